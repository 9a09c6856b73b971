"""The values found so far -> whether a float bound of a cell, line or segment could still beat them (pruning only)."""

from __future__ import annotations

from fractions import Fraction

from beamlang.engine.moving.found import Critical


class _Best:
    """The largest and smallest value found so far per key, and the largest magnitude per part of the member
    where each part is checked on its own: |v| per span (span/N limits) and, on a stepped member, |M| and |V|
    per stretch (the stress uses each stretch's section). What a line or a cell must be able to beat (by its
    float bound) to be searched exactly."""

    ABS = ("theta", "V")  # only the largest magnitude of these is reported

    def __init__(self, spans: list[Fraction], stretches: list[Fraction] | None = None):
        self.parts = {"v": spans} | ({"M": stretches, "V": stretches} if stretches else {})
        self.values: dict = {}
        self.region: dict[tuple[str, int], float] = {}

    def note(self, key, c: Critical) -> None:
        value = float(c.value)
        b = self.values.setdefault(key, [value, value])
        b[0], b[1] = max(b[0], value), min(b[1], value)
        if key in self.parts:
            for k in _regions_of(self.parts[key], c.x):
                self.region[(key, k)] = max(self.region.get((key, k), 0.0), abs(value))

    def wanted(self, keys, hi_b: float, lo_b: float, x_mid: Fraction | None = None) -> bool:
        """Could a value between lo_b and hi_b (of a cell or line around x_mid) beat what was found?"""
        for key in keys:
            b = self.values.get(key)
            if b is None:
                return True
            kind = key if isinstance(key, str) else key[0]
            if kind in self.ABS:
                if max(abs(hi_b), abs(lo_b)) > max(abs(b[0]), abs(b[1])):
                    return True
            elif hi_b > b[0] or lo_b < b[1]:
                return True
            if key in self.parts and x_mid is not None:  # a point on a bound belongs to both parts
                for part in _regions_of(self.parts[key], x_mid) or [-1]:
                    if max(abs(hi_b), abs(lo_b)) > self.region.get((key, part), 0.0):
                        return True
        return False


def _regions_of(bounds: list[Fraction], x: Fraction) -> list[int]:
    """The spans or overhangs (between consecutive bounds) that x belongs to (two at a support)."""
    return [k for k in range(len(bounds) - 1) if bounds[k] <= x <= bounds[k + 1]]

"""A moving group's geometry -> its offsets, travel directions and the (x, p) cells the plane is cut into."""

from __future__ import annotations

from bisect import bisect_right
from dataclasses import dataclass
from fractions import Fraction

from beamlang.model import MovingLoad


def group_offsets(load: MovingLoad, reversed_: bool) -> tuple[Fraction, ...]:
    """Offsets of the forces from the first one along x; travelling the other way, they point back."""
    return tuple(-d for d in load.offsets) if reversed_ else load.offsets


def directions(load: MovingLoad) -> tuple[bool, ...]:
    """The travel directions to search (reversed: True): both unless the group is symmetric."""
    return (False, True) if _asymmetric(load) else (False,)


def _asymmetric(load: MovingLoad) -> bool:
    d, F = load.offsets, load.forces
    return any(F[i] != F[-1 - i] or d[i] - d[0] != d[-1] - d[-1 - i] for i in range(len(F)))


def _wheels(load: MovingLoad, offsets, p: Fraction) -> list[tuple[Fraction, Fraction]]:
    return [(p + d, F) for d, F in zip(offsets, load.forces) if load.lo <= p + d <= load.hi]


def _events(xs, offsets, load: MovingLoad) -> list[Fraction]:
    """Group positions where some force reaches a breakpoint (inside the travel): the p intervals' ends."""
    start, stop = load.lo - max(offsets), load.hi - min(offsets)
    out = {start, stop}
    for x in xs:
        if load.lo <= x <= load.hi:
            out.update(x - d for d in offsets if start <= x - d <= stop)
    return sorted(out)


def _on_segments(xs, load: MovingLoad, offsets, p: Fraction) -> tuple[int | None, ...]:
    """For each force: the fixed segment it stands in at group position p, or None when off the travel."""
    out = []
    for d in offsets:
        x = p + d
        out.append(bisect_right(xs, x) - 1 if load.lo < x < load.hi else None)
    return tuple(out)


@dataclass(frozen=True, slots=True)
class _Cell:
    """x in fixed segment s, between the lines of force `left` and force `right` (None: the segment end)."""

    s: int
    left: int | None
    right: int | None
    on: tuple[int | None, ...]


def _cells(xs, offsets, on) -> list[_Cell]:
    out = []
    for s in range(len(xs) - 1):
        inside = sorted((i for i, t in enumerate(on) if t == s), key=lambda i: offsets[i])
        bounds = [None] + inside + [None]
        out += [_Cell(s, a, b, on) for a, b in zip(bounds, bounds[1:])]
    return out


def _cell_at(xs, offsets, on, x0: Fraction) -> _Cell:
    """The cell that holds the breakpoint x0 (inside a p interval no force stands on a breakpoint)."""
    k = xs.index(x0)
    s = min(k, len(xs) - 2)
    inside = sorted((i for i, t in enumerate(on) if t == s), key=lambda i: offsets[i])
    if k < len(xs) - 1:  # x0 starts segment k: left of every force in it
        return _Cell(s, None, inside[0] if inside else None, on)
    return _Cell(s, inside[-1] if inside else None, None, on)


def _x_range(xs, offsets, cell: _Cell, p: Fraction) -> tuple[Fraction, Fraction]:
    lo = xs[cell.s] if cell.left is None else p + offsets[cell.left]
    hi = xs[cell.s + 1] if cell.right is None else p + offsets[cell.right]
    return lo, hi

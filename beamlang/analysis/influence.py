"""A solved moving target -> float samples for its figure: influence lines at the governing points and the
envelopes of M and v over a grid of group positions (SI units; the report converts and draws them).

The influence lines come from the engine's exact kernels, evaluated in floats for drawing; the envelopes over x
are the largest and smallest response over a fine grid of group positions, for the figure only: the values in
the tables are the exact ones, and the figure marks them on the curves."""

from __future__ import annotations

from bisect import bisect_right
from dataclasses import dataclass
from fractions import Fraction

import numpy as np

from beamlang.engine.moving import directions, group_offsets, kernels_for, standing_loads
from beamlang.engine.solve import Solution

POSITIONS = 400  # group positions per direction for the drawn envelopes
X_SAMPLES = 200  # points along the member for the drawn envelopes
LINES = (("v", "max_down", "max_up"), ("M", "moment_positive", "moment_negative"))  # quantity, field, fallback


@dataclass(frozen=True, slots=True)
class InfluenceLine:
    """K_q(x0, xi) in SI per newton upward, with the group's forces where the value governs."""

    quantity: str
    at: object  # the governing Located extreme whose x is x0
    xi: np.ndarray  # unit-force positions, m
    values: np.ndarray
    forces_at: tuple[Fraction, ...]  # where the group's forces stand at the governing position, m
    wheels: tuple[tuple[int, Fraction, Fraction], ...] = ()  # (number in the group as written, x m, force N down)


@dataclass(frozen=True, slots=True)
class EnvelopeBand:
    """The largest and smallest response at each x over every drawn group position (SI)."""

    quantity: str
    xs: np.ndarray  # m
    top: np.ndarray
    bottom: np.ndarray


@dataclass(frozen=True, slots=True)
class MovingDrawing:
    """Everything the moving-load figure draws for one target, in SI floats (the marked extremes stay exact)."""

    lines: tuple[InfluenceLine | None, ...]  # v, then M (None: no extreme of that quantity)
    bands: tuple[EnvelopeBand, ...]  # M, then v
    positions: int  # how many group positions the bands were drawn from


def moving_drawing(sol: Solution, result) -> MovingDrawing:
    """Sample one moving target's influence lines and envelopes for its figure."""
    lines = _Lines(sol, result)
    load = result.envelope.load
    xi = np.linspace(float(load.lo), float(load.hi), 801)
    drawn = []
    for q, field, fallback in LINES:
        at = getattr(result, field) or getattr(result, fallback)
        if at is None:
            drawn.append(None)
            continue
        crit = result.position(field)
        forces = tuple(f.x for f in standing_loads(result.envelope, crit)) if crit is not None else ()
        drawn.append(InfluenceLine(q, at, xi, lines.line(q, float(at.x), xi), forces, _wheels(load, crit)))
    positions, offsets_all = _positions(load)
    xs = np.unique(np.concatenate([np.linspace(0.0, float(sol.member.length), X_SAMPLES), lines.xf]))
    bands = []
    for q in ("M", "v"):
        top, bottom = [], []
        for x in xs:
            values = np.concatenate([lines.response(q, float(x), positions, offs) for offs in offsets_all])
            top.append(values.max())
            bottom.append(values.min())
        bands.append(EnvelopeBand(q, xs, np.array(top), np.array(bottom)))
    return MovingDrawing(tuple(drawn), tuple(bands), POSITIONS * len(offsets_all))


class _Lines:
    """Float influence lines K_q(x, xi) of a unit upward force at xi, from the exact kernels."""

    def __init__(self, sol, result):
        self.env = result.envelope
        self.kernels = kernels_for(sol, self.env.load)
        self.xs = sol.xs
        self.xf = np.array([float(x) for x in sol.xs])
        self.static = sol.target(result.name).curves
        self._float: dict = {}

    def _coeffs(self, q: str, s: int, t: int, side: str, x: float) -> np.ndarray:
        """Coefficients in xi (highest first) of K_q(x, xi) for x in segment s and xi in segment t."""
        key = (q, s, t, side)
        if key not in self._float:
            field = self.kernels.field(q, s, t, side)
            deg_x = max((i for i, _ in field), default=0)
            deg_xi = max((j for _, j in field), default=0)
            grid = np.zeros((deg_x + 1, deg_xi + 1))
            for (i, j), c in field.items():
                grid[i, j] = float(c)
            self._float[key] = grid
        grid = self._float[key]
        in_xi = (x ** np.arange(grid.shape[0])) @ grid
        return in_xi[::-1]

    def line(self, q: str, x: float, xi: np.ndarray) -> np.ndarray:
        """K_q(x, xi) for an array of positions inside the travel."""
        n = len(self.xs) - 1
        s = min(max(int(np.searchsorted(self.xf, x, side="right")) - 1, 0), n - 1)
        t_of = np.clip(np.searchsorted(self.xf, xi, side="right") - 1, 0, n - 1)
        out = np.zeros_like(xi)
        for t in np.unique(t_of):
            at = t_of == t
            if t != s:
                out[at] = np.polyval(self._coeffs(q, s, int(t), "-", x), xi[at])
                continue
            for side, where in (("L", xi > x), ("R", xi <= x)):
                part = at & where
                if part.any():
                    out[part] = np.polyval(self._coeffs(q, s, int(t), side, x), xi[part])
        return out

    def response(self, q: str, x: float, positions: np.ndarray, offsets) -> np.ndarray:
        """The static part plus the factored group with its first force at each position."""
        load, env = self.env.load, self.env
        k = min(max(bisect_right(self.xs, Fraction(x)) - 1, 0), len(self.xs) - 2)
        curve = {"v": self.static.v, "M": self.static.M}[q]
        total = np.full_like(positions, float(curve.pieces[k](Fraction(x))))
        lo, hi = float(load.lo), float(load.hi)
        for d, F in zip(offsets, load.forces):
            xi = positions + float(d)
            on = (xi >= lo) & (xi <= hi)
            if on.any():
                total[on] += float(env.factor * F) * self.line(q, x, xi[on])
        return total


def _wheels(load, crit) -> tuple[tuple[int, Fraction, Fraction], ...]:
    """Each force on the travel with the group where `crit` governs: its number as written, x and force (down)."""
    if crit is None:
        return ()
    out = []
    for k, (d, F) in enumerate(zip(group_offsets(load, crit.reversed), load.forces)):
        x = crit.position + d
        if load.lo <= x <= load.hi:
            out.append((k + 1, x, -F))
    return tuple(out)


def _positions(load) -> tuple[np.ndarray, list]:
    """First-force positions from entering to leaving, and the offsets of each travel direction searched."""
    out = [group_offsets(load, rev) for rev in directions(load)]
    lo = float(load.lo) - float(max(max(o) for o in out))
    hi = float(load.hi) - float(min(min(o) for o in out))
    return np.linspace(lo, hi, POSITIONS), out

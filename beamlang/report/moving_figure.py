"""Moving-load figure: Analysis + a target with a moving group -> SVG of influence lines and envelopes.

The influence lines come from the engine's exact kernels (evaluated in floats for drawing); the
envelopes over x are the largest and smallest response over a fine grid of group positions, for
the figure only: the values in the tables are the exact ones, and they are marked on the curves."""

from __future__ import annotations

from bisect import bisect_right
from fractions import Fraction

import numpy as np

from beamlang.analysis.display import convert, number, report_units
from beamlang.engine.moving import (
    directions,
    group_offsets,
    kernels_for,
    standing_loads,
)
from beamlang.pipeline import Analysis
from beamlang.report.drawing import (
    CURVE,
    LABEL_ROOM,
    LOAD,
    limit_lines,
    mark_changes_and_hinges,
    mark_extreme,
)
from beamlang.report.svgplot import Figure

POSITIONS = 400  # group positions per direction for the drawn envelopes
X_SAMPLES = 200  # points along the member for the drawn envelopes


class _Lines:
    """Float influence lines K_q(x, xi) of a unit upward force at xi, from the exact kernels."""

    def __init__(self, a: Analysis, name: str):
        sol = a.solution
        self.env = a.result(name).envelope
        self.kernels = kernels_for(sol, self.env.load)
        self.xs = sol.xs
        self.xf = np.array([float(x) for x in sol.xs])
        self.static = sol.target(name).curves
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


def moving_figure(a: Analysis, name: str) -> str:
    """Influence lines of v and M at their governing points, and the envelopes of M and v along x."""
    m = a.loaded.member
    u = report_units(m)
    r = a.result(name)
    lines = _Lines(a, name)
    load = r.envelope.load
    to_length = float(convert(Fraction(1), u["length"]))
    length = lambda x: float(x) * to_length  # noqa: E731  SI metres (exact or float) -> report length unit
    fig = Figure(title=f"{name}: moving group, influence lines and envelopes (dashed: the group where the value "
                       "governs)")
    axes = [fig.panel(110.0, LABEL_ROOM) for _ in range(4)]
    xi = np.linspace(float(load.lo), float(load.hi), 801)
    per_force = 1 / float(convert(Fraction(1), u["force"]))  # newtons in one report force unit
    for ax, (q, field, quantity, what) in zip(axes[:2], (("v", "max_down", "deflection", "deflection"),
                                                         ("M", "moment_positive", "moment", "moment"))):
        at = getattr(r, field) or (r.max_up if q == "v" else r.moment_negative)
        if at is None:
            ax.axis = False
            continue
        x0 = float(at.x)
        scale = float(convert(Fraction(1), u[quantity]))
        ys = -lines.line(q, x0, xi) * per_force * scale  # one report force unit down
        ax.line([length(v) for v in xi], ys, color=CURVE, width=1.1)
        ax.hline(0, width=0.6)
        ax.ylabel = f"{q} ({u[quantity]})"
        ax.title = (f"influence line: {what} at x = {number(length(at.x))} {u['length']} per 1 {u['force']} "
                    "down at the position on the axis", 7.0)
        crit = r.position(field)
        if crit is not None:
            for force in standing_loads(r.envelope, crit):
                ax.vline(length(force.x), color=LOAD, width=0.8, dash="dashed")
    positions, offsets_all = _positions(load)
    xs = np.unique(np.concatenate([np.linspace(0.0, float(m.length), X_SAMPLES), lines.xf]))
    for ax, (q, quantity, marks) in zip(axes[2:], (("M", "moment", (r.moment_positive, r.moment_negative)),
                                                 ("v", "deflection", (r.max_down, r.max_up)))):
        scale = float(convert(Fraction(1), u[quantity]))
        top, bottom = [], []
        for x in xs:
            values = np.concatenate([lines.response(q, float(x), positions, offs) for offs in offsets_all])
            top.append(values.max() * scale)
            bottom.append(values.min() * scale)
        px = [length(x) for x in xs]
        ax.band(px, top, bottom, CURVE, 0.15)
        ax.line(px, top, color=CURVE, width=1.0)
        ax.line(px, bottom, color=CURVE, width=1.0)
        ax.hline(0, width=0.6)
        mark_changes_and_hinges(ax, m, u)
        if q == "v":
            limit_lines(ax, m, r, u)
        ax.ylabel = f"{q} ({u[quantity]})"
        ax.title = (f"envelope of {q} over every position of the group (drawn from "
                    f"{2 * POSITIONS if len(offsets_all) > 1 else POSITIONS} positions; the dots are the exact extremes)", 7.0)
        for loc in marks:
            if loc is None:
                continue
            mark_extreme(ax, loc, u, quantity, length(m.length))
    for ax in axes:
        for sp in m.supports:
            ax.vline(length(sp.x), width=0.5, opacity=0.4)
    axes[-1].xlabel = f"x ({u['length']}) from the left end; for the influence lines, where a force stands"
    fig.xlim = (-0.02 * length(m.length), 1.02 * length(m.length))
    return fig.svg()


def _positions(load) -> tuple[np.ndarray, list]:
    """First-force positions from entering to leaving, and the offsets of each travel direction searched."""
    out = [group_offsets(load, rev) for rev in directions(load)]
    lo = float(load.lo) - float(max(max(o) for o in out))
    hi = float(load.hi) - float(min(min(o) for o in out))
    return np.linspace(lo, hi, POSITIONS), out

"""Moving-load figure: Analysis + a target with a moving group -> SVG of influence lines and envelopes, drawn
from the samples the analysis hands over (analysis/influence.py) with the exact extremes marked."""

from __future__ import annotations

from fractions import Fraction

from beamlang.analysis.display import convert, number
from beamlang.analysis.influence import moving_drawing
from beamlang.pipeline import Analysis
from beamlang.report.drawing import CURVE, LABEL_ROOM, LOAD, limit_lines, mark_changes_and_hinges, mark_extreme
from beamlang.report.svgplot import Figure


def moving_figure(a: Analysis, name: str) -> str:
    """Influence lines of v and M at their governing points, and the envelopes of M and v along x."""
    m = a.loaded.member
    u = a.units
    r = a.result(name)
    drawing = moving_drawing(a.solution, r)
    to_length = float(convert(Fraction(1), u["length"]))
    length = lambda x: float(x) * to_length  # noqa: E731  SI metres (exact or float) -> report length unit
    fig = Figure(title=f"{name}: moving group, influence lines and envelopes (dashed: the group's forces where the "
                       "value governs, numbered as written)")
    axes = [fig.panel(110.0, LABEL_ROOM) for _ in range(4)]
    per_force = 1 / float(convert(Fraction(1), u["force"]))  # newtons in one report force unit
    for ax, line, quantity in zip(axes[:2], drawing.lines, ("deflection", "moment")):
        if line is None:
            ax.axis = False
            continue
        q, at = line.quantity, line.at
        scale = float(convert(Fraction(1), u[quantity]))
        ys = -line.values * per_force * scale  # one report force unit down
        ax.line([length(v) for v in line.xi], ys, color=CURVE, width=1.1)
        ax.hline(0, width=0.6)
        ax.ylabel = f"{q} ({u[quantity]})"
        ax.title = (f"influence line: {quantity} at x = {number(length(at.x))} {u['length']} per 1 {u['force']} "
                    "down at the position on the axis", 7.0)
        for x in line.forces_at:
            ax.vline(length(x), color=LOAD, width=0.8, dash="dashed")
        top = float(max(ys.max(), 0.0))
        for k, (n, x, force) in enumerate(sorted(line.wheels, key=lambda w: w[1])):  # staggered: close wheels
            ax.text(length(x), top, f"{n}: {number(convert(force, u['force']))} {u['force']}", 6.0, LOAD,
                    "start", "top", dx=2.0, dy=-9.0 - 8.0 * (k % 2))
    for ax, band, quantity, marks in zip(axes[2:], drawing.bands, ("moment", "deflection"),
                                         ((r.moment_positive, r.moment_negative), (r.max_down, r.max_up))):
        q = band.quantity
        scale = float(convert(Fraction(1), u[quantity]))
        top, bottom = [v * scale for v in band.top], [v * scale for v in band.bottom]
        px = [length(x) for x in band.xs]
        ax.band(px, top, bottom, CURVE, 0.15)
        ax.line(px, top, color=CURVE, width=1.0)
        ax.line(px, bottom, color=CURVE, width=1.0)
        ax.hline(0, width=0.6)
        mark_changes_and_hinges(ax, m, u)
        if q == "v":
            limit_lines(ax, m, r, u)
        ax.ylabel = f"{q} ({u[quantity]})"
        ax.title = (f"envelope of {q} over every position of the group (drawn from "
                    f"{drawing.positions} positions; the dots are the exact extremes)", 7.0)
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

"""The package's two figures of the whole member: the sign convention, and the envelope of M and v over every
combination (or case), with a moving group's band over all its positions and a patterned target's two envelopes."""

from __future__ import annotations

from fractions import Fraction

from beamlang.analysis.display import convert
from beamlang.analysis.influence import moving_drawing
from beamlang.pipeline import Analysis
from beamlang.report.drawing import CURVE, LOAD, MARK, sample
from beamlang.report.svgplot import Figure


def sign_convention_figure() -> str:
    """x to the right from the left end; up positive; sagging positive; counterclockwise positive."""
    fig = Figure(width=360.0)
    ax = fig.panel(100.0)
    ax.axis = False
    ax.line([0, 10], [0, 0], width=3)
    ax.arrow((10.2, 0), (11.5, 0), "black", 1.0)
    ax.text(11.6, 0, "x", 8.0, baseline="middle")
    ax.arrow((1, 0.3), (1, 2.2), CURVE, 1.0)
    ax.text(1.2, 1.6, "v, forces, reactions: + up", 7.0, CURVE)
    ax.dot(5.5, 0, 14.0, None, LOAD)
    ax.text(5.9, 0.5, "moments, slope: + counterclockwise", 7.0, LOAD)
    ax.line([7, 8, 9], [-1.2, -1.7, -1.2], color=MARK)
    ax.text(9.2, -1.5, "M > 0: sagging", 7.0, MARK)
    fig.xlim = (-0.5, 12.5)
    ax.ylim = (-2.2, 2.5)
    return fig.svg()


def envelope_targets(a: Analysis) -> list[str]:
    """The combinations, or the cases when there are none."""
    combos = [t.name for t in a.solution.targets if t.kind == "combination"]
    return combos or [t.name for t in a.solution.targets]


def envelope_figure(a: Analysis) -> str:
    """M and v of every combination on one figure, with the upper and lower envelope."""
    u = a.units
    names = envelope_targets(a)
    fig = Figure()
    panels = [fig.panel(120.0), fig.panel(120.0)]
    drawn = {name: moving_drawing(a.solution, a.result(name)) for name in names if a.solution.member.moving(name)}
    for ax, attr, quantity, label in ((panels[0], "M", "moment", "M"), (panels[1], "v", "deflection", "v")):
        series = []  # (name, top, bottom, moving): a static curve has top == bottom; a moving group has its band
        for i, name in enumerate(names):
            xs, ys = sample(getattr(a.solution.target(name).curves, attr), u[quantity])
            x = [float(convert(p, u["length"])) for p in xs]
            pattern = a.result(name).pattern
            if name in drawn:
                top, bottom = _moving_band(drawn[name], attr, u, quantity, [float(p) for p in xs])
                series.append((name, top, bottom, True))
            elif pattern is not None:
                for s, side in ((1, "upper"), (-1, "lower")):  # the patterned target's envelopes at the same x
                    curve = pattern.curve(attr, s)
                    ys_side = [float(convert(curve.at(p), u[quantity])) for p in xs]
                    series.append((f"{name} ({side})", ys_side, ys_side, False))
            else:
                series.append((name, ys, ys, False))
        ax.band(x, [max(col) for col in zip(*(top for _, top, _, _ in series))],
                [min(col) for col in zip(*(bottom for _, _, bottom, _ in series))], "#888888", 0.15)
        for i, (name, top, bottom, moving) in enumerate(series):
            color = _PALETTE[i % len(_PALETTE)]
            if moving:
                tag = f"{name} (over every position of the moving group)"
                ax.line(x, top, color=color, width=0.9, label=tag if ax is panels[0] else None)
                ax.line(x, bottom, color=color, width=0.9)
            else:
                ax.line(x, top, color=color, width=0.9, label=name if ax is panels[0] else None)
        ax.hline(0, width=0.6)
        ax.ylabel = f"{label} ({u[quantity]})"
    panels[0].legend.append(("envelope", "#888888", "band"))
    panels[0].title = ("Envelope of " + ("the combinations" if len(names) < len(a.solution.targets) or
                                         all(t.kind == "combination" for t in a.solution.targets) else "the cases"), 8.0)
    panels[1].xlabel = f"x ({u['length']}) from the left end"
    return fig.svg()


def _moving_band(drawing, attr: str, u, quantity: str, xs_m: list[float]) -> tuple[list[float], list[float]]:
    """A moving target's drawn envelope (static part plus the group at every drawn position), read at xs_m."""
    import numpy as np
    band = next(b for b in drawing.bands if b.quantity == attr)
    scale = float(convert(Fraction(1), u[quantity]))
    top = np.interp(xs_m, band.xs, band.top) * scale
    bottom = np.interp(xs_m, band.xs, band.bottom) * scale
    return [float(v) for v in top], [float(v) for v in bottom]


_PALETTE = ("#1f4e79", "#b22222", "#2e7d32", "#8b4513", "#6a1b9a", "#00838f")

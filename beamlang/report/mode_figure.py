"""Mode-shape figure: Analysis + one frequency result -> SVG of the first bending mode, with supports and masses."""

from __future__ import annotations

from beamlang.analysis.display import convert, number
from beamlang.pipeline import Analysis
from beamlang.report.drawing import CURVE, LOAD, MARK, mark_changes_and_hinges
from beamlang.report.svgplot import Figure


def mode_figure(a: Analysis, k: int) -> str:
    """The mode shape of the k-th `limit frequency` line, scaled to a largest magnitude of 1."""
    m, u = a.loaded.member, a.units
    found = a.frequencies[k]
    f = found.frequency
    L = float(convert(m.length, u["length"]))
    fig = Figure(title=f"First bending mode, f1 = {number(f.hz)} Hz (mass {found.limit.text})")
    ax = fig.panel(120.0, 0.12)
    xs = [float(convert(x, u["length"])) for x, _ in f.mode]
    ys = [v for _, v in f.mode]
    ax.band(xs, ys, 0, CURVE, 0.12)
    ax.line(xs, ys, color=CURVE, width=1.2)
    ax.hline(0, width=0.6)
    mark_changes_and_hinges(ax, m, u)
    for sp in m.supports:
        x = float(convert(sp.x, u["length"]))
        ax.dot(x, 0.0, 5.0, "white" if sp.kind != "fixed" else "black", MARK)
        ax.text(x, 0.0, sp.kind, 6.5, MARK, "middle", dy=-12)
    for x, mass in found.masses.points:
        px = float(convert(x, u["length"]))
        ax.dot(px, _at(f.mode, float(x)), 4.0, LOAD)
        ax.text(px, _at(f.mode, float(x)), f"{number(convert(mass, u['mass']))} {u['mass']}", 6.5, LOAD, "middle", dy=8)
    ax.ylabel = "mode shape (largest 1)"
    ax.xlabel = f"x ({u['length']}) from the left end"
    fig.xlim = (-0.03 * L, 1.03 * L)
    return fig.svg()


def _at(mode, x: float) -> float:
    """The sampled mode shape at x (a point mass sits on a node, which is a sample)."""
    return min(mode, key=lambda p: abs(p[0] - x))[1]

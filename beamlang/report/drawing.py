"""Drawing pieces shared by every figure: colours, sampled curves, exact extremes, limit lines, section changes."""

from __future__ import annotations

import math
from fractions import Fraction

from beamlang.analysis.display import convert, number
from beamlang.poly import runs

SAMPLES_PER_MEMBER, SAMPLES_MIN, SAMPLES_PER_RUN = 160, 6, 40  # points of a drawn curve (`sample`)
CURVE = "#1f4e79"
MARK = "#b22222"
LOAD = "#8b4513"
LABEL_ROOM = 0.16  # y margin of a curve's panel: the labels of its marked extremes fit inside the frame


def mark_extreme(ax, loc, u: dict, quantity: str, L: float) -> None:
    """A dot at an exact extreme and its value and place beside it, reaching inwards near the right end."""
    x, y = float(convert(loc.x, u["length"])), float(convert(loc.value, u[quantity]))
    ax.dot(x, y, 3.5, MARK)
    right = x > 0.6 * L  # keep the label inside the axes
    ax.text(x, y, f"{number(y)} at {number(x)} {u['length']}", 7.0, MARK, "end" if right else "start",
            dx=-4 if right else 4, dy=4 if y >= 0 else -10)


def limit_lines(ax, m, r, u: dict) -> None:
    """Each deflection limit on this target as a dashed line over each span and overhang, at the allowed value on
    the side the member deflects there (the check compares the largest deflection either way)."""
    L = float(convert(m.length, u["length"]))
    for limit in (limit for limit in m.limits if limit.target == r.name):
        for region in r.regions:
            allowed = limit.value if limit.value is not None else region.basis / limit.divisor
            side = -1 if region.max_abs is None or region.max_abs.value <= 0 else 1
            y = float(convert(side * allowed, u["deflection"]))
            x1, x2 = (float(convert(v, u["length"])) for v in (region.lo, region.hi))
            ax.line([x1, x2], [y, y], color=MARK, width=0.8, dash="dashed")
            what = "limit" if limit.value is not None else f"span/{number(limit.divisor)}"
            if region.kind != "span" and limit.value is None:
                what = f"2 x {region.kind}/{number(limit.divisor)}"
            short = x2 - x1 < 0.3 * L  # a short overhang: the label reaches inwards from the member's end
            x, anchor = ((x2, "end") if short and x2 >= L else (x1, "start") if short and x1 <= 0
                         else ((x1 + x2) / 2, "middle"))
            ax.text(x, y, f"{what}: {number(abs(y))} {u['deflection']}", 6.0, MARK, anchor, dy=3 if side > 0 else -8)


def sample(curve, unit: str) -> tuple[list[Fraction], list[float]]:
    """Points on every run of one formula, both sides of each breakpoint where the formula changes (jumps stay
    vertical). A run gets points in proportion to its share of the member (SAMPLES_PER_MEMBER in all), at least
    SAMPLES_MIN and at most SAMPLES_PER_RUN: a few pixels apart on the drawn panel, however many other loads
    break the member into short segments. The values are floats from the exact coefficients of each piece in
    h = x - (run start), converted to `unit` exactly first: short, well-conditioned sums (the marked extremes
    are drawn from their exact values)."""
    factor = convert(Fraction(1), unit)
    length = curve.xs[-1] - curve.xs[0]
    xs, ys = [], []
    for k, a, b in runs((curve,)):
        p = curve.pieces[k]
        coeffs = [float(c * factor) for c in reversed(p.taylor(a).coeffs)]
        n = min(SAMPLES_PER_RUN, max(SAMPLES_MIN, math.ceil(SAMPLES_PER_MEMBER * float((b - a) / length))))
        step = float(b - a) / n
        for i in range(n + 1):
            xs.append(a + (b - a) * Fraction(i, n))
            h, y = step * i, 0.0
            for c in coeffs:
                y = y * h + c
            ys.append(y)
    return xs, ys


def changes(m, u: dict) -> list[float]:
    """Where the section or material changes, in report length units."""
    return [float(convert(st.x1, u["length"])) for st in m.stretches[1:]]


def mark_changes_and_hinges(ax, m, u: dict) -> None:
    """Dotted verticals on a curve's axes where the section changes and at every hinge."""
    for x in changes(m, u) + [float(convert(h.x, u["length"])) for h in m.hinges]:
        ax.vline(x, color="#777777", width=0.6, dash="dotted")

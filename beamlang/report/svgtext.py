"""SVG text of the plotter's elements: coordinates rounded to 0.01 pt, line segments, polylines' points, dashes,
arrows and text blocks; and the labels' boxes (from an estimated width), moved clear of the labels placed before."""

from __future__ import annotations

import math
from xml.sax.saxutils import escape

GLYPH = 0.6  # estimated average advance of a character, as a fraction of the font size (layout only)
DASHES = {"dotted": "1 1.6", "dashed": "3.7 1.6"}


def num(v: float) -> str:
    """One coordinate: two decimals, no trailing zeros, no negative zero."""
    s = f"{v:.2f}".rstrip("0").rstrip(".")
    return "0" if s in ("-0", "") else s


def text_width(s: str, size: float) -> float:
    """Estimated width of a (possibly multi-line) label."""
    return GLYPH * size * max(len(line) for line in s.split("\n"))


def segment(x1: float, y1: float, x2: float, y2: float, color: str, width: float, extra: str = "") -> str:
    return (f'<line x1="{num(x1)}" y1="{num(y1)}" x2="{num(x2)}" y2="{num(y2)}" stroke="{color}" '
            f'stroke-width="{num(width)}"{extra}/>\n')


def point_list(xs: list[float], ys: list[float], px, py) -> str:
    return " ".join(f"{num(px(a))},{num(py(b))}" for a, b in zip(xs, ys))


def dash_attrs(dash: str | None, opacity: float) -> str:
    out = f' stroke-dasharray="{DASHES[dash]}"' if dash else ""
    return out + (f' stroke-opacity="{opacity:g}"' if opacity != 1 else "")


def arrow(item: tuple, px, py) -> str:
    """A shaft from start to 2 pt short of the tip, and an open (two strokes) or filled head at the tip."""
    _, (sx, sy), (tx, ty), color, width, filled = item
    ax, ay, bx, by = px(sx), py(sy), px(tx), py(ty)
    length = math.hypot(bx - ax, by - ay) or 1.0
    ux, uy = (bx - ax) / length, (by - ay) / length
    bx, by = bx - 2.0 * ux, by - 2.0 * uy  # stop short of the member line, as a drawn arrow does
    head, half = 5.0, 2.2
    lx, ly = bx - head * ux + half * uy, by - head * uy - half * ux
    rx, ry = bx - head * ux - half * uy, by - head * uy + half * ux
    shaft = segment(ax, ay, bx, by, color, width)
    if filled:
        return shaft + (f'<polygon points="{num(lx)},{num(ly)} {num(bx)},{num(by)} {num(rx)},{num(ry)}" fill="{color}" '
                        f'stroke="none"/>\n')
    return shaft + (f'<polyline points="{num(lx)},{num(ly)} {num(bx)},{num(by)} {num(rx)},{num(ry)}" fill="none" '
                    f'stroke="{color}" stroke-width="{num(width)}"/>\n')


def first_baseline(y: float, size: float, n: int, baseline: str) -> float:
    """The baseline of a block's first line when its bottom, top, middle or first baseline is at y."""
    step = 1.2 * size
    if baseline == "bottom":
        return y - 0.24 * size - step * (n - 1)
    if baseline == "top":
        return y + 0.76 * size
    if baseline == "middle":
        return y + 0.36 * size - step * (n - 1) / 2
    return y


def text_element(x: float, y: float, s: str, size: float, color: str, anchor: str, baseline: str = "baseline") -> str:
    """Text at a point; lines below one another; `baseline` puts the block's bottom, top or middle at y."""
    lines = s.split("\n")
    step = 1.2 * size
    first = first_baseline(y, size, len(lines), baseline)
    fill = "" if color == "black" else f' fill="{color}"'
    anchor_attr = "" if anchor == "start" else f' text-anchor="{anchor}"'
    if len(lines) == 1:
        return f'<text x="{num(x)}" y="{num(first)}" font-size="{num(size)}"{anchor_attr}{fill}>{escape(s)}</text>\n'
    spans = "".join(f'<tspan x="{num(x)}" y="{num(first + i * step)}">{escape(line)}</tspan>'
                    for i, line in enumerate(lines))
    return f'<text font-size="{num(size)}"{anchor_attr}{fill}>{spans}</text>\n'


PAD = 1.0  # pt kept between two labels


def label_box(x: float, y: float, s: str, size: float, anchor: str, baseline: str) -> tuple[float, float, float, float]:
    """(left, top, right, bottom) of a label on the page, from the estimated width and the line height."""
    w, n = text_width(s, size), len(s.split("\n"))
    left = x - {"start": 0.0, "middle": w / 2, "end": w}[anchor]
    first = first_baseline(y, size, n, baseline)
    return left, first - 0.76 * size, left + w, first + 1.2 * size * (n - 1) + 0.24 * size


def clear(box: tuple[float, float, float, float], placed: list, top: float, bottom: float, way: int) -> float:
    """How far (pt, down positive) a label must move, first `way` (-1 up, 1 down), to overlap no label placed
    before it in its panel; the other way if the first leaves the frame (from `top` to `bottom`). The label's box
    is then placed."""
    def moved(direction: int) -> float:
        shift = 0.0
        for _ in range(4 * len(placed) + 1):
            l, t, r, b = box[0], box[1] + shift, box[2], box[3] + shift
            hit = next((o for o in placed if l < o[2] + PAD and o[0] < r + PAD and t < o[3] + PAD and o[1] < b + PAD),
                       None)
            if hit is None:
                return shift
            shift += (hit[1] - PAD - b) if direction < 0 else (hit[3] + PAD - t)
        return shift

    shift = moved(way)
    inside = top <= box[1] and box[3] <= bottom
    if shift and inside and not (top <= box[1] + shift and box[3] + shift <= bottom):
        other = moved(-way)
        if top <= box[1] + other and box[3] + other <= bottom:
            shift = other
    placed.append((box[0], box[1] + shift, box[2], box[3] + shift))
    return shift

"""SVG plotting: panels stacked over one shared x axis -> SVG text that depends on nothing but the data.

The calc package's figures need lines, filled bands and polygons, arrows, markers, text, ticks and a
grid; this module draws exactly that. Coordinates are in points (1/72 in), rounded to 0.01 pt, so the
same figure gives the same bytes on every machine and with every library version. Text is SVG text in
a common sans-serif; its width is estimated (GLYPH) only to leave room for labels and legends."""

from __future__ import annotations

from dataclasses import dataclass
from xml.sax.saxutils import escape

from beamlang.report.svgtext import (
    arrow,
    clear,
    dash_attrs,
    label_box,
    num,
    point_list,
    segment,
    text_element,
    text_width,
)
from beamlang.report.ticks import limits, nice_ticks, tick_labels

FONT = "DejaVu Sans, Verdana, Arial, Helvetica, sans-serif"
TICK = 3.5  # tick length, pt
TICK_FONT = 7.0
GRID = "#b0b0b0"
_SUPERSCRIPT = str.maketrans("0123456789-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁻")


class Panel:
    """One axes box: items in data coordinates, drawn in the order they were added."""

    def __init__(self, height: float):
        self.height = height
        self.items: list[tuple] = []
        self.xlim: tuple[float, float] | None = None
        self.ylim: tuple[float, float] | None = None
        self.axis = True  # frame, ticks and grid
        self.yticks = True
        self.title: tuple[str, float] | None = None
        self.ylabel: str | None = None
        self.xlabel: str | None = None
        self.legend: list[tuple[str, str, str]] = []  # (label, colour, "line" | "band")
        self.margin = 0.05  # of the y extent, above and below the data
        self._x: list[float] = []
        self._y: list[float] = []

    # drawing -------------------------------------------------------------------------------------------
    def line(self, xs, ys, color: str = "black", width: float = 1.0, dash: str | None = None,
             opacity: float = 1.0, label: str | None = None) -> None:
        xs, ys = [float(v) for v in xs], [float(v) for v in ys]
        self._extend(xs, ys)
        self.items.append(("line", xs, ys, color, width, dash, opacity))
        if label:
            self.legend.append((label, color, "line"))

    def band(self, xs, top, bottom, color: str, opacity: float, label: str | None = None) -> None:
        """The area between two curves over the same xs (a curve and zero, or an envelope)."""
        xs = [float(v) for v in xs]
        top = [float(v) for v in top]
        bottom = [float(v) for v in bottom] if hasattr(bottom, "__iter__") else [float(bottom)] * len(xs)
        self._extend(xs + xs, top + bottom)
        self.items.append(("polygon", xs + xs[::-1], top + bottom[::-1], color, opacity, None, 0.0, True))
        if label:
            self.legend.append((label, color, "band"))

    def polygon(self, xs, ys, fill: str, opacity: float = 1.0, edge: str | None = None, width: float = 0.8) -> None:
        xs, ys = [float(v) for v in xs], [float(v) for v in ys]
        self._extend(xs, ys)
        self.items.append(("polygon", xs, ys, fill, opacity, edge, width, True))

    def hline(self, y: float, color: str = "black", width: float = 0.6) -> None:
        self._y.append(float(y))
        self.items.append(("hline", float(y), color, width))

    def vline(self, x: float, color: str = "black", width: float = 0.6, dash: str | None = None,
              opacity: float = 1.0) -> None:
        self.items.append(("vline", float(x), color, width, dash, opacity))

    def dot(self, x: float, y: float, size: float, face: str | None, edge: str | None = None,
            edge_width: float = 1.0) -> None:
        """A round marker `size` pt across; face None leaves it open."""
        self._extend([float(x)], [float(y)])
        self.items.append(("dot", float(x), float(y), size, face, edge or face, edge_width))

    def ellipse(self, x: float, y: float, rx: float, ry: float, face: str, edge: str, width: float) -> None:
        """Radii in data units of each axis."""
        self.items.append(("ellipse", float(x), float(y), float(rx), float(ry), face, edge, width))

    def arrow(self, start: tuple[float, float], tip: tuple[float, float], color: str, width: float = 1.0,
              filled: bool = False) -> None:
        self.items.append(("arrow", tuple(map(float, start)), tuple(map(float, tip)), color, width, filled))

    def text(self, x: float, y: float, s: str, size: float = 7.0, color: str = "black", anchor: str = "start",
             baseline: str = "baseline", dx: float = 0.0, dy: float = 0.0) -> None:
        """`anchor` start | middle | end; `baseline` baseline | bottom | top | middle; dx, dy in pt (dy up)."""
        self.items.append(("text", float(x), float(y), s, size, color, anchor, baseline, dx, dy))

    def _extend(self, xs: list[float], ys: list[float]) -> None:
        self._x += xs
        self._y += ys

    # layout helpers ---------------------------------------------------------------------------------------
    def x_extent(self) -> tuple[float, float] | None:
        return (min(self._x), max(self._x)) if self._x else None

    def y_range(self) -> tuple[float, float]:
        if self.ylim:
            return self.ylim
        return limits(min(self._y, default=None), max(self._y, default=None), self.margin)

    def y_ticks(self) -> tuple[list[float], list[str], int]:
        if not (self.axis and self.yticks):
            return [], [], 0
        lo, hi = self.y_range()
        ticks, step = nice_ticks(lo, hi, max(3, int(self.height / 30)))
        labels, exp = tick_labels(ticks, step)
        return ticks, labels, exp


class Figure:
    """Panels stacked top to bottom, sharing one x axis; x tick labels under the last panel only."""

    def __init__(self, width: float = 504.0, title: str | None = None, title_size: float = 8.0):
        self.width = width
        self.title = title
        self.title_size = title_size
        self.panels: list[Panel] = []
        self.xlim: tuple[float, float] | None = None

    def panel(self, height: float, margin: float = 0.05) -> Panel:
        """A new panel under the others; `margin` is the room above and below the data, as a fraction of its
        extent (room for labels at the extremes)."""
        p = Panel(height)
        p.margin = margin
        self.panels.append(p)
        return p

    def _x_range(self) -> tuple[float, float]:
        if self.xlim:
            return self.xlim
        extents = [e for e in (p.x_extent() for p in self.panels) if e]
        if not extents:
            return 0.0, 1.0
        return limits(min(e[0] for e in extents), max(e[1] for e in extents))

    def _margins(self, ylabels: list[str], xlabels: list[str]) -> tuple[float, float]:
        """Room left of the panels for the widest y tick label and the y labels, and right of them for half
        the last x tick label."""
        if not any(p.axis for p in self.panels):
            return 4.0, 4.0
        widest = max((text_width(s, TICK_FONT) for s in ylabels), default=0.0)
        left = 8.0 + (widest + TICK + 3.0 if widest else 0.0) + (12.0 if any(p.ylabel for p in self.panels) else 0.0)
        return left, max(8.0, text_width(xlabels[-1], TICK_FONT) / 2 + 4) if xlabels else 4.0

    def svg(self) -> str:
        x0, x1 = self._x_range()
        axis_panels = [p for p in self.panels if p.axis]
        xt, xstep = nice_ticks(x0, x1, max(3, int(self.width / 100))) if axis_panels else ([], 1.0)
        xlabels, xexp = tick_labels(xt, xstep)
        yticks = {id(p): p.y_ticks() for p in self.panels}
        left, right = self._margins([s for t in yticks.values() for s in t[1]], xlabels)
        plot_w = self.width - left - right
        body: list[str] = []
        y = 6.0
        if self.title:
            for line in _wrap(self.title, self.title_size, self.width - 12.0):
                y += self.title_size + 2.0
                body.append(text_element(6.0, y, line, self.title_size, "black", "start"))
            y += 4.0
        last = self.panels[-1] if self.panels else None
        for k, p in enumerate(self.panels):
            y = _header(body, p, left, plot_w, y)
            ticks, labels, exp = yticks[id(p)]
            box = (left, y, plot_w, p.height)
            _panel(body, p, box, (x0, x1), ticks, labels, exp, xt, xlabels if p is last else None, k)
            y += p.height
            if p.axis:
                y += TICK + 2.0
            xlabel = p.xlabel
            if p is last and p.axis:
                y += TICK_FONT + 2.0
                if xexp:
                    xlabel = (xlabel or "x") + _power(xexp)
            if xlabel:
                y += 8.0 + 2.0
                body.append(text_element(left + plot_w / 2, y, xlabel, 8.0, "black", "middle"))
            y += 8.0
        height = y
        head = (f'<?xml version="1.0" encoding="utf-8"?>\n'
                f'<svg xmlns="http://www.w3.org/2000/svg" width="{num(self.width)}pt" height="{num(height)}pt" '
                f'viewBox="0 0 {num(self.width)} {num(height)}" font-family="{FONT}">\n'
                f'<rect width="100%" height="100%" fill="white"/>\n')
        return head + "".join(body) + "</svg>\n"


def _header(body: list[str], p: Panel, left: float, plot_w: float, y: float) -> float:
    """The panel's title and legend rows above its box; returns the top of the box."""
    if p.title:
        text, size = p.title
        for line in _wrap(text, size, plot_w):
            y += size + 2.0
            body.append(text_element(left, y, line, size, "black", "start"))
        y += 2.0
    if p.legend:
        rows: list[list[tuple[float, tuple]]] = [[]]
        x = 0.0
        for entry in p.legend:
            w = 18.0 + text_width(entry[0], 7.0) + 10.0
            if x and x + w > plot_w:
                rows.append([])
                x = 0.0
            rows[-1].append((x, entry))
            x += w
        for row in rows:
            y += 10.0
            for dx, (label, color, kind) in row:
                sx = left + dx
                if kind == "band":
                    body.append(f'<rect x="{num(sx)}" y="{num(y - 6)}" width="14" height="6" fill="{color}" '
                                f'fill-opacity="0.15" stroke="none"/>\n')
                else:
                    body.append(segment(sx, y - 3, sx + 14, y - 3, color, 1.2))
                body.append(text_element(sx + 18, y, label, 7.0, "black", "start"))
        y += 2.0
    return y + 4.0 if (p.title or p.legend) else y + 2.0


@dataclass(frozen=True, slots=True)
class _Frame:
    """A panel's box on the page (pt) and the data range it shows: the mapping between the two."""

    left: float
    top: float
    w: float
    h: float
    x0: float
    x1: float
    y0: float
    y1: float

    def px(self, x: float) -> float:
        return self.left + (x - self.x0) / (self.x1 - self.x0) * self.w

    def py(self, y: float) -> float:
        return self.top + (self.y1 - y) / (self.y1 - self.y0) * self.h


def _panel(body: list[str], p: Panel, box, xr, yt, ylabels, yexp, xt, xlabels, k: int) -> None:
    f = _Frame(*box, *xr, *p.y_range())
    clipped, free = [], []  # lines and areas stay inside the frame; markers, arrows and text may leave it
    placed: list[tuple[float, float, float, float]] = []  # the boxes of the panel's texts so far (pt)
    for item in p.items:
        text, inside = _item(item, f, placed)
        (clipped if inside else free).append(text)
    if p.axis:
        body += [segment(f.px(t), f.top, f.px(t), f.top + f.h, GRID, 0.8, ' stroke-opacity="0.3"') for t in xt]
        body += [segment(f.left, f.py(t), f.left + f.w, f.py(t), GRID, 0.8, ' stroke-opacity="0.3"') for t in yt]
        body.append(f'<clipPath id="c{k}"><rect x="{num(f.left)}" y="{num(f.top)}" width="{num(f.w)}" '
                    f'height="{num(f.h)}"/></clipPath>\n<g clip-path="url(#c{k})">\n')
        body += clipped + ["</g>\n"]
        body += _axes(f, p, xt, yt, ylabels, yexp, xlabels)
    else:
        body += clipped
    body += free


def _item(item: tuple, f: _Frame, placed: list) -> tuple[str, bool]:
    """One drawn item as SVG, and whether it is clipped to the frame; a text keeps clear of `placed`."""
    kind, px, py = item[0], f.px, f.py
    if kind == "line":
        _, xs, ys, color, width, dash, opacity = item
        return (f'<polyline points="{point_list(xs, ys, px, py)}" fill="none" stroke="{color}" '
                f'stroke-width="{num(width)}"{dash_attrs(dash, opacity)} stroke-linejoin="round"/>\n'), True
    if kind == "polygon":
        _, xs, ys, fill, opacity, edge, width, _ = item
        attrs = f' fill-opacity="{opacity:g}"' if opacity != 1 else ""
        if edge:  # an edge of the fill's own colour fades with it
            attrs += f' stroke="{edge}" stroke-width="{num(width)}"'
            attrs += f' stroke-opacity="{opacity:g}"' if edge == fill and opacity != 1 else ""
        else:
            attrs += ' stroke="none"'
        return f'<polygon points="{point_list(xs, ys, px, py)}" fill="{fill}"{attrs}/>\n', True
    if kind == "hline":
        _, yv, color, width = item
        return segment(f.left, py(yv), f.left + f.w, py(yv), color, width), True
    if kind == "vline":
        _, xv, color, width, dash, opacity = item
        return segment(px(xv), f.top, px(xv), f.top + f.h, color, width, dash_attrs(dash, opacity)), True
    if kind == "ellipse":
        _, xv, yv, rx, ry, face, edge, width = item
        return (f'<ellipse cx="{num(px(xv))}" cy="{num(py(yv))}" rx="{num(rx / (f.x1 - f.x0) * f.w)}" '
                f'ry="{num(ry / (f.y1 - f.y0) * f.h)}" fill="{face}" stroke="{edge}" '
                f'stroke-width="{num(width)}"/>\n'), True
    if kind == "dot":
        _, xv, yv, size, face, edge, ew = item
        return (f'<circle cx="{num(px(xv))}" cy="{num(py(yv))}" r="{num(size / 2)}" fill="{face or "none"}" '
                f'stroke="{edge}" stroke-width="{num(ew)}"/>\n'), False
    if kind == "arrow":
        return arrow(item, px, py), False
    _, xv, yv, s, size, color, anchor, baseline, dx, dy = item  # text
    x, y = px(xv) + dx, py(yv) - dy
    y += clear(label_box(x, y, s, size, anchor, baseline), placed, f.top, f.top + f.h,
               -1 if baseline == "bottom" or dy > 0 else 1)
    return text_element(x, y, s, size, color, anchor, baseline), False


def _axes(f: _Frame, p: Panel, xt, yt, ylabels, yexp, xlabels) -> list[str]:
    """The frame, the ticks with their labels (x labels under the last panel only) and the y label."""
    out = [f'<rect x="{num(f.left)}" y="{num(f.top)}" width="{num(f.w)}" height="{num(f.h)}" fill="none" '
           f'stroke="black" stroke-width="0.8"/>\n']
    for t, label in zip(yt, ylabels):
        out.append(segment(f.left - TICK, f.py(t), f.left, f.py(t), "black", 0.8))
        out.append(text_element(f.left - TICK - 2.0, f.py(t), label, TICK_FONT, "black", "end", "middle"))
    bottom = f.top + f.h
    for i, t in enumerate(xt):
        out.append(segment(f.px(t), bottom, f.px(t), bottom + TICK, "black", 0.8))
        if xlabels is not None:
            out.append(text_element(f.px(t), bottom + TICK + 1.5, xlabels[i], TICK_FONT, "black", "middle", "top"))
    if p.ylabel:
        label = p.ylabel + (_power(yexp) if yexp else "")
        cx, cy = 10.0, f.top + f.h / 2
        out.append(f'<text x="{num(cx)}" y="{num(cy)}" font-size="8" text-anchor="middle" '
                   f'transform="rotate(-90 {num(cx)} {num(cy)})">{escape(label)}</text>\n')
    return out


def _wrap(text: str, size: float, width: float) -> list[str]:
    """A title broken between words into lines no wider than `width` (by the width estimate)."""
    lines: list[str] = []
    for word in text.split(" "):
        if lines and text_width(lines[-1] + " " + word, size) <= width:
            lines[-1] += " " + word
        else:
            lines.append(word)
    return lines


def _power(exp: int) -> str:
    """What an axis label adds when its tick labels are in units of 10^exp."""
    return f", \u00d710{str(exp).translate(_SUPERSCRIPT)}"



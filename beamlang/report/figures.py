"""Figures: Analysis -> deterministic SVG text (loaded member, V, M, slope, deflection) per case and combination."""

from __future__ import annotations

from fractions import Fraction

from beamlang.analysis.display import convert, number
from beamlang.model import LineLoad, MomentLoad, PointLoad, Settlement
from beamlang.pipeline import Analysis
from beamlang.report.drawing import (
    CURVE,
    LABEL_ROOM,
    LOAD,
    changes,
    limit_lines,
    mark_changes_and_hinges,
    mark_extreme,
    sample,
)
from beamlang.report.envelope_figure import envelope_figure, sign_convention_figure
from beamlang.report.load_labels import LoadLabels
from beamlang.report.mode_figure import mode_figure
from beamlang.report.moving_figure import moving_figure
from beamlang.report.svgplot import Figure

PATTERNED = {"force": "V", "moment": "M", "slope": "theta", "deflection": "v"}  # figure quantity -> envelope curve
POINTS_PER_LEVEL = 30.0  # height of one unit of the loads panel (a level is 0.9): labels keep their room


def target_figure(a: Analysis, name: str) -> str:
    """Loads and supports, then V, M, slope and deflection of one case or combination."""
    m = a.loaded.member
    u = a.units
    t = a.solution.target(name)
    r = a.result(name)
    fig = Figure()
    L = float(convert(m.length, u["length"]))
    _draw_member(fig.panel(100.0), a, name, u, L)
    curves = [(t.curves.V, "force", "V", r.shear_max and [r.shear_max]),
              (t.curves.M, "moment", "M", [l for l in (r.moment_positive, r.moment_negative) if l]),
              (t.curves.theta, "slope", "θ", r.slope_max and [r.slope_max]),
              (t.curves.v, "deflection", "v", [l for l in (r.max_down, r.max_up) if l])]
    if r.envelope is not None:  # its extremes come from other group positions than these static curves
        curves = [(curve, quantity, label, None) for curve, quantity, label, _ in curves]
    for curve, quantity, label, marks in curves:
        ax = fig.panel(100.0, LABEL_ROOM)
        drawn = [curve] if r.pattern is None else [r.pattern.curve(PATTERNED[quantity], s) for s in (1, -1)]
        for each in drawn:  # a patterned target: its upper and lower envelope over every arrangement
            xs, ys = sample(each, u[quantity])
            px = [float(convert(x, u["length"])) for x in xs]
            ax.band(px, ys, 0, CURVE, 0.12)
            ax.line(px, ys, color=CURVE, width=1.2)
        ax.hline(0, width=0.6)
        mark_changes_and_hinges(ax, m, u)
        ax.ylabel = f"{label} ({u[quantity]})" + (" envelope" if r.pattern is not None else "")
        if quantity == "deflection" and r.envelope is None:
            limit_lines(ax, m, r, u)
        for loc in marks or []:
            mark_extreme(ax, loc, u, quantity, L)
    ax.xlabel = f"x ({u['length']}) from the left end"
    fig.xlim = (-0.03 * L, 1.03 * L)  # a support symbol at an end fits inside the frame
    return fig.svg()








def _draw_member(ax, a: Analysis, name: str, u: dict, L: float) -> None:
    m = a.loaded.member
    _draw_stretches(ax, m, u, L)
    for sp in m.supports:
        _support(ax, float(convert(sp.x, u["length"])), sp.kind, L)
    factors = {case: f for f, case in _terms(a, name)}
    style = LoadLabels(a, factors, u)
    levels = {1: 0, -1: 0}  # line loads drawn so far above the member (downward loads) and below it (upward)
    loads = [(case.name, ld) for case in m.cases if case.name in factors for ld in case.loads]
    marks = tuple(float(convert(ld.x, u["length"])) for _, ld in loads if isinstance(ld, (PointLoad, MomentLoad)))
    pieces: dict[int, list] = {}  # line loads of one statement (self-weight per stretch): one level, one label
    for _, load in loads:
        if isinstance(load, LineLoad):
            pieces.setdefault(load.span.line, []).append(load)
    for case, load in loads:  # line loads first: the point loads' arrows start above all of them
        if isinstance(load, LineLoad) and len(pieces[load.span.line]) > 1:
            if load is pieces[load.span.line][0]:
                _pieces(ax, pieces[load.span.line], factors[case], u, levels, L, marks, style.text(case, load))
        elif isinstance(load, LineLoad):
            _load(ax, load, factors[case], u, levels, L, marks=marks, text=style.text(case, load))
    top = max(1.1, _base(1, levels[1]) + 0.1)  # where the downward point loads' arrows start
    points = [(c, ld) for c, ld in loads if isinstance(ld, (PointLoad, MomentLoad, Settlement))]
    stack = _point_stacks(ax, points, style, u, L, top)
    drawn = [ld for _, ld in loads if not (isinstance(ld, LineLoad) and len(pieces[ld.span.line]) > 1)]
    low = _lowest(drawn, levels)
    r = a.result(name)
    if r.envelope is None:  # a moving group's reactions depend on where it stands: see its table
        _reactions(ax, m, r, u, L, low)
        low += 0.55
    ax.ylim = (min(-1.7, -(low + 0.2)), max(1.6, 1.0 + 0.9 * levels[1], stack + 0.15))
    ax.height = max(100.0, POINTS_PER_LEVEL * (ax.ylim[1] - ax.ylim[0]))  # more levels: a taller panel, same scale
    ax.yticks = False
    title = f"{name}: loads, supports" + (" and reactions" if r.envelope is None else "")
    if style.factored:
        title += " (factored: " + " + ".join(f"{number(f)} {c}" for c, f in factors.items()) + ")"
    if a.solution.member.moving(name):
        title += "; the moving group is not drawn (see its table)"
    if m.stepped:
        title += "; line weight: stiffer stretches thicker, ticks: changes of section"
    if m.hinges:
        title += "; open circles: hinges"
    ax.title = (title, 8.0)


def _point_stacks(ax, items: list, style: LoadLabels, u: dict, L: float, top: float) -> float:
    """Point loads, moments and settlements. Those that stand together (a dead and a live load at the tip) are
    drawn at their places and labelled one above the other, each label on a line of its own; returns the
    highest label's top."""
    highest = top
    at = lambda ld: float(convert(ld.x, u["length"]))  # noqa: E731
    groups: list[list] = []
    for case, ld in sorted(((c, ld) for c, ld in items if not isinstance(ld, Settlement)), key=lambda i: at(i[1])):
        if groups and at(ld) - at(groups[-1][-1][1]) < 0.12 * L:
            groups[-1].append((case, ld))
        else:
            groups.append([(case, ld)])
    for group in groups:
        y = top + 0.1
        for case, ld in group:
            x = at(ld)
            if isinstance(ld, PointLoad) and ld.force > 0:
                ax.arrow((x, -1.1), (x, -0.05), LOAD, 1.2)
                ax.text(x, -1.2, style.text(case, ld), 7.0, LOAD, _anchor(x, L), "top")
                continue
            if isinstance(ld, PointLoad):
                ax.arrow((x, top), (x, 0.05), LOAD, 1.2)
            else:  # a moment: its mark on the member, a dotted leader up to its label in the stack
                ax.dot(x, 0, 9.0, None, LOAD)
                ax.line([x, x], [0.2, y], color=LOAD, width=0.5, dash="dotted")
            text = style.text(case, ld)
            ax.text(x, y, text, 7.0 if isinstance(ld, PointLoad) else 6.0, LOAD, _anchor(x, L), "bottom")
            y += 0.1 + 0.045 * (7.0 if isinstance(ld, PointLoad) else 6.0) * (1 + text.count("\n"))
        highest = max(highest, y)
    for case, ld in items:
        if isinstance(ld, Settlement):
            _load(ax, ld, style.factors[case], u, {1: 0, -1: 0}, L)
    return highest


def _draw_stretches(ax, m, u: dict, L: float) -> None:
    """The member line (thicker where stiffer on a stepped member), section changes and hinges."""
    if not m.stepped:
        ax.line([0, L], [0, 0], width=3)
    else:
        stiffest = max(float(st.EI) for st in m.stretches)
        for st in m.stretches:
            width = 1.5 + 3.0 * (float(st.EI) / stiffest) ** (1 / 3)
            ax.line([float(convert(st.x1, u["length"])), float(convert(st.x2, u["length"]))], [0, 0], width=width)
        for x in changes(m, u):
            ax.line([x, x], [-0.3, 0.3], color="#555555", width=0.8)
    for h in m.hinges:
        ax.dot(float(convert(h.x, u["length"])), 0, 5.0, "white", "black")






def _lowest(drawn: list, levels: dict[int, int]) -> float:
    """How far below the member line the drawing reaches: supports, settlements, upward forces and loads."""
    low = 1.0
    if any(isinstance(ld, Settlement) for ld in drawn):
        low = 1.6
    if any(isinstance(ld, PointLoad) and ld.force > 0 for ld in drawn):
        low = max(low, 1.5)
    return max(low, 1.2 + 0.9 * levels[-1]) if levels[-1] else low


def _reactions(ax, m, r, u: dict, L: float, low: float) -> None:
    """Each support's reaction written under it, below everything else drawn: the panel is then a free-body
    diagram a checker can sum."""
    for sp, (x, force, moment) in zip(m.supports, r.reactions):  # a zero too: every support is accounted for
        xr = float(convert(x, u["length"]))
        text = f"R = {number(convert(abs(force), u['force']))} {u['force']}" + ("" if force == 0 else
                                                                             " up" if force > 0 else " down")
        if sp.kind == "fixed" and moment != 0:
            turn = "counterclockwise" if moment > 0 else "clockwise"
            text += f"\nM = {number(convert(abs(moment), u['moment']))} {u['moment']} {turn}"
        ax.text(xr, -(low + 0.1), text, 6.0, REACTION, _anchor(xr, L), "top")


def _pieces(ax, group: list, factor: Fraction, u: dict, levels: dict[int, int], L: float, marks: tuple,
            text: str) -> None:
    """A line load given per stretch (self-weight of a stepped member): drawn at one level, labelled once."""
    sign = _side(group[0], factor)
    base = _base(sign, levels[sign])
    for piece in group:
        _load(ax, piece, factor, u, dict(levels), L, label=False)  # every piece at the same level
    levels[sign] += 1
    unit = u["force"] + "/" + u["length"]
    values = sorted({abs(piece.w1 * factor) for piece in group})
    x1, x2 = float(convert(group[0].x1, u["length"])), float(convert(group[-1].x2, u["length"]))
    prefix = text[: text.index("self-weight")] if "self-weight" in text else ""
    ax.text(_label_x(x1, x2, marks, L), (base + 0.85) * sign,
            f"{prefix}{group[0].origin}, {number(convert(values[0], unit))} to {number(convert(values[-1], unit))} "
            f"{unit}", 6.0, LOAD, "middle", "bottom" if sign > 0 else "top")


def _terms(a: Analysis, name: str) -> list[tuple[Fraction, str]]:
    t = a.solution.target(name)
    return [(Fraction(1), name)] if t.kind == "case" else list(t.terms)


def _support(ax, x: float, kind: str, L: float) -> None:
    s = 0.025 * L
    if kind == "fixed":
        side = -1 if x < L / 2 else 1
        ax.line([x, x], [-0.6, 0.6], width=2)
        for i in range(6):
            y = -0.6 + 0.24 * i
            ax.line([x, x + side * s * 0.8], [y, y - 0.2], width=0.8)
        return
    if kind == "spring":
        zig_x = [x, x, x - s / 2, x + s / 2, x - s / 2, x + s / 2, x, x]
        zig_y = [0, -0.2, -0.3, -0.45, -0.6, -0.75, -0.85, -1.0]
        ax.line(zig_x, zig_y, width=0.9)
        ax.line([x - s, x + s], [-1.0, -1.0], width=1.2)
        return
    ax.polygon([x, x - s, x + s], [0, -0.55, -0.55], "white", edge="black", width=0.9)
    if kind == "roller":
        for dx in (-s / 2, s / 2):
            ax.ellipse(x + dx, -0.68, 0.1 * s, 0.1, "white", "black", 0.8)
        ax.line([x - s, x + s], [-0.82, -0.82], width=1.0)
    else:
        ax.line([x - s, x + s], [-0.55, -0.55], width=1.2)


REACTION = "#2e7d32"
SETTLE = "#6a1b9a"


def _anchor(x: float, L: float) -> str:
    """A label centred on its load, or reaching inwards from a load at an end of the member."""
    return "start" if x < 0.08 * L else "end" if x > 0.92 * L else "middle"


def _side(load: LineLoad, factor: Fraction) -> int:
    """1: drawn above the member (a downward load, or a zero one, as a zero point load is), -1: below it."""
    return -1 if (load.w1 + load.w2) * factor > 0 else 1


def _base(sign: int, level: int) -> float:
    """Distance from the member line to the near edge of a line load at a level; below the member the first
    level starts under the support symbols."""
    return (0.1 if sign > 0 else 1.15) + 0.9 * level


def _label_x(x1: float, x2: float, marks: tuple, L: float) -> float:
    """Where along a line load its label goes: the middle, or a quarter from either end when a point load's
    arrow or a moment's mark stands near the middle (the place farthest from every such mark)."""
    places = ((x1 + x2) / 2, x1 + (x2 - x1) / 4, x2 - (x2 - x1) / 4)
    room = [min((abs(x - k) for k in marks), default=L) for x in places]
    return places[0] if room[0] >= 0.1 * L else places[room.index(max(room))]


def _load(ax, load, factor: Fraction, u: dict, levels: dict[int, int], L: float, label: bool = True,
          marks: tuple = (), text: str | None = None) -> None:
    """Draw one load; line loads stack outwards from the member (downward ones above it, upward ones below)
    so that none hides another; `levels` counts the levels taken on each side, `marks` are the x of the
    point loads and moments, which line-load labels keep clear of."""
    if isinstance(load, PointLoad):
        x = float(convert(load.x, u["length"]))
        up = load.force > 0
        ax.arrow((x, 1.1 if not up else -1.1), (x, 0.05 if not up else -0.05), LOAD, 1.2)
        ax.text(x, 1.2 if not up else -1.2, number(convert(abs(load.force * factor), u["force"])) + f" {u['force']}",
                7.0, LOAD, _anchor(x, L), "bottom" if not up else "top")
    elif isinstance(load, MomentLoad):
        x = float(convert(load.x, u["length"]))
        turn = "counterclockwise" if load.moment > 0 else "clockwise"
        ax.dot(x, 0, 9.0, None, LOAD)
        under = sum(abs(k - x) < 0.02 * L for k in marks) > 1  # a point load's arrow stands here: label below
        ax.text(x, -0.35 if under else 0.35, f"{number(convert(abs(load.moment * factor), u['moment']))} "
                f"{u['moment']}\n{turn}", 6.0, LOAD, _anchor(x, L), "top" if under else "bottom")
    elif isinstance(load, Settlement):
        x = float(convert(load.x, u["length"]))
        down = load.movement < 0
        ax.arrow((x, -0.75 if down else -1.25), (x, -1.25 if down else -0.75), SETTLE, 1.0, filled=True)
        ax.text(x, -1.35, f"settles {number(convert(abs(load.movement * factor), u['deflection']))} {u['deflection']}"
                + ("" if down else " up"), 6.0, SETTLE, _anchor(x, L), "top")
    elif isinstance(load, LineLoad):
        x1, x2 = float(convert(load.x1, u["length"])), float(convert(load.x2, u["length"]))
        w1, w2 = load.w1 * factor, load.w2 * factor
        big = max(abs(w1), abs(w2)) or 1
        h1, h2 = 0.2 + 0.6 * float(abs(w1) / big), 0.2 + 0.6 * float(abs(w2) / big)
        sign = _side(load, factor)
        base = _base(sign, levels[sign])
        levels[sign] += 1
        ax.polygon([x1, x1, x2, x2], [base * sign, (base + h1 * 0.8) * sign, (base + h2 * 0.8) * sign, base * sign],
                   LOAD, 0.15, edge=LOAD, width=0.8)
        _line_arrows(ax, x1, x2, base, base + h1 * 0.8, base + h2 * 0.8, sign, L)
        h1, h2 = base + h1 * 0.8 - 0.1, base + h2 * 0.8 - 0.1
        if text is None:
            unit = u["force"] + "/" + u["length"]
            text = (number(convert(abs(w1), unit)) if w1 == w2 else
                    f"{number(convert(abs(w1), unit))} to {number(convert(abs(w2), unit))}") + f" {unit}"
        if label:
            ax.text(_label_x(x1, x2, marks, L), (0.15 + max(h1, h2)) * sign, text, 6.0, LOAD, "middle",
                    "bottom" if sign > 0 else "top")


def _line_arrows(ax, x1: float, x2: float, base: float, top1: float, top2: float, sign: int, L: float) -> None:
    """Arrows inside a line load's outline, from its outer edge to the edge near the member, pointing the way
    the load acts: about every L/16, at least one at each end, where the outline is tall enough to hold one."""
    n = max(1, round((x2 - x1) / (L / 16)))
    for i in range(n + 1):
        x = x1 + (x2 - x1) * (0.04 + 0.92 * i / n) if n else (x1 + x2) / 2
        outer = top1 + (top2 - top1) * (x - x1) / (x2 - x1 or 1)
        if outer - base >= 0.3:
            ax.arrow((x, outer * sign), (x, base * sign), LOAD, 0.6)


def figure_names(a: Analysis) -> dict[str, str]:
    """Figure key -> file name: "sign convention", "(envelope)", every target's name, and "(moving) NAME" for
    the influence lines and envelopes of each target with a moving group (no case name has a space)."""
    out = {"sign convention": "sign-convention.svg", "(envelope)": "envelope.svg"}
    out.update({f"(mode) {k}": f"mode-{k + 1}.svg" for k in range(len(a.frequencies))})
    for i, t in enumerate(a.solution.targets, start=1):
        moving = a.solution.member.moving(t.name)
        if not moving or any(p.coeffs for p in t.curves.v.pieces):  # a moving case alone has no static curves
            out[t.name] = f"{i:02d}-{_safe(t.name)}.svg"
        if moving:
            out[f"(moving) {t.name}"] = f"{i:02d}-{_safe(t.name)}-moving.svg"
    return out


def all_figures(a: Analysis) -> dict[str, str]:
    """{file name: SVG text} for the whole package, file names sorted and safe."""
    out = {}
    for key, file in figure_names(a).items():
        if key == "sign convention":
            out[file] = sign_convention_figure()
        elif key == "(envelope)":
            out[file] = envelope_figure(a)
        elif key.startswith("(mode) "):
            out[file] = mode_figure(a, int(key.removeprefix("(mode) ")))
        elif key.startswith("(moving) "):
            out[file] = moving_figure(a, key.removeprefix("(moving) "))
        else:
            out[file] = target_figure(a, key)
    return dict(sorted(out.items()))


def _safe(name: str) -> str:
    return "".join(ch if ch.isalnum() or ch in "-_" else "-" for ch in name)

"""Figures: Analysis -> deterministic SVG text (loaded member, V, M, slope, deflection) per case and combination."""

from __future__ import annotations

import io
from fractions import Fraction

from ..display import convert, number, report_units
from ..model import LineLoad, MomentLoad, PointLoad, Settlement
from ..pipeline import Analysis

SAMPLES_PER_SEGMENT = 40


def _pyplot():
    import matplotlib
    matplotlib.use("Agg")
    import matplotlib.pyplot as plt
    matplotlib.rcParams.update({"svg.hashsalt": "beamlang", "svg.fonttype": "path", "font.size": 8,
                                "font.family": "DejaVu Sans", "axes.grid": True, "grid.alpha": 0.3})
    return plt


def _svg(fig) -> str:
    buf = io.StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None, "Creator": None})
    _pyplot().close(fig)
    return buf.getvalue()


def target_figure(a: Analysis, name: str) -> str:
    """Loads and supports, then V, M, slope and deflection of one case or combination."""
    plt = _pyplot()
    m = a.loaded.member
    u = report_units(m)
    t = a.solution.target(name)
    r = a.result(name)
    fig, axes = plt.subplots(5, 1, figsize=(7.0, 9.0), sharex=True, layout=None)
    fig.subplots_adjust(hspace=0.35, left=0.12, right=0.97, top=0.97, bottom=0.05)
    L = float(convert(m.length, u["length"]))
    _draw_member(axes[0], a, name, u, L)
    curves = [(t.curves.V, "force", "V", r.shear_max and [r.shear_max]),
              (t.curves.M, "moment", "M", [l for l in (r.moment_positive, r.moment_negative) if l]),
              (t.curves.theta, "slope", "θ", r.slope_max and [r.slope_max]),
              (t.curves.v, "deflection", "v", [l for l in (r.max_down, r.max_up) if l])]
    if r.envelope is not None:  # its extremes come from other group positions than these static curves
        curves = [(curve, quantity, label, None) for curve, quantity, label, _ in curves]
    for ax, (curve, quantity, label, marks) in zip(axes[1:], curves):
        xs, ys = _sample(curve, u[quantity])
        ax.plot([convert(x, u["length"]) for x in xs], ys, color="#1f4e79", linewidth=1.2)
        ax.fill_between([float(convert(x, u["length"])) for x in xs], ys, 0, color="#1f4e79", alpha=0.12)
        ax.axhline(0, color="black", linewidth=0.6)
        mark_changes_and_hinges(ax, m, u)
        ax.set_ylabel(f"{label} ({u[quantity]})")
        for loc in marks or []:
            x, y = float(convert(loc.x, u["length"])), float(convert(loc.value, u[quantity]))
            ax.plot([x], [y], "o", color="#b22222", markersize=3)
            right = x > 0.6 * L  # keep the label inside the axes
            ax.annotate(f"{number(y)} at {number(x)} {u['length']}", (x, y), textcoords="offset points",
                        xytext=(-4 if right else 4, 4 if y >= 0 else -10), ha="right" if right else "left",
                        fontsize=7, color="#b22222")
    axes[-1].set_xlabel(f"x ({u['length']}) from the left end")
    axes[-1].set_xlim(-0.02 * L, 1.02 * L)
    return _svg(fig)


def _sample(curve, unit: str) -> tuple[list[Fraction], list[float]]:
    """Points on every segment, both sides of each breakpoint (jumps stay vertical)."""
    xs, ys = [], []
    for k, p in enumerate(curve.pieces):
        a, b = curve.xs[k], curve.xs[k + 1]
        for i in range(SAMPLES_PER_SEGMENT + 1):
            x = a + (b - a) * Fraction(i, SAMPLES_PER_SEGMENT)
            xs.append(x)
            ys.append(float(convert(p(x), unit)))
    return xs, ys


def _draw_member(ax, a: Analysis, name: str, u: dict, L: float) -> None:
    m = a.loaded.member
    _draw_stretches(ax, m, u, L)
    for sp in m.supports:
        _support(ax, float(convert(sp.x, u["length"])), sp.kind, L)
    factors = {case: f for f, case in _terms(a, name)}
    stack = 0
    for case in m.cases:
        if case.name not in factors:
            continue
        pieces: dict[int, list] = {}  # line loads of one statement (self-weight per stretch): one level, one label
        for load in case.loads:
            if isinstance(load, LineLoad):
                pieces.setdefault(load.span.line, []).append(load)
        for load in case.loads:
            if isinstance(load, LineLoad) and len(pieces[load.span.line]) > 1:
                group = pieces[load.span.line]
                if load is group[0]:
                    _pieces(ax, group, factors[case.name], u, stack)
                    stack += 1
                continue
            stack += _load(ax, load, factors[case.name], u, stack)
    ax.set_ylim(-1.7, max(1.6, 1.0 + 0.9 * stack))
    ax.set_yticks([])
    title = f"{name}: loads and supports" + ("" if len(factors) == 1 else " (factored)")
    if a.solution.member.moving(name):
        title += "; the moving group is not drawn (see its table)"
    if m.stepped:
        title += "; line weight: stiffer stretches thicker, ticks: changes of section"
    if m.hinges:
        title += "; open circles: hinges"
    ax.set_title(title, fontsize=8, loc="left")


def _draw_stretches(ax, m, u: dict, L: float) -> None:
    """The member line (thicker where stiffer on a stepped member), section changes and hinges."""
    if not m.stepped:
        ax.plot([0, L], [0, 0], color="black", linewidth=3)
    else:
        stiffest = max(float(st.EI) for st in m.stretches)
        for st in m.stretches:
            width = 1.5 + 3.0 * (float(st.EI) / stiffest) ** (1 / 3)
            ax.plot([float(convert(st.x1, u["length"])), float(convert(st.x2, u["length"]))], [0, 0],
                    color="black", linewidth=width, solid_capstyle="butt")
        for x in changes(m, u):
            ax.plot([x, x], [-0.3, 0.3], color="#555555", linewidth=0.8)
    for h in m.hinges:
        ax.plot([float(convert(h.x, u["length"]))], [0], marker="o", markersize=5, markerfacecolor="white",
                markeredgecolor="black", markeredgewidth=1.0, zorder=5)


def changes(m, u: dict) -> list[float]:
    """Where the section or material changes, in report length units."""
    return [float(convert(st.x1, u["length"])) for st in m.stretches[1:]]


def mark_changes_and_hinges(ax, m, u: dict) -> None:
    """Dotted verticals on a curve's axes where the section changes and at every hinge."""
    for x in changes(m, u) + [float(convert(h.x, u["length"])) for h in m.hinges]:
        ax.axvline(x, color="#777777", linewidth=0.6, linestyle=":")


def _pieces(ax, group: list, factor: Fraction, u: dict, stack: int) -> None:
    """A line load given per stretch (self-weight of a stepped member): drawn at one level, labelled once."""
    for piece in group:
        _load(ax, piece, factor, u, stack, label=False)
    unit = u["force"] + "/" + u["length"]
    values = sorted({abs(piece.w1 * factor) for piece in group})
    x1, x2 = float(convert(group[0].x1, u["length"])), float(convert(group[-1].x2, u["length"]))
    sign = 1 if group[0].w1 * factor < 0 else -1
    ax.text((x1 + x2) / 2, (0.25 + 0.9 * stack + 0.7) * sign,
            f"{group[0].origin}, {number(convert(values[0], unit))} to {number(convert(values[-1], unit))} {unit}",
            ha="center", va="bottom" if sign > 0 else "top", fontsize=6, color="#8b4513")


def _terms(a: Analysis, name: str) -> list[tuple[Fraction, str]]:
    t = a.solution.target(name)
    return [(Fraction(1), name)] if t.kind == "case" else list(t.terms)


def _support(ax, x: float, kind: str, L: float) -> None:
    s = 0.025 * L
    if kind == "fixed":
        side = -1 if x < L / 2 else 1
        ax.plot([x, x], [-0.6, 0.6], color="black", linewidth=2)
        for i in range(6):
            y = -0.6 + 0.24 * i
            ax.plot([x, x + side * s * 0.8], [y, y - 0.2], color="black", linewidth=0.8)
        return
    if kind == "spring":
        zig_x = [x, x, x - s / 2, x + s / 2, x - s / 2, x + s / 2, x, x]
        zig_y = [0, -0.2, -0.3, -0.45, -0.6, -0.75, -0.85, -1.0]
        ax.plot(zig_x, zig_y, color="black", linewidth=0.9)
        ax.plot([x - s, x + s], [-1.0, -1.0], color="black", linewidth=1.2)
        return
    ax.fill([x, x - s, x + s], [0, -0.55, -0.55], facecolor="white", edgecolor="black", linewidth=0.9)
    if kind == "roller":
        for dx in (-s / 2, s / 2):
            ax.add_patch(_circle((x + dx, -0.68), 0.1 * s))
        ax.plot([x - s, x + s], [-0.82, -0.82], color="black", linewidth=1.0)
    else:
        ax.plot([x - s, x + s], [-0.55, -0.55], color="black", linewidth=1.2)


def _circle(center, radius):
    from matplotlib.patches import Ellipse
    return Ellipse(center, 2 * radius, 0.2, facecolor="white", edgecolor="black", linewidth=0.8)


def _load(ax, load, factor: Fraction, u: dict, stack: int, label: bool = True) -> int:
    """Draw one load; distributed loads stack upwards so that none hides another. Returns 1 if stacked."""
    color = "#8b4513"
    if isinstance(load, PointLoad):
        x = float(convert(load.x, u["length"]))
        up = load.force > 0
        ax.annotate("", xy=(x, 0.05 if not up else -0.05), xytext=(x, 1.1 if not up else -1.1),
                    arrowprops={"arrowstyle": "->", "color": color, "linewidth": 1.2})
        ax.text(x, 1.2 if not up else -1.2, number(convert(abs(load.force * factor), u["force"])) + f" {u['force']}",
                ha="center", va="bottom" if not up else "top", fontsize=7, color=color)
    elif isinstance(load, MomentLoad):
        x = float(convert(load.x, u["length"]))
        turn = "counterclockwise" if load.moment > 0 else "clockwise"
        ax.plot([x], [0], marker="o", markersize=9, markerfacecolor="none", markeredgecolor=color)
        ax.text(x, 0.35, f"{number(convert(abs(load.moment * factor), u['moment']))} {u['moment']}\n{turn}",
                ha="center", va="bottom", fontsize=6, color=color)
        return 0
    elif isinstance(load, Settlement):
        x = float(convert(load.x, u["length"]))
        down = load.movement < 0
        ax.annotate("", xy=(x, -1.25 if down else -0.75), xytext=(x, -0.75 if down else -1.25),
                    arrowprops={"arrowstyle": "-|>", "color": "#6a1b9a", "linewidth": 1.0})
        ax.text(x, -1.35, f"settles {number(convert(abs(load.movement * factor), u['deflection']))} {u['deflection']}"
                + ("" if down else " up"), ha="center", va="top", fontsize=6, color="#6a1b9a")
    elif isinstance(load, LineLoad):
        x1, x2 = float(convert(load.x1, u["length"])), float(convert(load.x2, u["length"]))
        w1, w2 = load.w1 * factor, load.w2 * factor
        big = max(abs(w1), abs(w2)) or 1
        h1, h2 = 0.2 + 0.6 * float(abs(w1) / big), 0.2 + 0.6 * float(abs(w2) / big)
        sign = 1 if (w1 + w2) < 0 else -1  # downward loads drawn above the member
        base = 0.1 + 0.9 * stack
        ax.fill([x1, x1, x2, x2], [base * sign, (base + h1 * 0.8) * sign, (base + h2 * 0.8) * sign, base * sign],
                facecolor=color, alpha=0.15, edgecolor=color, linewidth=0.8)
        h1, h2 = base + h1 * 0.8 - 0.1, base + h2 * 0.8 - 0.1
        unit = u["force"] + "/" + u["length"]
        text = number(convert(abs(w1), unit)) if w1 == w2 else f"{number(convert(abs(w1), unit))} to {number(convert(abs(w2), unit))}"
        if label:
            ax.text((x1 + x2) / 2, (0.15 + max(h1, h2)) * sign, f"{text} {unit}", ha="center",
                    va="bottom" if sign > 0 else "top", fontsize=6, color=color)
        return 1
    return 0


def sign_convention_figure() -> str:
    """x to the right from the left end; up positive; sagging positive; counterclockwise positive."""
    plt = _pyplot()
    fig, ax = plt.subplots(figsize=(5.0, 1.6), layout=None)
    ax.set_axis_off()
    ax.plot([0, 10], [0, 0], color="black", linewidth=3)
    ax.annotate("", xy=(11.5, 0), xytext=(10.2, 0), arrowprops={"arrowstyle": "->"})
    ax.text(11.6, 0, "x", va="center")
    ax.annotate("", xy=(1, 2.2), xytext=(1, 0.3), arrowprops={"arrowstyle": "->", "color": "#1f4e79"})
    ax.text(1.2, 1.6, "v, forces, reactions: + up", fontsize=7, color="#1f4e79")
    ax.plot([5.5], [0], marker="o", markersize=14, markerfacecolor="none", markeredgecolor="#8b4513")
    ax.text(5.9, 0.5, "moments, slope: + counterclockwise", fontsize=7, color="#8b4513")
    ax.plot([7, 8, 9], [-1.2, -1.7, -1.2], color="#b22222")
    ax.text(9.2, -1.5, "M > 0: sagging", fontsize=7, color="#b22222")
    ax.set_xlim(-0.5, 12.5)
    ax.set_ylim(-2.2, 2.5)
    return _svg(fig)


def envelope_targets(a: Analysis) -> list[str]:
    """The combinations, or the cases when there are none."""
    combos = [t.name for t in a.solution.targets if t.kind == "combination"]
    return combos or [t.name for t in a.solution.targets]


def envelope_figure(a: Analysis) -> str:
    """M and v of every combination on one figure, with the upper and lower envelope."""
    plt = _pyplot()
    u = report_units(a.loaded.member)
    names = envelope_targets(a)
    fig, axes = plt.subplots(2, 1, figsize=(7.0, 4.6), sharex=True, layout=None)
    fig.subplots_adjust(hspace=0.25, left=0.12, right=0.97, top=0.93, bottom=0.1)
    for ax, attr, quantity, label in ((axes[0], "M", "moment", "M"), (axes[1], "v", "deflection", "v")):
        series = []
        for i, name in enumerate(names):
            xs, ys = _sample(getattr(a.solution.target(name).curves, attr), u[quantity])
            x = [float(convert(p, u["length"])) for p in xs]
            tag = f"{name} (static part)" if a.solution.member.moving(name) else name
            ax.plot(x, ys, linewidth=0.9, label=tag, color=_PALETTE[i % len(_PALETTE)])
            series.append(ys)
        ax.fill_between(x, [max(col) for col in zip(*series)], [min(col) for col in zip(*series)],
                        color="#888888", alpha=0.15, label="envelope")
        ax.axhline(0, color="black", linewidth=0.6)
        ax.set_ylabel(f"{label} ({u[quantity]})")
    axes[0].legend(fontsize=7, loc="best")
    axes[0].set_title("Envelope of " + ("the combinations" if len(names) < len(a.solution.targets) or
                                       all(t.kind == "combination" for t in a.solution.targets) else "the cases"),
                      fontsize=8, loc="left")
    axes[1].set_xlabel(f"x ({u['length']}) from the left end")
    return _svg(fig)


_PALETTE = ("#1f4e79", "#b22222", "#2e7d32", "#8b4513", "#6a1b9a", "#00838f")


def figure_names(a: Analysis) -> dict[str, str]:
    """Figure key -> file name: "sign convention", "(envelope)", every target's name, and "(moving) NAME" for
    the influence lines and envelopes of each target with a moving group (no case name has a space)."""
    out = {"sign convention": "sign-convention.svg", "(envelope)": "envelope.svg"}
    for i, t in enumerate(a.solution.targets, start=1):
        moving = a.solution.member.moving(t.name)
        if not moving or any(p.coeffs for p in t.curves.v.pieces):  # a moving case alone has no static curves
            out[t.name] = f"{i:02d}-{_safe(t.name)}.svg"
        if moving:
            out[f"(moving) {t.name}"] = f"{i:02d}-{_safe(t.name)}-moving.svg"
    return out


def all_figures(a: Analysis) -> dict[str, str]:
    """{file name: SVG text} for the whole package, file names sorted and safe."""
    from .moving_figure import moving_figure
    out = {}
    for key, file in figure_names(a).items():
        if key == "sign convention":
            out[file] = sign_convention_figure()
        elif key == "(envelope)":
            out[file] = envelope_figure(a)
        elif key.startswith("(moving) "):
            out[file] = moving_figure(a, key.removeprefix("(moving) "))
        else:
            out[file] = target_figure(a, key)
    return dict(sorted(out.items()))


def _safe(name: str) -> str:
    return "".join(ch if ch.isalnum() or ch in "-_" else "-" for ch in name)

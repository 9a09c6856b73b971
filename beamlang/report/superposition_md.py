"""A case's superposition in the calc package: its loads as written and in SI, each load's own curve and general formula, the
compatibility equations, the superposed curves."""

from __future__ import annotations

from beamlang.analysis.display import convert, scaled, working_units
from beamlang.analysis.working import formulas_shown, load_deflection, settlements
from beamlang.language.fmt import statement_text
from beamlang.model import LineLoad
from beamlang.pipeline import Analysis
from beamlang.poly import runs as merged
from beamlang.report.sections import vector
from beamlang.report.selfweight import self_weight_lines
from beamlang.report.formula_md import formula_lines
from beamlang.report.tex import cell, md, plain, poly
from beamlang.report.tributary import tributary_lines


def loads_table(a: Analysis, t) -> list[str]:
    if not t.loads:  # a case that holds only a moving group: its forces are listed with the group
        return ["### Loads", "", "No static loads: the case holds only the moving group, whose forces and travel "
                "are given under Moving load below.", ""] + self_weight_lines(a, t)
    doc_lines = {st.span.line: st for _, st in a.loaded.document.statements}
    w = working_units(a.units)
    rows = [f"| {ld.span.line} | `{cell(statement_text(doc_lines[ld.span.line]))}` | {_load_value(ld, w)} |"
            for ld in t.loads]
    units = "SI" if w["length"] == "m" else f"{w['force']}, {_dot(w['moment'])}, {w['line load']}, {w['length']}"
    return ["### Loads", "", f"| line | load as written | in {units} (signs: up and counterclockwise positive) |",
            "|---|---|---|", *rows, ""] + tributary_lines(a, t) + self_weight_lines(a, t)


def _load_value(ld, w: dict[str, str]) -> str:
    kind = type(ld).__name__
    L, F, M, q, d = w["length"], w["force"], w["moment"], w["line load"], w["deflection"]
    pos = lambda x: f"{plain(convert(x, L))} {L}"  # noqa: E731
    if kind == "PointLoad":
        return f"P = {plain(convert(ld.force, F))} {F} at x = {pos(ld.x)}"
    if kind == "MomentLoad":
        return f"C = {plain(convert(ld.moment, M))} {_dot(M)} at x = {pos(ld.x)}"
    if kind == "Settlement":
        return (f"support at x = {pos(ld.x)} moves Δ = {plain(convert(ld.movement, d))} {d} "
                "(prescribed; carries no force)")
    if ld.w1 == ld.w2:
        return f"w = {plain(convert(ld.w1, q))} {q} from x = {pos(ld.x1)} to {pos(ld.x2)}"
    return (f"w from {plain(convert(ld.w1, q))} {q} at x = {pos(ld.x1)} to {plain(convert(ld.w2, q))} {q} "
            f"at x = {pos(ld.x2)}")


def _dot(unit: str) -> str:
    return unit.replace("*", "·")


def runs(*curves):
    """(start, end, pieces) with neighbouring segments merged where every curve has the same formula."""
    return [(start, end, tuple(c.pieces[k] for c in curves)) for k, start, end in merged(curves)]


def x_range(start, end, length: str = "m") -> str:
    """A segment's ends in the length unit the curves are shown in."""
    return f"{plain(convert(start, length))} ≤ x ≤ {plain(convert(end, length))}"


def each_load(a: Analysis, t, shown: dict | None = None) -> list[str]:
    if not t.loads:  # only a moving group: its response is the envelope below, not one elastic curve
        return []
    w = working_units(a.units)
    L, d = w["length"], w["deflection"]
    symbolic = formulas_shown(a.solution)
    lines = ["### Each load's elastic curve", "",
             "Each load is solved alone on this member. " + (
                 "First its general formula, derived by the engine for this support layout (the table formula "
                 "for this case), with the value of every symbol; then " if symbolic else
                 "(General formulas are not shown for members with springs, hinges, changes of section or more "
                 "than two redundants: they run to many lines.) ") +
             f"v(x) in {d} with x in {L}, coefficients shown to six significant digits (computed exactly). "
             "The case curve is their sum.", ""]
    shown = {} if shown is None else shown  # the general formulas written out before (formula_lines)
    for ld in t.loads:
        deflection = load_deflection(a.solution, ld)
        shared = sum(1 for other in t.loads if other.span.line == ld.span.line) > 1  # self-weight per stretch
        where = (f" ({plain(convert(ld.x1, L))} {L} to {plain(convert(ld.x2, L))} {L})"
                 if shared and isinstance(ld, LineLoad) else "")
        lines += [f"Load of line {ld.span.line}{where}:", ""]
        if symbolic:
            lines += formula_lines(a, ld, shown, f"case {md(t.name)}")
        lines += [f"| segment (x in {L}) | v(x) in {d} |", "|---|---|"]
        for start, end, (p,) in runs(deflection):
            lines.append(f"| {x_range(start, end, L)} | ${poly(scaled(p, L, d))}$ |")
        lines.append("")
    return lines


def compatibility(a: Analysis, t) -> list[str]:
    p = a.solution.primary
    if not p.redundants:
        return []
    s = t.solved
    m = a.loaded.member
    w = working_units(a.units)
    moved = settlements(m, s.loads)
    delta = [moved.get(m.supports[r.support].x, 0) if r.kind == "force" else 0 for r in p.redundants]
    move_units = [w["deflection"] if r.kind == "force" else "rad" for r in p.redundants]
    force_units = [w["force"] if r.kind == "force" else w["moment"] for r in p.redundants]
    d0 = vector(s.displacements, move_units)
    x = vector(s.redundants, force_units)
    names = "; ".join(f"X{j} the {'force' if r.kind == 'force' else 'moment'} of the "
                      f"{m.supports[r.support].kind} at {plain(convert(m.supports[r.support].x, w['length']))} "
                      f"{w['length']}" for j, r in enumerate(p.redundants, start=1))
    if not any(delta):
        return ["### Compatibility", "",
                "Displacements D0 of the primary beam at the released restraints under this case, and the "
                f"redundants solved exactly from A X = -D0 ({names}):", "",
                f"$$D_0 = {d0}, \\qquad X = -A^{{-1}} D_0 = {x}$$", ""]
    return ["### Compatibility", "",
            "Displacements D0 of the primary beam at the released restraints under this case, the prescribed "
            f"settlements Δ there, and the redundants solved exactly from A X = Δ - D0 ({names}):", "",
            f"$$D_0 = {d0}, \\qquad \\Delta = {vector(delta, move_units)}, \\qquad "
            f"X = A^{{-1}} (\\Delta - D_0) = {x}$$", ""]


def superposed(a: Analysis, t) -> list[str]:
    c = t.curves
    w = working_units(a.units)
    L, F, M, d = w["length"], w["force"], w["moment"], w["deflection"]
    lines = ["### Superposed curves", "", f"The sums of the load curves; x in {L}.", "",
             f"| segment | V(x) in {F} | M(x) in {_dot(M)} |", "|---|---|---|"]
    for start, end, (V, Mx) in runs(c.V, c.M):
        lines.append(f"| {x_range(start, end, L)} | ${poly(scaled(V, L, F))}$ | ${poly(scaled(Mx, L, M))}$ |")
    if c.vs is not None:
        return lines + _with_shear(c, L, d)
    lines += ["", f"θ(x) is the slope dv/dx in rad (v and x taken in the same unit); x in {L}.", "",
              f"| segment | θ(x) in rad | v(x) in {d} |", "|---|---|---|"]
    for start, end, (theta, v) in runs(c.theta, c.v):
        lines.append(f"| {x_range(start, end, L)} | ${poly(scaled(theta, L, 'rad'))}$ | ${poly(scaled(v, L, d))}$ |")
    return lines + [""]


def _with_shear(c, L: str, d: str) -> list[str]:
    """θ, then the deflection's bending and shear parts side by side, and their sum."""
    lines = ["", f"θ(x) is the rotation of the cross-section in rad; the deflection v(x) is its bending part "
             f"v_b(x) plus its shear part v_s(x); x in {L}.", "",
             f"| segment | θ(x) in rad | v_b(x) in {d} | v_s(x) in {d} | v(x) in {d} |", "|---|---|---|---|---|"]
    vb = c.v + c.vs * -1
    for start, end, (theta, b, sh, v) in runs(c.theta, vb, c.vs, c.v):
        lines.append(f"| {x_range(start, end, L)} | ${poly(scaled(theta, L, 'rad'))}$ | ${poly(scaled(b, L, d))}$ | "
                     f"${poly(scaled(sh, L, d))}$ | ${poly(scaled(v, L, d))}$ |")
    return lines + [""]

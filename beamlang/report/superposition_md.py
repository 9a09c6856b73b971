"""A case's superposition in the calc package: its loads as written and in SI, each load's own curve and general formula, the
compatibility equations, the superposed curves."""

from __future__ import annotations

from beamlang.analysis.working import formulas_shown, general_formula, load_deflection, settlements
from beamlang.language.fmt import statement_text
from beamlang.model import LineLoad
from beamlang.pipeline import Analysis
from beamlang.report.sections import vector
from beamlang.report.tex import cell, num, plain, poly, sympy_tex


def loads_table(a: Analysis, t) -> list[str]:
    doc_lines = {st.span.line: st for _, st in a.loaded.document.statements}
    rows = [f"| {ld.span.line} | `{cell(statement_text(doc_lines[ld.span.line]))}` | {_load_si(ld)} |" for ld in t.loads]
    return ["### Loads", "", "| line | load as written | in SI (signs: up and counterclockwise positive) |",
            "|---|---|---|", *rows, ""]


def _load_si(ld) -> str:
    kind = type(ld).__name__
    if kind == "PointLoad":
        return f"P = {plain(ld.force)} N at x = {plain(ld.x)} m"
    if kind == "MomentLoad":
        return f"C = {plain(ld.moment)} N·m at x = {plain(ld.x)} m"
    if kind == "Settlement":
        return f"support at x = {plain(ld.x)} m moves Δ = {plain(ld.movement)} m (prescribed; carries no force)"
    if ld.w1 == ld.w2:
        return f"w = {plain(ld.w1)} N/m from x = {plain(ld.x1)} m to {plain(ld.x2)} m"
    return f"w from {plain(ld.w1)} N/m at x = {plain(ld.x1)} m to {plain(ld.w2)} N/m at x = {plain(ld.x2)} m"


def runs(xs, *curves):
    """(start, end, pieces) with neighbouring segments merged where every curve has the same formula."""
    out = []
    for k in range(len(xs) - 1):
        pieces = tuple(c.pieces[k] for c in curves)
        if out and out[-1][2] == pieces:
            out[-1] = (out[-1][0], xs[k + 1], pieces)
        else:
            out.append((xs[k], xs[k + 1], pieces))
    return out


def x_range(start, end) -> str:
    return f"{plain(start)} ≤ x ≤ {plain(end)}"


def each_load(a: Analysis, t) -> list[str]:
    m = a.loaded.member
    symbolic = formulas_shown(a.solution)
    lines = ["### Each load's elastic curve", "",
             "Each load is solved alone on this member. " + (
                 "First its general formula, derived by the engine for this support layout (the table formula "
                 "for this case), with the value of every symbol; then " if symbolic else
                 "(General formulas are not shown for members with springs, hinges, changes of section or more "
                 "than two redundants: they run to many lines.) ") +
             "v(x) in m with x in m, coefficients shown to six significant digits (computed exactly). "
             "The case curve is their sum.", ""]
    xs = a.solution.xs
    for ld in t.loads:
        deflection = load_deflection(a.solution, ld)
        shared = sum(1 for other in t.loads if other.span.line == ld.span.line) > 1  # self-weight per stretch
        where = f" ({plain(ld.x1)} m to {plain(ld.x2)} m)" if shared and isinstance(ld, LineLoad) else ""
        lines += [f"Load of line {ld.span.line}{where}:", ""]
        if symbolic:
            lines += _formula(m, ld)
        lines += ["| segment | v(x) |", "|---|---|"]
        for start, end, (p,) in runs(xs, deflection):
            lines.append(f"| {x_range(start, end)} | ${poly(p)}$ |")
        lines.append("")
    return lines


def _formula(m, ld) -> list[str]:
    segments, names = general_formula(m, ld)
    out = []
    for start, end, expr in segments:
        out += [f"$$v(x) = {sympy_tex(expr)} \\qquad ({plain(start)} \\le x \\le {plain(end)})$$", ""]
    values = ", ".join(f"${_symbol(n)} = {num(v)}$" for n, v in names.items())
    return out + [f"with {values} (SI units).", ""]


def _symbol(name: str) -> str:
    base, _, sub = name.partition("_")
    return f"{base}_{{{sub}}}" if sub else base


def compatibility(a: Analysis, t) -> list[str]:
    p = a.solution.primary
    if not p.redundants:
        return []
    s = t.solved
    moved = settlements(a.loaded.member, s.loads)
    delta = [moved.get(a.loaded.member.supports[r.support].x, 0) if r.kind == "force" else 0 for r in p.redundants]
    if not any(delta):
        return ["### Compatibility", "",
                "Displacements of the primary beam at the released restraints under this case, and the "
                "redundants solved exactly from A X = -D0:", "",
                f"$$D_0 = {vector(s.displacements)}, \\qquad X = -A^{{-1}} D_0 = {vector(s.redundants)}$$", ""]
    return ["### Compatibility", "",
            "Displacements of the primary beam at the released restraints under this case, the prescribed "
            "settlements Δ there, and the redundants solved exactly from A X = Δ - D0:", "",
            f"$$D_0 = {vector(s.displacements)}, \\qquad \\Delta = {vector(delta)}, \\qquad "
            f"X = A^{{-1}} (\\Delta - D_0) = {vector(s.redundants)}$$", ""]


def superposed(a: Analysis, t) -> list[str]:
    xs = a.solution.xs
    c = t.curves
    lines = ["### Superposed curves", "", "The sums of the load curves; x in m.", "",
             "| segment | V(x) in N | M(x) in N·m |", "|---|---|---|"]
    for start, end, (V, M) in runs(xs, c.V, c.M):
        lines.append(f"| {x_range(start, end)} | ${poly(V)}$ | ${poly(M)}$ |")
    lines += ["", "| segment | θ(x) in rad | v(x) in m |", "|---|---|---|"]
    for start, end, (theta, v) in runs(xs, c.theta, c.v):
        lines.append(f"| {x_range(start, end)} | ${poly(theta)}$ | ${poly(v)}$ |")
    return lines + [""]

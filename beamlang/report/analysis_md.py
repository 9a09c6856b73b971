"""Result-side sections of the calc package: summary, each case's superposition and extremum search, checks."""

from __future__ import annotations


from beamlang.analysis.display import CHECK_QUANTITY, convert, number, report_units, show
from beamlang.engine.extrema import Candidate
from beamlang.engine.fem import reported
from beamlang.language.fmt import statement_text
from beamlang.model import LineLoad
from beamlang.pipeline import Analysis
from beamlang.engine.roots import square_free
from beamlang.engine.solve import load_solution, prescribed
from beamlang.engine.symbolic import latex, load_formula, worth_deriving
from beamlang.report.sections import vector
from beamlang.report.tex import cell, md, num, plain, poly


def summary(a: Analysis) -> list[str]:
    u = report_units(a.loaded.member)
    lines = ["## Summary", ""]
    if not a.checks:
        return lines + ["No checks are requested in the input file.", ""]
    lines += ["| check | case or combination | actual | allowed | ratio | result | governs at | input line |",
              "|---|---|---|---|---|---|---|---|"]
    for c in a.checks:
        q = CHECK_QUANTITY[c.unit]
        where = f"x = {number(convert(c.x, u['length']))} {u['length']}" if c.x is not None else "-"
        if c.region:
            where += f" ({c.region})"
        result = "**PASS**" if c.passed else "**FAIL**"
        lines.append(f"| {c.kind} | {md(c.target)} | {show(c.actual, u, q)} | {show(c.allowed, u, q)} | "
                     f"{c.ratio:.3f} | {result} | {where} | {c.span.line} |")
    failed = sum(not c.passed for c in a.checks)
    verdict = "All checks pass." if not failed else f"{failed} of {len(a.checks)} checks FAIL."
    named = [f"Section {md(a.loaded.member.designations)}.", ""] if a.loaded.member.designations else []
    return lines + ["", verdict, ""] + named


def target(a: Analysis, name: str, figure: str | None, moving_figure: str | None = None) -> list[str]:
    t = a.solution.target(name)
    r = a.result(name)
    m = a.loaded.member
    head = f"## {'Case' if t.kind == 'case' else 'Combination'} {md(name)}"
    lines = [head, ""]
    if t.kind == "case":
        case = m.case(name)
        if case.title:
            lines += [md(case.title), ""]
        lines += _loads(a, t) + _each_load(a, t) + _compatibility(a, t)
    else:
        terms = " + ".join(f"{plain(f)} × {md(case)}" for f, case in t.terms)
        lines += [f"{md(name)} = {terms}: every curve and reaction is this factored sum of the case curves "
                  "(exact, by linearity).", ""]
    if r.envelope is not None:
        lines += _moving(a, t, r) + [
            f"![{md(name)}: influence lines at the governing points and envelopes of M and v]({moving_figure})", ""]
        if figure is None:  # the moving group alone: no static curves to draw
            return lines
        return lines + [f"![{md(name)}: the static loads alone, V, M, slope and deflection]({figure})", ""]
    lines += _superposed(a, t) + _hinges(a, t) + _reactions(a, r) + _moment_search(a, r)
    lines += _deflection_search(a, t, r)
    lines += _points(a, r) + [f"![{md(name)}: loads and reactions, V, M, slope and deflection with its limits]({figure})", ""]
    return lines


MOVING_FIELDS = (("max_down", "largest downward deflection", "deflection"),
                 ("max_up", "largest upward deflection", "deflection"),
                 ("moment_positive", "largest sagging moment", "moment"),
                 ("moment_negative", "largest hogging moment", "moment"),
                 ("shear_max", "largest shear", "force"),
                 ("slope_max", "largest slope", "slope"))


def _moving(a: Analysis, t, r) -> list[str]:
    """The envelope over every position of the moving group: method, critical positions, reactions."""
    m = a.loaded.member
    u = report_units(m)
    env = r.envelope
    ld = env.load
    doc_lines = {st.span.line: st for _, st in a.loaded.document.statements}
    group = ", ".join(f"{show(-F, u, 'force')} at {show(d, u, 'length')}" for F, d in zip(ld.forces, ld.offsets))
    lines = ["### Moving load", "",
             f"Input line {ld.span.line}: `{cell(statement_text(doc_lines[ld.span.line]))}`, factor "
             f"{plain(env.factor)}. Forces (down +) and their offsets from the first: {group}. The group travels "
             f"from {show(ld.lo, u, 'length')} to {show(ld.hi, u, 'length')}" +
             (", in both directions (the reversed order is searched too)" if len(ld.forces) > 1 else "") +
             "; a force acts while it is on that stretch, so a group entering or leaving the member is included.",
             "",
             "Method: a unit force at ξ gives the deflection G(x, ξ) at x, and by Maxwell-Betti reciprocity "
             "G(x, ξ) = G(ξ, x): the deflection influence line of any point is the member's own deflection under "
             "a unit force there. On each cell of the (x, ξ) plane the influence kernels of v, θ, M and V are "
             "polynomials of degree three or less in ξ, interpolated exactly from the engine's solutions for unit "
             "forces at four places in each segment and confirmed at a fifth. With the first force at p, each "
             "response is the static part plus the factored sum of the forces times their kernels: a polynomial "
             "in (x, p) on every cell the breakpoints and the lines x = p + offset cut out. Its extremes are "
             "taken, without sampling, from the group standing at every position where a force meets a "
             "breakpoint, from every edge (influence lines at fixed x, and under each force), and from the "
             "interior critical points, where ∂f/∂x = ∂f/∂p = 0 is solved through the resultant in x with its "
             "real roots isolated exactly. "
             f"The plane was cut into {env.cells} cells; of their {4 * env.cells} interiors (one per response), "
             f"{env.interiors} could hold a value beyond those already found (a float bound with a safety margin "
             "decides) and were solved exactly.",
             "",
             "| result | value | at x | first force at | direction | found |", "|---|---|---|---|---|---|"]
    for field, label, kind in MOVING_FIELDS:
        loc, crit = getattr(r, field), r.position(field)
        if loc is None or crit is None:
            lines.append(f"| {label} | none | - | - | - | - |")
            continue
        value = f"{plain(loc.value)} rad" if kind == "slope" else show(loc.value, u, kind, 6)
        mark = "" if crit.exact else " (refined roots)"
        lines.append(f"| {label} | {value} | {show(loc.x, u, 'length')} | {show(crit.position, u, 'length')} "
                     f"| {'reversed' if crit.reversed else 'as written'} | {crit.how}{mark} |")
    lines += ["", "Reactions over all positions (up +):", "",
              "| support | x | largest | first force at | smallest | first force at | input line |",
              "|---|---|---|---|---|---|---|"]
    for sp, (big, small) in zip(m.supports, env.reactions):
        lines.append(f"| {sp.kind} | {show(sp.x, u, 'length')} | {show(big.value, u, 'force')} | "
                     f"{show(big.position, u, 'length')} | {show(small.value, u, 'force')} | "
                     f"{show(small.position, u, 'length')} | {sp.span.line} |")
    lines += _standing_check(a, t, r)
    if m.report_points:
        lines += ["", "Requested points over all positions:", "", "| x | largest up | largest down |", "|---|---|---|"]
        for rp, (up, down) in zip(m.report_points, env.points):
            lines.append(f"| {show(rp.x, u, 'length')} | {show(up.value, u, 'deflection', 6)} | "
                         f"{show(down.value, u, 'deflection', 6)} |")
    return lines + [""]


def _standing_check(a: Analysis, t, r) -> list[str]:
    """The governing positions re-solved as ordinary static cases: the checker's way to confirm them."""
    from beamlang.engine.moving import standing_case, standing_loads
    from beamlang.analysis.results import factored_loads
    from beamlang.engine.solve import curves_with
    u = report_units(a.loaded.member)
    lines = ["", "Each governing position re-solved as a static case (the group's forces as point loads where "
             "they stand, with the target's other loads), and the response read at the governing x:", "",
             "| result | forces at | value of the static case | envelope value |", "|---|---|---|---|"]
    for field, label, kind in MOVING_FIELDS[:4]:
        loc, crit = getattr(r, field), r.position(field)
        if loc is None or crit is None:
            continue
        loads = standing_case(r.envelope, crit, factored_loads(a.solution, t))
        curves = curves_with(a.solution, loads)
        curve = curves.v if kind == "deflection" else curves.M
        value = curve.at(crit.x, "left") if crit.how == "under a force" else curve.at(crit.x)
        wheels = ", ".join(show(ld.x, u, "length") for ld in standing_loads(r.envelope, crit)) or "off the member"
        lines.append(f"| {label} | {wheels} | {show(value, u, kind, 6)} | {show(loc.value, u, kind, 6)} |")
    return lines


def _loads(a: Analysis, t) -> list[str]:
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


def _runs(xs, *curves):
    """(start, end, pieces) with neighbouring segments merged where every curve has the same formula."""
    out = []
    for k in range(len(xs) - 1):
        pieces = tuple(c.pieces[k] for c in curves)
        if out and out[-1][2] == pieces:
            out[-1] = (out[-1][0], xs[k + 1], pieces)
        else:
            out.append((xs[k], xs[k + 1], pieces))
    return out


def _range(start, end) -> str:
    return f"{plain(start)} ≤ x ≤ {plain(end)}"


def _each_load(a: Analysis, t) -> list[str]:
    m = a.loaded.member
    symbolic = worth_deriving(m, len(a.solution.primary.redundants))
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
        solved = load_solution(a.solution, ld)
        shared = sum(1 for other in t.loads if other.span.line == ld.span.line) > 1  # self-weight per stretch
        where = f" ({plain(ld.x1)} m to {plain(ld.x2)} m)" if shared and isinstance(ld, LineLoad) else ""
        lines += [f"Load of line {ld.span.line}{where}:", ""]
        if symbolic:
            lines += _formula(m, ld)
        lines += ["| segment | v(x) |", "|---|---|"]
        for start, end, (p,) in _runs(xs, solved.curves.v):
            lines.append(f"| {_range(start, end)} | ${poly(p)}$ |")
        lines.append("")
    return lines


def _formula(m, ld) -> list[str]:
    segments, names = load_formula(m, ld)
    out = []
    for start, end, expr in segments:
        out += [f"$$v(x) = {latex(expr)} \\qquad ({plain(start)} \\le x \\le {plain(end)})$$", ""]
    values = ", ".join(f"${_symbol(n)} = {num(v)}$" for n, v in names.items())
    return out + [f"with {values} (SI units).", ""]


def _symbol(name: str) -> str:
    base, _, sub = name.partition("_")
    return f"{base}_{{{sub}}}" if sub else base


def _compatibility(a: Analysis, t) -> list[str]:
    p = a.solution.primary
    if not p.redundants:
        return []
    s = t.solved
    moved = prescribed(a.loaded.member, s.loads)
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


def _superposed(a: Analysis, t) -> list[str]:
    xs = a.solution.xs
    c = t.curves
    lines = ["### Superposed curves", "", "The sums of the load curves; x in m.", "",
             "| segment | V(x) in N | M(x) in N·m |", "|---|---|---|"]
    for start, end, (V, M) in _runs(xs, c.V, c.M):
        lines.append(f"| {_range(start, end)} | ${poly(V)}$ | ${poly(M)}$ |")
    lines += ["", "| segment | θ(x) in rad | v(x) in m |", "|---|---|---|"]
    for start, end, (theta, v) in _runs(xs, c.theta, c.v):
        lines.append(f"| {_range(start, end)} | ${poly(theta)}$ | ${poly(v)}$ |")
    return lines + [""]


def _hinges(a: Analysis, t) -> list[str]:
    """The hinge conditions, verified on the superposed curves: zero moment, a slope jump, no gap."""
    m = a.loaded.member
    if not m.hinges:
        return []
    c = t.curves
    u = report_units(m)
    lines = ["### Hinge conditions", "", "At every hinge: the moment from either side, the deflection from either side "
             "(equal: no gap) and the slope jump Δθ = θ(right) - θ(left).", "",
             "| hinge (input line) | M left | M right | v left = v right | Δθ |", "|---|---|---|---|---|"]
    for h in m.hinges:
        ml, mr = c.M.at(h.x, "left"), c.M.at(h.x, "right")
        vl, vr = c.v.at(h.x, "left"), c.v.at(h.x, "right")
        assert ml == 0 and mr == 0 and vl == vr, "hinge conditions must hold exactly"
        jump = c.theta.at(h.x, "right") - c.theta.at(h.x, "left")
        lines.append(f"| x = {show(h.x, u, 'length')} (line {h.span.line}) | {show(ml, u, 'moment')} | "
                     f"{show(mr, u, 'moment')} | {show(vl, u, 'deflection', 6)} | {plain(jump, 8)} rad |")
    return lines + [""]


def _reactions(a: Analysis, r) -> list[str]:
    m = a.loaded.member
    u = report_units(m)
    lines = ["### Reactions", "", "| support | x | force (up +) | moment (counterclockwise +) | input line |",
             "|---|---|---|---|---|"]
    for sp, (x, f, mo) in zip(m.supports, r.reactions):
        moment = show(mo, u, "moment") if sp.kind == "fixed" else "-"
        lines.append(f"| {sp.kind} | {show(x, u, 'length')} | {show(f, u, 'force')} | {moment} | {sp.span.line} |")
    return lines + [""]


def _moment_search(a: Analysis, r) -> list[str]:
    u = report_units(a.loaded.member)
    zeros = [x for x in r.moment_candidates if x.reason == "derivative zero"]
    found = ", ".join(f"x = {_where(z)} m" for z in zeros) or "none inside a segment"
    lines = ["### Shear and moment", "",
             f"Extreme moments are at segment ends (both sides of each) or where V(x) = 0 inside a segment: {found}.", ""]
    for label, loc in (("largest sagging moment", r.moment_positive), ("largest hogging moment", r.moment_negative),
                       ("largest shear magnitude", r.shear_max)):
        q = "force" if "shear" in label else "moment"
        value = show(loc.value, u, q) if loc else "none"
        at = f" at x = {_places(loc, u)}" if loc else ""
        lines.append(f"- {label}: {value}{at}")
    return lines + [""]


def _deflection_search(a: Analysis, t, r) -> list[str]:
    u = report_units(a.loaded.member)
    c, xs = t.curves, a.solution.xs
    cands = r.deflection_candidates
    lines = ["### Where the deflection is largest", "",
             "The slope θ(x) = dv/dx is zero at every interior extremum. In every segment the equation "
             "θ(x) = 0 is solved exactly; its roots inside the segment, and both ends of every segment, are "
             "the candidates.", "", "| segment | equation θ(x) = 0 | roots inside the segment |", "|---|---|---|"]
    for k, p in enumerate(c.theta.pieces):
        roots = [x for x in cands if x.reason == "derivative zero" and x.segment == k]
        text = "; ".join(_root_text(x) for x in roots) or "none"
        lines.append(f"| {plain(xs[k])} ≤ x ≤ {plain(xs[k + 1])} | ${poly(p)} = 0$ | {text} |")
    lines += ["", "| candidate x | why | v |", "|---|---|---|"]
    for x in _unique(cands):
        lines.append(f"| {_where(x)} m | {x.reason} | {show(x.value, u, 'deflection', 6)} |")
    down = f"{show(r.max_down.value, u, 'deflection', 6)} at x = {_places(r.max_down, u)}" if r.max_down else "none"
    up = f"{show(r.max_up.value, u, 'deflection', 6)} at x = {_places(r.max_up, u)}" if r.max_up else "none"
    return lines + ["", f"Governing: largest downward deflection {down}; largest upward deflection {up}.", ""]


def _unique(cands: list[Candidate]) -> list[Candidate]:
    seen, out = set(), []
    for x in cands:
        if (x.x, x.value) not in seen:
            seen.add((x.x, x.value))
            out.append(x)
    return out


def _root_text(x: Candidate) -> str:
    if x.root is None:
        return f"x = {plain(x.x, 10)} (rational, exact)"
    q = square_free(x.root.poly)
    if q.degree == 2:
        c0, c1, c2 = q.coeffs
        disc = c1 * c1 - 4 * c0 * c2
        sign = "+" if x.x > -c1 / (2 * c2) else "-"
        return f"x = $\\frac{{{num(-c1)} {sign} \\sqrt{{{num(disc)}}}}}{{{num(2 * c2)}}}$ = {plain(x.x, 10)}"
    width = plain(x.root.hi - x.root.lo, 2)
    return (f"x = {plain(x.x, 10)}, a root of the degree-{q.degree} factor (irrational; isolated exactly "
            f"in an interval {width} m wide)")


def _where(x) -> str:
    return plain(x.x, 8)


def _places(loc, u) -> str:
    places = ", ".join(number(convert(x, u["length"]), 6) for x in loc.x_all)
    return f"{places} {u['length']}"


def _points(a: Analysis, r) -> list[str]:
    if not r.points:
        return []
    u = report_units(a.loaded.member)
    lines = ["### Requested points", "", "| x | deflection | slope |", "|---|---|---|"]
    for x, v, theta in r.points:
        lines.append(f"| {show(x, u, 'length')} | {show(v, u, 'deflection', 6)} | {plain(theta)} rad |")
    return lines + [""]


def envelope(a: Analysis, figure: str) -> list[str]:
    from beamlang.report.figures import envelope_targets
    u = report_units(a.loaded.member)
    names = envelope_targets(a)
    rows = []
    for name in names:
        r = a.result(name)
        rows.append(f"| {md(name)} | {show(r.moment_positive.value if r.moment_positive else None, u, 'moment')} | "
                    f"{show(r.moment_negative.value if r.moment_negative else None, u, 'moment')} | "
                    f"{show(r.max_down.value if r.max_down else None, u, 'deflection')} | "
                    f"{show(r.max_up.value if r.max_up else None, u, 'deflection')} |")
    moving = [n for n in names if a.loaded.member.moving(n)]
    note = ([f"For {', '.join(md(n) for n in moving)} the table gives the extremes over every position of the "
             "moving group; the figure draws the static part only.", ""] if moving else [])
    return ["## Envelope", "", "| case or combination | largest M+ | largest M- | largest down | largest up |",
            "|---|---|---|---|---|", *rows, "", *note, f"![Envelope of moment and deflection]({figure})", ""]


def checks_detail(a: Analysis) -> list[str]:
    u = report_units(a.loaded.member)
    lines = ["## Checks", "", "| input line | check | case or combination | actual | allowed | ratio | basis | result |",
             "|---|---|---|---|---|---|---|---|"]
    for c in a.checks:
        q = CHECK_QUANTITY[c.unit]
        lines.append(f"| {c.span.line} | {c.kind} | {md(c.target)} | {show(c.actual, u, q, 6)} | {show(c.allowed, u, q, 6)} | "
                     f"{c.ratio:.4f} | {cell(c.basis)} | {'PASS' if c.passed else 'FAIL'} |")
    lines += ["", "Elastic range: superposition holds only while the member stays linear elastic.", ""]
    for r in a.results:
        st = r.stress
        if st.bending is None:
            continue
        shear = show(st.shear, u, "stress") if st.shear is not None else "not computed (section given by properties)"
        state = {True: "elastic", False: "NOT elastic: superposition is not valid", None: "no yield strength given"}[st.elastic]
        lines.append(f"- {md(r.name)}: bending stress {show(st.bending, u, 'stress')}, shear stress {shear}: {state}.")
    return lines + [""]


def required(a: Analysis) -> list[str]:
    """The least I and S that pass, with their derivation."""
    req, m = a.required, a.loaded.member
    small = report_units(m)["section"]
    lines = ["## Required section", ""]
    if req.I is None and req.S is None:
        return lines + [f"{req.note[0].upper()}{req.note[1:]}." if req.note.startswith("not") else
                        "No deflection limit or stress check asks for one.", ""]
    lines += ["With the loads fixed, every deflection of this member is proportional to 1/I and the moments do "
              "not depend on I, so the least second moment of area meeting every deflection limit, and the least "
              "elastic section modulus keeping the bending stress within yield, follow exactly from the ratios:", ""]
    if req.I is not None:
        c = req.I_check
        lines += [f"$$I_{{req}} = I \\cdot \\frac{{\\delta}}{{\\delta_{{allow}}}} = {num(convert(m.section.I, small + '^4'))} "
                  f"\\times {num(c.ratio, 6)} = {num(convert(req.I, small + '^4'))}$$", "",
                  f"in {small}^4, governed by the deflection check on {md(c.target)} (input line {c.span.line}).", ""]
    if req.S is not None:
        c = req.S_check
        S = m.section.S if m.section.S is not None else m.section.I / m.section.c
        lines += [f"$$S_{{req}} = \\frac{{M_{{max}}}}{{f_y}} = S \\cdot \\frac{{\\sigma}}{{f_y}} = "
                  f"{num(convert(S, small + '^3'))} \\times {num(c.ratio, 6)} = {num(convert(req.S, small + '^3'))}$$", "",
                  f"in {small}^3, governed by the bending stress on {md(c.target)} (input line {c.span.line}).", ""]
    note = req.note.split("; ", 1)
    return lines + ([f"Note: {note[1]}.", ""] if len(note) > 1 else [])


def cross_check(a: Analysis) -> list[str]:
    lines = ["## Independent cross-check", "",
             "Each case and combination is solved again by finite elements (Hermite cubic beam elements; a node "
             "at each end, every support and every breakpoint not closer than L/500 to another node; consistent "
             "nodal loads; floating point). Largest nodal difference from the "
             "exact curves, relative to the largest deflection or slope, rounded up to a power of ten "
             "(1e-12 means at most 1e-12: float noise):", "",
             "| case or combination | relative difference at most |", "|---|---|"]
    lines += [f"| {md(r.name)} | {reported(r.cross_check):.0e} |" for r in a.results]
    return lines + [""]

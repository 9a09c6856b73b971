"""Result-side sections of the calc package: summary, each case's superposition and extremum search, checks."""

from __future__ import annotations

from beamlang.analysis.display import (CHECK_QUANTITY, at, check_name, convert, governing, number, place, scaled, show,
                                       working_units)
from beamlang.language import syntax
from beamlang.analysis.working import reported, root_factor, search_runs
from beamlang.pipeline import Analysis
from beamlang.report.checks_md import stress_units
from beamlang.report.moving_md import moving_section
from beamlang.report.pattern_md import pattern_section
from beamlang.report.superposition_md import compatibility, each_load, loads_table, superposed, x_range
from beamlang.report.tex import cell, md, num, plain, poly, quantity


def summary(a: Analysis) -> list[str]:
    u = a.units
    lines = ["## Summary", ""] + designation(a)
    if not a.checks:
        return lines + ["No checks are requested in the input file.", ""]
    worst = governing(a.checks)
    lines += ["| check | case or combination | actual | allowed | ratio | result | governs at | input line |",
              "|---|---|---|---|---|---|---|---|"]
    for c in a.checks:
        q = CHECK_QUANTITY[c.unit]
        name = c.kind + (f", {place(c, u)}" if c.place else "")
        ratio = f"**{c.ratio:.3f}** (governs)" if c is worst else f"{c.ratio:.3f}"
        result = "**PASS**" if c.passed else "**FAIL**"
        lines.append(f"| {name} | {md(c.target)} | {show(c.actual, u, q)} | {show(c.allowed, u, q)} | "
                     f"{ratio} | {result} | {at(c, u)} | {c.span.line} |")
    failed = sum(not c.passed for c in a.checks)
    named = [f"Section {md(a.loaded.member.designations)}.", ""] if a.loaded.member.designations else []
    verdict = (f"All {len(a.checks)} checks pass." if not failed else f"{failed} of {len(a.checks)} checks FAIL.")
    return lines + ["", f"{verdict} Governing check: {md(check_name(worst, u))} (input line {worst.span.line}), "
                    f"ratio {worst.ratio:.3f}, {'PASS' if worst.passed else 'FAIL'}.", ""] + named


def designation(a: Analysis) -> list[str]:
    """The member's section and material as written (and the catalogue row the section was taken from)."""
    from beamlang.language.catalogue import designation as catalogue_row
    from beamlang.language.fmt import statement_text
    doc = a.loaded.document
    row = catalogue_row(a.loaded)
    out = []
    for line, st in doc.statements:
        if isinstance(st, (syntax.Section, syntax.Material)):
            what = "Section" if isinstance(st, syntax.Section) else "Material"
            named = f", {md(row[0])} from the catalogue {md(row[1])}" if row and what == "Section" else ""
            out.append(f"- {what}: `{cell(statement_text(st))}` (input line {line.number}{named})")
    return out + [""]


def target(a: Analysis, name: str, figure: str | None, moving_figure: str | None = None,
           shown: dict | None = None) -> list[str]:
    """One case's or combination's section; `shown` collects the general formulas written out in the package
    (`formula_md.formula_lines`)."""
    t = a.solution.target(name)
    r = a.result(name)
    m = a.loaded.member
    head = f"## {'Case' if t.kind == 'case' else 'Combination'} {md(name)}"
    lines = [head, ""]
    if t.kind == "case":
        case = m.case(name)
        if case.title:
            lines += [md(case.title), ""]
        lines += loads_table(a, t) + each_load(a, t, shown) + compatibility(a, t)
    else:
        terms = " + ".join(f"{plain(f)} × {md(case)}" for f, case in t.terms)
        lines += ([f"{md(name)} = {terms}: every curve and reaction is this factored sum of the case curves "
                   "(exact, by linearity).", ""] if r.pattern is None else
                  [f"{md(name)} = {terms}, with {', '.join(md(c) for c in r.pattern.cases)} patterned: the other "
                   "cases, factored, are on every span; each patterned case enters, factored, through the "
                   "envelope of its arrangements below.", ""])
    if r.envelope is not None:
        lines += moving_section(a, t, r) + [
            f"![{md(name)}: influence lines at the governing points and envelopes of M and v]({moving_figure})", ""]
        if figure is None:  # the moving group alone: no static curves to draw
            return lines
        return lines + [f"![{md(name)}: the static loads alone, V, M, slope and deflection]({figure})", ""]
    if r.pattern is not None:  # the envelope over every arrangement replaces the one curve and its searches
        lines += pattern_section(a, r) + _reactions(a, r)
        return lines + _points(a, r) + [
            f"![{md(name)}: loads and reactions, envelopes of V, M, slope and deflection with its limits]({figure})", ""]
    lines += superposed(a, t) + _hinges(a, t) + _reactions(a, r) + _moment_search(a, r)
    lines += _deflection_search(a, t, r)
    lines += _points(a, r) + [f"![{md(name)}: loads and reactions, V, M, slope and deflection with its limits]({figure})", ""]
    return lines


def _hinges(a: Analysis, t) -> list[str]:
    """The hinge conditions, verified on the superposed curves: zero moment, a slope jump, no gap."""
    m = a.loaded.member
    if not m.hinges:
        return []
    c = t.curves
    u = a.units
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
    u = a.units
    lines = ["### Reactions", "", "| support | x | force (up +) | moment (counterclockwise +) | input line |",
             "|---|---|---|---|---|"]
    for sp, (x, f, mo) in zip(m.supports, r.reactions):
        moment = show(mo, u, "moment") if sp.kind == "fixed" else "-"
        lines.append(f"| {sp.kind} | {show(x, u, 'length')} | {show(f, u, 'force')} | {moment} | {sp.span.line} |")
    return lines + [""]


def _moment_search(a: Analysis, r) -> list[str]:
    u = a.units
    zeros = [x for x in r.moment_candidates if x.reason == "derivative zero"]
    L = u["length"]
    found = ", ".join(f"x = {_where(z, L)} {L}" for z in zeros) or "none inside a segment"
    lines = ["### Shear and moment", "",
             f"Extreme moments are at segment ends (both sides of each) or where V(x) = 0 inside a segment: {found}.", ""]
    for label, loc in (("largest sagging moment", r.moment_positive), ("largest hogging moment", r.moment_negative),
                       ("largest shear magnitude", r.shear_max)):
        q = "force" if "shear" in label else "moment"
        value = show(loc.value, u, q) if loc else "none"
        at = f" at x = {_places(loc, u)}" if loc else ""
        lines.append(f"- {label}: {value}{at}")
    return lines + [""]


RUNS = ("A segment runs from one change of this curve's formula to the next: the ends, supports, hinges, "
        "changes of section and this target's own loads.")


def _deflection_search(a: Analysis, t, r) -> list[str]:
    u = a.units
    L = working_units(u)["length"]
    c = t.curves
    cands = r.deflection_candidates
    if c.vs is None:
        lines = ["### Where the deflection is largest", "",
                 "The slope θ(x) = dv/dx is zero at every interior extremum. In every segment the equation "
                 f"θ(x) = 0 (θ in rad, x in {L}) is solved exactly; its roots inside the segment, and both ends of "
                 f"every segment, are the candidates. {RUNS}", "", "| segment | equation θ(x) = 0 | roots inside the segment |",
                 "|---|---|---|"]
    else:
        lines = ["### Where the deflection is largest", "",
                 "The slope of the deflection, dv/dx = θ(x) - V(x)/(κGA) (the section's rotation less the shear "
                 "strain), is zero at every interior extremum. In every segment the equation dv/dx = 0 (in rad, x in "
                 f"{L}) is solved exactly; its roots inside the segment, and both ends of every segment, are the "
                 f"candidates. {RUNS}", "", "| segment | equation dv/dx = 0 | roots inside the segment |", "|---|---|---|"]
    for k, lo, hi in search_runs(a.loaded.member, c.v, c.slope):  # the runs the search examined
        roots = [x for x in cands if x.reason == "derivative zero" and x.segment == k]
        text = "; ".join(_root_text(x, L) for x in roots) or "none"
        lines.append(f"| {x_range(lo, hi, L)} | ${poly(scaled(c.slope.pieces[k], L, 'rad'))} = 0$ | {text} |")
    lines += ["", f"| candidate x ({L}) | why | v |", "|---|---|---|"]
    for x in _unique(cands):
        lines.append(f"| {_where(x, L)} | {x.reason} | {show(x.value, u, 'deflection', 6)} |")
    down = f"{show(r.max_down.value, u, 'deflection', 6)} at x = {_places(r.max_down, u)}" if r.max_down else "none"
    up = f"{show(r.max_up.value, u, 'deflection', 6)} at x = {_places(r.max_up, u)}" if r.max_up else "none"
    return lines + ["", f"Governing: largest downward deflection {down}; largest upward deflection {up}.", ""]


def _unique(cands: list) -> list:
    seen, out = set(), []
    for x in cands:
        if (x.x, x.value) not in seen:
            seen.add((x.x, x.value))
            out.append(x)
    return out


def _root_text(x, L: str) -> str:
    """A root of the slope in the length unit shown: closed form for a quadratic factor, else its interval."""
    if x.root is None:
        return f"x = {plain(convert(x.x, L), 10)} (rational, exact)"
    q = scaled(root_factor(x.root.poly), L, "rad")
    xl = convert(x.x, L)
    if q.degree == 2:
        c0, c1, c2 = q.coeffs
        disc = c1 * c1 - 4 * c0 * c2
        sign = "+" if xl > -c1 / (2 * c2) else "-"
        return f"x = $\\frac{{{num(-c1)} {sign} \\sqrt{{{num(disc)}}}}}{{{num(2 * c2)}}}$ = {plain(xl, 10)}"
    width = plain(convert(x.root.hi - x.root.lo, L), 2)
    return (f"x = {plain(xl, 10)}, a root of the degree-{q.degree} factor (irrational; isolated exactly "
            f"in an interval {width} {L} wide)")


def _where(x, L: str = "m") -> str:
    return plain(convert(x.x, L), 8)


def _places(loc, u) -> str:
    places = ", ".join(number(convert(x, u["length"]), 6) for x in loc.x_all)
    return f"{places} {u['length']}"


def _points(a: Analysis, r) -> list[str]:
    if not r.points:
        return []
    u = a.units
    lines = ["### Requested points", "", "| x | deflection | slope |", "|---|---|---|"]
    for x, v, theta in r.points:
        lines.append(f"| {show(x, u, 'length')} | {show(v, u, 'deflection', 6)} | {plain(theta)} rad |")
    return lines + [""]


def envelope(a: Analysis, figure: str) -> list[str]:
    from beamlang.report.envelope_figure import envelope_targets
    u = a.units
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
             "moving group, each at its own position (not simultaneous); the figure draws the envelope over the "
             "group's positions, sampled for drawing (the table's values are exact).", ""] if moving else [])
    return ["## Envelope", "", "| case or combination | largest M+ | largest M- | largest down | largest up |",
            "|---|---|---|---|---|", *rows, "", *note, f"![Envelope of moment and deflection]({figure})", ""]


def required(a: Analysis) -> list[str]:
    """The least I and S that pass, with their derivation."""
    req, m = a.required, a.loaded.member
    small = a.units["section"]
    lines = ["## Required section", ""]
    if req.I is None and req.S is None:
        return lines + [f"{req.note[0].upper()}{req.note[1:]}." if req.note.startswith("not") else
                        "No deflection limit or stress check asks for one.", ""]
    lines += ["With the loads fixed, every deflection of this member is proportional to 1/I and the moments do "
              "not depend on I, so the least second moment of area meeting every deflection limit, and the least "
              "elastic section modulus keeping the bending stress within its limit, follow exactly from the ratios:", ""]
    if req.I is not None:
        c, i4 = req.I_check, small + "^4"
        lines += [f"$$I_{{req}} = I \\cdot \\frac{{\\delta}}{{\\delta_{{allow}}}} = {quantity(convert(m.section.I, i4), i4)} "
                  f"\\times {num(c.ratio, 6)} = {quantity(convert(req.I, i4), i4)}$$", "",
                  f"governed by the deflection check on {md(c.target)} (input line {c.span.line}).", ""]
    if req.S is not None:
        c, s3 = req.S_check, small + "^3"
        S = m.section.S if m.section.S is not None else m.section.I / m.section.c
        allowed = "F_b" if c.strength == "allowable" else "f_y"
        w = stress_units(a.units)
        big_m = abs(c.at.value) if c.at is not None else c.actual * S
        lines += [f"$$S_{{req}} = \\frac{{|M|_{{max}}}}{{{allowed}}} = \\frac{{{quantity(convert(big_m, w['moment']), w['moment'])}}}"
                  f"{{{quantity(convert(c.allowed, w['stress']), w['stress'])}}} = {quantity(convert(req.S, s3), s3)}$$", "",
                  f"$$S_{{req}} = S \\cdot \\frac{{\\sigma}}{{{allowed}}} = "
                  f"{quantity(convert(S, s3), s3)} \\times {num(c.ratio, 6)} = {quantity(convert(req.S, s3), s3)}$$", "",
                  f"governed by the bending stress on {md(c.target)} (input line {c.span.line}); "
                  + ("F_b is the allowable bending stress given with the material." if c.strength == "allowable"
                     else "f_y is the yield strength of the material."), ""]
    note = req.note.split("; ", 1)
    return lines + ([f"Note: {note[1]}.", ""] if len(note) > 1 else [])


def cross_check(a: Analysis) -> list[str]:
    elements = ("shear-flexible cubic beam elements (Timoshenko, phi = 12 EI / (κGA l^2))"
                if a.loaded.member.shear_deformation else "Hermite cubic beam elements")
    lines = ["## Independent cross-check", "",
             f"Each case and combination is solved again by finite elements ({elements}; a node "
             "at each end, every support and every breakpoint not closer than L/500 to another node; consistent "
             "nodal loads; floating point). Largest nodal difference from the "
             "exact curves, relative to the largest deflection or slope, rounded up to a power of ten "
             "(1e-12 means at most 1e-12: float noise):", "",
             "| case or combination | relative difference at most |", "|---|---|"]
    lines += [f"| {md(r.name)} | {reported(r.cross_check):.0e} |" for r in a.results]
    return lines + [""]

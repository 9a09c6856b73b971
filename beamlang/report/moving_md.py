"""A moving target's section of the calc package: the method, every critical group position, reactions over all positions,
and the governing positions re-solved as static cases."""

from __future__ import annotations

from beamlang.analysis.display import show
from beamlang.analysis.working import standing_value
from beamlang.language.fmt import statement_text
from beamlang.pipeline import Analysis
from beamlang.report.tex import cell, plain

MOVING_FIELDS = (("max_down", "largest downward deflection", "deflection"),
                 ("max_up", "largest upward deflection", "deflection"),
                 ("moment_positive", "largest sagging moment", "moment"),
                 ("moment_negative", "largest hogging moment", "moment"),
                 ("shear_max", "largest shear", "force"),
                 ("slope_max", "largest slope", "slope"))


def moving_section(a: Analysis, t, r) -> list[str]:
    """The envelope over every position of the moving group: method, critical positions, reactions."""
    m = a.loaded.member
    u = a.units
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
             f"{env.interiors} could hold both a value beyond those already found and a critical point (float "
             "bounds with a safety margin, on the response and on ∂f/∂x and ∂f/∂p, decide) and were solved exactly.",
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
    lines += standing_check(a, t, r)
    if m.report_points:
        lines += ["", "Requested points over all positions:", "", "| x | largest up | largest down |", "|---|---|---|"]
        for rp, (up, down) in zip(m.report_points, env.points):
            lines.append(f"| {show(rp.x, u, 'length')} | {show(up.value, u, 'deflection', 6)} | "
                         f"{show(down.value, u, 'deflection', 6)} |")
    return lines + [""]


def standing_check(a: Analysis, t, r) -> list[str]:
    """The governing positions re-solved as ordinary static cases: the checker's way to confirm them."""
    u = a.units
    lines = ["", "Each governing position re-solved as a static case (the group's forces as point loads where "
             "they stand, with the target's other loads), and the response read at the governing x:", "",
             "| result | forces at | value of the static case | envelope value |", "|---|---|---|---|"]
    for field, label, kind in MOVING_FIELDS[:4]:
        loc, crit = getattr(r, field), r.position(field)
        if loc is None or crit is None:
            continue
        value, forces = standing_value(a.solution, t, r, field, kind)
        wheels = ", ".join(show(x, u, "length") for x in forces) or "off the member"
        lines.append(f"| {label} | {wheels} | {show(value, u, kind, 6)} | {show(loc.value, u, kind, 6)} |")
    return lines

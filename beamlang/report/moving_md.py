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
             "polynomials of degree three or less in ξ, interpolated from the engine's solutions for unit forces at "
             "four places in each segment: exactly, and confirmed at a fifth, on every cell that is searched; a "
             "cell whose float bound (with a safety margin) shows it cannot beat the values already found is not "
             "searched further. With the first force at p, each "
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
             "Every value below is an envelope over the group's positions: the extreme of that response over "
             "every position, reached with the group where its row says (first force at, direction of travel). "
             "The values are not simultaneous: each comes from its own position. Where a layout is mirrored, or "
             "the other travel direction gives the same value, every place that ties is listed, each with its "
             "own position (the largest slope and shear tie with mirrored places of the other sign); where a whole "
             "range of positions or places gives the same value, the ends of the range are listed.",
             "",
             "| result | value | at x | first force at | direction | found |", "|---|---|---|---|---|---|"]
    for field, label, kind in MOVING_FIELDS:
        loc, places = getattr(r, field), r.places_of(field)
        if loc is None or not places:
            lines.append(f"| {label} | none | - | - | - | - |")
            continue
        for k, crit in enumerate(places):
            value = f"{plain(crit.value)} rad" if kind == "slope" else show(crit.value, u, kind, 6)
            mark = "" if crit.exact else " (refined roots)"
            name = label if k == 0 else f"{label} (tied place {k + 1} of {len(places)})"
            lines.append(f"| {name} | {value} | {show(crit.x, u, 'length')} | {show(crit.position, u, 'length')} "
                         f"| {direction(crit)} | {crit.how}{mark} |")
    lines += ["", "Reactions over all positions (up +): the largest and the smallest each support takes as the group "
              "travels, each with every group position found to give it (first force at, direction); they are "
              "not one simultaneous set of reactions.", "",
              "| support | x | largest | group at | smallest | group at | input line |",
              "|---|---|---|---|---|---|---|"]
    for sp, reach, turn in zip(m.supports, r.reaches, r.moment_reaches):
        lines.append(f"| {sp.kind} | {show(sp.x, u, 'length')} | {show(reach.largest, u, 'force')} | "
                     f"{positions(reach.largest_at, u)} | {show(reach.smallest, u, 'force')} | "
                     f"{positions(reach.smallest_at, u)} | {sp.span.line} |")
        if turn.largest or turn.smallest:
            lines.append(f"| {sp.kind}, moment | {show(sp.x, u, 'length')} | {show(turn.largest, u, 'moment')} | "
                         f"{positions(turn.largest_at, u)} | {show(turn.smallest, u, 'moment')} | "
                         f"{positions(turn.smallest_at, u)} | {sp.span.line} |")
    lines += standing_check(a, t, r)
    if m.report_points:
        lines += ["", "Requested points over all positions:", "", "| x | largest up | largest down |", "|---|---|---|"]
        for rp, (up, down) in zip(m.report_points, env.points):
            lines.append(f"| {show(rp.x, u, 'length')} | {show(up.value, u, 'deflection', 6)} | "
                         f"{show(down.value, u, 'deflection', 6)} |")
    return lines + [""]


def direction(crit) -> str:
    return "reversed" if crit.reversed else "as written"


def positions(items, u) -> str:
    """Group positions as 'first force at, direction', every one that ties."""
    return "; ".join(f"{show(c.position, u, 'length')}, {direction(c)}" for c in items)


def standing_check(a: Analysis, t, r) -> list[str]:
    """The governing positions re-solved as ordinary static cases: the checker's way to confirm them."""
    u = a.units
    lines = ["", "Each governing position re-solved as a static case (the group's forces as point loads where "
             "they stand, with the target's other loads), and the response read at the governing x:", "",
             "| result | forces at | value of the static case | envelope value |", "|---|---|---|---|"]
    for field, label, kind in MOVING_FIELDS[:4]:
        loc, places = getattr(r, field), r.places_of(field)
        if loc is None:
            continue
        for k, crit in enumerate(places):
            value, forces = standing_value(a.solution, t, r, field, kind, crit)
            wheels = ", ".join(show(x, u, "length") for x in forces) or "off the member"
            name = label if k == 0 else f"{label} (tied place {k + 1})"
            lines.append(f"| {name}, x = {show(crit.x, u, 'length')} | {wheels} | {show(value, u, kind, 6)} | "
                         f"{show(crit.value, u, kind, 6)} |")
    return lines

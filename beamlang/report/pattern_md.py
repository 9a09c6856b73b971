"""Pattern loading in the package: a patterned target's result -> the parts, the arrangements considered and the
governing arrangement of every extreme; and the cautions pattern loading brings (or its absence calls for)."""

from __future__ import annotations

from beamlang.analysis.display import show
from beamlang.language import syntax as s
from beamlang.model import LineLoad, MomentLoad, PointLoad
from beamlang.pipeline import Analysis
from beamlang.report.tex import md


def pattern_section(a: Analysis, r) -> list[str]:
    """How the envelope was found and which arrangement gives each extreme."""
    p = r.pattern
    u = a.units
    lines_of = {st.case.text: line.number for line, st in a.loaded.document.statements if isinstance(st, s.Pattern)}
    cases = " and ".join(f"`{md(c)}` (input line {lines_of[c]})" for c in p.cases)
    parts = ", ".join(f"{md(case)} on {'' if region.startswith('span') else 'the '}{md(region)}"
                      for case, region in p.parts)
    lines = ["### Pattern loading", "",
             f"Patterned: {cases}. Each part below is loaded or not, independently: "
             f"{len(p.parts)} parts, {2 ** len(p.parts)} arrangements. Parts: {parts}.", "",
             "Each part is solved alone, exactly. At every x the worst arrangement for an effect loads exactly "
             "the parts of one sign there, so the upper envelope is the fixed loads' curve plus every positive "
             "part, the lower one plus every negative part; between the parts' own zeros each envelope is one "
             "polynomial, searched for its extremes like any curve. The values below, the checks and the "
             "required section are taken from these envelopes (every arrangement at once), not from the case "
             "with every part loaded.", "",
             "| extreme | value | at | governing arrangement |", "|---|---|---|---|"]
    for extreme, how, x, value, quantity in p.arrangements:
        where = show(x, u, "length") if x is not None else "-"
        lines.append(f"| {md(extreme)} | {show(value, u, quantity)} | x = {where} | {md(how)} |")
    return lines + ["", "Where several arrangements give the same value (a part that adds nothing there), the "
                    "one named leaves that part unloaded. The reactions below are, at each support, the larger in "
                    "magnitude of its two extremes above.", ""]


def pattern_cautions(a: Analysis) -> list[str]:
    """The caution of pattern loading where it is used; where a continuous member has a variable case that is
    not patterned, a caution saying so."""
    m = a.loaded.member
    out = []
    patterned = [c.name for c in m.cases if c.patterned]
    if patterned:
        names = ", ".join(f"`{md(n)}`" for n in patterned)
        out.append(f"Pattern loading of {names}: every arrangement of each span and overhang loaded or not, with "
                   "the full intensity of the case on each loaded part, is considered (through the exact envelope); "
                   "partial loading within a span and reduced intensities are not. Which loads must be patterned, and "
                   "how, is decided by the governing code: confirm that the cases patterned here are the ones it "
                   "requires, and that the fixed cases may stay fixed.")
    regions = a.results[0].regions if a.results else ()
    continuous = sum(r.kind == "span" for r in regions) >= 2 or any(r.kind == "overhang" for r in regions)
    if continuous:
        variable = [c.name for c in m.cases if not c.patterned and any(
            isinstance(ld, (PointLoad, MomentLoad)) or (isinstance(ld, LineLoad) and ld.origin != "self-weight")
            for ld in c.loads)]
        if variable:
            names = ", ".join(f"`{md(n)}`" for n in variable)
            out.append(f"Pattern loading was not considered for {names}: on this continuous member (more than one "
                       "span, or an overhang) each is applied exactly as written, on every span at once, which may not "
                       "give the largest moments, shears, reactions or deflections of a load that may be partly "
                       "absent. If a case is a variable (live, snow, occupancy) load, add `pattern NAME` or confirm "
                       "against the governing code that it need not be patterned.")
    return out

"""Input-side sections of the calc package: title block, inputs and units, signs, section, method."""

from __future__ import annotations

import dataclasses
import re
from fractions import Fraction

from beamlang import __version__
from beamlang.analysis.display import convert, number
from beamlang.language import syntax as s
from beamlang.language.sections import FORMULAS
from beamlang.language.units import SHORTHANDS, factor_of, to_si
from beamlang.pipeline import Analysis
from beamlang.report.provenance import versions_text
from beamlang.report.tex import cell, md, num, plain, quantity

US_TOKENS = ("ft", "in", "lbf", "kip", "psi", "ksi", "lb")
NIST = ("NIST SP 811 (2008), Appendix B: 1 ft = 0.3048 m, 1 in = 0.0254 m, 1 lbf = 4.4482216152605 N, "
        "1 lb = 0.45359237 kg (all exact); 1 kip = 1000 lbf, 1 psi = 1 lbf/in^2")


def title(a: Analysis) -> list[str]:
    m = a.loaded.member
    fields = dict(m.fields)
    head = ["Project", "Job", "Member", "By", "Checked", "Date", "Revision"]
    values = [fields.get("project", ""), fields.get("job", ""), m.mark, fields.get("by", ""),
              fields.get("checked", ""), fields.get("date", ""), fields.get("revision", "")]
    n_cases, n_combos = len(m.cases), len(m.combinations)
    return [f"# {md(m.mark)}: {md(m.title)}", "",
            "| " + " | ".join(head) + " |", "|" + "---|" * len(head),
            "| " + " | ".join(cell(md(v)) if v else "-" for v in values) + " |", "",
            f"This calculation checks the elastic deflection and stress of member {md(m.mark)}, a "
            f"{_describe(a)}, under {n_cases} load case{'s' * (n_cases != 1)} and {n_combos} "
            f"combination{'s' * (n_combos != 1)}. Every curve is computed exactly by superposing the elastic "
            "curve of each load (force method where the member is indeterminate); maxima are found where "
            "the slope or shear is zero, not by sampling.", ""]


def _describe(a: Analysis) -> str:
    m = a.loaded.member
    kinds = [sp.kind for sp in m.supports]
    span = f"{number(convert(m.length, a.units['length']))} {a.units['length']} member"
    return f"{span} on {len(kinds)} support{'s' * (len(kinds) != 1)} ({', '.join(kinds)})"


def _quantities(obj) -> list[s.Quantity]:
    """Every written quantity inside a syntax object, in field order."""
    found: list[s.Quantity] = []
    if isinstance(obj, s.Quantity):
        return [obj]
    if dataclasses.is_dataclass(obj):
        for f in dataclasses.fields(obj):
            found += _quantities(getattr(obj, f.name))
    elif isinstance(obj, tuple):
        for item in obj:
            found += _quantities(item)
    return found


ANGLE_TOKENS = ("deg", "\u00b0", "arcmin", "arcsec", "grad")
ANGLE = "a fraction of π rad (a degree is π/180 rad); π carried as a 50-digit rational (not exact beyond that)"


def inputs(a: Analysis) -> list[str]:
    """Every number as written, its exact SI value, and every conversion factor used."""
    from beamlang.language.fmt import statement_text
    rows, units = [], set()
    for line, st in a.loaded.document.statements:
        for k, q in enumerate(_quantities(st)):
            f = factor_of(q.unit)
            units.update(part.unit for part in (q, *q.parts))
            si = number(to_si(q, "length", "a length") if q.parts else Fraction(q.number) * f.factor, 10)
            written = f"`{cell(statement_text(st))}`" if k == 0 else "″"  # the statement once, then ditto marks
            rows.append(f"| {line.number if k == 0 else ''} | {written} | {cell(str(q))} | {si} {f.si_unit} |")
    out = ["## Inputs", "", "Each number as written in the file and its exact value in SI base units.", "",
           "| line | statement | as written | SI value |", "|---|---|---|---|", *rows, "",
           "Conversion factors used (exact):", "", "| unit | SI | source |", "|---|---|---|"]
    cited = set()
    for unit in sorted(units):
        f = factor_of(unit)
        spelled = SHORTHANDS.get(unit, unit).replace("**", "^")
        source = ("angle" if any(tok in unit for tok in ANGLE_TOKENS) else "NIST" if any(tok in spelled for tok in US_TOKENS)
                  else "SI")
        cited.add(source)
        text = {"angle": ANGLE, "NIST": "NIST SP 811 (see below)", "SI": "SI prefixes, exact by definition"}[source]
        if unit in SHORTHANDS:
            text = f"{unit} = {spelled} (US shorthand); {text}"
        out.append(f"| {cell(unit)} | {plain(f.factor, 14)} {f.si_unit} | {text} |")
    return out + ([""] + [NIST] if "NIST" in cited else []) + [""]


def signs(a: Analysis, figure: str) -> list[str]:
    from beamlang.language.fmt import statement_text
    rows = []
    for line, st in a.loaded.document.statements:
        direction = getattr(st, "direction", None)
        if direction is not None:
            sign = "+" if direction.text in ("up", "counterclockwise") else "-"
            rows.append(f"| {line.number} | `{cell(statement_text(st))}` | {direction.text} | {sign} |")
        elif isinstance(st, s.SelfWeight):
            rows.append(f"| {line.number} | `self-weight` | down (gravity) | - |")
    return ["## Sign convention", "",
            "x is measured from the left end of the member. Deflection v, loads and reaction forces are "
            "positive up. Bending moment M is positive when sagging (tension at the bottom). Slope "
            "θ = dv/dx is in radians, positive counterclockwise. Applied moments and reaction moments "
            "are positive counterclockwise (a reaction moment is the moment the support exerts on the "
            "beam). Shear V(x) is the sum of the upward forces left of x, so dM/dx = V.", "",
            f"![Sign convention]({figure})", "",
            "How each direction word of the input became a sign:", "",
            "| line | statement | direction | sign |", "|---|---|---|---|", *rows, ""]


def section_properties(a: Analysis) -> list[str]:
    m = a.loaded.member
    small = a.units["section"]
    lines = ["## Section and material", ""]
    sections = list({id(st.section): st.section for st in m.stretches}.values())
    materials = list({id(st.material): st.material for st in m.stretches}.values())
    for sec in sections:
        lines += _section_table(sec, small, m.shear_deformation)
    if any(sec.shape in ("round", "tube") for sec in sections):
        lines += ["π is carried as a 40-digit rational, far below every printed digit.", ""]
    stress = "MPa" if m.units == "si" else "ksi"
    for mat in materials:
        lines += [f"Material: {md(mat.name or 'unnamed')}, E = {number(convert(mat.E, stress), 6)} {stress}"
                  + (f", yield strength fy = {number(convert(mat.yield_strength, stress), 6)} {stress}"
                     if mat.yield_strength else "")
                  + (f", allowable bending stress Fb = {number(convert(mat.allowable_bending, stress), 6)} {stress}"
                     if mat.allowable_bending else "")
                  + (f", {'allowable shear stress Fv' if mat.allowable_bending else 'shear strength fv'} = "
                     f"{number(convert(mat.shear_strength, stress), 6)} {stress}" if mat.shear_strength else "")
                  + (f", shear modulus G = {number(convert(mat.G, stress), 6)} {stress}" if mat.G else "")
                  + (f", density = {number(convert(mat.density, a.units['density']), 6)} {a.units['density']}"
                     if mat.density else "")
                  + f" (input line {mat.span.line}).", ""]
    ei = "N*m^2" if m.units == "si" else "kip*in^2"
    if m.shear_deformation:
        ga = "N" if m.units == "si" else "kip"
        lines += ["Shear stiffness, per stretch: " + ", ".join(
            f"$\\kappa G A = {quantity(convert(st.GA, ga), ga)}$" for st in m.stretches) + ".", ""]
    if not m.stepped:
        return lines + [f"Flexural stiffness: $EI = {quantity(convert(m.stretches[0].EI, ei), ei)}$.", ""]
    length = a.units["length"]
    lines += ["The member is stepped: each stretch has its own flexural stiffness, and the curvature "
              "M(x)/EI(x) is integrated stretch by stretch (every change is a segment end).", "",
              f"| stretch ({length}) | section (input line) | material (input line) | EI ({ei.replace('*', '·')}) |",
              "|---|---|---|---|"]
    for st in m.stretches:
        lines.append(f"| {number(convert(st.x1, length))} to {number(convert(st.x2, length))} | "
                     f"{_named(st.section)}{st.section.shape} (line {st.section.span.line}) | "
                     f"{md(st.material.name or 'unnamed')} (line {st.material.span.line}) | ${num(convert(st.EI, ei))}$ |")
    return lines + [""]


def _named(section) -> str:
    return f"{md(section.designation)}, " if section.designation else ""


def _section_table(sec, small: str, shear: bool = False) -> list[str]:
    if sec.shape == "properties":
        named = f"Section {md(sec.designation)}, given" if sec.designation else "Section given"
        lines = [f"{named} by its properties, input line {sec.span.line}.", ""]
    else:
        dims = ", ".join(f"{name} = {number(convert(v, small))} {small}" for name, v in sec.dimensions)
        named = f" {md(sec.designation)}" if sec.designation else ""
        lines = [f"Section{named}: {sec.shape} ({dims}), input line {sec.span.line}.", ""]
    formulas = FORMULAS.get(sec.shape, {})
    lines += ["| property | formula | value |", "|---|---|---|"]
    for key, power in (("A", 2), ("I", 4), ("c", 1), ("S", 3), ("Q", 3), ("t", 1)):
        value = getattr(sec, key)
        if value is None:
            continue
        formula = f"${formulas[key]}$" if key in formulas else ("given" if sec.shape == "properties" else "")
        if key == "S" and "S" not in formulas and sec.shape != "properties":
            formula = "$I / c$"
        unit = small if power == 1 else f"{small}^{power}"
        lines.append(f"| {key} | {formula} | {number(convert(value, unit), 6)} {unit} |")
    if shear and sec.shear_area is not None:
        lines.append(f"| κA (shear area) | {md(sec.shear_rule)} | {number(convert(sec.shear_area, small + '^2'), 6)} "
                     f"{small}^2 |")
    return lines + [""]


def method(a: Analysis) -> list[str]:
    """The primary beam and the compatibility system shared by every case."""
    sol, m = a.solution, a.loaded.member
    p = sol.primary
    L = a.units["length"]
    kept = ", ".join(_kept(m, p, i, L) for i in sorted(p.supports))
    lines = ["## Method", ""] + _hinge_text(m, L)
    if not p.redundants:
        return lines + [f"The member is statically determinate: a {p.kind} beam on {kept}. Reactions follow "
                        "from statics" + (" (with zero moment at every hinge)" if m.hinges else "") +
                        "; each load's curve is M/EI integrated twice with the support conditions.", ""] + _shear_method(m)
    names = [_redundant_name(m, r, j, L) for j, r in enumerate(p.redundants, start=1)]
    lines += [f"The member is statically indeterminate to degree {len(p.redundants)}. Primary (released) beam: "
              f"a {p.kind} beam on {kept}. Redundants: " + "; ".join(names) + ".", "",
              "Compatibility: at every released restraint the displacement of the primary beam under the loads, "
              "D0, plus the displacements caused by the redundants, must equal the support's own movement "
              "(zero for a rigid support, -R/k for a spring, plus any prescribed settlement Δ). With unit "
              "redundants this is A X = Δ - D0 (Δ = 0 without settlements), where A "
              "holds the displacement (or slope) at restraint i due to a unit value of redundant j, plus 1/k "
              f"on the diagonal for springs ({_flexibility_units(a)}):", "",
              "$$A = " + _matrix(p.flexibility, _matrix_units(a)) + "$$", ""]
    return lines + _shear_method(m)


def _shear_method(m) -> list[str]:
    if not m.shear_deformation:
        return []
    return ["Shear deformation is included: each curve adds the shear deflection $v_s = -\\int V / (\\kappa G A)\\,dx$, "
            "integrated exactly segment by segment (V is piecewise polynomial), with the same support conditions; "
            "the displacements of the primary beam, and so the compatibility equations, include it. The slope "
            "shown is the rotation of the cross-section (M/EI integrated once); the deflection's slope differs from "
            "it by the shear strain $-V/(\\kappa G A)$. A fixed support holds the cross-section's rotation at zero.", ""]


def _kept(m, p, i: int, L: str) -> str:
    sp = m.supports[i]
    released = " (its moment released)" if sp.kind == "fixed" and (i, "moment") not in {
        (r.support, r.kind) for r in p.kept} else ""
    return f"{sp.kind} at x = {plain(convert(sp.x, L))} {L} (line {sp.span.line}){released}"


def _hinge_text(m, L: str) -> list[str]:
    if not m.hinges:
        return []
    where = ", ".join(f"x = {plain(convert(h.x, L))} {L} (line {h.span.line})" for h in m.hinges)
    return [f"Internal hinges at {where}. At each hinge the bending moment is zero, which gives statics one more "
            "equation per hinge, and the slope may jump: the elastic curve is continuous there but not smooth. "
            "Each hinge adds one unknown slope jump to the two constants of integration; the support "
            "conditions of the primary beam fix them all.", ""]


def _redundant_name(m, r, j: int, L: str) -> str:
    sp = m.supports[r.support]
    what = "force" if r.kind == "force" else "moment"
    return f"X{j} = reaction {what} of the {sp.kind} at x = {plain(convert(sp.x, L))} {L} (line {sp.span.line})"


def _matrix_units(a: Analysis) -> list[list[str]]:
    """The unit of each flexibility entry: the displacement at restraint i per unit redundant j."""
    from beamlang.analysis.display import working_units
    w = working_units(a.units)
    kinds = [r.kind for r in a.solution.primary.redundants]
    move = {"force": w["deflection"], "moment": "rad"}
    load = {"force": w["force"], "moment": w["moment"]}
    return [[f"{move[ki]}/({load[kj]})" if "*" in load[kj] else f"{move[ki]}/{load[kj]}" for kj in kinds]
            for ki in kinds]


def _flexibility_units(a: Analysis) -> str:
    units = sorted({u for row in _matrix_units(a) for u in row})
    return "A in " + ", ".join(u.replace("*", "·") for u in units)


def _matrix(rows, units: list[list[str]] | None = None) -> str:
    def entry(i: int, j: int, v) -> str:
        return num(v) if units is None else num(convert(v, units[i][j]))
    return ("\\begin{bmatrix}" + " \\\\ ".join(" & ".join(entry(i, j, v) for j, v in enumerate(row))
                                                for i, row in enumerate(rows)) + "\\end{bmatrix}")


def vector(values, units: list[str] | None = None) -> str:
    """A column vector for LaTeX; with `units`, each SI entry converted and shown with its unit."""
    if units is None:
        return "\\begin{bmatrix}" + " \\\\ ".join(num(v) for v in values) + "\\end{bmatrix}"
    return "\\begin{bmatrix}" + " \\\\ ".join(quantity(convert(v, u), u) for v, u in zip(values, units)) + "\\end{bmatrix}"


CAUTIONS = [
    "Linear elastic, small-deflection Euler-Bernoulli theory for a prismatic member; shear deformation is "
    "neglected, which understates deflection of deep or short members.",
    "Superposition is valid only while the member stays linear elastic; the stress check shows whether it does.",
    "Not checked here: lateral-torsional and local buckling, web crippling and bearing, connections, vibration, "
    "ponding, long-term creep and shrinkage of timber or concrete, fire, fatigue, and axial effects.",
    "Load factors, combinations and deflection limits are the values written in the input file. Limits such as "
    "span/360, and twice the overhang length for cantilevers and overhangs, are common practice: confirm them "
    "against the governing local code.",
    "Deflections are measured from the unloaded position of the member, so they include the movement of "
    "spring supports and any prescribed settlement (conservative for span/N limits, which some codes apply to "
    "the deflection relative to the supports).",
    "The shear check is made at the neutral axis against the shear strength given with the material (`shear`), or "
    "else against fy/sqrt(3) (von Mises), which suits steel but overstates the shear strength of timber and other "
    "non-metallic materials: give theirs (a material given by `allowable bending` always gives its `shear`). "
    "Bending and shear are not combined.",
    "This calculation must be reviewed and accepted by a qualified, licensed engineer before it is relied on.",
]


SHEAR_CAUTION = (
    "Linear elastic, small-deflection beam theory with shear deformation (Timoshenko): the shear part "
    "V / (kappa G A) uses the shear area kappa A of each section's shape, by the rule stated with the section "
    "(a textbook approximation for I-shapes and boxes); rotary inertia and local effects at loads and supports "
    "are not modelled.")


def cautions(a: Analysis) -> list[str]:
    from beamlang.report.pattern_md import pattern_cautions
    listed = [SHEAR_CAUTION] + CAUTIONS[1:] if a.loaded.member.shear_deformation else list(CAUTIONS)
    if a.loaded.member.frequency_limits:
        from beamlang.report.frequency_md import CAUTIONS as FREQUENCY
        listed = [c.replace("connections, vibration, ", "connections, ") for c in listed]
        listed = listed[:-1] + FREQUENCY + listed[-1:]
    cautions = (listed[:3] + _moving_cautions(a) + listed[3:-1] + _allowables(a) + _unchecked_shear(a)
                + pattern_cautions(a) + listed[-1:])  # the review by a licensed engineer stays last
    lines = ["## Assumptions and cautions", ""] + [f"- {c}" for c in cautions]
    notes = a.loaded.member.notes
    if notes:
        lines += ["", "Notes from the input file (the engineer's own assumptions):", ""] + [f"- {md(n)}" for n in notes]
    return lines + [""]


def _allowables(a: Analysis) -> list[str]:
    """A material given by allowable stresses: they are used as written, its code's adjustments are not applied."""
    lines = sorted({st.material.span.line for st in a.loaded.member.stretches if st.material.allowable_bending})
    if not lines:
        return []
    where = ", ".join(str(n) for n in lines)
    return [f"The allowable bending and shear stresses of the material (input line{'s' if len(lines) > 1 else ''} "
            f"{where}) are used exactly as written. The adjustment factors of the governing timber or aluminium "
            "code (load duration, moisture and temperature service, size, repetitive member, lateral stability, "
            "welding and the like) are not applied here: they are the engineer's to apply to the values given."]


def _moving_cautions(a: Analysis) -> list[str]:
    """A member with a moving group: its wheel loads are static forces as written, beside the fatigue caution."""
    m = a.loaded.member
    if not any(m.moving(t.name) for t in a.solution.targets):
        return []
    return ["The moving group's wheel loads are applied as static forces, exactly as written: no dynamic "
            "amplification (impact allowance) of the vertical wheel loads is added, nor any horizontal wheel force "
            "(lateral or along the runway). Where the governing code calls for an allowance, include it in the "
            "wheel loads or in the combination's factor, and confirm it against that code. Fatigue under "
            "repeated passes of the group is not checked (see above)."]


def _unchecked_shear(a: Analysis) -> list[str]:
    """A stress check with a section given by its properties: its shear stress is not checked, say so."""
    m = a.loaded.member
    if not m.stress_checks:
        return []
    lines = sorted({st.section.span.line for st in m.stretches if st.section.Q is None or st.section.t is None})
    if not lines:
        return []
    where = ", ".join(str(n) for n in lines)
    return [f"The shear stress is not checked where the section is given by its properties (input line {where}) "
            "without `Q` and `t`, the first moment of area and the width at the neutral axis that V Q / (I t) "
            "needs: give them, or check the shear by hand."]


def traceability(a: Analysis) -> list[str]:
    import hashlib

    from beamlang.language.frontend import recorded_name
    src = a.loaded.source
    digest = hashlib.sha256(src.text.encode("utf-8")).hexdigest()
    width = len(str(len(src.text.splitlines())))
    listing = [f"{i:>{width}}  {text}" for i, text in enumerate(src.text.splitlines(), start=1)]
    longest = max((len(run) for run in re.findall(r"`+", src.text)), default=0)
    fence = "`" * max(3, longest + 1)  # the file's own backticks cannot close the block
    return ["## Traceability", "",
            f"Input file {md(recorded_name(a.loaded))}, SHA-256 `{digest}`, built by beamlang {__version__} "
            f"with {versions_text()}. Nothing in this package depends on the clock; rebuilding the same input "
            "with the same versions gives the same bytes.", "",
            "### Appendix: the input file, line by line", "", fence + "text", *listing, fence, ""]

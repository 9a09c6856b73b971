"""The checks in the calc package: Analysis -> every check's arithmetic, one substituted line at a time, in the
member's own units (each line a checker can tick)."""

from __future__ import annotations

from fractions import Fraction

from beamlang.analysis.checks import SQRT3, Check
from beamlang.analysis.display import CHECK_QUANTITY, check_name, convert, number, show
from beamlang.model import Member
from beamlang.pipeline import Analysis
from beamlang.report.tex import cell, md, num, quantity

RATIO_DIGITS = 4


def checks_detail(a: Analysis) -> list[str]:
    """The table of every check, then each check worked out, then the elastic-range statement."""
    u = a.units
    lines = ["## Checks", "", "| input line | check | actual | allowed | ratio | basis | result |",
             "|---|---|---|---|---|---|---|"]
    for c in a.checks:
        q = CHECK_QUANTITY[c.unit]
        lines.append(f"| {c.span.line} | {md(check_name(c, u))} | {show(c.actual, u, q, 6)} | "
                     f"{show(c.allowed, u, q, 6)} | {c.ratio:.4f} | {cell(basis(a, c))} | "
                     f"{'PASS' if c.passed else 'FAIL'} |")
    lines.append("")
    if a.checks:
        lines += ["### Each check worked out", "",
                  f"Every value below is in the units of this package ({_unit_list(u)}); each line substitutes the "
                  "values into the formula and gives the result, computed exactly and rounded only for display.", ""]
    for c in a.checks:
        lines += working(a, c)
    lines += ["Elastic range: superposition holds only while the member stays linear elastic.", ""]
    for r in a.results:
        st = r.stress
        if st.bending is None:
            continue
        shear = show(st.shear, u, "stress") if st.shear is not None else "not computed (section given by properties)"
        state = {True: "within the allowable stresses: elastic" if st.allowable else "elastic", False: "NOT elastic: superposition is not valid",
                 None: "above the allowable stresses, and no yield strength is given to say whether it stays elastic"
                 if st.allowable else "no yield strength given"}[st.elastic]
        lines.append(f"- {md(r.name)}: bending stress {show(st.bending, u, 'stress')}, shear stress {shear}: {state}.")
    return lines + [""]


def _unit_list(u: dict[str, str]) -> str:
    return (f"positions in {u['length']}, deflections in {u['deflection']}, forces in {u['force']}, moments in "
            f"{u['moment']}, stresses in {u['stress']}, section properties in {u['section']}")


def basis(a: Analysis, c: Check) -> str:
    """How the allowed value was found, in the package's units."""
    u, m = a.units, a.loaded.member
    if c.kind == "deflection":
        if c.place == "":
            return "absolute limit, on the largest deflection anywhere"
        n = number(c.divisor, 6)
        if c.region == "span":
            return f"span/{n}, the length of {c.place} ({show(c.length, u, 'length')})"
        return f"2 x {c.region} length / {n} ({show(c.length, u, 'length')}; twice the length: common practice)"
    if c.kind == "support slope":
        return f"slope at {support_at(m, c.x, u)}, limit given by the user"
    if c.kind == "frequency":
        return c.basis.replace("f1 at least the limit; ", "f1 at least the least frequency given; ")
    mat = m.stretches[c.stretch].material if c.stretch is not None else m.stretches[0].material
    where = f" (material line {mat.span.line})"
    if c.kind == "bending stress" and c.strength == "allowable":
        return "sigma = M c / I against the allowable bending stress Fb given with the material" + where
    if c.kind == "bending stress":
        return "sigma = M c / I against the yield strength fy" + where
    if c.strength == "shear" and mat.allowable_bending is not None:
        return "tau = V Q / (I t) against the allowable shear stress Fv given with the material" + where
    if c.strength == "shear":
        return "tau = V Q / (I t) against the shear strength fv given with the material" + where
    return "tau = V Q / (I t) against fy/sqrt(3) (von Mises)" + where


def working(a: Analysis, c: Check) -> list[str]:
    """One check's arithmetic, with the governing case or combination and place."""
    head = [f"**{md(check_name(c, a.units))}** (input line {c.span.line}): "
            f"{'PASS' if c.passed else 'FAIL'}", ""]
    if c.kind == "deflection":
        body = _deflection(a, c)
    elif c.kind == "support slope":
        body = _slope(a, c)
    elif c.kind == "frequency":
        return head + _frequency(a, c)
    elif c.kind == "bending stress":
        body = _bending(a, c)
    else:
        body = _shear(a, c)
    return head + body + _ratio(a, c)


def _ratio(a: Analysis, c: Check) -> list[str]:
    sym = {"deflection": "\\delta", "support slope": "\\theta", "bending stress": "\\sigma",
           "shear stress": "\\tau"}[c.kind]
    unit = a.units[CHECK_QUANTITY[c.unit]]
    verdict = "\\le 1" if c.passed else "> 1"
    return [f"$$\\frac{{{sym}}}{{{sym}_{{allow}}}} = \\frac{{{quantity(convert(c.actual, unit), unit)}}}"
            f"{{{quantity(convert(c.allowed, unit), unit)}}} = {num(c.ratio, RATIO_DIGITS)} {verdict}$$", ""]


def _deflection(a: Analysis, c: Check) -> list[str]:
    u, m = a.units, a.loaded.member
    d, L = u["deflection"], u["length"]
    moving = " over every position of the moving group" if m.moving(c.target) else ""
    pattern = a.result(c.target).pattern
    if pattern is not None:  # the envelope over every arrangement, and the one that gives this deflection
        up = c.at is not None and c.at.value > 0
        how = pattern.arrangement(f"largest deflection in {c.place}" if c.place else
                                  f"largest deflection {'up' if up else 'down'}")
        moving = " over every arrangement of the patterned loads" + (f" ({md(how)})" if how else "")
    where = f"at x = {show(c.x, u, 'length')}" if c.x is not None else "(no deflection)"
    if not c.place:
        return [f"The allowed deflection is the value given on the limit line: $\\delta_{{allow}} = "
                f"{quantity(convert(c.allowed, d), d)}$. The deflection checked is the largest of {md(c.target)} "
                f"anywhere on the member{moving}, {where}:", ""] + _magnitude(c, d)
    if c.region == "span":
        what = (f"L is the length of {c.place}, from {support_at(m, c.lo, u)} to {support_at(m, c.hi, u)}, and N = "
                f"{number(c.divisor, 6)} from the limit line:")
        length = (f"L = {quantity(convert(c.hi, L), L)} - {quantity(convert(c.lo, L), L)} = "
                  f"{quantity(convert(c.length, L), L)}")
    else:
        what = (f"L is twice the length of the {c.place} (common practice; confirm against the governing code), "
                f"from {support_at(m, c.lo, u)} to {support_at(m, c.hi, u)}, and N = {number(c.divisor, 6)} from "
                "the limit line:")
        length = (f"L = 2 \\times ({quantity(convert(c.hi, L), L)} - {quantity(convert(c.lo, L), L)}) = "
                  f"{quantity(convert(c.length, L), L)}")
    if L != d:
        length += f" = {quantity(convert(c.length, d), d)}"
    return [what, "", f"$${length}$$", "",
            f"$$\\delta_{{allow}} = \\frac{{L}}{{N}} = \\frac{{{quantity(convert(c.length, d), d)}}}"
            f"{{{number(c.divisor, 6)}}} = {quantity(convert(c.allowed, d), d)}$$", "",
            f"δ is the largest deflection magnitude of {md(c.target)} in {c.place}{moving}, {where}:", ""] + _magnitude(c, d)


def _magnitude(c: Check, d: str) -> list[str]:
    """δ = |v|; with shear deformation its bending and shear parts side by side, v = v_b + v_s."""
    if c.parts is None:
        return [f"$$\\delta = |v| = {quantity(convert(c.actual, d), d)}$$", ""]
    vb, vs = (convert(p, d) for p in c.parts)
    total = c.parts[0] + c.parts[1]
    return ["With shear deformation the deflection is the bending part $v_b$ (M/EI integrated twice, with any "
            "movement of the supports) plus the shear part $v_s$ (minus V/(κGA) integrated once), both at this "
            "place:", "",
            f"$$\\delta = |v_b + v_s| = |{quantity(vb, d)} {'+' if vs >= 0 else '-'} {quantity(abs(vs), d)}| = "
            f"{quantity(convert(c.actual, d), d)}$$", "",
            f"| part | deflection ({d}) | share of δ |", "|---|---|---|",
            *(f"| {name}, ${sym}$ | {number(convert(p, d), 6)} | {f'{100 * float(p / total):.1f} %' if total else '-'} |"
              for name, sym, p in (("bending", "v_b", c.parts[0]), ("shear", "v_s", c.parts[1]))), ""]


def _frequency(a: Analysis, c: Check) -> list[str]:
    """f1 against the least frequency: the ratio is the limit over f1 (at most 1 passes)."""
    verdict = "\\le 1" if c.passed else "> 1"
    return [f"f1 is the fundamental bending frequency with the {md(c.target)} (see Natural frequency); the least "
            "frequency allowed is the value given on the limit line:", "",
            f"$$\\frac{{f_{{min}}}}{{f_1}} = \\frac{{{quantity(c.allowed, 'Hz', 6)}}}{{{quantity(c.actual, 'Hz', 6)}}} "
            f"= {num(c.ratio, RATIO_DIGITS)} {verdict}$$", ""]


def _slope(a: Analysis, c: Check) -> list[str]:
    m = a.loaded.member
    return [f"θ is the slope of {md(c.target)} at {support_at(m, c.x, a.units)} (where a hinge sits over the support, "
            "the larger side); the allowed slope is the value given on the limit line:", "",
            f"$$|\\theta| = {quantity(c.actual, 'rad')}, \\qquad \\theta_{{allow}} = {quantity(c.allowed, 'rad')}$$", ""]


def stress_units(u: dict[str, str]) -> dict[str, str]:
    """Consistent units for a stress line: N, N*mm, mm, MPa in SI; kip, kip*in, in, ksi in US units."""
    if u["section"] == "mm":
        return {"force": "N", "moment": "N*mm", "section": "mm", "stress": u["stress"]}
    return {"force": "kip", "moment": "kip*in", "section": "in", "stress": u["stress"]}


def _governing(a: Analysis, c: Check, what: str) -> str:
    u, m = a.units, a.loaded.member
    moving = ", over every position of the moving group" if m.moving(c.target) else ""
    q = "moment" if what == "moment" else "force"
    if c.at is None:
        return f"no {what} in {md(c.target)}"
    pattern = a.result(c.target).pattern
    if pattern is not None:  # the envelope over every arrangement, and the one that gives this value
        extreme = ("largest shear" if what != "moment" else
                   "largest sagging moment" if c.at.value > 0 else "largest hogging moment")
        how = next((h for e, h, x, v, _ in pattern.arrangements if e == extreme and x == c.at.x and v == c.at.value),
                   None)
        moving = ", over every arrangement of the patterned loads" + (f" ({md(how)})" if how else "")
    sign = ""
    if what == "moment":
        sign = " (sagging)" if c.at.value > 0 else " (hogging)"
    side = f", just {c.at.side} of x = {show(c.x, u, 'length')}" if c.at.side else f", at x = {show(c.x, u, 'length')}"
    near = _near(m, c.x, u)
    return (f"the largest {what} magnitude of {md(c.target)}{moving}: {show(c.at.value, u, q, 6)}{sign}{side}"
            f"{near}")


def _near(m: Member, x: Fraction, u: dict[str, str]) -> str:
    sp = next((sp for sp in m.supports if sp.x == x), None)
    return f" ({support_at(m, x, u)})" if sp is not None else ""


def _section_of(a: Analysis, c: Check):
    m = a.loaded.member
    st = m.stretches[c.stretch if c.stretch is not None else 0]
    stepped = (f" (the stretch from {show(st.x1, a.units, 'length')} to {show(st.x2, a.units, 'length')})"
               if m.stepped else "")
    return st, stepped


def _bending(a: Analysis, c: Check) -> list[str]:
    w = stress_units(a.units)
    st, stepped = _section_of(a, c)
    sec, mat = st.section, st.material
    s, mo, f = w["section"], w["moment"], w["stress"]
    big_m = abs(c.at.value) if c.at is not None else Fraction(0)
    lines = [f"M is {_governing(a, c, 'moment')}; its magnitude, in units consistent with the section's:", "",
             f"$$|M| = {quantity(convert(big_m, a.units['moment']), a.units['moment'])} = "
             f"{quantity(convert(big_m, mo), mo)}$$", ""]
    if sec.c is not None:
        lines += [f"c = distance from the neutral axis to the extreme fibre, I = second moment of area, both of the "
                  f"section on line {sec.span.line}{stepped}:", "",
                  f"$$\\sigma = \\frac{{M c}}{{I}} = \\frac{{{quantity(convert(big_m, mo), mo)} \\times "
                  f"{quantity(convert(sec.c, s), s)}}}{{{quantity(convert(sec.I, s + '^4'), s + '^4')}}} = "
                  f"{quantity(convert(c.actual, f), f)}$$", ""]
    else:
        lines += [f"S = elastic section modulus, given on line {sec.span.line}{stepped}:", "",
                  f"$$\\sigma = \\frac{{M}}{{S}} = \\frac{{{quantity(convert(big_m, mo), mo)}}}"
                  f"{{{quantity(convert(sec.S, s + '^3'), s + '^3')}}} = {quantity(convert(c.actual, f), f)}$$", ""]
    name = md(mat.name or "the material")
    if c.strength == "allowable":
        return lines + [f"The allowable bending stress Fb is the value given with {name} (material line "
                        f"{mat.span.line}), used as written: no adjustment factor is applied to it here:", "",
                        f"$$\\sigma_{{allow}} = F_b = {quantity(convert(c.allowed, f), f)}$$", ""]
    lines += [f"The allowed bending stress is the yield strength fy of {name} (material line {mat.span.line}):", "",
              f"$$\\sigma_{{allow}} = f_y = {quantity(convert(c.allowed, f), f)}$$", ""]
    return lines


def _shear(a: Analysis, c: Check) -> list[str]:
    w = stress_units(a.units)
    st, stepped = _section_of(a, c)
    sec, mat = st.section, st.material
    s, fo, f = w["section"], w["force"], w["stress"]
    big_v = abs(c.at.value) if c.at is not None else Fraction(0)
    lines = [f"V is {_governing(a, c, 'shear')}:", "",
             f"$$|V| = {quantity(convert(big_v, a.units['force']), a.units['force'])}"
             + (f" = {quantity(convert(big_v, fo), fo)}" if fo != a.units["force"] else "") + "$$", "",
             f"Q = first moment of the area beyond the neutral axis, I = second moment of area, t = width at the "
             f"neutral axis, of the section on line {sec.span.line}{stepped}:", "",
             f"$$\\tau = \\frac{{V Q}}{{I t}} = \\frac{{{quantity(convert(big_v, fo), fo)} \\times "
             f"{quantity(convert(sec.Q, s + '^3'), s + '^3')}}}{{{quantity(convert(sec.I, s + '^4'), s + '^4')} "
             f"\\times {quantity(convert(sec.t, s), s)}}} = {quantity(convert(c.actual, f), f)}$$", ""]
    name = md(mat.name or "the material")
    if c.strength == "shear" and mat.allowable_bending is not None:
        return lines + [f"The allowable shear stress Fv is the value given with {name} (material line "
                        f"{mat.span.line}), used as written: no adjustment factor is applied to it here:", "",
                        f"$$\\tau_{{allow}} = F_v = {quantity(convert(c.allowed, f), f)}$$", ""]
    if c.strength == "shear":
        return lines + [f"The allowed shear stress is the shear strength fv given with {name} (material line "
                        f"{mat.span.line}):", "", f"$$\\tau_{{allow}} = f_v = {quantity(convert(c.allowed, f), f)}$$", ""]
    fy = convert(c.allowed, f) * SQRT3
    return lines + [f"No shear strength is given with {name}: the allowed shear stress is the von Mises shear yield "
                    f"fy/√3 of its yield strength (material line {mat.span.line}), which suits steel:", "",
                    f"$$\\tau_{{allow}} = \\frac{{f_y}}{{\\sqrt{{3}}}} = \\frac{{{quantity(fy, f)}}}{{\\sqrt{{3}}}} = "
                    f"{quantity(convert(c.allowed, f), f)}$$", ""]


def support_at(m: Member, x: Fraction, u: dict[str, str]) -> str:
    """A place named by what is there: 'the roller at 12 ft', 'the free end at 22 ft'."""
    where = show(x, u, "length")
    for sp in m.supports:
        if sp.x == x:
            return f"the {sp.kind} at {where}"
    if x == 0 or x == m.length:
        return f"the free end at {where}"
    return f"x = {where}"


"""A case's self-weight derived in the calc package: case loads -> w = rho A g on one line, with the area from the
section's own line, in the member's units."""

from __future__ import annotations

from beamlang.analysis.display import convert, number
from beamlang.language.units import STANDARD_GRAVITY
from beamlang.model import LineLoad
from beamlang.pipeline import Analysis
from beamlang.report.tex import quantity


def self_weight_lines(a: Analysis, t) -> list[str]:
    """One derivation per self-weight load (one per stretch on a stepped member)."""
    m = a.loaded.member
    out = []
    for ld in t.loads:
        if not isinstance(ld, LineLoad) or ld.origin != "self-weight":
            continue
        st = m.stretch_at(ld.x1, "right")
        mat, sec = st.material, st.section
        where = ""
        if m.stepped:
            L = a.units["length"]
            where = f" from {number(convert(ld.x1, L))} {L} to {number(convert(ld.x2, L))} {L}"
        out += [f"Self-weight of line {ld.span.line}{where}: density ρ of {mat.name or 'the material'} (material "
                f"line {mat.span.line}), area A of the section (section line {sec.span.line}), standard gravity "
                + ("g = 9.80665 m/s² (exact by definition) = 32.174049 ft/s²; one pound-force is the weight of a "
                   "pound of mass under g, 1 lbf = 32.174049 lb·ft/s² (NIST SP 811), so "
                   "32.174049 lb/s² make 1 lbf/ft:" if m.units == "us" else "g = 9.80665 m/s² (exact by definition):"), "",
                f"$${_formula(a, abs(ld.w1), mat.density, sec.A)}$$", ""]
    return out


def _formula(a: Analysis, w, density, area) -> str:
    u = a.units
    small = u["section"] + "^2"
    line = u["line load"]
    if a.loaded.member.units == "us":
        big = "ft^2"
        tail = (f"{quantity(convert(density, 'lb/ft^3'), 'lb/ft^3')} \\times {quantity(convert(area, big), big)} "
                f"\\times {quantity(convert(STANDARD_GRAVITY, 'ft/s^2'), 'ft/s^2', 8)} = "
                f"{quantity(convert(w, 'lb/s^2'), 'lb/s^2')} = {quantity(convert(w, 'lbf/ft'), 'lbf/ft')}")
        if line not in ("lbf/ft", "plf"):
            tail += f" = {quantity(convert(w, line), line)}"
        return f"A = {quantity(convert(area, small), small)}, \\quad w = \\rho A g = {tail}"
    tail = (f"{quantity(density, 'kg/m^3')} \\times {quantity(area, 'm^2')} \\times "
            f"{quantity(9.80665, 'm/s^2', 8)} = {quantity(w, 'N/m')}")
    if line != "N/m":
        tail += f" = {quantity(convert(w, line), line)}"
    return f"A = {quantity(convert(area, small), small)}, \\quad w = \\rho A g = {tail}"

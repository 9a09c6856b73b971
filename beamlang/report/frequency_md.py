"""The natural-frequency section of the calc package: Analysis -> the masses, the method, f1 and the mode shape."""

from __future__ import annotations

from beamlang.analysis.display import convert, number
from beamlang.pipeline import Analysis
from beamlang.report.tex import md, quantity

CAUTIONS = [
    "The frequency criterion and the mass to include (which loads, which fraction of the imposed load) are set by "
    "the governing code or guidance for the use (floors, footbridges, machine supports): confirm both.",
    "Only the fundamental frequency of bending in the plane of the loads is found; the response to walking, "
    "running, machinery or other dynamic loads (accelerations, resonance with harmonics, damping) is not checked, "
    "nor are lateral, torsional or higher modes.",
    "The masses are the downward loads of the named cases divided by standard gravity (9.80665 m/s^2); moments "
    "and settlements carry no mass; rotary inertia is neglected; the supports are as modelled for the static "
    "analysis (a real bearing or connection may be stiffer or softer).",
]


# units in which f1 = pi / (2 L^2) sqrt(EI / m) comes out in Hz: SI, and kip, inch, second for US members
CONSISTENT = {"si": ("m", "N*m^2", "kg/m"), "us": ("in", "kip*in^2", "kip*s^2/in^2")}


def frequency_section(a: Analysis, figures: dict[str, str]) -> list[str]:
    """One subsection per `limit frequency` line (none when the member has none)."""
    if not a.frequencies:
        return []
    lines = ["## Natural frequency", ""]
    for k, found in enumerate(a.frequencies):
        lines += _one(a, found, figures.get(f"(mode) {k}"))
    return lines


def _one(a: Analysis, found, figure: str | None) -> list[str]:
    u, m = a.units, a.loaded.member
    f, limit = found.frequency, found.limit
    L, ml, mp = u["length"], u["mass per length"], u["mass"]
    lines = [f"### Mass {md(limit.text)} (input line {limit.span.line})", "",
             "The vibrating mass is the downward loads of these cases, each with its factor, divided by standard "
             "gravity g = 9.80665 m/s^2; self-weight is in it where a case holds `self-weight`.", ""]
    if found.masses.lines:
        lines += [f"| from ({L}) | to ({L}) | mass per length at the start ({ml}) | at the end ({ml}) |",
                  "|---|---|---|---|"]
        lines += [f"| {number(convert(x1, L), 6)} | {number(convert(x2, L), 6)} | {number(convert(m1, ml), 6)} | "
                  f"{number(convert(m2, ml), 6)} |" for x1, x2, m1, m2 in found.masses.lines] + [""]
    if found.masses.points:
        lines += [f"| point mass at ({L}) | mass ({mp}) |", "|---|---|"]
        lines += [f"| {number(convert(x, L), 6)} | {number(convert(mass, mp), 6)} |"
                  for x, mass in found.masses.points] + [""]
    lines += _method(a, found) + [
        f"$$f_1 = {quantity(f.hz, 'Hz', 6)}, \\qquad f_{{min}} = {quantity(convert(limit.value, 'Hz'), 'Hz', 6)}$$", ""]
    if figure:
        lines += [f"![first bending mode, mass {md(limit.text)}]({figure})", ""]
    return lines


def _method(a: Analysis, found) -> list[str]:
    f, m = found.frequency, a.loaded.member
    tries = ", ".join(f"{n}: {number(hz, 9)} Hz" for n, hz in f.history)
    numeric = (f"Finite elements (numerical, floating point): Hermite cubic elements"
               + (" with shear flexibility (phi = 12 EI / (κGA l^2))" if m.shear_deformation else "")
               + ", each taking its stretch's EI, a node at every support, hinge, change of section, point mass and "
               "end of a line mass; a consistent mass matrix; springs as their stiffness. K u = ω² M u is solved by "
               "scipy.linalg.eigh (generalized symmetric); every element is halved until the first frequency changes "
               f"by less than 1e-06 relative. Meshes tried (elements: f1): {tries}. The last change was "
               f"{f.change:.1e} relative, below the tolerance 1e-06.")
    if f.method == "closed form":
        rel = abs(f.hz - f.fe_hz) / f.hz
        st = m.stretches[0]
        mass = sum((m1 for _, _, m1, _ in found.masses.lines), 0)
        L, EI, ml = CONSISTENT[m.units]
        return [f"The member is a uniform simple span with a uniform mass: the closed form applies (in consistent "
                f"units: L in {L}, EI in {EI}, m in {ml}),", "",
                f"$$f_1 = \\frac{{\\pi}}{{2 L^2}} \\sqrt{{\\frac{{EI}}{{m}}}} = \\frac{{\\pi}}{{2 \\times "
                f"({quantity(convert(m.length, L), L, 6)})^2}} \\sqrt{{\\frac{{{quantity(convert(st.EI, EI), EI, 6)}}}"
                f"{{{quantity(convert(mass, ml), ml, 6)}}}}} = {quantity(f.hz, 'Hz', 6)}$$", "",
                f"As a check: {numeric} It gives {number(f.fe_hz, 9)} Hz, {rel:.1e} relative from the closed form.", ""]
    return [numeric, ""]

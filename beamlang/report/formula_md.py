"""One load's general formula in the calc package: load + member -> v(x) in symbols, and every symbol named with
its value and unit (consistent units: N and m in SI, kip and in in US units)."""

from __future__ import annotations

from beamlang.analysis.display import convert, number
from beamlang.analysis.working import general_formula
from beamlang.model import Load, Member
from beamlang.pipeline import Analysis
from beamlang.report.tex import plain, quantity, sympy_tex

# consistent units for substituting into a formula: v comes out in the length unit
CONSISTENT = {
    "si": {"length": "m", "force": "N", "stress": "Pa", "I": "m^4", "moment": "N*m", "line load": "N/m",
           "stiffness": "N/m"},
    "us": {"length": "in", "force": "kip", "stress": "ksi", "I": "in^4", "moment": "kip*in", "line load": "kip/in",
           "stiffness": "kip/in"},
}
SUPPORT_LETTERS = "ABCDEFGHJKMNPQRSTUVWXYZ"  # as the symbolic solver names supports, in order


def formula_lines(a: Analysis, ld: Load) -> list[str]:
    """v(x) per segment in symbols, then each symbol: its value in consistent units and what it is."""
    m = a.loaded.member
    system = "si" if a.units["length"] == "m" else "us"
    units = CONSISTENT[system]
    segments, names = general_formula(m, ld)
    out = []
    for start, end, expr in segments:
        lo, hi = plain(convert(start, units["length"])), plain(convert(end, units["length"]))
        out += [f"$$v(x) = {sympy_tex(expr)} \\qquad ({lo} \\le x \\le {hi})$$", ""]
    consistent = ("SI units: N, m, Pa" if system == "si" else
                  "consistent units: kip, in, ksi; the package's own units beside")
    out += [f"with v and x in {units['length']} ({consistent}), where:", ""]
    for name, value in names.items():
        kind, meaning = _meaning(m, ld, name, a.units)
        shown = f"${_symbol(name)} = {quantity(convert(value, units[kind]), units[kind])}$"
        own = {"length": a.units["length"], "line load": a.units["line load"], "moment": a.units["moment"]}.get(kind)
        if own is not None and own != units[kind]:
            shown += f" ({number(convert(value, own), 6)} {own})"
        out.append(f"- {shown}: {meaning}")
    return out + [""]


def _symbol(name: str) -> str:
    base, _, sub = name.partition("_")
    base = "\\Delta" if base == "Delta" else base
    return f"{base}_{{{sub}}}" if sub else base


def _meaning(m: Member, ld: Load, name: str, u: dict[str, str]) -> tuple[str, str]:
    """(kind of unit, what the symbol stands for) for one symbol of the general formula."""
    fixed = {"L": ("length", "the member's length"),
             "E": ("stress", f"the elastic modulus (material line {m.stretches[0].material.span.line})"),
             "I": ("I", f"the second moment of area (section line {m.stretches[0].section.span.line})"),
             "P": ("force", "the magnitude of the point load"), "C": ("moment", "the magnitude of the applied moment"),
             "w": ("line load", "the intensity of the line load"), "w_1": ("line load", "its intensity at its start"),
             "w_2": ("line load", "its intensity at its end"), "Delta": ("length", "the settlement of the support"),
             "b": ("length", "where the line load ends")}
    if name == "a":
        return "length", ("the position of the load" if not hasattr(ld, "x1") else "where the line load starts")
    if name in fixed:
        return fixed[name]
    letter = name.partition("_")[2]
    sp = m.supports[SUPPORT_LETTERS.index(letter)]
    where = f"the {sp.kind} at {number(convert(sp.x, u['length']), 6)} {u['length']} (line {sp.span.line})"
    if name.startswith("k_"):
        return "stiffness", f"the stiffness of {where}"
    return "length", f"the position of {where}"


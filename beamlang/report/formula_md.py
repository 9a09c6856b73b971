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


def formula_lines(a: Analysis, ld: Load, before: dict | None = None, where: str = "above") -> list[str]:
    """v(x) per segment in symbols, then each symbol: its value in consistent units and what it is. `before`
    keeps, per general formula written out before, the line of its load, its symbols' values and `where` it is
    (its section): a load with the same formula refers to it and names only the symbols whose values differ."""
    m = a.loaded.member
    system = "si" if a.units["length"] == "m" else "us"
    units = CONSISTENT[system]
    segments, names = general_formula(m, ld)
    same = tuple(expr for _start, _end, expr in segments), tuple(names)
    if before is not None and same in before:
        line, values, there = before[same]
        changed = [name for name, value in names.items() if values[name] != value]
        listed = ", ".join(_value(m, ld, name, names[name], a.units, units) for name in changed) or "no symbol"
        return [f"Its general formula is that of the load of line {line} ({there}), segment by segment (this "
                f"load's segment ends in the table below), with {listed}; every other symbol as there.", ""]
    if before is not None:
        before[same] = (ld.span.line, dict(names), where)
    out = []
    for start, end, expr in segments:
        lo, hi = plain(convert(start, units["length"])), plain(convert(end, units["length"]))
        out += [_display(expr, f"\\qquad ({lo} \\le x \\le {hi})"), ""]
    consistent = ("SI units: N, m, Pa" if system == "si" else
                  "consistent units: kip, in, ksi; the package's own units beside")
    out += [f"with v and x in {units['length']} ({consistent}), where:", ""]
    for name, value in names.items():
        out.append(f"- {_value(m, ld, name, value, a.units, units)}: {_meaning(m, ld, name, a.units)[1]}")
    return out + [""]


def _value(m: Member, ld: Load, name: str, value, u: dict, units: dict) -> str:
    """A symbol = its value in consistent units, and in the package's own unit beside where that differs."""
    kind = _meaning(m, ld, name, u)[0]
    shown = f"${_symbol(name)} = {quantity(convert(value, units[kind]), units[kind])}$"
    own = {"length": u["length"], "line load": u["line load"], "moment": u["moment"]}.get(kind)
    if own is not None and own != units[kind]:
        shown += f" ({number(convert(value, own), 6)} {own})"
    return shown


LINE = 120  # characters of TeX in one line of a broken display (about the text width of a sheet)


def _display(expr, where: str) -> str:
    """v(x) = expr as a display; a long one is broken into lines (`aligned`) at the terms of its longest factor:
    the other factors as a fraction, then that sum in parentheses, a few terms a line, so that every symbol stays
    legible when printed, where shrinking the whole to the text width would not."""
    whole = sympy_tex(expr)
    if len(whole) <= LINE * 3 // 2:
        return f"$$v(x) = {whole} {where}$$"
    import sympy
    coeff, factors = expr.as_coeff_mul()
    sums = [f for f in factors if f.is_Add]
    if not sums:
        return f"$$v(x) = {whole} {where}$$"
    big = max(sums, key=lambda f: (len(sympy_tex(f)), sympy.default_sort_key(f)))
    rest = sympy.Mul(coeff, *(f for f in factors if f is not big))
    lead = "" if rest == 1 else ("-" if rest == -1 else sympy_tex(rest))
    lines, line = [], ""
    for k, term in enumerate(big.as_ordered_terms()):
        negative = term.could_extract_minus_sign()
        text = sympy_tex(-term if negative else term)
        sign = ("- " if negative else "") if k == 0 else (" - " if negative else " + ")
        room = LINE - (len(lead) // 2 if not lines else 0)  # the first line also holds the fraction
        if line and len(line) + len(text) > room:
            lines.append(line)
            line = sign.strip() + " "
            sign = ""
        line += sign + text
    lines.append(line)
    rows = [f"v(x) = {{}} & {lead} ({lines[0]}"] + [f"& \\quad {part}" for part in lines[1:]]
    rows[-1] += f") {where}"
    return "$$\\begin{aligned} " + " \\\\ ".join(rows) + " \\end{aligned}$$"


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


"""Display: exact SI values -> numbers in the member's report units, with explicit, deterministic formatting."""

from __future__ import annotations

from fractions import Fraction

from beamlang.language.syntax import Linear, SpanLength, Uniform
from beamlang.language.units import factor_of
from beamlang.model import Member
from beamlang.poly import Poly

REPORT_UNITS = {
    # "section": the length unit of section dimensions and properties (mm^4, in^4, ...)
    "si": {"length": "m", "deflection": "mm", "force": "kN", "moment": "kN*m", "stress": "MPa", "slope": "rad",
           "section": "mm", "line load": "kN/m", "density": "kg/m^3", "frequency": "Hz", "mass per length": "kg/m",
           "mass": "kg"},
    "us": {"length": "ft", "deflection": "in", "force": "kip", "moment": "kip*ft", "stress": "ksi", "slope": "rad",
           "section": "in", "line load": "plf", "density": "lb/ft^3", "frequency": "Hz", "mass per length": "lb/ft",
           "mass": "lb"},
}


CHECK_QUANTITY = {"m": "deflection", "rad": "slope", "Pa": "stress", "Hz": "frequency"}  # a check's SI unit -> its report quantity

SMALL_US = {"length": "in", "moment": "kip*in"}  # members whose span is written in inches


def report_units(member: Member) -> dict[str, str]:
    """The units a member is reported in: by its system, in inches when its span is written in inches."""
    units = dict(REPORT_UNITS[member.units])
    span_unit = next((st.length.unit for _, st in member.document.statements if isinstance(st, SpanLength)), "")
    if member.units == "us" and span_unit in ("in", "inch", "inches"):
        units.update(SMALL_US)
    written = next((st.intensity.unit if isinstance(st, Uniform) else st.start_intensity.unit
                    for _, st in member.document.statements if isinstance(st, (Uniform, Linear))), None)
    if written is not None and factor_of(written) is not None and factor_of(written).kind == "force per length":
        units["line load"] = written  # line loads are shown in the unit they were written in
    return units


def working_units(units: dict[str, str]) -> dict[str, str]:
    """The units the worked curves, redundants and loads are shown in: N and m in an SI member (as computed), the
    package's own units (ft, in, kip, kip*ft) in a US one."""
    if units["length"] == "m":
        return {"length": "m", "deflection": "m", "force": "N", "moment": "N*m", "slope": "rad", "line load": "N/m"}
    return {key: units[key] for key in ("length", "deflection", "force", "moment", "slope", "line load")}


def scaled(p: Poly, x_unit: str, y_unit: str) -> Poly:
    """A polynomial in SI (y in SI with x in m) rewritten as y in `y_unit` with x in `x_unit` (exact)."""
    fx, fy = factor_of(x_unit).factor, factor_of(y_unit).factor
    return Poly(tuple(c * fx**k / fy for k, c in enumerate(p.coeffs)))


def convert(value: Fraction, unit: str) -> Fraction:
    """An SI value expressed in `unit` (exact)."""
    if type(value) is Fraction:  # a Fraction over gmpy2's mpq factor: divide as Fractions
        return value / Fraction(int(factor_of(unit).factor.numerator), int(factor_of(unit).factor.denominator))
    return value / factor_of(unit).factor


def number(value: Fraction | float | None, digits: int = 4) -> str:
    """Fixed significant digits, no exponent for ordinary magnitudes, '-0' never printed."""
    if value is None:
        return "-"
    f = float(value)
    if f == 0:
        return "0"
    text = f"{f:.{digits}g}"
    if "e" in text:
        mantissa, exp = text.split("e")
        return f"{mantissa}e{int(exp)}"
    return text


def show(value: Fraction | None, units: dict[str, str], quantity: str, digits: int = 4) -> str:
    """An SI value in the report unit of its quantity, with the unit."""
    if value is None:
        return "-"
    unit = units[quantity]
    return f"{number(convert(value, unit), digits)} {unit}"


def place(check, units: dict[str, str]) -> str:
    """The span or overhang a span/N check is on, in report units: 'span 2, 12 ft to 22 ft' ('' otherwise)."""
    if not check.place:
        return ""
    L = units["length"]
    return f"{check.place}, {number(convert(check.lo, L))} {L} to {number(convert(check.hi, L))} {L}"


def check_name(check, units: dict[str, str]) -> str:
    """A check as a checker names it: 'deflection live, span 2, 12 ft to 22 ft'."""
    where = place(check, units)
    return f"{check.kind} {check.target}" + (f", {where}" if where else "")


def governing(checks) -> object | None:
    """The check with the largest ratio (the first of equal ones, in the order listed)."""
    best = None
    for c in checks:
        if best is None or c.actual * best.allowed > best.actual * c.allowed:
            best = c
    return best


def at(check, units: dict[str, str]) -> str:
    """Where a check governs, in report units, with the side of a jump: 'x = 12 ft (just left)'."""
    if check.x is None:
        return "-"
    L = units["length"]
    side = getattr(check.at, "side", "") if check.at is not None else ""
    return f"x = {number(convert(check.x, L))} {L}" + (f" (just {side})" if side else "")

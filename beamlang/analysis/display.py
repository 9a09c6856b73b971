"""Display: exact SI values -> numbers in the member's report units, with explicit, deterministic formatting."""

from __future__ import annotations

from fractions import Fraction

from beamlang.language.syntax import SpanLength
from beamlang.language.units import factor_of
from beamlang.model import Member

REPORT_UNITS = {
    # "section": the length unit of section dimensions and properties (mm^4, in^4, ...)
    "si": {"length": "m", "deflection": "mm", "force": "kN", "moment": "kN*m", "stress": "MPa", "slope": "rad",
           "section": "mm"},
    "us": {"length": "ft", "deflection": "in", "force": "kip", "moment": "kip*ft", "stress": "ksi", "slope": "rad",
           "section": "in"},
}


CHECK_QUANTITY = {"m": "deflection", "rad": "slope", "Pa": "stress"}  # a check's SI unit -> its report quantity

SMALL_US = {"length": "in", "moment": "kip*in"}  # members whose span is written in inches


def report_units(member: Member) -> dict[str, str]:
    """The units a member is reported in: by its system, in inches when its span is written in inches."""
    units = dict(REPORT_UNITS[member.units])
    span_unit = next((st.length.unit for _, st in member.document.statements if isinstance(st, SpanLength)), "")
    if member.units == "us" and span_unit in ("in", "inch", "inches"):
        units.update(SMALL_US)
    return units


def convert(value: Fraction, unit: str) -> Fraction:
    """An SI value expressed in `unit` (exact)."""
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

"""Display: exact SI values -> numbers in the member's report units, with explicit, deterministic formatting."""

from __future__ import annotations

from fractions import Fraction

from .units import factor_of

REPORT_UNITS = {
    "si": {"length": "m", "deflection": "mm", "force": "kN", "moment": "kN*m", "stress": "MPa", "slope": "rad"},
    "us": {"length": "ft", "deflection": "in", "force": "kip", "moment": "kip*ft", "stress": "ksi", "slope": "rad"},
}


def unit_for(system: str, quantity: str) -> str:
    return REPORT_UNITS[system][quantity]


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


def show(value: Fraction | None, system: str, quantity: str, digits: int = 4) -> str:
    if value is None:
        return "-"
    unit = unit_for(system, quantity)
    return f"{number(convert(value, unit), digits)} {unit}"

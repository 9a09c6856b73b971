"""Units at the edge: a quantity as written -> exact SI Fraction (one pint registry, exact factors)."""

from __future__ import annotations

import difflib
import re
from dataclasses import dataclass, replace
from fractions import Fraction
from functools import lru_cache

from beamlang.errors import Diagnostic
from beamlang.exact import Q
from beamlang.language.syntax import Quantity

KINDS = {
    "length": "[length]",
    "force": "[force]",
    "moment": "[force]*[length]",
    "force per length": "[force]/[length]",
    "stress": "[pressure]",
    "density": "[mass]/[length]**3",
    "second moment of area": "[length]**4",
    "section modulus": "[length]**3",
    "area": "[length]**2",
    "angle": "[]",
    "frequency": "1/[time]",
}
EXAMPLE_UNIT = {
    "length": "m", "force": "kN", "moment": "kN*m", "force per length": "kN/m", "stress": "MPa",
    "density": "kg/m^3", "second moment of area": "mm^4", "section modulus": "mm^3", "area": "mm^2",
    "angle": "rad", "frequency": "Hz",
}
# US trade shorthands, written as one word (common practice, no source): pounds and kips per linear foot,
# per square foot, pounds per cubic foot.
SHORTHANDS = {"plf": "lbf/ft", "klf": "kip/ft", "psf": "lbf/ft**2", "ksf": "kip/ft**2", "pcf": "lb/ft**3"}
COMMON_UNITS = ("m", "mm", "cm", "km", "ft", "in", "N", "kN", "MN", "lbf", "kip", "Pa", "kPa", "MPa",
                "GPa", "psi", "ksi", "kN/m", "N/mm", "kip/ft", "lbf/ft", "lbf/in", "kN*m", "N*m",
                "kip*ft", "kip*in", "lbf*ft", "kg/m^3", "lb/ft^3", "mm^4", "in^4", "cm^4", "m^4",
                "mm^2", "in^2", "mm^3", "in^3", "kN/mm", "kip/in", "rad", "Hz", *SHORTHANDS)
POUND_MASS = re.compile(r"(?<![A-Za-z])lbs?(?![A-Za-z])")  # lb or lbs, not lbf
STANDARD_GRAVITY = Q(980665, 100000)  # m/s^2, exact by definition (CGPM 1901; NIST SP 811)


@dataclass(frozen=True, slots=True)
class Factor:
    """How one unit spelling converts to SI: value_SI = number * factor."""

    unit: str
    si_unit: str
    factor: Fraction
    kind: str | None


class UnitProblem(Exception):
    def __init__(self, diagnostic: Diagnostic):
        super().__init__(diagnostic.message)
        self.diagnostic = diagnostic


@lru_cache(maxsize=1)
def registry():
    """The one pint registry of the process, with exact Fraction arithmetic (see `make_registry`)."""
    return make_registry()


def make_registry():
    """A pint registry, read from this install's own cache when it can be (it takes about 1.2 s to build
    from pint's definition files, 0.2 s from the cache).

    The cache folder belongs to one install and version of beamlang and pint (`cache_folder`), is filled in
    a hidden folder and renamed into place whole, and is only ever an accelerator: whatever goes wrong with
    it (cut short by a kill, left by a removed install, a file in its place, no permission) the registry is
    built without it."""
    import pint
    folder = cache_folder()
    if folder is not None:
        try:
            return _checked(_from_cache(folder))
        except Exception:  # noqa: BLE001 (any failure of the cache means: do without it)
            _discard(folder)
    return pint.UnitRegistry(non_int_type=Fraction, cache_folder=None)


def cache_folder():
    """`<user cache>/beamlang/units-<beamlang>-<pint>-<install digest>`, or None when BEAMLANG_CACHE is `off`.

    BEAMLANG_CACHE names another parent folder; by default the platform's user cache folder."""
    import hashlib
    import os
    import sys

    import pint

    from beamlang import __version__
    from beamlang.cache import cache_root
    root = cache_root()
    if root is None:
        return None
    install = "\n".join((os.path.realpath(pint.__file__), os.path.realpath(__file__), sys.version))
    digest = hashlib.sha256(install.encode("utf-8")).hexdigest()[:16]
    return root / f"units-{__version__}-pint-{pint.__version__}-{digest}"


def _from_cache(folder):
    """The registry read from the cache folder; a missing folder is filled first in a hidden folder beside it
    and renamed into place in one step (so it is whole or absent, never cut short)."""
    import os
    import shutil
    import tempfile

    import pint

    from beamlang.cache import retire_others
    if folder.is_dir():
        return pint.UnitRegistry(non_int_type=Fraction, cache_folder=folder)
    folder.parent.mkdir(parents=True, exist_ok=True)
    staging = tempfile.mkdtemp(prefix=f".{folder.name}.", dir=folder.parent)
    try:
        ureg = _checked(pint.UnitRegistry(non_int_type=Fraction, cache_folder=staging))
        try:
            os.rename(staging, folder)
            retire_others(folder)
        except OSError:  # another process was first: its folder is as good
            pass
    finally:
        shutil.rmtree(staging, ignore_errors=True)
    return ureg


def _checked(ureg):
    """A registry that converts a kilonewton metre exactly, or an error (a damaged cache can load half)."""
    if ureg.Quantity(Fraction(1), "kN*m").to("N*m").magnitude != 1000:
        raise ValueError("the unit registry does not convert kN*m")
    return ureg


def _discard(folder) -> None:
    import shutil
    try:
        if folder.is_symlink() or folder.is_file():
            folder.unlink()
        else:
            shutil.rmtree(folder)
    except OSError:
        pass


@lru_cache(maxsize=1)
def _dimensions() -> dict[str, object]:
    ureg = registry()
    return {name: ureg.get_dimensionality(dim) for name, dim in KINDS.items()}


def _pint_text(unit: str) -> str:
    if unit in SHORTHANDS:
        return SHORTHANDS[unit]
    return unit.replace("^", "**").replace("\u00b7", "*").replace("\u00b5", "u").replace("\u03bc", "u")


@lru_cache(maxsize=512)
def factor_of(unit: str) -> Factor | None:
    """The exact SI factor of a unit spelling, or None when pint does not know it."""
    import pint
    ureg = registry()
    try:
        q = ureg.Quantity(Fraction(1), _pint_text(unit)).to_base_units()
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, AttributeError,
            TypeError, ValueError, SyntaxError, AssertionError, KeyError, ArithmeticError):
        return None  # ArithmeticError: a spelling pint reads with a zero in it, such as kg/0m^3 (found by fuzzing)
    magnitude = Q(Fraction(q.magnitude))
    kind = next((n for n, d in _dimensions().items() if d == q.dimensionality), None)
    return Factor(unit, _si_unit(kind), magnitude, kind)


def _si_unit(kind: str | None) -> str:
    return {"length": "m", "force": "N", "moment": "N*m", "force per length": "N/m", "stress": "Pa",
            "density": "kg/m^3", "second moment of area": "m^4", "section modulus": "m^3",
            "area": "m^2", "angle": "rad", "frequency": "Hz"}.get(kind or "", "?")


def to_si(q: Quantity, kind: str, what: str, hint: str | None = None) -> Fraction:
    """Convert a written quantity to exact SI, checking that it is the expected kind; a length written in
    parts (`22 ft 6 in`) is the exact sum of its parts."""
    if q.parts:
        return _in_parts(q, kind, what)
    f = factor_of(q.unit)
    if f is None:
        close = difflib.get_close_matches(q.unit, COMMON_UNITS, n=1, cutoff=0.5)
        extra = f"did you mean '{close[0]}'?" if close else "units are written like m, mm, ft, kN, kip, kN/m, kN*m, MPa, mm^4"
        raise UnitProblem(Diagnostic(q.unit_span, f"unknown unit '{q.unit}'", extra))
    if f.kind != kind:
        got = _article(f.kind) if f.kind else "not a unit this language uses"
        if POUND_MASS.search(q.unit) and kind != "density":
            got = "in lb, the pound of mass (this language uses it for densities, e.g. \"35 lb/ft^3\")"
        label = {"moment": "a force times a length", "section modulus": "a length cubed"}.get(kind) or _article(kind)
        message = f"{what} must be {label} (e.g. \"10 {EXAMPLE_UNIT[kind]}\"); got \"{q}\", which is {got}"
        if POUND_MASS.search(q.unit) and kind != "density":
            hint = f"a pound-force is lbf: write \"{q.number} {POUND_MASS.sub('lbf', q.unit)}\""
        raise UnitProblem(Diagnostic(q.span, message, hint))
    value = exact_number(q.number, q.span) * f.factor
    if not in_range(value):
        raise UnitProblem(Diagnostic(q.span, f"{what} of {q} is {_magnitude(value)} {f.si_unit}, surely a typo",
                                     f"values {ACCEPTED} {f.si_unit} are accepted"))
    return value


def in_parts(q: Quantity) -> bool:
    """True when a quantity written in parts goes from larger units to smaller, each part less than one of the
    unit before it (`22 ft 6 in`, `2 m 250 mm`): a length in parts, not two quantities side by side."""
    units = [factor_of(part.unit) for part in (q, *q.parts)]
    if any(f is None or f.kind != "length" for f in units):
        return False
    try:
        values = [exact_number(part.number, part.span) * f.factor for part, f in zip(q.parts, units[1:])]
    except UnitProblem:
        return False
    return all(big.factor > small.factor and v < big.factor for big, small, v in zip(units, units[1:], values))


def _in_parts(q: Quantity, kind: str, what: str) -> Fraction:
    if kind != "length":
        raise UnitProblem(Diagnostic(q.parts[0].span, f"only a length may be written in parts; {what} takes one "
                                     "number and one unit", f"write it as one quantity, e.g. \"10 {EXAMPLE_UNIT[kind]}\""))
    first = Quantity(q.number, q.unit, replace(q.span, end_col=q.unit_span.end_col), q.unit_span)
    total = sum((to_si(part, "length", what) for part in (first, *q.parts)), Q(0))
    if not in_parts(q):
        raise UnitProblem(Diagnostic(q.span, f"{what} of {q}: a length in parts goes from the larger unit to the "
                                     "smaller, each part less than one of the unit before it",
                                     "write e.g. `22 ft 6 in` or `2 m 250 mm`, or one number and one unit"))
    if not in_range(total):
        raise UnitProblem(Diagnostic(q.span, f"{what} of {q} is {_magnitude(total)} m, surely a typo",
                                     f"values {ACCEPTED} m are accepted"))
    return total


LOWEST, HIGHEST = Fraction(1, 10**12), Fraction(10**12)  # in SI base units: anything outside is a typo
ACCEPTED = "between 1e-12 and 1e12"  # LOWEST and HIGHEST as the hints print them


def in_range(value: Fraction) -> bool:
    """True for zero and for magnitudes from LOWEST to HIGHEST; anything else is surely a typo."""
    return not value or LOWEST <= abs(value) <= HIGHEST
MAX_DIGITS = 30  # digits and exponent size of a written number


def exact_number(text: str, span) -> Fraction:
    """A written decimal as an exact Fraction, refusing numbers too long or too large to be meant."""
    mantissa, _, exponent = text.lower().partition("e")
    if len(mantissa.replace(".", "")) > MAX_DIGITS or (exponent and abs(int(exponent)) > MAX_DIGITS):
        raise UnitProblem(Diagnostic(span, f"the number {text[:40]} is out of range",
                                     f"numbers have at most {MAX_DIGITS} digits and exponents up to {MAX_DIGITS}"))
    return Q(text)


def _magnitude(value: Fraction) -> str:
    return f"{float(value):.3g}"


def _article(kind: str) -> str:
    return ("an " if kind[0] in "aeiou" else "a ") + kind


def is_us(unit: str) -> bool:
    """True for US customary length spellings (used to pick the default report units)."""
    return _pint_text(unit).strip() in {"ft", "foot", "feet", "in", "inch", "inches", "yd", "yard"}

"""The engine's exact rational type: gmpy2's mpq where it is installed, else fractions.Fraction.

Measured here: mpq multiplies and adds rationals of the engine's size about 12 times faster than
Fraction. Both are numbers.Rational; they mix (Fraction op mpq gives mpq), and equal values compare
and hash alike, so the model's numbers start as Q and the rest follows by arithmetic."""

from __future__ import annotations

from fractions import Fraction

try:
    from gmpy2 import mpq as Q
except ImportError:  # pragma: no cover - gmpy2 is a dependency; Fraction keeps a source tree usable
    Q = Fraction


def fraction(value) -> Fraction:
    """The same rational as a Fraction with int parts (for Fraction-only methods such as limit_denominator)."""
    return Fraction(int(value.numerator), int(value.denominator))


def plain(value) -> str:
    """A length, count or factor in plain decimals (six significant digits) for a message or a basis text."""
    return f"{float(value):.6g}"

"""Curves: the exact shear, moment, slope and deflection of a member under some loads, with its reactions."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.poly import Piecewise


@dataclass(frozen=True, slots=True)
class Curves:
    """Shear, moment, slope and deflection (SI), with the reaction (force, moment) at every support.

    With shear deformation, `v` holds both parts and `vs` the shear part alone (v - vs is the bending part);
    `theta` is then the rotation of the cross-section, and the slope of `v` is theta - V / (kappa G A)."""

    V: Piecewise
    M: Piecewise
    theta: Piecewise
    v: Piecewise
    reactions: tuple[tuple[Fraction, Fraction], ...]
    vs: Piecewise | None = None  # the shear part of v, when the member includes shear deformation

    def __add__(self, other: "Curves") -> "Curves":
        vs = self.vs if other.vs is None else (other.vs if self.vs is None else self.vs + other.vs)
        return Curves(self.V + other.V, self.M + other.M, self.theta + other.theta, self.v + other.v,
                      tuple((a + c, b + d) for (a, b), (c, d) in zip(self.reactions, other.reactions)), vs)

    def scaled(self, k) -> "Curves":
        return Curves(self.V * k, self.M * k, self.theta * k, self.v * k,
                      tuple((a * k, b * k) for a, b in self.reactions), None if self.vs is None else self.vs * k)

    @property
    def slope(self) -> Piecewise:
        """dv/dx: the section rotation, plus the shear strain where shear deformation is included."""
        return self.theta if self.vs is None else self.v.map(lambda p: p.derivative())

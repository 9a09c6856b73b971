"""Natural frequency: member + its `limit frequency` lines -> the masses (loads / g) and the fundamental frequency."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.engine.frequency import Frequency, Masses, fundamental
from beamlang.language.units import STANDARD_GRAVITY
from beamlang.model import FrequencyLimit, LineLoad, Member, PointLoad


@dataclass(frozen=True, slots=True)
class FrequencyResult:
    limit: FrequencyLimit
    masses: Masses  # kg/m and kg, in the member's coordinates
    frequency: Frequency


def natural_frequencies(member: Member) -> tuple[FrequencyResult, ...]:
    """Each `limit frequency` line: its masses and the member's first bending frequency carrying them."""
    return tuple(FrequencyResult(limit, masses(member, limit), fundamental(member, masses(member, limit)))
                 for limit in member.frequency_limits)


def masses(member: Member, limit: FrequencyLimit) -> Masses:
    """The downward loads of the limit's cases, factored and divided by standard gravity: line loads become line
    masses, point loads point masses; moments and settlements carry no mass (the builder refuses upward loads)."""
    lines: list[tuple[Fraction, Fraction, Fraction, Fraction]] = []
    points: dict[Fraction, Fraction] = {}
    for factor, name in limit.terms:
        for load in member.case(name).loads:
            if isinstance(load, LineLoad):
                lines.append((load.x1, load.x2, -factor * load.w1 / STANDARD_GRAVITY, -factor * load.w2 / STANDARD_GRAVITY))
            elif isinstance(load, PointLoad):
                points[load.x] = points.get(load.x, Fraction(0)) - factor * load.force / STANDARD_GRAVITY
    return Masses(tuple(lines), tuple(sorted(points.items())))

"""The moving-load search's frozen results: each critical value with its group position, and the envelope."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.model import MovingLoad


@dataclass(frozen=True, slots=True)
class Critical:
    """A value of a response with the group standing at `position` (the first-listed force there)."""

    value: Fraction
    x: Fraction
    position: Fraction
    reversed: bool  # the group travelling the other way: its forces in reverse order along x
    how: str  # "group standing" | "influence line" | "under a force" | "interior"
    exact: bool  # x and position exact rationals (else refined isolating roots)


@dataclass(frozen=True, slots=True)
class Envelope:
    """Every extreme of a moving target, each with the group position that produces it."""

    load: MovingLoad
    factor: Fraction
    extremes: tuple[tuple[str, tuple[Critical, ...]], ...]  # quantity -> its candidates (all examined)
    reactions: tuple[tuple[Critical | None, Critical | None], ...]  # per support: (largest force, smallest)
    reaction_moments: tuple[tuple[Critical | None, Critical | None], ...]
    support_slopes: tuple[Critical | None, ...]  # largest |theta| at each support
    points: tuple[tuple[Critical | None, Critical | None], ...]  # per report point: (v up, v down)
    cells: int  # how many (x, p) cells the plane was cut into, for the calc package
    interiors: int  # how many cell interiors needed the exact critical-point search (the others were bounded)
    fixed: tuple[tuple[tuple[str, object], tuple[Critical, ...]], ...] = ()  # (quantity, x or support) -> every
    # candidate found there: the analysis collects every position that ties for a reaction's largest or smallest

    def of(self, quantity: str) -> tuple[Critical, ...]:
        return dict(self.extremes)[quantity]

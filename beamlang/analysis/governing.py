"""A moving envelope's candidates -> every tied governing place of an extreme, each with its group position,
and each support's force as the largest and smallest over the group's positions (never one simultaneous set)."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from math import floor
from typing import TYPE_CHECKING

from beamlang.engine.extrema import SAME

if TYPE_CHECKING:  # the moving engine is loaded only for moving targets
    from beamlang.engine.moving import Critical, Envelope

NEAR = Fraction(1, 10**9)  # two refined roots this close (relative to the member's length) are one place


@dataclass(frozen=True, slots=True)
class Reach:
    """The largest and smallest value of a support's force (or moment) over the group's positions, each with
    every group position found to reach it."""

    x: Fraction
    largest: Fraction
    largest_at: tuple["Critical", ...]
    smallest: Fraction
    smallest_at: tuple["Critical", ...]


def ties(items, target: Fraction, absolute: bool, length: Fraction) -> tuple["Critical", ...]:
    """Every candidate whose value ties with `target` (its magnitude, when `absolute`: a mirrored slope or shear
    has the other sign), one per distinct (place, group position, direction), ordered by x, then position."""
    size = abs(target)
    goal, tol = float(size if absolute else target), 2 * float(SAME) * float(size) + 1e-300
    near = [c for c in items if abs((abs(float(c.value)) if absolute else float(c.value)) - goal) <= tol]  # a float
    # pre-filter wider than the exact test (the rounding of both values is far below SAME), then the exact test
    tied = [c for c in near if abs((abs(c.value) if absolute else c.value) - (size if absolute else target))
            <= SAME * size]
    return distinct(tied, length)


def distinct(items, length: Fraction) -> tuple["Critical", ...]:
    """One candidate per place and group position (the same point found from two cells, or by two routes,
    counts once; an exact one is kept before a refined one)."""
    eps = NEAR * length
    width = 2 * float(eps)  # two places within eps of each other (exactly) fall in the same or adjacent buckets
    out: list = []
    kept: dict[tuple, list] = {}  # (direction, bucket of x, bucket of position) -> the candidates kept there
    for c in sorted(items, key=lambda c: (c.x, c.reversed, c.position, not c.exact)):
        bx, bp = floor(float(c.x) / width), floor(float(c.position) / width)
        near = (o for i in (-1, 0, 1) for j in (-1, 0, 1) for o in kept.get((c.reversed, bx + i, bp + j), ()))
        if any(abs(o.x - c.x) <= eps and abs(o.position - c.position) <= eps for o in near):
            continue
        out.append(c)
        kept.setdefault((c.reversed, bx, bp), []).append(c)
    return tuple(out)


def reaches(env: "Envelope", kind: str, xs: tuple[Fraction, ...], length: Fraction) -> tuple[Reach, ...]:
    """Per support: the largest and smallest of its force (kind "R") or moment ("Rm") over every position."""
    fixed = dict(env.fixed)
    out = []
    for j, x in enumerate(xs):
        items = fixed[(kind, j)]
        hi, lo = max(c.value for c in items), min(c.value for c in items)
        out.append(Reach(x, hi, ties(items, hi, False, length), lo, ties(items, lo, False, length)))
    return tuple(out)

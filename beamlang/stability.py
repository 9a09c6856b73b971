"""Stability: supports and hinges -> the restraints a statically determinate primary beam keeps.

A straight member under transverse load has two equations of equilibrium (vertical forces, moments)
and one more per internal hinge (zero moment there). A set of reaction components is a statically
determinate, stable primary beam exactly when its columns in those equations are linearly independent
and there are as many of them as equations; the layout is a mechanism when no such set exists. The
choice is greedy in a preferred order (a linear matroid, so greedy always finds a set when one exists)."""

from __future__ import annotations

from dataclasses import dataclass

from beamlang.exact import Q


@dataclass(frozen=True, slots=True)
class Restraint:
    """A support reaction component: `force` (vertical) or `moment`, at member.supports[support]."""

    support: int
    kind: str


class Mechanism(Exception):
    """No stable primary beam exists; `hinges` are those that take part (indices into the member's hinges)."""

    def __init__(self, hinges: tuple[int, ...]):
        super().__init__("mechanism")
        self.hinges = hinges


def components(supports) -> list[Restraint]:
    """Every reaction component, in support order (force, then moment at a fixed support)."""
    out = []
    for i, sp in enumerate(supports):
        if sp.kind == "spring" and not sp.stiffness:
            continue  # a spring of zero stiffness restrains nothing
        out.append(Restraint(i, "force"))
        if sp.kind == "fixed":
            out.append(Restraint(i, "moment"))
    return out


def equilibrium_column(supports, hinge_xs, r: Restraint) -> list:
    """The component's coefficients in: sum of forces, sum of moments about x = 0, moment at each hinge
    from the part left of it (sagging positive; a counterclockwise couple lowers the moment to its right)."""
    x = supports[r.support].x
    if r.kind == "force":
        return [Q(1), x] + [(h - x) if x < h else Q(0) for h in hinge_xs]
    return [Q(0), Q(1)] + [Q(-1) if x < h else Q(0) for h in hinge_xs]


def keep(supports, hinge_xs, preferred: list[Restraint]) -> tuple[Restraint, ...]:
    """The first independent components in `preferred` order, as many as there are equations."""
    need = 2 + len(hinge_xs)
    kept = []
    for r in _independent(supports, hinge_xs, preferred):
        kept.append(r)
        if len(kept) == need:
            return tuple(kept)
    raise Mechanism(_culprits(supports, hinge_xs, preferred, need - len(kept)))


def _independent(supports, hinge_xs, preferred):
    """The components of `preferred`, in order, whose columns are independent of those before them."""
    basis: list = []
    for r in preferred:
        reduced = _reduce(equilibrium_column(supports, hinge_xs, r), basis)
        if reduced is not None:
            basis.append(reduced)
            yield r


def _reduce(column: list, basis: list[tuple[int, list]]) -> tuple[int, list] | None:
    """Eliminate the column against the echelon basis; (pivot row, reduced column), or None if dependent."""
    col = list(column)
    for pivot, vec in basis:
        if col[pivot]:
            f = col[pivot] / vec[pivot]
            col = [a - f * b for a, b in zip(col, vec)]
    pivot = next((i for i, v in enumerate(col) if v), None)
    return None if pivot is None else (pivot, col)


def _rank(supports, hinge_xs, preferred) -> int:
    return sum(1 for _ in _independent(supports, hinge_xs, preferred))


def _culprits(supports, hinge_xs, preferred, deficiency: int) -> tuple[int, ...]:
    """Hinges whose removal makes the layout less of a mechanism."""
    out = []
    for j in range(len(hinge_xs)):
        rest = hinge_xs[:j] + hinge_xs[j + 1:]
        if (2 + len(rest)) - _rank(supports, rest, preferred) < deficiency:
            out.append(j)
    return tuple(out)

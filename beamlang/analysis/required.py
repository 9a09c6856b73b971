"""Required section: a member's checks -> the least I meeting every deflection limit and the least S for the bending limit."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.analysis.checks import Check
from beamlang.model import Member, Settlement


@dataclass(frozen=True, slots=True)
class Required:
    I: Fraction | None  # m^4
    S: Fraction | None  # m^3
    I_check: Check | None  # the deflection check that governs I
    S_check: Check | None  # the bending check that governs S
    note: str  # how it was found, or why it could not be


def required_section(member: Member, checks: tuple[Check, ...]) -> Required:
    """Exact: with the loads fixed, every deflection is proportional to 1/I and M does not depend on I.

    That holds for a prismatic member on rigid supports without prescribed settlements; springs and
    settlements make deflection (and, with springs, moments) depend on I in other ways."""
    if member.stepped:
        return Required(None, None, None, None, "not computed for a stepped member: its stretches have sections "
                                                "of their own (the check ratios show each check's margin)")
    if any(sp.kind == "spring" for sp in member.supports) or any(
            isinstance(ld, Settlement) for case in member.cases for ld in case.loads):
        return Required(None, None, None, None, "not computed: with springs or settlements deflection is not "
                                                "proportional to 1/I (change the section and check again)")
    if member.shear_deformation:
        return Required(None, None, None, None, "not computed: with shear deformation deflection is not "
                                                "proportional to 1/I (change the section and check again)")
    deflection = [c for c in checks if c.kind == "deflection" and c.actual]
    bending = [c for c in checks if c.kind == "bending stress"]
    I_check = max(deflection, key=lambda c: c.actual / c.allowed, default=None)
    S_check = max(bending, key=lambda c: c.actual / c.allowed, default=None)
    I = member.section.I * I_check.actual / I_check.allowed if I_check else None
    S = _section_modulus(member) * S_check.actual / S_check.allowed if S_check else None
    weight = any(ld.origin == "self-weight" for case in member.cases for ld in case.loads if hasattr(ld, "origin"))
    note = ("I_req = I x (largest deflection ratio), S_req = S x (largest bending-stress ratio) = M_max / (fy or the allowable bending stress)"
            + ("; the self-weight of the present section is kept (a lighter section needs slightly less, a "
               "heavier one slightly more)" if weight else ""))
    return Required(I, S, I_check, S_check, note)


def _section_modulus(member: Member) -> Fraction:
    sec = member.section
    return sec.S if sec.S is not None else sec.I / sec.c

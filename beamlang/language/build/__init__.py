"""Build: syntax Document -> validated Member model in exact SI; every problem is reported.

One module per statement family; each takes the shared `Context` (document, error collector,
conversions) and what earlier families found. `build` runs them in this order, which is also the
order their errors are collected in.
"""

from __future__ import annotations

from beamlang import model as m
from beamlang.errors import Diagnostic
from beamlang.language import syntax as s
from beamlang.language.build import checks, combinations, geometry, loads, sections, supports
from beamlang.language.build.context import Context
from beamlang.language.build.geometry import FIELD_ORDER

__all__ = ["FIELD_ORDER", "build", "problems"]


def build(doc: s.Document) -> m.Member:
    """Validate a parsed file and convert it to the exact SI member model."""
    ctx = Context(doc)
    member = _member(ctx)
    ctx.errors.raise_if_any()
    assert member is not None
    return member


def problems(doc: s.Document) -> tuple[Diagnostic, ...]:
    """The problems of a file some of whose lines failed to parse (they are missing from `doc`): those of the
    lines present, not those the missing lines may cause (`Context.whole`)."""
    ctx = Context(doc, partial=True)
    _member(ctx)
    return tuple(ctx.errors.items)


def _member(ctx: Context) -> m.Member | None:
    if not ctx.doc.statements:
        geometry.empty(ctx)
        return None
    head = geometry.head(ctx)
    stretches = sections.stretches(ctx)
    shear = sections.shear_deformation(ctx)
    bearings = supports.supports(ctx, head.span)
    hinges = supports.hinges(ctx, bearings)
    cases = loads.cases(ctx, head.span)
    supports.no_couple_at_hinges(ctx, cases, hinges)
    names = loads.names(ctx, cases)
    combos = combinations.combinations(ctx, names)
    cases = combinations.patterned(ctx, cases, names)
    targets = combinations.targets(ctx, names)
    limits = checks.deflection_limits(ctx, targets)
    slopes = checks.slope_limits(ctx, targets, bearings)
    stress = checks.stress_checks(ctx, targets, stretches)
    reports = checks.report_points(ctx)
    frequencies = checks.frequency_limits(ctx, names, cases)
    if ctx.failed or ctx.partial or not stretches or ctx.length is None:
        return None
    member = head.single["member"]
    return m.Member(member.mark.text, member.title, geometry.fields(ctx), geometry.units(head), ctx.length,
                    stretches, bearings, hinges, cases, combos, limits, slopes, stress, reports,
                    geometry.notes(ctx), ctx.doc, member.span, shear, frequencies)

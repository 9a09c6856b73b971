"""Moving loads: a `moving` line -> a group of forces at fixed offsets and the range it travels over."""

from __future__ import annotations

from dataclasses import replace
from fractions import Fraction

from beamlang import model as m
from beamlang.language import syntax as s
from beamlang.language.build.context import Context, sign
from beamlang.language.units import in_parts


def moving_load(ctx: Context, st: s.Moving) -> list[m.Load]:
    """The forces (signed), their offsets from the first, and the travel (the whole member unless given)."""
    joined = _without_and(ctx, st)
    if joined:
        return []
    forces = [ctx.positive(q, "force", "a moving force") for q in st.forces]
    gaps = [ctx.positive(q, "length", "a spacing") for q in st.spacings]
    if len(gaps) != len(forces) - 1:
        _spacing_count(ctx, st, len(forces), len(gaps))
        return []
    lo = Fraction(0) if st.start is None else ctx.position(st.start, "start of travel")
    hi = ctx.length if st.end is None else ctx.position(st.end, "end of travel")
    if None in forces or None in gaps or lo is None or hi is None:
        return []
    if lo >= hi:
        ctx.error(st.end.span, "the travel must end to the right of where it starts",
                  "write `from` the left position `to` the right one")
        return []
    offsets = [Fraction(0)]
    for gap in gaps:
        offsets.append(offsets[-1] + gap)
    k = sign(st.direction.text)
    return [m.MovingLoad(tuple(k * f for f in forces), tuple(offsets), lo, hi, st.span)]


def _without_and(ctx: Context, st: s.Moving) -> bool:
    """`moving 20 kN 20 kN ...` or `spaced 3 m 1.5 m`: a second force or spacing written without `and` (a
    spacing in proper parts, `spaced 3 ft 6 in`, is one length); reported, True."""
    for what, items in (("forces", st.forces), ("spacings", st.spacings)):
        for q in items:
            if q.parts and (what == "forces" or not in_parts(q)):
                second = q.parts[0]
                text = ctx.doc.source.line_text(second.span.line)
                fixed = text[: second.span.col - 1].rstrip() + " and " + text[second.span.col - 1:]
                ctx.error(replace(second.span, end_col=second.span.col + len(second.number)),
                          f"the {what} of a moving group are joined by `and`", f"write `{fixed.strip()}`")
                return True
    return False


def _spacing_count(ctx: Context, st: s.Moving, forces: int, gaps: int) -> None:
    where = st.spacings[-1].span if st.spacings else st.direction.span
    if forces == 1:
        message = "a single moving force takes no spacing"
    else:
        message = f"{forces} moving forces need {_count(forces - 1, 'spacing')}, found {gaps}"
    ctx.error(where, message, "write e.g. `moving 12 kN and 12 kN down spaced 1.5 m`")


def _count(n: int, word: str) -> str:
    return f"{n} {word}" if n == 1 else f"{n} {word}s"

"""Combinations: `combine` lines -> factored sums of cases (names new, cases known and once, factors in range)."""

from __future__ import annotations

from dataclasses import replace
from fractions import Fraction

from beamlang import model as m
from beamlang.language import syntax as s
from beamlang.language.build.context import Context
from beamlang.language.units import ACCEPTED, in_range


def combinations(ctx: Context, cases: set[str]) -> tuple[m.Combination, ...]:
    """Every combination without an error, in file order."""
    out: list[m.Combination] = []
    for st in ctx.of(s.Combine):
        name = st.name.text
        if name in cases or any(c.name == name for c in out):
            ctx.error(st.name.span, f"the name '{name}' is already used",
                      "cases and combinations need names of their own")
            continue
        terms, ok = _terms(ctx, st, cases)
        with_moving = [t for t in st.terms if t.case.text in ctx.moving_cases]
        if len(with_moving) > 1:
            ctx.error(with_moving[1].case.span, "a combination may hold only one case with a moving load",
                      "two groups moving independently are not supported; combine each with the "
                      "other cases separately")
            ok = False
        if ok:
            out.append(m.Combination(name, tuple(terms), st.span))
    return tuple(out)


def _terms(ctx: Context, st: s.Combine, cases: set[str]) -> tuple[list[tuple[Fraction, str]], bool]:
    """The (factor, case) terms and whether all of them are sound."""
    terms: list[tuple[Fraction, str]] = []
    ok = True
    for term in st.terms:
        factor = ctx.number(term.factor, term.factor_span) if term.factor is not None else Fraction(1)
        if factor is None:
            ok = False
            continue
        if not in_range(factor):
            ctx.error(term.factor_span, f"a load factor of {term.factor} is surely a typo",
                      f"load factors {ACCEPTED} are accepted")
            ok = False
        if term.case.text not in cases:
            ctx.whole(term.case.span, f"unknown case '{term.case.text}'",
                      ctx.suggest(term.case.text, sorted(cases), "cases"))
            ok = False
        elif any(t[1] == term.case.text for t in terms):
            ctx.error(term.case.span, f"case '{term.case.text}' appears twice in this combination")
            ok = False
        elif factor == 0:
            ctx.error(term.case.span, "a factor of zero; leave the case out instead")
            ok = False
        terms.append((factor, term.case.text))
    return terms, ok


def patterned(ctx: Context, cases: tuple[m.Case, ...], names: set[str]) -> tuple[m.Case, ...]:
    """The cases with each `pattern NAME` line applied: the named case marked as patterned."""
    chosen: dict[str, s.Pattern] = {}
    by_name = {c.name: c for c in cases}
    for st in ctx.of(s.Pattern):
        name = st.case.text
        if name not in names:
            ctx.error(st.case.span, f"unknown case '{name}'", ctx.suggest(name, sorted(names), "cases"))
        elif name in chosen:
            ctx.error(st.span, f"case '{name}' is already patterned on line {chosen[name].span.line}")
        elif name in ctx.moving_cases:
            ctx.error(st.case.span, f"case '{name}' holds a moving load, which is not patterned",
                      "a moving load already takes its worst position; pattern only static cases")
        elif any(isinstance(ld, m.Settlement) for ld in by_name[name].loads):
            ctx.error(st.case.span, f"case '{name}' holds a settlement, which cannot be applied span by span",
                      "put the settlement in a case of its own and pattern the loads")
        else:
            chosen[name] = st
    for combo in ctx.of(s.Combine):
        held = [t.case.text for t in combo.terms]
        if any(n in chosen for n in held) and any(n in ctx.moving_cases for n in held):
            ctx.error(combo.span, f"combination '{combo.name.text}' holds a patterned case and a moving load",
                      "the two envelopes are not combined; combine the moving case with the fixed cases only")
    return tuple(replace(c, patterned=True) if c.name in chosen else c for c in cases)


def targets(ctx: Context, cases: set[str]) -> set[str]:
    """The names limits and checks may refer to (a combination with an error is still known: no cascade)."""
    return cases | {st.name.text for st in ctx.of(s.Combine)}

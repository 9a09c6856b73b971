"""Limits and checks: deflection limits, stress checks, slope limits and report points -> their model objects."""

from __future__ import annotations

from beamlang import model as m
from beamlang.language import syntax as s
from beamlang.language.build.combinations import _terms
from beamlang.language.build.context import Context


def _target(ctx: Context, name: s.Name, targets: set[str]) -> bool:
    """True when a limit or check names a known case or combination; else the error is reported."""
    if name.text in targets:
        return True
    ctx.whole(name.span, f"unknown case or combination '{name.text}'",
              ctx.suggest(name.text, sorted(targets), "cases and combinations"))
    return False


def deflection_limits(ctx: Context, targets: set[str]) -> tuple[m.DeflectionLimit, ...]:
    """`limit deflection` lines: span/N or an absolute length, for a known case or combination."""
    out = []
    for st in ctx.of(s.Limit):
        ok = _target(ctx, st.target, targets)
        divisor = value = None
        if st.divisor is not None:
            divisor = ctx.number(st.divisor, st.span)
            if divisor is None:
                ok = False
            elif divisor == 0:
                ctx.error(st.span, "a limit of span/0 allows no deflection at all", "write e.g. span/360")
                ok = False
        else:
            value = ctx.positive(st.value, "length", "a deflection limit")
            ok = ok and value is not None
        if ok:
            out.append(m.DeflectionLimit(st.target.text, divisor, value, st.span))
    return tuple(out)


def slope_limits(ctx: Context, targets: set[str], supports: tuple[m.Support, ...]) -> tuple[m.SlopeLimit, ...]:
    """`limit slope` lines: an angle at the supports, which must include a bearing that can turn."""
    out = []
    for st in ctx.of(s.SlopeLimit):
        ok = st.target is None or _target(ctx, st.target, targets)
        value = ctx.positive(st.value, "angle", "a slope limit", "write the slope in rad, e.g. `0.001 rad`")
        if ok and value is not None:
            out.append(m.SlopeLimit(st.target.text if st.target else None, value, st.span))
    if out and supports and all(sp.kind == "fixed" for sp in supports):
        ctx.whole(out[0].span, "a slope limit at supports needs a pin, roller or spring support",
                  "a fixed support holds the slope at zero; the limit is for bearings")
    return tuple(out)


def stress_checks(ctx: Context, targets: set[str], stretches: tuple[m.Stretch, ...]) -> tuple[m.StressCheck, ...]:
    """`check stress` lines: every stretch needs a yield strength (or allowable stresses) and a depth (c or S)."""
    out = []
    no_yield = next((sp.material for sp in stretches if sp.material.bending_strength is None), None)
    no_depth = next((sp.section for sp in stretches if sp.section.c is None and sp.section.S is None), None)
    for st in ctx.of(s.StressCheck):
        ok = _target(ctx, st.target, targets)
        if no_yield is not None:
            ctx.error(st.span, "a stress check needs the material's yield strength or allowable stresses",
                      f"add e.g. `yield 350 MPa` (steel) or `allowable bending 1.2 ksi shear 0.18 ksi` (timber) "
                      f"to the material line (line {no_yield.span.line})")
            ok = False
        if no_depth is not None:
            ctx.error(st.span, "a stress check needs the section depth, c or S",
                      f"add e.g. `depth 250 mm` to the section line (line {no_depth.span.line})")
            ok = False
        if ok:
            out.append(m.StressCheck(st.target.text, st.span))
    return tuple(out)


def report_points(ctx: Context) -> tuple[m.ReportPoint, ...]:
    """`report deflection at` lines: positions on the member to report results at."""
    points = ((ctx.position(st.at, "report point"), st) for st in ctx.of(s.Report))
    return tuple(m.ReportPoint(x, st.span) for x, st in points if x is not None)


def frequency_limits(ctx: Context, cases: set[str], built: tuple[m.Case, ...]) -> tuple[m.FrequencyLimit, ...]:
    """`limit frequency F mass TERMS`: a frequency above zero; the mass cases known, each once, with a factor in
    range, and loads that can be a mass (downward forces and line loads; moments and settlements carry none)."""
    out = []
    for st in ctx.of(s.FrequencyLimit):
        value = ctx.positive(st.value, "frequency", "a frequency limit", "write it in Hz, e.g. `5 Hz`")
        terms, ok = _terms(ctx, st, cases)
        by_name = {c.name: c for c in built}
        for term in st.terms:
            case = by_name.get(term.case.text)
            ok = _mass_loads(ctx, case, term, st) and ok if case is not None else ok
        if ok and value is not None:
            text = " + ".join((f"{t.factor} " if t.factor is not None else "") + t.case.text for t in st.terms)
            out.append(m.FrequencyLimit(value, tuple(terms), text, st.span))
    return tuple(out)


def _mass_loads(ctx: Context, case: m.Case, term: s.Term, st: s.FrequencyLimit) -> bool:
    for load in case.loads:
        if isinstance(load, m.MovingLoad):
            ctx.error(term.case.span, f"case '{case.name}' holds a moving load, which cannot be a mass",
                      f"the moving load is on line {load.span.line}; give the mass as a case of static loads")
            return False
        up = (isinstance(load, m.PointLoad) and load.force > 0) or (
            isinstance(load, m.LineLoad) and (load.w1 > 0 or load.w2 > 0))
        if up:
            ctx.error(term.case.span, f"case '{case.name}' holds an upward load, which cannot be a mass",
                      f"the upward load is on line {load.span.line}; the mass is the downward loads divided by g")
            return False
    return True

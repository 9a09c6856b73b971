"""Pattern loading against published continuous-beam cases, and the envelope against every arrangement solved alone.

Sources (from memory, edition as remembered):
- [AISC] AISC Steel Construction Manual, 15th ed., Part 3, Table 3-23 "Shears, Moments and Deflections":
  case 30 (continuous beam, two equal spans, uniform load on one span), case 29 (two equal spans, uniform
  load on both), case 34 (three equal spans, end spans loaded); case numbers as remembered.
Exact closed forms are compared exactly; coefficients the table prints rounded, at their printed precision.
"""

from __future__ import annotations

from dataclasses import replace
from fractions import Fraction as F
from itertools import product

from hypothesis import given, settings
from hypothesis import strategies as st

from engine_helpers import EI, analyse_text, member_text, rel

from beamlang.analysis.results import evaluate
from beamlang.engine.solve import solve
from beamlang.model import LineLoad

W = F(10000)  # N/m, from "10 kN/m"


def _two_spans(extra=("pattern a",)):
    return analyse_text(member_text("12 m", ["pin at 0 m", "roller at 6 m", "roller at span"],
                                    {"a": ["uniform 10 kN/m down"]}, extra=list(extra)))


def test_two_equal_spans_one_loaded_sagging_moment_and_deflection():
    # [AISC] 3-23 case 30: M max = 49/512 w l^2 at x = 7/16 l from the end of the loaded span;
    # d max = 0.0092 w l^4 / (E I) at 0.472 l (printed rounded)
    a = _two_spans()
    r = a.result("a")
    l = F(6)
    assert r.moment_positive.value == F(49, 512) * W * l**2 and r.moment_positive.x in (7 * l / 16, 2 * l - 7 * l / 16)
    assert r.pattern.arrangement("largest sagging moment") in ("a on span 1", "a on span 2")
    coefficient = -r.max_down.value * EI / (W * l**4)
    assert round(float(coefficient), 4) == 0.0092
    assert round(float(min(r.max_down.x, 2 * l - r.max_down.x) / l), 3) == 0.472
    assert r.pattern.arrangement("largest deflection down") in ("a on span 1", "a on span 2")


def test_two_equal_spans_both_loaded_hogging_over_middle_support():
    # [AISC] 3-23 case 29: M at the middle support = -w l^2 / 8, middle reaction 10/8 w l, with both spans loaded
    r = _two_spans().result("a")
    l = F(6)
    assert r.moment_negative.value == -W * l**2 / 8 and r.moment_negative.x == l
    assert r.pattern.arrangement("largest hogging moment") == "a on all its spans: spans 1 and 2"
    assert r.reactions[1][1] == F(10, 8) * W * l
    # [AISC] 3-23 case 30: the far end reaction of the unloaded span is -1/16 w l (uplift): the envelope's low end
    lows = [v for e, _, x, v, _ in r.pattern.arrangements if e == "reaction force, largest down" and x == 2 * l]
    assert lows == [-W * l / 16]


def test_three_equal_spans_end_spans_loaded():
    # [AISC] 3-23 case 34 (end spans loaded): R1 = 0.450 w l, M max = 0.1013 w l^2 at 0.450 l,
    # d max = 0.0099 w l^4 / (E I) at 0.479 l. By three moments the support moments are -w l^2 / 20, so
    # R1 = 9/20 w l and M max = R1^2 / (2 w) = 81/800 w l^2 exactly at x = 9/20 l.
    a = analyse_text(member_text("15 m", ["pin at 0 m", "roller at 5 m", "roller at 10 m", "roller at span"],
                                 {"a": ["uniform 10 kN/m down"]}, extra=["pattern a"]))
    r = a.result("a")
    l = F(5)
    assert r.moment_positive.value == F(81, 800) * W * l**2
    assert round(float(F(81, 800)), 4) == 0.1013
    assert r.moment_positive.x in (F(9, 20) * l, 3 * l - F(9, 20) * l)
    assert r.pattern.arrangement("largest sagging moment") == "a on spans 1 and 3"
    assert round(float(-r.max_down.value * EI / (W * l**4)), 4) == 0.0099
    assert round(float(min(r.max_down.x, 3 * l - r.max_down.x) / l), 3) == 0.479
    assert r.pattern.arrangement("largest deflection down") == "a on spans 1 and 3"


def test_checks_and_required_section_use_the_envelope():
    # the per-span deflection checks take the envelope: one span loaded deflects more than both loaded
    plain = _two_spans(extra=["limit deflection a span/360"])
    patterned = _two_spans(extra=["pattern a", "limit deflection a span/360"])
    worst = abs(patterned.result("a").max_down.value)
    assert len(patterned.checks) == 2 and all(rel(c.actual, worst) < 1e-12 for c in patterned.checks)
    assert all(p.actual > q.actual for p, q in zip(patterned.checks, plain.checks))
    assert patterned.required.I > plain.required.I


def test_a_load_across_a_support_is_split_there():
    # a uniform load from 4 m to 8 m over the support at 6 m: two parts, loaded or not independently; with only
    # the part in span 1 loaded, the end reaction is larger than with the whole load
    a = analyse_text(member_text("12 m", ["pin at 0 m", "roller at 6 m", "roller at span"],
                                 {"a": ["uniform 10 kN/m down from 4 m to 8 m"]}, extra=["pattern a"]))
    r = a.result("a")
    assert r.pattern.parts == (("a", "span 1"), ("a", "span 2"))
    whole = analyse_text(member_text("12 m", ["pin at 0 m", "roller at 6 m", "roller at span"],
                                     {"a": ["uniform 10 kN/m down from 4 m to 8 m"]}))
    part = analyse_text(member_text("12 m", ["pin at 0 m", "roller at 6 m", "roller at span"],
                                    {"a": ["uniform 10 kN/m down from 4 m to 6 m"]}))
    assert r.reactions[0][1] == part.result("a").reactions[0][1] > whole.result("a").reactions[0][1]


def test_combination_takes_the_pattern_with_the_fixed_cases():
    # 1.2 dead + 1.6 live with live patterned: every effect is 1.2 x dead plus the worst arrangement of 1.6 x live
    cases = {"dead": ["uniform 2 kN/m down"], "live": ["uniform 10 kN/m down"]}
    a = analyse_text(member_text("12 m", ["pin at 0 m", "roller at 6 m", "roller at span"], cases,
                                 extra=["pattern live", "combine u = 1.2 dead + 1.6 live"]))
    r = a.result("u")
    l = F(6)
    # sagging: by [AISC] 3-23 cases 29 and 30, dead on both spans gives R1 = 3/8 wd l and live on span 1
    # alone R1 = 7/16 wl l; the largest sagging moment of the sum is R1^2 / (2 w) with w the total on span 1
    wd, wl = F(12, 10) * 2000, F(16, 10) * W
    R1 = F(3, 8) * wd * l + F(7, 16) * wl * l
    assert r.moment_positive.value == R1**2 / (2 * (wd + wl))
    assert r.pattern.arrangement("largest sagging moment") in ("live on span 1", "live on span 2")
    assert r.moment_negative.value == -(wd + wl) * l**2 / 8


def test_the_package_names_arrangements_and_carries_the_cautions(tmp_path):
    from beamlang.report.pattern_md import pattern_cautions

    a = _two_spans()
    assert any("Pattern loading of `a`" in c and "governing code" in c for c in pattern_cautions(a))
    plain = _two_spans(extra=())
    assert any("Pattern loading was not considered for `a`" in c for c in pattern_cautions(plain))
    single = analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]}))
    assert pattern_cautions(single) == []  # one span and no overhang: nothing to pattern


# ---- the envelope against every arrangement, solved one by one

def _cut(ld: LineLoad, a, b) -> LineLoad:
    """A line load restricted to [a, b] (written here again, independently of the engine's split)."""
    slope = (ld.w2 - ld.w1) / (ld.x2 - ld.x1)
    return replace(ld, x1=a, x2=b, w1=ld.w1 + slope * (a - ld.x1), w2=ld.w1 + slope * (b - ld.x1))


def _arrangement_loads(member, loads, loaded: tuple[bool, ...]):
    bounds = sorted({F(0), member.length} | {s.x for s in member.supports})
    out = []
    for ld in loads:
        for k, (lo, hi) in enumerate(zip(bounds, bounds[1:])):
            if not loaded[k]:
                continue
            if isinstance(ld, LineLoad):
                a, b = max(lo, ld.x1), min(hi, ld.x2)
                if a < b:
                    out.append(_cut(ld, a, b))
            elif lo <= ld.x < hi or (ld.x == hi == member.length):
                out.append(ld)
    return tuple(out)


def _extremes(r):
    return {"down": r.max_down.value if r.max_down else 0, "up": r.max_up.value if r.max_up else 0,
            "sag": r.moment_positive.value if r.moment_positive else 0,
            "hog": r.moment_negative.value if r.moment_negative else 0,
            "shear": abs(r.shear_max.value) if r.shear_max else 0}


@st.composite
def _continuous(draw):
    spans = draw(st.lists(st.integers(2, 6), min_size=2, max_size=3))
    left = draw(st.sampled_from([0, 0, 1]))
    right = draw(st.sampled_from([0, 0, 2]))
    xs = [left]
    for s in spans:
        xs.append(xs[-1] + s)
    length = xs[-1] + right
    supports = ["pin at %d m" % xs[0]] + ["roller at %d m" % x for x in xs[1:]]
    loads = []
    for _ in range(draw(st.integers(1, 3))):
        kind = draw(st.sampled_from(["uniform", "partial", "linear", "point"]))
        a, b = sorted(draw(st.lists(st.integers(0, 2 * length), min_size=2, max_size=2, unique=True)))
        a, b = F(a, 2), F(b, 2)
        direction = draw(st.sampled_from(["down", "down", "up"]))
        n = draw(st.sampled_from(["3", "7.5", "12"]))
        loads.append({"uniform": f"uniform {n} kN/m {direction}",
                      "partial": f"uniform {n} kN/m {direction} from {float(a)} m to {float(b)} m",
                      "linear": f"linear 0 kN/m to {n} kN/m {direction} from {float(a)} m to {float(b)} m",
                      "point": f"point {n} kN {direction} at {float(b)} m"}[kind])
    fixed = draw(st.booleans())
    cases = {"live": loads} | ({"dead": ["uniform 2 kN/m down"]} if fixed else {})
    extra = ["pattern live"] + (["combine u = 1.2 dead + 1.6 live"] if fixed else [])
    return member_text(f"{length} m", supports, cases, extra=extra), "u" if fixed else "live"


@settings(max_examples=25, deadline=None)
@given(_continuous())
def test_envelope_is_never_less_adverse_than_any_arrangement(drawn):
    text, target = drawn
    a = analyse_text(text)
    m = a.loaded.member
    env = a.result(target)
    live = m.case("live")
    n = len(env.regions)
    best: dict[str, list] = {}
    for loaded in product((False, True), repeat=n):
        cases = tuple(replace(c, loads=_arrangement_loads(m, live.loads, loaded), patterned=False) if c.name == "live"
                      else c for c in m.cases)
        if not any(c.loads for c in cases if c.name == "live"):
            cases = tuple(c for c in cases if c.name != "live")
            combos = tuple(replace(k, terms=tuple(t for t in k.terms if t[1] != "live")) for k in m.combinations)
        else:
            combos = m.combinations
        if target == "live" and not any(c.name == "live" for c in cases):
            continue  # nothing loaded at all: every effect zero, which the envelope bounds trivially
        one = replace(m, cases=cases, combinations=combos)
        r = next(x for x in evaluate(solve(one)) if x.name == target)
        for key, value in _extremes(r).items():
            best.setdefault(key, []).append(value)
        for j, (_, force, _) in enumerate(r.reactions):
            best.setdefault(f"R{j}", []).append(force)
    got = _extremes(env)
    tol = F(1, 10**9)
    for key, sign in (("down", -1), ("hog", -1), ("up", 1), ("sag", 1), ("shear", 1)):
        worst = max(sign * v for v in best[key] + [0])
        assert sign * got[key] >= worst * (1 - tol), (key, got[key], worst)  # never less adverse
        assert sign * got[key] <= worst * (1 + tol) + F(1, 10**12), (key, got[key], worst)  # and reached by one
    for j, (_, force, _) in enumerate(env.reactions):
        assert abs(force) == max(abs(v) for v in best[f"R{j}"] + [0])


def test_diff_names_an_added_pattern_line_and_the_results_it_moves():
    from beamlang.tools.diff import diff_members

    d = diff_members("T-1", _two_spans(extra=()), _two_spans())
    assert [(c.kind, c.what, c.new) for c in d.inputs] == [("added", "pattern loading of a", "pattern a")]


def test_sizing_uses_the_envelope():
    from pathlib import Path

    from beamlang.language.frontend import load
    from beamlang.pipeline import analyse_loaded
    from beamlang.tools.size import try_all

    item = load(Path(__file__).resolve().parent.parent / "examples" / "floor-joist-patterned-us.beam")
    a = analyse_loaded(item)
    trial, = try_all(item, [(1, "2x10", "rectangle width 1.5 in depth 9.25 in")], "test")
    assert trial.ratio == max(c.ratio for c in a.checks)
    unpatterned = analyse_text(item.source.text.replace("pattern live", ""))
    assert trial.ratio > max(c.ratio for c in unpatterned.checks)

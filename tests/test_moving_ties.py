"""Moving loads on mirrored layouts: every tied governing place, each with its group position, against hand
values and against a brute-force scan of group positions written here from closed-form statics (independent of
the engine's plane search and of its static solver)."""

from __future__ import annotations

from fractions import Fraction

import pytest

from beamlang.report.jsonout import member_json
from beamlang.report.table import member_table
from engine_helpers import EI, analyse_text, member_text

kN = Fraction(1000)


# --- closed-form statics for the scan -----------------------------------------------------------------------
# A beam under point loads P_i (down, N) at a_i: the moment M(x) and, for the layouts that need it, the slope
# and deflection from EI v'' = M with the layout's end conditions.

def _ramp(x, a, n):
    return (x - a) ** n if x > a else Fraction(0)


def simple_beam(L, loads, x):
    """Simply supported span L (statics): R_A = sum P (L - a) / L, M = R_A x - sum P <x - a>; EI v = R_A x^3/6
    - sum P <x - a>^3 / 6 + C x with v(L) = 0."""
    RA = sum(P * (L - a) / L for a, P in loads)
    M = RA * x - sum(P * _ramp(x, a, 1) for a, P in loads)
    C = -(RA * L**3 / 6 - sum(P * _ramp(L, a, 3) / 6 for a, P in loads)) / L
    theta = (RA * x**2 / 2 - sum(P * _ramp(x, a, 2) / 2 for a, P in loads) + C) / EI
    v = (RA * x**3 / 6 - sum(P * _ramp(x, a, 3) / 6 for a, P in loads) + C * x) / EI
    return M, theta, v


def fixed_beam(L, loads, x):
    """Both ends fixed: M_A = -P a b^2 / L^2, R_A = P b^2 (3 a + b) / L^3 per load (Gere & Goodno, Mechanics
    of Materials, 8th ed., App. H, fixed-end actions of a point load, from memory; AISC Steel Construction Manual,
    beam diagrams, fixed at both ends with a point load, from memory); then
    EI theta = M_A x + R_A x^2/2 - sum P <x - a>^2 / 2 and EI v = M_A x^2/2 + R_A x^3/6 - sum P <x - a>^3 / 6,
    both zero at x = 0."""
    MA = sum(-P * a * (L - a) ** 2 / L**2 for a, P in loads)
    RA = sum(P * (L - a) ** 2 * (3 * a + (L - a)) / L**3 for a, P in loads)
    M = MA + RA * x - sum(P * _ramp(x, a, 1) for a, P in loads)
    theta = (MA * x + RA * x**2 / 2 - sum(P * _ramp(x, a, 2) / 2 for a, P in loads)) / EI
    v = (MA * x**2 / 2 + RA * x**3 / 6 - sum(P * _ramp(x, a, 3) / 6 for a, P in loads)) / EI
    return M, theta, v


def two_span_moment(L, loads, x):
    """Two equal spans L (pin, roller, roller). Three-moment equation (Hibbeler, Structural Analysis, 8th ed.,
    ch. 10, from memory): a load P at a in the first span gives the middle-support moment
    M_B = -P a (L^2 - a^2) / (4 L^2); a load in the second span, by the mirror. Each span is then a simple span
    with end moments."""
    MB = Fraction(0)
    for a, P in loads:
        d = a if a <= L else 2 * L - a
        MB += -P * d * (L**2 - d**2) / (4 * L**2)
    if x > L:  # the mirror of the first span
        x, loads = 2 * L - x, [(2 * L - a, P) for a, P in loads]
    inside = [(a, P) for a, P in loads if a <= L]
    M0, _, _ = simple_beam(L, inside, x)
    return M0 + MB * x / L


def cantilever(L, loads, x):
    """Fixed at x = 0, free at L: M = -sum P <a - x>; v(L) = -sum P a^2 (3 L - a) / (6 E I) (Gere & Goodno,
    App. H, Table H-1, case 5, from memory)."""
    M = -sum(P * (a - x) for a, P in loads if a > x)
    tip = -sum(P * a**2 * (3 * L - a) / (6 * EI) for a, P in loads)
    return M, tip


# --- the brute-force scan ---------------------------------------------------------------------------------

def wheels(group, p, reversed_, L):
    """(position, force) of the forces on the member with the first at p (reversed: offsets point back)."""
    out = []
    for d, P in group:
        x = p - d if reversed_ else p + d
        if 0 <= x <= L:
            out.append((x, P))
    return out


def scan(group, L, response, step, xs_fixed=()):
    """Every group position on a grid of `step` (both directions; one for a group that reads the same either
    way round, such as one force), the response read at a grid of x, under each force and at the fixed x: a
    list of (value, x, p, reversed)."""
    length = max(d for d, _ in group)
    out = []
    n = int((L + 2 * length) / step)
    grid_x = [L * Fraction(k, 240) for k in range(241)]
    for rev in (False, True) if len(group) > 1 else (False,):
        for k in range(n + 1):
            p = -length + step * k
            loads = wheels(group, p, rev, L)
            if not loads:
                continue
            for x in sorted(set(grid_x) | {a for a, _ in loads} | set(xs_fixed)):
                out.append((response(loads, x), x, p, rev))
    return out


def near_best(samples, sign, rel=Fraction(1, 10**6)):
    """The best sign*value of the scan and every (x, p, reversed) within `rel` of it."""
    best = max(sign * s[0] for s in samples)
    return sign * best, [(x, p, r) for v, x, p, r in samples if sign * v >= best - rel * abs(best)]


def places(r, field):
    return [(c.x, c.position, c.reversed, c.value) for c in r.places_of(field)]


def assert_matches_scan(r, field, samples, sign, tol, absolute=False):
    """The envelope's value is at least the scan's best (which reaches it where the grid holds the governing
    positions); every tied place the scan finds is listed, and every listed place has a scan sample close by."""
    if absolute:
        samples = [(abs(v), x, p, rv) for v, x, p, rv in samples]
    best, where = near_best(samples, sign)
    got = places(r, field)
    value = abs(got[0][3]) if absolute else got[0][3]
    assert sign * value >= sign * best * (1 - Fraction(1, 10**12))
    assert abs(value - best) <= tol * abs(value)
    for x, p, rv in where:  # every place the scan finds near the best is one the envelope lists
        assert any(abs(x - gx) <= Fraction(1, 5) and rv == grv for gx, _, grv, _ in got), (x, p, rv, got)
    return got


# --- the layouts ----------------------------------------------------------------------------------------------

GROUP = [(Fraction(0), 60 * kN), (Fraction(3), 40 * kN)]


@pytest.fixture(scope="module")
def girder():
    text = member_text("12 m", ["pin at 0 m", "roller at span"], {"crane": ["moving 60 kN and 40 kN down spaced 3 m"]})
    return analyse_text(text)


def test_girder_sagging_moment_at_both_mirrored_places(girder):
    # Absolute maximum moment under a group (Hibbeler, Structural Analysis, 8th ed., sec. 6.x, from memory): the
    # largest moment is under the heavier force when midspan bisects the distance between it and the resultant.
    # Resultant 100 kN at 40 * 3 / 100 = 1.2 m from the 60 kN force: 60 kN at 6 - 0.6 = 5.4 m, or, the group
    # travelling the other way, at 6.6 m; M = R_A x = (100 (12 - 6) + ... ) by statics: R_A = 100 (12 - 6.6) / 12
    # = 45 kN with the resultant at 6.6 m, M = 45 * 5.4 = 243 kN m.
    r = girder.result("crane")
    assert r.moment_positive.value == 243 * kN
    assert r.moment_positive.x_all == (Fraction(27, 5), Fraction(33, 5))
    assert places(r, "moment_positive") == [(Fraction(27, 5), Fraction(27, 5), False, 243 * kN),
                                            (Fraction(33, 5), Fraction(33, 5), True, 243 * kN)]
    L = Fraction(12)
    samples = scan(GROUP, L, lambda loads, x: simple_beam(L, loads, x)[0], Fraction(1, 20))
    assert_matches_scan(r, "moment_positive", samples, 1, Fraction(0))  # the grid holds 5.4 and 6.6


def test_girder_other_extremes_tie_at_mirrored_places(girder):
    r = girder.result("crane")
    L = Fraction(12)
    step = Fraction(1, 20)
    defl = scan(GROUP, L, lambda loads, x: simple_beam(L, loads, x)[2], step)
    got = assert_matches_scan(r, "max_down", defl, -1, Fraction(1, 10**4))
    assert len(got) == 2 and got[0][2] is False and got[1][2] is True
    assert abs(got[0][0] + got[1][0] - L) < Fraction(1, 10**9)  # mirrored about midspan
    slope = scan(GROUP, L, lambda loads, x: simple_beam(L, loads, x)[1], step, (Fraction(0), L))
    got = assert_matches_scan(r, "slope_max", slope, 1, Fraction(1, 10**4), absolute=True)
    assert [g[0] for g in got] == [0, 12] and got[0][3] == -got[1][3]  # both ends, opposite signs
    # the largest shear is the left reaction with the 60 kN force just beside the support (statics):
    # 60 + 40 * 9 / 12 = 90 kN, and its mirror at the right end with the other sign
    assert [(g[0], g[3]) for g in places(r, "shear_max")] == [(0, 90 * kN), (12, -90 * kN)]


def test_girder_reactions_are_max_and_min_over_positions(girder):
    # Statics: the left reaction is largest with the 60 kN force at the support and the 40 kN force 3 m in:
    # 60 + 40 * 9 / 12 = 90 kN; it is zero with a force at the far support and the other off the member.
    r = girder.result("crane")
    left, right = r.reaches
    assert left.largest == 90 * kN and [(c.position, c.reversed) for c in left.largest_at] == [(0, False)]
    assert right.largest == 90 * kN and [(c.position, c.reversed) for c in right.largest_at] == [(12, True)]
    assert left.smallest == 0 and right.smallest == 0


def test_girder_ties_in_results_json_check_and_package(girder):
    crane = member_json(girder)["results"]["crane"]
    assert crane["moment"]["max_positive"]["x_all_m"] == [5.4, 6.6]
    placed = crane["moving"]["critical"]["moment_positive"]["places"]
    assert [(p["x_m"], p["first_force_at_m"], p["reversed"]) for p in placed] == [(5.4, 5.4, False), (6.6, 6.6, True)]
    assert "not simultaneous" in crane["moving"]["envelope"]
    assert crane["reactions"][0]["envelope"] and crane["reactions"][0]["max_force_N"] == 90000.0
    text = member_table(girder)
    assert "crane (envelope)" in text
    assert "M+: 243 kN*m at x = 5.4 m (first force at 5.4 m, as written); 243 kN*m at x = 6.6 m (first force at " \
           "6.6 m, reversed)" in text
    from beamlang.report.figures import figure_names
    from beamlang.report.markdown import member_markdown
    md = member_markdown(girder, figure_names(girder))
    assert "| largest sagging moment (tied place 2 of 2) | 243 kN·m | 6.6 m | 6.6 m | reversed |" in md \
        or "| largest sagging moment (tied place 2 of 2) | 243 kN*m | 6.6 m | 6.6 m | reversed |" in md, md


def test_fixed_beam_hogging_at_both_ends_and_both_slope_places():
    # Fixed-end moment of a point load (Gere & Goodno, 8th ed., App. H, from memory): M_A = -P a b^2 / L^2,
    # largest at a = L / 3: -4 P L / 27 = -4 * 60 * 12 / 27 = -106.67 kN m; at the other end, with a = 2 L / 3.
    a = analyse_text(member_text("12 m", ["fixed at 0 m", "fixed at span"], {"crane": ["moving 60 kN down"]}))
    r = a.result("crane")
    P, L = 60 * kN, Fraction(12)
    assert r.moment_negative.value == -4 * P * L / 27
    assert places(r, "moment_negative") == [(0, 4, False, -4 * P * L / 27), (12, 8, False, -4 * P * L / 27)]
    one = [(Fraction(0), P)]
    hog = scan(one, L, lambda loads, x: fixed_beam(L, loads, x)[0], Fraction(1, 20), (Fraction(0), L))
    assert_matches_scan(r, "moment_negative", hog, -1, Fraction(0))
    # the largest slope: two mirrored places x and L - x, the force at p and L - p, opposite signs
    got = places(r, "slope_max")
    assert len(got) == 2
    (x1, p1, _, t1), (x2, p2, _, t2) = got
    assert abs(x1 + x2 - L) < Fraction(1, 10**9) and abs(p1 + p2 - L) < Fraction(1, 10**9)
    assert abs(t1 + t2) <= Fraction(1, 10**12) * abs(t1)
    slope = scan(one, L, lambda loads, x: fixed_beam(L, loads, x)[1], Fraction(1, 20))
    assert_matches_scan(r, "slope_max", slope, 1, Fraction(1, 10**4), absolute=True)
    # by the scan's closed form, the slope at the listed place with the force at the listed position
    assert abs(fixed_beam(L, [(p1, P)], x1)[1] - t1) <= Fraction(1, 10**9) * abs(t1)


def test_two_span_sagging_moment_at_mirrored_irrational_places():
    # Two equal spans L, one force P at a = t L in the first: by the three-moment equation above, the moment under
    # it is P L (t - 5 t^2 / 4 + t^4 / 4), largest where 2 t^3 - 5 t + 2 = 0, t = 0.432320..., x = 3.45856 m on
    # 8 m spans, and its mirror 12.54144 m.
    a = analyse_text(member_text("16 m", ["pin at 0 m", "roller at 8 m", "roller at span"],
                                 {"crane": ["moving 60 kN down"]}))
    r = a.result("crane")
    t = 0.4323
    for _ in range(60):  # Newton on 2 t^3 - 5 t + 2
        t -= (2 * t**3 - 5 * t + 2) / (6 * t**2 - 5)
    P, L = 60000.0, 8.0
    got = places(r, "moment_positive")
    assert len(got) == 2
    assert abs(float(got[0][0]) - t * L) < 1e-9 and abs(float(got[1][0]) - (2 * L - t * L)) < 1e-9
    assert abs(float(got[0][1]) - t * L) < 1e-9  # the force stands at the place
    assert abs(float(got[0][3]) - P * L * (t - 5 * t**2 / 4 + t**4 / 4)) < 1e-6
    samples = scan([(Fraction(0), 60 * kN)], 2 * Fraction(8), lambda loads, x: two_span_moment(Fraction(8), loads, x),
                   Fraction(1, 40))
    assert_matches_scan(r, "moment_positive", samples, 1, Fraction(1, 10**4))
    # the largest hogging moment over the middle support: one place, reached from two group positions (mirrored)
    hog = places(r, "moment_negative")
    assert [g[0] for g in hog] == [8, 8] and abs(hog[0][1] + hog[1][1] - 16) < Fraction(1, 10**9)


def test_reversed_direction_gives_the_larger_extreme():
    # A 6 m cantilever fixed at x = 0 with 60 kN and 40 kN 3 m apart. By statics, with both forces on: as
    # written (60 kN at 3 m, 40 kN at 6 m) M = -(60 * 3 + 40 * 6) = -420 kN m; reversed (60 kN at 6 m, 40 kN at
    # 3 m) M = -(60 * 6 + 40 * 3) = -480 kN m, which governs. The tip deflection, P a^2 (3 L - a) / (6 E I) per
    # force: as written 4230 kN m^3 / EI, reversed 5220 kN m^3 / EI, which governs.
    a = analyse_text(member_text("6 m", ["fixed at 0 m"], {"crane": ["moving 60 kN and 40 kN down spaced 3 m"]}))
    r = a.result("crane")
    L = Fraction(6)
    assert places(r, "moment_negative") == [(0, 6, True, -480 * kN)]
    assert r.max_down.value == -5220 * kN / EI and [c[1:3] for c in places(r, "max_down")] == [(6, True)]
    samples = scan(GROUP, L, lambda loads, x: cantilever(L, loads, x)[0], Fraction(1, 20), (Fraction(0),))
    best, where = near_best(samples, -1)
    assert best == -480 * kN and {(x, p, rv) for x, p, rv in where} == {(0, 6, True)}
    tips = scan(GROUP, L, lambda loads, x: cantilever(L, loads, x)[1], Fraction(1, 20))
    best, where = near_best(tips, -1)
    assert best == r.max_down.value and all(rv for _, _, rv in where)


def test_moving_only_case_package_has_no_empty_sections_and_labels_its_wheels():
    from beamlang.report.figures import all_figures, figure_names
    from beamlang.report.markdown import member_markdown
    text = member_text("12 m", ["pin at 0 m", "roller at span"], {"crane": ["moving 60 kN and 40 kN down spaced 3 m"]},
                       ["combine strength = 1.5 crane"])
    a = analyse_text(text)
    md = member_markdown(a, figure_names(a))
    case = md[md.index("## Case crane"):md.index("## Combination strength")]
    assert "|---|---|---|\n\n" not in case and "No static loads" in case  # no empty Loads table
    assert "Each load's elastic curve" not in case
    assert "dynamic amplification" in md and "fatigue" in md  # the wheel-load caution beside the fatigue one
    figures = all_figures(a)
    moving = figures[figure_names(a)["(moving) crane"]]
    assert ">1: 60 kN<" in moving and ">2: 40 kN<" in moving  # each wheel named on the influence lines
    envelope = figures[figure_names(a)["(envelope)"]]
    assert "strength (over every position of the moving group)" in envelope


def test_static_member_has_no_moving_caution():
    from beamlang.report.figures import figure_names
    from beamlang.report.markdown import member_markdown
    a = analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"], {"dead": ["uniform 2 kN/m down"]}))
    assert "dynamic amplification" not in member_markdown(a, figure_names(a))


def test_two_span_fixed_ends_ties_across_travel_directions():
    # A symmetric two-span member (fixed, roller, fixed) under an asymmetric group: by symmetry, the group as
    # written with its first force at p and the group reversed with its first force at L - p are mirror images,
    # so every extreme the search lists must come in mirrored pairs (x and L - x, p and L - p, the direction
    # flipped), and each listed place, re-solved as a static case with the forces where they stand, must give
    # the listed value.
    from beamlang.analysis.results import factored_loads
    from beamlang.engine.moving import standing_case
    from beamlang.engine.solve import curves_with
    a = analyse_text(member_text("16 m", ["fixed at 0 m", "roller at 8 m", "fixed at span"],
                                 {"crane": ["moving 60 kN and 40 kN down spaced 3 m"]}))
    r, sol = a.result("crane"), a.solution
    L, eps = Fraction(16), Fraction(1, 10**8)
    for field, curve in (("max_down", "v"), ("max_up", "v"), ("moment_positive", "M"), ("moment_negative", "M")):
        got = r.places_of(field)
        assert len(got) == 2, field
        first, other = got
        assert first.reversed != other.reversed
        assert abs(first.x + other.x - L) < eps and abs(first.position + other.position - L) < eps
        for c in got:
            curves = curves_with(sol, standing_case(r.envelope, c, factored_loads(sol, sol.target("crane"))))
            value = getattr(curves, curve).at(c.x)
            assert abs(value - c.value) <= Fraction(1, 10**9) * abs(c.value)

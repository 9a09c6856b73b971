"""Natural frequency (`limit frequency F mass TERMS`) against published values.

Sources (from memory, edition as remembered):
- [Blevins] R. D. Blevins, Formulas for Natural Frequency and Mode Shape, Table 8-1 (single-span Euler-Bernoulli
  beams): f1 = lambda^2 / (2 pi L^2) sqrt(EI / m) with lambda = pi (pinned-pinned), 1.87510407 (clamped-free),
  4.73004074 (clamped-clamped); a continuous beam of two equal spans on three rigid supports has the first
  frequency of one simply supported span (its first mode is antisymmetric, the middle support a node).
- [Rayleigh] Rayleigh's method with the static deflection shape: a simple span with a central mass M and its own
  mass m per length, f1 = (1 / 2 pi) sqrt(48 EI / (L^3 (M + 17/35 m L))) (from memory); exact when m = 0.
- [Timoshenko] S. Timoshenko, Vibration Problems in Engineering, the shear correction for a simply supported
  beam: with shear deformation and without rotary inertia the sine mode stays exact and
  omega1^2 = omega_EB^2 / (1 + (pi / L)^2 EI / (kappa G A)) (from memory).
"""

from __future__ import annotations

import math

import pytest

from beamlang.engine.frequency import TOLERANCE
from beamlang.errors import BeamError
from engine_helpers import analyse_text, member_text

EI = 200e9 * 8e-5  # E 200 GPa, I 8e7 mm^4
G0 = 9.80665
W = 2.0  # kN/m of the mass case: m = 2000 / g kg/m
M = 2000 / G0
L = 6.0


def _frequency(supports, loads=("uniform 2 kN/m down",), extra=(), span="6 m", **kw):
    text = member_text(span, list(supports), {"dead": list(loads)}, ["limit frequency 5 Hz mass dead", *extra], **kw)
    a = analyse_text(text)
    (found,) = a.frequencies
    check = next(c for c in a.checks if c.kind == "frequency")
    return found.frequency, check


def _blevins(lam, length=L, mass=M):
    return lam**2 / (2 * math.pi * length**2) * math.sqrt(EI / mass)


def test_simple_span_closed_form_and_converged_elements():
    f, check = _frequency(["pin at 0 m", "roller at span"])
    exact = math.pi / (2 * L**2) * math.sqrt(EI / M)  # [Blevins] lambda = pi
    assert f.method == "closed form" and f.hz == pytest.approx(exact, rel=1e-14)
    assert abs(f.fe_hz - exact) / exact < 10 * TOLERANCE  # the element value, converged, agrees
    assert f.change < TOLERANCE
    assert check.passed and check.ratio == pytest.approx(5 / exact, rel=1e-8)  # f1 kept to 9 digits in checks


@pytest.mark.parametrize("supports, lam", [
    (["fixed at 0 m"], 1.87510407),  # [Blevins] clamped-free
    (["fixed at 0 m", "fixed at span"], 4.73004074),  # [Blevins] clamped-clamped
    (["fixed at span"], 1.87510407),  # the same cantilever, fixed at the other end
])
def test_cantilever_and_fixed_fixed(supports, lam):
    f, _ = _frequency(supports)
    assert f.method == "finite elements"
    assert abs(f.hz - _blevins(lam)) / _blevins(lam) < 1e-6  # lambda printed to 9 digits


def test_two_equal_spans_have_the_simple_span_frequency():
    f, _ = _frequency(["pin at 0 m", "roller at 3 m", "roller at span"])
    exact = _blevins(math.pi, L / 2)  # [Blevins] two equal spans
    assert abs(f.hz - exact) / exact < 1e-6


def test_central_point_mass_on_a_massless_span_is_exact():
    f, _ = _frequency(["pin at 0 m", "roller at span"], loads=("point 10 kN down at span/2",))
    mass = 10000 / G0
    exact = math.sqrt(48 * EI / (L**3 * mass)) / (2 * math.pi)  # [Rayleigh] with m = 0: exact
    assert f.method == "finite elements" and abs(f.hz - exact) / exact < 1e-9


def test_central_point_mass_with_the_span_own_mass_by_rayleigh():
    f, _ = _frequency(["pin at 0 m", "roller at span"], loads=("point 10 kN down at span/2", "uniform 2 kN/m down"))
    big = 10000 / G0
    rayleigh = math.sqrt(48 * EI / (L**3 * (big + 17 / 35 * M * L))) / (2 * math.pi)  # [Rayleigh]
    assert f.hz < rayleigh * (1 + 1e-9)  # Rayleigh's quotient is an upper bound
    assert abs(f.hz - rayleigh) / rayleigh < 2e-3  # and close for a dominant central mass


def test_factors_and_self_weight_make_the_mass():
    text = member_text("6 m", ["pin at 0 m", "roller at span"],
                       {"dead": ["uniform 1 kN/m down", "self-weight"], "live": ["uniform 2 kN/m down"]},
                       ["limit frequency 5 Hz mass dead + 0.5 live"],
                       material="E 200 GPa yield 250 MPa density 7850 kg/m^3",
                       section="properties I 8e7 mm^4 depth 300 mm A 5000 mm^2")
    a = analyse_text(text)
    (found,) = a.frequencies
    m = 1000 / G0 + 7850 * 5e-3 + 0.5 * 2000 / G0  # loads / g, self-weight density x A
    assert sum(float(m1) for _, _, m1, _ in found.masses.lines) == pytest.approx(m, rel=1e-14)
    assert found.frequency.hz == pytest.approx(math.pi / (2 * L**2) * math.sqrt(EI / m), rel=1e-14)


def test_shear_deformation_lowers_the_simple_span_frequency_as_timoshenko_gives():
    f, _ = _frequency(["pin at 0 m", "roller at span"], extra=["include shear deformation"], span="3 m",
                      material="E 200 GPa G 80 GPa", section="rectangle width 100 mm depth 400 mm")
    EIr, kGA, m, Ls = 200e9 * 0.1 * 0.4**3 / 12, 5 / 6 * 80e9 * 0.04, 2000 / G0, 3.0
    euler = math.pi / (2 * Ls**2) * math.sqrt(EIr / m)
    exact = euler / math.sqrt(1 + (math.pi / Ls) ** 2 * EIr / kGA)  # [Timoshenko]
    assert f.method == "finite elements" and abs(f.hz - exact) / exact < 1e-6
    assert f.hz < euler * 0.99


def test_a_stepped_hinged_member_on_a_spring_converges():
    text = "\n".join([
        'member T-3 "Test"', "span 8 m", "material steel E 200 GPa",
        "section properties I 8e7 mm^4 from 0 m to 3 m", "section properties I 2e7 mm^4 from 3 m to span",
        "support fixed at 0 m", "support spring 2 kN/mm at 4 m", "hinge at 5 m", "support pin at 6 m",
        "support roller at span", "case dead", "  uniform 2 kN/m down", "  point 5 kN down at 7 m",
        "limit frequency 8 Hz mass dead", ""])
    a = analyse_text(text)
    (found,) = a.frequencies
    f = found.frequency
    assert f.change < TOLERANCE and f.method == "finite elements"
    # halving the elements once more moves it by less than the tolerance too
    hzs = [hz for _, hz in f.history]
    assert abs(hzs[-1] - hzs[-2]) / hzs[-1] < TOLERANCE
    # the mode shape: zero at the rigid supports, largest +1
    mode = dict(f.mode)
    assert abs(mode[0.0]) < 1e-12 and abs(mode[6.0]) < 1e-12 and max(v for v in mode.values()) == 1.0


def _error(text: str) -> str:
    with pytest.raises(BeamError) as exc:
        analyse_text(text)
    return exc.value.diagnostics[0].message


def test_an_upward_load_cannot_be_a_mass():
    text = member_text("6 m", ["pin at 0 m", "roller at span"], {"dead": ["uniform 2 kN/m up"]},
                       ["limit frequency 5 Hz mass dead"])
    assert _error(text) == "case 'dead' holds an upward load, which cannot be a mass"

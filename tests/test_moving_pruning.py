"""The moving-load search's float pruning changes nothing: on random small members the pruned envelope gives
the same results (values, places, group positions, ties, support reaches, span maxima) as the exact search
with every cell, line, segment and interior searched."""

from __future__ import annotations

from contextlib import contextmanager
from unittest import mock

from hypothesis import given, settings
from hypothesis import strategies as st

from beamlang.engine.moving import bounds, search, standing
from engine_helpers import analyse_text, member_text

FIELDS = ("reactions", "max_down", "max_up", "slope_max", "slope_at_supports", "moment_positive", "moment_negative",
          "shear_max", "points", "regions", "stress", "cross_check", "positions", "places", "reaches",
          "moment_reaches")
INF = float("inf")
LAYOUTS = (["pin at 0 m", "roller at span"], ["pin at 0 m", "roller at 3 m", "roller at span"],
           ["pin at 0.8 m", "roller at 4 m"], ["fixed at 0 m"], ["pin at 0 m", "spring 5 kN/mm at 3 m", "roller at span"],
           ["fixed at 0 m", "roller at span"])


class _Every:
    """Every fixed point's line searched against its own extremes too, every support with a moment."""

    def get(self, key, default=None):
        return key, key[0]

    def __contains__(self, item) -> bool:
        return True


@contextmanager
def unpruned():
    """Every float bound says 'could beat': each cell, line, segment and interior is searched exactly; and every
    line through a fixed point is built, with both ends (constant lines and the ends the group standing gives
    too are not left out)."""
    everything = mock.patch.object(bounds._Best, "wanted", lambda self, *a, **k: True)
    interiors = mock.patch.object(search, "interior_bounds", lambda items, *a: [(INF, -INF, INF, -INF)] * len(items))
    lines = mock.patch.object(search, "critical_bounds", lambda g, pa, pb: (INF, -INF))
    pieces = mock.patch.object(standing, "critical_bounds", lambda g, pa, pb: (INF, -INF))
    ends = mock.patch.object(search, "_fresh_ends", lambda load, offsets, on, pa, pb: (pa, pb))
    fixed = mock.patch.object(search, "_fixed_keys", lambda member: (_Every(), set(), _Every()))
    with everything, interiors, lines, pieces, ends, fixed:
        yield


@st.composite
def moving_members(draw) -> str:
    layout = draw(st.sampled_from(LAYOUTS))
    wheels = draw(st.integers(1, 3))
    forces = [draw(st.integers(2, 20)) for _ in range(wheels)]
    gaps = [draw(st.integers(3, 20)) / 10 for _ in range(wheels - 1)]
    moving = "moving " + " and ".join(f"{f} kN" for f in forces) + " down"
    if gaps:
        moving += " spaced " + " and ".join(f"{g:g} m" for g in gaps)
    cases = {"m": [moving]}
    extra = []
    if draw(st.booleans()):
        cases["d"] = [f"uniform {draw(st.integers(1, 5))} kN/m down",
                      f"point {draw(st.integers(1, 9))} kN down at {draw(st.integers(1, 5)) / 2:g} m"]
        extra = [f"combine c = {draw(st.sampled_from(['1', '1.2', '1.35']))} d + 1.5 m"]
    return member_text("6 m", layout, cases, extra)


def _results(text: str) -> dict:
    a = analyse_text(text)
    return {r.name: tuple(getattr(r, f) for f in FIELDS) for r in a.results if r.envelope is not None}


@settings(max_examples=12, deadline=None, derandomize=True)
@given(moving_members())
def test_pruned_envelope_equals_the_unpruned_exact_search(text):
    pruned = _results(text)
    with unpruned():
        full = _results(text)
    assert pruned == full


def test_pruning_skips_interiors():
    # the pruning does something: a two-span member with a wheel pair solves few of its interiors exactly
    text = member_text("6 m", LAYOUTS[1], {"m": ["moving 10 kN and 8 kN down spaced 1.2 m"]})
    env = next(r.envelope for r in analyse_text(text).results if r.envelope is not None)
    with unpruned():
        full = next(r.envelope for r in analyse_text(text).results if r.envelope is not None)
    assert env.interiors < full.interiors == 4 * full.cells

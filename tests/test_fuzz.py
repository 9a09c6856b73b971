"""Damaged and generated inputs never crash: a result, or errors in the `file:line:col: error:` form."""

from __future__ import annotations

from hypothesis import HealthCheck, given, settings

from engine_helpers import analyse_text
from fuzz.mutate import run
from strategies import members


def test_mutated_examples_give_results_or_clean_errors(tmp_path):
    count, problems = run(300, seed=7, workdir=tmp_path)
    assert count == 300 and problems == [], problems[0] if problems else ""


@settings(max_examples=100, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_generated_members_check_without_error(text):
    a = analyse_text(text)
    assert len(a.results) == len(a.loaded.member.cases) + len(a.loaded.member.combinations)

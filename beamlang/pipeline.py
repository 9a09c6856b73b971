"""The compile pipeline in one place: path -> Analysis (model, exact solution, results, checks)."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from beamlang.analysis.checks import Check, run_checks
from beamlang.analysis.display import report_units
from beamlang.analysis.frequency import FrequencyResult, natural_frequencies
from beamlang.language.frontend import Loaded, load
from beamlang.analysis.required import Required, required_section
from beamlang.analysis.results import TargetResult, evaluate
from beamlang.engine.solve import Solution, solve


@dataclass(frozen=True, slots=True)
class Analysis:
    loaded: Loaded
    solution: Solution
    results: tuple[TargetResult, ...]
    checks: tuple[Check, ...]
    required: Required
    units: dict[str, str]  # the report unit of each quantity, chosen once from the member (display.report_units)
    frequencies: tuple[FrequencyResult, ...] = ()  # one per `limit frequency` line

    def result(self, name: str) -> TargetResult:
        """The results of one case or combination."""
        return next(r for r in self.results if r.name == name)

    @property
    def passed(self) -> bool:
        return all(c.passed for c in self.checks)


def analyse_loaded(item: Loaded) -> Analysis:
    solution = solve(item.member)            # every load's exact curve, force method, superposed
    results = evaluate(solution)             # reactions, located extrema, stresses, cross-check
    frequencies = natural_frequencies(item.member)  # first bending frequency per `limit frequency` line
    checks = run_checks(item.member, results, frequencies)  # limits and stress against the member's statements
    return Analysis(item, solution, results, checks, required_section(item.member, checks), report_units(item.member),
                    frequencies)


def analyse(path: Path) -> Analysis:
    return analyse_loaded(load(path))        # read, parse, validate into exact SI, then solve

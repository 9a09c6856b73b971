"""Markdown: Analysis + figure names -> the calc package text (renders on a code-hosting site as it is)."""

from __future__ import annotations

from beamlang.pipeline import Analysis
from beamlang.report import analysis_md as results
from beamlang.report import checks_md
from beamlang.report.frequency_md import frequency_section
from beamlang.report import sections


def member_markdown(a: Analysis, figures: dict[str, str], changes: list[str] | None = None) -> str:
    """The whole package in the order a checker reads it; `figures` maps target name -> relative path;
    `changes` is the optional 'Changes since REV' section, placed after the summary."""
    parts = [sections.title(a), results.summary(a), changes or [], sections.inputs(a),
             sections.signs(a, figures["sign convention"]), sections.section_properties(a), sections.method(a)]
    shown: dict = {}  # every general formula written out so far: a later load with the same one refers to it
    parts += [results.target(a, t.name, figures.get(t.name), figures.get(f"(moving) {t.name}"), shown)
              for t in a.solution.targets]
    parts += [results.envelope(a, figures["(envelope)"]), frequency_section(a, figures)]
    parts += [checks_md.checks_detail(a), results.required(a), results.cross_check(a), sections.cautions(a),
              sections.traceability(a)]
    return "\n".join(line for part in parts for line in part).rstrip("\n") + "\n"

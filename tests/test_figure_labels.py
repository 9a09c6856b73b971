"""The loads panel a checker reads: loads at one place labelled apart, line loads drawn with arrows and
labelled in the unit they were written in, "factored" only where a factor is not 1; no two labels of any
figure overlap."""

from __future__ import annotations

import xml.etree.ElementTree as ET

import pytest
from hypothesis import HealthCheck, given, settings

from beamlang.language.frontend import load
from beamlang.pipeline import analyse, analyse_loaded
from beamlang.report import figures
from beamlang.report.svgtext import text_width
from casefiles import CASES, EXAMPLES
from engine_helpers import analyse_text
from strategies import members

SVG = "{http://www.w3.org/2000/svg}"


def _figure(target: str):
    a = analyse_loaded(load(CASES / "checker" / "tip-loads-us.beam"))
    return ET.fromstring(figures.target_figure(a, target))


def _boxes(root) -> list[tuple[float, float, float, float, str]]:
    """(left, top, right, bottom, text) of every unrotated line of text, from the plotter's width estimate."""
    out = []
    for t in root.iter(f"{SVG}text"):
        if t.get("transform"):  # the rotated y-axis labels stand beside the frame, outside every panel
            continue
        size, anchor = float(t.get("font-size")), t.get("text-anchor") or "start"
        for line in (t.findall(f"{SVG}tspan") or [t]):
            w, x, y = text_width(line.text or "", size), float(line.get("x")), float(line.get("y"))
            left = x - {"start": 0.0, "middle": w / 2, "end": w}[anchor]
            out.append((left, y - 0.76 * size, left + w, y + 0.24 * size, line.text or ""))
    return out


def _overlaps(root) -> list[tuple[str, str]]:
    b = _boxes(root)
    return [(p[4], q[4]) for i, p in enumerate(b) for q in b[i + 1:]
            if p[0] < q[2] and q[0] < p[2] and p[1] < q[3] and q[1] < p[3]]


def _load_texts(root) -> dict[str, tuple[float, float]]:
    return {"\n".join(s.text for s in (t.findall(f"{SVG}tspan") or [t])): (float(t.get("x") or 0), float(t.get("y") or 0))
            for t in root.iter(f"{SVG}text") if t.get("fill") == figures.LOAD}


def test_a_dead_and_a_live_tip_load_are_labelled_apart():
    texts = _load_texts(_figure("service"))
    dead, live = texts["dead: 500 lbf"], texts["live: 800 lbf"]  # as written: `point 500 lbf`, `point 800 lbf`
    assert dead[0] == live[0] and abs(dead[1] - live[1]) >= 7.0  # one above the other, a line apart
    assert not _overlaps(_figure("service"))


def test_a_factored_combination_says_so_and_shows_the_factored_loads():
    root = _figure("strength")
    title = next(t.text for t in root.iter(f"{SVG}text") if t.text and t.text.startswith("strength:"))
    assert title == "strength: loads, supports and reactions (factored: 1.2 dead + 1.6 live)"
    texts = _load_texts(root)
    assert {"dead: 1.2 x 500 = 600 lbf", "live: 1.6 x 800 = 1280 lbf", "dead: 1.2 x 50 = 60 plf",
            "live: 0 to 64 plf (1.6 x the written values)"} <= set(texts)
    # statics of a cantilever (sum of the factored loads; their moments about the support):
    # R = 1.2 (50 x 6 + 500) + 1.6 (800 + 40 x 6 / 2) = 2432 lbf, M = 1.2 (50 x 36 / 2 + 500 x 6)
    # + 1.6 (800 x 6 + 120 x 4) = 13128 lbf*ft
    reaction = [t for t in root.iter(f"{SVG}text") if t.get("fill") == figures.REACTION][0]
    assert [s.text for s in reaction.iter(f"{SVG}tspan")] == ["R = 2.432 kip up", "M = 13.13 kip*ft counterclockwise"]


def test_a_combination_of_factors_1_is_not_called_factored():
    root = _figure("service")
    title = next(t.text for t in root.iter(f"{SVG}text") if t.text and t.text.startswith("service:"))
    assert title == "service: loads, supports and reactions"
    assert {"dead: 50 plf", "live: 0 to 40 plf"} <= set(_load_texts(root))


def test_line_loads_are_drawn_with_arrows_pointing_at_the_member():
    root = _figure("dead")
    heads = [p for p in root.iter(f"{SVG}polyline") if p.get("stroke") == figures.LOAD and p.get("fill") == "none"]
    # one point load's arrow head, and the uniform load's arrows (about one every L/16, 17 on the whole member)
    assert len(heads) == 1 + 17
    member_y = max(float(p.get("points").split()[1].split(",")[1]) for p in heads)
    assert all(float(p.get("points").split()[1].split(",")[1]) <= member_y for p in heads)  # tips at the member


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.beam")), ids=lambda p: p.stem)
def test_no_two_labels_overlap_in_an_examples_figures(path):
    a = analyse(path)
    for file, svg in figures.all_figures(a).items():
        assert not _overlaps(ET.fromstring(svg)), file


@settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_no_two_load_labels_overlap_in_generated_members(text):
    a = analyse_text(text)
    for key in figures.figure_names(a):
        if key in ("sign convention", "(envelope)") or key.startswith("(moving) "):
            continue
        root = ET.fromstring(figures.target_figure(a, key))
        loads = {line for t in _load_texts(root) for line in t.split("\n")}
        assert not [o for o in _overlaps(root) if o[0] in loads or o[1] in loads], key

"""The SVG plotter and the figures drawn with it: ticks, labels, the data-to-page mapping, escaping, and
that a drawn curve is the engine's curve."""

from __future__ import annotations

import xml.etree.ElementTree as ET
from fractions import Fraction

import pytest
from hypothesis import HealthCheck, given, settings

from beamlang.report import drawing, figures
from beamlang.report.svgplot import Figure
from beamlang.report.ticks import nice_ticks, tick_labels
from engine_helpers import analyse_text, member_text
from strategies import members

SVG = "{http://www.w3.org/2000/svg}"


@pytest.mark.parametrize("lo, hi, least, ticks", [
    (0.0, 5.4, 5, [0, 1, 2, 3, 4, 5]),
    (-0.27, 5.67, 5, [0, 1, 2, 3, 4, 5]),
    (-26.0, 24.0, 3, [-20, 0, 20]),
    (-0.0068, 0.0061, 3, [-0.005, 0, 0.005]),
    (0.0, 1.0, 3, [0, 0.5, 1.0]),
    (0.0, 1.0, 4, [0, 0.25, 0.5, 0.75, 1.0]),
    (-9.9, 0.6, 3, [-7.5, -5, -2.5, 0]),
    (1e6, 1.3e6, 3, [1.0e6, 1.1e6, 1.2e6, 1.3e6]),
])
def test_ticks_are_round_numbers_inside_the_range(lo, hi, least, ticks):
    got, step = nice_ticks(lo, hi, least)
    assert got == pytest.approx(ticks, abs=1e-12)
    assert all(lo <= t <= hi for t in got)


def test_tick_labels_share_their_decimals_and_use_a_true_minus():
    assert tick_labels([-0.005, 0.0, 0.005], 0.005) == (["\u22120.005", "0.000", "0.005"], 0)
    assert tick_labels([-7.5, -5.0, -2.5, 0.0], 2.5) == (["\u22127.5", "\u22125.0", "\u22122.5", "0.0"], 0)
    assert tick_labels([0.0, 20.0, 40.0], 20.0) == (["0", "20", "40"], 0)


def test_very_large_or_small_tick_values_take_out_a_power_of_ten():
    labels, exp = tick_labels([0.0, 2e5, 4e5], 2e5)
    assert (labels, exp) == (["0", "2", "4"], 5)
    labels, exp = tick_labels([0.0, 2.5e-5, 5e-5], 2.5e-5)
    assert (labels, exp) == (["0.0", "2.5", "5.0"], -5)


def _box(root) -> tuple[float, float, float, float]:
    frame = next(r for r in root.iter(f"{SVG}rect") if r.get("stroke") == "black")
    return tuple(float(frame.get(k)) for k in ("x", "y", "width", "height"))


def test_data_limits_map_to_the_frame_corners():
    fig = Figure()
    p = fig.panel(100.0)
    p.line([0, 10], [0, 5], color="#123456")
    fig.xlim, p.ylim = (0.0, 10.0), (0.0, 5.0)
    root = ET.fromstring(fig.svg())
    x, y, w, h = _box(root)
    line = next(e for e in root.iter(f"{SVG}polyline") if e.get("stroke") == "#123456")
    (x1, y1), (x2, y2) = [tuple(map(float, pt.split(","))) for pt in line.get("points").split()]
    assert (x1, y1) == pytest.approx((x, y + h), abs=0.01) and (x2, y2) == pytest.approx((x + w, y), abs=0.01)


def test_text_is_escaped_and_the_output_is_xml():
    fig = Figure(title='<script>alert(1)</script> & "quotes"')
    p = fig.panel(80.0)
    p.line([0, 1], [0, 1])
    p.text(0.5, 0.5, "a < b\nc > d")
    text = fig.svg()
    assert "<script>" not in text and "&lt;script&gt;" in text
    ET.fromstring(text)  # parses


def _member():
    return analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"], {"live": ["uniform 10 kN/m down"]}))


def test_drawn_moment_curve_is_the_handbook_parabola():
    # Simple span under a full uniform load: M(x) = w x (L - x) / 2 (AISC Steel Construction Manual, 15th ed.,
    # Table 3-23, case 1, from memory). The figure's M polyline, read back through its own tick labels, must
    # be that curve: the drawing is checked, not only the numbers in the tables.
    a = _member()
    root = ET.fromstring(figures.target_figure(a, "live"))
    frames = [r for r in root.iter(f"{SVG}rect") if r.get("stroke") == "black"]
    curves = [e for e in root.iter(f"{SVG}polyline") if e.get("stroke") == figures.CURVE]
    assert len(frames) == 5 and len(curves) == 4  # member, then V, M, slope and deflection
    x, top, w, h = (float(frames[2].get(k)) for k in ("x", "y", "width", "height"))
    ticks = [(float(t.get("y")), t.text) for t in root.iter(f"{SVG}text")
             if t.get("text-anchor") == "end" and top <= float(t.get("y")) <= top + h + 3]
    (ya, va), (yb, vb) = ticks[0], ticks[-1]
    va, vb = (float(v.replace("\u2212", "-")) for v in (va, vb))
    bottom = float(frames[-1].get("y")) + float(frames[-1].get("height"))
    xticks = [(float(t.get("x")), float(t.text.replace("\u2212", "-"))) for t in root.iter(f"{SVG}text")
              if t.get("text-anchor") == "middle" and t.get("font-size") == "7" and float(t.get("y")) > bottom]
    (xa, ua), (xb, ub) = xticks[0], xticks[-1]
    points = [tuple(map(float, pt.split(","))) for pt in curves[1].get("points").split()]
    assert len(points) > 20
    for px, py in points:
        xm = ua + (px - xa) * (ub - ua) / (xb - xa)
        moment = va + (py - ya + 0.36 * 7) * (vb - va) / (yb - ya)  # the labels' baseline sits 0.36 em low
        assert moment == pytest.approx(10 * xm * (6 - xm) / 2, abs=0.2)  # kN m, to the drawing's 0.01 pt


def test_figures_are_the_same_text_every_time():
    a = _member()
    assert figures.all_figures(a) == figures.all_figures(_member())


def test_sampled_points_are_exact_values_of_the_curve():
    a = _member()
    xs, ys = drawing.sample(a.solution.target("live").curves.M, "kN*m")
    for x, y in zip(xs, ys):
        assert y == pytest.approx(float(Fraction(10) * x * (6 - x) / 2), rel=1e-12, abs=1e-12)


def _examples():
    from casefiles import EXAMPLES
    return sorted(EXAMPLES.glob("*.beam"))


@pytest.mark.parametrize("path", _examples(), ids=lambda p: p.stem)
def test_every_load_label_lies_inside_the_loads_panel(path):
    # Upward line loads are drawn below the member and downward ones above it; a label outside the first
    # panel's frame would sit on a curve and be read as part of it.
    from beamlang.pipeline import analyse
    a = analyse(path)
    for key in figures.figure_names(a):
        if key in ("sign convention", "(envelope)") or key.startswith(("(moving) ", "(mode) ")):
            continue
        root = ET.fromstring(figures.target_figure(a, key))
        x, y, w, h = _box(root)
        labels = [t for t in root.iter(f"{SVG}text") if t.get("fill") in (figures.LOAD, figures.SETTLE, figures.REACTION)]
        for t in labels:
            for line in (t.findall(f"{SVG}tspan") or [t]):
                assert x <= float(line.get("x")) <= x + w and y <= float(line.get("y")) <= y + h, (key, t.text)


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_figures_of_generated_members_are_xml_with_labels_in_their_panel(text):
    a = analyse_text(text)
    for file, svg in figures.all_figures(a).items():
        root = ET.fromstring(svg)
        if file in ("sign-convention.svg", "envelope.svg") or file.endswith("-moving.svg"):
            continue
        x, y, w, h = _box(root)
        for t in root.iter(f"{SVG}text"):
            if t.get("fill") in (figures.LOAD, figures.SETTLE, figures.REACTION):
                for line in (t.findall(f"{SVG}tspan") or [t]):
                    assert x <= float(line.get("x")) <= x + w and y <= float(line.get("y")) <= y + h, (file, t.text)


def test_deflection_limit_is_drawn_at_its_allowed_value():
    # span/360 on a 6 m span allows 16.67 mm (the limit as the governing codes write it: common practice,
    # no source); the dashed line must sit at that value on the deflection axis, below the member.
    a = analyse_text(member_text("6 m", ["pin at 0 m", "roller at span"], {"live": ["uniform 10 kN/m down"]},
                                 extra=["limit deflection live span/360"]))
    root = ET.fromstring(figures.target_figure(a, "live"))
    assert any(t.text == "span/360: 16.67 mm" for t in root.iter(f"{SVG}text"))
    frames = [r for r in root.iter(f"{SVG}rect") if r.get("stroke") == "black"]
    top, h = float(frames[4].get("y")), float(frames[4].get("height"))
    ticks = [(float(t.get("y")) - 0.36 * 7, float(t.text.replace("\u2212", "-"))) for t in root.iter(f"{SVG}text")
             if t.get("text-anchor") == "end" and top <= float(t.get("y")) <= top + h + 3]
    (ya, va), (yb, vb) = ticks[0], ticks[-1]
    dashed = [e for e in root.iter(f"{SVG}polyline") if e.get("stroke") == drawing.MARK and e.get("stroke-dasharray")]
    assert len(dashed) == 1
    y = float(dashed[0].get("points").split()[0].split(",")[1])
    assert va + (y - ya) * (vb - va) / (yb - ya) == pytest.approx(-6000 / 360, abs=0.05)


def test_reactions_are_written_under_their_supports():
    # Simple span, full uniform load: each reaction is w L / 2 = 30 kN up (statics).
    root = ET.fromstring(figures.target_figure(_member(), "live"))
    x, y, w, h = _box(root)
    labels = [t for t in root.iter(f"{SVG}text") if t.get("fill") == figures.REACTION]
    assert [t.text for t in labels] == ["R = 30 kN up", "R = 30 kN up"]
    assert all(y < float(t.get("y")) < y + h for t in labels)
    assert float(labels[0].get("x")) < x + 0.1 * w and float(labels[1].get("x")) > x + 0.9 * w


def test_a_long_title_is_wrapped_inside_the_figure():
    fig = Figure(width=300.0, title="word " * 40)
    p = fig.panel(60.0)
    p.title = ("panel " * 30, 7.0)
    p.line([0, 1], [0, 1])
    root = ET.fromstring(fig.svg())
    texts = [t for t in root.iter(f"{SVG}text") if t.text and t.text.startswith(("word", "panel"))]
    assert len(texts) > 4  # several lines each
    from beamlang.report.svgtext import text_width
    assert all(float(t.get("x")) + text_width(t.text, float(t.get("font-size"))) <= 300.0 for t in texts)

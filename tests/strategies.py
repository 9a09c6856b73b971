"""Hypothesis strategies: random valid `.beam` members written with random spacing, order and units."""

from __future__ import annotations

from hypothesis import strategies as st

SYSTEMS = {
    "si": {"length": ("m", 1000, "mm"), "force": ("kN", "N"), "line": ("kN/m", "N/mm"), "moment": ("kN*m", "kN\u00b7m"),
           "E": "200 GPa", "G": "80 GPa", "yield": "350 MPa", "density": "7850 kg/m^3", "spring": "5 kN/mm",
           "allowable": "allowable bending 150 MPa shear 90 MPa", "pressure": "kPa", "width": "1 m 200 mm"},
    "us": {"length": ("ft", 12, "in"), "force": ("kip", "lbf"), "line": ("kip/ft", "lbf/ft"), "moment": ("kip*ft", "kip*in"),
           "E": "29000 ksi", "G": "11200 ksi", "yield": "50 ksi", "density": "490 lb/ft^3", "spring": "30 kip/in",
           "allowable": "allowable bending 1.2 ksi shear 0.18 ksi", "pressure": "psf", "width": "16 in"},
}
SECTIONS = {
    "si": ["section rectangle width 100 mm depth 200 mm", "section I-shape depth 250 mm flange 150 mm x 12 mm web 8 mm",
           "section properties I 8.5e7 mm^4 depth 250 mm A 5400 mm^2", "section tube diameter 60 mm wall 4 mm",
           "section box width 100 mm depth 150 mm wall 6 mm", "section round diameter 50 mm"],
    "us": ["section rectangle width 1.5 in depth 9.25 in", 'section "2x10" rectangle width 1.5 in depth 9.25 in',
           "section properties I 340 in^4 depth 12 in A 10 in^2",
           "section tube diameter 4.5 in wall 0.237 in"],
}


@st.composite
def positions(draw, span: int, sub: int, unit: str, fine: str) -> tuple[str, int]:
    """A position text and its value in sub-units (so that tests can order them)."""
    form = draw(st.sampled_from(["abs", "fine", "end", "half", "from_end"]))
    if form == "end":
        return "span", span * sub
    if form == "half" and (span * sub) % 2 == 0:
        return "span/2", span * sub // 2
    if form == "from_end":
        k = draw(st.integers(0, span * sub))
        return f"span - {k} {fine}", span * sub - k
    k = draw(st.integers(0, span * sub))
    if form == "abs" and k % sub == 0:
        return f"{k // sub} {unit}", k
    if form == "abs" and k > sub:  # a length in parts: `3 ft 4 in`, `2 m 250 mm`
        return f"{k // sub} {unit} {k % sub} {fine}", k
    return f"{k} {fine}", k


@st.composite
def members(draw) -> str:
    system = draw(st.sampled_from(sorted(SYSTEMS)))
    u = SYSTEMS[system]
    unit, sub, fine = u["length"]
    span = draw(st.integers(2, 12))
    pos = lambda: draw(positions(span, sub, unit, fine))  # noqa: E731
    gap = lambda: draw(st.sampled_from([" ", "  ", "\t"]))  # noqa: E731
    lines = [f'member M-{draw(st.integers(1, 99))}{gap()}"Generated member"',
             f"span{gap()}{span} {unit}",
             f"material steel E {u['E']}{gap()}"
             + draw(st.sampled_from([f"yield {u['yield']}", u["allowable"]])) + f" density {u['density']} G {u['G']}",
             'project "Generated"  # a comment']
    inside = st.integers(1, span * sub - 1).filter(lambda k: 2 * k != span * sub)  # not an end, not span/2
    sections = draw(st.lists(st.sampled_from(SECTIONS[system]), min_size=1, max_size=3))
    if len(sections) == 1:
        lines.append(sections[0])
    else:  # a stepped member: stretches meeting end to end
        cuts = sorted(draw(st.lists(inside, min_size=len(sections) - 1, max_size=len(sections) - 1, unique=True)))
        ends = ["0 " + unit] + [f"{k} {fine}" for k in cuts] + ["span"]
        lines += [f"{sec} from {a} to {b}" for sec, a, b in zip(sections, ends, ends[1:])]
    if not any("properties" in sec for sec in sections) and draw(st.booleans()):
        lines.append("include shear deformation")  # every shape but `properties` has its shear area
    layouts = [["fixed at 0 " + unit], ["pin at 0 " + unit, "roller at span"],
               ["fixed at 0 " + unit, "roller at span"], ["fixed at 0 " + unit, "fixed at span"],
               ["pin at 0 " + unit, f"spring {u['spring']} at span/2", "roller at span"]]
    choice = draw(st.integers(0, len(layouts) - 1))
    lines += [f"support {text}" for text in layouts[choice]]
    hinges: list[int] = []
    if choice in (2, 3, 4) and draw(st.booleans()):  # layouts that stay stable with one hinge
        hinges = [draw(inside)]
        lines.append(f"hinge at {hinges[0]} {fine}")
    if choice in (1, 2, 4) and draw(st.booleans()):
        lines.append(f"limit slope at supports {draw(st.sampled_from(['0.001', '0.004', '0.02']))} rad")
    free = lambda: draw(positions(span, sub, unit, fine).filter(lambda p: p[1] not in hinges))  # noqa: E731
    names = []
    for c in range(draw(st.integers(1, 3))):
        name = ["dead", "live", "snow"][c]
        names.append(name)
        body = [f"case {name}"]
        for _ in range(draw(st.integers(1, 4))):
            body.append("  " + draw(loads(pos, u, free)))
        lines.append("\n".join(body))
    if len(names) > 1 and draw(st.booleans()):
        lines.append(f"pattern {names[1]}")
    if len(names) > 1:
        lines.append("combine total = " + " + ".join(f"{draw(st.sampled_from(['', '1.2 ', '1.6 ']))}{n}" for n in names))
    lines.append(f"limit deflection {names[0]} span/{draw(st.sampled_from([180, 240, 360]))}")
    lines.append(f"report deflection at {pos()[0]}")
    order = draw(st.permutations(range(len(lines))))
    return "\n".join(lines[i] for i in order) + "\n"


@st.composite
def loads(draw, pos, u, free=None) -> str:
    """A load line; a couple goes to a `free` position (never on a hinge)."""
    kind = draw(st.sampled_from(["point", "uniform", "partial", "linear", "moment", "self", "area"]))
    direction = draw(st.sampled_from(["down", "up"]))
    number = draw(st.sampled_from(["1", "2.5", "0.75", "12", "1e1"]))
    if kind == "point":
        return f"point {number} {draw(st.sampled_from(u['force']))} {direction} at {pos()[0]}"
    if kind == "moment":
        turn = draw(st.sampled_from(["clockwise", "counterclockwise"]))
        return f"moment {number} {draw(st.sampled_from(u['moment']))} {turn} at {(free or pos)()[0]}"
    if kind == "self":
        return "self-weight"
    line = draw(st.sampled_from(u["line"]))
    if kind == "uniform":
        return f"uniform {number} {line} {direction}"
    if kind == "area":  # a pressure gathered over a tributary width
        return f"uniform {number} {u['pressure']} over {u['width']} {direction}"
    a, b = pos(), pos()
    if a[1] == b[1]:
        return f"uniform {number} {line} {direction}"
    (a, _), (b, _) = sorted([a, b], key=lambda p: p[1])
    if kind == "partial":
        return f"uniform {number} {line} {direction} from {a} to {b}"
    return f"linear 0 {line} to {number} {line} {direction} from {a} to {b}"

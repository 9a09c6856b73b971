"""Materials and sections: their lines (whole member or per stretch) -> stretches of one material and one section."""

from __future__ import annotations

from collections.abc import Callable, Sequence
from fractions import Fraction

from beamlang import model as m
from beamlang.exact import plain
from beamlang.language import syntax as s
from beamlang.language.build.context import Context
from beamlang.language.sections import DIMENSION_KIND, SHAPE_DIMENSIONS, ShapeProblem, properties, shear_area
from beamlang.language.units import STANDARD_GRAVITY

MATERIAL_PROPERTIES = {"E": "stress", "G": "stress", "yield": "stress", "allowable bending": "stress",
                       "shear": "stress", "density": "density"}
_DESCRIBE = {"E": "the elastic modulus E", "G": "the shear modulus G", "yield": "the yield strength",
             "shear": "the shear strength", "allowable bending": "the allowable bending stress",
             "density": "the density",
             "I": "the second moment of area I", "A": "the area A", "S": "the section modulus S",
             "Q": "the first moment of area Q", "t": "the shear width t"}
_SECTION_EXAMPLES = {
    "properties": "for example `section properties I 8.5e7 mm^4 depth 250 mm`",
    "rectangle": "for example `section rectangle width 89 mm depth 235 mm`",
    "round": "for example `section round diameter 60 mm`",
    "tube": "for example `section tube diameter 60 mm wall 4 mm`",
    "box": "for example `section box width 100 mm depth 200 mm wall 6 mm`",
    "I-shape": "for example `section I-shape depth 250 mm flange 150 mm x 12 mm web 8 mm`",
}

Placed = list[tuple[Fraction, Fraction, object]]  # (x1, x2, material or section)
Placeable = s.Material | s.Section


def stretches(ctx: Context) -> tuple[m.Stretch, ...]:
    """Materials and sections, each for the whole member or per stretch, merged into stretches
    of one material and one section (also kept on the context, for self-weight)."""
    mats = _cover(ctx, ctx.of(s.Material), "material", material)
    secs = _cover(ctx, ctx.of(s.Section), "section", section)
    ctx.stretches = _merge(ctx, mats, secs)
    return ctx.stretches


def _merge(ctx: Context, mats: Placed, secs: Placed) -> tuple[m.Stretch, ...]:
    if not mats or not secs or ctx.failed:
        return ()
    bounds = sorted({x for x1, x2, _ in mats + secs for x in (x1, x2)})
    out = []
    for a, b in zip(bounds, bounds[1:]):
        mid = (a + b) / 2
        mat = next(v for x1, x2, v in mats if x1 <= mid <= x2)
        sec = next(v for x1, x2, v in secs if x1 <= mid <= x2)
        out.append(m.Stretch(a, b, mat, sec))
    return tuple(out)


def _cover(ctx: Context, stmts: Sequence[Placeable], key: str,
           convert: Callable[[Context, Placeable], object]) -> Placed:
    """[(x1, x2, value)] covering the member once; a gap, an overlap or a mix is an error."""
    if not stmts:
        return []
    if ctx.length is None:  # no usable span (reported already): check the lines' own values only
        for st in stmts:
            convert(ctx, st)
        return []
    if len(stmts) > 1 and any(st.stretch is None for st in stmts):
        first, second = sorted(stmts, key=lambda st: st.span.line)[:2]
        ctx.error(second.span, f"a second `{key}` line; a member has only one unless each says where it applies",
                  f"the first is on line {first.span.line}; give each {key} its stretch, e.g. `... from 0 m to 1.2 m`")
        return []
    placed, ok = [], True
    for st in stmts:  # every statement is converted, so that all their problems are reported together
        value = convert(ctx, st)
        x1, x2 = _where(ctx, st, key)
        if value is None or x1 is None or x2 is None:
            ok = False
            continue
        placed.append((x1, x2, value, st))
    if not ok:
        return []
    placed.sort(key=lambda p: p[0])
    _gaps_and_overlaps(ctx, placed, key)
    return [(x1, x2, v) for x1, x2, v, _ in placed]


def _where(ctx: Context, st: Placeable, key: str) -> tuple[Fraction | None, Fraction | None]:
    """The stretch a material or section line applies to (the whole member when it names none)."""
    if st.stretch is None:
        return Fraction(0), ctx.length
    x1 = ctx.position(st.stretch.start, f"start of the {key}")
    x2 = ctx.position(st.stretch.end, f"end of the {key}")
    if x1 is not None and x2 is not None and x1 >= x2:
        ctx.error(st.stretch.span, f"the {key} must end to the right of where it starts",
                  "write `from` the left position `to` the right one")
        return None, x2
    return x1, x2


def _gaps_and_overlaps(ctx: Context, placed: list[tuple[Fraction, Fraction, object, Placeable]], key: str) -> None:
    at = Fraction(0)
    for x1, x2, _, st in placed:
        if x1 > at:
            ctx.whole(st.stretch.span, f"no {key} covers {plain(at)} m to {plain(x1)} m",
                      f"every part of the member needs a {key}: the stretches must meet end to end")
        elif x1 < at:
            ctx.error(st.stretch.span, f"this {key} overlaps another from {plain(x1)} m to "
                      f"{plain(min(at, x2))} m", "the stretches must meet end to end, without overlap")
        at = max(at, x2)
    if at < ctx.length:
        last = placed[-1][3]
        ctx.whole(last.stretch.span if last.stretch else last.span,
                  f"no {key} covers {plain(at)} m to {plain(ctx.length)} m (the end of the member)",
                  f"every part of the member needs a {key}: the last stretch must end at the span")


def material(ctx: Context, st: s.Material) -> m.Material | None:
    """One material line: its properties in SI (E required)."""
    values = _properties(ctx, st.properties, MATERIAL_PROPERTIES, "material property", "material properties")
    if "E" not in values and not any(p.name.text == "E" for p in st.properties):
        ctx.error(st.span, "the material has no elastic modulus E", "for example `E 200 GPa`")
    _strength_basis(ctx, st)
    if any(v is None for v in values.values()) or "E" not in values:
        return None
    return m.Material(st.name.text if st.name else None, values["E"], values.get("yield"),
                      values.get("density"), st.span, values.get("shear"), values.get("allowable bending"),
                      G=values.get("G"))


def _strength_basis(ctx: Context, st: s.Material) -> None:
    """A material's strength is a yield strength (a metal) or allowable stresses (bending with its shear), not both."""
    given = {p.name.text: p for p in st.properties}
    allowable = given.get("allowable bending")
    if allowable is None:
        return
    if "yield" in given:
        later = max(allowable, given["yield"], key=lambda p: p.span.col)
        ctx.error(later.name.span, "a material gives its yield strength or its allowable bending stress, not both",
                  "`yield` is a metal's yield strength (shear then fy/sqrt(3) unless `shear` is given); "
                  "`allowable bending` and `shear` are allowable stresses, used as given")
    if "shear" not in given:
        ctx.error(allowable.name.span, "an allowable bending stress needs the allowable shear stress beside it",
                  "add e.g. `shear 0.18 ksi`: the shear check never derives it from the bending value")


def _properties(ctx: Context, props: tuple[s.Property, ...], kinds: dict[str, str], one: str,
                many: str) -> dict[str, Fraction | None]:
    values: dict[str, Fraction | None] = {}
    for p in props:
        name = p.name.text
        if name not in kinds:
            ctx.error(p.name.span, f"unknown {one} '{name}'", ctx.suggest(name, kinds, many))
            continue
        if name in values:
            ctx.error(p.name.span, f"'{name}' is given twice")
            continue
        if p.second is not None and name != "flange":
            ctx.error(p.second.span, f"'{name}' takes one value", "only `flange` is written as width x thickness")
        values[name] = ctx.positive(p.value, kinds[name], _DESCRIBE.get(name, f"the {name}"))
    return values


def section(ctx: Context, st: s.Section) -> m.SectionProperties | None:
    """One section line: a shape's dimensions (or the properties themselves) -> its properties in SI."""
    shape = st.shape.text
    required, optional = SHAPE_DIMENSIONS[shape]
    kinds = {n: DIMENSION_KIND.get(n, "length") for n in required + optional}
    values = _properties(ctx, st.properties, kinds, f"{shape} dimension", f"{shape} dimensions")
    missing = [n for n in required if n not in values]
    if missing and all(p.name.text in kinds for p in st.properties):
        ctx.error(st.span, f"a {shape} section needs {', '.join(missing)}", _SECTION_EXAMPLES[shape])
    if missing:
        return None
    flange_t = _flange_thickness(ctx, st) if shape == "I-shape" else None
    if any(v is None for v in values.values()) or (shape == "I-shape" and flange_t is None):
        return None
    try:
        props = properties(shape, values, flange_t)
    except ShapeProblem as exc:
        where = next(p.span for p in st.properties if p.name.text == exc.name)
        ctx.error(where, exc.message, exc.hint)
        return None
    dims = tuple((n, values[n]) for n in required + optional if n in values)
    if flange_t is not None:
        dims += (("flange thickness", flange_t),)
    area, rule = shear_area(shape, values, props["A"])
    return m.SectionProperties(shape, dims, props["I"], props["A"], props["c"], props["S"],
                               props["Q"], props["t"], st.span, st.designation, area, rule)


def _flange_thickness(ctx: Context, st: s.Section) -> Fraction | None:
    flange = next(p for p in st.properties if p.name.text == "flange")
    if flange.second is None:
        ctx.error(flange.span, "the flange is written as width x thickness", "for example `flange 150 mm x 12 mm`")
        return None
    return ctx.positive(flange.second, "length", "the flange thickness")


def self_weight(ctx: Context, st: s.SelfWeight) -> list[m.Load]:
    """The weight of every stretch, density x g x area (one load where the weight per length does not change)."""
    stretches = ctx.stretches
    if not stretches or ctx.length is None:
        return []
    if any(sp.material.density is None for sp in stretches):
        line = next(sp.material.span.line for sp in stretches if sp.material.density is None)
        ctx.error(st.span, "self-weight needs the material's density",
                  f"add e.g. `density 7850 kg/m^3` to the material line (line {line})")
        return []
    if any(sp.section.A is None for sp in stretches):
        line = next(sp.section.span.line for sp in stretches if sp.section.A is None)
        ctx.error(st.span, "self-weight needs the section area",
                  f"give the area, e.g. `A 5400 mm^2`, or describe the section by its shape (line {line})")
        return []
    out: list[m.Load] = []
    for sp in stretches:
        w = sp.material.density * STANDARD_GRAVITY * sp.section.A
        if out and out[-1].w1 == -w:
            out[-1] = m.LineLoad(out[-1].x1, sp.x2, -w, -w, "self-weight", st.span)
        else:
            out.append(m.LineLoad(sp.x1, sp.x2, -w, -w, "self-weight", st.span))
    return out


def shear_deformation(ctx: Context) -> bool:
    """`include shear deformation`: every stretch needs the shear modulus G and a shape with a shear area."""
    lines = ctx.of(s.Include)
    if len(lines) > 1:
        ctx.error(lines[1].span, "`include shear deformation` is given twice", f"the first is on line {lines[0].span.line}")
    if not lines or not ctx.stretches:
        return bool(lines)
    no_g = next((sp.material for sp in ctx.stretches if sp.material.G is None), None)
    if no_g is not None:
        ctx.error(lines[0].span, "shear deformation needs the material's shear modulus G",
                  f"add e.g. `G 80 GPa` to the material line (line {no_g.span.line})")
    no_area = next((sp.section for sp in ctx.stretches if sp.section.shear_area is None), None)
    if no_area is not None:
        ctx.error(lines[0].span, "shear deformation needs a section described by its shape",
                  f"the shear area kappa A follows from the shape; a section given by its properties has none "
                  f"(line {no_area.span.line})")
    return True

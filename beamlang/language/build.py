"""Build: syntax Document -> validated Member model in exact SI; every problem is reported."""

from __future__ import annotations

import difflib
from fractions import Fraction

from beamlang import model as m
from beamlang.language import syntax as s
from beamlang.errors import Collector
from beamlang.exact import plain
from beamlang.language.sections import DIMENSION_KIND, SHAPE_DIMENSIONS, ShapeProblem, properties
from beamlang.source import Span
from beamlang.engine.stability import Mechanism, components, keep
from beamlang.language.units import STANDARD_GRAVITY, UnitProblem, exact_number, is_us, to_si

MIN_SPAN = Fraction(1, 1000)  # m
FIELD_ORDER = ("project", "job", "by", "checked", "date", "revision")
MATERIAL_PROPERTIES = {"E": "stress", "yield": "stress", "shear": "stress", "density": "density"}
SINGLE = {s.Member: "member", s.Units: "units", s.SpanLength: "span", s.Catalogue: "catalogue"}


def build(doc: s.Document) -> m.Member:
    """Validate a parsed file and convert it to the exact SI member model."""
    b = _Builder(doc)
    member = b.run()
    b.errors.raise_if_any()
    assert member is not None
    return member


class _Builder:
    def __init__(self, doc: s.Document):
        self.doc = doc
        self.errors = Collector(doc.source)
        self.length: Fraction | None = None
        self.support_positions: set[Fraction] = set()
        self.moving_cases: set[str] = set()

    # -- helpers ---------------------------------------------------------------------------
    def si(self, q: s.Quantity, kind: str, what: str, hint: str | None = None) -> Fraction | None:
        try:
            return to_si(q, kind, what, hint)
        except UnitProblem as exc:
            d = exc.diagnostic
            self.errors.error(d.span, d.message, d.hint)
            return None

    def number(self, text: str, span: Span) -> Fraction | None:
        try:
            return exact_number(text, span)
        except UnitProblem as exc:
            self.errors.error(exc.diagnostic.span, exc.diagnostic.message, exc.diagnostic.hint)
            return None

    def positive(self, q: s.Quantity, kind: str, what: str, hint: str | None = None) -> Fraction | None:
        value = self.si(q, kind, what, hint)
        if value is not None and value <= 0:
            self.errors.error(q.span, f"{what} must be greater than zero")
            return None
        return value

    def position(self, p: s.Position, what: str = "position") -> Fraction | None:
        L = self.length
        if p.form == "length":
            x = self.si(p.quantity, "length", what)
        elif L is None:
            return None
        elif p.form == "end":
            x = L
        elif p.form == "fraction":
            divisor = self.number(p.divisor, p.span)
            if divisor is None:
                return None
            if divisor == 0:
                self.errors.error(p.span, "cannot divide the span by zero")
                return None
            x = L / divisor
        else:
            d = self.si(p.quantity, "length", what)
            x = None if d is None else L - d
        if x is None or L is None:
            return x
        if x < 0 or x > L:
            self.errors.error(p.span, f"{what} {p} is outside the span (0 to {_show_span(self.doc)})",
                              "positions are measured from the left end, from 0 to the span")
            return None
        return x

    def suggest(self, word: str, choices, what: str) -> str | None:
        close = difflib.get_close_matches(word, list(choices), n=1, cutoff=0.5)
        if close:
            return f"did you mean '{close[0]}'?"
        return f"the {what} are: {', '.join(choices)}" if choices else None

    # -- the whole file --------------------------------------------------------------------
    def run(self) -> m.Member | None:
        stmts = self.doc.statements
        if not stmts:
            self.errors.error(Span(self.doc.source.name, 1, 1, 2), "empty file: there is no member to check",
                              "a member needs `member`, `span`, `material`, `section`, `support` and `case` lines")
            return None
        single = self._singletons(stmts)
        member_span = single["member"].span if "member" in single else stmts[0][1].span
        materials = [st for _, st in stmts if isinstance(st, s.Material)]
        sections = [st for _, st in stmts if isinstance(st, s.Section)]
        for key, found in (("member", "member" in single), ("span", "span" in single), ("material", materials),
                           ("section", sections)):
            if not found:
                self.errors.error(member_span, f"this member has no `{key}` line", _EXAMPLES[key])
        if "span" in single:
            self.length = self.positive(single["span"].length, "length", "the span")
            if self.length is not None and self.length < MIN_SPAN:
                self.errors.error(single["span"].length.span, "a span under 1 mm is surely a typo",
                                  "write the span with its unit, e.g. `span 5.4 m`")
                self.length = None
        stretches = self._stretches(materials, sections)
        supports = self._supports([st for _, st in stmts if isinstance(st, s.Support)], member_span)
        self.support_positions = {sp.x for sp in supports}
        hinges = self._hinges([st for _, st in stmts if isinstance(st, s.Hinge)], supports)
        self._stable_with_hinges(supports, hinges)
        cases = self._cases(stmts, stretches, member_span)
        self._no_couple_at_hinges(cases, hinges)
        self.moving_cases = {c.name for c in cases if any(isinstance(ld, m.MovingLoad) for ld in c.loads)}
        names = self._names(cases)
        combine = [st for _, st in stmts if isinstance(st, s.Combine)]
        combos = self._combinations(combine, names)
        targets = names | {st.name.text for st in combine}  # one with an error is still known: no cascade
        limits = self._limits([st for _, st in stmts if isinstance(st, s.Limit)], targets)
        slopes = self._slope_limits([st for _, st in stmts if isinstance(st, s.SlopeLimit)], targets, supports)
        checks = self._stress_checks([st for _, st in stmts if isinstance(st, s.StressCheck)], targets, stretches)
        reports = self._report_points([st for _, st in stmts if isinstance(st, s.Report)])
        if self.errors.items or not stretches or self.length is None:
            return None
        member = single["member"]
        fields = tuple((f, st.text) for f in FIELD_ORDER for _, st in stmts if isinstance(st, s.Field) and st.name == f)
        units = single["units"].system.text if "units" in single else (
            "us" if is_us(single["span"].length.unit) else "si")
        return m.Member(member.mark.text, member.title, fields, units, self.length, stretches,
                        supports, hinges, cases, combos, limits, slopes, checks, reports,
                        tuple(st.text for _, st in stmts if isinstance(st, s.Note)), self.doc, member.span)

    def _singletons(self, stmts) -> dict[str, s.Statement]:
        seen: dict[str, s.Statement] = {}
        for line, st in stmts:
            key = SINGLE.get(type(st)) or (st.name if isinstance(st, s.Field) else None)
            self._check_block(line, st)
            if key is None:
                continue
            if key in seen:
                self.errors.error(st.span, f"a second `{key}` line; a member has only one",
                                  f"the first is on line {seen[key].span.line}")
            else:
                seen[key] = st
        return seen

    def _check_block(self, line: s.Line, st: s.Statement) -> None:
        is_load = isinstance(st, s.LOADS)
        if is_load and not line.indented:
            self.errors.error(st.span, "a load must be indented under a `case` line",
                              "write the case first, e.g. `case dead`, then each load on its own indented line")
        elif line.indented and not is_load:
            self.errors.error(st.span, "only loads are indented; this statement starts at the left margin")

    # -- material and section --------------------------------------------------------------
    def _stretches(self, materials: list[s.Material], sections: list[s.Section]) -> tuple[m.Stretch, ...]:
        """Materials and sections, each for the whole member or per stretch, merged into stretches
        of one material and one section."""
        mats = self._cover(materials, "material", self._material)
        secs = self._cover(sections, "section", self._section)
        if not mats or not secs or self.errors.items:
            return ()
        bounds = sorted({x for x1, x2, _ in mats + secs for x in (x1, x2)})
        out = []
        for a, b in zip(bounds, bounds[1:]):
            mid = (a + b) / 2
            mat = next(v for x1, x2, v in mats if x1 <= mid <= x2)
            sec = next(v for x1, x2, v in secs if x1 <= mid <= x2)
            out.append(m.Stretch(a, b, mat, sec))
        return tuple(out)

    def _cover(self, stmts, key: str, convert) -> list[tuple[Fraction, Fraction, object]]:
        """[(x1, x2, value)] covering the member once; a gap, an overlap or a mix is an error."""
        if not stmts:
            return []
        if self.length is None:  # no usable span (reported already): check the lines' own values only
            for st in stmts:
                convert(st)
            return []
        if len(stmts) > 1 and any(st.stretch is None for st in stmts):
            first, second = sorted(stmts, key=lambda st: st.span.line)[:2]
            self.errors.error(second.span, f"a second `{key}` line; a member has only one unless each says "
                              "where it applies", f"the first is on line {first.span.line}; give each {key} "
                              "its stretch, e.g. `... from 0 m to 1.2 m`")
            return []
        placed, ok = [], True
        for st in stmts:  # every statement is converted, so that all their problems are reported together
            value = convert(st)
            if st.stretch is None:
                x1, x2 = Fraction(0), self.length
            else:
                x1 = self.position(st.stretch.start, f"start of the {key}")
                x2 = self.position(st.stretch.end, f"end of the {key}")
                if x1 is not None and x2 is not None and x1 >= x2:
                    self.errors.error(st.stretch.span, f"the {key} must end to the right of where it starts",
                                      "write `from` the left position `to` the right one")
                    x1 = None
            if value is None or x1 is None or x2 is None:
                ok = False
                continue
            placed.append((x1, x2, value, st))
        if not ok:
            return []
        placed.sort(key=lambda p: p[0])
        at = Fraction(0)
        for x1, x2, _, st in placed:
            if x1 > at:
                self.errors.error(st.stretch.span, f"no {key} covers {plain(at)} m to {plain(x1)} m",
                                  f"every part of the member needs a {key}: the stretches must meet end to end")
            elif x1 < at:
                self.errors.error(st.stretch.span, f"this {key} overlaps another from {plain(x1)} m to "
                                  f"{plain(min(at, x2))} m", "the stretches must meet end to end, without overlap")
            at = max(at, x2)
        if at < self.length:
            last = placed[-1][3]
            self.errors.error(last.stretch.span if last.stretch else last.span,
                              f"no {key} covers {plain(at)} m to {plain(self.length)} m (the end of the member)",
                              f"every part of the member needs a {key}: the last stretch must end at the span")
        return [(x1, x2, v) for x1, x2, v, _ in placed]

    def _material(self, st: s.Material) -> m.Material | None:
        values = self._properties(st.properties, MATERIAL_PROPERTIES, "material property", "material properties")
        if "E" not in values and not any(p.name.text == "E" for p in st.properties):
            self.errors.error(st.span, "the material has no elastic modulus E", "for example `E 200 GPa`")
        if any(v is None for v in values.values()) or "E" not in values:
            return None
        return m.Material(st.name.text if st.name else None, values["E"], values.get("yield"),
                          values.get("density"), st.span, values.get("shear"))

    def _properties(self, props, kinds: dict[str, str], one: str, many: str) -> dict[str, Fraction | None]:
        values: dict[str, Fraction | None] = {}
        for p in props:
            name = p.name.text
            if name not in kinds:
                self.errors.error(p.name.span, f"unknown {one} '{name}'", self.suggest(name, kinds, many))
                continue
            if name in values:
                self.errors.error(p.name.span, f"'{name}' is given twice")
                continue
            if p.second is not None and name != "flange":
                self.errors.error(p.second.span, f"'{name}' takes one value", "only `flange` is written as width x thickness")
            values[name] = self.positive(p.value, kinds[name], _DESCRIBE.get(name, f"the {name}"))
        return values

    def _section(self, st: s.Section) -> m.SectionProperties | None:
        shape = st.shape.text
        required, optional = SHAPE_DIMENSIONS[shape]
        kinds = {n: DIMENSION_KIND.get(n, "length") for n in required + optional}
        values = self._properties(st.properties, kinds, f"{shape} dimension", f"{shape} dimensions")
        missing = [n for n in required if n not in values]
        if missing and all(p.name.text in kinds for p in st.properties):
            self.errors.error(st.span, f"a {shape} section needs {', '.join(missing)}", _SECTION_EXAMPLES[shape])
        if missing:
            return None
        flange_t = None
        if shape == "I-shape":
            flange = next(p for p in st.properties if p.name.text == "flange")
            if flange.second is None:
                self.errors.error(flange.span, "the flange is written as width x thickness",
                                  "for example `flange 150 mm x 12 mm`")
                return None
            flange_t = self.positive(flange.second, "length", "the flange thickness")
        if any(v is None for v in values.values()) or (shape == "I-shape" and flange_t is None):
            return None
        try:
            props = properties(shape, values, flange_t)
        except ShapeProblem as exc:
            where = next(p.span for p in st.properties if p.name.text == exc.name)
            self.errors.error(where, exc.message, exc.hint)
            return None
        dims = tuple((n, values[n]) for n in required + optional if n in values)
        if flange_t is not None:
            dims += (("flange thickness", flange_t),)
        return m.SectionProperties(shape, dims, props["I"], props["A"], props["c"], props["S"],
                                   props["Q"], props["t"], st.span, st.designation)

    # -- supports ------------------------------------------------------------------------------
    def _supports(self, stmts: list[s.Support], member_span: Span) -> tuple[m.Support, ...]:
        out: list[m.Support] = []
        for st in stmts:
            kind = st.kind.text
            k = None
            if kind == "spring" and st.stiffness is None:
                self.errors.error(st.kind.span, "a spring support needs its stiffness",
                                  "for example `support spring 5 kN/mm at 3 m`")
            elif kind == "spring":
                k = self.si(st.stiffness, "force per length", "a spring stiffness")
            elif st.stiffness is not None:
                self.errors.error(st.stiffness.span, f"a {kind} support takes no stiffness",
                                  "only `spring` supports have one")
            x = self.position(st.at, "support position")
            if x is None or (kind == "spring" and k is None):
                continue
            twin = next((o for o in out if o.x == x), None)
            if twin is not None:
                self.errors.error(st.at.span, "two supports at one point",
                                  f"the other is on line {twin.span.line}; merge them into one support")
                continue
            out.append(m.Support(kind, x, k, st.span))
        if not stmts:
            self.errors.error(member_span, "this member has no supports, so it cannot carry load",
                              "add supports, e.g. `support pin at 0 m` and `support roller at span`")
        elif out and len(out) == len(stmts) and not _stable(out):
            self.errors.error(out[0].span, "these supports cannot carry load: the beam is a mechanism",
                              _why_unstable(out))
        return tuple(sorted(out, key=lambda sp: sp.x))

    # -- cases and loads -------------------------------------------------------------------
    def _cases(self, stmts, stretches, member_span: Span) -> tuple[m.Case, ...]:
        cases: list[m.Case] = []
        current: tuple[s.Case, list[m.Load]] | None = None
        for line, st in stmts:
            if isinstance(st, s.Case):
                if current:
                    cases.append(self._close_case(*current))
                current = (st, [])
            elif isinstance(st, s.LOADS) and line.indented:
                if current is None:
                    self.errors.error(st.span, "this load belongs to no case", "put a `case` line above it")
                    continue
                loads = self._self_weight(st, stretches) if isinstance(st, s.SelfWeight) else [self._load(st)]
                current[1].extend(ld for ld in loads if ld is not None)
            elif current and not line.indented:
                cases.append(self._close_case(*current))
                current = None
        if current:
            cases.append(self._close_case(*current))
        if not cases and not any(isinstance(st, s.Case) for _, st in stmts):
            self.errors.error(member_span, "this member has no load cases",
                              "add e.g. `case dead` with its loads indented below it")
        return tuple(cases)

    def _close_case(self, st: s.Case, loads: list[m.Load]) -> m.Case:
        moving = [ld for ld in loads if isinstance(ld, m.MovingLoad)]
        for extra in moving[1:]:
            self.errors.error(extra.span, "a case holds at most one moving load",
                              "put the forces that travel together in one `moving` line, or the second "
                              "group in a case of its own")
        return m.Case(st.name.text, st.title, tuple(loads), st.span)

    def _load(self, st) -> m.Load | None:
        if isinstance(st, s.Point):
            P = self.si(st.force, "force", "a point load", _hint_for(st.force, "force per length",
                        "for a load per length, did you mean `uniform`?"))
            x = self.position(st.at, "load position")
            return None if P is None or x is None else m.PointLoad(x, _sign(st.direction.text) * P, st.span)
        if isinstance(st, s.Moment):
            M = self.si(st.moment, "moment", "a concentrated moment", _hint_for(st.moment, "force",
                        "for a single force, did you mean `point`?"))
            x = self.position(st.at, "moment position")
            sign = 1 if st.direction.text == "counterclockwise" else -1
            return None if M is None or x is None else m.MomentLoad(x, sign * M, st.span)
        if isinstance(st, s.Uniform):
            w = self.si(st.intensity, "force per length", "a uniform load",
                        _hint_for(st.intensity, "force", "for a single force, did you mean `point`?"))
            x1 = Fraction(0) if st.start is None else self.position(st.start, "load start")
            x2 = self.length if st.end is None else self.position(st.end, "load end")
            return self._line_load(st, x1, x2, w, w, "uniform")
        if isinstance(st, s.Settlement):
            return self._settlement(st)
        if isinstance(st, s.Moving):
            return self._moving(st)
        if isinstance(st, s.Linear):
            w1 = self.si(st.start_intensity, "force per length", "a linear load")
            w2 = self.si(st.end_intensity, "force per length", "a linear load")
            x1, x2 = self.position(st.start, "load start"), self.position(st.end, "load end")
            return self._line_load(st, x1, x2, w1, w2, "linear")
        raise AssertionError(f"unknown load statement {type(st).__name__}")

    def _moving(self, st: s.Moving) -> m.MovingLoad | None:
        forces = [self.positive(q, "force", "a moving force") for q in st.forces]
        gaps = [self.positive(q, "length", "a spacing") for q in st.spacings]
        if len(gaps) != len(forces) - 1:
            where = st.spacings[-1].span if st.spacings else st.direction.span
            if len(forces) == 1:
                message = "a single moving force takes no spacing"
            else:
                message = (f"{len(forces)} moving forces need {_count(len(forces) - 1, 'spacing')}, "
                           f"found {len(gaps)}")
            self.errors.error(where, message, "write e.g. `moving 12 kN and 12 kN down spaced 1.5 m`")
            return None
        lo = Fraction(0) if st.start is None else self.position(st.start, "start of travel")
        hi = self.length if st.end is None else self.position(st.end, "end of travel")
        if None in forces or None in gaps or lo is None or hi is None:
            return None
        if lo >= hi:
            self.errors.error(st.end.span, "the travel must end to the right of where it starts",
                              "write `from` the left position `to` the right one")
            return None
        offsets = [Fraction(0)]
        for gap in gaps:
            offsets.append(offsets[-1] + gap)
        sign = _sign(st.direction.text)
        return m.MovingLoad(tuple(sign * f for f in forces), tuple(offsets), lo, hi, st.span)

    def _settlement(self, st: s.Settlement) -> m.Settlement | None:
        d = self.si(st.movement, "length", "a settlement")
        x = self.position(st.at, "settlement position")
        if d is None or x is None:
            return None
        if x not in self.support_positions:
            self.errors.error(st.at.span, "a settlement must be at a support",
                              "write the position of the support that moves, e.g. `settlement 5 mm down at 4.5 m`")
            return None
        return m.Settlement(x, _sign(st.direction.text) * d, st.span)

    def _line_load(self, st, x1, x2, w1, w2, origin: str) -> m.LineLoad | None:
        if None in (x1, x2, w1, w2):
            return None
        if x1 >= x2:
            where = st.end.span if getattr(st, "end", None) is not None else st.span
            self.errors.error(where, "a distributed load must end to the right of where it starts",
                              "write `from` the left position `to` the right one")
            return None
        sign = _sign(st.direction.text)
        return m.LineLoad(x1, x2, sign * w1, sign * w2, origin, st.span)

    def _self_weight(self, st: s.SelfWeight, stretches) -> list[m.LineLoad]:
        """The weight of every stretch (one load where the weight per length does not change)."""
        if not stretches or self.length is None:
            return []
        if any(sp.material.density is None for sp in stretches):
            line = next(sp.material.span.line for sp in stretches if sp.material.density is None)
            self.errors.error(st.span, "self-weight needs the material's density",
                              f"add e.g. `density 7850 kg/m^3` to the material line (line {line})")
            return []
        if any(sp.section.A is None for sp in stretches):
            line = next(sp.section.span.line for sp in stretches if sp.section.A is None)
            self.errors.error(st.span, "self-weight needs the section area",
                              f"give the area, e.g. `A 5400 mm^2`, or describe the section by its shape (line {line})")
            return []
        out: list[m.LineLoad] = []
        for sp in stretches:
            w = sp.material.density * STANDARD_GRAVITY * sp.section.A
            if out and out[-1].w1 == -w:
                out[-1] = m.LineLoad(out[-1].x1, sp.x2, -w, -w, "self-weight", st.span)
            else:
                out.append(m.LineLoad(sp.x1, sp.x2, -w, -w, "self-weight", st.span))
        return out

    def _names(self, cases: tuple[m.Case, ...]) -> set[str]:
        seen: dict[str, m.Case] = {}
        for c in cases:
            if c.name in seen:
                self.errors.error(c.span, f"a second case named '{c.name}'",
                                  f"the first is on line {seen[c.name].span.line}; case names must differ")
            elif not c.loads and not self._has_load_lines(c):
                self.errors.error(c.span, f"case '{c.name}' has no loads", "indent its loads under it, or remove it")
            seen.setdefault(c.name, c)
        return set(seen)

    def _has_load_lines(self, case: m.Case) -> bool:
        """True when load lines follow the case line (their own errors are reported instead)."""
        lines = [ln for ln in self.doc.lines if ln.number > case.span.line and ln.statement is not None]
        return bool(lines) and isinstance(lines[0].statement, s.LOADS)

    # -- combinations, limits, checks ------------------------------------------------------
    def _combinations(self, stmts: list[s.Combine], cases: set[str]) -> tuple[m.Combination, ...]:
        out: list[m.Combination] = []
        for st in stmts:
            name = st.name.text
            if name in cases or any(c.name == name for c in out):
                self.errors.error(st.name.span, f"the name '{name}' is already used",
                                  "cases and combinations need names of their own")
                continue
            terms, ok = [], True
            for term in st.terms:
                factor = self.number(term.factor, term.factor_span) if term.factor is not None else Fraction(1)
                if factor is None:
                    ok = False
                    continue
                if term.case.text not in cases:
                    self.errors.error(term.case.span, f"unknown case '{term.case.text}'",
                                      self.suggest(term.case.text, sorted(cases), "cases"))
                    ok = False
                elif any(t[1] == term.case.text for t in terms):
                    self.errors.error(term.case.span, f"case '{term.case.text}' appears twice in this combination")
                    ok = False
                elif factor == 0:
                    self.errors.error(term.case.span, "a factor of zero; leave the case out instead")
                    ok = False
                terms.append((factor, term.case.text))
            with_moving = [t for t in st.terms if t.case.text in self.moving_cases]
            if len(with_moving) > 1:
                self.errors.error(with_moving[1].case.span, "a combination may hold only one case with a moving load",
                                  "two groups moving independently are not supported; combine each with the "
                                  "other cases separately")
                ok = False
            if ok:
                out.append(m.Combination(name, tuple(terms), st.span))
        return tuple(out)

    def _target(self, name: s.Name, targets: set[str]) -> bool:
        if name.text in targets:
            return True
        self.errors.error(name.span, f"unknown case or combination '{name.text}'",
                          self.suggest(name.text, sorted(targets), "cases and combinations"))
        return False

    def _limits(self, stmts: list[s.Limit], targets: set[str]) -> tuple[m.DeflectionLimit, ...]:
        out = []
        for st in stmts:
            ok = self._target(st.target, targets)
            divisor = value = None
            if st.divisor is not None:
                divisor = self.number(st.divisor, st.span)
                if divisor is None:
                    ok = False
                elif divisor == 0:
                    self.errors.error(st.span, "a limit of span/0 allows no deflection at all", "write e.g. span/360")
                    ok = False
            else:
                value = self.positive(st.value, "length", "a deflection limit")
                ok = ok and value is not None
            if ok:
                out.append(m.DeflectionLimit(st.target.text, divisor, value, st.span))
        return tuple(out)

    def _stress_checks(self, stmts, targets, stretches) -> tuple[m.StressCheck, ...]:
        out = []
        no_yield = next((sp.material for sp in stretches if sp.material.yield_strength is None), None)
        no_depth = next((sp.section for sp in stretches if sp.section.c is None and sp.section.S is None), None)
        for st in stmts:
            ok = self._target(st.target, targets)
            if no_yield is not None:
                self.errors.error(st.span, "a stress check needs the material's yield strength",
                                  f"add e.g. `yield 350 MPa` to the material line (line {no_yield.span.line})")
                ok = False
            if no_depth is not None:
                self.errors.error(st.span, "a stress check needs the section depth, c or S",
                                  f"add e.g. `depth 250 mm` to the section line (line {no_depth.span.line})")
                ok = False
            if ok:
                out.append(m.StressCheck(st.target.text, st.span))
        return tuple(out)

    def _slope_limits(self, stmts: list[s.SlopeLimit], targets: set[str],
                      supports: tuple[m.Support, ...]) -> tuple[m.SlopeLimit, ...]:
        out = []
        for st in stmts:
            ok = st.target is None or self._target(st.target, targets)
            value = self.positive(st.value, "angle", "a slope limit", "write the slope in rad, e.g. `0.001 rad`")
            if ok and value is not None:
                out.append(m.SlopeLimit(st.target.text if st.target else None, value, st.span))
        if out and supports and all(sp.kind == "fixed" for sp in supports):
            self.errors.error(out[0].span, "a slope limit at supports needs a pin, roller or spring support",
                              "a fixed support holds the slope at zero; the limit is for bearings")
        return tuple(out)

    # -- hinges ----------------------------------------------------------------------------
    def _hinges(self, stmts: list[s.Hinge], supports: tuple[m.Support, ...]) -> tuple[m.Hinge, ...]:
        out: list[m.Hinge] = []
        for st in stmts:
            x = self.position(st.at, "hinge position")
            if x is None:
                continue
            if x == 0 or x == self.length:
                self.errors.error(st.at.span, "a hinge at an end of the member releases nothing",
                                  "an end already carries no moment unless it is fixed; for a pinned end write "
                                  "`support pin at ...`")
            elif any(sp.x == x and sp.kind == "fixed" for sp in supports):
                self.errors.error(st.at.span, "a hinge at a fixed support",
                                  "a fixed support holds the slope: use a pin there, or move the hinge off it")
            elif (twin := next((h for h in out if h.x == x), None)) is not None:
                self.errors.error(st.at.span, "two hinges at one point", f"the other is on line {twin.span.line}")
            else:
                out.append(m.Hinge(x, st.span))
        return tuple(sorted(out, key=lambda h: h.x))

    def _stable_with_hinges(self, supports: tuple[m.Support, ...], hinges: tuple[m.Hinge, ...]) -> None:
        """Supports and hinges together: a hinge can turn a stable layout into a mechanism."""
        if not hinges or not supports or not _stable(list(supports)):
            return  # without hinges the supports were checked already
        try:
            keep(supports, [h.x for h in hinges], components(supports))
        except Mechanism as exc:
            h = hinges[exc.hinges[0]] if exc.hinges else hinges[0]
            others = ", ".join(f"line {hinges[j].span.line}" for j in exc.hinges[1:])
            self.errors.error(h.span, "this hinge makes the member a mechanism: the parts either side of it can turn",
                              "each part between hinges needs enough supports to stand on its own, or to hang "
                              "from a part that does: add a support or remove the hinge"
                              + (f" (the hinges on {others} take part too)" if others else ""))

    def _no_couple_at_hinges(self, cases, hinges) -> None:
        at = {h.x: h for h in hinges}
        for case in cases:
            for ld in case.loads:
                if isinstance(ld, m.MomentLoad) and ld.x in at:
                    self.errors.error(ld.span, "a concentrated moment at a hinge: the hinge cannot pass it on",
                                      f"put it on the side of the hinge (line {at[ld.x].span.line}) it acts on, "
                                      "e.g. a millimetre away")

    def _report_points(self, stmts: list[s.Report]) -> tuple[m.ReportPoint, ...]:
        points = ((self.position(st.at, "report point"), st) for st in stmts)
        return tuple(m.ReportPoint(x, st.span) for x, st in points if x is not None)


def _stable(supports: list[m.Support]) -> bool:
    """A straight beam under transverse load is stable with one fixed end or two point restraints."""
    restraints = components(supports)  # a spring of zero stiffness restrains nothing
    return any(r.kind == "moment" for r in restraints) or len({r.support for r in restraints}) >= 2


def _why_unstable(supports: list[m.Support]) -> str:
    if all(sp.kind == "spring" and not sp.stiffness for sp in supports):
        return "springs of zero stiffness restrain nothing; give them a stiffness or add a support"
    return "one pin, roller or spring lets the beam turn about it; add a second support or make one fixed"



def _count(n: int, word: str) -> str:
    return f"{n} {word}" if n == 1 else f"{n} {word}s"


def _sign(direction: str) -> int:
    return 1 if direction in ("up", "counterclockwise") else -1


def _hint_for(q: s.Quantity, kind: str, hint: str) -> str | None:
    from beamlang.language.units import factor_of
    f = factor_of(q.unit)
    return hint if f is not None and f.kind == kind else None


def _show_span(doc: s.Document) -> str:
    for _, st in doc.statements:
        if isinstance(st, s.SpanLength):
            return str(st.length)
    return "?"


_DESCRIBE = {"E": "the elastic modulus E", "yield": "the yield strength", "shear": "the shear strength",
             "density": "the density",
             "I": "the second moment of area I", "A": "the area A", "S": "the section modulus S",
             "Q": "the first moment of area Q", "t": "the shear width t"}
_EXAMPLES = {"member": 'start the file with e.g. `member B-1 "Floor beam"`', "span": "for example `span 5.4 m`",
             "material": "for example `material steel E 200 GPa yield 350 MPa`",
             "section": "for example `section rectangle width 89 mm depth 235 mm`"}
_SECTION_EXAMPLES = {
    "properties": "for example `section properties I 8.5e7 mm^4 depth 250 mm`",
    "rectangle": "for example `section rectangle width 89 mm depth 235 mm`",
    "round": "for example `section round diameter 60 mm`",
    "tube": "for example `section tube diameter 60 mm wall 4 mm`",
    "box": "for example `section box width 100 mm depth 200 mm wall 6 mm`",
    "I-shape": "for example `section I-shape depth 250 mm flange 150 mm x 12 mm web 8 mm`",
}

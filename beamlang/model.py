"""The member model: frozen, validated, exact SI values (Fractions), each with its source span."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction
from typing import TYPE_CHECKING

from beamlang.source import Span

if TYPE_CHECKING:  # the model keeps the syntax it was built from; it never runs language code
    from beamlang.language import syntax as s


@dataclass(frozen=True, slots=True)
class Material:
    name: str | None
    E: Fraction  # Pa
    yield_strength: Fraction | None  # Pa
    density: Fraction | None  # kg/m^3
    span: Span
    shear_strength: Fraction | None = None  # Pa; given: the shear check uses it instead of yield/sqrt(3)
    allowable_bending: Fraction | None = None  # Pa; given (timber, aluminium): the bending check's limit, no yield
    G: Fraction | None = None  # Pa, the shear modulus (for shear deformation)

    @property
    def bending_strength(self) -> Fraction | None:
        """What bending stress is checked against: the allowable bending stress where given, else the yield."""
        return self.allowable_bending if self.allowable_bending is not None else self.yield_strength


@dataclass(frozen=True, slots=True)
class SectionProperties:
    """Section properties in SI; `formulas` names how each was found, for the calc package."""

    shape: str
    dimensions: tuple[tuple[str, Fraction], ...]  # (name, metres), canonical order
    I: Fraction  # m^4
    A: Fraction | None  # m^2
    c: Fraction | None  # m, neutral axis to extreme fibre
    S: Fraction | None  # m^3, I/c or given
    Q: Fraction | None  # m^3, first moment of area above the neutral axis
    t: Fraction | None  # m, width at the neutral axis (for V*Q/(I*t))
    span: Span
    designation: str | None = None  # the name written on the section line (a catalogue's), not a design value
    shear_area: Fraction | None = None  # m^2, kappa A (the area that carries shear in V / (kappa G A))
    shear_rule: str = ""  # how kappa A was found, with its source


@dataclass(frozen=True, slots=True)
class Stretch:
    """A part of the member, x1 <= x <= x2, with one material and one section (a prismatic member
    is one stretch; a stepped one has a stretch wherever its material or section changes)."""

    x1: Fraction
    x2: Fraction
    material: Material
    section: SectionProperties

    @property
    def EI(self) -> Fraction:
        return self.material.E * self.section.I

    @property
    def GA(self) -> Fraction:
        """The shear stiffness kappa G A (needs G and the section's shear area)."""
        return self.material.G * self.section.shear_area


@dataclass(frozen=True, slots=True)
class Hinge:
    """An internal moment release at x: the moment is zero there, the slope may jump."""

    x: Fraction
    span: Span


@dataclass(frozen=True, slots=True)
class Support:
    kind: str  # fixed | pin | roller | spring
    x: Fraction  # m
    stiffness: Fraction | None  # N/m, springs only
    span: Span

    @property
    def restrains_rotation(self) -> bool:
        return self.kind == "fixed"


@dataclass(frozen=True, slots=True)
class PointLoad:
    x: Fraction
    force: Fraction  # N, positive up
    span: Span


@dataclass(frozen=True, slots=True)
class LineLoad:
    """Load per length varying linearly from w1 at x1 to w2 at x2 (N/m, positive up)."""

    x1: Fraction
    x2: Fraction
    w1: Fraction
    w2: Fraction
    origin: str  # uniform | linear | self-weight
    span: Span
    width: Fraction | None = None  # m: written as a pressure gathered from this tributary width (`over`)


@dataclass(frozen=True, slots=True)
class MomentLoad:
    x: Fraction
    moment: Fraction  # N*m, positive counterclockwise
    span: Span


@dataclass(frozen=True, slots=True)
class Settlement:
    """A support at x moved by `movement` (m, positive up) in this case; it carries no force itself."""

    x: Fraction
    movement: Fraction
    span: Span


@dataclass(frozen=True, slots=True)
class MovingLoad:
    """Forces (N, positive up) at offsets from the first one (m, first 0, increasing) that travel along
    the member, in either direction; each force acts while it lies within [lo, hi]."""

    forces: tuple[Fraction, ...]
    offsets: tuple[Fraction, ...]
    lo: Fraction
    hi: Fraction
    span: Span

    @property
    def length(self) -> Fraction:
        return self.offsets[-1]


Load = PointLoad | LineLoad | MomentLoad | Settlement | MovingLoad


@dataclass(frozen=True, slots=True)
class Case:
    name: str
    title: str | None
    loads: tuple[Load, ...]
    span: Span
    patterned: bool = False  # `pattern NAME`: applied span by span, the worst arrangement for each effect


@dataclass(frozen=True, slots=True)
class Combination:
    name: str
    terms: tuple[tuple[Fraction, str], ...]  # (factor, case name)
    span: Span


@dataclass(frozen=True, slots=True)
class DeflectionLimit:
    target: str
    divisor: Fraction | None  # span/N
    value: Fraction | None  # m, absolute
    span: Span


@dataclass(frozen=True, slots=True)
class SlopeLimit:
    """The largest slope allowed at every support (bearing), rad; target None: every case and combination."""

    target: str | None
    value: Fraction
    span: Span


@dataclass(frozen=True, slots=True)
class FrequencyLimit:
    """The least fundamental frequency (Hz); the mass is the loads of the cases, factored, divided by g."""

    value: Fraction  # Hz
    terms: tuple[tuple[Fraction, str], ...]  # (factor, case name)
    text: str  # the mass as written: "dead + 0.3 live"
    span: Span


@dataclass(frozen=True, slots=True)
class StressCheck:
    target: str
    span: Span


@dataclass(frozen=True, slots=True)
class ReportPoint:
    x: Fraction
    span: Span


@dataclass(frozen=True, slots=True)
class Member:
    mark: str
    title: str
    fields: tuple[tuple[str, str], ...]  # title block, canonical order
    units: str  # si | us
    length: Fraction  # m
    stretches: tuple[Stretch, ...]  # cover 0..length in order, no gap or overlap
    supports: tuple[Support, ...]  # sorted by x
    hinges: tuple[Hinge, ...]  # sorted by x
    cases: tuple[Case, ...]
    combinations: tuple[Combination, ...]
    limits: tuple[DeflectionLimit, ...]
    slope_limits: tuple[SlopeLimit, ...]
    stress_checks: tuple[StressCheck, ...]
    report_points: tuple[ReportPoint, ...]
    notes: tuple[str, ...]
    document: s.Document  # the syntax it was built from: author's units, comments, spans
    span: Span
    shear_deformation: bool = False  # `include shear deformation`: deflections add V / (kappa G A)
    frequency_limits: tuple[FrequencyLimit, ...] = ()

    @property
    def stepped(self) -> bool:
        return len(self.stretches) > 1

    @property
    def material(self) -> Material:
        """The member's material, when one material runs its whole length."""
        return self._only("material")

    @property
    def section(self) -> SectionProperties:
        """The member's section, when it is prismatic."""
        return self._only("section")

    @property
    def designations(self) -> str | None:
        """The names written on the section lines (`section "2x10" ...`), with their lines: `2x10 (line 13)`."""
        named = {st.section.span.line: st.section.designation for st in self.stretches if st.section.designation}
        return ", ".join(f"{name} (line {line})" for line, name in sorted(named.items())) or None

    def _only(self, attr: str):
        found = {id(getattr(st, attr)): getattr(st, attr) for st in self.stretches}
        if len(found) > 1:
            raise ValueError(f"this member has a {attr} per stretch: use `stretches`")
        return getattr(self.stretches[0], attr)

    def stretch_at(self, x: Fraction, side: str = "right") -> Stretch:
        """The stretch holding x; at a change of section, the one to its `side`."""
        for st in self.stretches:
            if (st.x1 <= x < st.x2) if side == "right" else (st.x1 < x <= st.x2):
                return st
        return self.stretches[-1] if x >= self.length else self.stretches[0]

    def moving(self, target: str) -> tuple[Fraction, MovingLoad] | None:
        """The moving load in a case or combination, with its factor (at most one: the builder checks)."""
        for case in self.cases:
            if case.name == target:
                return next(((Fraction(1), ld) for ld in case.loads if isinstance(ld, MovingLoad)), None)
        for combo in self.combinations:
            if combo.name == target:
                for factor, name in combo.terms:
                    found = self.moving(name)
                    if found:
                        return factor * found[0], found[1]
        return None

    def case(self, name: str) -> Case:
        for case in self.cases:
            if case.name == name:
                return case
        raise KeyError(name)

    def patterned(self, target: str) -> tuple[str, ...]:
        """The patterned cases a case or combination holds (none: it is solved as written)."""
        for case in self.cases:
            if case.name == target:
                return (case.name,) if case.patterned else ()
        combo = next((c for c in self.combinations if c.name == target), None)
        return tuple(name for _, name in combo.terms if self.case(name).patterned) if combo else ()

    @property
    def targets(self) -> tuple[str, ...]:
        """Names that limits and checks may refer to: every case, then every combination."""
        return tuple(c.name for c in self.cases) + tuple(c.name for c in self.combinations)


def essence(obj: object) -> object:
    """The design content of a model object: nested tuples without spans or syntax (for comparisons)."""
    if hasattr(obj, "__dataclass_fields__"):
        return (type(obj).__name__,) + tuple(
            (name, essence(getattr(obj, name))) for name in obj.__dataclass_fields__
            if name not in ("span", "document", "designation"))
    if isinstance(obj, tuple):
        return tuple(essence(item) for item in obj)
    return obj

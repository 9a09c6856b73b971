"""Syntax objects: what each line of a `.beam` file says, as written, with spans."""

from __future__ import annotations

from dataclasses import dataclass

from beamlang.source import Source, Span


@dataclass(frozen=True, slots=True)
class Name:
    text: str
    span: Span


@dataclass(frozen=True, slots=True)
class Quantity:
    """A number and its unit exactly as the author wrote them; a length may go on in parts (`22 ft 6 in`),
    each a quantity of its own in `parts`."""

    number: str
    unit: str
    span: Span
    unit_span: Span
    parts: tuple["Quantity", ...] = ()  # the further parts of a length written in parts, in order

    def __str__(self) -> str:
        return " ".join([f"{self.number} {self.unit}", *(str(p) for p in self.parts)])


@dataclass(frozen=True, slots=True)
class Position:
    """`at 2 m`, `at span`, `at span/2`, `at span - 1.2 m`."""

    form: str  # "length" | "end" | "fraction" | "from_end"
    quantity: Quantity | None
    divisor: str | None
    span: Span

    def __str__(self) -> str:
        if self.form == "length":
            return str(self.quantity)
        if self.form == "end":
            return "span"
        if self.form == "fraction":
            return f"span/{self.divisor}"
        return f"span - {self.quantity}"


@dataclass(frozen=True, slots=True)
class Property:
    """`E 200 GPa`, `depth 250 mm`, `flange 150 mm x 12 mm`."""

    name: Name
    value: Quantity
    second: Quantity | None
    span: Span


@dataclass(frozen=True, slots=True)
class Member:
    mark: Name
    title: str
    span: Span


@dataclass(frozen=True, slots=True)
class Field:
    name: str  # project | job | by | checked | date | revision
    text: str
    span: Span


@dataclass(frozen=True, slots=True)
class Units:
    system: Name  # si | us
    span: Span


@dataclass(frozen=True, slots=True)
class SpanLength:
    length: Quantity
    span: Span


@dataclass(frozen=True, slots=True)
class Stretch:
    """`from 0 m to 1.2 m` after a material or section: the part of the member it applies to."""

    start: Position
    end: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Material:
    name: Name | None
    properties: tuple[Property, ...]
    span: Span
    stretch: Stretch | None = None  # None: the whole member


@dataclass(frozen=True, slots=True)
class Section:
    shape: Name
    properties: tuple[Property, ...]
    span: Span
    stretch: Stretch | None = None  # None: the whole member
    designation: str | None = None  # `section "2x10" rectangle ...`: the name it is known by (a catalogue's)


@dataclass(frozen=True, slots=True)
class Support:
    kind: Name  # fixed | pin | roller | spring
    stiffness: Quantity | None
    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Hinge:
    """An internal moment release: the moment is zero there and the slope may jump."""

    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Case:
    name: Name
    title: str | None
    span: Span


@dataclass(frozen=True, slots=True)
class Point:
    force: Quantity
    direction: Name
    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Uniform:
    intensity: Quantity
    direction: Name
    start: Position | None
    end: Position | None
    span: Span
    width: Quantity | None = None  # `over 16 in`: the intensity is a pressure gathered from this width


@dataclass(frozen=True, slots=True)
class Linear:
    start_intensity: Quantity
    end_intensity: Quantity
    direction: Name
    start: Position
    end: Position
    span: Span
    width: Quantity | None = None  # `over 16 in`: the intensities are pressures gathered from this width


@dataclass(frozen=True, slots=True)
class Moment:
    moment: Quantity
    direction: Name
    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class SelfWeight:
    span: Span


@dataclass(frozen=True, slots=True)
class Settlement:
    """A prescribed movement of the support at `at`, as a load of its case."""

    movement: Quantity
    direction: Name
    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Moving:
    """A group of forces at fixed spacings that travels along the member (a trolley, an axle group)."""

    forces: tuple[Quantity, ...]
    direction: Name
    spacings: tuple[Quantity, ...]
    start: Position | None  # travel range, default the whole member
    end: Position | None
    span: Span


@dataclass(frozen=True, slots=True)
class Term:
    factor: str | None
    case: Name
    factor_span: Span | None = None


@dataclass(frozen=True, slots=True)
class Combine:
    name: Name
    terms: tuple[Term, ...]
    span: Span


@dataclass(frozen=True, slots=True)
class Pattern:
    """`pattern CASE`: the case's loads are applied span by span in the worst arrangement for each effect."""

    case: Name
    span: Span


@dataclass(frozen=True, slots=True)
class Limit:
    target: Name
    divisor: str | None  # span/N
    value: Quantity | None  # absolute
    span: Span


@dataclass(frozen=True, slots=True)
class SlopeLimit:
    """`limit slope [NAME] at supports 0.001 rad`: no target means every case and combination."""

    target: Name | None
    value: Quantity
    span: Span


@dataclass(frozen=True, slots=True)
class FrequencyLimit:
    """`limit frequency 5 Hz mass dead + 0.3 live`: the least fundamental frequency, with the cases whose loads
    (divided by g) are the vibrating mass."""

    value: Quantity
    terms: tuple[Term, ...]
    span: Span


@dataclass(frozen=True, slots=True)
class StressCheck:
    target: Name
    span: Span


@dataclass(frozen=True, slots=True)
class Include:
    """`include shear deformation`: deflections add the shear part V / (kappa G A)."""

    span: Span


@dataclass(frozen=True, slots=True)
class Report:
    at: Position
    span: Span


@dataclass(frozen=True, slots=True)
class Catalogue:
    """`catalogue "FILE.csv"`: the sections `beamlang size` tries for this member."""

    path: str
    span: Span


@dataclass(frozen=True, slots=True)
class Note:
    text: str
    span: Span


Statement = (
    Member | Field | Units | SpanLength | Material | Section | Support | Hinge | Case | Point | Uniform
    | Linear | Moment | SelfWeight | Settlement | Moving | Combine | Pattern | Limit | SlopeLimit | StressCheck | Report
    | Note | Catalogue | Include | FrequencyLimit
)
LOADS = (Point, Uniform, Linear, Moment, SelfWeight, Settlement, Moving)


@dataclass(frozen=True, slots=True)
class Line:
    """One physical line: its indentation, statement and trailing comment (each may be absent)."""

    number: int
    indented: bool
    statement: Statement | None
    comment: str | None


@dataclass(frozen=True, slots=True)
class Document:
    source: Source
    lines: tuple[Line, ...]

    @property
    def statements(self) -> tuple[tuple[Line, Statement], ...]:
        return tuple((ln, ln.statement) for ln in self.lines if ln.statement is not None)

"""Diff: two versions of a member -> semantic input changes, result deltas and check status changes."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.errors import BeamError
from beamlang.language import syntax as s
from beamlang.language.fmt import statement_text
from beamlang.model import essence
from beamlang.pipeline import Analysis

THRESHOLD = 0.05  # a check whose ratio moves by more than this (relative) is flagged
QUANTITY = {"m": "deflection", "N*m": "moment", "N": "force", "Pa": "stress"}  # a result's SI unit -> report quantity


@dataclass(frozen=True, slots=True)
class InputChange:
    kind: str  # "changed" | "added" | "removed"
    what: str  # e.g. "section I", "case live: load", "support"
    old: str | None
    new: str | None
    line: int | None  # line in the new file (or the old one for a removal)


@dataclass(frozen=True, slots=True)
class Delta:
    target: str
    quantity: str  # e.g. "max down deflection"
    unit: str  # SI unit
    old: Fraction | None
    new: Fraction | None
    old_x: Fraction | None
    new_x: Fraction | None

    @property
    def percent(self) -> float | None:
        """Change of the magnitude, in percent (a deflection growing downwards is an increase)."""
        if self.old is None or self.new is None or self.old == 0 or (self.old > 0) != (self.new > 0):
            return None
        return float((abs(self.new) - abs(self.old)) / abs(self.old) * 100)


@dataclass(frozen=True, slots=True)
class StatusChange:
    check: str  # "deflection live (span/360)"
    old_ratio: float | None
    new_ratio: float | None
    old_pass: bool | None
    new_pass: bool | None

    @property
    def label(self) -> str:
        if self.old_pass is None:
            return "NEW " + ("PASS" if self.new_pass else "FAIL")
        if self.new_pass is None:
            return "REMOVED"
        if self.old_pass and not self.new_pass:
            return "PASS -> FAIL"
        if not self.old_pass and self.new_pass:
            return "FAIL -> PASS"
        return "ratio up" if self.new_ratio > self.old_ratio else "ratio down"

    @property
    def worse(self) -> bool:
        """A regression: the check fails now, or its ratio grew."""
        if self.new_pass is None:
            return False
        if not self.new_pass:
            return True
        return self.old_ratio is not None and self.new_ratio > self.old_ratio * (1 + 1e-9)


@dataclass(frozen=True, slots=True)
class Invalid:
    """One side of a diff whose file has input errors: reported, and the diff goes on."""

    error: BeamError

    def messages(self) -> tuple[str, ...]:
        return tuple(f"{d.span}: {d.message}" for d in self.error.diagnostics)


@dataclass(frozen=True, slots=True)
class MemberDiff:
    name: str  # path or mark shown to the reader
    status: str  # "changed" | "unchanged" | "added" | "removed" | "invalid before" | "invalid now" | "invalid"
    units: dict  # report units of the newer version, for text output
    design_changed: bool
    inputs: tuple[InputChange, ...]
    statuses: tuple[StatusChange, ...]  # flagged ones first
    deltas: tuple[Delta, ...]
    input_errors: tuple[str, ...] = ()  # of an invalid side

    @property
    def regression(self) -> bool:
        """A check fails or got worse, or the newer version cannot be checked at all."""
        return any(c.worse for c in self.statuses) or self.status in ("invalid now", "invalid")


def diff_members(name: str, old: Analysis | Invalid | None, new: Analysis | Invalid | None,
                 threshold: float = THRESHOLD) -> MemberDiff:
    """Compare two analyses of one member (either may be missing: added or removed files; or invalid: its input
    errors are listed and the other side's checks shown as for an added or removed file)."""
    if isinstance(old, Invalid) or isinstance(new, Invalid):
        return _with_invalid(name, old, new)
    if old is not None and new is not None and old.loaded.source.text == new.loaded.source.text:
        return MemberDiff(name, "unchanged", new.units, False, (), (), ())
    if old is None or new is None:
        only = new or old
        statuses = tuple(_status(_key(c), None if new else c, c if new else None) for c in only.checks)
        return MemberDiff(name, "added" if new else "removed", only.units, True, (), statuses, ())
    inputs = tuple(input_changes(old.loaded.document, new.loaded.document))
    design = _design(old) != _design(new)
    statuses = _statuses(old, new, threshold)
    units = new.units
    deltas = tuple(d for d in _deltas(old, new, units) if _shows_a_change(d, units)) if design else ()
    return MemberDiff(name, "changed", units, design, inputs, statuses, deltas)


def _with_invalid(name: str, old, new) -> MemberDiff:
    errors = tuple(m for side in (old, new) if isinstance(side, Invalid) for m in side.messages())
    good = next((side for side in (new, old) if side is not None and not isinstance(side, Invalid)), None)
    if good is None:
        status = "invalid" if isinstance(new, Invalid) and isinstance(old, Invalid) else (
            "invalid now" if isinstance(new, Invalid) else "invalid before")
        return MemberDiff(name, status, {}, True, (), (), (), errors)
    statuses = tuple(_status(_key(c), None if good is new else c, c if good is new else None) for c in good.checks)
    return MemberDiff(name, "invalid before" if good is new else "invalid now", good.units, True, (), statuses, (),
                      errors)


def _shows_a_change(d: Delta, units: dict[str, str]) -> bool:
    """A result is listed when its change shows at the printed precision: exact dust and zero changes are not."""
    from beamlang.analysis.display import show
    return show(d.old, units, QUANTITY[d.unit]) != show(d.new, units, QUANTITY[d.unit])


def _design(a: Analysis):
    m = essence(a.loaded.member)
    return tuple(item for item in m[1:] if item[0] not in ("mark", "title", "fields", "notes", "units"))


# -- inputs, statement by statement, matched by meaning ----------------------------------------------

def input_changes(old: s.Document, new: s.Document) -> list[InputChange]:
    out: list[InputChange] = []
    o, n = _index(old), _index(new)
    for key in _ordered_keys(o, n):
        a, b = o.get(key), n.get(key)
        if a is not None and b is not None:
            out += _compare(key, a, b)
        elif b is not None:
            out.append(InputChange("added", _label(key), None, statement_text(b), b.span.line))
        else:
            out.append(InputChange("removed", _label(key), statement_text(a), None, a.span.line))
    return out


def _index(doc: s.Document) -> dict[tuple, s.Statement]:
    """Statements keyed by meaning: singletons by kind, loads by case and order of their kind, others by name."""
    index: dict[tuple, s.Statement] = {}
    case = None
    seen: dict[tuple, int] = {}
    for _, st in doc.statements:
        if isinstance(st, s.Case):
            case = st.name.text
            key = ("case", case)
        elif isinstance(st, s.LOADS):
            kind = type(st).__name__.lower()
            n = seen.get((case, kind), 0)
            seen[(case, kind)] = n + 1
            key = ("load", case, kind, n)
        elif isinstance(st, s.Field):
            key = ("field", st.name)
        elif isinstance(st, (s.Material, s.Section)) and st.stretch is not None:
            kind = type(st).__name__.lower()  # per stretch: matched by their order in the file
            n = seen.get((None, kind), 0)
            seen[(None, kind)] = n + 1
            key = (kind, n)
        elif isinstance(st, (s.Member, s.Units, s.SpanLength, s.Material, s.Section, s.Catalogue)):
            key = (type(st).__name__.lower(),)
        elif isinstance(st, s.Hinge):
            key = ("hinge", str(st.at))
        elif isinstance(st, s.SlopeLimit):
            key = ("slope limit", st.target.text if st.target else "every case")
        elif isinstance(st, s.Support):
            key = ("support", str(st.at))  # a moved support shows as removed and added
        elif isinstance(st, s.Combine):
            key = ("combine", st.name.text)
        elif isinstance(st, s.Limit):
            key = ("limit", st.target.text, "ratio" if st.divisor else "absolute")
        elif isinstance(st, s.StressCheck):
            key = ("check", st.target.text)
        elif isinstance(st, s.FrequencyLimit):
            key = ("frequency limit", " + ".join(t.case.text for t in st.terms))
        elif isinstance(st, s.Include):
            key = ("include shear deformation",)
        elif isinstance(st, s.Report):
            key = ("report", str(st.at))
        elif isinstance(st, s.Pattern):
            key = ("pattern", st.case.text)
        else:
            key = ("note", st.text)
        index[key] = st
    return index


def _ordered_keys(o: dict, n: dict) -> list[tuple]:
    keys = list(n)
    keys += [k for k in o if k not in n]
    return keys


def _label(key: tuple) -> str:
    kind = key[0]
    if kind == "load":
        return f"case {key[1]}: {key[2]} load"
    if kind in ("case", "combine", "check", "field"):
        return f"{'combination' if kind == 'combine' else 'stress check' if kind == 'check' else kind} {key[1]}"
    if kind == "limit":
        return f"limit on {key[1]}"
    if kind in ("support", "report", "hinge"):
        return f"{kind} at {key[1]}"
    if kind in ("material", "section") and len(key) > 1:
        return f"{kind}, stretch {key[1] + 1}"
    if kind == "slope limit":
        return f"slope limit on {key[1]}"
    if kind == "pattern":
        return f"pattern loading of {key[1]}"
    return kind


def _compare(key: tuple, a: s.Statement, b: s.Statement) -> list[InputChange]:
    shape = lambda st: st.shape.text if isinstance(st, s.Section) else None  # noqa: E731
    if isinstance(a, (s.Material, s.Section)) and type(a) is type(b) and shape(a) == shape(b):
        out = _properties(_label(key), a, b)
        if isinstance(a, s.Section) and a.designation != b.designation:
            change = "changed" if a.designation and b.designation else ("added" if b.designation else "removed")
            out.append(InputChange(change, f"{_label(key)} designation", a.designation, b.designation, b.span.line))
        where = lambda st: f"from {st.stretch.start} to {st.stretch.end}" if st.stretch else "whole member"  # noqa: E731
        if where(a) != where(b):
            out.append(InputChange("changed", f"{_label(key)} extent", where(a), where(b), b.span.line))
        return out
    ta, tb = statement_text(a), statement_text(b)
    if ta == tb:
        return []
    return [InputChange("changed", _label(key), ta, tb, b.span.line)]


def _properties(kind: str, a, b) -> list[InputChange]:
    pa = {p.name.text: _prop_text(p) for p in a.properties}
    pb = {p.name.text: _prop_text(p) for p in b.properties}
    out = []
    for name in list(pb) + [k for k in pa if k not in pb]:
        old, new = pa.get(name), pb.get(name)
        if old != new:
            change = "changed" if old and new else ("added" if new else "removed")
            out.append(InputChange(change, f"{kind} {name}", old, new, b.span.line))
    return out


def _prop_text(p: s.Property) -> str:
    return f"{p.value}" + (f" x {p.second}" if p.second else "")


# -- results and checks ---------------------------------------------------------------------------

def _key(c) -> str:
    if c.kind == "support slope":  # one check per support
        return f"{c.kind} {c.target} at x = {float(c.x):.6g} m"
    basis = c.basis.split(",")[0] if c.kind == "deflection" else c.kind
    place = f", {c.place}" if c.place else ""  # a span/N limit: one check per span and overhang
    return f"{c.kind} {c.target}" + (f" ({basis}{place})" if c.kind == "deflection" else "")


def _status(key: str, old, new) -> StatusChange:
    return StatusChange(key, old.ratio if old else None, new.ratio if new else None,
                        old.passed if old else None, new.passed if new else None)


def _statuses(old: Analysis, new: Analysis, threshold: float) -> tuple[StatusChange, ...]:
    o = {_key(c): c for c in old.checks}
    n = {_key(c): c for c in new.checks}
    changes = []
    for key in list(n) + [k for k in o if k not in n]:
        a, b = o.get(key), n.get(key)
        change = _status(key, a, b)
        moved = a is not None and b is not None and abs(b.ratio - a.ratio) > threshold * a.ratio
        if a is None or b is None or a.passed != b.passed or moved:
            changes.append(change)
    order = {"PASS -> FAIL": 0, "NEW FAIL": 1, "FAIL -> PASS": 2, "ratio up": 3, "NEW PASS": 4, "ratio down": 5,
             "REMOVED": 6}
    return tuple(sorted(changes, key=lambda c: order[c.label]))


def _deltas(old: Analysis, new: Analysis, units: dict[str, str]) -> list[Delta]:
    out = []
    o = {r.name: r for r in old.results}
    for r in new.results:
        p = o.get(r.name)
        if p is None:
            continue
        for label, unit, get in _QUANTITIES:
            a, b = get(p), get(r)
            if (a[0] if a else None) != (b[0] if b else None):
                out.append(Delta(r.name, label, unit, a[0] if a else None, b[0] if b else None,
                                 a[1] if a else None, b[1] if b else None))
        out += _reactions(r.name, p.reactions, r.reactions, units)
    return out


def _reactions(target: str, old: tuple, new: tuple, units: dict[str, str]) -> list[Delta]:
    """Reactions matched by the support's position and named by it as `check` names them (`reaction at 12 ft`)."""
    from beamlang.analysis.display import convert, number
    a, b = {x: (f, mo) for x, f, mo in old}, {x: (f, mo) for x, f, mo in new}
    out = []
    for x in sorted(set(a) | set(b)):
        where = f"at {number(convert(x, units['length']))} {units['length']}"
        (f1, m1), (f2, m2) = a.get(x, (None, None)), b.get(x, (None, None))
        if f1 != f2:
            out.append(Delta(target, f"reaction {where}", "N", f1, f2, x if x in a else None, x if x in b else None))
        if (m1 or None) != (m2 or None):  # a moment only where a support takes one (fixed)
            out.append(Delta(target, f"reaction moment {where}", "N*m", m1 or None, m2 or None,
                             x if x in a else None, x if x in b else None))
    return out


def _loc(located):
    return (located.value, located.x) if located else None


_QUANTITIES = (
    ("max down deflection", "m", lambda r: _loc(r.max_down)),
    ("max up deflection", "m", lambda r: _loc(r.max_up)),
    ("max sagging moment", "N*m", lambda r: _loc(r.moment_positive)),
    ("max hogging moment", "N*m", lambda r: _loc(r.moment_negative)),
    ("max shear", "N", lambda r: _loc(r.shear_max)),
    ("bending stress", "Pa", lambda r: (r.stress.bending, None) if r.stress.bending is not None else None),
    ("shear stress", "Pa", lambda r: (r.stress.shear, None) if r.stress.shear is not None else None),
)

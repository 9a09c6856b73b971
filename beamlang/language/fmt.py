"""Format: syntax Document -> canonical `.beam` text (order, spacing; numbers and units as written)."""

from __future__ import annotations

from beamlang.language import syntax as s
from beamlang.language.build import FIELD_ORDER
from beamlang.language.sections import SHAPE_DIMENSIONS

MATERIAL_ORDER = ("E", "G", "yield", "allowable bending", "shear", "density")
INDENT = "  "


def format_document(doc: s.Document) -> str:
    """Canonical text of a parsed file; a comment line travels with the statement below it."""
    header, blocks, trailing = _blocks(doc)
    chunks: list[list[str]] = [header]
    for group in _GROUP_ORDER:
        keys = _MEMBERS[group]
        mine = sorted((b for b in blocks if b[0] in keys), key=lambda b: keys.index(b[0]))
        if group == "case":
            chunks.extend(lines for _, lines in mine)
        else:
            chunks.append([text for _, lines in mine for text in lines])
    chunks.append(trailing)
    return "\n\n".join("\n".join(chunk) for chunk in chunks if chunk) + "\n"


def _blocks(doc: s.Document) -> tuple[list[str], list[tuple[str, list[str]]], list[str]]:
    """Header comments, (group key, lines) blocks in file order, comments after the last statement."""
    header: list[str] = []
    blocks: list[tuple[str, list[str]]] = []
    pending: list[str] = []
    for line in doc.lines:
        st = line.statement
        if st is None:
            if line.comment is not None:
                (pending if blocks else header).append(line.comment)
            continue
        indent = INDENT if isinstance(st, s.LOADS) else ""
        text = indent + statement_text(st) + (f"  {line.comment}" if line.comment else "")
        lines = [indent + c for c in pending] + [text]
        pending = []
        if isinstance(st, s.LOADS) and blocks and blocks[-1][0] == "case":
            blocks[-1][1].extend(lines)
        else:
            blocks.append((_group_key(st), lines))
    return header, blocks, pending


def _group_key(st: s.Statement) -> str:
    if isinstance(st, s.Field):
        return "field:" + st.name
    if isinstance(st, s.LOADS):
        return "orphan"
    return _KEY[type(st)]


_KEY = {s.Member: "member", s.Units: "units", s.SpanLength: "span", s.Material: "material",
        s.Section: "section", s.Support: "support", s.Hinge: "hinge", s.Case: "case", s.Combine: "combine",
        s.Pattern: "pattern", s.Limit: "limit", s.SlopeLimit: "slope", s.StressCheck: "check", s.Report: "report", s.Note: "note",
        s.Catalogue: "catalogue", s.Include: "include", s.FrequencyLimit: "limit"}
_GROUP_ORDER = ("title", "geometry", "support", "case", "rest", "note", "orphan")
_MEMBERS = {
    "title": ("member",) + tuple("field:" + f for f in FIELD_ORDER),
    "geometry": ("units", "span", "material", "section", "include", "catalogue"),
    "support": ("support", "hinge"), "case": ("case",), "rest": ("pattern", "combine", "limit", "slope", "check", "report"),
    "note": ("note",), "orphan": ("orphan",),
}


def statement_text(st: s.Statement) -> str:
    """One statement in canonical spelling."""
    return _TEXT[type(st)](st)


def _q(q: s.Quantity) -> str:
    return str(q)


def _quote(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def _props(props: tuple[s.Property, ...], order: tuple[str, ...]) -> str:
    rank = {name: i for i, name in enumerate(order)}
    ordered = sorted(props, key=lambda p: rank.get(p.name.text, len(rank)))
    return " ".join(p.name.text + " " + _q(p.value) + (f" x {_q(p.second)}" if p.second else "") for p in ordered)


def _support(st: s.Support) -> str:
    k = f" {_q(st.stiffness)}" if st.stiffness else ""
    return f"support {st.kind.text}{k} at {st.at}"


def _uniform(st: s.Uniform) -> str:
    where = f" from {st.start} to {st.end}" if st.start is not None else ""
    return f"uniform {_q(st.intensity)}{_over(st.width)} {st.direction.text}{where}"


def _over(width: s.Quantity | None) -> str:
    return f" over {_q(width)}" if width is not None else ""


def _limit(st: s.Limit) -> str:
    allowed = f"span/{st.divisor}" if st.divisor is not None else _q(st.value)
    return f"limit deflection {st.target.text} {allowed}"


def _stretch(st: s.Material | s.Section) -> str:
    return f" from {st.stretch.start} to {st.stretch.end}" if st.stretch is not None else ""


def _slope(st: s.SlopeLimit) -> str:
    target = f" {st.target.text}" if st.target is not None else ""
    return f"limit slope{target} at supports {_q(st.value)}"


def _combine(st: s.Combine) -> str:
    terms = " + ".join((f"{t.factor} " if t.factor is not None else "") + t.case.text for t in st.terms)
    return f"combine {st.name.text} = {terms}"


_TEXT = {
    s.Member: lambda st: f"member {st.mark.text} {_quote(st.title)}",
    s.Field: lambda st: f"{st.name} {_quote(st.text)}",
    s.Units: lambda st: f"units {st.system.text}",
    s.SpanLength: lambda st: f"span {_q(st.length)}",
    s.Material: lambda st: ("material " + (f"{st.name.text} " if st.name else "") + _props(st.properties, MATERIAL_ORDER)
                            + _stretch(st)),
    s.Section: lambda st: ("section " + (f"{_quote(st.designation)} " if st.designation is not None else "")
                           + f"{st.shape.text} " + _props(st.properties, sum(SHAPE_DIMENSIONS[st.shape.text], ()))
                           + _stretch(st)),
    s.Support: _support,
    s.Hinge: lambda st: f"hinge at {st.at}",
    s.Case: lambda st: f"case {st.name.text}" + (f" {_quote(st.title)}" if st.title is not None else ""),
    s.Point: lambda st: f"point {_q(st.force)} {st.direction.text} at {st.at}",
    s.Uniform: _uniform,
    s.Linear: lambda st: (f"linear {_q(st.start_intensity)} to {_q(st.end_intensity)}{_over(st.width)} {st.direction.text} "
                          f"from {st.start} to {st.end}"),
    s.Moment: lambda st: f"moment {_q(st.moment)} {st.direction.text} at {st.at}",
    s.SelfWeight: lambda st: "self-weight",
    s.Settlement: lambda st: f"settlement {_q(st.movement)} {st.direction.text} at {st.at}",
    s.Moving: lambda st: (f"moving {' and '.join(_q(q) for q in st.forces)} {st.direction.text}"
                          + (f" spaced {' and '.join(_q(q) for q in st.spacings)}" if st.spacings else "")
                          + (f" from {st.start} to {st.end}" if st.start is not None else "")),
    s.Combine: _combine,
    s.Pattern: lambda st: f"pattern {st.case.text}",
    s.Limit: _limit,
    s.SlopeLimit: _slope,
    s.StressCheck: lambda st: f"check stress {st.target.text}",
    s.Report: lambda st: f"report deflection at {st.at}",
    s.Note: lambda st: f"note {_quote(st.text)}",
    s.Catalogue: lambda st: f"catalogue {_quote(st.path)}",
    s.Include: lambda st: "include shear deformation",
    s.FrequencyLimit: lambda st: f"limit frequency {_q(st.value)} mass " + " + ".join(
        (f"{t.factor} " if t.factor is not None else "") + t.case.text for t in st.terms),
}

"""Sheet: title-block facts + Typst body -> PDF bytes through the `typst` package, with fonts from its wheel only.

The PDF's bytes depend on the source text, the figures and the typst wheel (named in the package's traceability):
system fonts are ignored and the document date is the member's date, never the clock."""

from __future__ import annotations

import re
from dataclasses import dataclass
from functools import lru_cache
from pathlib import Path

from beamlang.report.pdf.markup import string

TEMPLATE = Path(__file__).resolve().parent / "template.typ"
PAPERS = {"a4": (210.0, 297.0), "letter": (215.9, 279.4)}  # mm, ISO 216 and ANSI/ASME Y14.1
MARGINS = (17.0 + 17.0, 15.0 + 34.0)  # left + right, top + bottom (template.typ)
# Where things landed, for the tests (invisible): each table's first and last sheet and whether it fits a sheet,
# each shrunk display's factor, the pages of each member.
LAYOUT = """#context [#metadata((
  tables: query(<bl-table-start>).zip(query(<bl-table-end>)).map(((a, b)) =>
    (a.value, a.location().page(), b.location().page())),
  shrunk: query(<bl-shrunk>).map(it => (float(it.value), it.location().page())),
  members: query(<bl-start>).zip(query(<bl-end>)).map(((a, b)) =>
    (a.value.mark, a.location().page(), b.location().page())),
  pages: counter(page).final().first(),
)) <bl-layout>]
"""
_ISO_DATE = re.compile(r"^(\d{4})-(\d{2})-(\d{2})$")


@dataclass(frozen=True, slots=True)
class Info:
    """What the title block of each sheet shows for one member (or for the contents of a set)."""
    project: str
    job: str
    mark: str
    title: str
    by: str
    checked: str
    date: str
    revision: str
    tool: str

    def typst(self) -> str:
        return "(" + ", ".join(f"{name}: {string(getattr(self, name))}" for name in self.__slots__) + ")"


def iso_date(text: str) -> tuple[int, int, int] | None:
    """(year, month, day) of a date written YYYY-MM-DD, else None (the PDF then carries no date)."""
    m = _ISO_DATE.match(text.strip())
    if not m:
        return None
    y, mo, d = map(int, m.groups())
    return (y, mo, d) if 1 <= mo <= 12 and 1 <= d <= 31 else None


def document(body: str, paper: str, title: str, date: tuple[int, int, int] | None, in_set: bool,
             part: bool = False) -> str:
    """The whole Typst source: bindings, the template, document metadata, then `body` (bl-member calls). `part`:
    one part of a member typeset in parts (`parts.py`), whose title blocks leave the sheet number blank."""
    when = "none" if date is None else f"datetime(year: {date[0]}, month: {date[1]}, day: {date[2]})"
    head = (f"#let bl-paper = {typst_paper(paper)}\n#let bl-body = {body_size(paper)}\n"
            f"#let bl-set = {'true' if in_set else 'false'}\n#let bl-part = {'true' if part else 'false'}\n")
    meta = f"#set document(title: {string(title)}, author: (), date: {when})\n"
    return head + _template() + meta + body + LAYOUT


def typst_paper(paper: str) -> str:
    return '"a4"' if paper == "a4" else '"us-letter"'


def text_area_mm(paper: str) -> tuple[float, float]:
    """The text width and height of a sheet (the paper less the margins), in mm."""
    width, height = PAPERS[paper]
    return width - MARGINS[0], height - MARGINS[1]


def body_size(paper: str) -> str:
    """The text area of a sheet as a Typst dictionary (what a table or figure may fill)."""
    width, height = text_area_mm(paper)
    return f"(width: {width:.1f}mm, height: {height:.1f}mm)"


def bl_member(info: Info, paper: str, body: str) -> str:
    return f"#bl-member({info.typst()}, {typst_paper(paper)}, {body_size(paper)})[\n{body}\n]\n"


@lru_cache(maxsize=1)
def _template() -> str:
    return TEMPLATE.read_text(encoding="utf-8")


def compile_pdf(source: str, figures: dict[str, str]) -> bytes:
    """PDF bytes; `figures` maps each sys.inputs key to SVG text. Raises TypstError (our bug) on a bad source."""
    import typst
    return typst.compile(source.encode("utf-8"), format="pdf", sys_inputs=figures, ignore_system_fonts=True)


def query(source: str, figures: dict[str, str], selector: str) -> list:
    """The elements a selector finds in the laid-out document (tests, and the set's sheet numbers)."""
    import json

    import typst
    return json.loads(typst.query(source.encode("utf-8"), selector, sys_inputs=figures, ignore_system_fonts=True))

"""PDF: a member's calc-package Markdown + figures -> <mark>.pdf sheets; members -> the calc set with contents.

`member_pdf` typesets one member; `write_set` (in `calcset.py`) makes the project's set from the members' PDFs.
The Markdown is the one source: `markup.py` converts it, `math.py` its formulas, `sheet.py` adds the title block
and runs typst."""

from __future__ import annotations

from dataclasses import dataclass

from beamlang import __version__
from beamlang.report.pdf.markup import text, to_typst_markup
from beamlang.report.pdf.sheet import Info, bl_member, body_size, compile_pdf, document, iso_date, typst_paper

PAPER_WORDS = {"A4": "a4", "letter": "letter"}  # the `paper` line (language/build/geometry.PAPERS)


@dataclass(frozen=True, slots=True)
class Revision:
    """One row of the revision table: the `revision` value, its date and author, and what changed in it."""
    revision: str
    date: str
    by: str
    changes: tuple[str, ...]


@dataclass(frozen=True, slots=True)
class Options:
    """How the sheets are made beyond the member itself: paper from the project, a fallback date (the commit's),
    the revision table and the lines of the package Markdown whose values changed since the previous revision
    (`changes.changed_lines`; marked in the margin)."""
    paper: str | None = None  # a4 | letter; None: the member's `paper` field, else by its unit system
    fallback_date: str | None = None  # YYYY-MM-DD, used when the member has no `date` line
    revisions: tuple[Revision, ...] = ()
    marked: tuple[int, ...] = ()  # sorted


def member_info(member) -> Info:
    f = dict(member.fields)
    return Info(project=f.get("project", ""), job=f.get("job", ""), mark=member.mark, title=member.title,
                by=f.get("by", ""), checked=f.get("checked", ""), date=f.get("date", ""),
                revision=f.get("revision", ""), tool=f"beamlang {__version__}")


def paper_of(member, options: Options) -> str:
    """The member's `paper` line wins, then the project setting, then the unit system (US: letter, SI: A4)."""
    written = dict(member.fields).get("paper")
    if written:
        return PAPER_WORDS[written]
    if options.paper:
        return options.paper
    return "letter" if member.units == "us" else "a4"


def pdf_date(member, options: Options) -> tuple[int, int, int] | None:
    return iso_date(dict(member.fields).get("date", "")) or iso_date(options.fallback_date or "")


def pdf_figures(svgs: dict[str, str]) -> dict[str, str]:
    """Figure SVGs keyed for sys.inputs, their text in DejaVu Sans Mono (a font of the typst wheel, whose
    advance of 0.6 em is the width the plotter assumes)."""
    from beamlang.report.svgplot import FONT
    return {key: svg.replace(f'font-family="{FONT}"', 'font-family="DejaVu Sans Mono"') for key, svg in svgs.items()}


def member_markup(markdown: str, options: Options = Options()) -> str:
    """The converted Markdown of one member, with the revision table before the summary and the values changed
    since the previous revision marked."""
    revisions = revision_table(options.revisions)
    mark = options.revisions[-1].revision if options.revisions and options.marked else ""
    return to_typst_markup(markdown, revisions, frozenset(options.marked), mark)


def member_body(member, markdown: str, paper: str, options: Options = Options()) -> str:
    """One member's `bl-member` call: its title-block facts, paper and converted Markdown (`member_markup`)."""
    return bl_member(member_info(member), paper, member_markup(markdown, options))


def revision_table(rows: tuple[Revision, ...]) -> str:
    """The revision table as Typst (empty without revisions)."""
    if not rows:
        return ""
    cells = ",\n  ".join(", ".join(f"[{text(v)}]" for v in (r.revision, r.date or "-", r.by or "-")) + ", [" +
                         " \\\n".join(text(c) for c in r.changes) + "]" for r in rows)
    note = (f"A mark ▲ {text(rows[-1].revision)} in the left margin flags a table row, formula or line of text whose "
            f"values (inputs, results, checks) changed since revision {text(rows[-2].revision)}."
            if len(rows) > 1 else "")
    return (f"\n#heading(level: 2)[Revisions]\n\n#bl-table(4, ([revision], [date], [by], [what changed]), (\n  "
            f"{cells},\n))\n\n{note}\n")


def member_source(member, markdown: str, options: Options = Options()) -> str:
    paper = paper_of(member, options)
    return document(member_body(member, markdown, paper, options=options), paper, f"{member.mark}: {member.title}",
                    pdf_date(member, options), in_set=False)


def member_pdf(member, markdown: str, svgs: dict[str, str], options: Options = Options()) -> bytes:
    """The member's sheets; `svgs` maps each figure path the Markdown uses to its SVG text. A long member is typeset
    in parts, each in a process of its own (`parts.py`)."""
    from beamlang.report.pdf.parts import split, typeset_parts
    paper = paper_of(member, options)
    chunks = split(member_markup(markdown, options))
    if len(chunks) == 1:
        return compile_pdf(member_source(member, markdown, options), pdf_figures(svgs))
    title, date, info = f"{member.mark}: {member.title}", pdf_date(member, options), member_info(member)
    sources = [document(bl_member(info, paper, chunk), paper, title, date, in_set=False, part=True)
               for chunk in chunks]
    frame = lambda n: document(f"#bl-part-sheets({typst_paper(paper)}, {body_size(paper)}.width, {n})\n",  # noqa: E731
                               paper, title, date, in_set=False, part=True)
    return typeset_parts(sources, pdf_figures(svgs), frame)

"""Markup: calc-package Markdown -> Typst markup, token by token (markdown-it's parse, the same one the HTML uses).

Every construct the package writes has a rule here; an unknown token type raises, so a new kind of Markdown
cannot silently vanish from the PDF. Text is escaped character by character; formulas go through `math.to_typst`;
tables, display formulas and figures call the functions of `template.typ` (`bl-table`, `bl-display`, `bl-figure`).
"""

from __future__ import annotations

import math
import re
from functools import lru_cache

from beamlang.report.pdf.math import to_typst

_ESCAPE = set("\\*_`#$[]<>@~=-+/'\"&.:;!?%(){}|^,")


def text(s: str) -> str:
    """Literal text in Typst markup (every character that could start markup escaped; newlines as spaces)."""
    return "".join("\\" + ch if ch in _ESCAPE else ch for ch in s.replace("\n", " "))


def string(s: str) -> str:
    """A Typst string literal."""
    return '"' + s.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n") + '"'


# A table surely fits on a sheet when this over-estimate of its height does: the smaller text area of A4 and US
# letter (sheet.body_size), every character of the cell's Markdown source (a formula's by `characters`) as wide
# as a wide capital at the table's 8 pt, in columns no wider than the typesetter makes them (`_column_widths`), one
# line more than that gives, a tall line (superscripts) and the cell insets. On tables made to be awkward
# (tests/test_pdf_estimates.py) it is 1.37 to 4.6 times the measured height. A table it cannot
# place is measured by the typesetter (bl-table), which costs another layout of it; most tables never need it.
_CHAR_MM, _LINE_MM, _ROW_MM, _INSET_MM = 2.0, 5.0, 2.0, 2.5
# A display formula surely fits the text width when its TeX source does at 1.2 em of the 9.5 pt body per
# character: no glyph with the space math puts around a relation is wider, and the source has at least one
# character per glyph drawn. A longer one is measured and shrunk to the width where needed (bl-display).
_MATH_CHAR_MM = 1.2 * 9.5 * 25.4 / 72


# A paragraph right before a table or display formula stays on its sheet when it ends in a colon (a caption) or
# is at most this long (a sentence introducing it: "The sums of the load curves; x in m."), so that neither it nor
# the heading above it is left at the foot of a sheet.
LEAD_CHARACTERS = 240


@lru_cache(maxsize=1)
def _text_areas() -> tuple[tuple[float, float], ...]:
    """The text width and height of every paper's sheets (`sheet.text_area_mm`), in mm."""
    from beamlang.report.pdf.sheet import PAPERS, text_area_mm  # sheet imports this module
    return tuple(text_area_mm(paper) for paper in PAPERS)


def body_mm() -> tuple[float, float]:
    """The smaller text width and height of the sheets, in mm."""
    return min(w for w, _ in _text_areas()), min(h for _, h in _text_areas())


# A table is surely taller than any sheet when even its rows at their least height are: a row with any text or
# formula is at least its insets and one line at 8 pt (measured in Typst: 10.26 pt, 3.62 mm), an empty row its
# insets (5 pt). `_ROOM_MM` is what bl-table leaves below a sheet's text height before it calls a table tall.
_LEAST_ROW_MM, _EMPTY_ROW_MM, _ROOM_MM = 3.5, 1.7, 8.0


# A table of this many body rows or more breaks wherever a sheet ends, its header repeated on each sheet, without
# being measured, as long tables do in a printed calc: kept whole, it could push most of a sheet's rows to the next
# sheet and leave the rest of this one blank, and measuring it costs the typesetter another layout of it (the
# 20-case member's four tables of 61 to 77 rows: 0.4 to 0.7 s and 75 MiB of its PDF, measured 2026-12-05). No
# table of the examples is this long.
LONG_TABLE_ROWS = 50


def breaks_freely(cells: list[list[str]]) -> bool:
    """Whether a table (header row first) is placed breakable without being measured: surely taller than a sheet,
    or long (`LONG_TABLE_ROWS`)."""
    return len(cells) - 1 >= LONG_TABLE_ROWS or surely_tall(cells)


def surely_tall(cells: list[list[str]]) -> bool:
    """Whether a table of these cells' Markdown source is taller than the text of every sheet (A4 and US letter),
    so that it breaks across sheets without being measured first."""
    least = sum(_LEAST_ROW_MM if any(c.strip() for c in row) else _EMPTY_ROW_MM for row in cells)
    return least > max(h for _, h in _text_areas()) - _ROOM_MM


def surely_fits(cells: list[list[str]]) -> bool:
    """Whether a table of these cells' Markdown source fits on one sheet whatever the column widths come to: an
    auto column wider than its fair share of the width (width / columns) is never narrowed below that share, and
    a narrower one holds each of its cells on one line."""
    return estimate_mm(cells) <= 0.9 * body_mm()[1]


def estimate_mm(cells: list[list[str]]) -> float:
    """The over-estimate of a table's height in mm (`surely_fits`)."""
    counts = [[characters(c) for c in row] for row in cells]
    widths = _column_widths(counts)
    height = 0.0
    for row in counts:
        lines = max((1 + math.ceil(n * _CHAR_MM / (w - _INSET_MM)) for n, w in zip(row, widths)), default=1)
        height += _ROW_MM + lines * _LINE_MM
    return height


def _column_widths(counts: list[list[float]]) -> list[float]:
    """Each column's width, no more than the typesetter gives it: auto columns whose one-line widths fit the text
    keep them; otherwise a column narrower than the fair share of what the narrower ones leave keeps its width and
    the wider ones share the rest equally (Typst's rule for auto columns). A one-line width here is the estimate's,
    at least the true one, so a wide column's share is at most the true share."""
    natural = [max(row[k] if k < len(row) else 0.0 for row in counts) * _CHAR_MM + _INSET_MM
               for k in range(len(counts[0]))]
    room = body_mm()[0]
    if sum(natural) <= room:
        return natural
    fair, previous = room / len(natural), None
    while fair != previous:
        narrow = [w for w in natural if w <= fair]
        if len(narrow) == len(natural):
            return natural
        previous, fair = fair, (room - sum(narrow)) / (len(natural) - len(narrow))
    return [min(w, fair) for w in natural]


# Inside `$...$` the TeX source is longer than what it draws: `\times 10^{-5}\,x^{3}` draws six glyphs. A
# formula counts as characters of the estimate thus: a structural command, brace, script mark or space nothing; a
# thin space a quarter; an operator or relation (+, -, =, <, >, and every other command: \times, \le, \theta) two,
# for the glyph and the space math puts around it; a capital one and a half (an italic M or W is wider than a text
# capital); any other character one (scripts are drawn smaller but counted whole; a fraction's parts are counted
# side by side though they are drawn one above the other).
_STRUCTURAL = frozenset({"frac", "dfrac", "tfrac", "mathrm", "mathit", "mathbf", "text", "textrm", "operatorname",
                         "left", "right", "big", "Big", "begin", "end", "displaystyle", "sqrt"})
_SPACES = {",": 0.25, ":": 0.25, ";": 0.5, "!": 0.0, " ": 0.25, "quad": 2.0, "qquad": 4.0}
_TOKEN = re.compile(r"\\([A-Za-z]+|.)|(.)", re.DOTALL)


def characters(cell: str) -> float:
    """A cell's Markdown source as a count of text characters at least as wide as what it draws."""
    parts = cell.split("$")
    return sum(len(p) if k % 2 == 0 else _math_characters(p) for k, p in enumerate(parts))


def _math_characters(tex: str) -> float:
    count = 0.0
    for command, ch in _TOKEN.findall(tex):
        if command:
            count += _SPACES.get(command, 0.0 if command in _STRUCTURAL else 2.0)
        elif ch in "{}^_ \t\n&":
            continue
        elif ch in "+-=<>":
            count += 2.0
        else:
            count += 1.5 if ch.isupper() else 1.0
    return count


def to_typst_markup(markdown: str, before_summary: str = "", changed: frozenset[int] = frozenset(),
                    mark: str = "") -> str:
    """The whole document body; a figure's path in the Markdown names the sys.inputs entry holding its SVG;
    `before_summary` is Typst placed before the first section; the table rows, formulas and paragraphs that start
    on a line of `changed` (lines of the Markdown, from 1) get a margin mark naming revision `mark`."""
    from beamlang.report.html import parsed
    tokens = parsed(markdown)
    return _Writer(tokens, before_summary, changed, mark).blocks(0, len(tokens))


class _Writer:
    def __init__(self, tokens, before: str, changed: frozenset[int], mark: str) -> None:
        self.tokens = tokens
        self.before, self.changed, self.mark = before, changed, mark

    def blocks(self, start: int, stop: int) -> str:
        out, i = [], start
        while i < stop:
            tok = self.tokens[i]
            handler = getattr(self, "_" + tok.type.removesuffix("_open"), None)
            if handler is None:
                raise ValueError(f"no Typst rule for Markdown token {tok.type}")
            end = self._close(i) if tok.nesting == 1 else i
            out.append(handler(i, end))
            i = end + 1
        return "".join(out)

    def _close(self, i: int) -> int:
        depth = 0
        for j in range(i, len(self.tokens)):
            depth += self.tokens[j].nesting
            if depth == 0:
                return j
        raise ValueError("unclosed Markdown block")

    def _heading(self, i: int, end: int) -> str:
        level = int(self.tokens[i].tag[1])
        before, self.before = (self.before, "") if level == 2 else ("", self.before)
        return f"{before}\n#heading(level: {level})[{self.inline(self.tokens[i + 1])}]\n"

    def _marked(self, tok) -> bool:
        return tok.map is not None and tok.map[0] + 1 in self.changed

    def _flag(self) -> str:
        return f"#bl-changed({string(self.mark)});"

    def _paragraph(self, i: int, end: int) -> str:
        body = (self._flag() if self._marked(self.tokens[i]) else "") + self.inline(self.tokens[i + 1])
        nxt = self.tokens[end + 1] if end + 1 < len(self.tokens) else None
        lead = body.rstrip().endswith("\\:") or len(self.tokens[i + 1].content) <= LEAD_CHARACTERS
        if nxt is not None and nxt.type in ("table_open", "math_block") and lead:
            return f"\n#bl-lead[{body}]\n"  # a caption line: kept on the sheet of what it introduces
        return f"\n{body}\n"

    def _bullet_list(self, i: int, end: int) -> str:
        items = []
        j = i + 1
        while j < end:
            close = self._close(j)
            items.append("[" + self.blocks(j + 1, close).strip() + "]")
            j = close + 1
        return "\n#list(" + ", ".join(items) + ")\n"

    _ordered_list = None  # not written by the package; an ordered list would raise

    def _table(self, i: int, end: int) -> str:
        rows: list[list[str]] = []
        raw: list[list[str]] = []  # each cell's Markdown source, for the height estimate
        flag = ""
        for j in range(i, end):
            tok = self.tokens[j]
            if tok.type == "tr_open":
                rows.append([])
                raw.append([])
                flag = self._flag() if self._marked(tok) else ""
            elif tok.type in ("th_open", "td_open"):
                rows[-1].append("[" + flag + self.inline(self.tokens[j + 1]) + "]")
                raw[-1].append(self.tokens[j + 1].content.strip())
                flag = ""
        ncols = len(rows[0])
        header = ", ".join(rows[0])
        body = ",\n  ".join(", ".join(r + ["[]"] * (ncols - len(r))) for r in rows[1:])
        small = ", small: true" if surely_fits(raw) else ", tall: true" if breaks_freely(raw) else ""
        return f"\n#bl-table({ncols}, ({header},), (\n  {body},\n){small})\n" if rows[1:] else \
            f"\n#bl-table({ncols}, ({header},), (){small})\n"

    def _math_block(self, i: int, end: int) -> str:
        tex = self.tokens[i].content
        small = ", small: true" if len(tex) * _MATH_CHAR_MM <= body_mm()[0] else ""
        flag = f", mark: {string(self.mark)}" if self._marked(self.tokens[i]) else ""
        return f"\n#bl-display($ {to_typst(tex)} ${small}{flag})\n"

    def _fence(self, i: int, end: int) -> str:
        return f"\n#bl-listing({string(self.tokens[i].content.rstrip(chr(10)))})\n"

    _code_block = _fence

    def _hr(self, i: int, end: int) -> str:
        return "\n#line(length: 100%, stroke: 0.4pt)\n"

    def inline(self, tok) -> str:
        out = []
        for child in tok.children or []:
            kind = child.type
            if kind == "text":
                out.append(text(child.content))
            elif kind == "math_inline":
                out.append(f"${to_typst(child.content)}$")
            elif kind == "code_inline":
                out.append(f"#raw({string(child.content)})")
            elif kind in ("strong_open", "em_open"):
                out.append("#strong[" if kind == "strong_open" else "#emph[")
            elif kind in ("strong_close", "em_close"):
                out.append("]")
            elif kind in ("softbreak", "hardbreak"):
                out.append(" " if kind == "softbreak" else " \\\n")
            elif kind == "image":
                out.append(f"#bl-figure({string(child.attrs['src'])}, "
                           f"{string(child.content)})")
            else:
                raise ValueError(f"no Typst rule for inline Markdown token {kind}")
        return "".join(out)

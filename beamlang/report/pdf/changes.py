"""Changes: the previous revision's package Markdown and this one's -> the lines of this one whose values changed.

Both texts are read with markdown-it (the parse the HTML and the PDF use) and compared by structure, not line by
line. A table row is keyed by its section (the heading path below the title), its table's header and its label
(the first cell; a ditto row by the label above; the k-th row of a repeated label by k): it is marked when no row
of the previous text has that key, or that row's text differs. A display formula, a paragraph or a list item is
marked when its text occurs nowhere in the previous text's same section; a figure is not marked. Input line
numbers (a "line" column, "line 12" in text) are left out of every key and text, so a line inserted above a value
does not mark it; so are the title-block columns (revision, date, by, checked) of the title table. The
Traceability section (the input file's name and SHA-256, which change with every revision, and its listing) is
not marked.
"""

from __future__ import annotations

import re
from collections import Counter

LINE_COLUMNS = {"line", "input line"}
TITLE_COLUMNS = {"revision", "date", "by", "checked"}  # in the title table, before the first section
DITTO = "″"
_LINE_REF = re.compile(r"\b(lines?) \d+")
UNMARKED = {("Traceability",)}  # the input file's name and SHA-256 (new in every revision) and its listing


def changed_lines(old: str, new: str) -> frozenset[int]:
    """The lines of `new` (from 1) that start an item (table row, formula, paragraph, list item) it changed."""
    old_rows, old_texts = _items(old)
    rows, texts = _items(new)
    marked = {line for key, (line, body) in rows.items() if key not in old_rows or old_rows[key][1] != body}
    marked |= {line for item, lines in texts.items() if item not in old_texts for line in lines}
    return frozenset(marked)


def _plain(s: str) -> str:
    return _LINE_REF.sub(r"\1 #", " ".join(s.split()))


def _figure(inline) -> bool:
    """A paragraph that is one figure: not a value (its file name follows the case numbering)."""
    return [child.type for child in inline.children or []] == ["image"]


def _items(markdown: str) -> tuple[dict[tuple, tuple[int, str]], dict[tuple, list[int]]]:
    """Table rows {(section, header, label, k): (line, text)} and other items {(section, text): [lines]}."""
    from beamlang.report.html import _markdown
    tokens = _markdown().parse(markdown)
    rows: dict[tuple, tuple[int, str]] = {}
    texts: dict[tuple, list[int]] = {}
    path: list[str] = []
    i = 0
    while i < len(tokens):
        tok = tokens[i]
        section = tuple(path)
        if tok.type == "heading_open":
            level = int(tok.tag[1])
            if level >= 2:
                path[level - 2:] = [_plain(tokens[i + 1].content)]
        elif tok.type == "table_open":
            i = _table(tokens, i, section, rows)
        elif tok.type == "math_block" or (tok.type == "paragraph_open" and not _figure(tokens[i + 1])):
            body = tok.content if tok.type == "math_block" else tokens[i + 1].content
            texts.setdefault((section, _plain(body)), []).append(tok.map[0] + 1)
        i += 1
    return ({k: v for k, v in rows.items() if k[0][:1] not in UNMARKED},
            {k: v for k, v in texts.items() if k[0][:1] not in UNMARKED})


def _table(tokens, i: int, section: tuple, rows: dict) -> int:
    """Adds the rows of the table opening at `i` to `rows`; returns the index of its closing token."""
    table: list[tuple[int, list[str]]] = []
    while tokens[i].type != "table_close":
        tok = tokens[i]
        if tok.type == "tr_open":
            table.append((tok.map[0] + 1, []))
        elif tok.type in ("th_open", "td_open"):
            table[-1][1].append(tokens[i + 1].content.strip())
        i += 1
    header = table[0][1]
    skip = LINE_COLUMNS | (TITLE_COLUMNS if not section else set())
    keep = [k for k, name in enumerate(header) if name.lower() not in skip]
    head = tuple(_plain(header[k]) for k in keep)
    seen: Counter = Counter()
    base = ""
    for line, cells in table[1:]:
        cells = [_plain(cells[k]) if k < len(cells) else "" for k in keep]
        first = cells[0] if cells else ""
        base = base if first == DITTO else first
        label = f"{base} {DITTO}" if first == DITTO else first
        seen[label] += 1
        rows[(section, head, label, seen[label])] = (line, " | ".join(cells))
    return i

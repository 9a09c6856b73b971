"""Source text and spans: file name + text -> line lookups for diagnostics."""

from __future__ import annotations

from dataclasses import dataclass


def split_lines(text: str) -> list[str]:
    """The lines of a file: split at LF only, one CR before it dropped (a CRLF file reads as its LF twin).

    Not `str.splitlines`, which also breaks at a vertical tab, form feed, NEL or U+2028: a line must be what an
    editor shows as one line."""
    parts = text.split("\n")
    if parts and parts[-1] == "":
        parts.pop()
    return [p[:-1] if p.endswith("\r") else p for p in parts]


@dataclass(frozen=True, slots=True)
class Span:
    """A region of one line of a source file; line and columns count from 1."""

    file: str
    line: int
    col: int
    end_col: int

    def __str__(self) -> str:
        return f"{self.file}:{self.line}:{self.col}"


@dataclass(frozen=True, slots=True)
class Source:
    """The text of one `.beam` file and the name it is reported under."""

    name: str
    text: str

    def line_text(self, line: int) -> str:
        lines = split_lines(self.text)
        if 1 <= line <= len(lines):
            return lines[line - 1]
        return ""

    def span(self, line: int, col: int, end_col: int | None = None) -> Span:
        return Span(self.name, line, col, end_col if end_col is not None else col + 1)

    def whole_line(self, line: int) -> Span:
        text = self.line_text(line)
        start = len(text) - len(text.lstrip()) + 1
        return Span(self.name, line, start, max(len(text) + 1, start + 1))

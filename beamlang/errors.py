"""The one error shape: diagnostics with spans -> `file:line:col: error: message`, line, caret, hint."""

from __future__ import annotations

from dataclasses import dataclass

from beamlang.source import Source, Span


def visible(text: str) -> str:
    """Text safe to print on a terminal: control and invisible characters shown as one visible character each
    (C0 controls as their control pictures, U+2400..., others as U+FFFD), so that an escape sequence in a file
    cannot recolour or clear the screen, and carets stay under the right column. Line feeds are kept."""
    import unicodedata
    out = []
    for ch in text:
        if ch == "\n":
            out.append(ch)
        elif ord(ch) < 0x20:
            out.append(chr(0x2400 + ord(ch)))
        elif ch == "\x7f":
            out.append("\u2421")
        elif unicodedata.category(ch) in ("Cc", "Cf", "Zl", "Zp", "Cs", "Co", "Cn"):
            out.append("\ufffd")
        else:
            out.append(ch)
    return "".join(out)


@dataclass(frozen=True, slots=True)
class Diagnostic:
    """One problem in the user's input, pointing at the text that causes it."""

    span: Span
    message: str
    hint: str | None = None

    def render(self, source: Source | None) -> str:
        out = [visible(f"{self.span}: error: {self.message}")]
        text = source.line_text(self.span.line) if source is not None else ""
        if text:
            shown = visible(text.replace("\t", " "))
            width = max(1, min(self.span.end_col, len(shown) + 1) - self.span.col)
            out.append(f"    {shown}")
            out.append("    " + " " * (self.span.col - 1) + "^" + "~" * (width - 1))
        if self.hint:
            out.append(visible(f"    hint: {self.hint}"))
        return "\n".join(out)


class BeamError(Exception):
    """One or more diagnostics about the user's input (exit code 2)."""

    def __init__(self, diagnostics: list[Diagnostic] | tuple[Diagnostic, ...],
                 sources: Source | list[Source] | None = None):
        self.diagnostics = tuple(sorted(diagnostics, key=lambda d: (d.span.file, d.span.line, d.span.col)))
        listed = [sources] if isinstance(sources, Source) else list(sources or [])
        self.sources = {src.name: src for src in listed}
        super().__init__(self.render())

    def render(self) -> str:
        return "\n".join(d.render(self.sources.get(d.span.file)) for d in self.diagnostics)

    def __reduce__(self):  # whole through pickle, as a build worker hands it to the building process
        return BeamError, (self.diagnostics, list(self.sources.values()))


class Collector:
    """Gathers diagnostics so that all problems of a file are reported together."""

    def __init__(self, source: Source):
        self.source = source
        self.items: list[Diagnostic] = []

    def error(self, span: Span, message: str, hint: str | None = None) -> None:
        self.items.append(Diagnostic(span, message, hint))

    def raise_if_any(self) -> None:
        if self.items:
            raise BeamError(self.items, self.source)

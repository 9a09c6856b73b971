"""Diagnostics: what `check` reports for a file -> LSP diagnostics (same message and span; the hint as related information)."""

from __future__ import annotations

from lsprotocol import types

from beamlang.errors import Diagnostic
from beamlang.tools.lsp.document import Analysed, Ranges

SOURCE = "beamlang"


def diagnostics(analysed: Analysed, uri: str, ranges: Ranges) -> list[types.Diagnostic]:
    """Every error of the file, in `check`'s order."""
    return [_one(d, uri, ranges) for d in analysed.diagnostics]


def _one(d: Diagnostic, uri: str, ranges: Ranges) -> types.Diagnostic:
    where = ranges.of(d.span)
    related = None
    if d.hint:
        related = [types.DiagnosticRelatedInformation(location=types.Location(uri=uri, range=where),
                                                      message=f"hint: {d.hint}")]
    return types.Diagnostic(range=where, message=d.message, severity=types.DiagnosticSeverity.Error,
                            source=SOURCE, related_information=related)

"""Server wiring: LSP requests over stdio (pygls) -> the feature functions of this package, one open file at a time.

Diagnostics are published on open and on every change; hover, completion, definition, document symbols and
formatting answer from the last analysis of the file's current text. Nothing here imports the report layer, so
the server starts with the front end alone."""

from __future__ import annotations

from pathlib import Path

from lsprotocol import types
from pygls import uris
from pygls.lsp.server import LanguageServer

from beamlang import __version__
from beamlang.tools.lsp.completion import complete
from beamlang.tools.lsp.diagnostics import diagnostics
from beamlang.tools.lsp.document import Analysed, Ranges, analyse, formatted
from beamlang.tools.lsp.hover import hover
from beamlang.tools.lsp.symbols import definition, document_symbols


class BeamServer(LanguageServer):
    """A language server that keeps the analysis of each open file's current text."""

    def __init__(self) -> None:
        super().__init__("beamlang", __version__)
        self.analyses: dict[str, Analysed] = {}
        self.shut_down = False  # a `shutdown` request came before `exit`

    def analysed(self, uri: str) -> Analysed:
        text = self.workspace.get_text_document(uri).source
        cached = self.analyses.get(uri)
        if cached is None or cached.text != text.removeprefix("\ufeff"):
            path = _path(uri)
            cached = self.analyses[uri] = analyse(_shown(path, self.workspace.root_path), text, path)
        return cached

    def ranges(self, uri: str) -> Ranges:
        return Ranges(self.workspace.get_text_document(uri).source, self.workspace.position_codec)

    def publish(self, uri: str) -> None:
        found = diagnostics(self.analysed(uri), uri, self.ranges(uri))
        self.text_document_publish_diagnostics(types.PublishDiagnosticsParams(uri=uri, diagnostics=found))


def _path(uri: str) -> Path | None:
    fs = uris.to_fs_path(uri)
    return Path(fs) if fs else None


def _shown(path: Path | None, root: str | None) -> str:
    """The file's name in messages as `check` run from the workspace's folder would give it."""
    if path is None:
        return "untitled.beam"
    if root and path.is_relative_to(root):
        return path.relative_to(root).as_posix()
    return path.name


def make_server() -> BeamServer:
    server = BeamServer()

    @server.feature(types.TEXT_DOCUMENT_DID_OPEN)
    def did_open(ls: BeamServer, params: types.DidOpenTextDocumentParams) -> None:
        ls.publish(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_CHANGE)
    def did_change(ls: BeamServer, params: types.DidChangeTextDocumentParams) -> None:
        ls.publish(params.text_document.uri)

    @server.feature(types.TEXT_DOCUMENT_DID_CLOSE)
    def did_close(ls: BeamServer, params: types.DidCloseTextDocumentParams) -> None:
        ls.analyses.pop(params.text_document.uri, None)
        ls.text_document_publish_diagnostics(types.PublishDiagnosticsParams(uri=params.text_document.uri,
                                                                           diagnostics=[]))

    @server.feature(types.SHUTDOWN)
    def on_shutdown(ls: BeamServer, params: None) -> None:
        ls.shut_down = True

    _requests(server)
    return server


def _requests(server: BeamServer) -> None:
    """The features that answer at a place in a file, and formatting."""

    @server.feature(types.TEXT_DOCUMENT_HOVER)
    def on_hover(ls: BeamServer, params: types.HoverParams) -> types.Hover | None:
        uri, ranges = params.text_document.uri, ls.ranges(params.text_document.uri)
        return hover(ls.analysed(uri), *ranges.point(params.position), ranges)

    @server.feature(types.TEXT_DOCUMENT_COMPLETION, types.CompletionOptions(trigger_characters=[" ", "="]))
    def on_completion(ls: BeamServer, params: types.CompletionParams) -> types.CompletionList:
        uri, ranges = params.text_document.uri, ls.ranges(params.text_document.uri)
        return complete(ls.analysed(uri), *ranges.point(params.position), ranges)

    @server.feature(types.TEXT_DOCUMENT_DEFINITION)
    def on_definition(ls: BeamServer, params: types.DefinitionParams) -> types.Location | None:
        uri, ranges = params.text_document.uri, ls.ranges(params.text_document.uri)
        return definition(ls.analysed(uri), *ranges.point(params.position), uri, ranges)

    @server.feature(types.TEXT_DOCUMENT_DOCUMENT_SYMBOL)
    def on_symbols(ls: BeamServer, params: types.DocumentSymbolParams) -> list[types.DocumentSymbol]:
        uri = params.text_document.uri
        return document_symbols(ls.analysed(uri), ls.ranges(uri))

    @server.feature(types.TEXT_DOCUMENT_FORMATTING)
    def on_formatting(ls: BeamServer, params: types.DocumentFormattingParams) -> list[types.TextEdit] | None:
        """The whole text as `beamlang fmt` writes it; nothing for a file that does not parse."""
        uri = params.text_document.uri
        analysed = ls.analysed(uri)
        text = formatted(analysed)
        if text is None:
            return None
        return [] if text == analysed.text else [types.TextEdit(range=ls.ranges(uri).whole(), new_text=text)]


def run() -> int:
    """Serve over stdin and stdout until the client says exit: 0 after a shutdown request, else 1 (as the
    protocol asks)."""
    server = make_server()
    server.start_io()
    return 0 if server.shut_down else 1

"""`beamlang lsp` driven as an editor drives it, over stdio with pygls's client: diagnostics equal to `check`'s,
hover, completion, definition, symbols, formatting, shutdown. The waits are generous bounds against a hang only."""

from __future__ import annotations

import asyncio
import re
from fractions import Fraction
import subprocess
import sys
from pathlib import Path

import pytest
from lsprotocol import types
from pygls.lsp.client import LanguageClient

from beamlang.cli import main
from casefiles import EXAMPLES

WAIT = 120  # seconds: only so that a broken server fails the test instead of hanging it
GOOD = (EXAMPLES / "mezzanine-edge-beam.beam").read_text(encoding="utf-8")
# two lines that do not parse, one after a character outside the BMP (two UTF-16 units, one code point)
UNPARSED = GOOD.replace('member B-3 "Mezzanine edge beam, grid C"', 'member B-3 "Edge beam \U0001F3D7" extra') \
               .replace("  point 12 kN down at 2.0 m", "  point 12 kN dwn at 2.0 m")
# parses, but three statements are wrong: a unit, a position, a case name
INVALID = GOOD.replace("uniform 2.5 kN/m down", "uniform 2.5 kN/mm2 down").replace("at 2.0 m", "at 7 m") \
              .replace("combine service = dead + live", "combine service = dead + lve")
MESSY = GOOD.replace("span 5.4 m", "span    5.4 m").replace("  self-weight", "    self-weight")


def check_errors(path: Path, capsys) -> list[tuple[int, int, int, str, str | None]]:
    """(line, column, caret end, message, hint) of every error `beamlang check` prints for the file."""
    assert main(["check", str(path)]) == 2
    lines = capsys.readouterr().err.splitlines()
    found = []
    for i, line in enumerate(lines):
        head = re.match(r".+?:(\d+):(\d+): error: (.*)$", line)
        if not head:
            continue
        caret = lines[i + 2].strip()
        hint = lines[i + 3].strip().removeprefix("hint: ") if i + 3 < len(lines) and "hint:" in lines[i + 3] else None
        found.append((int(head[1]), int(head[2]), int(head[2]) + len(caret), head[3], hint))
    return found


def lsp_errors(params: types.PublishDiagnosticsParams, text: str) -> list[tuple[int, int, int, str, str | None]]:
    """The same five things from the server's diagnostics, its UTF-16 columns turned back into code points and
    the end clipped to the line as `check` draws its caret."""
    rows = text.splitlines()
    out = []
    for d in params.diagnostics:
        row = rows[d.range.start.line]
        col = _code_points(row, d.range.start.character) + 1
        end = min(_code_points(row, d.range.end.character) + 1, len(row) + 1)
        hints = [r.message.removeprefix("hint: ") for r in d.related_information or []]
        out.append((d.range.start.line + 1, col, max(end, col + 1), d.message, hints[0] if hints else None))
    return out


def _code_points(row: str, utf16: int) -> int:
    count = units = 0
    for ch in row:
        if units >= utf16:
            break
        units += 2 if ord(ch) > 0xFFFF else 1
        count += 1
    return count if units >= utf16 else len(row) + (utf16 - units)


def _where(text: str, needle: str, offset: int = 0, occurrence: int = 1) -> types.Position:
    """The position (UTF-16, as the client counts) of the n-th occurrence of `needle`, plus `offset` characters."""
    for number, row in enumerate(text.splitlines()):
        if needle in row:
            occurrence -= 1
            if occurrence == 0:
                col = row.index(needle) + offset
                return types.Position(number, len(row[:col].encode("utf-16-le")) // 2)
    raise AssertionError(f"{needle!r} not in the text")


class Session:
    """A client talking to one `beamlang lsp` process."""

    def __init__(self, uri: str):
        self.uri, self.version = uri, 0
        self.client = LanguageClient("beamlang-test", "1")
        self.published: asyncio.Queue = asyncio.Queue()

        @self.client.feature(types.TEXT_DOCUMENT_PUBLISH_DIAGNOSTICS)
        def published(params: types.PublishDiagnosticsParams) -> None:
            self.published.put_nowait(params)

    async def next_diagnostics(self) -> types.PublishDiagnosticsParams:
        params = await asyncio.wait_for(self.published.get(), WAIT)
        assert params.uri == self.uri
        return params

    def change(self, text: str) -> None:
        self.version += 1
        self.client.text_document_did_change(types.DidChangeTextDocumentParams(
            text_document=types.VersionedTextDocumentIdentifier(uri=self.uri, version=self.version),
            content_changes=[types.TextDocumentContentChangeWholeDocument(text=text)]))

    def edit(self, text: str, replacements: list[tuple[str, str]]) -> None:
        """Ranged changes, as an editor sends keystrokes (each on its own line, so none moves another)."""
        self.version += 1
        changes = []
        for old, new in replacements:
            start = _where(text, old)
            end = types.Position(start.line, start.character + len(old))
            changes.append(types.TextDocumentContentChangePartial(range=types.Range(start, end), text=new))
        self.client.text_document_did_change(types.DidChangeTextDocumentParams(
            text_document=types.VersionedTextDocumentIdentifier(uri=self.uri, version=self.version),
            content_changes=changes))

    def doc(self) -> types.TextDocumentIdentifier:
        return types.TextDocumentIdentifier(uri=self.uri)

    async def hover(self, at: types.Position) -> str:
        found = await asyncio.wait_for(self.client.text_document_hover_async(
            types.HoverParams(text_document=self.doc(), position=at)), WAIT)
        return found.contents.value if found else ""

    async def completion(self, at: types.Position) -> list[str]:
        found = await asyncio.wait_for(self.client.text_document_completion_async(
            types.CompletionParams(text_document=self.doc(), position=at)), WAIT)
        items = found.items if isinstance(found, types.CompletionList) else found
        return [item.label for item in items]


async def _drive(folder: Path, capsys) -> dict:
    path = folder / "b3.beam"
    session = Session(path.as_uri())
    client, seen = session.client, {}
    await client.start_io(sys.executable, "-m", "beamlang", "lsp", cwd=str(folder))
    init = await asyncio.wait_for(client.initialize_async(types.InitializeParams(
        capabilities=types.ClientCapabilities(), root_uri=folder.as_uri())), WAIT)
    seen["capabilities"] = init.capabilities
    client.initialized(types.InitializedParams())

    for name, text in (("unparsed", UNPARSED), ("invalid", INVALID)):
        path.write_text(text, encoding="utf-8")
        if name == "unparsed":
            client.text_document_did_open(types.DidOpenTextDocumentParams(
                text_document=types.TextDocumentItem(uri=session.uri, language_id="beam", version=0, text=text)))
        else:
            session.change(text)
        seen[name] = (lsp_errors(await session.next_diagnostics(), text), check_errors(path, capsys))

    session.edit(INVALID, [("kN/mm2", "kN/m"), ("at 7 m", "at 2.0 m"), ("+ lve", "+ live")])  # incremental
    seen["fixed"] = (await session.next_diagnostics()).diagnostics
    seen["hover"] = {what: await session.hover(_where(GOOD, *where)) for what, where in {
        "quantity": ("12 kN", 1), "keyword": ("point 12", 3), "case": ("+ live", 3),
        "combination": ("stress strength", 8), "position": ("report deflection at span/2", 22)}.items()}
    seen["completion"] = {}
    for what, line in {"statement": "", "load": "  ", "unit": "  point 12 ", "case": "combine extra = 1.5 ",
                       "target": "check stress "}.items():
        text = GOOD.replace("case live", f"{line}\ncase live", 1)
        session.change(text)
        await session.next_diagnostics()
        seen["completion"][what] = await session.completion(
            types.Position(_where(text, "case live").line - 1, len(line)))

    session.change(GOOD)
    await session.next_diagnostics()
    found = await asyncio.wait_for(client.text_document_definition_async(types.DefinitionParams(
        text_document=session.doc(), position=_where(GOOD, "+ live", 2, occurrence=1))), WAIT)
    seen["definition"] = found if isinstance(found, types.Location) else found[0]
    seen["symbols"] = await asyncio.wait_for(client.text_document_document_symbol_async(
        types.DocumentSymbolParams(text_document=session.doc())), WAIT)

    session.change(MESSY)
    await session.next_diagnostics()
    seen["formatting"] = await asyncio.wait_for(client.text_document_formatting_async(types.DocumentFormattingParams(
        text_document=session.doc(), options=types.FormattingOptions(tab_size=2, insert_spaces=True))), WAIT)

    await asyncio.wait_for(client.shutdown_async(None), WAIT)
    client.exit(None)
    await asyncio.wait_for(client.stop(), WAIT)
    seen["returncode"] = client._server.returncode
    return seen


def test_the_server_answers_as_check_and_fmt_do(tmp_path, capsys):
    seen = asyncio.run(_drive(tmp_path, capsys))

    caps = seen["capabilities"]
    assert caps.hover_provider and caps.definition_provider and caps.document_symbol_provider
    assert caps.document_formatting_provider and list(caps.completion_provider.trigger_characters) == [" ", "="]
    server, check = seen["unparsed"]
    assert len(check) == 2 and server == check  # every bad line, same messages, hints and spans
    assert check[0][:4] == (4, 26, 31, "unexpected 'extra'") and check[1][3].startswith("missing direction")
    server, check = seen["invalid"]
    assert len(check) == 3 and server == check
    assert [c[3] for c in check] == ["unknown unit 'kN/mm2'", "load position 7 m is outside the span (0 to 5.4 m)",
                                     "unknown case 'lve'"]
    assert [c[4] for c in check] == ["did you mean 'kN/mm'?", "positions are measured from the left end, from 0 to "
                                     "the span", "did you mean 'live'?"]
    assert list(seen["fixed"]) == []

    hover = seen["hover"]
    assert "`12 kN` = 12000 N (a force)" in hover["quantity"] and "1 kN = 1000 N" in hover["quantity"]
    assert "point FORCE down|up at POS" in hover["keyword"]
    assert "point 12 kN down at 2.0 m" in hover["case"] and "moment 3 kN*m clockwise at 0 m" in hover["case"]
    assert "1.2 x `dead`" in hover["combination"] and "1.6 x `live`" in hover["combination"]
    assert "`span/2` = 2.7 m from the left end" in hover["position"]

    done = seen["completion"]
    assert {"case", "combine", "limit", "check", "note"} <= set(done["statement"])
    assert not {"member", "span", "point", "self-weight"} & set(done["statement"])  # present once; loads indented
    assert set(done["load"]) == {"point", "uniform", "linear", "moment", "self-weight", "settlement", "moving"}
    assert {"kN", "N", "lbf", "kip"} <= set(done["unit"]) and not {"m", "kN/m", "kN*m"} & set(done["unit"])
    assert done["case"] == ["dead", "live"]  # a combination's terms are cases
    assert done["target"] == ["dead", "live", "service", "strength"]

    definition = seen["definition"]
    assert (definition.range.start.line, definition.range.start.character) == (_where(GOOD, "case live", 5).line, 5)
    (member,) = seen["symbols"]
    assert member.name == "B-3" and member.detail == "Mezzanine edge beam, grid C"
    assert [c.name for c in member.children][:4] == ["dead", "live", "service", "strength"]
    assert "check stress strength" in [c.name for c in member.children]
    assert [c.name for c in member.children[0].children] == ["uniform 2.5 kN/m down", "self-weight"]

    (edit,) = seen["formatting"]
    assert edit.new_text == GOOD  # the example is canonical: formatting the messy copy gives it back
    assert seen["returncode"] == 0


def test_formatting_is_fmts(tmp_path):
    """The formatter the server applies is `beamlang fmt`: the same text for the messy file."""
    (tmp_path / "m.beam").write_text(MESSY, encoding="utf-8")
    assert main(["fmt", str(tmp_path / "m.beam")]) == 0
    assert (tmp_path / "m.beam").read_text(encoding="utf-8") == GOOD


def test_the_server_loads_neither_the_report_nor_its_libraries():
    probe = ("import sys; from beamlang.tools.lsp import server; from beamlang.tools.lsp.document import analyse; "
             "from beamlang.tools.lsp.hover import _explain; "
             f"a = analyse('b.beam', open({str(EXAMPLES / 'mezzanine-edge-beam.beam')!r}).read()); _explain(a, 24, 9); "
             "print(sorted(m for m in sys.modules if m.startswith(('beamlang.report', 'beamlang.pipeline', "
             "'beamlang.engine.solve', 'sympy', 'markdown_it', 'pygments'))))")
    done = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, check=True)
    assert done.stdout.strip() == "[]"


def _at_end(text: str, extra: str):
    """The analysis of `text` plus a last line `extra`, and the place at its end."""
    from pygls.workspace import PositionCodec

    from beamlang.tools.lsp.document import Ranges, analyse
    whole = text + extra
    return analyse("t.beam", whole), len(whole.splitlines()), len(extra) + 1, Ranges(whole, PositionCodec())


US = (EXAMPLES / "floor-joist-sized-us.beam").read_text(encoding="utf-8")


@pytest.mark.parametrize("text, line, expected", [
    (GOOD, "section I-shape depth 250 mm flange 150 mm ", ["web", "from", "x"]),  # a flange is width x thickness
    (GOOD, "section rectangle width 100 mm ", ["depth", "from"]),  # no `x` after another dimension
    (GOOD, "material E 200 GPa yield 350 MPa ", ["G", "density", "shear", "from"]),
    (GOOD, "material E 1400 ksi ", ["G", "density", "shear", "yield", "allowable", "from"]),
    (GOOD, "material E 1400 ksi allowable ", ["bending"]),
    (GOOD, "  linear 0 kN/m to 4", ["N/mm", "kN/m", "kN/mm", "kip/ft", "kip/in", "klf", "lbf/ft", "lbf/in", "plf"]),
    (GOOD, "  linear 0 kN/m to 4 kN/m down from 3", ["cm", "km", "m", "mm", "ft", "in"]),
    (GOOD, "support spring 5", ["N/mm", "kN/m", "kN/mm", "kip/ft", "kip/in", "klf", "lbf/ft", "lbf/in", "plf"]),
    (GOOD, "limit slope at supports 0.001", ["rad"]),
    (GOOD, "  moving 11 kN and 9", ["MN", "N", "kN", "kip", "lbf"]),
    (GOOD, "  moving 11 kN and 9 kN down spaced 0.45 m and 1", ["cm", "km", "m", "mm", "ft", "in"]),
    (US, "  point 300 ", ["kip", "lbf", "MN", "N", "kN"]),  # a US member: its own units first
    (GOOD, "  moment 3 kN*m ", ["clockwise", "counterclockwise"]),
    (GOOD, "limit ", ["deflection", "frequency", "slope"]),
    (GOOD, "units ", ["si", "us"]),
    (GOOD, "# a comment ", []),
    (GOOD, 'note "a text ', []),
    (GOOD, "spann ", []),  # no statement starts so
])
def test_completion_by_context(text, line, expected):
    from beamlang.tools.lsp.completion import complete
    analysed, row, col, ranges = _at_end(text, line)
    assert [item.label for item in complete(analysed, row, col, ranges).items] == expected


def test_completion_replaces_the_word_being_typed():
    from beamlang.tools.lsp.completion import complete
    analysed, row, col, ranges = _at_end(GOOD, "  point 12 kN/")
    item = next(i for i in complete(analysed, row, col, ranges).items if i.label == "kN")
    assert (item.text_edit.range.start.character, item.text_edit.range.end.character) == (11, 14)


@pytest.mark.parametrize("text, needle, offset, expected", [
    (US, "9.25 in", 0, "`9.25 in` = 0.23495 m (a length)\n\n1 in = 0.0254 m"),  # NIST SP 811: 1 in = 0.0254 m exactly
    # NIST SP 811, Appendix B: 1 lbf = 4.4482216152605 N, 1 in = 0.0254 m, 1 ft = 0.3048 m (exact); neither a psi
    # nor a lbf/ft is a finite decimal of the SI unit (127 divides the denominators)
    (US, "1400 ksi", 0, "`1400 ksi` = {} Pa ≈ 9652660210.44 Pa (a stress)".format(
        Fraction("4.4482216152605") * 1400 * 1000 / Fraction("0.0254") ** 2)),
    (GOOD.replace("2.5 kN/m", "150 plf"), "150 plf", 0, "1 plf = {} N/m ≈ 14.5939029372 N/m (plf is lbf/ft)".format(
        Fraction("4.4482216152605") / Fraction("0.3048"))),
    (GOOD, "0.0012", 0, None),  # not in this file
    (GOOD, "section I-shape", 10, "section I-shape depth .. flange .. web .."),
    (GOOD, "roller", 1, "support roller at POS"),
    (GOOD, "# every load", 3, None),  # a word inside a comment
    (GOOD, "+ lve", 3, None),
])
def test_hover_text(text, needle, offset, expected):
    from beamlang.tools.lsp.hover import _explain
    from beamlang.tools.lsp.document import analyse
    rows = text.splitlines()
    found = [(i, row.index(needle)) for i, row in enumerate(rows, start=1) if needle in row]
    if not found:
        assert expected is None
        return
    (line, col), = found[:1]
    said = _explain(analyse("t.beam", text), line, col + 1 + offset)
    assert (said is None) if expected is None else expected in said[0]


def test_without_pygls_the_command_says_what_to_install(monkeypatch, capsys):
    for name in [m for m in sys.modules if m.startswith(("beamlang.tools.lsp", "pygls"))]:
        monkeypatch.delitem(sys.modules, name)
    monkeypatch.setitem(sys.modules, "pygls", None)  # as if it were not installed
    assert main(["lsp"]) == 2
    assert capsys.readouterr().err.startswith("beamlang lsp needs pygls 2 and lsprotocol: pip install 'beamlang[lsp]'")


from hypothesis import given, settings, strategies as st  # noqa: E402

EXAMPLE_TEXTS = [p.read_text(encoding="utf-8") for p in sorted(EXAMPLES.glob("*.beam"))]


@settings(max_examples=150, deadline=None)
@given(st.sampled_from(EXAMPLE_TEXTS), st.integers(0, 2000), st.integers(0, 40), st.text(max_size=6),
       st.integers(0, 60), st.integers(0, 90))
def test_features_never_fail_on_a_file_being_typed(text, cut, length, typed, line, col):
    """A file cut and typed into at any place: every feature answers (possibly nothing), none raises."""
    from pygls.workspace import PositionCodec

    from beamlang.tools.lsp.completion import complete
    from beamlang.tools.lsp.diagnostics import diagnostics
    from beamlang.tools.lsp.document import Ranges, analyse, formatted
    from beamlang.tools.lsp.hover import hover
    from beamlang.tools.lsp.symbols import definition, document_symbols
    cut %= len(text)
    text = text[:cut] + typed + text[cut + length:]
    analysed, ranges = analyse("t.beam", text), Ranges(text, PositionCodec())
    here = ranges.point(types.Position(line, col))
    diagnostics(analysed, "file:///t.beam", ranges)
    hover(analysed, *here, ranges)
    complete(analysed, *here, ranges)
    definition(analysed, *here, "file:///t.beam", ranges)
    document_symbols(analysed, ranges)
    assert formatted(analysed) is None or analysed.parsed

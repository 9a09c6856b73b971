"""Characters a reader cannot see: refused by name with a caret, never echoed raw, and never a hidden statement."""

from __future__ import annotations

import os
import stat
import threading

import pytest

from beamlang.cli import main
from casefiles import EXAMPLES

MEMBER = """member T-1 "Test beam"
span 4 m
material steel E 200 GPa yield 250 MPa density 7850 kg/m^3
section rectangle width 100 mm depth 200 mm
support pin at 0 m
support roller at span
case dead
  uniform 2 kN/m down  # from the spec
"""


def run(tmp_path, monkeypatch, capsys, text: str | bytes, argv=("check",)):
    monkeypatch.chdir(tmp_path)
    path = tmp_path / "case.beam"
    if isinstance(text, bytes):
        path.write_bytes(text)
    else:
        path.write_text(text, encoding="utf-8", newline="")
    code = main([*argv, "case.beam"])
    out = capsys.readouterr()
    return code, out.out, out.err


@pytest.mark.parametrize("brk, name", [("\x0b", "U+000B LINE TABULATION"), ("\x0c", "U+000C FORM FEED"),
                                       ("\x85", "U+0085 NEXT LINE"), ("\u2028", "U+2028 LINE SEPARATOR"),
                                       ("\u2029", "U+2029 PARAGRAPH SEPARATOR"), ("\r", "U+000D CARRIAGE RETURN"),
                                       ("\x1c", "U+001C INFORMATION SEPARATOR FOUR")])
def test_a_line_break_inside_a_comment_hides_no_statement(brk, name, tmp_path, monkeypatch, capsys):
    text = MEMBER.replace("# from the spec", f"# from the spec{brk}point 9 kN up at 2.5 m")
    code, out, err = run(tmp_path, monkeypatch, capsys, text)
    assert code == 2 and out == ""
    assert err.startswith(f"case.beam:8:39: error: {name} inside a line\n")
    assert brk not in err
    for argv in (["fmt"], ["build", "-o", "out"]):  # nothing rewrites the file or builds the hidden load
        assert main([*argv, "case.beam"]) == 2
    assert (tmp_path / "case.beam").read_bytes() == text.encode("utf-8")
    assert not (tmp_path / "out" / "T-1").exists()


def test_crlf_lines_are_ordinary_lines(tmp_path, monkeypatch, capsys):
    code, out, err = run(tmp_path, monkeypatch, capsys, MEMBER.replace("\n", "\r\n"))
    assert code == 0 and err == "" and "T-1" in out


@pytest.mark.parametrize("line, col, message", [
    ("span \uff15 m", 6, "U+FF15 FULLWIDTH DIGIT FIVE is not one of the digits 0-9"),
    ("span \u0664 m", 6, "U+0664 ARABIC-INDIC DIGIT FOUR is not one of the digits 0-9"),
    ("span\u00a05 m", 5, "invisible character U+00A0 NO-BREAK SPACE"),
    ("span 4\u202fm", 7, "invisible character U+202F NARROW NO-BREAK SPACE"),
    ("span 4 m\u200b", 9, "invisible character U+200B ZERO WIDTH SPACE"),
    ("\ufeffspan 4 m", 1, "invisible character U+FEFF ZERO WIDTH NO-BREAK SPACE"),
    ("span 4 m  # \u202eevil", 13, "invisible character U+202E RIGHT-TO-LEFT OVERRIDE"),
    ("span 4 m\x00", 9, "control character U+0000 NULL"),
    ("span 4 m\x1b[2J", 9, "control character U+001B ESCAPE"),
    ("span 4 m\x7f", 9, "control character U+007F DELETE"),
])
def test_invisible_and_foreign_characters_are_named(line, col, message, tmp_path, monkeypatch, capsys):
    text = "\ufeff" + MEMBER.replace("span 4 m", line)  # the first byte-order mark of a file is allowed
    code, out, err = run(tmp_path, monkeypatch, capsys, text)
    assert code == 2
    first = err.splitlines()[0]
    assert first == f"case.beam:2:{col}: error: {message}"
    assert err.splitlines()[2] == " " * (3 + col) + "^"
    import unicodedata  # no control or format character reaches the terminal raw
    assert not [ch for ch in err if ch != "\n" and unicodedata.category(ch) in ("Cc", "Cf")], repr(err)


def test_foreign_characters_inside_quotes_and_comments_are_text(tmp_path, monkeypatch, capsys):
    text = MEMBER.replace('"Test beam"', '"Träger \uff15\u00a0m"').replace("# from the spec", "# ５ m\u00a0x")
    code, out, err = run(tmp_path, monkeypatch, capsys, text)
    assert code == 0, err
    assert "Träger \uff15\u00a0m" in out


def test_escape_sequence_in_a_title_is_refused_not_echoed(tmp_path, monkeypatch, capsys):
    text = MEMBER.replace('"Test beam"', '"Test \x1b[2J\x1b[31mbeam"')
    code, out, err = run(tmp_path, monkeypatch, capsys, text, ("check", "--junit", "j.xml"))
    assert code == 2 and "\x1b" not in err + out
    assert "control character U+001B ESCAPE" in err
    assert "\u241b[2J" in err  # the line is shown with the control picture in place of the character
    import xml.etree.ElementTree as ET
    ET.parse(tmp_path / "j.xml")  # the JUnit file stays well-formed XML


def test_junit_writes_only_xml_legal_characters():
    from beamlang.errors import BeamError, Diagnostic
    from beamlang.source import Source, Span
    from beamlang.tools.junit import junit_xml
    import xml.etree.ElementTree as ET
    diag = Diagnostic(Span("a\x01.beam", 1, 1, 2), "bad \x00 \x1b[2J \ufffe thing", "hint \x0b")
    xml = junit_xml([], [BeamError([diag], Source("a\x01.beam", "x\x00y\n"))])
    root = ET.fromstring(xml.split("\n", 1)[1])
    assert root.get("errors") == "1"
    assert "\x00" not in xml and "\x1b" not in xml and "\ufffe" not in xml


@pytest.mark.parametrize("written, kept", [(r'"C:\\calc\\new"', "C:\\calc\\new"), (r'"a \"b\""', 'a "b"')])
def test_documented_escapes_in_quoted_text(written, kept, tmp_path, monkeypatch, capsys):
    text = MEMBER.replace('"Test beam"', written) + f"note {written}\n"
    code, out, err = run(tmp_path, monkeypatch, capsys, text, ("check", "--json"))
    assert code == 0, err
    import json
    assert json.loads(out)[0]["title"] == kept


def test_unknown_escape_is_refused_not_dropped(tmp_path, monkeypatch, capsys):
    code, out, err = run(tmp_path, monkeypatch, capsys, MEMBER + 'note "C:\\calc\\new"\n')
    assert code == 2
    assert err.splitlines()[0] == "case.beam:9:9: error: unknown escape '\\c' in quoted text"
    assert err.splitlines()[3] == '    hint: a backslash is written \\\\ (C:\\\\calc) and a quote \\"'


def test_fmt_keeps_backslashes(tmp_path, monkeypatch, capsys):
    code, _, err = run(tmp_path, monkeypatch, capsys, MEMBER + 'note   "C:\\\\calc\\\\new"\n', ("fmt",))
    assert code == 0, err
    assert (tmp_path / "case.beam").read_text(encoding="utf-8").endswith('note "C:\\\\calc\\\\new"\n')


def test_the_size_limit_is_kept_while_reading(tmp_path, monkeypatch, capsys):
    import beamlang.language.parse as parse
    reads = []
    real = os.fdopen

    def spy(fd, *a, **k):
        handle = real(fd, *a, **k)
        original = handle.read
        handle.read = lambda n=-1: reads.append(n) or original(n)
        return handle
    monkeypatch.setattr(parse.os, "fdopen", spy)
    code, _, err = run(tmp_path, monkeypatch, capsys, b"#" * 3_000_000)
    assert code == 2 and "file too large for a member (more than 1000000 bytes)" in err
    assert reads == [parse.MAX_BYTES + 1]


@pytest.mark.skipif(not os.path.exists("/dev/zero"), reason="no /dev/zero here")
def test_a_device_is_refused_without_reading(monkeypatch, capsys):
    code = main(["check", "/dev/zero"])
    err = capsys.readouterr().err
    assert code == 2
    assert err == ("/dev/zero:1:1: error: is not a regular file (a device); a member is a .beam file\n")


@pytest.mark.skipif(not hasattr(os, "mkfifo"), reason="no named pipes here")
def test_a_pipe_without_a_writer_is_refused_without_waiting(tmp_path, monkeypatch, capsys):
    fifo = tmp_path / "pipe.beam"
    os.mkfifo(fifo)
    assert stat.S_ISFIFO(fifo.stat().st_mode)
    result = []
    worker = threading.Thread(target=lambda: result.append(main(["check", str(fifo)])), daemon=True)
    worker.start()
    worker.join(timeout=20)
    if worker.is_alive():  # unblock the reader so that the suite goes on, then fail
        with open(fifo, "w"):
            pass
        pytest.fail("check waited on a pipe with no writer")
    assert result == [2]
    assert "is not a regular file (a pipe)" in capsys.readouterr().err


def test_examples_have_no_refused_characters():
    from beamlang.language.characters import first_problem
    from beamlang.source import split_lines
    for path in sorted(EXAMPLES.glob("*.beam")):
        for line in split_lines(path.read_text(encoding="utf-8")):
            assert first_problem(line) is None, (path.name, line)

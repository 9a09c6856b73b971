"""Every class of input error: whole message, line, column, caret and exit code 2, from case files."""

from __future__ import annotations

import pytest

from beamlang.cli import main
from casefiles import UPDATE, case_files, read_case, write_case

COMMANDS = (["fmt", "--check"], ["check"])


def run(argv, capsys):
    code = main(argv)
    out = capsys.readouterr()
    return code, out.out, out.err


@pytest.mark.parametrize("command", COMMANDS, ids=lambda c: c[0])
@pytest.mark.parametrize("path", case_files("errors"), ids=lambda p: p.stem)
def test_error_case(path, command, tmp_path, monkeypatch, capsys):
    case = read_case(path)
    (tmp_path / "case.beam").write_text(case["input"], encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    code, out, err = run(command + ["case.beam"], capsys)
    if UPDATE:
        write_case(path, {"input": case["input"], "stderr": err})
    assert err == case["stderr"]
    assert code == 2
    assert "Traceback" not in err


def test_missing_file(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    code, _, err = run(["fmt", "nothing.beam"], capsys)
    assert (code, err) == (2, "nothing.beam:1:1: error: no such file\n")


def test_not_utf8(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "latin.beam").write_bytes(b'member B-1 "Tr\xe4ger"\n')
    code, _, err = run(["fmt", "latin.beam"], capsys)
    assert code == 2
    assert err == "latin.beam:1:15: error: file is not UTF-8 text\n    hint: save the file as UTF-8\n"


def test_duplicate_marks_across_files(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    valid = ('member T-1 "Test beam"\n\nspan 4 m\nmaterial steel E 200 GPa\n'
             'section rectangle width 100 mm depth 200 mm\n\nsupport pin at 0 m\nsupport roller at span\n\n'
             'case dead\n  uniform 1 kN/m down\n')  # canonical layout, so fmt has nothing else to say
    (tmp_path / "a.beam").write_text(valid, encoding="utf-8")
    (tmp_path / "b.beam").write_text(valid.replace("Test beam", "Same mark"), encoding="utf-8")
    code, _, err = run(["fmt", "--check", "a.beam", "b.beam"], capsys)
    assert code == 2
    assert err == (
        "b.beam:1:8: error: member mark 'T-1' is used twice\n"
        '    member T-1 "Same mark"\n'
        "           ^~~\n"
        "    hint: also in a.beam:1; marks name the output folders and must differ\n")


def test_debug_flag_is_accepted_after_the_command(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    code, _, err = run(["fmt", "--debug", "nothing.beam"], capsys)
    assert code == 2 and "no such file" in err


def test_file_too_large(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "big.beam").write_text("# padding\n" * 120_000, encoding="utf-8")
    code, _, err = run(["check", "big.beam"], capsys)
    assert code == 2
    assert err == ("big.beam:1:1: error: file too large for a member (more than 1000000 bytes)\n"
                   "    hint: the limits are 1000000 bytes and 20000 lines\n")


def test_line_too_long(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "long.beam").write_text('note "' + "x" * 2100 + '"\n', encoding="utf-8")
    code, _, err = run(["fmt", "long.beam"], capsys)
    assert code == 2 and err.startswith("long.beam:1:2001: error: line too long (2107 characters)\n")


def test_marks_differing_only_in_case_collide(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    valid = ('member b-1 "One"\n\nspan 4 m\nmaterial steel E 200 GPa\nsection rectangle width 100 mm depth 200 mm\n\n'
             'support pin at 0 m\nsupport roller at span\n\ncase dead\n  uniform 1 kN/m down\n')
    (tmp_path / "a.beam").write_text(valid, encoding="utf-8")
    (tmp_path / "b.beam").write_text(valid.replace("b-1", "B-1"), encoding="utf-8")
    code, _, err = run(["check", "a.beam", "b.beam"], capsys)
    assert code == 2 and err.startswith("b.beam:1:8: error: member mark 'B-1' is used twice")

"""`beamlang diff` on a real git repository made by the test; `check --junit` parsed back."""

from __future__ import annotations

import json
import shutil
import subprocess
import xml.etree.ElementTree as ET

import pytest

from beamlang.cli import main
from casefiles import EXAMPLES

pytestmark = pytest.mark.skipif(shutil.which("git") is None, reason="git is not installed")


def git(repo, *args):
    subprocess.run(["git", *args], cwd=repo, check=True, capture_output=True)


@pytest.fixture
def repo(tmp_path, monkeypatch):
    git(tmp_path, "init", "-q")
    git(tmp_path, "config", "user.email", "test@example.invalid")
    git(tmp_path, "config", "user.name", "test")
    (tmp_path / "beams").mkdir()
    shutil.copy(EXAMPLES / "mezzanine-edge-beam.beam", tmp_path / "beams" / "b3.beam")
    shutil.copy(EXAMPLES / "canopy-cantilever.beam", tmp_path / "beams" / "ca1.beam")
    git(tmp_path, "add", ".")
    git(tmp_path, "commit", "-qm", "first")
    b3 = tmp_path / "beams" / "b3.beam"
    text = b3.read_text(encoding="utf-8")
    text = text.replace("depth 250 mm flange", "depth 200 mm flange").replace("point 12 kN down", "point 45 kN down")
    b3.write_text(text, encoding="utf-8")
    git(tmp_path, "commit", "-qam", "smaller section, heavier load")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def run(capsys, *argv):
    code = main(list(argv))
    return code, capsys.readouterr().out


def test_text_diff_by_revision_puts_status_changes_first(repo, capsys):
    code, out = run(capsys, "diff", "HEAD~1:beams/b3.beam", "beams/b3.beam")
    assert code == 0
    lines = out.splitlines()
    assert lines[0] == "beams/b3.beam: changed"
    assert lines[1].split()[:3] == ["PASS", "->", "FAIL"]  # the first flagged change is the worst
    assert "  changed  section depth: 250 mm -> 200 mm  (line 14)" in lines
    assert "  changed  case live: point load: point 12 kN down at 2.0 m -> point 45 kN down at 2.0 m  (line 24)" in lines
    assert any(l.startswith("  result   live: max down deflection -4.074 mm -> ") for l in lines)


def test_fail_on_regression_gates(repo, capsys):
    assert run(capsys, "diff", "HEAD~1:beams/b3.beam", "beams/b3.beam", "--fail-on", "regression")[0] == 1
    assert run(capsys, "diff", "beams/b3.beam", "HEAD~1:beams/b3.beam", "--fail-on", "regression")[0] == 0  # reverse: better


def test_markdown_and_json_formats(repo, capsys):
    _, md = run(capsys, "diff", "--rev", "HEAD~1", "beams", "--format", "markdown")
    assert md.startswith("### beams/b3.beam: changed\n\n| status | check | ratio before | ratio after |")
    assert "### beams/ca1.beam: unchanged" in md
    _, js = run(capsys, "diff", "--rev", "HEAD~1", "--format", "json")
    data = json.loads(js)
    assert data["schema"] == "beamlang.diff/1"
    b3 = next(m for m in data["members"] if m["name"] == "beams/b3.beam")
    assert b3["regression"] and b3["checks"][0]["change"] == "PASS -> FAIL"
    assert {"change": "changed", "what": "section depth", "before": "250 mm", "after": "200 mm", "line": 14} in b3["inputs"]


def test_working_tree_changes_added_and_removed_files(repo, capsys):
    (repo / "beams" / "ca1.beam").unlink()
    shutil.copy(EXAMPLES / "lintel-propped.beam", repo / "beams" / "l4.beam")
    _, out = run(capsys, "diff", "--rev", "HEAD")
    assert "beams/ca1.beam: removed" in out and "beams/l4.beam: added" in out
    assert "beams/b3.beam: unchanged" in out.splitlines()


def test_an_untouched_file_is_unchanged(repo, capsys):
    code, out = run(capsys, "diff", "--rev", "HEAD", "--format", "json")
    assert code == 0
    statuses = {m["name"]: m["status"] for m in json.loads(out)["members"]}
    assert statuses == {"beams/b3.beam": "unchanged", "beams/ca1.beam": "unchanged"}
    assert run(capsys, "diff", "--rev", "HEAD")[1] == "beams/b3.beam: unchanged\nbeams/ca1.beam: unchanged\n"


@pytest.mark.parametrize("argv", [["diff", "--", "--output=PWNED:beams/b3.beam", "beams/b3.beam"],
                                  ["diff", "--rev=--output=PWNED", "beams"],
                                  ["build", "beams", "-o", "out", "--since=--output=PWNED"]])
def test_a_revision_is_never_a_git_option(argv, repo, capsys):
    assert main(argv) == 2
    err = capsys.readouterr().err
    assert "error: '--output=PWNED' is not a revision" in err
    assert not (repo / "PWNED").exists()


def test_git_is_always_told_where_its_options_end(repo, monkeypatch):
    import beamlang.tools.gitsource as gitsource
    calls = []
    real = gitsource.subprocess.run
    monkeypatch.setattr(gitsource.subprocess, "run", lambda argv, **kw: calls.append(argv) or real(argv, **kw))
    gitsource.files_at("HEAD", ["beams"])
    gitsource.read_revision("HEAD", "beams/b3.beam")
    for argv in calls:
        if argv[1] in ("show", "ls-tree"):
            assert "--end-of-options" in argv and argv.index("--end-of-options") < argv.index(
                next(a for a in argv if a.startswith("HEAD")))


@pytest.fixture
def repo_fixing_an_error(repo):
    """HEAD~1 has a member with an input error that HEAD fixes."""
    b3 = repo / "beams" / "b3.beam"
    good = b3.read_text(encoding="utf-8")
    b3.write_text(good.replace("span 5.4 m", "span 5.4"), encoding="utf-8")
    git(repo, "commit", "-qam", "broken")
    b3.write_text(good, encoding="utf-8")
    git(repo, "commit", "-qam", "fixed")
    return repo


def test_an_old_side_with_input_errors_is_reported_and_the_diff_goes_on(repo_fixing_an_error, capsys):
    git(repo_fixing_an_error, "rm", "-q", "beams/ca1.beam")
    code, out = run(capsys, "diff", "--rev", "HEAD~1", "--format", "json")
    assert code == 0
    members = {m["name"]: m for m in json.loads(out)["members"]}
    assert members["beams/b3.beam"]["status"] == "invalid before"
    assert members["beams/b3.beam"]["input_errors"] == ["HEAD~1:beams/b3.beam:12:6: this number needs its unit"]
    assert members["beams/b3.beam"]["checks"] and all(c["pass_before"] is None
                                                      for c in members["beams/b3.beam"]["checks"])
    assert members["beams/ca1.beam"]["status"] == "removed"  # the other member is still compared
    text = run(capsys, "diff", "--rev", "HEAD~1")[1]
    assert "beams/b3.beam: invalid before\n  input error HEAD~1:beams/b3.beam:12:6: this number needs its unit\n" in text


def test_a_new_side_with_input_errors_is_a_regression(repo, capsys):
    b3 = repo / "beams" / "b3.beam"
    b3.write_text(b3.read_text(encoding="utf-8").replace("span 5.4 m", "span 5.4"), encoding="utf-8")
    code, out = run(capsys, "diff", "--rev", "HEAD", "--fail-on", "regression")
    assert code == 1
    assert "beams/b3.beam: invalid now\n" in out and "beams/ca1.beam: unchanged" in out


def test_build_since_an_invalid_revision_still_builds(repo_fixing_an_error, capsys):
    assert main(["build", "beams", "-o", "out", "--since", "HEAD~1"]) == 1  # the heavier load fails a check
    text = (repo_fixing_an_error / "out" / "B-3" / "B-3.md").read_text(encoding="utf-8")
    section = text.split("## Changes since HEAD\\~1\n", 1)[1].split("\n## ", 1)[0]
    assert section.startswith("\nThe file had input errors at this revision; every check is shown as new.")
    assert "this number needs its unit" in section
    assert (repo_fixing_an_error / "out" / "CA-1" / "CA-1.md").is_file()


def test_reformat_only_commit_is_no_design_change(repo, capsys):
    b3 = repo / "beams" / "b3.beam"
    b3.write_text(b3.read_text(encoding="utf-8").replace("span 5.4 m", "span   5.4 m  # checked on site"), encoding="utf-8")
    git(repo, "commit", "-qam", "comment")
    code, out = run(capsys, "diff", "HEAD~1:beams/b3.beam", "beams/b3.beam", "--fail-on", "regression")
    assert (code, out) == (0, "beams/b3.beam: changed (no change to the design)\n")


def test_bad_revision_is_an_input_error(repo, capsys):
    assert main(["diff", "nosuchrev:beams/b3.beam", "beams/b3.beam"]) == 2
    assert "error:" in capsys.readouterr().err


def test_junit_counts_match(repo, capsys, tmp_path):
    (repo / "beams" / "bad.beam").write_text("span 4\n", encoding="utf-8")
    report = tmp_path / "junit.xml"
    assert main(["check", "beams", "--junit", str(report)]) == 2
    root = ET.parse(report).getroot()
    cases = root.findall(".//testcase")
    failures, errors = root.findall(".//failure"), root.findall(".//error")
    assert int(root.get("tests")) == len(cases) == 4 + 4 + 1
    assert int(root.get("failures")) == len(failures) >= 1 and int(root.get("errors")) == len(errors) == 1
    assert failures[0].get("message").startswith("actual ") and "ratio" in failures[0].get("message")
    assert "this number needs its unit" in errors[0].text


def test_build_since_adds_the_changes_section(repo, capsys):
    assert main(["build", "beams", "-o", "out", "--since", "HEAD~1"]) == 1  # the heavier load fails a check
    text = (repo / "out" / "B-3" / "B-3.md").read_text(encoding="utf-8")
    section = text.split("## Changes since HEAD\\~1\n", 1)[1].split("\n## ", 1)[0]
    assert "| **PASS -> FAIL** |" in section and "| changed | section depth | `250 mm` | `200 mm` | 14 |" in section
    other = (repo / "out" / "CA-1" / "CA-1.md").read_text(encoding="utf-8")
    assert "## Changes since HEAD\\~1\n\nNo change." in other


def _pair(tmp_path, old: str, new: str):
    (tmp_path / "old.beam").write_text(old, encoding="utf-8")
    (tmp_path / "new.beam").write_text(new, encoding="utf-8")
    return str(tmp_path / "old.beam"), str(tmp_path / "new.beam")


def test_changes_below_the_printed_precision_are_not_listed(tmp_path, capsys):
    # A 1 mN force beside a 12 kN one moves every live result by about 1e-7 of itself: exact rational dust that
    # printed to four digits used to read "-4.074 mm -> -4.074 mm (-0.0 %)". The input change is still listed.
    text = (EXAMPLES / "mezzanine-edge-beam.beam").read_text(encoding="utf-8")
    dust = text.replace("  point 12 kN down at 2.0 m\n", "  point 12 kN down at 2.0 m\n  point 1 mN down at 1 m\n")
    code, out = run(capsys, "diff", *_pair(tmp_path, text, dust))
    assert code == 0
    assert "  added    case live: point load: point 1 mN down at 1 m  (line 25)" in out
    assert "result" not in out  # every result prints as it did
    _, js = run(capsys, "diff", *_pair(tmp_path, text, dust), "--format", "json")
    assert json.loads(js)["members"][0]["results"] == []
    visible = text.replace("point 12 kN down", "point 12.1 kN down")
    _, out = run(capsys, "diff", *_pair(tmp_path, text, visible))
    assert "  result   live: max down deflection -4.074 mm -> " in out
    assert "  result   dead:" not in out  # the dead case is exactly the same: unchanged, not listed


def test_reactions_are_named_by_their_support_as_check_names_them(tmp_path, capsys):
    text = (EXAMPLES / "mezzanine-edge-beam.beam").read_text(encoding="utf-8")
    old, new = _pair(tmp_path, text, text.replace("point 12 kN down", "point 20 kN down"))
    assert main(["check", new]) == 0
    header = next(line for line in capsys.readouterr().out.splitlines() if "reactions at" in line)
    assert header.endswith("reactions at 0, 5.4 m")
    _, out = run(capsys, "diff", old, new)
    reactions = [line.split(": ", 1)[1] for line in out.splitlines() if line.startswith("  result") and ": reaction" in line]
    assert [r.split(" kN")[0].rsplit(" ", 1)[0] for r in reactions] == ["reaction at 0 m", "reaction at 5.4 m"] * 3
    assert "support 1" not in out
    _, md = run(capsys, "diff", old, new, "--format", "markdown")
    assert "| live | reaction at 5.4 m | " in md


def test_a_fixed_support_also_shows_its_reaction_moment(tmp_path, capsys):
    text = (EXAMPLES / "canopy-cantilever.beam").read_text(encoding="utf-8")
    _, out = run(capsys, "diff", *_pair(tmp_path, text, text.replace("point 0.35 kN down", "point 0.5 kN down")))
    assert any(line.startswith("  result   ") and ": reaction moment at 0 m " in line for line in out.splitlines())


def test_a_tiny_visible_change_keeps_its_digits():
    from beamlang.tools.diffout import _percent
    assert (_percent(2.5), _percent(-0.04), _percent(0.0123)) == ("+2.5 %", "-0.04 %", "+0.012 %")


def test_a_renamed_designation_is_an_input_change_not_a_design_change(tmp_path, capsys):
    text = (EXAMPLES / "floor-joist-sized-us.beam").read_text(encoding="utf-8")
    _, out = run(capsys, "diff", *_pair(tmp_path, text, text.replace('section "2x10"', 'section "2x10 No. 2"')))
    assert out.splitlines()[1:] == ["  changed  section designation: 2x10 -> 2x10 No. 2  (line 13)"]
    assert "(no change to the design)" in out.splitlines()[0]

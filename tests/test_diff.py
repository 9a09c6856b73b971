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
    assert "### beams/ca1.beam: changed (no change to the design)" in md
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
    assert "beams/b3.beam: changed (no change to the design)" in out


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

"""The layers contract in pyproject.toml (import-linter): kept by the code, and broken by a back-import."""

from __future__ import annotations

import shutil
import subprocess
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]


def _lint(root: Path) -> subprocess.CompletedProcess:
    probe = "import sys; from importlinter.cli import lint_imports_command; sys.exit(lint_imports_command())"
    return subprocess.run([sys.executable, "-c", probe], cwd=root, capture_output=True, text=True,
                          env={"PYTHONPATH": str(root), "PATH": "/usr/bin:/bin"})


def test_the_stages_keep_their_layers():
    done = _lint(ROOT)
    assert done.returncode == 0, done.stdout + done.stderr
    assert "Contracts: 2 kept, 0 broken." in done.stdout


def test_a_back_import_breaks_the_contract(tmp_path):
    # an engine module that imports the report, and a report module that imports the engine directly
    shutil.copytree(ROOT / "beamlang", tmp_path / "beamlang", ignore=shutil.ignore_patterns("__pycache__"))
    shutil.copy(ROOT / "pyproject.toml", tmp_path / "pyproject.toml")
    solve = tmp_path / "beamlang" / "engine" / "solve.py"
    solve.write_text(solve.read_text() + "\nfrom beamlang.report import tex  # noqa: E402\n")
    html = tmp_path / "beamlang" / "report" / "html.py"
    html.write_text(html.read_text() + "\nfrom beamlang.engine import roots  # noqa: E402\n")
    done = _lint(tmp_path)
    assert done.returncode != 0
    assert "beamlang.engine is not allowed to import beamlang.report" in done.stdout
    assert "beamlang.report.html -> beamlang.engine.roots" in done.stdout
    assert "Contracts: 0 kept, 2 broken." in done.stdout

"""The grammar and every module ship inside the wheel; the grammar is found after a plain, non-editable install."""

from __future__ import annotations

import subprocess
import sys
import zipfile
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent


def test_wheel_contains_grammar_and_installed_copy_finds_it(tmp_path):
    wheels = tmp_path / "wheels"
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "--no-build-isolation", "-q",
                    "-w", str(wheels), str(ROOT)], check=True, cwd=tmp_path)
    wheel = next(wheels.glob("beamlang-*.whl"))
    names = zipfile.ZipFile(wheel).namelist()
    assert "beamlang/grammar/beam.lark" in names
    modules = {p.relative_to(ROOT).as_posix() for p in (ROOT / "beamlang").rglob("*.py")}
    assert modules - set(names) == set()  # every module ships (a folder named like an ignored one too)
    target = tmp_path / "site"
    subprocess.run([sys.executable, "-m", "pip", "install", "--no-deps", "-q", "--target", str(target), str(wheel)],
                   check=True, cwd=tmp_path)
    probe = ("import beamlang.language.parse as p, beamlang.language.grammar as g; print(g.grammar_path()); "
             "from beamlang.source import Source; p.parse(Source('x', 'span 1 m\\n')); print('ok'); "
             "from beamlang.report.package import code_hash; print(code_hash())")
    out = subprocess.run([sys.executable, "-c", probe], cwd=tmp_path, capture_output=True, text=True,
                         env={"PYTHONPATH": str(target), "PATH": "/usr/bin:/bin"}, check=True).stdout.split()
    assert Path(out[0]).resolve().is_relative_to(target.resolve()) and out[1] == "ok"
    from beamlang.report.package import code_hash
    assert out[2] == code_hash()  # the same tool installed or checked out: packages built by either are up to date

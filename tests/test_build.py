"""`beamlang build`: byte-identical rebuilds, `out/` kept current, atomic and safe output, escaped user text."""

from __future__ import annotations

import os
import re
import subprocess
import sys
import xml.etree.ElementTree as ET
from pathlib import Path

import pytest
from hypothesis import HealthCheck, given, settings

from beamlang.cli import main
from beamlang.report import package
from beamlang.report.html import check_mathml
from beamlang.report.provenance import LIBRARIES, versions_text
from casefiles import EXAMPLES
from engine_helpers import analyse_text, member_text
from strategies import members

ROOT = EXAMPLES.parent


def _tree(folder: Path) -> dict[str, bytes]:
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


def _build(out: Path, seed: str, jobs: int = 1) -> dict[str, bytes]:
    env = dict(os.environ, PYTHONHASHSEED=seed)
    subprocess.run([sys.executable, "-m", "beamlang", "build", "examples", "-o", str(out), "--jobs", str(jobs)],
                   cwd=ROOT, env=env, check=True, capture_output=True)
    return _tree(out)


@pytest.fixture(scope="module")
def built(tmp_path_factory) -> dict[str, bytes]:
    return _build(tmp_path_factory.mktemp("a"), "1")


def _committed() -> dict[str, bytes]:
    return {k: v for k, v in _tree(ROOT / "out").items() if k != "README.md"}


def test_out_results_and_figures_are_current(built):
    """results.json and the SVG figures are beamlang's own output: they must match whatever library versions
    are installed."""
    committed = _committed()
    assert sorted(committed) == sorted(built), "rebuild out/ with: beamlang build examples -o out"
    for name in (n for n in built if n.endswith(("results.json", ".svg"))):
        assert committed[name] == built[name], f"out/{name} differs: rebuild out/ with: beamlang build examples -o out"


def test_out_packages_are_current(built):
    """Markdown and HTML also carry the bytes of sympy and the Markdown libraries: compared in full where the
    installed versions are the ones the committed packages name in their traceability section."""
    committed = _committed()
    stamp = re.search(r"built by beamlang \S+ with (.+?)\. Nothing", committed["B-3/B-3.md"].decode("utf-8"))
    assert stamp, "the committed package names no library versions"
    assert [part.rsplit(" ", 1)[0] for part in stamp.group(1).split(", ")] == list(LIBRARIES)
    if stamp.group(1) != versions_text():
        pytest.skip(f"out/ was built with {stamp.group(1)}; installed: {versions_text()}")
    for name, data in built.items():
        assert committed[name] == data, f"out/{name} differs: rebuild out/ with: beamlang build examples -o out"


def test_rebuild_in_another_process_is_byte_identical(built, tmp_path):
    assert _build(tmp_path / "b", "2", jobs=2) == built  # other hash seed, two worker processes


def test_package_has_every_file_and_valid_math(built):
    marks = {name.split("/")[0] for name in built}
    assert marks == {"B-3", "CA-1", "FB-1", "G-5", "HR-1", "J-12", "J-14", "J-22", "L-4", "MF-2", "P-7", "P-9", "SH-2"}
    for mark in marks:
        assert {f"{mark}/{mark}.md", f"{mark}/{mark}.html", f"{mark}/results.json",
                f"{mark}/figures/sign-convention.svg"} <= set(built)
        page = built[f"{mark}/{mark}.html"].decode("utf-8")
        assert check_mathml(page) > 20 and "<script" not in page
        assert '<pre class="beam-code"><code><span class="ln"> 1  </span>' in page  # highlighted appendix
        text = built[f"{mark}/{mark}.md"].decode("utf-8")
        for heading in ("## Summary", "## Inputs", "## Sign convention", "## Section and material", "## Method",
                        "## Checks", "## Independent cross-check", "## Assumptions and cautions", "## Traceability"):
            assert heading in text
        assert "qualified, licensed engineer" in text


def test_user_text_is_escaped(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    title = '<script>alert(1)</script> "><img src=x onerror=alert(2)> [link](http://x) ![img](y.png) $5'
    text = member_text("4 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]},
                       extra=['note "<b>bold</b> *not emphasis*"']).replace('"Test beam"', '"' + title.replace('"', '\\"') + '"')
    (tmp_path / "x.beam").write_text(text, encoding="utf-8")
    assert main(["build", "x.beam", "-o", "out"]) == 0
    page = (tmp_path / "out" / "T-1" / "T-1.html").read_text(encoding="utf-8")
    assert "<script>" not in page and "<img src=x" not in page and "<b>bold</b>" not in page
    assert '<a href="http://x"' not in page and 'src="y.png"' not in page
    assert "&lt;script&gt;alert(1)&lt;/script&gt;" in page


def test_failed_build_leaves_the_previous_package(tmp_path, monkeypatch):
    a = analyse_text(member_text("4 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]}))
    first = package.write_package(a, tmp_path)
    before = _tree(first)

    def broken(*_args):
        raise RuntimeError("disk full")
    monkeypatch.setattr(package, "package_files", broken)
    with pytest.raises(RuntimeError):
        package.write_package(a, tmp_path)
    assert _tree(first) == before
    assert sorted(p.name for p in tmp_path.iterdir()) == ["T-1"]  # no staging folder left behind


def test_symlink_in_output_is_replaced_not_followed(tmp_path):
    outside = tmp_path / "outside"
    outside.mkdir()
    (outside / "keep.txt").write_text("keep", encoding="utf-8")
    out = tmp_path / "out"
    out.mkdir()
    (out / "T-1").symlink_to(outside, target_is_directory=True)
    a = analyse_text(member_text("4 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]}))
    package.write_package(a, out)
    assert not (out / "T-1").is_symlink() and (out / "T-1" / "T-1.md").is_file()
    assert sorted(p.name for p in outside.iterdir()) == ["keep.txt"]


@pytest.mark.parametrize("mark,folder", [("B-3", "B-3"), ("CON", "CON_"), ("nul.x", "nul.x_"), ("com1", "com1_"),
                                         ("a.b", "a.b")])
def test_folder_names_are_safe(mark, folder):
    assert package.folder_name(mark) == folder


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(members())
def test_generated_members_build_complete_packages(text):
    # Every part of the package on random layouts (stepped members, hinges, springs, moving groups, slope
    # limits): figures parse, every formula renders to MathML, the page embeds every figure.
    a = analyse_text(text)
    files = package.package_files(a)
    mark = package.folder_name(a.loaded.member.mark)
    page = files[f"{mark}.html"].decode("utf-8")
    svgs = [name for name in files if name.endswith(".svg")]
    assert check_mathml(page) > 5 and page.count('src="data:image/svg+xml;base64,') == len(svgs)
    for name in svgs:
        ET.fromstring(files[name])
    assert "qualified, licensed engineer" in files[f"{mark}.md"].decode("utf-8")


def test_a_section_without_shear_properties_is_named_in_the_cautions():
    caution = "The shear stress is not checked where the section is given by its properties (input line 4) without"
    for section, named in (("properties I 8e7 mm^4 depth 300 mm", True), ("rectangle width 100 mm depth 200 mm", False)):
        a = analyse_text(member_text("4 m", ["pin at 0 m", "roller at span"], {"a": ["uniform 1 kN/m down"]},
                                     extra=["check stress a"], section=section))
        assert any(c.kind == "shear stress" for c in a.checks) is not named
        assert (caution in package.package_files(a)["T-1.md"].decode("utf-8")) is named

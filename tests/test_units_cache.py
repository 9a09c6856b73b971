"""The unit registry's cache is an accelerator only: one per install and version, filled whole, and any failure of it
(cut short by a kill, left by a removed install, a file in its place) means building the registry without it."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys
from fractions import Fraction
from pathlib import Path

import pytest

from beamlang.language import units


def _works(ureg) -> bool:
    return ureg.Quantity(Fraction(1), "kip").to("N").magnitude == Fraction(44482216152605, 10**10)  # NIST SP 811


@pytest.fixture
def cache(tmp_path, monkeypatch):
    monkeypatch.setenv("BEAMLANG_CACHE", str(tmp_path / "cache"))
    return tmp_path / "cache"


def test_the_cache_is_filled_whole_and_then_used(cache):
    assert _works(units.make_registry())
    (folder,) = cache.iterdir()  # no hidden staging folder is left beside it
    assert folder == units.cache_folder() and folder.name.startswith("units-")
    assert sorted(p.suffix for p in folder.iterdir()) and any(p.suffix == ".pickle" for p in folder.iterdir())
    assert _works(units.make_registry())


def test_a_cache_cut_short_by_a_kill_is_not_used(cache):
    units.make_registry()
    for pickle in units.cache_folder().glob("*.pickle"):
        data = pickle.read_bytes()
        pickle.write_bytes(data[: len(data) // 2])
    assert _works(units.make_registry())
    assert not units.cache_folder().exists()  # discarded; the next run fills it again
    assert _works(units.make_registry()) and units.cache_folder().is_dir()


def test_a_cache_of_garbage_is_not_used(cache):
    units.make_registry()
    for pickle in units.cache_folder().glob("*.pickle"):
        pickle.write_bytes(b"\x80\x05not a pickle")
    assert _works(units.make_registry())


@pytest.mark.parametrize("where", ["cache", "parent"])
def test_a_file_where_the_cache_goes_is_harmless(where, cache):
    if where == "cache":
        cache.write_text("a file, not a folder", encoding="utf-8")
    else:
        cache.mkdir()
        units.cache_folder().write_text("a file, not a folder", encoding="utf-8")
    assert _works(units.make_registry())


def test_the_cache_can_be_turned_off(monkeypatch, tmp_path):
    monkeypatch.setenv("BEAMLANG_CACHE", "off")
    assert units.cache_folder() is None
    assert _works(units.make_registry())


def test_a_removed_install_leaves_nothing_another_install_reads(tmp_path):
    """A second copy of pint (another virtual environment) fills its own cache and is deleted; this install
    still checks a member (the shared cache of before failed here with FileNotFoundError)."""
    import pint
    copy = tmp_path / "other-env"
    shutil.copytree(Path(pint.__file__).parent, copy / "pint")
    env = {**os.environ, "BEAMLANG_CACHE": str(tmp_path / "cache")}
    member = Path(__file__).resolve().parents[1] / "examples" / "lintel-propped.beam"
    code = "import sys; from beamlang.cli import main; sys.exit(main(['check', sys.argv[1]]))"
    other = subprocess.run([sys.executable, "-c", code, str(member)], capture_output=True, text=True, timeout=300,
                           env={**env, "PYTHONPATH": str(copy) + os.pathsep + env.get("PYTHONPATH", "")})
    assert other.returncode == 0, other.stderr
    assert len(list((tmp_path / "cache").iterdir())) == 1
    shutil.rmtree(copy)
    here = subprocess.run([sys.executable, "-c", code, str(member)], capture_output=True, text=True, timeout=300,
                          env=env)
    assert here.returncode == 0, here.stderr
    assert len(list((tmp_path / "cache").iterdir())) == 2  # one folder per install

"""Derived formulas kept between runs (the user's cache folder): a later process takes them instead of deriving
again, a damaged file is ignored, and a kept formula that does not fit the load at hand is never used."""

from __future__ import annotations

import pytest

from beamlang.engine import symbolic
from beamlang.language.frontend import from_source
from beamlang.source import Source

TEXT = """member T-2 "a propped span (invented)"
material E 200 GPa yield 250 MPa
section properties I 8e7 mm^4 depth 300 mm
span 7 m
support fixed at 0 m
support roller at span
case a
  point 9 kN down at 2.5 m
"""


@pytest.fixture
def fresh(monkeypatch, tmp_path):
    monkeypatch.setenv("BEAMLANG_CACHE", str(tmp_path / "cache"))
    symbolic._DERIVED.clear()
    yield tmp_path / "cache"
    symbolic._DERIVED.clear()


def _member(text: str = TEXT):
    return from_source(Source("t.beam", text), None).member


def test_a_later_run_takes_the_kept_formula_instead_of_deriving(fresh, monkeypatch):
    m = _member()
    first, names = symbolic.load_formula(m, m.cases[0].loads[0])
    assert len(list(fresh.glob("formulas-*/*.pickle"))) == 1
    symbolic._DERIVED.clear()  # as in a new process
    monkeypatch.setattr(symbolic, "_derive", lambda *_: pytest.fail("derived again"))
    again, names_again = symbolic.load_formula(m, m.cases[0].loads[0])
    assert again == first and names_again == names


def test_a_damaged_file_is_ignored_and_replaced(fresh):
    m = _member()
    first, _ = symbolic.load_formula(m, m.cases[0].loads[0])
    (kept,) = fresh.glob("formulas-*/*.pickle")
    kept.write_bytes(b"\x80\x04not a pickle")
    symbolic._DERIVED.clear()
    again, _ = symbolic.load_formula(m, m.cases[0].loads[0])
    assert again == first and kept.read_bytes().startswith(b"\x80")


def test_a_kept_formula_that_does_not_fit_is_not_used(fresh):
    """A kept formula of another layout, put in this layout's place, fails the exact check and is derived anew."""
    m = _member()
    other = _member(TEXT.replace("support fixed at 0 m", "support pin at 0 m"))
    right, _ = symbolic.load_formula(m, m.cases[0].loads[0])
    (kept,) = fresh.glob("formulas-*/*.pickle")
    symbolic._DERIVED.clear()
    wrong, _ = symbolic.load_formula(other, other.cases[0].loads[0])  # the simple span's formula
    for path in fresh.glob("formulas-*/*.pickle"):
        if path != kept:
            kept.write_bytes(path.read_bytes())  # the propped span's file now holds the simple span's formula
    symbolic._DERIVED.clear()
    again, _ = symbolic.load_formula(m, m.cases[0].loads[0])
    assert again == right and [e for *_, e in wrong] != [e for *_, e in right]


def test_no_cache_when_it_is_off(monkeypatch, tmp_path):
    monkeypatch.setenv("BEAMLANG_CACHE", "off")
    symbolic._DERIVED.clear()
    m = _member()
    symbolic.load_formula(m, m.cases[0].loads[0])
    assert symbolic._store_path(("any",)) is None
    symbolic._DERIVED.clear()


def test_a_new_version_folder_retires_all_but_the_most_recent_others(fresh):
    """Folders of earlier versions (a newer beamlang, an edited engine) do not pile up: when this version's folder
    is made, folders of the same kind but the newest few go; another kind's folders and hidden ones stay."""
    import os

    from beamlang.cache import KEPT_VERSIONS
    fresh.mkdir(parents=True)
    old = [fresh / f"formulas-old{k}" for k in range(6)]
    for k, folder in enumerate(old):
        folder.mkdir()
        (folder / "x.pickle").write_bytes(b"")
        os.utime(folder, (1_000_000 + k, 1_000_000 + k))  # old0 the least recently changed
    keep = [fresh / "units-1-pint-2-abc", fresh / ".formulas-new.123"]
    for folder in keep:
        folder.mkdir()
    m = _member()
    symbolic.load_formula(m, m.cases[0].loads[0])
    mine = [p for p in fresh.iterdir() if p.name.startswith("formulas-") and p not in old]
    assert len(mine) == 1 and any(mine[0].iterdir())
    left = sorted(p.name for p in fresh.iterdir() if p.name.startswith("formulas-old"))
    assert left == [f"formulas-old{k}" for k in range(6 - (KEPT_VERSIONS - 1), 6)]
    assert all(p.is_dir() for p in keep)

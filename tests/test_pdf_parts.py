"""A long member typeset in parts (report/pdf/parts.py, joined.py): one PDF whose sheets are numbered through the
member where one compile numbers them, whose tags and outline are those of one compile, and whose bytes are the same
when made again. The parts are forced here on an example (SPLIT_ABOVE = 0), whose one compile is the reference."""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest

import beamlang.report.pdf.parts as parts
from beamlang.cli import main
from beamlang.language.frontend import load
from beamlang.report.pdf import member_markup, member_pdf
from beamlang.report.pdf.joined import sheet_count

ROOT = Path(__file__).resolve().parents[1]
EXAMPLE = ROOT / "examples" / "continuous-purlin.beam"
poppler = pytest.mark.skipif(not shutil.which("pdftotext"), reason="poppler-utils is not installed")
WORD = re.compile(r'<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="([\d.]+)">([^<]*)<')


@pytest.fixture(scope="module")
def pdfs(tmp_path_factory):
    """The example's PDF of one compile (the build's) and the same member typeset in parts of about 8000 characters."""
    out = tmp_path_factory.mktemp("parts")
    assert main(["build", str(EXAMPLE), "-o", str(out)]) == 0
    member = load(EXAMPLE).member
    folder = out / member.mark
    markdown = (folder / f"{member.mark}.md").read_text(encoding="utf-8")
    svgs = {f"figures/{p.name}": p.read_text(encoding="utf-8") for p in (folder / "figures").iterdir()}
    saved = parts.SPLIT_ABOVE, parts.PART_CHARACTERS
    parts.SPLIT_ABOVE, parts.PART_CHARACTERS = 0, 8000
    try:
        assert len(parts.split(member_markup(markdown))) > 3
        split = member_pdf(member, markdown, svgs)
        again = member_pdf(member, markdown, svgs)
    finally:
        parts.SPLIT_ABOVE, parts.PART_CHARACTERS = saved
    (out / "parts.pdf").write_bytes(split)
    return folder / f"{member.mark}.pdf", out / "parts.pdf", again


def test_the_split_keeps_every_character_and_cuts_only_before_headings(monkeypatch):
    sections = ["#heading(level: 1)[M]\nintro\n"] + [f"#heading(level: 2)[S{k}]\n" + "x" * 30 + "\n" for k in range(6)]
    big = "#heading(level: 2)[Big]\n" + "".join(f"#heading(level: 3)[T{k}]\n" + "y" * 40 + "\n" for k in range(4))
    body = "".join(sections[:4]) + big + "".join(sections[4:])
    monkeypatch.setattr(parts, "SPLIT_ABOVE", len(body))
    assert parts.split(body) == [body]  # at most SPLIT_ABOVE: one part
    monkeypatch.setattr(parts, "SPLIT_ABOVE", 0)
    monkeypatch.setattr(parts, "PART_CHARACTERS", 100)
    cut = parts.split(body)
    assert "".join(cut) == body and len(cut) > 3
    assert all(c.startswith("#heading(level: 2)") or c.startswith("#heading(level: 3)") for c in cut[1:])
    assert all(len(c) <= 100 for c in cut)  # every piece here is shorter than a part
    assert any(c.startswith("#heading(level: 3)") for c in cut)  # the long section is cut at its level-3 headings
    assert sum(c.count("#heading(level: 3)[T0]") for c in cut) == 1


def test_a_typst_error_in_a_part_is_raised_again_as_typsts_error():
    import typst
    with pytest.raises(typst.TypstError, match="unclosed delimiter"):
        parts.typeset_apart("#foo(", {})


@poppler
def test_the_sheets_are_numbered_through_the_member_where_one_compile_numbers_them(pdfs):
    whole, split, _again = pdfs

    def numbers(pdf: Path) -> list[tuple[tuple[float, ...], str]]:
        pages = subprocess.run(["pdftotext", "-bbox", str(pdf), "-"], check=True, capture_output=True,
                               text=True).stdout.split("</page>")[:-1]
        found = []
        for page in pages:
            words = WORD.findall(page)
            at = [i for i, w in enumerate(words) if w[4] == "Sheet"]
            assert len(at) == 1, at  # one sheet number a sheet, none left from a part
            i = at[0]
            found.append((tuple(round(float(v), 2) for v in words[i][:2]), " ".join(w[4] for w in words[i:i + 4])))
        return found

    one, many = numbers(whole), numbers(split)
    assert [text for _at, text in many] == [f"Sheet {k} of {len(many)}" for k in range(1, len(many) + 1)]
    assert {at for at, _text in many} == {at for at, _text in one} and len({at for at, _ in one}) == 1
    assert len(many) == sheet_count(split.read_bytes()) >= len(one)


def _outline(pdf) -> list[tuple[int, str, int]]:
    found = []

    def walk(item, depth):
        while item is not None:
            found.append((depth, str(item.Title), int(item.get("/Count", 0))))
            if "/First" in item:
                walk(item.First, depth + 1)
            item = item.get("/Next")
    walk(pdf.Root.Outlines.First, 0)
    return found


def _tags(pdf) -> list[str]:
    """The structure elements' types in document order."""
    import pikepdf
    found, todo = [], [pdf.Root.StructTreeRoot.K[0]]
    while todo:
        element = todo.pop()
        found.append(str(element.S))
        kids = element.get("/K")
        kids = kids if isinstance(kids, pikepdf.Array) else [kids]
        todo.extend(k for k in reversed(list(kids)) if isinstance(k, pikepdf.Dictionary) and "/S" in k)
    return found


def test_the_joined_pdf_has_the_outline_and_tags_of_one_compile_and_is_well_formed(pdfs):
    import pikepdf
    whole, split, again = pdfs
    assert split.read_bytes() == again  # the same parts give the same bytes
    with pikepdf.open(whole) as one, pikepdf.open(split) as many:
        assert many.check_pdf_syntax() == []
        assert _outline(many) == _outline(one) and len(_outline(one)) > 10
        assert _tags(many) == _tags(one)
        tree = many.Root.StructTreeRoot
        pages = {page.obj.objgen for page in many.pages}
        elements = [o for o in many.objects if isinstance(o, pikepdf.Dictionary) and "/S" in o and "/P" in o]
        assert all(e.Pg.objgen in pages for e in elements if "/Pg" in e)  # every tag on a sheet of this PDF
        nums = list(tree.ParentTree.Nums)
        keys = [int(k) for k in nums[::2]]
        assert keys == sorted(int(page.obj.StructParents) for page in many.pages) == list(range(len(many.pages)))
        assert int(tree.ParentTreeNextKey) == len(many.pages)
        names = [str(n) for n in list(tree.IDTree.Names)[::2]]
        assert names == sorted(names, key=lambda s: s.encode()) and len(set(names)) == len(names) > 0
        ids = {str(e.ID) for e in elements if "/ID" in e}
        assert ids == set(names)
        attributes = [a for e in elements if "/A" in e
                      for a in (e.A if isinstance(e.A, pikepdf.Array) else [e.A]) if isinstance(a, pikepdf.Dictionary)]
        headers = {str(h) for a in attributes for h in a.get("/Headers", [])}
        assert headers and headers <= ids  # every table cell's header names a cell of this PDF
        assert f"<xmpTPg:NPages>{len(many.pages)}</xmpTPg:NPages>".encode() in many.Root.Metadata.read_bytes()
        assert str(many.docinfo.Title) == str(one.docinfo.Title)


@poppler
def test_a_member_typeset_in_parts_takes_its_place_in_the_calc_set(pdfs, tmp_path):
    import json

    from beamlang.report.pdf.calcset import write_set
    whole, split, _again = pdfs
    folder = tmp_path / "set"
    shutil.copytree(whole.parent, folder / whole.parent.name)
    (folder / whole.parent.name / whole.name).write_bytes(split.read_bytes())
    assert write_set(folder, [whole.parent.name], "a4")
    record = json.loads((folder / "index.json").read_text(encoding="utf-8"))
    own = sheet_count(split.read_bytes())
    assert record["sheets"] == own + 1 and record["members"][0]["sheets"] == [2, own + 1]
    pages = subprocess.run(["pdftotext", "-layout", str(folder / "calc-set.pdf"), "-"], check=True,
                           capture_output=True, text=True).stdout.split("\f")[:-1]
    for s, page in enumerate(pages[1:], start=2):
        flat = " ".join(page.split())
        assert f"Sheet {s - 1} of {own}" in flat and f"Set sheet {s} of {own + 1}" in flat, s

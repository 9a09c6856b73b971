"""The PDF sheets, read back from the built files with poppler (pdftotext, pdfinfo) and typst's own layout query:
a title block with the right "Sheet k of N" on every sheet, nothing past the right margin, tables kept on one
sheet, every formula typeset as math, fixed dates, byte-identical rebuilds; the calc set's member sheets are the
members' own sheets with the set sheet number added."""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest

from beamlang.cli import main
from beamlang.language.frontend import load
from beamlang.report.html import MathError, _markdown
from beamlang.report.pdf import member_source, pdf_figures
from beamlang.report.pdf.math import to_typst
from beamlang.report.pdf.sheet import MARGINS, query
from beamlang.tools.history import fallback_date

ROOT = Path(__file__).resolve().parents[1]
EXAMPLES = sorted((ROOT / "examples").glob("*.beam"))
MM = 72 / 25.4
poppler = pytest.mark.skipif(not shutil.which("pdftotext"), reason="poppler-utils is not installed")


@pytest.fixture(scope="module")
def built(tmp_path_factory) -> Path:
    out = tmp_path_factory.mktemp("pdf")
    assert main(["build", str(ROOT / "examples"), "-o", str(out), "--jobs", "2"]) == 0
    return out


def _members(out: Path):
    for path in EXAMPLES:
        item = load(path)
        folder = out / item.member.mark
        yield item, folder, folder / f"{item.member.mark}.pdf"


def _pages(pdf: Path, mode: str = "-layout") -> list[str]:
    text = subprocess.run(["pdftotext", mode, str(pdf), "-"], check=True, capture_output=True, text=True).stdout
    return text.split("\f")[:-1]


def _layout(item, folder: Path) -> dict:
    markdown = (folder / f"{item.member.mark}.md").read_text(encoding="utf-8")
    svgs = {f"figures/{p.name}": p.read_text(encoding="utf-8") for p in (folder / "figures").iterdir()}
    source = member_source(item.member, markdown)
    return query(source, pdf_figures(svgs), "<bl-layout>")[0]["value"], query(source, pdf_figures(svgs),
                                                                             "math.equation"), markdown


@poppler
def test_every_sheet_has_the_title_block_and_its_number(built):
    for item, _folder, pdf in _members(built):
        fields = dict(item.member.fields)
        pages = _pages(pdf)
        info = subprocess.run(["pdfinfo", str(pdf)], check=True, capture_output=True, text=True).stdout
        assert f"Pages:           {len(pages)}" in info
        for k, page in enumerate(pages, start=1):
            flat = " ".join(page.split())
            assert f"Sheet {k} of {len(pages)}" in flat, (pdf.name, k)
            for label in ("PROJECT", "JOB", "MEMBER", "REVISION", "DATE", "BY", "CHECKED"):
                assert label in flat, (pdf.name, k, label)
            assert f"{item.member.mark}: {item.member.title}" in flat, (pdf.name, k)
            for name in ("project", "job", "by", "checked", "date", "revision"):
                if fields.get(name):
                    assert fields[name] in flat, (pdf.name, k, name)


@poppler
def test_no_word_lies_past_the_right_margin(built):
    word = re.compile(r'<page width="([\d.]+)"|<word xMin="([\d.]+)" yMin="[\d.]+" xMax="([\d.]+)"[^>]*>([^<]*)<')
    for _item, _folder, pdf in _members(built):
        html = subprocess.run(["pdftotext", "-bbox", str(pdf), "-"], check=True, capture_output=True,
                              text=True).stdout
        width = None
        for m in word.finditer(html):
            if m.group(1):
                width = float(m.group(1))
                continue
            right = width - MARGINS[0] / 2 * MM  # equal left and right margins
            assert float(m.group(3)) <= right + 0.5, f"{pdf.name}: {m.group(4)!r} ends at {m.group(3)} > {right}"
            assert float(m.group(2)) >= MARGINS[0] / 2 * MM - 0.5, f"{pdf.name}: {m.group(4)!r} starts left of it"


def test_tables_stay_on_one_sheet_and_every_formula_is_typeset(built):
    for item, folder, _pdf in _members(built):
        layout, equations, markdown = _layout(item, folder)
        assert layout["tables"], item.member.mark
        for kind, first, last in layout["tables"]:
            assert kind == "tall" or first == last, (item.member.mark, first, last)
        tokens = _markdown().parse(markdown)
        formulas = [t for t in tokens if t.type == "math_block"]
        formulas += [c for t in tokens for c in (t.children or []) if c.type == "math_inline"]
        assert len(equations) == len(formulas), item.member.mark  # each formula became one Typst equation
        assert all(factor > 0.3 for factor, _page in layout["shrunk"]), item.member.mark
        assert layout["members"] == [[item.member.mark, 1, layout["pages"]]]


def test_math_conversion_of_the_tex_beamlang_writes():
    assert to_typst(r"\frac{w L^{2}}{8}") == "frac(w L^(2), 8)"
    assert to_typst(r"7850\ \mathrm{kg}/\mathrm{m}^{3}") == '7850 thick "kg"\\/"m"^(3)'
    assert to_typst(r"\delta \le \frac{L}{360}") == "delta <= frac(L, 360)"
    assert to_typst(r"\begin{bmatrix}1 & 2 \\ 3 & 4\end{bmatrix}") == 'mat(delim: "[", 1, 2; 3, 4)'
    assert to_typst(r"\sqrt{a, b}") == "sqrt(a \\, b)"  # a comma inside an argument does not split it
    with pytest.raises(MathError, match="unknown TeX command"):
        to_typst(r"\SI{5}{kN}")
    with pytest.raises(MathError, match="missing"):
        to_typst(r"\frac{a}{b")


@poppler
def test_the_pdf_date_is_the_members_date_never_the_clock(built):
    for item, _folder, pdf in _members(built):
        info = subprocess.run(["pdfinfo", "-isodates", str(pdf)], check=True, capture_output=True, text=True).stdout
        date = dict(item.member.fields).get("date") or fallback_date(item.path)  # else the commit's date
        if date:
            assert re.search(rf"CreationDate:\s+{date}T00:00:00Z", info), pdf.name
        else:
            assert "CreationDate" not in info, pdf.name


@poppler
def test_paper_follows_the_unit_system(built):
    for item, _folder, pdf in _members(built):
        info = subprocess.run(["pdfinfo", str(pdf)], check=True, capture_output=True, text=True).stdout
        box = re.search(r"Page size:\s+([\d.]+) x ([\d.]+) pts", info)
        size = (round(float(box.group(1))), round(float(box.group(2))))
        assert size == ((612, 792) if item.member.units == "us" else (595, 842)), pdf.name


def test_a_paper_line_wins_over_the_unit_system(tmp_path):
    from beamlang.report.pdf import Options, paper_of
    text = (ROOT / "examples" / "lintel-propped.beam").read_text(encoding="utf-8")
    path = tmp_path / "x.beam"
    path.write_text(text.replace('project "Demo garden studio"', 'project "Demo garden studio"\npaper "letter"'),
                    encoding="utf-8")
    member = load(path).member
    assert member.units == "si" and paper_of(member, Options()) == "letter"
    assert paper_of(load(ROOT / "examples" / "lintel-propped.beam").member, Options(paper="letter")) == "letter"
    assert paper_of(load(ROOT / "examples" / "lintel-propped.beam").member, Options()) == "a4"


@poppler
def test_the_index_lists_every_member_with_its_governing_ratio_and_set_sheets(built):
    import json
    index = (built / "index.md").read_text(encoding="utf-8")
    record = json.loads((built / "index.json").read_text(encoding="utf-8"))
    pages = _pages(built / "calc-set.pdf")
    assert record["sheets"] == len(pages)
    assert "Calc set: contents" in pages[0] and "Set sheet 1 of" in " ".join(pages[0].split())
    listed = {m["mark"]: m for m in record["members"]}
    for item, folder, pdf in _members(built):
        results = json.loads((folder / "results.json").read_text(encoding="utf-8"))
        worst = max(c["ratio"] for c in results["checks"])
        row = next(line for line in index.splitlines() if line.startswith(f"| [{item.member.mark.replace('-', chr(92) + '-')}]"))
        assert f"| {worst:.3f} |" in row
        first, last = listed[item.member.mark]["sheets"]
        assert f"| {first} to {last} |" in row
        n = len(_pages(pdf))
        assert last - first + 1 == n
        for k, page in enumerate(pages[first - 1:last], start=1):
            flat = " ".join(page.split())
            assert f"Sheet {k} of {n}" in flat and f"Set sheet {first + k - 1} of {len(pages)}" in flat
            assert f"{item.member.mark}: {item.member.title}" in flat
        contents = " ".join(" ".join(p.split()) for p in pages[:record["members"][0]["sheets"][0] - 1])
        assert item.member.mark in contents and f"{worst:.3f}" in contents and f"{first} to {last}" in contents
    assert len(listed) == len(EXAMPLES)


@poppler
def test_a_members_set_sheets_are_its_own_sheets_with_the_set_number_added(built):
    import json
    record = json.loads((built / "index.json").read_text(encoding="utf-8"))
    whole = built / "calc-set.pdf"
    in_set = _pages(whole, "-raw")  # content order: the embedded sheet's text, then what the set draws over it
    listed = {m["mark"]: m["sheets"] for m in record["members"]}
    for item, _folder, pdf in _members(built):
        own = _pages(pdf, "-raw")
        first, last = listed[item.member.mark]
        assert last - first + 1 == len(own)
        for k, page in enumerate(own, start=1):
            s = first + k - 1
            assert "Set sheet" not in page and "single member" not in page, (pdf.name, k)  # nothing to contradict
            assert in_set[s - 1] == page + f"Set sheet {s} of {record['sheets']}\n", (pdf.name, k, s)
            assert _size(whole, s) == _size(pdf, k), (pdf.name, k)


@poppler
def test_the_set_is_well_formed_vector_and_the_same_bytes_when_written_again(built, tmp_path):
    import json

    import pikepdf

    from beamlang.report.pdf.calcset import write_set
    whole = built / "calc-set.pdf"
    with pikepdf.open(whole) as pdf:
        assert pdf.check_pdf_syntax() == []  # qpdf's check: syntax, cross-references, every stream decodes
        assert pdf.pdf_version == "1.7"
    if shutil.which("qpdf"):
        subprocess.run(["qpdf", "--check", str(whole)], check=True, capture_output=True)
    images = subprocess.run(["pdfimages", "-list", str(whole)], check=True, capture_output=True, text=True).stdout
    assert len(images.splitlines()) == 2  # the header only: no sheet is a picture, text and figures stay vector
    record = json.loads((built / "index.json").read_text(encoding="utf-8"))
    again = tmp_path / "again"
    shutil.copytree(built, again)
    (again / "index.json").unlink()
    assert write_set(again, [m["folder"] for m in record["members"]], record["paper"])
    assert (again / "calc-set.pdf").read_bytes() == whole.read_bytes()
    assert (again / "index.json").read_bytes() == (built / "index.json").read_bytes()


@poppler
def test_the_set_number_lands_in_the_calc_set_cell_when_the_title_block_rows_wrap(tmp_path):
    text = (ROOT / "examples" / "lintel-propped.beam").read_text(encoding="utf-8")
    long = " ".join(["a long name that wraps"] * 6)
    src = tmp_path / "src"
    src.mkdir()
    (src / "l.beam").write_text(text.replace('"Workshop door lintel"', f'"{long}"')
                                .replace('project "Demo garden studio"', f'project "{long}"'), encoding="utf-8")
    assert main(["build", str(src), "-o", str(tmp_path / "out")]) == 0
    word = re.compile(r'<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="[\d.]+" yMax="([\d.]+)">([^<]*)<')
    pages = subprocess.run(["pdftotext", "-bbox", str(tmp_path / "out" / "calc-set.pdf"), "-"], check=True,
                           capture_output=True, text=True).stdout.split("</page>")[:-1]
    own = subprocess.run(["pdftotext", "-bbox", str(tmp_path / "out" / "L-4" / "L-4.pdf"), "-"], check=True,
                         capture_output=True, text=True).stdout.split("</page>")[:-1]
    assert len(pages) == len(own) + 1
    for s, page in enumerate(pages[1:], start=2):
        words = [(float(x), float(top), float(bottom), w) for x, top, bottom, w in word.findall(page)]
        label = next(i for i, (*_box, w) in enumerate(words) if w == "CALC" and words[i + 1][3] == "SET")
        number = next(i for i, (*_box, w) in enumerate(words) if w == "Set" and words[i + 1][3] == "sheet")
        assert [w for *_box, w in words[number:number + 5]] == ["Set", "sheet", str(s), "of", str(len(pages))]
        assert abs(words[number][0] - words[label][0]) < 0.5, s  # the value's column: the label's
        assert 0 < words[number][1] - words[label][2] < 4, s  # its line: the one below the label
        block = next(top for _x, top, _bottom, w in words if w == "PROJECT")
        assert len({top for _x, top, _bottom, w in words if w == "wraps" and top > block}) == 4, s  # rows wrap


def _size(pdf: Path, k: int) -> str:
    info = subprocess.run(["pdfinfo", "-f", str(k), "-l", str(k), str(pdf)], check=True, capture_output=True,
                          text=True).stdout
    return re.search(rf"Page\s+{k} size:\s+(.*)", info).group(1)


def test_an_unchanged_member_is_not_rebuilt(tmp_path, capsys):
    source = (ROOT / "examples" / "lintel-propped.beam").read_text(encoding="utf-8")
    src = tmp_path / "src"
    src.mkdir()
    (src / "l.beam").write_text(source, encoding="utf-8")
    out = tmp_path / "out"
    assert main(["build", str(src), "-o", str(out)]) == 0
    first = {p: p.stat().st_mtime_ns for p in out.rglob("*") if p.is_file()}
    capsys.readouterr()
    assert main(["build", str(src), "-o", str(out)]) == 0
    assert "up to date" in capsys.readouterr().err
    assert {p: p.stat().st_mtime_ns for p in out.rglob("*") if p.is_file()} == first  # nothing written again
    assert main(["build", str(src), "-o", str(out), "--paper", "letter"]) == 0  # another option: rebuilt
    assert "built " in capsys.readouterr().err
    (src / "l.beam").write_text(source.replace("span 1.8 m", "span 1.9 m"), encoding="utf-8")
    assert main(["build", str(src), "-o", str(out), "--paper", "letter"]) == 0  # another input: rebuilt
    err = capsys.readouterr().err
    assert "built " in err and "wrote" in err


@poppler
def test_revisions_from_the_field_and_git_history_with_changed_values_marked(tmp_path, monkeypatch):
    def git(*args):
        subprocess.run(["git", *args], cwd=tmp_path, check=True, capture_output=True)
    text = (ROOT / "examples" / "lintel-propped.beam").read_text(encoding="utf-8")
    member = tmp_path / "m" / "l.beam"
    member.parent.mkdir()
    member.write_text(text.replace('project "Demo garden studio"', 'project "Demo garden studio"\nrevision "A"\n'
                                   'by "A. Author"\ndate "2026-11-01"'), encoding="utf-8")
    git("init", "-q")
    git("-c", "user.email=a@example.org", "-c", "user.name=A", "add", ".")
    git("-c", "user.email=a@example.org", "-c", "user.name=A", "commit", "-qm", "first issue")
    member.write_text(member.read_text(encoding="utf-8").replace('revision "A"', 'revision "B"')
                      .replace("diameter 80 mm", "diameter 70 mm"), encoding="utf-8")
    monkeypatch.chdir(tmp_path)
    assert main(["build", "m", "-o", "out"]) == 0
    page = _pages(tmp_path / "out" / "L-4" / "L-4.pdf")[0]
    flat = " ".join(page.split())
    assert "Revisions" in flat and "A 2026-11-01 A. Author first issue" in flat
    assert "section diameter: 80 mm -> 70 mm" in flat
    # the new ratio is the one this build reports; I falls as d^4, the self-weight only as d^2, so the deflection
    # ratio grows by less than (80/70)^4
    import json
    checks = json.loads((tmp_path / "out" / "L-4" / "results.json").read_text(encoding="utf-8"))["checks"]
    new = next(c["ratio"] for c in checks if c["kind"] == "deflection")
    assert 0.093 < new < 0.0928 * (80 / 70) ** 4
    assert f"deflection dead (span/500, span 1): ratio 0.093 -> {new:.3f}" in flat
    section_line = next(i for i, line in enumerate(member.read_text().splitlines(), 1) if line.startswith("section"))
    marked = [" ".join(line.split()) for line in page.splitlines() if line.replace(" ", "").startswith("▲B")]
    assert f"▲B {section_line} section round diameter 70 mm 70 mm 0.07 m" in marked  # the input's row
    assert any(m.startswith("▲B deflection, span 1") and f"{new:.3f} (governs)" in m for m in marked)  # its ratio

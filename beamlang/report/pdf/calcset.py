"""Calc set: the built packages of a project (their build.json records) -> index.md, index.html and calc-set.pdf.

The set PDF opens with a contents sheet (every member, its section, governing check and ratio, status and its
sheets in the set), then every member's sheets; each sheet is numbered within its member and through the set.
It is made from the packages on disk (the contents and the set numbers typeset, every member sheet copied from the
member's own PDF with its number laid over it, `overlay.py`), so members that an incremental build left alone are in
it too."""

from __future__ import annotations

import hashlib
import json
from concurrent.futures import ThreadPoolExecutor
from importlib.metadata import version
from pathlib import Path

from beamlang import __version__
from beamlang.report.pdf import member_info
from beamlang.report.pdf.markup import text
from beamlang.report.pdf.overlay import laid_over
from beamlang.report.pdf.joined import sheet_count
from beamlang.report.pdf.sheet import Info, bl_member, body_size, compile_pdf, document, iso_date, typst_paper
from beamlang.report.tex import cell, md

SET_PDF = "calc-set.pdf"
SET_RECORD = "index.json"
COLUMNS = ("member", "title", "section", "governing check", "ratio", "status", "sheets in the set")


def _records(out: Path, folders: list[str]) -> list[dict]:
    return [json.loads((out / f / "build.json").read_text(encoding="utf-8")) | {"folder": f} for f in sorted(folders)]


class _Member:
    """What `member_info` needs of a member, read back from its record."""

    def __init__(self, rec: dict) -> None:
        self.mark, self.title, self.fields = rec["mark"], rec["title"], tuple(rec["fields"].items())


def _common(records: list[dict], name: str) -> str:
    """The members' common value of a title-block field, or a pointer to their own sheets."""
    values = sorted({r["fields"].get(name, "") for r in records})
    return values[0] if len(values) == 1 else "several: see each member's sheets"


def _status(rec: dict) -> str:
    return "no checks" if not rec["checks"] else ("PASS" if rec["passed"] == rec["checks"] else "FAIL")


def _ratio(rec: dict) -> str:
    return "-" if rec["governing"] is None else f"{rec['governing']['ratio']:.3f}"


def _contents(records: list[dict], counts: list[int]) -> str:
    rows = []
    for rec, n, after in zip(records, counts, _after(counts)):
        gov = rec["governing"]["check"] if rec["governing"] else "-"
        rows.append(", ".join([*(f"[{text(v)}]" for v in (rec["mark"], rec["title"], rec["section"], gov,
                                                          _ratio(rec), _status(rec))), f"bl-set-range({n}, {after})"]))
    header = ", ".join(f"[{text(c)}]" for c in COLUMNS)
    n = len(records)
    summary = (f"{n} member{'s' * (n != 1)}; {sum(_status(r) == 'PASS' for r in records)} pass every check, "
               f"{sum(_status(r) == 'FAIL' for r in records)} fail a check.")
    return (f"#heading(level: 1)[Calc set: contents]\n\n{text(summary)} {text(_CAUTION)}\n\n"
            f"#bl-table({len(COLUMNS)}, tall: true, ({header},), (\n  " + ",\n  ".join(rows) + ",\n))\n")


def _after(counts: list[int]) -> list[int]:
    """For each member, the sheets of the set from its first to the end (its own and those after it)."""
    return [sum(counts[i:]) for i in range(len(counts))]


_CAUTION = ("Each member's package states its assumptions, what it does not check and its cautions; the set is to be "
            "reviewed by a qualified licensed engineer against the governing local code.")


def _ranges(first: int, counts: list[int]) -> list[tuple[int, int]]:
    ranges = []
    for n in counts:
        ranges.append((first, first + n - 1))
        first += n
    return ranges


def set_source(records: list[dict], counts: list[int], paper: str) -> str:
    """The set's frame in Typst: the contents sheets, then for each member as many pages as it has sheets (`counts`),
    each carrying only its set sheet number, to be laid over the member's own sheet (`overlay.laid_over`).

    Each member's sheets in the set are counted back from the set's last sheet (its sheets and those after it), so
    the contents' own sheet count, which the numbers depend on, is settled by Typst within the one compile."""
    dates = sorted(d for r in records if (d := r["fields"].get("date", "")) and iso_date(d))
    info = Info(project=_common(records, "project"), job=_common(records, "job"), mark="Calc set",
                title="contents", by=_common(records, "by"), checked=_common(records, "checked"),
                date=dates[-1] if dates else "", revision="", tool=f"beamlang {__version__}")
    date = iso_date(dates[-1]) if dates else None
    members = ",\n  ".join(
        f"({typst_paper(r['paper'])}, {body_size(r['paper'])}.width, {member_info(_Member(r)).typst()}, {n}, {after})"
        for r, n, after in zip(records, counts, _after(counts)))
    body = bl_member(info, paper, _contents(records, counts)) + f"#bl-set-sheets((\n  {members},\n))\n"
    return document(body, paper, f"Calc set: {info.project}", date, in_set=True)


def index_markdown(records: list[dict], sheets: list[tuple[int, int]], link: str) -> str:
    """The project index; `link` is the extension the member names link to (md or html)."""
    lines = ["# Calc set: contents", "", f"Every member built into this folder; the sheets are those of `{SET_PDF}`.",
             "", "| " + " | ".join(COLUMNS) + " |", "|" + "---|" * len(COLUMNS)]
    for rec, (first, last) in zip(records, sheets):
        gov = md(rec["governing"]["check"]) if rec["governing"] else "-"
        name = f"[{md(rec['mark'])}]({rec['folder']}/{rec['folder']}.{link})"
        lines.append("| " + " | ".join([name, cell(md(rec["title"])), cell(md(rec["section"])), cell(gov),
                                        _ratio(rec), _status(rec), f"{first} to {last}"]) + " |")
    return "\n".join(lines + ["", md(_CAUTION), ""])


def write_set(out: Path, folders: list[str], paper: str) -> list[Path]:
    """index.md, index.html, index.json and calc-set.pdf for the packages in `folders` (names under `out`);
    nothing is written when the members, the paper and pikepdf (which writes the set) are those of the last set
    (index.json's key)."""
    from beamlang.report.html import member_html
    records = _records(out, folders)
    key = hashlib.sha256(json.dumps([paper, [[r["folder"], r["key"]] for r in records],
                                     version("pikepdf")]).encode()).hexdigest()
    try:
        if json.loads((out / SET_RECORD).read_text(encoding="utf-8"))["key"] == key and (out / SET_PDF).is_file():
            return []
    except (OSError, ValueError, KeyError):
        pass
    own = [out / r["folder"] / f"{r['folder']}.pdf" for r in records]
    counts = [sheet_count(path.read_bytes()) for path in own]
    with ThreadPoolExecutor(max_workers=1) as typesetter:  # typst runs without the GIL, beside the copying
        frame = typesetter.submit(compile_pdf, set_source(records, counts, paper), {})
        pdf = laid_over(frame.result, own)
    total = sheet_count(frame.result())
    sheets = _ranges(total - sum(counts) + 1, counts)
    index = {"key": key, "paper": paper, "sheets": total,
             "members": [{"mark": r["mark"], "folder": r["folder"], "section": r["section"],
                          "governing": r["governing"], "status": _status(r), "sheets": list(s)}
                         for r, s in zip(records, sheets)]}
    written = {"index.md": index_markdown(records, sheets, "md").encode("utf-8"),
               "index.html": member_html(index_markdown(records, sheets, "html"), "Calc set: contents",
                                         {}).encode("utf-8"),
               SET_PDF: pdf, SET_RECORD: (json.dumps(index, indent=2, sort_keys=True) + "\n").encode("utf-8")}
    paths = []
    for name, data in written.items():
        path = out / name
        tmp = path.with_name(f".{name}.tmp")
        tmp.write_bytes(data)
        tmp.replace(path)
        paths.append(path)
    return paths

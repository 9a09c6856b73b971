"""Package: Analysis -> OUT/<mark>/ with <mark>.md, <mark>.html, <mark>.pdf, figures/*.svg, results.json and
build.json (the record of what it was built from, for incremental builds and the project index), written atomically."""

from __future__ import annotations

import hashlib
import json
import os
import shutil
import tempfile
from functools import lru_cache
from pathlib import Path

from beamlang.pipeline import Analysis
from beamlang.report.jsonout import member_json

RECORD = "build.json"
RESERVED = {"CON", "PRN", "AUX", "NUL", *(f"COM{i}" for i in range(1, 10)), *(f"LPT{i}" for i in range(1, 10))}


def folder_name(mark: str) -> str:
    """A mark as a folder name that is safe on every common file system."""
    name = "".join(ch if ch.isalnum() or ch in "-_." else "_" for ch in mark).strip(".") or "member"
    return name + "_" if name.split(".")[0].upper() in RESERVED else name


def build_key(source_text: str, options: str) -> str:
    """What a package depends on: the input's bytes, beamlang's version and code, the libraries' versions, the
    build options."""
    from beamlang import __version__
    from beamlang.report.provenance import versions_text
    text = "\0".join([source_text, __version__, code_hash(), versions_text(), options])
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


@lru_cache(maxsize=1)
def code_hash() -> str:
    """A hash of beamlang's own files (code, grammar, template, assets): an edited checkout is another tool."""
    root = Path(__file__).resolve().parents[1]
    digest = hashlib.sha256()
    from beamlang.language.parse import grammar_path
    files = {p for p in root.rglob("*") if p.is_file() and p.suffix in (".py", ".typ", ".lark", ".woff")}
    for path in sorted(files | {Path(grammar_path()).resolve()}):
        digest.update(path.name.encode("utf-8") + b"\0" + path.read_bytes())
    return digest.hexdigest()


def up_to_date(out: Path, mark: str, key: str) -> dict | None:
    """The record of a package built from the same key with every file it lists present, else None."""
    folder = out / folder_name(mark)
    try:
        rec = json.loads((folder / RECORD).read_text(encoding="utf-8"))
    except (OSError, ValueError):
        return None
    if rec.get("key") != key or not all((folder / f).is_file() for f in rec.get("files", ())):
        return None
    return rec


def _record(a: Analysis, key: str, files: dict[str, bytes], paper: str, sheets) -> bytes:
    from beamlang.analysis.display import check_name
    from beamlang.language.fmt import statement_text
    from beamlang.language.syntax import Section
    m = a.loaded.member
    worst = max(a.checks, key=lambda c: (c.ratio, not c.passed), default=None)
    sections = [statement_text(st) for _line, st in a.loaded.document.statements if isinstance(st, Section)]
    rec = {"schema": "beamlang.build/1", "key": key, "mark": m.mark, "title": m.title, "fields": dict(m.fields),
           "file": a.loaded.source.name, "section": "; ".join(sections) + (f" ({m.designations})"
                                                                         if m.designations else ""),
           "governing": None if worst is None else {"check": check_name(worst, a.units), "ratio": worst.ratio,
                                                    "pass": worst.passed},
           "passed": sum(c.passed for c in a.checks), "checks": len(a.checks), "paper": paper,
           "files": sorted(files), "changed_lines": list(sheets.changed_lines),
           "revisions": [[r.revision, r.date, r.by, list(r.changes)] for r in sheets.revisions]}
    return (json.dumps(rec, indent=2, sort_keys=True) + "\n").encode("utf-8")


def package_files(a: Analysis, changes: list[str] | tuple = (), sheets=None, key: str = "") -> dict[str, bytes]:
    """Every file of the package, by relative path (figures first; the page and the sheets embed them);
    `sheets` are the PDF's `report.pdf.Options` (paper, fallback date), default when None."""
    from beamlang.report.figures import all_figures, figure_names
    from beamlang.report.html import member_html
    from beamlang.report.markdown import member_markdown
    mark = folder_name(a.loaded.member.mark)
    svgs = all_figures(a)
    names = {key: f"figures/{file}" for key, file in figure_names(a).items()}
    text = member_markdown(a, names, list(changes))
    files = {f"figures/{k}": v.encode("utf-8") for k, v in svgs.items()}
    files[f"{mark}.md"] = text.encode("utf-8")
    page = member_html(text, f"{a.loaded.member.mark}: {a.loaded.member.title}",
                       {k: v.decode("utf-8") for k, v in files.items() if k.endswith(".svg")})
    files[f"{mark}.html"] = page.encode("utf-8")
    from beamlang.report.pdf import Options, member_pdf
    files[f"{mark}.pdf"] = member_pdf(a.loaded.member, text, {f"figures/{k}": v for k, v in svgs.items()},
                                      sheets or Options())
    files["results.json"] = (json.dumps(member_json(a), indent=2) + "\n").encode("utf-8")
    from beamlang.report.pdf import paper_of
    files[RECORD] = _record(a, key, files, paper_of(a.loaded.member, sheets or Options()), sheets or Options())
    return dict(sorted(files.items()))


def write_package(a: Analysis, out: Path, changes: list[str] | tuple = (), sheets=None, key: str = "") -> Path:
    """Build everything in a temporary folder beside the target, then swap it into place."""
    files = package_files(a, changes, sheets, key)
    out.mkdir(parents=True, exist_ok=True)
    target = out / folder_name(a.loaded.member.mark)
    staging = Path(tempfile.mkdtemp(prefix=f".{target.name}.", dir=out))
    try:
        for rel, data in files.items():
            path = staging / rel
            path.parent.mkdir(parents=True, exist_ok=True)
            path.write_bytes(data)
        _swap(staging, target)
    except BaseException:
        shutil.rmtree(staging, ignore_errors=True)
        raise
    return target


def _swap(staging: Path, target: Path) -> None:
    if target.is_symlink() or target.is_file():
        target.unlink()  # a link is replaced, never followed
    if target.exists():
        old = target.with_name(f".{target.name}.old")
        if old.exists():
            shutil.rmtree(old)
        os.replace(target, old)
        os.replace(staging, target)
        shutil.rmtree(old)
    else:
        os.replace(staging, target)

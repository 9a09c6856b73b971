"""Package: Analysis -> OUT/<mark>/ with <mark>.md, <mark>.html, <mark>.pdf, figures/*.svg and results.json,
written atomically."""

from __future__ import annotations

import json
import os
import shutil
import tempfile
from pathlib import Path

from beamlang.pipeline import Analysis
from beamlang.report.jsonout import member_json

RESERVED = {"CON", "PRN", "AUX", "NUL", *(f"COM{i}" for i in range(1, 10)), *(f"LPT{i}" for i in range(1, 10))}


def folder_name(mark: str) -> str:
    """A mark as a folder name that is safe on every common file system."""
    name = "".join(ch if ch.isalnum() or ch in "-_." else "_" for ch in mark).strip(".") or "member"
    return name + "_" if name.split(".")[0].upper() in RESERVED else name


def package_files(a: Analysis, changes: list[str] | tuple = (), sheets=None) -> dict[str, bytes]:
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
    return dict(sorted(files.items()))


def write_package(a: Analysis, out: Path, changes: list[str] | tuple = (), sheets=None) -> Path:
    """Build everything in a temporary folder beside the target, then swap it into place."""
    files = package_files(a, changes, sheets)
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

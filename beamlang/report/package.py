"""Package: Analysis -> OUT/<mark>/ with <mark>.md, <mark>.html, <mark>.pdf, figures/*.svg, results.json and
build.json (the record of what it was built from, for incremental builds and the project index), written atomically."""

from __future__ import annotations

import hashlib
import json
import os
import secrets
import shutil
import sys
from contextlib import contextmanager
from functools import lru_cache
from pathlib import Path

from beamlang.language.frontend import recorded_name
from beamlang.language.marks import RESERVED, folder_name  # noqa: F401 (the package folder's name lives there)
from beamlang.pipeline import Analysis
from beamlang.report.jsonout import member_json

RECORD = "build.json"


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
    from beamlang.language.grammar import grammar_path
    files = {p for p in root.rglob("*") if p.is_file() and p.suffix in (".py", ".typ", ".lark", ".woff")}
    # each file by its name and content, in an order that does not depend on where the files lie: a checkout
    # keeps the grammar beside the package, an installed wheel inside it, and both are the same tool
    entries = sorted(path.name + "\0" + hashlib.sha256(path.read_bytes()).hexdigest()
                     for path in files | {Path(grammar_path()).resolve()})
    return hashlib.sha256("\n".join(entries).encode("utf-8")).hexdigest()


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
           "file": recorded_name(a.loaded), "section": "; ".join(sections) + (f" ({m.designations})"
                                                                         if m.designations else ""),
           "governing": None if worst is None else {"check": check_name(worst, a.units), "ratio": worst.ratio,
                                                    "pass": worst.passed},
           "passed": sum(c.passed for c in a.checks), "checks": len(a.checks), "paper": paper,
           "files": sorted(files), "marked": list(sheets.marked),
           "revisions": [[r.revision, r.date, r.by, list(r.changes)] for r in sheets.revisions]}
    return (json.dumps(rec, indent=2, sort_keys=True) + "\n").encode("utf-8")


def package_files(a: Analysis, changes: list[str] | tuple = (), sheets=None, key: str = "",
                  previous: Analysis | None = None) -> dict[str, bytes]:
    """Every file of the package, by relative path (figures first; the page and the sheets embed them);
    `sheets` are the PDF's `report.pdf.Options` (paper, fallback date, revisions), default when None; the values
    that differ from the package of `previous` (the previous revision, with the same figure names and changes
    section) are marked on the sheets."""
    from dataclasses import replace

    from beamlang.report.figures import all_figures, figure_names
    from beamlang.report.html import member_html
    from beamlang.report.markdown import member_markdown
    from beamlang.report.pdf import Options
    from beamlang.report.pdf.changes import changed_lines
    mark = folder_name(a.loaded.member.mark)
    svgs = all_figures(a)
    names = {key: f"figures/{file}" for key, file in figure_names(a).items()}
    text = member_markdown(a, names, list(changes))
    sheets = sheets or Options()
    if previous is not None:  # with this package's figure names (a figure it lacks is left out) and changes
        before = member_markdown(previous, names, list(changes))
        sheets = replace(sheets, marked=tuple(sorted(changed_lines(before, text))))
    files = {f"figures/{k}": v.encode("utf-8") for k, v in svgs.items()}
    files[f"{mark}.md"] = text.encode("utf-8")
    page = member_html(text, f"{a.loaded.member.mark}: {a.loaded.member.title}",
                       {k: v.decode("utf-8") for k, v in files.items() if k.endswith(".svg")})
    files[f"{mark}.html"] = page.encode("utf-8")
    from beamlang.report.pdf import member_pdf, paper_of
    files[f"{mark}.pdf"] = member_pdf(a.loaded.member, text, {f"figures/{k}": v for k, v in svgs.items()}, sheets)
    files["results.json"] = (json.dumps(member_json(a), indent=2) + "\n").encode("utf-8")
    files[RECORD] = _record(a, key, files, paper_of(a.loaded.member, sheets), sheets)
    return dict(sorted(files.items()))


def write_package(a: Analysis, out: Path, changes: list[str] | tuple = (), sheets=None, key: str = "",
                  previous: Analysis | None = None) -> Path:
    """Build everything in a hidden folder beside the target, then swap it into place (see `swap`)."""
    target = out / folder_name(a.loaded.member.mark)
    return swap_in(package_files(a, changes, sheets, key, previous), target)


# The swap. Each member's folder is, at every instant, its old package or its new one:
# - the new package is written into a hidden folder `.NAME.beamlang-new-TOKEN` beside the target (created with
#   the user's umask, like any folder the user makes);
# - on Linux one renameat2(RENAME_EXCHANGE) puts it in place and the old one where it was, atomically; the
#   hidden folder, now holding the old package, is removed;
# - where the file system cannot exchange (another OS, some network file systems) the old package is renamed
#   to `.NAME.beamlang-old-TOKEN` and the new one into place; a kill between those two renames leaves no
#   folder, and the next build puts the old one back before it starts;
# - builds into one output folder take turns by an advisory lock on that folder (flock), held from before the
#   hidden folder is made until the old package is removed, so concurrent builds and `--jobs` workers never
#   see each other's hidden folders; whatever hidden folders an earlier, killed run left are removed (or put
#   back) under that lock by the next build of the same folder name.
LEFTOVER = ".beamlang-"


def swap_in(files: dict[str, bytes], target: Path) -> Path:
    out = target.parent
    try:
        out.mkdir(parents=True, exist_ok=True)
    except OSError as exc:
        raise OSError(exc.errno, exc.strerror, str(out)) from exc
    try:
        with _locked(out):
            _clean_leftovers(target)
            staging = _new_folder(target, "new")
            try:
                for rel, data in files.items():
                    path = staging / rel
                    path.parent.mkdir(parents=True, exist_ok=True)
                    path.write_bytes(data)
                _step("written")
                _swap(staging, target)
            finally:
                _remove(staging)  # the unfinished new package, or after the swap the old one
    except OSError as exc:
        if exc.filename == str(target):
            raise
        raise OSError(exc.errno, exc.strerror, str(target)) from exc
    return target


def _step(name: str) -> None:
    """A point between the swap's steps (`written`, `aside`, `swapped`); tests kill the process here."""


def _swap(staging: Path, target: Path) -> None:
    if target.is_symlink() or (target.exists() and not target.is_dir()):
        target.unlink()  # a link is replaced, never followed
    if not target.exists():
        os.rename(staging, target)
    elif not _exchange(staging, target):
        old = _new_name(target, "old")
        os.rename(target, old)
        _step("aside")
        try:
            os.rename(staging, target)
        except BaseException:
            os.rename(old, target)
            raise
        os.rename(old, staging)  # removed with the staging folder
    _step("swapped")


def _exchange(a: Path, b: Path) -> bool:
    """Swap two folders in one step (Linux renameat2 RENAME_EXCHANGE); False where that cannot be done."""
    if not sys.platform.startswith("linux"):
        return False
    import ctypes
    import errno
    try:
        libc = ctypes.CDLL(None, use_errno=True)
        renameat2 = libc.renameat2
    except (OSError, AttributeError):
        return False
    at_fdcwd, rename_exchange = -100, 2
    if renameat2(at_fdcwd, os.fsencode(a), at_fdcwd, os.fsencode(b), rename_exchange) == 0:
        return True
    code = ctypes.get_errno()
    if code in (errno.EINVAL, errno.ENOSYS, getattr(errno, "ENOTSUP", errno.EINVAL), errno.EOPNOTSUPP):
        return False
    raise OSError(code, os.strerror(code), str(b))


def _new_name(target: Path, kind: str) -> Path:
    return target.with_name(f".{target.name}{LEFTOVER}{kind}-{secrets.token_hex(4)}")


def _new_folder(target: Path, kind: str) -> Path:
    while True:
        path = _new_name(target, kind)
        try:
            os.mkdir(path, 0o777)  # the umask applies
            return path
        except FileExistsError:
            continue


def tidy(target: Path) -> None:
    """A package left as it is (up to date): still remove what an earlier, killed run left beside it."""
    if not target.parent.is_dir():
        return
    with _locked(target.parent):
        _clean_leftovers(target)


def _clean_leftovers(target: Path) -> None:
    """Hidden folders of an earlier run that was killed: an old package put aside with no package in its place
    goes back; everything else is removed (links unlinked, never followed)."""
    prefix = f".{target.name}{LEFTOVER}"
    try:
        names = sorted(os.listdir(target.parent))
    except OSError:
        return
    leftovers = [target.parent / n for n in names if n.startswith(prefix)]
    if not (target.exists() or target.is_symlink()):
        aside = [p for p in leftovers if p.name.startswith(prefix + "old-") and p.is_dir() and not p.is_symlink()]
        if aside:
            os.rename(aside[0], target)
            leftovers.remove(aside[0])
    for path in leftovers:
        _remove(path)


def _remove(path: Path) -> None:
    if path.is_symlink() or (path.exists() and not path.is_dir()):
        path.unlink()
    elif path.exists():
        shutil.rmtree(path)


@contextmanager
def _locked(folder: Path):
    """An advisory lock on the output folder itself (no lock file is left behind); none where there is no flock."""
    try:
        import fcntl
    except ImportError:
        yield
        return
    fd = os.open(folder, os.O_RDONLY)
    try:
        fcntl.flock(fd, fcntl.LOCK_EX)
        yield
    finally:
        os.close(fd)  # closing releases the lock

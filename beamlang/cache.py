"""The user's cache folder for what beamlang can keep between runs (the unit registry, derived formulas): the
platform's user cache folder, or BEAMLANG_CACHE (a folder, or `off` for none). Everything kept there is
rebuilt when missing or damaged; nothing in it is needed. Each kind of thing kept has a folder per version of
what it depends on (`formulas-<digest>`, `units-<versions>-<digest>`); when a new one is made, the folders of that
kind beyond the few most recently used are removed (`make_folder`), so upgrades and edits do not pile up."""

from __future__ import annotations

import os
import shutil
import sys
from pathlib import Path


def cache_root() -> Path | None:
    """`<user cache>/beamlang`, the folder BEAMLANG_CACHE names, or None when it is `off`."""
    chosen = os.environ.get("BEAMLANG_CACHE", "")
    if chosen.lower() == "off":
        return None
    if chosen:
        return Path(chosen)
    if sys.platform == "win32":
        return Path(os.environ.get("LOCALAPPDATA") or Path.home() / "AppData" / "Local") / "beamlang"
    if sys.platform == "darwin":
        return Path.home() / "Library" / "Caches" / "beamlang"
    return Path(os.environ.get("XDG_CACHE_HOME") or Path.home() / ".cache") / "beamlang"


def write_whole(path: Path, data: bytes) -> None:
    """`data` at `path`, whole or not at all: written beside it under a hidden name, then renamed into place."""
    path.parent.mkdir(parents=True, exist_ok=True)
    tmp = path.with_name(f".{path.name}.{os.getpid()}.tmp")
    try:
        tmp.write_bytes(data)
        os.replace(tmp, path)
    finally:
        tmp.unlink(missing_ok=True)


KEPT_VERSIONS = 4  # folders of one kind left in the cache: the newest, and a few that other installations may use


def make_folder(folder: Path) -> None:
    """Make `folder` (a cache folder named `<kind>-<version>`) if it is missing, then `retire_others`."""
    if folder.is_dir():
        return
    folder.mkdir(parents=True, exist_ok=True)
    retire_others(folder)


def retire_others(folder: Path) -> None:
    """Remove the folders of `folder`'s kind beside it but the `KEPT_VERSIONS` most recently changed (`folder`, just
    made, among them); hidden folders (another process's, being filled) are left. Best effort: a folder that
    cannot go stays, and one that goes is made again by whatever installation needs it."""
    kind = folder.name.split("-", 1)[0] + "-"
    try:
        others = [p for p in folder.parent.iterdir() if p.is_dir() and p.name.startswith(kind) and p != folder]
        others.sort(key=lambda p: (p.stat().st_mtime, p.name), reverse=True)
    except OSError:
        return
    for old in others[KEPT_VERSIONS - 1:]:
        shutil.rmtree(old, ignore_errors=True)

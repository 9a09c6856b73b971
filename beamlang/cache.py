"""The user's cache folder for what beamlang can keep between runs (the unit registry, derived formulas): the
platform's user cache folder, or BEAMLANG_CACHE (a folder, or `off` for none). Everything kept there is
rebuilt when missing or damaged; nothing in it is needed."""

from __future__ import annotations

import os
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

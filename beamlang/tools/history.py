"""History: a member's file in a git checkout -> the commit date for its sheets (and its revisions)."""

from __future__ import annotations

import subprocess
from pathlib import Path


def _git(path: Path, *args: str) -> str | None:
    """git's output run beside `path`, or None outside a checkout (or without git)."""
    try:
        done = subprocess.run(["git", *args], cwd=path.parent, capture_output=True, text=True, check=False)
    except (FileNotFoundError, NotADirectoryError):
        return None
    return done.stdout if done.returncode == 0 else None


def fallback_date(path: Path) -> str | None:
    """YYYY-MM-DD of the last commit that changed the file, None when it is untracked or changed since."""
    path = Path(path).resolve()
    if _git(path, "status", "--porcelain", "--", path.name) not in ("",):
        return None  # outside git, untracked or modified: no commit states this text
    date = (_git(path, "log", "-1", "--format=%cs", "--", path.name) or "").strip()
    return date or None

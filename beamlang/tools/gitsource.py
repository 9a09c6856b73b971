"""Git at the edge: `REV:path` and `--rev REV` -> file texts read through `git show` and `git ls-tree`."""

from __future__ import annotations

import subprocess
from pathlib import Path

from beamlang.errors import BeamError, Diagnostic
from beamlang.source import Source, Span


def _git(*args: str) -> str:
    try:
        done = subprocess.run(["git", *args], capture_output=True, text=True, check=False)
    except FileNotFoundError:
        raise BeamError([Diagnostic(Span("git", 1, 1, 2), "git is not installed")]) from None
    if done.returncode != 0:
        message = (done.stderr.strip().splitlines() or ["git failed"])[-1]
        raise BeamError([Diagnostic(Span(f"git {' '.join(args)}", 1, 1, 2), message.removeprefix("fatal: "))])
    return done.stdout


def _check_revision(rev: str) -> None:
    """A revision is never read as an option of git (`--output=FILE` would make git write a file): one starting
    with `-` is refused here, and every call passes `--end-of-options` before it as well."""
    if rev.startswith("-") or not rev:
        raise BeamError([Diagnostic(Span("beamlang", 1, 1, 2), f"'{rev}' is not a revision",
                                    "a revision is a commit, branch or tag name such as HEAD~1 or main; it does not "
                                    "start with '-'")])


def read_revision(rev: str, path: str) -> Source:
    """The text of `path` (relative to the current folder) at revision `rev`."""
    _check_revision(rev)
    rel = path if path.startswith("./") else "./" + path
    return Source(f"{rev}:{path}", _git("show", "--end-of-options", f"{rev}:{rel}"))


def files_at(rev: str, paths: list[str]) -> list[str]:
    """Every `.beam` file under `paths` at `rev`, relative to the current folder, sorted."""
    _check_revision(rev)
    prefix = _git("rev-parse", "--show-prefix").strip()
    listed = _git("ls-tree", "-r", "--name-only", "--full-name", "--end-of-options", rev, "--", *(paths or ["."]))
    out = []
    for name in listed.splitlines():
        if name.endswith(".beam") and name.startswith(prefix):
            out.append(Path(name[len(prefix):]).as_posix())
    return sorted(out)

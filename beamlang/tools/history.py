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


def commits(path: Path) -> tuple[str, ...]:
    """The commits that changed the file, oldest first (empty outside a checkout): part of the build key."""
    path = Path(path).resolve()
    return tuple(reversed((_git(path, "log", "--format=%H", "--", path.name) or "").split()))


def revisions(item, a, limit: int = 6):
    """The revision table of a member and the analysis of its previous revision.

    Each distinct `revision` value in the file's history (and the working text) is one row; what changed is
    the diff machinery's account (inputs changed, check status changes) between the last text of the previous
    revision and the last text of this one. Returns (rows, previous): rows are `report.pdf.Revision`; previous is
    the analysis of the last text of the revision before this one (None without one), whose package the sheets
    compare with this one's to mark the values that changed."""
    from beamlang.errors import BeamError
    from beamlang.language.frontend import from_source
    from beamlang.pipeline import analyse_loaded
    from beamlang.report.pdf import Revision
    from beamlang.source import Source
    path = Path(item.path).resolve()
    states = []  # (revision, loaded) per commit, then the working text
    for sha in commits(path):
        text = _git(path, "show", f"{sha}:./{path.name}")
        try:
            states.append(from_source(Source(f"{sha[:10]}:{item.source.name}", text), None))
        except (BeamError, TypeError):
            continue  # a version that did not build has no revision to show
    states.append(item)
    last: dict[str, object] = {}
    for loaded in states:  # the last text of each revision, in order of first appearance
        rev = dict(loaded.member.fields).get("revision", "")
        last.pop(rev, None)
        last[rev] = loaded
    if list(last) == [""]:
        return (), None
    rows, before, previous = [], None, None
    for rev, loaded in list(last.items())[-limit:]:
        now = a if loaded is item else analyse_loaded(loaded)
        fields = dict(loaded.member.fields)
        rows.append(Revision(rev or "-", fields.get("date", ""), fields.get("by", ""), _what_changed(previous, now)))
        before, previous = previous, now
    return tuple(rows), before


TITLE_FIELDS = {f"field {name}" for name in ("revision", "date", "by", "checked")}  # the row shows these


def _ratio(r: float | None) -> str:
    return "-" if r is None else f"{r:.3f}"


def _what_changed(old, new) -> tuple[str, ...]:
    """The diff between two revisions as short phrases."""
    from beamlang.tools.diff import diff_members
    if old is None:
        return ("first issue",)
    d = diff_members(new.loaded.member.mark, old, new)
    inputs = [c for c in d.inputs if c.what not in TITLE_FIELDS]
    phrases = [f"{c.what}: {c.old or '-'} -> {c.new or '-'}" if c.kind == "changed" else f"{c.kind} {c.what}"
               for c in inputs]
    for s in d.statuses:
        ratios = f"ratio {_ratio(s.old_ratio)} -> {_ratio(s.new_ratio)}"
        if s.label not in ("ratio up", "ratio down"):
            phrases.append(f"{s.check}: {s.label}, {ratios}")
        elif _ratio(s.old_ratio) != _ratio(s.new_ratio):
            phrases.append(f"{s.check}: {ratios}")
    return tuple(phrases) or ("no change to inputs or checks",)

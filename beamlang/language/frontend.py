"""Front end: a `.beam` path -> (Source, Document, Member); files and folders -> sorted `.beam` paths."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from beamlang.errors import BeamError, Diagnostic
from beamlang.language.build import build
from beamlang.language.build import problems as build_problems
from beamlang.language.marks import folder_key, folder_name
from beamlang.language.parse import parse_recovering, read_source
from beamlang.language.syntax import Document
from beamlang.model import Member
from beamlang.source import Source, Span


@dataclass(frozen=True, slots=True)
class Loaded:
    path: Path
    source: Source
    document: Document
    member: Member


def load(path: Path) -> Loaded:
    """Read, parse and validate one file (raises BeamError with every problem found)."""
    return from_source(read_source(path, shown_as=_shown(path)), path)


def from_source(source: Source, path: Path | None) -> Loaded:
    """Parse and validate text that is already read (a file, a git revision, a trial section). A line that fails
    to parse does not stop the others: they are validated too, and every problem is raised together."""
    doc, problems = parse_recovering(source)
    if not problems:
        return Loaded(path, source, doc, build(doc))
    raise BeamError(problems + build_problems(doc), source)


def expand(args: list[str]) -> list[Path]:
    """Files as given, folders searched for `*.beam` (sorted, so output order is stable)."""
    out: list[Path] = []
    for arg in args:
        p = Path(arg)
        if p.is_dir():
            out.extend(sorted(p.rglob("*.beam")))
        else:
            out.append(p)
    return out


def without_colliding_marks(loaded: list[Loaded]) -> tuple[list[Loaded], BeamError | None]:
    """Two files whose marks give one output folder in one run is an error (one package would overwrite the
    other), found before anything is built and naming both files; neither is built. -> (the others, the error)."""
    keys = [folder_key(item.member.mark) for item in loaded]
    kept = [item for item, key in zip(loaded, keys) if keys.count(key) == 1]
    try:
        check_unique_marks(loaded)
    except BeamError as exc:
        return kept, exc
    return kept, None


def check_unique_marks(loaded: list[Loaded]) -> None:
    """Raise the error of `without_colliding_marks`, if any."""
    seen: dict[str, Loaded] = {}
    problems = []
    for item in loaded:
        mark = item.member.mark
        first = seen.get(folder_key(mark))
        if first is None:
            seen[folder_key(mark)] = item
            continue
        where = f"{_shown(first.path)}:{_mark_span(first).line}"
        if first.member.mark.lower() == mark.lower():
            problems.append(Diagnostic(_mark_span(item), f"member mark '{mark}' is used twice",
                                       f"also in {where}; marks name the output folders and must differ"))
        else:
            problems.append(Diagnostic(_mark_span(item), f"member mark '{mark}' gives the same output folder "
                                       f"'{folder_name(mark)}' as '{first.member.mark}' in {where}",
                                       "marks name the output folders: change one of them"))
    if problems:
        raise BeamError(problems, [item.source for item in loaded])


def _mark_span(item: Loaded) -> Span:
    from beamlang.language.syntax import Member as MemberStmt
    for _, st in item.document.statements:
        if isinstance(st, MemberStmt):
            return st.mark.span
    return item.member.span


def recorded_name(item: Loaded) -> str:
    """The input path a package records, the same whichever folder the build ran from and however the path was
    typed: relative to the git repository that holds the file (the nearest folder above it with a `.git`),
    with `/` separators; outside a repository, the file's name alone (a builder's folders stay out of it)."""
    if item.path is None or not item.path.is_file():
        return item.source.name
    here = item.path.resolve()
    for folder in here.parents:
        if (folder / ".git").exists():
            return here.relative_to(folder).as_posix()
    return here.name


def _shown(path: Path) -> str:
    """Paths are shown as given, relative where they are relative (no absolute paths in output)."""
    return path.as_posix()

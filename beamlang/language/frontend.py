"""Front end: a `.beam` path -> (Source, Document, Member); files and folders -> sorted `.beam` paths."""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path

from beamlang.language.build import build
from beamlang.language.build import problems as build_problems
from beamlang.errors import BeamError, Diagnostic
from beamlang.model import Member
from beamlang.language.parse import parse_recovering, read_source
from beamlang.source import Source, Span
from beamlang.language.syntax import Document


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


def check_unique_marks(loaded: list[Loaded]) -> None:
    """Two files describing the same mark in one run is an error (their output would collide)."""
    seen: dict[str, Loaded] = {}
    problems = []
    for item in loaded:
        mark = item.member.mark
        first = seen.get(mark.lower())
        if first is not None:
            problems.append(Diagnostic(_mark_span(item), f"member mark '{mark}' is used twice",
                                       f"also in {_shown(first.path)}:{first.member.span.line}; "
                                       "marks name the output folders and must differ"))
        else:
            seen[mark.lower()] = item
    if problems:
        raise BeamError(problems, [item.source for item in loaded])


def _mark_span(item: Loaded) -> Span:
    from beamlang.language.syntax import Member as MemberStmt
    for _, st in item.document.statements:
        if isinstance(st, MemberStmt):
            return st.mark.span
    return item.member.span


def _shown(path: Path) -> str:
    """Paths are shown as given, relative where they are relative (no absolute paths in output)."""
    return path.as_posix()

"""Catalogues: a CSV file of named sections -> its rows, the catalogue a member names, and the name of the row
that a member's section line was taken from.

Format (`#` comment lines allowed): a header `name,section`, then one row per section whose `section` cell is
the text after the keyword `section` in a `.beam` file (`2x10,rectangle width 1.5 in depth 9.25 in`)."""

from __future__ import annotations

import csv
from pathlib import Path

from beamlang.errors import BeamError, Diagnostic
from beamlang.language import syntax as s
from beamlang.language.frontend import Loaded
from beamlang.source import Span


def read_catalogue(path: Path) -> list[tuple[int, str, str]]:
    """(line, name, section text) rows; a malformed catalogue is an input error."""
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise BeamError([Diagnostic(Span(path.as_posix(), 1, 1, 2), f"cannot read the catalogue ({exc.strerror})")]) from None
    except UnicodeDecodeError:
        raise BeamError([Diagnostic(Span(path.as_posix(), 1, 1, 2), "the catalogue is not UTF-8 text",
                                    "save it as UTF-8")]) from None
    rows, header = [], None
    for number, line in enumerate(text.splitlines(), start=1):
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        cells = next(csv.reader([line]))
        if header is None:
            header = [c.strip().lower() for c in cells]
            if header[:2] != ["name", "section"]:
                raise BeamError([Diagnostic(Span(path.as_posix(), number, 1, len(line) + 1),
                                            "a catalogue starts with the header `name,section`")])
            continue
        if len(cells) < 2:
            raise BeamError([Diagnostic(Span(path.as_posix(), number, 1, len(line) + 1),
                                        "a catalogue row needs a name and a section")])
        rows.append((number, cells[0].strip(), cells[1].strip()))
    return rows


SHIPPED = Path(__file__).resolve().parents[1] / "catalogues"


def _found(name: str, folder: Path) -> Path | None:
    """`name` as a path from `folder`, else the file name of a catalogue shipped with beamlang."""
    for candidate in (folder / name, SHIPPED / name):
        if candidate.is_file():
            return candidate
    return None


def _shipped_hint() -> str:
    return "the shipped catalogues are: " + ", ".join(sorted(p.name for p in SHIPPED.glob("*.csv")))


def catalogue_of(item: Loaded) -> Path:
    """The catalogue named by the member's `catalogue` line: a path from the member's folder, or the
    file name of a catalogue shipped with beamlang (beamlang/catalogues/)."""
    line = next((st for _, st in item.document.statements if isinstance(st, s.Catalogue)), None)
    if line is None:
        raise BeamError([Diagnostic(Span(item.source.name, 1, 1, 2), "no catalogue to size from",
                                    "give `--catalogue FILE.csv`, or add e.g. `catalogue \"sawn-lumber-ps20.csv\"` "
                                    "to the member")])
    found = _found(line.path, Path(item.path).parent if item.path is not None else Path("."))
    if found is None:
        raise BeamError([Diagnostic(line.span, f"catalogue '{line.path}' not found beside the member or among the "
                                    "shipped ones", _shipped_hint())], item.source)
    return found


def catalogue_named(name: str) -> Path:
    """`--catalogue NAME`: a path from the current folder, or the file name of a shipped catalogue."""
    found = _found(name, Path("."))
    if found is None:
        raise BeamError([Diagnostic(Span(name, 1, 1, 2), f"catalogue '{name}' not found here or among the shipped ones",
                                    _shipped_hint())])
    return found


def shown(path: Path) -> str:
    """A catalogue's name in messages: shipped ones by their place in the package, others as given."""
    return f"beamlang/catalogues/{path.name}" if path.resolve().parent == SHIPPED else path.as_posix()








def designation(item: Loaded) -> tuple[str, str] | None:
    """(row name, catalogue as shown) of the catalogue row the member's one section line matches, word for word;
    None without a catalogue line, a readable catalogue or a matching row."""
    from beamlang.language.fmt import statement_text
    sections = [st for _, st in item.document.statements if isinstance(st, s.Section)]
    if len(sections) != 1:
        return None
    try:
        path = catalogue_of(item)
        rows = read_catalogue(path)
    except BeamError:
        return None
    written = " ".join(statement_text(sections[0]).split())
    for _, name, text in rows:
        if " ".join(f"section {text}".split()) == written:
            return name, shown(path)
    return None

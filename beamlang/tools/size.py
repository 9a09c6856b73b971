"""Size: a member + a catalogue of sections -> every section tried, the lightest that passes every check.

Catalogue format (CSV, `#` comment lines allowed): a header `name,section`, then one row per section
whose `section` cell is the text after the keyword `section` in a `.beam` file, for example
`2x10,rectangle width 1.5 in depth 9.25 in` or `B1,properties I 340 in^4 depth 12 in A 10 in^2`."""

from __future__ import annotations

import csv
import re
from dataclasses import dataclass
from fractions import Fraction
from pathlib import Path

from beamlang.language import syntax as s
from beamlang.errors import BeamError, Diagnostic
from beamlang.language.frontend import Loaded, from_source
from beamlang.pipeline import analyse_loaded
from beamlang.source import Source, Span
from beamlang.language.units import STANDARD_GRAVITY


@dataclass(frozen=True, slots=True)
class Trial:
    name: str
    section: str  # the catalogue's section text
    weight: Fraction | None  # N/m with a density, else the area in m^2 (same order)
    ratio: float | None  # the largest check ratio
    governing: str | None
    passed: bool
    problem: str | None  # why the section could not be tried


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


def with_section(item: Loaded, section_text: str, designation: str | None = None, others: tuple[str, ...] = ()) -> str:
    """The member's file text with its section line replaced (`section "designation" TEXT`), indentation kept,
    and its comment kept with every name of `others` (the sections it no longer holds) made `designation`."""
    line = next(ln for ln in item.document.lines if isinstance(ln.statement, s.Section))
    lines = item.source.text.splitlines(keepends=True)
    old = lines[line.number - 1]
    indent = old[: len(old) - len(old.lstrip())]
    ending = "\n" if old.endswith("\n") else ""
    named = f"{_quote(designation)} " if designation is not None else ""
    comment = renamed(line.comment, others, designation) if line.comment and designation else line.comment
    lines[line.number - 1] = f"{indent}section {named}{section_text}" + (f"  {comment}" if comment else "") + ending
    return "".join(lines)


def renamed(comment: str, others: tuple[str, ...], designation: str) -> str:
    """A comment that names another section (`# 2x8 trial`) names the chosen one instead (`# 2x12 trial`)."""
    names = sorted({n for n in others if n and n != designation}, key=lambda n: (-len(n), n))
    if not names:
        return comment
    pattern = re.compile(r"(?<![\w.])(?:" + "|".join(re.escape(n) for n in names) + r")(?![\w.])")
    return pattern.sub(lambda _: designation, comment)


def _quote(text: str) -> str:
    return '"' + text.replace("\\", "\\\\").replace('"', '\\"') + '"'


def section_line(item: Loaded, text: str) -> str:
    """The section line of `text` (the member's file rewritten by `with_section`), as it reads there."""
    line = next(ln for ln in item.document.lines if isinstance(ln.statement, s.Section))
    return text.splitlines()[line.number - 1].strip()


def designation_of(item: Loaded) -> str | None:
    """The name on the member's section line, if it has one."""
    return next((st.designation for _, st in item.document.statements if isinstance(st, s.Section)), None)


def try_all(item: Loaded, catalogue: list[tuple[int, str, str]], catalogue_name: str) -> list[Trial]:
    """Every section of the catalogue in this member, lightest first (ties by name)."""
    if item.member.stepped:
        line = next(ln for ln in item.document.lines if isinstance(ln.statement, (s.Section, s.Material))
                    and ln.statement.stretch is not None)
        raise BeamError([Diagnostic(line.statement.span, "a catalogue sizes a prismatic member; this one is stepped",
                                    "size each stretch's section by hand, or try the sizes one at a time")],
                        item.source)
    trials = []
    for number, name, section in catalogue:
        source = Source(f"{catalogue_name}:{number}", with_section(item, section, name))
        try:
            a = analyse_loaded(from_source(source, item.path))
        except BeamError as exc:
            trials.append(Trial(name, section, None, None, None, False, exc.diagnostics[0].message))
            continue
        m = a.loaded.member
        area = m.section.A
        weight = None if area is None else (area * m.material.density * STANDARD_GRAVITY if m.material.density else area)
        worst = max(a.checks, key=lambda c: c.ratio, default=None)
        trials.append(Trial(name, section, weight, worst.ratio if worst else None,
                            f"{worst.kind} {worst.target}" if worst else None, a.passed, None))
    return sorted(trials, key=lambda t: (t.weight is None, t.weight or 0, t.name))

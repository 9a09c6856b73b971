"""Size: a member + a catalogue of sections -> every section tried, the lightest that passes every check.

Catalogue format (CSV, `#` comment lines allowed): a header `name,section`, then one row per section
whose `section` cell is the text after the keyword `section` in a `.beam` file, for example
`2x10,rectangle width 1.5 in depth 9.25 in` or `B1,properties I 340 in^4 depth 12 in A 10 in^2`."""

from __future__ import annotations

import re
from dataclasses import dataclass
from fractions import Fraction

from beamlang.language import syntax as s
from beamlang.errors import BeamError, Diagnostic
from beamlang.language.catalogue import SHIPPED, catalogue_named, catalogue_of, read_catalogue, shown  # noqa: F401 (the CLI's names)
from beamlang.language.frontend import Loaded, from_source
from beamlang.pipeline import analyse_loaded
from beamlang.source import Source
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

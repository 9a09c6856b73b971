"""The statement grammar: where grammar/beam.lark lies, its parser, and what it accepts after a start of a line."""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

from lark import Lark
from lark.exceptions import UnexpectedInput


def grammar_path() -> Path:
    """Locate grammar/beam.lark: inside the installed package, or beside it in a source tree."""
    package = Path(__file__).resolve().parents[1]
    for candidate in (package / "grammar" / "beam.lark", package.parent / "grammar" / "beam.lark"):
        if candidate.is_file():
            return candidate
    raise RuntimeError("internal error: grammar/beam.lark is missing from this installation")


@lru_cache(maxsize=1)
def parser() -> Lark:
    """The statement grammar's LALR parser (one line at a time), made once."""
    path = grammar_path()
    return Lark(path.read_text(encoding="utf-8"), parser="lalr", propagate_positions=True,
                maybe_placeholders=False, cache=True)


def accepted_after(prefix: str) -> set[str] | None:
    """The terminals the statement grammar accepts after this start of a line (an editor's completion); None
    where no statement starts so."""
    interactive = parser().parse_interactive(prefix)
    try:
        for _ in interactive.iter_parse():
            pass
        return set(interactive.accepts())
    except UnexpectedInput:
        return None


def literals() -> dict[str, str]:
    """The grammar's fixed words by terminal name (`AT` -> `at`, `__ANON_0` -> `self-weight`)."""
    return {t.name: t.pattern.value for t in parser().terminals if t.pattern.type == "str"}

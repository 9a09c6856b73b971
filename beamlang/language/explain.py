"""Explain: a line the grammar refuses -> the span, message and hint a person can act on."""

from __future__ import annotations

import difflib

from lark.exceptions import UnexpectedCharacters, UnexpectedEOF, UnexpectedInput, UnexpectedToken

from beamlang.language.grammar import parser
from beamlang.language.vocabulary import KEYWORDS, SHAPES, SUPPORT_KINDS
from beamlang.source import Source, Span

TERMINAL_WORDS = {
    "NUMBER": "a number", "UNIT": "a unit", "NAME": "a name", "MARK": "a member mark",
    "STRING": 'a quoted text "..."', "FORCE_DIR": "`down` or `up`",
    "TURN_DIR": "`clockwise` or `counterclockwise`", "SHAPE": "a section shape",
    "SUPPORT_KIND": "a support kind", "SYSTEM": "`si` or `us`", "FIELD": "a title-block field",
    "AT": "`at`", "TO": "`to`", "FROM": "`from`", "SPAN": "`span`", "EQUAL": "`=`", "PLUS": "`+`",
    "SLASH": "`/`", "MINUS": "`-`", "X": "`x`", "$END": "the end of the line", "COMMENT": "a comment",
    "DEFLECTION": "`deflection`", "STRESS": "`stress`",
}


def explain(source: Source, number: int, text: str, exc: UnexpectedInput) -> tuple[Span, str, str | None]:
    """Turn a lark error into a message a person can act on."""
    col = getattr(exc, "column", len(text) + 1)
    if isinstance(exc, UnexpectedEOF) or col is None or col < 1:
        col = len(text.rstrip()) + 1
    word = _word_at(text, col)
    span = source.span(number, col, col + max(1, len(word)))
    expected = _accepted(text, exc)
    if isinstance(exc, UnexpectedToken) and exc.token.type == "$END":
        word, span = "", source.span(number, col, col + 1)
    first = len(text) - len(text.lstrip()) + 1
    if col == first:
        return span, f"unknown statement '{word}'", _suggest(word, KEYWORDS, "statements")
    if word.startswith("-") and "NUMBER" in expected | {"NUMBER"} and word[1:2].isdigit():
        return span, "numbers are written without a sign", ("lengths, sizes and positions are positive; loads take a "
                                                             "direction word: `down`/`up`, `clockwise`/`counterclockwise`")
    joined = _moving_without_and(text, col, word, expected)
    if joined is not None:
        return span, *joined
    if "FORCE_DIR" in expected:
        keyword = text.split()[0] if text.split() else ""
        example = _DIRECTION_EXAMPLES.get(keyword, _DIRECTION_EXAMPLES["point"])
        close = difflib.get_close_matches(word, ("down", "up"), n=1, cutoff=0.5)
        hint = f"did you mean '{close[0]}'?" if close else f"for example `{example}`"
        return span, "missing direction: a force or line load needs `down` or `up`", hint
    if "TURN_DIR" in expected:
        close = difflib.get_close_matches(word, ("clockwise", "counterclockwise"), n=1, cutoff=0.6)
        hint = f"did you mean '{close[0]}'?" if close else "for example `moment 3 kN*m clockwise at 0 m`"
        return span, "missing direction: a moment needs `clockwise` or `counterclockwise`", hint
    if expected == {"UNIT"}:
        return span, "this number needs its unit", "write the unit after the number, for example `5.4 m` or `12 kN`"
    if "SHAPE" in expected:
        return span, f"unknown section shape '{word}'", _suggest(word, SHAPES, "shapes")
    if "SUPPORT_KIND" in expected:
        return span, f"unknown support kind '{word}'", _suggest(word, SUPPORT_KINDS, "supports")
    if "MARK" in expected:
        return span, f"'{word}' is not a valid member mark", ("a mark is letters, digits, '.', '_' and '-', starting "
                                                             "with a letter or digit: it names the output folder")
    if "SYSTEM" in expected:
        return span, f"unknown unit system '{word}'", "write `units si` or `units us`"
    if isinstance(exc, UnexpectedCharacters) and text[col - 1:col] == '"':
        return source.span(number, col, col + 1), "this text has no closing quote", 'end it with "'
    if isinstance(exc, UnexpectedCharacters) and not expected & {"NUMBER", "NAME", "MARK", "UNIT"}:
        shown = text[col - 1] if col <= len(text) else ""
        return source.span(number, col, col + 1), f"unexpected character '{shown}'", _expected(expected)
    shown = f"'{word}'" if word else "end of line"
    misspelt = _misspelt_keyword(text[: col - 1], expected)
    return span, f"unexpected {shown}", misspelt or _expected(expected)


def _moving_without_and(text: str, col: int, word: str, expected: set[str]) -> tuple[str, str] | None:
    """`moving 20 kN 20 kN ...`: a second force (or spacing) of a moving group written without `and`."""
    if text.split()[:1] != ["moving"] or not word[:1].isdigit() or "AND" not in expected:
        return None
    what = "spacings" if "spaced" in text[: col - 1].split() else "forces"
    fixed = text[: col - 1].rstrip() + " and " + text[col - 1:]
    return f"the {what} of a moving group are joined by `and`", f"write `{fixed.strip()}`"


def _misspelt_keyword(before: str, expected: set[str]) -> str | None:
    """`frm 3 m to span` reads `frm` as a property name and stops at `to`: name the likely keyword."""
    for word in reversed(before.split()):
        for terminal in ("FROM", "TO", "AT"):
            keyword = terminal.lower()
            if terminal in expected and word != keyword and difflib.get_close_matches(word, [keyword], n=1,
                                                                                      cutoff=0.6):
                return f"did you mean '{keyword}' instead of '{word}'?"
    return None


_DIRECTION_EXAMPLES = {"point": "point 12 kN down at 2 m", "uniform": "uniform 2.5 kN/m down",
                       "linear": "linear 0 kN/m to 4 kN/m down from 3 m to 5.4 m"}


def _accepted(text: str, exc: UnexpectedInput) -> set[str]:
    """The terminals the parser really accepts where it stopped (LALR merges look-aheads)."""
    fallback = set(getattr(exc, "expected", None) or getattr(exc, "allowed", None) or ())
    interactive = parser().parse_interactive(text)
    try:
        for _ in interactive.iter_parse():
            pass
        interactive.feed_eof()
    except UnexpectedInput:
        pass
    try:
        return set(interactive.accepts()) or fallback
    except UnexpectedInput:
        return fallback


def _word_at(text: str, col: int) -> str:
    rest = text[col - 1:]
    word = rest.split()[0] if rest.split() else ""
    return word


def _suggest(word: str, choices: tuple[str, ...], what: str) -> str:
    close = difflib.get_close_matches(word, choices, n=1, cutoff=0.6)
    if close:
        return f"did you mean '{close[0]}'?"
    return f"the {what} are: " + ", ".join(choices)


def _expected(expected: set[str]) -> str | None:
    words = sorted({TERMINAL_WORDS.get(name, f"`{name.lower()}`") for name in expected
                    if not name.startswith("__") and name != "COMMENT"})
    if not words:
        return None
    return "expected " + (words[0] if len(words) == 1 else ", ".join(words[:-1]) + " or " + words[-1])

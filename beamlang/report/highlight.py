"""Syntax highlighting of the HTML appendix: numbered `.beam` listing -> HTML spans from beamlang's pygments lexer.

The lexer's rules are beamlang's (`language/lexer.py`); pygments supplies only its regular-expression engine,
and the spans and classes are written here (no pygments formatter or style), so the bytes follow the lexer and
this table. pygments' version is named in each package with the other libraries (`provenance.py`). Every
character of the input is escaped with `html.escape`.
"""

from __future__ import annotations

import html
import re
from functools import lru_cache

from pygments.token import Comment, Keyword, Name, Number, Operator, String

_NUMBERED = re.compile(r" *\d+  ")  # the appendix's own line numbers
TokenType = type(Comment)

# (token type, CSS class); the first type that contains the token wins; anything else is plain text
CLASSES: tuple[tuple[TokenType, str], ...] = (
    (Comment, "cm"), (String, "tx"), (Number, "nu"),
    (Keyword.Constant, "wd"), (Name.Builtin, "wd"), (Operator.Word, "wd"), (Keyword, "kw"), (Operator, "op"),
    (Name.Constant, "un"), (Name.Attribute, "pr"), (Name.Label, "nm"), (Name, "nm"),
)

STYLE = {  # class: CSS declarations (print-friendly colours, dark enough on white)
    "ln": "color: #8a8a8a; user-select: none",
    "cm": "color: #3d7a3d; font-style: italic",
    "tx": "color: #9a3412",
    "nu": "color: #1d4ed8",
    "kw": "color: #7c2d92; font-weight: bold",
    "wd": "color: #0f766e",
    "op": "color: #555555",
    "un": "color: #1f2937",
    "pr": "color: #4b5563",
    "nm": "color: #1f2937; font-weight: bold",
}


@lru_cache(maxsize=1)
def _lexer():
    from beamlang.language.lexer import BeamLexer
    return BeamLexer()


def _class(ttype: TokenType) -> str | None:
    return next((css for kind, css in CLASSES if ttype in kind), None)


def tokens(code: str) -> list[tuple[str | None, str]]:
    """The listing cut into (class, text) pieces whose concatenation is `code`; each line is lexed alone."""
    out: list[tuple[str | None, str]] = []

    def add(kind: str | None, text: str) -> None:
        if out and out[-1][0] is None and kind is None:
            out[-1] = (None, out[-1][1] + text)
        elif text:
            out.append((kind, text))

    for line in code.splitlines(keepends=True):
        number = _NUMBERED.match(line)
        if number:
            add("ln", number.group())
        for _, ttype, text in _lexer().get_tokens_unprocessed(line[number.end() if number else 0:]):
            add(_class(ttype), text)
    return out


def highlight_beam(code: str) -> str:
    """HTML for the inside of a code block of `.beam` text."""
    return "".join(html.escape(text) if kind is None else f'<span class="{kind}">{html.escape(text)}</span>'
                   for kind, text in tokens(code))


def css() -> str:
    return "".join(f".beam-code .{kind} {{ {rule} }}\n" for kind, rule in STYLE.items())

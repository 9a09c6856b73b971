"""Syntax highlighting of `.beam` text for the HTML appendix: a small regular-expression tokenizer of our own.

The output depends on this module alone (no highlighting library), so a calc package rebuilds byte for byte
whatever else is installed. Every character of the input is escaped with `html.escape`.
"""

from __future__ import annotations

import html
import re

STATEMENTS = ("member", "project", "job", "by", "checked", "date", "revision", "units", "span", "material",
              "section", "support", "case", "point", "uniform", "linear", "moment", "self-weight", "settlement", "moving",
              "combine", "limit", "check", "report", "note")
WORDS = ("down", "up", "and", "spaced", "clockwise", "counterclockwise", "at", "from", "to", "fixed", "pin", "roller", "spring",
         "deflection", "stress", "properties", "rectangle", "round", "tube", "box", "I-shape", "x", "si", "us")


def _words(names: tuple[str, ...]) -> str:
    alternatives = "|".join(re.escape(n) for n in sorted(names, key=lambda n: (-len(n), n)))
    return rf"(?<![\w-])(?:{alternatives})(?![\w-])"


# (CSS class, pattern); the first pattern that matches at a position wins; None means plain text.
_RULES = (
    ("ln", r"^ *\d+  "),  # the appendix's own line numbers
    ("cm", r"#[^\n]*"),
    ("tx", r'"(?:[^"\\\n]|\\.)*"'),
    ("nu", r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"),
    ("kw", _words(STATEMENTS)),
    ("wd", _words(WORDS)),
    ("op", r"[=+/\-]"),
    ("un", r"[A-Za-z\u00b5\u03bc\u00b0][\w\u00b7*/^\u00b5\u03bc\u00b0-]*"),
    (None, r"[ \t]+|\n|."),
)
_TOKEN = re.compile("|".join(f"(?P<g{i}>{pattern})" for i, (_, pattern) in enumerate(_RULES)), re.M | re.S)

STYLE = {  # class: CSS declarations (print-friendly colours, dark enough on white)
    "ln": "color: #8a8a8a; user-select: none",
    "cm": "color: #3d7a3d; font-style: italic",
    "tx": "color: #9a3412",
    "nu": "color: #1d4ed8",
    "kw": "color: #7c2d92; font-weight: bold",
    "wd": "color: #0f766e",
    "op": "color: #555555",
    "un": "color: #1f2937",
}


def tokens(code: str) -> list[tuple[str | None, str]]:
    """The text cut into (class, text) pieces whose concatenation is `code`."""
    out: list[tuple[str | None, str]] = []
    for match in _TOKEN.finditer(code):
        kind = _RULES[int(match.lastgroup[1:])][0]
        if out and out[-1][0] is None and kind is None:
            out[-1] = (None, out[-1][1] + match.group())
        else:
            out.append((kind, match.group()))
    return out


def highlight_beam(code: str) -> str:
    """HTML for the inside of a code block of `.beam` text."""
    return "".join(html.escape(text) if kind is None else f'<span class="{kind}">{html.escape(text)}</span>'
                   for kind, text in tokens(code))


def css() -> str:
    return "".join(f".beam-code .{kind} {{ {rule} }}\n" for kind, rule in STYLE.items())

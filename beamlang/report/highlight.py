"""Syntax highlighting of `.beam` text for the HTML appendix: a small Pygments lexer and formatter."""

from __future__ import annotations

from pygments import highlight
from pygments.formatters import HtmlFormatter
from pygments.lexer import RegexLexer, words
from pygments.token import Comment, Keyword, Name, Number, Operator, String, Text

STATEMENTS = ("member", "project", "job", "by", "checked", "date", "revision", "units", "span", "material",
              "section", "support", "case", "point", "uniform", "linear", "moment", "self-weight", "settlement", "combine",
              "limit", "check", "report", "note")
WORDS = ("down", "up", "clockwise", "counterclockwise", "at", "from", "to", "fixed", "pin", "roller", "spring",
         "deflection", "stress", "properties", "rectangle", "round", "tube", "box", "I-shape", "x", "si", "us")


class BeamLexer(RegexLexer):
    """Line numbers of the appendix, comments, quoted text, numbers with their units, keywords."""

    name = "beam"
    aliases = ["beam"]
    tokens = {
        "root": [
            (r"^ *\d+  ", Comment.Special),  # the appendix's own line numbers
            (r"#.*$", Comment.Single),
            (r'"([^"\\]|\\.)*"', String),
            (r"(\d+(\.\d*)?|\.\d+)([eE][+-]?\d+)?", Number),
            (words(STATEMENTS, prefix=r"(?<![\w-])", suffix=r"(?![\w-])"), Keyword),
            (words(WORDS, prefix=r"(?<![\w-])", suffix=r"(?![\w-])"), Name.Builtin),
            (r"[=+/\-]", Operator),
            (r"[A-Za-z\u00b5\u03bc\u00b0][\w\u00b7*/^\u00b5\u03bc\u00b0-]*", Name),
            (r"\n", Text),
            (r"[ \t]+", Text),
            (r".", Text),
        ]
    }


def highlight_beam(code: str) -> str:
    """HTML for a code block of `.beam` text (Pygments escapes every character)."""
    return highlight(code, BeamLexer(), HtmlFormatter(nowrap=True))


def css() -> str:
    return HtmlFormatter(style="default").get_style_defs(".beam-code")

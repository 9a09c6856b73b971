"""Lexer: `.beam` text -> pygments tokens (statement keywords, names, numbers with their units, comments).

Registered under the `pygments.lexers` entry point (alias `beam`, files `*.beam`), so `pygmentize -l beam`
and anything built on pygments colour member files; the calc package's input listing uses it too
(`report/highlight.py`). The words come from `vocabulary.py`; the number and unit patterns are the grammar's.
"""

from __future__ import annotations

from pygments.lexer import RegexLexer, bygroups, default, words
from pygments.token import (Comment, Error, Keyword, Name, Number, Operator, String, Whitespace)

from beamlang.language.vocabulary import (CONNECTIVES, FORCE_DIRECTIONS, KEYWORDS, SHAPES, SUPPORT_KINDS, SYSTEMS,
                                          TURN_DIRECTIONS)

_START, _END = r"(?<![\w-])", r"(?![\w-])"
NUMBER = r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"  # grammar/beam.lark NUMBER
UNIT = r"[A-Za-z\u00b5\u03bc\u00b0][A-Za-z0-9\u00b5\u03bc\u00b0\u00b7*/^]*"  # grammar/beam.lark UNIT
NAME = r"[A-Za-z][A-Za-z0-9_-]*"  # grammar/beam.lark NAME
MARK = r"[A-Za-z0-9][A-Za-z0-9._-]*"  # grammar/beam.lark MARK
STRING = r'"(?:[^"\\\n]|\\.)*"'

_SPACE = [(r"[ \t]+", Whitespace), (r"#[^\n]*", Comment.Single)]
_END_OF_LINE = (r"\n", Whitespace, "#pop")


class BeamLexer(RegexLexer):
    """One statement a line: its keyword, then quantities (number and unit), words, names and quoted text."""

    name = "beamlang"
    aliases = ["beam", "beamlang"]
    filenames = ["*.beam"]
    mimetypes = ["text/x-beam"]

    tokens = {
        "root": [
            (r"\n", Whitespace),
            *_SPACE,
            (r"(member)" + _END, Keyword, "member"),
            (r"(combine)" + _END, Keyword, "combine"),
            # `material timber E ...`: a name before the first property (a property is followed by a number)
            (r"(material)([ \t]+)(" + NAME + r")(?=[ \t]+[A-Za-z])", bygroups(Keyword, Whitespace, Name), "line"),
            (words(KEYWORDS, suffix=_END), Keyword, "line"),
            (r"[^\s#]+", Error, "line"),  # not a statement: the rest of the line is still read
        ],
        "member": [
            _END_OF_LINE,
            *_SPACE,
            (MARK, Name.Label, ("#pop", "line")),
            default(("#pop", "line")),
        ],
        "combine": [  # factors are bare numbers here, not quantities: `1.2 dead` is a factor and a case
            _END_OF_LINE,
            *_SPACE,
            (NUMBER, Number),
            (r"[=+]", Operator),
            (NAME, Name.Label),
            (r"[^\s]", Error),
        ],
        "line": [
            _END_OF_LINE,
            *_SPACE,
            (STRING, String.Double),
            ("(" + NUMBER + r")([ \t]*)(" + UNIT + ")", bygroups(Number, Whitespace, Name.Constant)),
            (NUMBER, Number),  # span/360, span/2
            (words(FORCE_DIRECTIONS + TURN_DIRECTIONS + SYSTEMS, prefix=_START, suffix=_END), Keyword.Constant),
            (words(SHAPES + SUPPORT_KINDS, prefix=_START, suffix=_END), Name.Builtin),
            (r"shear(?=[ \t]+\.?\d)", Name.Attribute),  # the material's `shear 0.18 ksi`, not `include shear`
            (words(CONNECTIVES, prefix=_START, suffix=_END), Operator.Word),
            (r"[=+/\-]", Operator),
            (NAME + r"(?=[ \t]+\.?\d)", Name.Attribute),  # a property: `depth 250 mm`, `E 200 GPa`
            (NAME, Name.Label),  # a case or combination name
            (r"[^\s]", Error),
        ],
    }

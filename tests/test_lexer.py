"""The pygments lexer: registered by its entry point, true to the grammar's words, and used by the package listing."""

from __future__ import annotations

import html
import re
import shutil
import subprocess
import sys
from pathlib import Path

import pytest
from pygments.lexers import get_lexer_by_name, get_lexer_for_filename
from pygments.token import Comment, Error, Keyword, Name, Number, Operator, String

from beamlang.language import vocabulary as v
from beamlang.language.lexer import BeamLexer
from beamlang.language.grammar import grammar_path
from beamlang.report.highlight import CLASSES
from casefiles import EXAMPLES
from engine_helpers import analyse_text

EXAMPLE_FILES = sorted(EXAMPLES.glob("*.beam"))


def _tokens(text: str) -> list[tuple[object, str]]:
    return [(t, s) for _, t, s in BeamLexer().get_tokens_unprocessed(text) if s.strip()]


def test_the_entry_point_registers_the_lexer():
    assert type(get_lexer_by_name("beam")) is BeamLexer
    assert type(get_lexer_for_filename("b3.beam")) is BeamLexer


def test_the_vocabulary_is_the_grammars():
    grammar = grammar_path().read_text(encoding="utf-8")
    literals = set(re.findall(r'"([a-z][a-z-]*)"', grammar))  # keyword strings of the rules
    alternatives = {name: set(words.split("|"))
                    for name, words in re.findall(r"^([A-Z_]+)\.2: /\(([^)]*)\)", grammar, flags=re.M)}
    assert alternatives["FIELD"] == set(v.FIELDS)
    assert alternatives["SHAPE"] == set(v.SHAPES)
    assert alternatives["SUPPORT_KIND"] == set(v.SUPPORT_KINDS)
    assert alternatives["FORCE_DIR"] | alternatives["TURN_DIR"] == set(v.FORCE_DIRECTIONS + v.TURN_DIRECTIONS)
    assert alternatives["SYSTEM"] == set(v.SYSTEMS)
    assert literals == (set(v.KEYWORDS) - set(v.FIELDS)) | set(v.CONNECTIVES)
    assert set(v.FORMS) == set(v.KEYWORDS)


@pytest.mark.parametrize("path", EXAMPLE_FILES, ids=lambda p: p.name)
def test_every_example_lexes_whole_and_without_errors(path):
    text = path.read_text(encoding="utf-8")
    pieces = list(BeamLexer().get_tokens_unprocessed(text))
    assert "".join(s for _, _, s in pieces) == text
    assert [s for _, t, s in pieces if t in Error] == []


@pytest.mark.parametrize("line, expected", [
    ("member 2B-1 \"Lintel\"  # a mark may start with a digit",
     [(Keyword, "member"), (Name.Label, "2B-1"), (String.Double, '"Lintel"'), (Comment.Single, "# a mark may start with a digit")]),
    ("material timber E 1400 ksi shear 0.18 ksi",
     [(Keyword, "material"), (Name, "timber"), (Name.Attribute, "E"), (Number, "1400"), (Name.Constant, "ksi"),
      (Name.Attribute, "shear"), (Number, "0.18"), (Name.Constant, "ksi")]),
    ('section "2x10" rectangle width 1.5 in depth 9.25 in',
     [(Keyword, "section"), (String.Double, '"2x10"'), (Name.Builtin, "rectangle"), (Name.Attribute, "width"),
      (Number, "1.5"), (Name.Constant, "in"), (Name.Attribute, "depth"), (Number, "9.25"), (Name.Constant, "in")]),
    ("  point 12 kN down at span - 1.2 m",
     [(Keyword, "point"), (Number, "12"), (Name.Constant, "kN"), (Keyword.Constant, "down"), (Operator.Word, "at"),
      (Operator.Word, "span"), (Operator, "-"), (Number, "1.2"), (Name.Constant, "m")]),
    ("combine strength = 1.2 dead + 1.6 live",  # a factor is a bare number, not a quantity in a unit `dead`
     [(Keyword, "combine"), (Name.Label, "strength"), (Operator, "="), (Number, "1.2"), (Name.Label, "dead"),
      (Operator, "+"), (Number, "1.6"), (Name.Label, "live")]),
    ("limit deflection live span/360",
     [(Keyword, "limit"), (Operator.Word, "deflection"), (Name.Label, "live"), (Operator.Word, "span"),
      (Operator, "/"), (Number, "360")]),
    ("hinge at 7.2 m", [(Keyword, "hinge"), (Operator.Word, "at"), (Number, "7.2"), (Name.Constant, "m")]),
    ("  self-weight", [(Keyword, "self-weight")]),
    ("spann 5 m", [(Error, "spann"), (Number, "5"), (Name.Constant, "m")]),
])
def test_tokens_of_each_statement_kind(line, expected):
    assert _tokens(line + "\n") == expected


def test_pygmentize_highlights_an_example():
    tool = shutil.which("pygmentize", path=str(Path(sys.executable).parent)) or shutil.which("pygmentize")
    command = [tool] if tool else [sys.executable, "-m", "pygments"]  # the same command line, where no script is
    out = subprocess.run([*command, "-l", "beam", "-f", "html", str(EXAMPLES / "mezzanine-edge-beam.beam")],
                         capture_output=True, text=True, check=True).stdout
    assert '<span class="k">member</span>' in out  # pygments' own short class of Keyword
    assert '<span class="nl">B-3</span>' in out and '<span class="m">5.4</span>' in out
    assert 'class="err"' not in out


def _listing(page: str) -> list[tuple[str | None, str]]:
    body = page.split('<pre class="beam-code"><code>', 1)[1].split("</code></pre>", 1)[0]
    pieces = []
    for match in re.finditer(r'<span class="(\w+)">(.*?)</span>|([^<]+)', body, flags=re.S):
        pieces.append((match.group(1), html.unescape(match.group(2) if match.group(1) else match.group(3))))
    return pieces


def test_the_package_listing_is_the_lexers(tmp_path):
    from beamlang.report.package import write_package
    text = (EXAMPLES / "hinged-roof-purlin.beam").read_text(encoding="utf-8")
    folder = write_package(analyse_text(text), tmp_path)
    pieces = [p for p in _listing((folder / f"{folder.name}.html").read_text(encoding="utf-8")) if p[0] != "ln"]
    assert "".join(s for _, s in pieces) == text
    lexer = get_lexer_by_name("beam")  # the registered lexer, through the listing's table of classes
    expected = [(next((c for kind, c in CLASSES if t in kind), None), s)
                for _, t, s in lexer.get_tokens_unprocessed(text) if s.strip()]
    assert [(c, s) for c, s in pieces if s.strip()] == expected
    assert ("kw", "hinge") in expected and ("nm", "snow") in expected  # statements and case names

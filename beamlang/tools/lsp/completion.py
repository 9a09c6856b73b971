"""Completion: the text before the cursor -> what the grammar accepts there, in this file's terms (statements valid
at that place, units of the quantity's kind after a number, case and combination names where one is referred to)."""

from __future__ import annotations

import re

from lsprotocol import types

from beamlang.source import split_lines
from beamlang.language import syntax as s
from beamlang.language.build.sections import MATERIAL_PROPERTIES
from beamlang.language.grammar import accepted_after, literals
from beamlang.language.sections import DIMENSION_KIND, SHAPE_DIMENSIONS
from beamlang.language.units import COMMON_UNITS, factor_of, is_us
from beamlang.language.vocabulary import (FIELDS, FORCE_DIRECTIONS, FORMS, LOADS, SHAPES, SUPPORT_KINDS, SYSTEMS,
                                          TURN_DIRECTIONS)
from beamlang.tools.lsp.document import Analysed, Ranges, names
from beamlang.tools.lsp.hover import code_end

_PARTIAL = re.compile(r"[A-Za-z\u00b5\u03bc\u00b0][A-Za-z0-9\u00b5\u03bc\u00b0\u00b7*/^_-]*$")  # a word being typed
_NUMBER_LAST = re.compile(r"(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?\s*$")
ONCE = ("member", "units", "span", "catalogue", *FIELDS)  # statements a member has at most one of
WORDS = {"SHAPE": SHAPES, "SUPPORT_KIND": SUPPORT_KINDS, "FORCE_DIR": FORCE_DIRECTIONS, "TURN_DIR": TURN_DIRECTIONS,
         "SYSTEM": SYSTEMS}
# the kind of the quantity a statement's numbers are, unless the word before the number says otherwise
STATEMENT_KIND = {"span": "length", "point": "force", "uniform": "force per length", "linear": "force per length",
                  "moment": "moment", "settlement": "length", "moving": "force", "limit": "length", "report": "length",
                  "support": "force per length"}
WORD_KIND = {"at": "length", "from": "length", "spaced": "length", "over": "length", "x": "length", "-": "length",
             "supports": "angle", "spring": "force per length", **{k.split()[-1]: v for k, v in MATERIAL_PROPERTIES.items()},
             **DIMENSION_KIND}


def complete(analysed: Analysed, line: int, col: int, ranges: Ranges) -> types.CompletionList:
    """The completions at a 1-based line and code-point column."""
    rows = split_lines(analysed.text)
    before = rows[line - 1][:col - 1] if 1 <= line <= len(rows) else ""
    if code_end(before) < len(before) or before.count('"') % 2:
        return types.CompletionList(is_incomplete=False, items=[])  # in a comment or a quoted text
    partial = _PARTIAL.search(before)
    start = partial.start() if partial else len(before)
    accepted = accepted_after(before[:start]) or set()
    where = ranges.between(line, start + 1, line, col)
    items: list[types.CompletionItem] = []
    for terminal in sorted(accepted):
        for label, kind, detail, order in _candidates(terminal, before[:start], analysed):
            items.append(types.CompletionItem(label=label, kind=kind, detail=detail, sort_text=f"{order}{label}",
                                              text_edit=types.TextEdit(range=where, new_text=label)))
    return types.CompletionList(is_incomplete=False, items=_unique(items))


def _unique(items: list[types.CompletionItem]) -> list[types.CompletionItem]:
    seen: dict[str, types.CompletionItem] = {}
    for item in items:
        seen.setdefault(item.label, item)
    return sorted(seen.values(), key=lambda i: i.sort_text)


Candidate = tuple[str, types.CompletionItemKind, str | None, str]  # label, kind, detail, sort group


def _candidates(terminal: str, prefix: str, analysed: Analysed) -> list[Candidate]:
    word = literals().get(terminal)
    if not prefix.strip():
        return _statements(terminal, word, prefix, analysed)
    if word == "x":  # the grammar lets any property take `W x T`; only the flange is written so
        words = prefix.split()
        return [(word, types.CompletionItemKind.Keyword, "flange width x thickness", "1")] if words[-3:-2] == [
            "flange"] else []
    if word == "allowable":  # only a material without a strength yet takes `allowable bending`
        words = prefix.split()
        return [] if words[0] != "material" or {"yield", "allowable"} & set(words) else [
            (word, types.CompletionItemKind.Keyword, "allowable bending STRESS shear STRESS", "1")]
    if word is not None:
        return [(word, types.CompletionItemKind.Keyword, None, "1")] if word[0].isalpha() else []
    if terminal in WORDS:
        return [(w, types.CompletionItemKind.EnumMember, None, "1") for w in WORDS[terminal]]
    if terminal == "UNIT":
        return _units(prefix, analysed)
    if terminal == "NAME":
        return _names(prefix, analysed)
    return []


def _statements(terminal: str, word: str | None, prefix: str, analysed: Analysed) -> list[Candidate]:
    """Statement keywords at the start of a line: loads on an indented line, the others on an unindented one,
    without those a member has once and this file has already."""
    keywords = FIELDS if terminal == "FIELD" else (word,) if word is not None else ()
    present = {_keyword(st) for _, st in analysed.statements()}
    out = []
    for keyword in keywords:
        if (keyword in LOADS) != bool(prefix) or (keyword in ONCE and keyword in present):
            continue
        form, meaning = FORMS[keyword]
        out.append((keyword, types.CompletionItemKind.Keyword, form, "0"))
    return out


def _keyword(st: s.Statement) -> str:
    return st.name if isinstance(st, s.Field) else {s.SpanLength: "span", s.SelfWeight: "self-weight",
                                                   s.StressCheck: "check", s.SlopeLimit: "limit",
                                                   s.FrequencyLimit: "limit"}.get(
        type(st), type(st).__name__.lower())


def _units(prefix: str, analysed: Analysed) -> list[Candidate]:
    """Units of the kind the number before the cursor must have; the member's own system first."""
    kind = quantity_kind(prefix)
    if kind is None:
        return []
    us = _system(analysed) == "us"
    out = []
    for unit in COMMON_UNITS:
        f = factor_of(unit)
        if f is not None and f.kind == kind:
            out.append((unit, types.CompletionItemKind.Unit, kind, "0" if _us_unit(unit) == us else "1"))
    return out


US_WORDS = {"ft", "in", "lbf", "kip", "psi", "ksi", "lb", "plf", "klf", "psf", "ksf", "pcf"}


def _us_unit(unit: str) -> bool:
    return any(part in US_WORDS for part in re.split(r"[*/^\d]+", unit))


def quantity_kind(prefix: str) -> str | None:
    """The kind of quantity whose number ends `prefix` (`point 12` -> force, `... at 3` -> length)."""
    if not _NUMBER_LAST.search(prefix):
        return None
    words = prefix.split()
    before = words[-2] if len(words) >= 2 else ""
    if before == "to" and "from" in words[:-2]:
        return "length"
    if before == "and":
        return "length" if "spaced" in words else "force"
    return WORD_KIND.get(before) or STATEMENT_KIND.get(words[0])


def _system(analysed: Analysed) -> str:
    if analysed.member is not None:
        return analysed.member.units
    units = next((st.system.text for _, st in analysed.statements() if isinstance(st, s.Units)), None)
    length = next((st.length.unit for _, st in analysed.statements() if isinstance(st, s.SpanLength)), None)
    return units or ("us" if length and is_us(length) else "si")


def _names(prefix: str, analysed: Analysed) -> list[Candidate]:
    """Case names in a combination's terms; cases and combinations after limit and check; unused properties."""
    words = prefix.split()
    cases, combos = names(analysed)
    targets = [(c.name.text, types.CompletionItemKind.Event, f"case, line {c.span.line}", "0") for c in cases]
    if words[0] == "combine":
        return targets if "=" in words else []
    if words[0] == "pattern":
        return targets
    if words[0] in ("limit", "check"):
        return targets + [(c.name.text, types.CompletionItemKind.Operator, f"combination, line {c.span.line}", "0")
                          for c in combos]
    if words[0] == "material" and words[-1] == "allowable":
        return [("bending", types.CompletionItemKind.Property, "stress", "0")]
    if words[0] == "material":  # one strength: `yield`, or `allowable bending` (offered as its keyword)
        strength = {"yield", "allowable"} & set(words)
        return [(p, types.CompletionItemKind.Property, MATERIAL_PROPERTIES[p], "0") for p in MATERIAL_PROPERTIES
                if p not in words and " " not in p and not (strength and p == "yield")]
    shape = next((w for w in words if w in SHAPE_DIMENSIONS), None)
    if words[0] == "section" and shape is not None:
        return [(d, types.CompletionItemKind.Property, DIMENSION_KIND.get(d, "length"), "0")
                for d in sum(SHAPE_DIMENSIONS[shape], ()) if d not in words]
    return []

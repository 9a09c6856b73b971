"""Characters: one line of a member -> the first character a reader cannot see or that would change the lines.

A line ends at LF (or CRLF) and nowhere else: a vertical tab, form feed, NEL or Unicode line separator
inside a comment would otherwise start a statement that an editor shows as part of the comment. Control
characters, invisible format characters (zero-width spaces, bidirectional overrides, a second byte-order
mark), spaces other than U+0020 and digits other than 0-9 are refused by name (U+00A0 NO-BREAK SPACE);
spaces and letters of any script may stand inside quoted text and comments. In quoted text a backslash
starts one of two escapes, `\\"` (a quote) and `\\\\` (a backslash); any other is refused."""

from __future__ import annotations

import unicodedata
from dataclasses import dataclass

# Names of the characters that have none in the Unicode database (the C0 and C1 controls), as ISO 6429 names them.
_CONTROL_NAMES = {
    0x00: "NULL", 0x07: "BELL", 0x08: "BACKSPACE", 0x09: "CHARACTER TABULATION", 0x0A: "LINE FEED",
    0x0B: "LINE TABULATION", 0x0C: "FORM FEED", 0x0D: "CARRIAGE RETURN", 0x1B: "ESCAPE",
    0x1C: "INFORMATION SEPARATOR FOUR", 0x1D: "INFORMATION SEPARATOR THREE", 0x1E: "INFORMATION SEPARATOR TWO",
    0x1F: "INFORMATION SEPARATOR ONE", 0x7F: "DELETE", 0x85: "NEXT LINE", 0x9B: "CONTROL SEQUENCE INTRODUCER",
}
# What other programs (Python's str.splitlines among them) take for the end of a line.
LINE_BREAKS = frozenset("\x0b\x0c\r\x1c\x1d\x1e\x85\u2028\u2029")


def char_name(ch: str) -> str:
    """`U+00A0 NO-BREAK SPACE`: how a character is named in messages (never the character itself)."""
    name = unicodedata.name(ch, None) or _CONTROL_NAMES.get(ord(ch)) or (
        "control character" if unicodedata.category(ch) == "Cc" else "unnamed character")
    return f"U+{ord(ch):04X} {name}"


@dataclass(frozen=True, slots=True)
class BadCharacter:
    col: int  # 1-based column of the character
    width: int  # characters the caret covers
    message: str
    hint: str


def first_problem(text: str) -> BadCharacter | None:
    """The first refused character of one line (without its line ending), or None."""
    in_string = comment = False
    i = 0
    while i < len(text):
        ch = text[i]
        category = unicodedata.category(ch)
        if ch in LINE_BREAKS:
            return BadCharacter(i + 1, 1, f"{char_name(ch)} inside a line",
                                "lines end at a line feed (LF or CRLF) only; other editors and programs may break "
                                "the line here and show a different text: remove it")
        if category == "Cc" and ch != "\t":
            return BadCharacter(i + 1, 1, f"control character {char_name(ch)}", "remove it")
        if category in ("Cf", "Cs", "Co", "Cn"):
            return BadCharacter(i + 1, 1, f"invisible character {char_name(ch)}",
                                "it does not show in an editor; remove it")
        if in_string:
            if ch == "\\":
                following = text[i + 1:i + 2]
                if following not in ('"', "\\"):
                    shown = following if following and following.isprintable() else ""
                    return BadCharacter(i + 1, 1 + len(shown), f"unknown escape '\\{shown}' in quoted text",
                                        'a backslash is written \\\\ (C:\\\\calc) and a quote \\"')
                i += 1
            elif ch == '"':
                in_string = False
        elif not comment:
            if category == "Zs" and ch != " ":
                return BadCharacter(i + 1, 1, f"invisible character {char_name(ch)}",
                                    "write an ordinary space (U+0020)")
            if category == "Nd" and not ch.isascii():
                return BadCharacter(i + 1, 1, f"{char_name(ch)} is not one of the digits 0-9",
                                    "write numbers with the digits 0 to 9")
            if ch == '"':
                in_string = True
            elif ch == "#":
                comment = True
        i += 1
    return None


"""Maintainer tool: Latin Modern Math (Debian fonts-lmodern) -> the small WOFF subset embedded in HTML.

Run once after changing the character set: `python -m beamlang.report.fontsubset` (needs fontTools and
the Debian package fonts-lmodern). The output is committed; builds only read it."""

from __future__ import annotations

import sys
from pathlib import Path

SOURCE = Path("/usr/share/texmf/fonts/opentype/public/lm-math/latinmodern-math.otf")
TARGET = Path(__file__).resolve().parent / "assets" / "latinmodern-math-subset.woff"
RANGES = [(0x20, 0x7E), (0xA0, 0xFF), (0x391, 0x3C9), (0x2010, 0x2027), (0x2032, 0x2034), (0x210E, 0x210E),
          (0x1D434, 0x1D467), (0x1D6E2, 0x1D71B)]  # Chromium maps single-letter <mi> to math italic
OPERATORS = "−×·±≤≥≈≠√∑∫∞∂∈⋅∕∣‖⟨⟩"


def main() -> int:
    from fontTools import subset
    options = subset.Options()
    options.flavor = "woff"
    options.layout_features = ["*"]
    options.drop_tables = []
    options.name_IDs = ["*"]
    options.notdef_outline = True
    font = subset.load_font(str(SOURCE), options)
    sub = subset.Subsetter(options)
    sub.populate(unicodes=[c for lo, hi in RANGES for c in range(lo, hi + 1)] + [ord(c) for c in OPERATORS])
    sub.subset(font)
    _rename(font)  # the GUST Font License asks that derived fonts carry new names
    font.flavor = "woff"
    font.save(str(TARGET))
    print(f"{TARGET.name}: {TARGET.stat().st_size} bytes; MATH table kept: {'MATH' in font}")
    return 0


def _rename(font) -> None:
    new = {1: FAMILY, 3: f"{FAMILY} (subset of Latin Modern Math 1.959)", 4: FAMILY, 6: FAMILY.replace(" ", ""),
           16: FAMILY}
    for record in font["name"].names:
        if record.nameID in new:
            record.string = new[record.nameID]


FAMILY = "Beamlang Math Subset"


if __name__ == "__main__":
    sys.exit(main())

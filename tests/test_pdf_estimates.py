"""The converter's shortcuts around the typesetter's measuring: a table it calls `small` (placed unbreakable
without being measured) is never taller than a sheet, and a display it calls `small` is never wider than the text.
Checked by measuring, in Typst, tables and formulas made to be awkward: long words, long formulas in narrow
columns, many rows."""

from __future__ import annotations

import random
from pathlib import Path

from beamlang.language.frontend import load
from beamlang.report.pdf import member_source
from beamlang.report.pdf.markup import estimate_mm, surely_fits, surely_tall
from beamlang.report.pdf.sheet import MARGINS, PAPERS, query

ROOT = Path(__file__).resolve().parents[1]
FORMULAS = ["$-4.13886 \\times 10^{-5}\\,x^{3} + 0.000335248\\,x^{2} - 0.0016293 = 0$", "$x^{2}$",
            "$\\frac{P a (L - a)}{6 E I L}$", "WWWWWWWWWWWWWWWWWWWWWWWW", "mmmm mmmmmmm mm mmmmmmmmmm",
            "`point 3 kN down at 1.00 m`", "x = 2.700282268, a root of the degree-4 factor (irrational)",
            "$-9.4697 \\times 10^{-7}\\,x^{5} - 1.48295 \\times 10^{-5}\\,x^{4} + 0.00017382\\,x^{3}$",
            "$\\theta_{B} = \\frac{W L^{2}}{16 E I} \\qquad M W M W \\le \\delta_{\\mathrm{max}}$", "0 ≤ x ≤ 0.7"]


def _cell(rng: random.Random) -> str:
    return " ".join(rng.choice(FORMULAS) for _ in range(rng.randint(1, 4)))


def _tables(seed: int, n: int) -> list[list[list[str]]]:
    rng = random.Random(seed)
    out = []
    while len(out) < n:
        cols, rows = rng.randint(2, 7), rng.randint(1, 30)
        cells = [[_cell(rng) for _ in range(cols)] for _ in range(rows + 1)]
        if surely_fits(cells):
            out.append(cells)
    return out


def _measured(markdown: str, paper: str) -> list:
    """(kind, height in pt) of every table, as the typesetter measures it, on the examples' first member."""
    member = load(sorted((ROOT / "examples").glob("*.beam"))[0]).member
    source = member_source(member, markdown).replace('#let bl-paper = "a4"', f'#let bl-paper = "{paper}"')
    probe = ('\n#let bl-table(n, header, cells, small: false, tall: false) = {\n  set text(size: 8pt, hyphenate: false)\n'
             '  let t = table(columns: n, inset: (x: 3.5pt, y: 2.5pt), table.header(..header.map(c => strong(c))), '
             '..cells)\n  context [#metadata((small, measure(t, width: bl-size.get().width).height.pt())) <h>]\n}\n')
    source = source.replace("// A display formula", probe + "// A display formula", 1)
    return [tuple(item["value"]) for item in query(source, {}, "<h>")]


def test_a_table_called_small_is_never_taller_than_a_sheet():
    tables = _tables(7, 40)
    markdown = "\n".join("| " + " | ".join(t[0]) + " |\n|" + "---|" * len(t[0]) + "\n" +
                         "\n".join("| " + " | ".join(r) + " |" for r in t[1:]) + "\n" for t in tables)
    for paper in ("a4", "us-letter"):
        heights = _measured(markdown, paper)
        assert len(heights) == len(tables) and all(small for small, _h in heights)
        body = (PAPERS["a4" if paper == "a4" else "letter"][1] - MARGINS[1]) * 72 / 25.4
        tallest = max(h for _s, h in heights)
        assert tallest <= body, (paper, tallest, body)
        assert tallest >= 0.3 * body  # the sample reaches well into the sheet: the estimate is not trivially safe


def test_the_estimate_is_safe_by_a_quarter_again_on_awkward_tables():
    rng = random.Random(3)
    tables = [[[_cell(rng) for _ in range(rng.randint(2, 7))]] for _ in range(30)]
    tables = [t * rng.randint(2, 12) for t in tables]
    markdown = "\n".join("| " + " | ".join(t[0]) + " |\n|" + "---|" * len(t[0]) + "\n" +
                         "\n".join("| " + " | ".join(r) + " |" for r in t[1:]) + "\n" for t in tables)
    for t, (_small, height) in zip(tables, _measured(markdown, "a4")):
        assert estimate_mm(t) >= 1.25 * height * 25.4 / 72, t[0]  # measured: 1.37 to 4.6 times


def test_a_formula_counts_what_it_draws_not_its_source():
    from beamlang.report.pdf.markup import characters
    assert characters("$\\times 10^{-5}\\,x^{3}$") == 2 + 1 + 1 + 2 + 1 + 0.25 + 1 + 1  # ×, 1, 0, -, 5, thin space, x, 3
    assert characters("$W$ and $w$") == 1.5 + 5 + 1
    assert characters("$x^{2}$") < len("$x^{2}$")


def test_narrow_columns_keep_their_width_and_wide_ones_share_the_rest():
    from beamlang.report.pdf.markup import _CHAR_MM, _INSET_MM, _column_widths, body_mm
    room = body_mm()[0]
    widths = _column_widths([[4, 200, 300]])
    assert widths[0] == 4 * _CHAR_MM + _INSET_MM and widths[1] == widths[2] == (room - widths[0]) / 2
    assert _column_widths([[4, 5]]) == [4 * _CHAR_MM + _INSET_MM, 5 * _CHAR_MM + _INSET_MM]
    assert _column_widths([[100, 100, 100]]) == [room / 3] * 3


def test_a_table_called_tall_is_taller_than_every_sheet():
    """The least rows that make a table `tall`, of the shortest cells there are (one character, an inline formula
    of one letter, an empty row among them), measured: taller than the text of A4 and US letter less bl-table's
    room, so that the typesetter would have broken it too."""
    shortest = [[".", "$x$"], ["", ""], ["1", "-"], ["$-$", "a"]]
    tables = []
    for k in range(4):
        rows = [["a", "b"]]
        while not surely_tall(rows):
            rows.append(shortest[(len(rows) + k) % len(shortest)])
        tables.append(rows)
        assert not surely_tall(rows[:-1])
    markdown = "\n".join("| " + " | ".join(t[0]) + " |\n|---|---|\n" + "\n".join("| " + " | ".join(r) + " |" for r in t[1:]) +
                         "\n" for t in tables)
    heights = [h for _small, h in _measured(markdown, "a4")]
    least = (max(h for _, h in PAPERS.values()) - MARGINS[1] - 8) * 72 / 25.4
    assert len(heights) == len(tables) and min(heights) > least, (heights, least)
    assert min(heights) < 1.2 * least  # the bound is close: a table a little shorter is measured
    assert not surely_tall([["a", "b"]] + [["1", "2"]] * 60)


def test_the_estimate_turns_away_a_tall_table():
    assert not surely_fits([["a", "b"]] + [["1", "2"]] * 60)
    assert surely_fits([["a", "b"]] + [["1", "2"]] * 10)


def test_a_display_called_small_is_never_wider_than_the_text():
    from beamlang.report.pdf.markup import _MATH_CHAR_MM, body_mm
    most = int(body_mm()[0] / _MATH_CHAR_MM)
    awkward = ["W" * most, "=".join(["W"] * ((most + 1) // 2)), "M + " * (most // 4), "\\frac{W}{W}" * (most // 11)]
    markdown = "\n".join(f"$$\n{tex[:most - 3]}\n$$\n" for tex in awkward)
    member = load(sorted((ROOT / "examples").glob("*.beam"))[0]).member
    source = member_source(member, markdown)
    assert source.count("small: true") == len(awkward)
    probe = "\n#let bl-display(eq, small: false) = context [#metadata(measure(eq).width.pt()) <w>]\n"
    source = source.replace("// A figure:", probe + "// A figure:", 1)
    widths = [item["value"] for item in query(source, {}, "<w>")]
    assert len(widths) == len(awkward)
    assert max(widths) <= body_mm()[0] * 72 / 25.4, widths
    assert max(widths) >= 0.5 * body_mm()[0] * 72 / 25.4  # the sample reaches across the text


def test_a_long_general_formula_is_broken_into_lines_of_the_same_sum():
    """A two-span member's line-load formula (three factors and a long sum) is shown on several lines; the
    lines hold exactly the sum sympy prints, term for term, after the other factors."""
    import sympy

    from beamlang.report.formula_md import LINE, _display
    from beamlang.report.tex import sympy_tex
    L, a, b, x, xb, w, E, I = sympy.symbols("L a b x x_B w E I")
    big = sympy.expand((L**3 * x - 3 * L * x * xb + a * b * x**2 - 4 * a**2 * xb + b * xb**2) * (L - a + 2 * b - xb) *
                       (x + L - 3 * a))
    expr = -w * x * (x - xb) * big / (24 * E * I * xb)
    shown = _display(expr, "\\qquad (0 \\le x \\le 1)")
    lead = "v(x) = {} & - \\frac{w x (x - x_{B})}{24 E I x_{B}} ("
    assert shown.startswith("$$\\begin{aligned} " + lead)
    rows = shown.removeprefix("$$\\begin{aligned} ").removesuffix(" \\end{aligned}$$").split(" \\\\ ")
    assert len(rows) >= 3 and all(len(r) <= LINE + 80 for r in rows)
    joined = " ".join(r.removeprefix(lead) if k == 0 else r.removeprefix("& \\quad ") for k, r in enumerate(rows))
    assert " ".join(joined.removesuffix(") \\qquad (0 \\le x \\le 1)").split()) == " ".join(sympy_tex(big).split())
    short = _display(w * x / (E * I), "")
    assert "aligned" not in short


def test_a_long_table_breaks_freely_without_being_measured():
    from beamlang.report.pdf.markup import LONG_TABLE_ROWS, breaks_freely, to_typst_markup
    rows = [["a", "b"]] + [["1", "$x$"]] * LONG_TABLE_ROWS
    assert not surely_tall(rows) and breaks_freely(rows) and not breaks_freely(rows[:-1])
    markdown = "| a | b |\n|---|---|\n" + "".join("| 1 | $x$ |\n" for _ in range(LONG_TABLE_ROWS))
    assert to_typst_markup(markdown).count("tall: true") == 1
    assert to_typst_markup(markdown.rsplit("| 1", 1)[0]).count("tall: true") == 0

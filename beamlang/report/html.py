"""HTML: calc-package Markdown + figures -> one self-contained page (MathML, embedded font and figures, no script)."""

from __future__ import annotations

import base64
import html
import re
import xml.etree.ElementTree as ET
from functools import lru_cache
from pathlib import Path

ASSETS = Path(__file__).resolve().parent / "assets"
_UNKNOWN_COMMAND = re.compile(r"<mi>\\[A-Za-z]+</mi>")
_SINGLE_MATHRM = re.compile(r"\\mathrm\{([A-Za-z])\}")


class MathError(Exception):
    """A formula that latex2mathml cannot render faithfully (our bug: the report writer made it)."""


@lru_cache(maxsize=8192)
def tex_to_mathml(tex: str, display: bool) -> str:
    """One formula as MathML; remembered, as a package repeats many formulas (a 20-case member: 1969
    distinct of 4527)."""
    from latex2mathml.converter import convert
    tex = _SINGLE_MATHRM.sub(r"\\mathrm{{\1}}", tex)  # one-letter \mathrm renders italic otherwise
    tex = tex.replace("{aligned}", "{align*}")  # latex2mathml's aligned shows its & and does not break
    out = convert(tex, display="block" if display else "inline")
    if _UNKNOWN_COMMAND.search(out):
        raise MathError(f"unknown TeX command in formula: {tex}")
    if display and (scale := print_scale(out)) < 100:
        out = out.replace("<math ", f'<math data-print-scale="{scale}" ', 1)
    return out


PRINT_WIDTH_EM = 40.0  # the printed text width (A4 or letter less the @page margins) in em of the math font
PRINT_SCALES = (90, 80, 70, 60, 50, 40, 30)


def print_scale(mathml: str) -> int:
    """The font size in percent at which a display formula fits the printed text width (an estimate from its
    glyph count; a fraction is as wide as its wider part); 100 when it fits as it is."""
    width = _width(ET.fromstring(mathml))
    fits = [s for s in PRINT_SCALES if width * s / 100 <= PRINT_WIDTH_EM]
    return 100 if width <= PRINT_WIDTH_EM else (fits[0] if fits else PRINT_SCALES[-1])


def _width(node) -> float:
    tag = node.tag.rsplit("}", 1)[-1]
    if tag == "mfrac":
        return max((_width(child) for child in node), default=0.0) + 0.4
    if tag in ("msub", "msup", "msubsup"):
        parts = [_width(child) for child in node]
        return (parts[0] + 0.7 * sum(parts[1:])) if parts else 0.0
    if tag in ("mi", "mn", "mtext"):
        return 0.55 * len(node.text or "")
    if tag == "mo":
        return 0.55 * len(node.text or "") + 0.5
    if tag == "mspace":
        return 1.0
    return sum(_width(child) for child in node)


@lru_cache(maxsize=1)
def _markdown():
    from markdown_it import MarkdownIt
    from mdit_py_plugins.anchors import anchors_plugin
    from mdit_py_plugins.dollarmath import dollarmath_plugin
    md = MarkdownIt("commonmark", {"html": False, "highlight": _highlight}).enable("table")  # raw HTML is escaped
    dollarmath_plugin(md, allow_digits=False, renderer=lambda s, o: tex_to_mathml(s, bool(o.get("display_mode"))))
    anchors_plugin(md, min_level=2, max_level=3, slug_func=_slug, permalink=False)
    return md


@lru_cache(maxsize=1)
def parsed(markdown: str) -> tuple:
    """markdown-it's tokens of a package's text, parsed once for both its HTML and its PDF."""
    return tuple(_markdown().parse(markdown, {}))


def _highlight(code: str, lang: str, _attrs) -> str:
    """The appendix (an ```text block of the input file) in colour; other blocks stay plain."""
    if lang != "text":
        return ""
    from beamlang.report.highlight import highlight_beam
    return f'<pre class="beam-code"><code>{highlight_beam(code)}</code></pre>\n'


def _slug(text: str) -> str:
    return re.sub(r"[^a-z0-9]+", "-", text.lower()).strip("-") or "section"


def member_html(markdown: str, title: str, figures: dict[str, str]) -> str:
    """The page: `figures` maps each relative SVG path used in the Markdown to its SVG text."""
    md = _markdown()
    body = md.renderer.render(list(parsed(markdown)), md.options, {})
    body = _embed_figures(body, figures)
    font = base64.b64encode((ASSETS / "latinmodern-math-subset.woff").read_bytes()).decode("ascii")
    return (f'<!DOCTYPE html>\n<html lang="en">\n<head>\n<meta charset="utf-8">\n'
            f'<meta name="viewport" content="width=device-width, initial-scale=1">\n'
            f"<title>{html.escape(title)}</title>\n<style>\n@font-face {{ font-family: 'Beamlang Math'; "
            f"src: url(data:font/woff;base64,{font}) format('woff'); }}\n{CSS}{_code_css()}</style>\n</head>\n"
            f"<body>\n<main>\n{body}</main>\n</body>\n</html>\n")


def _code_css() -> str:
    from beamlang.report.highlight import css
    return css() + "\n"


def _embed_figures(body: str, figures: dict[str, str]) -> str:
    def replace(match: re.Match) -> str:
        src = html.unescape(match.group(1))
        if src not in figures:
            raise KeyError(f"figure {src} was not built")
        data = base64.b64encode(figures[src].encode("utf-8")).decode("ascii")
        return f'src="data:image/svg+xml;base64,{data}"'
    return re.sub(r'src="([^"]+\.svg)"', replace, body)


def check_mathml(page: str) -> int:
    """Every <math> element parses as XML; returns how many there are."""
    count = 0
    for chunk in re.findall(r"<math.*?</math>", page, flags=re.S):
        ET.fromstring(chunk)
        count += 1
    return count


CSS = """
:root { --ink: #1b1b1b; --rule: #c8c8c8; --head: #1f4e79; }
body { font-family: "DejaVu Serif", Georgia, serif; color: var(--ink); margin: 0; background: #fff; }
main { max-width: 60rem; margin: 0 auto; padding: 1.5rem 2rem 4rem; line-height: 1.45; }
math[display="block"] { overflow-x: auto; overflow-y: hidden; padding: .2rem 0; }
math { font-family: 'Beamlang Math', 'Latin Modern Math', 'STIX Two Math', math; font-size: 1.05em; }
h1 { font-size: 1.6rem; color: var(--head); border-bottom: 2px solid var(--head); padding-bottom: .3rem; }
h2 { font-size: 1.25rem; color: var(--head); border-bottom: 1px solid var(--rule); margin-top: 2.2rem; }
h3 { font-size: 1.05rem; margin-top: 1.4rem; }
table { border-collapse: collapse; margin: .6rem 0 1rem; font-size: .9rem; display: block; overflow-x: auto; }
th, td { border: 1px solid var(--rule); padding: .25rem .5rem; text-align: left; vertical-align: top; }
th { background: #eef3f8; }
code, pre { font-family: "DejaVu Sans Mono", monospace; font-size: .85rem; }
pre { background: #f6f8fa; border: 1px solid var(--rule); padding: .6rem .8rem; overflow-x: auto; }
img { max-width: 100%; height: auto; }
mtable[columnspacing] > mtr > mtd { padding-left: 0; padding-right: 0; }
mtd[columnalign="left"] { text-align: left; }
strong { letter-spacing: .02em; }
@page { margin: 16mm 14mm; }  /* the paper size follows the printer: A4 or Letter */
@media print {
  body { font-size: 10pt; }
  main { max-width: none; padding: 0; line-height: 1.35; }
  h2, h3 { break-after: avoid; }
  math[display="block"] { overflow: visible; max-width: 100%; }
  math[data-print-scale="90"] { font-size: 90%; } math[data-print-scale="80"] { font-size: 80%; }
  math[data-print-scale="70"] { font-size: 70%; } math[data-print-scale="60"] { font-size: 60%; }
  math[data-print-scale="50"] { font-size: 50%; } math[data-print-scale="40"] { font-size: 40%; }
  math[data-print-scale="30"] { font-size: 30%; }
  table { display: table; font-size: 7.5pt; width: 100%; max-width: 100%; table-layout: auto; }
  th { hyphens: manual; word-break: normal; overflow-wrap: normal; }
  td { overflow-wrap: anywhere; }
  td math { font-size: 85%; }  /* an inline formula cannot wrap: a polynomial cell is set smaller */
  td code { white-space: pre-wrap; overflow-wrap: anywhere; }
  thead { display: table-header-group; }
  tr, img, pre, math[display="block"] { break-inside: avoid; }
  pre { white-space: pre-wrap; overflow-wrap: anywhere; }
  img { max-height: 230mm; }
}
"""

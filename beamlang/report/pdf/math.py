"""TeX math as the calc package writes it -> Typst math: one small parser over the TeX subset beamlang emits.

The Markdown's formulas are the one source of every formula; this module turns each into Typst math so that
the PDF typesets exactly what the HTML (through MathML) shows. A command outside the tables below is refused
with `MathError`, never passed through as text (the same rule as `html.tex_to_mathml`)."""

from __future__ import annotations

import re

from beamlang.report.html import MathError

SYMBOLS = {  # TeX command -> Typst math symbol
    "times": "times", "cdot": "dot.op", "le": "<=", "leq": "<=", "ge": ">=", "geq": ">=", "ne": "!=",
    "pm": "plus.minus", "approx": "approx", "infty": "infinity", "to": "->", "ldots": "...", "cdots": "dots.c",
    "alpha": "alpha", "beta": "beta", "gamma": "gamma", "delta": "delta", "epsilon": "epsilon.alt",
    "varepsilon": "epsilon", "theta": "theta", "lambda": "lambda", "mu": "mu", "nu": "nu", "xi": "xi",
    "pi": "pi", "rho": "rho", "sigma": "sigma", "tau": "tau", "phi": "phi.alt", "varphi": "phi", "omega": "omega",
    "Delta": "Delta", "Sigma": "Sigma", "Theta": "Theta", "Phi": "Phi", "Omega": "Omega", "Gamma": "Gamma",
    "kappa": "kappa", "zeta": "zeta", "eta": "eta", "iota": "iota", "chi": "chi", "psi": "psi", "upsilon": "upsilon",
    "omicron": "omicron", "vartheta": "theta.alt", "varrho": "rho.alt", "varsigma": "sigma.alt",
    "Lambda": "Lambda", "Xi": "Xi", "Pi": "Pi", "Psi": "Psi", "Upsilon": "Upsilon",
    "sum": "sum", "int": "integral", "partial": "partial",
}
SPACES = {",": "thin", ":": "med", ";": "thick", " ": "thick", "!": "#h(-0.1667em)", "quad": "quad",
          "qquad": "wide"}
ONE_ARGUMENT = {"sqrt": "sqrt", "mathbf": "bold", "boxed": "#box(stroke: 0.5pt, inset: 3pt)[$", "overline": "overline"}
TEXT = {"mathrm", "text", "textrm", "operatorname"}
MATRICES = {"bmatrix": '"["', "pmatrix": '"("', "matrix": "none", "vmatrix": '"|"'}
_TOKEN = re.compile(r"\\[A-Za-z]+|\\.|\d+(?:\.\d+)?|[A-Za-z]|\s+|.", re.S)
_PLAIN = set("+-=<>()[]|.,:;!'?")


def to_typst(tex: str) -> str:
    """The Typst math (without the `$` delimiters) of one TeX formula; MathError on anything unknown."""
    parser = _Parser(tex)
    out = parser.sequence(until=None)
    if parser.i != len(parser.tokens):
        raise MathError(f"unbalanced braces in formula: {tex}")
    return out


class _Parser:
    def __init__(self, tex: str) -> None:
        found = [(m.group(), m.start()) for m in _TOKEN.finditer(tex) if not m.group().isspace()]
        self.tokens = [t for t, _ in found]
        self.starts = [s for _, s in found] + [len(tex)]
        self.tex, self.i = tex, 0
        self.plain_parens = False  # inside `aligned`

    def fail(self, what: str) -> MathError:
        return MathError(f"{what} in formula: {self.tex}")

    def peek(self) -> str | None:
        return self.tokens[self.i] if self.i < len(self.tokens) else None

    def take(self) -> str:
        if self.i >= len(self.tokens):
            raise self.fail("unexpected end")
        self.i += 1
        return self.tokens[self.i - 1]

    def sequence(self, until: str | None, inside_args: bool = False) -> str:
        """Atoms up to `until` (consumed) or the end; attachments bind to the atom before them."""
        parts: list[str] = []
        while (tok := self.peek()) is not None and tok != until and tok not in ("&", "\\\\", "\\end"):
            self.i += 1
            if tok in ("^", "_"):
                if not parts:
                    parts.append('""')
                parts[-1] += tok + "(" + self.argument() + ")"
            else:
                parts.append(self.atom(tok, inside_args))
        if until is not None:
            if self.peek() != until:
                raise self.fail(f"missing {until!r}")
            self.i += 1
        return _join(parts)

    def argument(self) -> str:
        """A braced group or one token, as Typst math for a function argument (commas escaped)."""
        tok = self.take()
        if tok == "{":
            return self.sequence("}", inside_args=True)
        return self.atom(tok, inside_args=True)

    def text_argument(self) -> str:
        """A braced argument read as text, as a Typst string literal (the characters as written)."""
        if self.take() != "{":
            raise self.fail("a text command without braces")
        begin, depth = self.starts[self.i], 1
        while depth:
            tok = self.take()
            depth += {"{": 1, "}": -1}.get(tok, 0)
        raw = _raw_text(self.tex[begin:self.starts[self.i - 1]])
        return '"' + raw.replace("\\", "\\\\").replace('"', '\\"') + '"'

    def atom(self, tok: str, inside_args: bool) -> str:
        if tok == "{":
            return self.sequence("}", inside_args)
        if tok.startswith("\\") and len(tok) > 1:
            return self.command(tok[1:], inside_args)
        if tok[0].isdigit() or tok.isalpha() and tok.isascii():
            return tok
        if tok in (",", ";") and inside_args:
            return "\\" + tok
        if tok == "/":
            return "\\/"
        if tok in "()" and self.plain_parens:
            return "\\" + tok
        if tok in _PLAIN:
            return tok
        if tok in "#$\"@*~`&^_\\{}":
            raise self.fail(f"unexpected {tok!r}")
        return tok  # other Unicode characters stand for themselves

    def command(self, name: str, inside_args: bool) -> str:
        if name in SYMBOLS:
            return SYMBOLS[name]
        if name in SPACES:
            return SPACES[name]
        if name in TEXT:
            body = self.text_argument()
            return f"op({body})" if name == "operatorname" else body
        if name == "frac":
            return f"frac({self.argument()}, {self.argument()})"
        if name in ONE_ARGUMENT:
            if name == "boxed":
                return f"#box(stroke: 0.5pt, inset: 3pt, $display({self.argument()})$)"
            return f"{ONE_ARGUMENT[name]}({self.argument()})"
        if name in ("left", "right"):
            tok = self.take()
            return "" if tok == "." else self.atom(tok, inside_args)
        if name == "begin":
            return self.environment()
        if name in ("{", "}", "%", "_", "#", "$", "&"):
            return "\\" + name if name in "#$&_" else name
        raise self.fail(f"unknown TeX command \\{name}")

    def environment(self) -> str:
        env = self.text_argument().strip('"')
        if env == "aligned":
            return self.aligned()
        if env not in MATRICES:
            raise self.fail(f"unknown environment {env}")
        rows: list[list[str]] = [[]]
        while True:
            rows[-1].append(self.sequence(None, inside_args=True))
            tok = self.take()
            if tok == "&":
                continue
            if tok == "\\\\":
                rows.append([])
                continue
            if tok == "\\end" and self.text_argument().strip('"') == env:
                break
            raise self.fail(f"bad end of {env}")
        rows = [r for r in rows if any(cell for cell in r)]
        body = "; ".join(", ".join(cell or '""' for cell in r) for r in rows)
        return f"mat(delim: {MATRICES[env]}, {body})"


    def aligned(self) -> str:
        """A display broken into lines (`&` aligns, `\\\\` breaks). Its parentheses are plain, as in TeX: one that
        opens on a line and closes on a later one must not become a Typst delimiter group, which cannot break."""
        self.plain_parens = True
        lines: list[str] = []
        cells: list[str] = []
        while True:
            cells.append(self.sequence(None))
            tok = self.take()
            if tok == "&":
                continue
            lines.append(" & ".join(cells))
            cells = []
            if tok == "\\\\":
                continue
            if tok == "\\end" and self.text_argument().strip('"') == "aligned":
                break
            raise self.fail("bad end of aligned")
        self.plain_parens = False
        return " \\\n".join(lines)


def _raw_text(text: str) -> str:
    """The literal text of a \\text{...} or \\mathrm{...} argument (TeX spaces and escapes undone)."""
    text = re.sub(r"\\[,;: ]", " ", text)
    return re.sub(r"\\(.)", r"\1", text).replace("{", "").replace("}", "")


def _join(parts: list[str]) -> str:
    """Atoms separated by spaces, except between a quoted text and punctuation (Typst would show that space)."""
    out = ""
    for part in filter(None, parts):
        word = lambda ch: ch.isalnum() or ch == '"'  # noqa: E731
        tight = (out.endswith('"') and not word(part[0])) or (part.startswith('"') and out and not word(out[-1]))
        out += part if (tight or not out) else " " + part
    return out

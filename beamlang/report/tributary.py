"""Area loads in the calc package: case loads written with `over` -> the pressure times its tributary width, on
one line per load, in the member's units (`40 psf x 16 in = 53.33 plf`)."""

from __future__ import annotations

from beamlang.analysis.display import convert, number
from beamlang.language import syntax as s
from beamlang.language.units import to_si
from beamlang.model import LineLoad
from beamlang.pipeline import Analysis
from beamlang.report.tex import cell


def tributary_lines(a: Analysis, t) -> list[str]:
    """One line per load of the case that was written as a pressure gathered over a tributary width."""
    statements = {st.span.line: st for _, st in a.loaded.document.statements}
    unit = a.units["line load"]
    out = []
    for ld in t.loads:
        st = statements.get(ld.span.line)
        if not isinstance(ld, LineLoad) or ld.width is None or not isinstance(st, (s.Uniform, s.Linear)):
            continue
        pressures = (st.intensity,) if isinstance(st, s.Uniform) else (st.start_intensity, st.end_intensity)
        products = [f"{q} x {st.width} = {number(convert(to_si(q, 'stress', 'a pressure') * ld.width, unit))} {unit}"
                    for q in pressures]
        out += [f"Area load of line {ld.span.line}, a pressure times the tributary width it is gathered from: "
                + "; ".join(f"`{cell(p)}`" for p in products) + ".", ""]
    return out

"""The libraries whose versions shape a calc package's bytes (formulas, figures, MathML), for traceability."""

from __future__ import annotations

from functools import lru_cache
from importlib.metadata import PackageNotFoundError, version

# sympy writes the formulas, numpy runs the cross-check, scipy's eigh finds the natural frequency, the next three turn the Markdown and its TeX into HTML
# and MathML, and pygments runs beamlang's lexer over the input listing (the figures are beamlang's own SVG:
# report/svgplot.py). A package rebuilds byte for byte when these versions are the same.
LIBRARIES = ("sympy", "numpy", "scipy", "markdown-it-py", "mdit-py-plugins", "latex2mathml", "pygments")


@lru_cache(maxsize=1)
def library_versions() -> tuple[tuple[str, str], ...]:
    found = []
    for name in LIBRARIES:
        try:
            found.append((name, version(name)))
        except PackageNotFoundError:  # pragma: no cover - a broken install
            found.append((name, "unknown"))
    return tuple(found)


def versions_text() -> str:
    return ", ".join(f"{name} {v}" for name, v in library_versions())

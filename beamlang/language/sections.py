"""Section properties: shape dimensions (exact SI) -> A, I, c, S, Q, t with their formulas."""

from __future__ import annotations

from fractions import Fraction

from beamlang.exact import Q

# pi to 40 significant digits: round and tube properties are irrational, so they carry this
# rational value (relative error below 1e-39, far beneath every printed digit).
PI = Q("3.141592653589793238462643383279502884197")

SHAPE_DIMENSIONS: dict[str, tuple[tuple[str, ...], tuple[str, ...]]] = {
    # shape: (required dimensions, optional ones); `flange` is width x thickness
    "properties": (("I",), ("depth", "c", "A", "S", "Q", "t")),
    "rectangle": (("width", "depth"), ()),
    "round": (("diameter",), ()),
    "tube": (("diameter", "wall"), ()),
    "box": (("width", "depth", "wall"), ()),
    "I-shape": (("depth", "flange", "web"), ()),
}
DIMENSION_KIND = {"I": "second moment of area", "A": "area", "S": "section modulus", "Q": "section modulus"}

FORMULAS = {
    "rectangle": {"A": "b h", "I": "b h^3 / 12", "c": "h / 2", "Q": "b h^2 / 8", "t": "b"},
    "round": {"A": "\\pi d^2 / 4", "I": "\\pi d^4 / 64", "c": "d / 2", "Q": "d^3 / 12", "t": "d"},
    "tube": {"A": "\\pi (d^2 - d_i^2) / 4", "I": "\\pi (d^4 - d_i^4) / 64", "c": "d / 2",
             "Q": "(d^3 - d_i^3) / 12", "t": "d - d_i"},
    "box": {"A": "b h - b_i h_i", "I": "(b h^3 - b_i h_i^3) / 12", "c": "h / 2",
            "Q": "(b h^2 - b_i h_i^2) / 8", "t": "2 t_w"},
    "I-shape": {"A": "2 b t_f + (h - 2 t_f) t_w", "I": "(b h^3 - (b - t_w)(h - 2 t_f)^3) / 12",
                "c": "h / 2", "Q": "b t_f (h - t_f)/2 + t_w (h/2 - t_f)^2 / 2", "t": "t_w"},
}


# The shear area kappa A of each shape, for the shear deflection V / (kappa G A), and the rule it follows.
# kappa = 1 / f_s, f_s the form factor of the energy method: f_s = 6/5 for a rectangle, 10/9 for a solid round,
# 2 for a thin-walled round tube, about A / A_web for I-shapes and boxes (J. M. Gere and S. P. Timoshenko,
# Mechanics of Materials, the section on shear deflection of beams; from memory).
_SOURCE = "Gere and Timoshenko, Mechanics of Materials, shear deflection of beams (from memory)"
SHEAR_AREA = {
    "rectangle": (lambda d, A: A * Q(5, 6), f"kappa = 5/6 of A (form factor 6/5; {_SOURCE})"),
    "round": (lambda d, A: A * Q(9, 10), f"kappa = 9/10 of A (form factor 10/9; {_SOURCE})"),
    "tube": (lambda d, A: A / 2, f"kappa = 1/2 of A (thin-walled tube, form factor 2; {_SOURCE})"),
    "box": (lambda d, A: 2 * d["depth"] * d["wall"],
            f"kappa A = 2 h t, the two webs over the full depth (form factor about A / A_web; {_SOURCE})"),
    "I-shape": (lambda d, A: d["depth"] * d["web"],
                f"kappa A = h t_w, the web over the full depth (form factor about A / A_web; {_SOURCE})"),
}


def shear_area(shape: str, dims: dict[str, Fraction], A: Fraction | None) -> tuple[Fraction | None, str]:
    """kappa A of a shape and its rule; a section given by its properties has none."""
    if shape not in SHEAR_AREA or A is None:
        return None, ""
    area, rule = SHEAR_AREA[shape]
    return area(dims, A), rule


class ShapeProblem(Exception):
    """A dimension set that cannot make the shape; `name` is the dimension to point at."""

    def __init__(self, name: str, message: str, hint: str | None = None):
        super().__init__(message)
        self.name, self.message, self.hint = name, message, hint


def properties(shape: str, dims: dict[str, Fraction], flange_t: Fraction | None = None) -> dict[str, Fraction | None]:
    """A, I, c, S, Q, t of one shape from its dimensions in metres."""
    return _BUILDERS[shape](dims, flange_t)


def _given(d: dict[str, Fraction], _ft: Fraction | None) -> dict[str, Fraction | None]:
    c = d.get("c")
    if c is None and "depth" in d:
        c = d["depth"] / 2
    S = d.get("S") or (d["I"] / c if c else None)
    if ("Q" in d) != ("t" in d):  # V Q / (I t) needs both
        given, other = ("Q", "t") if "Q" in d else ("t", "Q")
        raise ShapeProblem(given, f"`{given}` needs `{other}` too: the shear stress V Q / (I t) takes the first moment Q "
                           "of the area beyond the neutral axis and the width t there",
                           "for an I-shape, Q of a half section and t the web thickness")
    return {"A": d.get("A"), "I": d["I"], "c": c, "S": S, "Q": d.get("Q"), "t": d.get("t")}


def _rectangle(d: dict[str, Fraction], _ft: Fraction | None) -> dict[str, Fraction | None]:
    b, h = d["width"], d["depth"]
    return _finish(b * h, b * h**3 / 12, h / 2, b * h**2 / 8, b)


def _round(d: dict[str, Fraction], _ft: Fraction | None) -> dict[str, Fraction | None]:
    D = d["diameter"]
    return _finish(PI * D**2 / 4, PI * D**4 / 64, D / 2, D**3 / 12, D)


def _tube(d: dict[str, Fraction], _ft: Fraction | None) -> dict[str, Fraction | None]:
    D, w = d["diameter"], d["wall"]
    if 2 * w >= D:
        raise ShapeProblem("wall", "the wall of a tube must be thinner than half its diameter")
    Di = D - 2 * w
    return _finish(PI * (D**2 - Di**2) / 4, PI * (D**4 - Di**4) / 64, D / 2, (D**3 - Di**3) / 12, D - Di)


def _box(d: dict[str, Fraction], _ft: Fraction | None) -> dict[str, Fraction | None]:
    b, h, w = d["width"], d["depth"], d["wall"]
    if 2 * w >= min(b, h):
        raise ShapeProblem("wall", "the wall of a box must be thinner than half its width and half its depth")
    bi, hi = b - 2 * w, h - 2 * w
    return _finish(b * h - bi * hi, (b * h**3 - bi * hi**3) / 12, h / 2, (b * h**2 - bi * hi**2) / 8, 2 * w)


def _ishape(d: dict[str, Fraction], tf: Fraction | None) -> dict[str, Fraction | None]:
    h, b, tw = d["depth"], d["flange"], d["web"]
    assert tf is not None
    if 2 * tf >= h:
        raise ShapeProblem("flange", "the flange thickness must be less than half the depth",
                           "the flange is written as width x thickness, e.g. `flange 150 mm x 12 mm`")
    if tw >= b:
        raise ShapeProblem("web", "the web must be thinner than the flange is wide")
    hw = h - 2 * tf
    A = 2 * b * tf + hw * tw
    I = (b * h**3 - (b - tw) * hw**3) / 12
    Q = b * tf * (h - tf) / 2 + tw * (hw / 2) ** 2 / 2
    return _finish(A, I, h / 2, Q, tw)


def _finish(A: Fraction, I: Fraction, c: Fraction, Q: Fraction, t: Fraction) -> dict[str, Fraction | None]:
    return {"A": A, "I": I, "c": c, "S": I / c, "Q": Q, "t": t}


_BUILDERS = {"properties": _given, "rectangle": _rectangle, "round": _round, "tube": _tube,
             "box": _box, "I-shape": _ishape}

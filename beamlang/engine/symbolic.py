"""Symbolic formulas: Member + one load -> that load's elastic curve in symbols (P or w, a, b, L, E, I, ...).

The engine itself derives them: the same solver runs on numbers that carry a symbolic expression beside
their exact value. Orderings and zero tests use the value, so the formula is the one that holds for this
layout (which segment lies where). The expressions are elements of sympy's field of rational functions
in the member's symbols (`sympy.polys.fields`), kept reduced at every step: measured on the examples, the
same formulas as with plain sympy expressions and `together` at the end, 7 times faster (10.6 s -> 1.5 s
for all of them, one fixed-end load 8.9 s -> 0.5 s). Each segment's formula is then factored for display by
FLINT's multivariate factoring into sympy's own form (`factored`). Used only by the calc package."""

from __future__ import annotations

import dataclasses
from bisect import bisect_left
from dataclasses import dataclass
from fractions import Fraction
from functools import lru_cache

from beamlang.exact import Q
from beamlang.model import Load, Member, MomentLoad, PointLoad, Settlement
from beamlang.poly import Poly


@dataclass(frozen=True, slots=True, eq=False)
class Sym:
    value: Fraction
    expr: object  # a rational function of the symbols (sympy FracElement); takes exact numbers as they are

    def _pair(self, other):
        if isinstance(other, Sym):
            return other.value, other.expr
        return other, other

    def __add__(self, other):
        v, e = self._pair(other)
        return Sym(self.value + v, self.expr + e)

    __radd__ = __add__

    def __sub__(self, other):
        v, e = self._pair(other)
        return Sym(self.value - v, self.expr - e)

    def __rsub__(self, other):
        v, e = self._pair(other)
        return Sym(v - self.value, e - self.expr)

    def __mul__(self, other):
        v, e = self._pair(other)
        return Sym(self.value * v, self.expr * e)

    __rmul__ = __mul__

    def __truediv__(self, other):
        v, e = self._pair(other)
        return Sym(self.value / v, self.expr / e)

    def __rtruediv__(self, other):
        v, e = self._pair(other)
        return Sym(v / self.value, e / self.expr)

    def __neg__(self):
        return Sym(-self.value, -self.expr)

    def __abs__(self):
        return self if self.value >= 0 else -self

    def __eq__(self, other):
        return self.value == (other.value if isinstance(other, Sym) else other)

    def __hash__(self):
        return hash(self.value)

    def __lt__(self, other):
        return self.value < (other.value if isinstance(other, Sym) else other)

    def __le__(self, other):
        return self.value <= (other.value if isinstance(other, Sym) else other)

    def __gt__(self, other):
        return self.value > (other.value if isinstance(other, Sym) else other)

    def __ge__(self, other):
        return self.value >= (other.value if isinstance(other, Sym) else other)

    def __bool__(self):
        return self.value != 0


def symbolic_member(member: Member, load: Load) -> tuple[Member, Load, dict[str, Fraction]]:
    """The member with only `load`, every number a Sym; also {symbol name: its value}."""
    names = _names(member, load)
    generators = dict(zip(names, _field(tuple(names))))

    def sym(name: str, value: Fraction) -> Sym:
        return Sym(value, generators[name])

    m, new_load = _build(member, load, sym)
    return m, new_load, names


def _names(member: Member, load: Load) -> dict[str, Fraction]:
    """The symbols the member and load need, in the order they are met, with their values."""
    names: dict[str, Fraction] = {}
    _build(member, load, _noted(names))
    return names


def _field(names: tuple[str, ...]) -> list:
    import sympy
    from sympy.polys.domains import QQ
    from sympy.polys.fields import field
    _, *gens = field([sympy.Symbol(n, positive=True) for n in names], QQ)
    return gens


def _build(member: Member, load: Load, sym) -> tuple[Member, Load]:
    """The member with only `load`, its numbers made by `sym(name, value)` (symbols, or names noted)."""
    L = sym("L", member.length)

    def pos(value: Fraction, name: str) -> Sym | Fraction:
        if value == 0:
            return Fraction(0)
        return L if value == member.length else sym(name, value)

    letters = iter("ABCDEFGHJKMNPQRSTUVWXYZ")
    supports = []
    for sp in member.supports:
        letter = next(letters)
        k = sym(f"k_{letter}", sp.stiffness) if sp.kind == "spring" and sp.stiffness else sp.stiffness
        supports.append(dataclasses.replace(sp, x=pos(sp.x, f"x_{letter}"), stiffness=k))
    mat = dataclasses.replace(member.material, E=sym("E", member.material.E))
    sec = dataclasses.replace(member.section, I=sym("I", member.section.I))
    new_load = _symbolic_load(load, pos, sym)
    case = dataclasses.replace(member.cases[0], name="load", loads=(new_load,))
    stretch = dataclasses.replace(member.stretches[0], x2=L, material=mat, section=sec)
    m = dataclasses.replace(member, length=L, stretches=(stretch,), supports=tuple(supports), cases=(case,),
                            combinations=(), report_points=())
    return m, new_load


def _symbolic_load(load: Load, pos, sym) -> Load:
    sign = lambda v: 1 if v >= 0 else -1  # noqa: E731  the symbol is the magnitude; the sign stays numeric
    if isinstance(load, PointLoad):
        return dataclasses.replace(load, x=pos(load.x, "a"), force=sign(load.force) * sym("P", abs(load.force)))
    if isinstance(load, MomentLoad):
        return dataclasses.replace(load, x=pos(load.x, "a"), moment=sign(load.moment) * sym("C", abs(load.moment)))
    if isinstance(load, Settlement):  # at a support: the same position symbol as the support
        return dataclasses.replace(load, x=pos(load.x, "a"), movement=sign(load.movement) * sym("Delta", abs(load.movement)))
    x1, x2 = pos(load.x1, "a"), pos(load.x2, "b")
    if load.w1 == load.w2:
        w = sign(load.w1) * sym("w", abs(load.w1))
        return dataclasses.replace(load, x1=x1, x2=x2, w1=w, w2=w)
    w1 = sign(load.w1) * sym("w_1", abs(load.w1)) if load.w1 else Fraction(0)
    w2 = sign(load.w2) * sym("w_2", abs(load.w2)) if load.w2 else Fraction(0)
    return dataclasses.replace(load, x1=x1, x2=x2, w1=w1, w2=w2)


MAX_REDUNDANTS = 2  # beyond this (or with springs) the general formula is too long to help a checker


def worth_deriving(member: Member, redundants: int) -> bool:
    """Symbolic formulas are shown for prismatic members without hinges, springs or shear deformation, up to two
    redundants."""
    return (redundants <= MAX_REDUNDANTS and not member.shear_deformation
            and not any(sp.kind == "spring" for sp in member.supports)
            and not member.stepped and not member.hinges)


def load_formula(member: Member, load: Load) -> tuple[list[tuple[Fraction, Fraction, object]], dict[str, Fraction]]:
    """[(segment start, end, v(x) as a sympy expression)] for one load alone, and the symbols' values.

    The formula depends on the numbers only through the layout (which segment lies where), so it is derived
    once per layout and reused: a formula derived before for the same kind of load, signs, symbols, supports
    and order of positions is taken when, evaluated at this load's values, it gives exactly the curve the
    engine finds for this load alone (else this load's own formula is derived)."""
    from beamlang.engine.solve import solve
    names: dict[str, Fraction] = {}
    numeric, _ = _build(member, load, _noted(names))
    probe = solve(numeric)  # the same member and load in plain exact numbers: fast
    key = _layout(member, load, names, numeric)
    values = tuple(names.values())
    pieces = probe.targets[0].curves.v.pieces
    if key not in _DERIVED:
        if len(_DERIVED) >= _LAYOUTS:
            _DERIVED.clear()  # a batch of many members: keep memory flat
        _DERIVED[key] = _stored(key)
    for derived in _DERIVED[key]:
        if derived.agrees(values, pieces):
            return _segments(probe.xs, derived.exprs), names
    derived, xs = _derive(member, load)
    _DERIVED[key].append(derived)
    _store(key, _DERIVED[key])
    return _segments(xs, derived.exprs), names


def _store_path(key: tuple):
    """Where the formulas of one layout are kept between runs: a file per layout in the user's cache folder,
    under a folder named for this beamlang, its engine's code, sympy and python-flint (another of any: other
    formulas)."""
    import hashlib

    from beamlang.cache import cache_root
    root = cache_root()
    if root is None:
        return None
    return root / f"formulas-{_engine_digest()}" / (hashlib.sha256(repr(key).encode("utf-8")).hexdigest() + ".pickle")


@lru_cache(maxsize=1)
def _engine_digest() -> str:
    import hashlib
    from pathlib import Path

    import flint
    import sympy

    from beamlang import __version__
    here = Path(__file__).resolve().parent
    versions = f"{__version__}\0sympy {sympy.__version__}\0python-flint {flint.__version__}"
    digest = hashlib.sha256(versions.encode("utf-8"))
    for path in sorted([*here.glob("*.py"), here.parent / "poly.py", here.parent / "exact.py"]):
        digest.update(path.name.encode("utf-8") + b"\0" + path.read_bytes())
    return digest.hexdigest()[:24]


def _stored(key: tuple) -> list["_Derived"]:
    """The formulas kept for this layout by an earlier run, or none (a missing, damaged or foreign file is
    ignored). Each is used only where it agrees exactly with the engine's curve of the load at hand, so a
    stale one can cost a derivation, never a wrong formula."""
    import pickle
    path = _store_path(key)
    try:
        kept = pickle.loads(path.read_bytes()) if path is not None else []
        return [d for d in kept if isinstance(d, _Derived)] if isinstance(kept, list) else []
    except Exception:  # noqa: BLE001 (any failure of the cache means: derive again)
        return []


def _store(key: tuple, derived: list["_Derived"]) -> None:
    import pickle

    from beamlang.cache import make_folder, write_whole
    path = _store_path(key)
    if path is None:
        return
    try:
        make_folder(path.parent)
        write_whole(path, pickle.dumps(derived[-8:], protocol=pickle.HIGHEST_PROTOCOL))
    except OSError:  # a read-only or full cache: the formula was derived all the same
        pass


_LAYOUTS = 256  # derived formulas kept per process, by layout


@dataclass(frozen=True, slots=True)
class _Derived:
    """One load's formula per segment: factored for display, and as exact coefficient functions to reuse it."""

    exprs: tuple  # v(x) per segment, a factored sympy expression
    coeffs: tuple  # per segment, per power of x: a number, or (numerator terms, denominator terms) in the symbols

    def agrees(self, values: tuple, pieces: tuple) -> bool:
        """Whether these formulas, at the symbols' `values`, are exactly the polynomials `pieces`."""
        if len(pieces) != len(self.coeffs):
            return False
        return all(Poly.of(*(_evaluate(c, values) for c in cs)) == p for cs, p in zip(self.coeffs, pieces))


_DERIVED: dict[tuple, list[_Derived]] = {}


def _noted(names: dict[str, Fraction]):
    """A `sym` for `_build` that records each symbol's value in `names` and gives back the plain number."""
    def note(name: str, value: Fraction) -> Fraction:
        names[name] = value
        return value
    return note


def _layout(member: Member, load: Load, names: dict, numeric: Member) -> tuple:
    """What a formula can depend on besides the symbols' values: the load's kind and signs, the symbols, the
    supports' kinds and the order of every position (ties included)."""
    ld = numeric.cases[0].loads[0]
    at = [sp.x for sp in numeric.supports] + [getattr(ld, k) for k in ("x", "x1", "x2") if hasattr(ld, k)]
    order = sorted({Fraction(0), numeric.length, *at})
    signs = tuple(1 if v > 0 else (-1 if v < 0 else 0) for v in _magnitudes(ld))
    return (type(load).__name__, signs, tuple(names), tuple(sp.kind for sp in member.supports),
            len(member.hinges), len(member.stretches), tuple(bisect_left(order, x) for x in at))


def _magnitudes(load: Load) -> tuple:
    if isinstance(load, PointLoad):
        return (load.force,)
    if isinstance(load, MomentLoad):
        return (load.moment,)
    if isinstance(load, Settlement):
        return (load.movement,)
    return (load.w1, load.w2)


def _derive(member: Member, load: Load) -> tuple[_Derived, tuple]:
    """The load's formula derived by the solver on symbols, and the segment ends it found."""
    import sympy

    from beamlang.engine.solve import solve
    m, _, _ = symbolic_member(member, load)
    sol = solve(m)
    x = sympy.Symbol("x")
    exprs, coeffs = [], []
    for p in sol.targets[0].curves.v.pieces:
        exprs.append(factored(p.coeffs, x))
        coeffs.append(tuple(_terms(c) for c in p.coeffs))
    return _Derived(tuple(exprs), tuple(coeffs)), sol.xs


def factored(coeffs, x):
    """sympy.factor(sympy.together(sum(c_i x^i))) for coefficients c_i (Sym or exact numbers), the factoring done by
    FLINT (`fmpz_mpoly.factor`) and the result put together as sympy's `factor` puts it: the constant times each
    irreducible factor, primitive over the integers with a positive leading coefficient in the lex order of its
    symbols as sympy sorts them (`_sort_gens`), to its power, numerator and denominator factored apart and a factor
    in both cancelled by sympy's Mul. The same expression as sympy's on every formula tried (tests/test_flint.py);
    sympy's multivariate factoring took 1.6 of the 2.1 s of a 20-case member's five derivations (2026-12-05)."""
    import flint
    import sympy
    from sympy.core.mul import _keep_coeff
    from sympy.polys.polyutils import _sort_gens
    symbols = next((c.expr.field.symbols for c in coeffs if isinstance(c, Sym)), ())
    gens = (*symbols, x)
    names = tuple(f"v{i}" for i in range(len(gens)))
    ctx, integers = flint.fmpq_mpoly_ctx.get(names, "lex"), flint.fmpz_mpoly_ctx.get(names, "lex")
    zero = (0,) * len(gens)

    def poly(element):  # a sympy PolyElement over QQ in the symbols -> fmpq_mpoly (x to the power 0)
        return ctx.from_dict({(*m, 0): flint.fmpq(int(k.numerator), int(k.denominator)) for m, k in element.terms()})

    def number(c):
        c = Fraction(c)
        return ctx.from_dict({zero: flint.fmpq(int(c.numerator), int(c.denominator))})

    pairs = [(poly(c.expr.numer), poly(c.expr.denom)) if isinstance(c, Sym) else (number(c), number(1))
             for c in coeffs]
    denominator = number(1)
    for _, d in pairs:
        denominator = denominator * d / denominator.gcd(d)
    power = ctx.from_dict({(0,) * len(symbols) + (1,): 1})
    numerator = ctx.from_dict({})
    for i, (n, d) in enumerate(pairs):
        numerator += n * (denominator / d) * power**i
    if numerator.is_zero():
        return sympy.Integer(0)
    order = _sort_gens(gens)
    rank = [order.index(g) for g in gens]  # each generator's place in sympy's order
    coeff, factors = Fraction(1), []
    for part, sign in ((numerator, 1), (denominator, -1)):
        terms = part.to_dict()
        scale = 1
        for k in terms.values():
            scale = scale * int(k.q) // flint.fmpz(scale).gcd(int(k.q))
        content, irreducible = integers.from_dict({m: int(k * scale) for m, k in terms.items()}).factor()
        c = Fraction(int(content), int(scale))
        for f, e in irreducible:
            d = f.to_dict()
            lead = max(d, key=lambda m: tuple(m[rank.index(i)] for i in range(len(gens))))
            flip = -1 if d[lead] < 0 else 1
            c *= flip ** int(e)
            factors.append((sympy.Add(*(sympy.Integer(flip * int(k)) * sympy.Mul(*(g**p for g, p in zip(gens, m) if p))
                                        for m, k in d.items())), sign * int(e)))
        coeff = coeff * c if sign == 1 else coeff / c
    return _keep_coeff(sympy.Rational(coeff.numerator, coeff.denominator), sympy.Mul(*(f**e for f, e in factors)))


def _segments(xs, exprs) -> list[tuple[Fraction, Fraction, object]]:
    return [(_value(a), _value(b), e) for a, b, e in zip(xs, xs[1:], exprs)]


def _terms(c):
    """A coefficient as exact data: a number, or the terms (exponents, rational) of its numerator and denominator."""
    if not isinstance(c, Sym):
        return Fraction(c)
    def terms(poly) -> tuple:
        return tuple((monom, Q(int(k.numerator), int(k.denominator))) for monom, k in poly.terms())
    return terms(c.expr.numer), terms(c.expr.denom)


def _evaluate(c, values: tuple) -> Fraction:
    if not isinstance(c, tuple):
        return c
    def at(terms) -> Fraction:
        total = Q(0)
        for monom, k in terms:
            for v, e in zip(values, monom):
                if e:
                    k = k * v**e
            total += k
        return total
    return at(c[0]) / at(c[1])


def _expr(c):
    import sympy
    if isinstance(c, Sym):
        return c.expr.as_expr()
    c = Fraction(c)
    return sympy.Rational(int(c.numerator), int(c.denominator))


def _value(c) -> Fraction:
    return c.value if isinstance(c, Sym) else Fraction(c)

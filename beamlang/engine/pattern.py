"""Pattern loading: a target holding patterned cases -> the exact envelope over every arrangement.

A patterned case is split into its parts, one per span and overhang (a line load that straddles a support is
cut there); each part is solved once. At every x the worst arrangement for an effect loads exactly the parts
of one sign there, so the upper envelope is the fixed curve plus the positive parts, the lower one the fixed
curve plus the negative parts. Between the parts' own zeros each envelope is one polynomial, and its extrema
are found by the same root isolation as any curve: the cost grows with the number of parts, not with the
2^n arrangements.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from fractions import Fraction

from beamlang.engine.extrema import Candidate
from beamlang.engine.roots import roots_in
from beamlang.engine.solve import Curves, Solution, Target, curves_with
from beamlang.engine.statics import region_bounds
from beamlang.exact import Q
from beamlang.model import LineLoad, Load, Member, MomentLoad, PointLoad
from beamlang.poly import Piecewise, Poly

QUANTITIES = ("v", "theta", "M", "V")


@dataclass(frozen=True, slots=True)
class Part:
    """The factored loads of one patterned case on one region (span or overhang), solved alone."""

    case: str
    region: int  # index of the region, from the left
    curves: Curves
    loads: tuple[tuple[Fraction, Load], ...]  # (factor, load): the part's own loads, cut at the supports


@dataclass(frozen=True, slots=True)
class Arranged:
    """An envelope value at x with the arrangement that gives it: the parts loaded (indices into `parts`)."""

    x: Fraction
    value: Fraction
    loaded: frozenset[int]


@dataclass(frozen=True, slots=True)
class Pattern:
    """A target's fixed curves (its unpatterned cases, factored) and the parts of its patterned cases."""

    fixed: Curves
    parts: tuple[Part, ...]
    bounds: tuple[Fraction, ...]  # region bounds: the ends and the supports
    zeros: dict = field(default_factory=dict, compare=False, repr=False)  # (case, region, quantity, segment) -> x

    def envelope(self, quantity: str, sign: int) -> tuple[Piecewise, list[Candidate], dict]:
        """The upper (sign 1) or lower (-1) envelope of v, theta, M or V; its extremum candidates (placed by x,
        segment -1); and, per candidate (x, value), the parts loaded there."""
        fixed = getattr(self.fixed, quantity)
        parts = [getattr(p.curves, quantity) for p in self.parts]
        xs: list[Fraction] = [fixed.xs[0]]
        pieces: list[Poly] = []
        cands: list[Candidate] = []
        loaded: dict[tuple[Fraction, Fraction], frozenset[int]] = {}
        for k, base in enumerate(fixed.pieces):
            a, b = fixed.xs[k], fixed.xs[k + 1]
            own = [p.pieces[k] for p in parts]
            cuts = sorted({x for i, p in enumerate(own) for x in self._zeros(i, quantity, k, p, a, b)} | {a, b})
            for c, d in zip(cuts, cuts[1:]):
                mid = (c + d) / 2
                chosen = frozenset(i for i, p in enumerate(own) if sign * p(mid) > 0)
                poly = base
                for i in sorted(chosen):
                    poly = poly + own[i]
                xs.append(d)
                pieces.append(poly)
                ends = {x: _worst(base, own, x, sign) for x in (c, d)}  # the true sign of every part there
                places = [(c, "segment end", None, "right", ends[c])]
                places += [(r.x, "derivative zero", None if r.exact is not None else r, "", (poly(r.x), chosen))
                           for r in roots_in(poly.derivative(), c, d)]
                places.append((d, "segment end", None, "left", ends[d]))
                for x, reason, root, side, (value, at_x) in places:
                    cands.append(Candidate(x, value, reason, root, side, -1))
                    loaded.setdefault((x, value), at_x)
        return Piecewise(tuple(xs), tuple(pieces)), cands, loaded

    def _zeros(self, i: int, quantity: str, k: int, p: Poly, a: Fraction, b: Fraction) -> list[Fraction]:
        """Where part i changes sign inside segment k: the same for both envelopes and for any factor of the
        part, so found once per case, region and segment."""
        key = (self.parts[i].case, self.parts[i].region, quantity, k)
        if key not in self.zeros:
            self.zeros[key] = [r.x for r in roots_in(p, a, b)]
        return self.zeros[key]

    def reaction(self, j: int, which: int, sign: int) -> Arranged:
        """The worst force (which 0) or moment (1) at support j for one sign, with its arrangement."""
        base = self.fixed.reactions[j][which]
        own = [p.curves.reactions[j][which] for p in self.parts]
        chosen = frozenset(i for i, r in enumerate(own) if sign * r > 0)
        return Arranged(Q(0), base + sum((own[i] for i in chosen), Q(0)), chosen)

    def at(self, quantity: str, x: Fraction, sign: int, side: str = "right") -> Arranged:
        """The worst value of a quantity at x for one sign, with its arrangement."""
        fixed = getattr(self.fixed, quantity)
        k = fixed.segment(x, side)
        value, chosen = _worst(fixed.pieces[k], [getattr(p.curves, quantity).pieces[k] for p in self.parts], x, sign)
        return Arranged(x, value, chosen)

    def loads(self, loaded: frozenset[int], fixed_loads: list[tuple[Fraction, Load]]) -> list[tuple[Fraction, Load]]:
        """The factored loads of one arrangement: the fixed ones and the loaded parts' (for the cross-check)."""
        return list(fixed_loads) + [item for i in sorted(loaded) for item in self.parts[i].loads]


def _worst(base: Poly, own: list[Poly], x: Fraction, sign: int) -> tuple[Fraction, frozenset[int]]:
    values = [p(x) for p in own]
    chosen = frozenset(i for i, v in enumerate(values) if sign * v > 0)
    return base(x) + sum((values[i] for i in chosen), Q(0)), chosen


def split(member: Member, loads: tuple[Load, ...]) -> list[list[Load]]:
    """A case's loads region by region: line loads cut at every support they straddle, point loads and
    moments in the region that holds them (at a support: the region to its right; at the right end: the last)."""
    bounds = region_bounds(member)
    out: list[list[Load]] = [[] for _ in bounds[1:]]
    for ld in loads:
        if isinstance(ld, LineLoad):
            for k, (lo, hi) in enumerate(zip(bounds, bounds[1:])):
                a, b = max(lo, ld.x1), min(hi, ld.x2)
                if a < b:
                    out[k].append(_cut(ld, a, b))
        elif isinstance(ld, (PointLoad, MomentLoad)):
            k = next((k for k, hi in enumerate(bounds[1:]) if ld.x < hi), len(out) - 1)
            out[k].append(ld)
        else:
            raise TypeError(f"a {type(ld).__name__} cannot be patterned")  # the builder refuses these
    return out


def _cut(ld: LineLoad, a: Fraction, b: Fraction) -> LineLoad:
    if (a, b) == (ld.x1, ld.x2):
        return ld
    w = Poly.line_through(ld.x1, ld.w1, ld.x2, ld.w2)
    return LineLoad(a, b, w(a), w(b), ld.origin, ld.span, ld.width)


def pattern_of(sol: Solution, t: Target, cache: dict | None = None) -> Pattern | None:
    """The pattern of a target that holds patterned cases; None for one solved as written. `cache` keeps each
    patterned case's parts (solved once for the case and all its combinations) and their zeros."""
    names = sol.member.patterned(t.name)
    if not names:
        return None
    cache = {} if cache is None else cache
    terms = ((Fraction(1), t.name),) if t.kind == "case" else t.terms
    fixed: Curves | None = None
    parts: list[Part] = []
    for factor, name in terms:
        case = sol.target(name)
        if name not in names:
            c = case.curves if factor == 1 else case.curves.scaled(factor)
            fixed = c if fixed is None else fixed + c
            continue
        if name not in cache:
            cache[name] = [(k, curves_with(sol, tuple(loads)), loads)
                           for k, loads in enumerate(split(sol.member, case.loads)) if loads]
        for k, curves, loads in cache[name]:
            parts.append(Part(name, k, curves if factor == 1 else curves.scaled(factor),
                              tuple((factor, ld) for ld in loads)))
    if fixed is None:
        fixed = case.curves.scaled(Q(0))
    return Pattern(fixed, tuple(parts), region_bounds(sol.member), cache.setdefault("(zeros)", {}))

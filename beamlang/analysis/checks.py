"""Checks: results + member limits -> deflection and elastic stress checks with actual, allowed, ratio, pass."""

from __future__ import annotations

from dataclasses import dataclass
from fractions import Fraction

from beamlang.analysis.results import Region, TargetResult
from beamlang.engine.extrema import Located
from beamlang.exact import plain
from beamlang.model import Member
from beamlang.source import Span

# sqrt(3) to 40 significant digits, for the shear yield fy/sqrt(3) (von Mises) shown in reports;
# the pass/fail decision itself is exact: 3 tau^2 <= fy^2.
SQRT3 = Fraction("1.732050807568877293527446341505872366943")


@dataclass(frozen=True, slots=True)
class Check:
    kind: str  # "deflection" | "support slope" | "bending stress" | "shear stress" | "frequency"
    target: str
    actual: Fraction
    allowed: Fraction
    unit: str  # SI unit of actual and allowed: "m", "rad", "Pa" or "Hz" (a frequency's allowed value is its least)
    passed: bool
    x: Fraction | None  # governing location
    basis: str  # how the allowed value was found
    span: Span
    region: str = ""  # span | overhang | cantilever, for span/N limits
    place: str = ""  # "span 2", "left overhang", "cantilever": a span/N limit gives one check per span and overhang
    lo: Fraction | None = None  # the ends of that span or overhang (m)
    hi: Fraction | None = None
    divisor: Fraction | None = None  # N of span/N
    length: Fraction | None = None  # the length span/N refers to (m): the span, or twice the overhang
    at: Located | None = None  # the governing deflection, or the moment or shear that gives the stress
    stretch: int | None = None  # stress: index of the stretch whose section and material give it
    strength: str = ""  # stress: what the allowed value is ("yield", "shear", "von Mises")
    parts: tuple[Fraction, Fraction] | None = None  # deflection with shear deformation: (bending, shear) parts, signed

    @property
    def label(self) -> str:
        """How the check is named wherever it is listed: kind, target, the span or overhang of a span/N limit,
        and input line (and the support, for a slope limit, which gives one check per support)."""
        where = f" at x = {plain(self.x)} m" if self.kind == "support slope" else ""
        place = f" {self.place}" if self.place else ""
        return f"{self.kind} {self.target}{place}{where} (line {self.span.line})"

    @property
    def ratio(self) -> float:
        """Actual over allowed; for a frequency, whose limit is a least value, the limit over the frequency."""
        if self.kind == "frequency":
            return float(self.allowed / self.actual)
        return float(self.actual / self.allowed)


def run_checks(member: Member, results: tuple[TargetResult, ...], frequencies=()) -> tuple[Check, ...]:
    """Every `limit deflection`, `limit slope`, `check stress` and `limit frequency` statement, in file order."""
    by_name = {r.name: r for r in results}
    out: list[Check] = []
    for limit in member.limits:
        out.extend(_deflection(limit, by_name[limit.target]))
    for limit in member.slope_limits:
        out.extend(_slopes(member, limit, results))
    for check in member.stress_checks:
        out.extend(_stress(member, check, by_name[check.target]))
    for found in frequencies:
        out.append(_frequency(found))
    return tuple(sorted(out, key=lambda c: (c.span.line, c.kind)))  # stable: spans stay in order


def _deflection(limit, r: TargetResult) -> list[Check]:
    """An absolute limit: one check on the largest deflection anywhere. A span/N limit: one check per span
    (against that span's length) and per overhang or cantilever (against twice its length)."""
    if limit.value is not None:
        worst = max((l for l in (r.max_down, r.max_up) if l is not None), key=lambda l: abs(l.value), default=None)
        actual = abs(worst.value) if worst else Fraction(0)
        return [Check("deflection", limit.target, actual, limit.value, "m", actual <= limit.value,
                      worst.x if worst else None, "absolute limit", limit.span, at=worst,
                      parts=r.deflection_parts(worst))]
    return [_span_check(limit, region, r) for region in r.regions]


def _span_check(limit, region: Region, r: TargetResult) -> Check:
    allowed = region.basis / limit.divisor
    actual = abs(region.max_abs.value) if region.max_abs else Fraction(0)
    n = plain(limit.divisor)
    if region.kind == "span":
        basis = f"span/{n}, span {plain(region.hi - region.lo)} m from x = {plain(region.lo)} m"
    else:
        basis = (f"2 x {region.kind} length / {n}, {region.kind} {plain(region.hi - region.lo)} m "
                 f"from x = {plain(region.lo)} m (twice the length: common practice)")
    x = region.max_abs.x if region.max_abs else None
    return Check("deflection", limit.target, actual, allowed, "m", actual <= allowed, x, basis, limit.span,
                 region.kind, region.name, region.lo, region.hi, limit.divisor, region.basis, region.max_abs,
                 parts=r.deflection_parts(region.max_abs))


def _stress(member: Member, check, r: TargetResult) -> list[Check]:
    st = r.stress
    fy = st.yield_strength
    x = st.bending_at.x if st.bending_at else None
    against = "the allowable bending stress given with the material" if st.allowable else "the yield strength"
    out = [Check("bending stress", check.target, st.bending, fy, "Pa", st.bending <= fy, x,
                 "sigma = M c / I against " + against + _where(member, st.bending_at), check.span,
                 at=st.bending_at, stretch=st.bending_stretch, strength="allowable" if st.allowable else "yield")]
    if st.shear is not None:
        given = st.shear_strength is not None
        allowed, basis = ((st.shear_strength, "tau = V Q / (I t) against the "
                           + ("allowable shear stress" if _allowable(member, st) else "shear strength")
                           + " given with the material")
                          if given else
                          (st.shear_fy / SQRT3, "tau = V Q / (I t) against fy/sqrt(3) (von Mises)"))
        out.append(Check("shear stress", check.target, st.shear, allowed, "Pa", st.shear_ok,
                         st.shear_at.x if st.shear_at else None, basis + _where(member, st.shear_at), check.span,
                         at=st.shear_at, stretch=st.shear_stretch, strength="shear" if given else "von Mises"))
    return out


def _allowable(member: Member, st) -> bool:
    """The stretch where shear governs gives allowable stresses (its `shear` is an allowable shear stress)."""
    k = st.shear_stretch if st.shear_stretch is not None else 0
    return member.stretches[k].material.allowable_bending is not None


def _where(member: Member, at) -> str:
    """On a stepped member, the stretch whose section gives the stress."""
    if not member.stepped or at is None:
        return ""
    side = "left" if at.side == "left" else "right"
    s = member.stretch_at(at.x, side)
    return f"; section of {plain(s.x1)} m to {plain(s.x2)} m (line {s.section.span.line})"


def _slopes(member: Member, limit, results: tuple[TargetResult, ...]) -> list[Check]:
    """The slope at every support that lets the member turn (a bearing), per target the limit applies to;
    a fixed support holds the slope at zero and is left out."""
    out = []
    for r in results:
        if limit.target is not None and r.name != limit.target:
            continue
        for sp, (x, theta) in zip(member.supports, r.slope_at_supports):
            if sp.kind == "fixed":
                continue
            out.append(Check("support slope", r.name, abs(theta), limit.value, "rad", abs(theta) <= limit.value, x,
                             f"slope at the {sp.kind} at x = {plain(x)} m (line {sp.span.line}), limit given by "
                             "the user", limit.span))
    return out



def _frequency(found) -> Check:
    """The fundamental frequency against its least value (a float eigenvalue, or the closed form: see `method`)."""
    f = found.frequency
    actual = Fraction(f"{f.hz:.9g}")  # 9 digits: far below the 1e-6 tolerance, above the LAPACK build's noise
    limit = found.limit
    how = ("closed form f1 = pi / (2 L^2) sqrt(EI / m)" if f.method == "closed form" else
           f"finite elements, {f.elements} elements, converged to {f.change:.1e} relative (tolerance 1e-06)")
    return Check("frequency", f"mass {limit.text}", actual, limit.value, "Hz", actual >= limit.value, None,
                 f"f1 at least the limit; {how}", limit.span)

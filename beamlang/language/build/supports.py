"""Supports and hinges: their lines -> sorted supports and hinges, checked for stability together."""

from __future__ import annotations

from beamlang import model as m
from beamlang.stability import Mechanism, components, keep
from beamlang.language import syntax as s
from beamlang.language.build.context import Context
from beamlang.source import Span

MAX_SUPPORTS = 1000  # the exact numbers of a continuous member grow with its spans: 1000 check in about 6 s



def supports(ctx: Context, member_span: Span) -> tuple[m.Support, ...]:
    """The supports sorted by position (their positions also kept on the context, for settlements)."""
    stmts = ctx.of(s.Support)
    if len(stmts) > MAX_SUPPORTS:
        ctx.error(stmts[MAX_SUPPORTS].span, f"a member has at most {MAX_SUPPORTS} supports; this is support "
                  f"{MAX_SUPPORTS + 1} of {len(stmts)}", "split the member into parts that each have fewer supports")
        stmts = stmts[:MAX_SUPPORTS]
    out: list[m.Support] = []
    for st in stmts:
        sp = _support(ctx, st)
        if sp is None:
            continue
        twin = next((o for o in out if o.x == sp.x), None)
        if twin is not None:
            ctx.error(st.at.span, "two supports at one point",
                      f"the other is on line {twin.span.line}; merge them into one support")
            continue
        out.append(sp)
    if not stmts:
        ctx.whole(member_span, "this member has no supports, so it cannot carry load",
                  "add supports, e.g. `support pin at 0 m` and `support roller at span`")
    elif out and len(out) == len(stmts) and not _stable(out):
        ctx.whole(out[0].span, "these supports cannot carry load: the beam is a mechanism", _why_unstable(out))
    ctx.support_positions = {sp.x for sp in out}
    return tuple(sorted(out, key=lambda sp: sp.x))


def _support(ctx: Context, st: s.Support) -> m.Support | None:
    kind = st.kind.text
    k = None
    if kind == "spring" and st.stiffness is None:
        ctx.error(st.kind.span, "a spring support needs its stiffness", "for example `support spring 5 kN/mm at 3 m`")
    elif kind == "spring":
        k = ctx.si(st.stiffness, "force per length", "a spring stiffness")
    elif st.stiffness is not None:
        ctx.error(st.stiffness.span, f"a {kind} support takes no stiffness", "only `spring` supports have one")
    x = ctx.position(st.at, "support position")
    if x is None or (kind == "spring" and k is None):
        return None
    return m.Support(kind, x, k, st.span)


def _stable(supports: list[m.Support]) -> bool:
    """A straight beam under transverse load is stable with one fixed end or two point restraints."""
    restraints = components(supports)  # a spring of zero stiffness restrains nothing
    return any(r.kind == "moment" for r in restraints) or len({r.support for r in restraints}) >= 2


def _why_unstable(supports: list[m.Support]) -> str:
    if all(sp.kind == "spring" and not sp.stiffness for sp in supports):
        return "springs of zero stiffness restrain nothing; give them a stiffness or add a support"
    return "one pin, roller or spring lets the beam turn about it; add a second support or make one fixed"


def hinges(ctx: Context, supports: tuple[m.Support, ...]) -> tuple[m.Hinge, ...]:
    """The hinges sorted by position; then supports and hinges together must not make a mechanism."""
    out: list[m.Hinge] = []
    for st in ctx.of(s.Hinge):
        x = ctx.position(st.at, "hinge position")
        if x is None:
            continue
        if x == 0 or x == ctx.length:
            ctx.error(st.at.span, "a hinge at an end of the member releases nothing",
                      "an end already carries no moment unless it is fixed; for a pinned end write "
                      "`support pin at ...`")
        elif any(sp.x == x and sp.kind == "fixed" for sp in supports):
            ctx.error(st.at.span, "a hinge at a fixed support",
                      "a fixed support holds the slope: use a pin there, or move the hinge off it")
        elif (twin := next((h for h in out if h.x == x), None)) is not None:
            ctx.error(st.at.span, "two hinges at one point", f"the other is on line {twin.span.line}")
        else:
            out.append(m.Hinge(x, st.span))
    found = tuple(sorted(out, key=lambda h: h.x))
    _stable_with_hinges(ctx, supports, found)
    return found


def _stable_with_hinges(ctx: Context, supports: tuple[m.Support, ...], hinges: tuple[m.Hinge, ...]) -> None:
    """Supports and hinges together: a hinge can turn a stable layout into a mechanism."""
    if not hinges or not supports or not _stable(list(supports)):
        return  # without hinges the supports were checked already
    try:
        keep(supports, [h.x for h in hinges], components(supports))
    except Mechanism as exc:
        h = hinges[exc.hinges[0]] if exc.hinges else hinges[0]
        others = ", ".join(f"line {hinges[j].span.line}" for j in exc.hinges[1:])
        ctx.whole(h.span, "this hinge makes the member a mechanism: the parts either side of it can turn",
                  "each part between hinges needs enough supports to stand on its own, or to hang "
                  "from a part that does: add a support or remove the hinge"
                  + (f" (the hinges on {others} take part too)" if others else ""))


def no_couple_at_hinges(ctx: Context, cases: tuple[m.Case, ...], hinges: tuple[m.Hinge, ...]) -> None:
    """A concentrated moment exactly at a hinge has nothing to act on."""
    at = {h.x: h for h in hinges}
    for case in cases:
        for ld in case.loads:
            if isinstance(ld, m.MomentLoad) and ld.x in at:
                ctx.error(ld.span, "a concentrated moment at a hinge: the hinge cannot pass it on",
                          f"put it on the side of the hinge (line {at[ld.x].span.line}) it acts on, "
                          "e.g. a millimetre away")

"""Terminal table: Analysis -> a compact text summary per member in its report units."""

from __future__ import annotations

from beamlang.analysis.display import CHECK_QUANTITY, at, check_name, convert, governing, number, show
from beamlang.pipeline import Analysis


def member_table(a: Analysis) -> str:
    m = a.loaded.member
    u = a.units
    lines = [f"{m.mark}  {m.title}  ({a.loaded.source.name})"]
    L = u["length"]
    head = ["case/combination", "max down", f"at ({L})", "max up", f"at ({L})", "M+", "M-",
            "reactions at " + ", ".join(number(convert(sp.x, L)) for sp in m.supports) + f" {L}"]
    rows = []
    for r in a.results:
        rows.append([
            r.name + (" (envelope)" if r.envelope is not None else ""),
            show(r.max_down.value if r.max_down else None, u, "deflection"),
            number(convert(r.max_down.x, L)) if r.max_down else "-",
            show(r.max_up.value if r.max_up else None, u, "deflection"),
            number(convert(r.max_up.x, L)) if r.max_up else "-",
            show(r.moment_positive.value if r.moment_positive else None, u, "moment"),
            show(r.moment_negative.value if r.moment_negative else None, u, "moment"),
            ", ".join(_reaction(f, mo, u) for _, f, mo in r.reactions) if r.envelope is None else
            ", ".join(_range(f, mo, u) for f, mo in zip(r.reaches, r.moment_reaches)),
        ])
    lines += _grid(head, rows)
    lines += _envelopes(a, u)
    if a.checks:
        rows = []
        worst = governing(a.checks)
        for c in a.checks:
            quantity = CHECK_QUANTITY[c.unit]
            where = at(c, u) if c.x is not None else ""
            rows.append([check_name(c, u), show(c.actual, u, quantity), show(c.allowed, u, quantity),
                         f"{c.ratio:.3f}" + (" <" if c is worst else ""), "PASS" if c.passed else "FAIL", where])
        lines += [""] + _grid(["check", "actual", "allowed", "ratio", "result", "governs at"], rows)
        failed = sum(1 for c in a.checks if not c.passed)
        lines.append(f"  {len(a.checks) - failed} of {len(a.checks)} checks pass" + (f", {failed} FAIL" if failed else "")
                     + f"; governing (<): {check_name(worst, u)}, ratio {worst.ratio:.3f}")
    else:
        lines.append("  no checks requested (add `limit deflection ...` or `check stress ...`)")
    if m.designations:
        lines.append(f"  section: {m.designations}")
    lines += _required(a, u)
    return "\n".join(lines) + "\n"


def _required(a: Analysis, u: dict[str, str]) -> list[str]:
    req = a.required
    small = u["section"]
    parts = []
    if req.I is not None:
        parts.append(f"I >= {number(convert(req.I, small + '^4'))} {small}^4 ({req.I_check.kind} {req.I_check.target})")
    if req.S is not None:
        parts.append(f"S >= {number(convert(req.S, small + '^3'))} {small}^3 ({req.S_check.kind} {req.S_check.target})")
    if not parts:
        return [f"  required section: {req.note}"] if req.note.startswith("not computed") else []
    return ["  required section: " + ", ".join(parts)]


MOVING = (("max_down", "max down", "deflection"), ("max_up", "max up", "deflection"),
          ("moment_positive", "M+", "moment"), ("moment_negative", "M-", "moment"), ("shear_max", "|V| max", "force"),
          ("slope_max", "|slope| max", "slope"))


def _envelopes(a: Analysis, u: dict[str, str]) -> list[str]:
    """Moving targets: each extreme with every tied place and the group position that gives it, and each
    support's largest and smallest reaction with theirs (envelopes over positions, not simultaneous values)."""
    moving = [r for r in a.results if r.envelope is not None]
    if not moving:
        return []
    L = u["length"]
    lines = ["", "  (envelope): extremes over every position of the moving group, each reached with the group where "
             "given (first force at, direction); not simultaneous; every tied place is listed, and where a range of "
             "positions gives the same value, the ends of the range"]
    for r in moving:
        lines.append(f"  {r.name}:")
        for field, label, kind in MOVING:
            places = r.places_of(field)
            if not places:
                continue
            value = lambda c: f"{number(c.value)} rad" if kind == "slope" else show(c.value, u, kind)  # noqa: E731
            lines.append(f"    {label}: " + "; ".join(
                f"{value(c)} at x = {number(convert(c.x, L))} {L} ({_at_position(c, u)})" for c in places))
        for reach, turn in zip(r.reaches, r.moment_reaches):
            where = f"{number(convert(reach.x, L))} {L}"
            lines.append(f"    reaction at {where}: " + _span(reach, u, "force"))
            if turn.largest or turn.smallest:
                lines.append(f"    support moment at {where}: " + _span(turn, u, "moment"))
    return lines


def _span(reach, u: dict[str, str], kind: str) -> str:
    """'max V (positions), min V (positions)': a support over every position of the group."""
    at = lambda items: "; ".join(_at_position(c, u) for c in items)  # noqa: E731
    return (f"max {show(reach.largest, u, kind)} ({at(reach.largest_at)}), "
            f"min {show(reach.smallest, u, kind)} ({at(reach.smallest_at)})")


def _at_position(c, u: dict[str, str]) -> str:
    L = u["length"]
    return f"first force at {number(convert(c.position, L))} {L}, {'reversed' if c.reversed else 'as written'}"


def _range(force, moment, u: dict[str, str]) -> str:
    """A moving target's support: from its smallest to its largest over the group's positions."""
    text = f"{show(force.smallest, u, 'force')} to {show(force.largest, u, 'force')}"
    if moment.largest or moment.smallest:
        text += f" & {show(moment.smallest, u, 'moment')} to {show(moment.largest, u, 'moment')}"
    return text


def _reaction(force, moment, u: dict[str, str]) -> str:
    text = show(force, u, "force")
    if moment:
        text += " & " + show(moment, u, "moment")
    return text


def _grid(head: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(r[i]) for r in [head] + rows) for i in range(len(head))]
    fmt = lambda r: "  " + "  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip()  # noqa: E731
    return [fmt(head)] + [fmt(r) for r in rows]

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
            r.name,
            show(r.max_down.value if r.max_down else None, u, "deflection"),
            number(convert(r.max_down.x, L)) if r.max_down else "-",
            show(r.max_up.value if r.max_up else None, u, "deflection"),
            number(convert(r.max_up.x, L)) if r.max_up else "-",
            show(r.moment_positive.value if r.moment_positive else None, u, "moment"),
            show(r.moment_negative.value if r.moment_negative else None, u, "moment"),
            ", ".join(_reaction(f, mo, u) for _, f, mo in r.reactions),
        ])
    lines += _grid(head, rows)
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


def _reaction(force, moment, u: dict[str, str]) -> str:
    text = show(force, u, "force")
    if moment:
        text += " & " + show(moment, u, "moment")
    return text


def _grid(head: list[str], rows: list[list[str]]) -> list[str]:
    widths = [max(len(r[i]) for r in [head] + rows) for i in range(len(head))]
    fmt = lambda r: "  " + "  ".join(c.ljust(w) for c, w in zip(r, widths)).rstrip()  # noqa: E731
    return [fmt(head)] + [fmt(r) for r in rows]

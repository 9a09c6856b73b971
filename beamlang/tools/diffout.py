"""Diff output: MemberDiffs -> terminal text, Markdown for a pull-request comment, or JSON (SI values)."""

from __future__ import annotations

import json
from fractions import Fraction

from beamlang.tools.diff import QUANTITY, MemberDiff
from beamlang.analysis.display import show

SCHEMA = "beamlang.diff/1"


def _shown(value: Fraction | None, unit: str, units: dict) -> str:
    return "none" if value is None else show(value, units, QUANTITY[unit])


def _pct(p: float | None) -> str:
    return "" if p is None else f" ({_percent(p)})"


def _percent(p: float) -> str:
    """+2.5 %; a change under 0.05 % keeps two significant digits instead of showing as 0.0 %."""
    return f"{p:+.1f} %" if abs(p) >= 0.05 else f"{p:+.2g} %"


def text(diffs: list[MemberDiff], colour: bool = False) -> str:
    red, green, bold, off = ("\033[31m", "\033[32m", "\033[1m", "\033[0m") if colour else ("", "", "", "")
    lines: list[str] = []
    for d in diffs:
        lines.append(f"{bold}{d.name}{off}: {d.status}" + _no_design_change(d))
        lines.extend(f"  input error {m}" for m in d.input_errors)
        for c in d.statuses:
            paint = red if c.worse else green
            ratios = f"{_ratio(c.old_ratio)} -> {_ratio(c.new_ratio)}"
            lines.append(f"  {paint}{c.label:<12}{off} {c.check}: ratio {ratios}")
        for ch in d.inputs:
            lines.append(f"  {ch.kind:<8} {ch.what}: " + _change(ch.old, ch.new) + (f"  (line {ch.line})" if ch.line else ""))
        for dl in d.deltas:
            where = ""
            moved = (show(dl.old_x, d.units, "length"), show(dl.new_x, d.units, "length"))
            if dl.old_x is not None and dl.new_x is not None and moved[0] != moved[1]:
                where = f" at x = {moved[0]} -> {moved[1]}"
            lines.append(f"  result   {dl.target}: {dl.quantity} {_shown(dl.old, dl.unit, d.units)} -> "
                         f"{_shown(dl.new, dl.unit, d.units)}{_pct(dl.percent)}{where}")
    return "\n".join(lines) + ("\n" if lines else "no .beam files to compare\n")


def _no_design_change(d: MemberDiff) -> str:
    return " (no change to the design)" if d.status == "changed" and not d.design_changed else ""


def _ratio(r: float | None) -> str:
    return "-" if r is None else f"{r:.3f}"


def _change(old: str | None, new: str | None) -> str:
    if old is None:
        return str(new)
    if new is None:
        return str(old)
    return f"{old} -> {new}"


def markdown(diffs: list[MemberDiff]) -> str:
    out: list[str] = []
    for d in diffs:
        out += [f"### {d.name}: {d.status}" + _no_design_change(d), ""]
        if d.input_errors:
            out += [f"- input error {_cell(m)}" for m in d.input_errors] + [""]
        if d.statuses:
            out += ["| status | check | ratio before | ratio after |", "|---|---|---|---|"]
            out += [f"| {'**' + c.label + '**' if c.worse else c.label} | {c.check} | {_ratio(c.old_ratio)} | "
                    f"{_ratio(c.new_ratio)} |" for c in d.statuses]
            out.append("")
        if d.inputs:
            out += ["| change | what | before | after | line |", "|---|---|---|---|---|"]
            out += [f"| {c.kind} | {c.what} | {_cell(c.old)} | {_cell(c.new)} | {c.line or ''} |" for c in d.inputs]
            out.append("")
        if d.deltas:
            out += ["| case or combination | result | before | after | change of magnitude |", "|---|---|---|---|---|"]
            out += [f"| {dl.target} | {dl.quantity} | {_shown(dl.old, dl.unit, d.units)} | {_shown(dl.new, dl.unit, d.units)} | "
                    f"{'' if dl.percent is None else _percent(dl.percent)} |" for dl in d.deltas]
            out.append("")
    return "\n".join(out) + "\n"


def _cell(text: str | None) -> str:
    return "" if text is None else "`" + text.replace("|", "\\|").replace("`", "'") + "`"


def as_json(diffs: list[MemberDiff]) -> str:
    data = {"schema": SCHEMA, "members": [{
        "name": d.name, "status": d.status, "design_changed": d.design_changed, "regression": d.regression,
        "input_errors": list(d.input_errors),
        "checks": [{"check": c.check, "change": c.label, "ratio_before": c.old_ratio, "ratio_after": c.new_ratio,
                    "pass_before": c.old_pass, "pass_after": c.new_pass, "worse": c.worse} for c in d.statuses],
        "inputs": [{"change": c.kind, "what": c.what, "before": c.old, "after": c.new, "line": c.line} for c in d.inputs],
        "results": [{"target": dl.target, "quantity": dl.quantity, "unit": dl.unit,
                     "before": None if dl.old is None else float(dl.old), "after": None if dl.new is None else float(dl.new),
                     "x_before_m": None if dl.old_x is None else float(dl.old_x),
                     "x_after_m": None if dl.new_x is None else float(dl.new_x), "percent": dl.percent}
                    for dl in d.deltas]} for d in diffs]}
    return json.dumps(data, indent=2) + "\n"

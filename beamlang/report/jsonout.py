"""JSON: Analysis -> the `beamlang.results/1` object (SI base units, unit in every key)."""

from __future__ import annotations

import hashlib
from fractions import Fraction

from beamlang.analysis.results import SIGN_CONVENTION, TargetResult
from beamlang.analysis.working import reported
from beamlang.language.frontend import recorded_name
from beamlang.pipeline import Analysis

SCHEMA = "beamlang.results/1"


def member_json(a: Analysis) -> dict:
    m = a.loaded.member
    return {
        "schema": SCHEMA,
        "member": m.mark,
        "title": m.title,
        "file": recorded_name(a.loaded),
        "input_sha256": hashlib.sha256(a.loaded.source.text.encode("utf-8")).hexdigest(),
        "sign_convention": SIGN_CONVENTION,
        "stretches": [{"from_m": float(st.x1), "to_m": float(st.x2), "EI_Nm2": float(st.EI),
                       "section_line": st.section.span.line, "material_line": st.material.span.line,
                       "section_designation": st.section.designation}
                      for st in m.stretches],
        "hinges": [{"x_m": float(h.x), "input_line": h.span.line} for h in m.hinges],
        **({"shear_deformation": {"GA_N": [float(st.GA) for st in m.stretches]}} if m.shear_deformation else {}),
        "results": {r.name: _target(r) for r in a.results},
        **({"frequencies": [_frequency(found) for found in a.frequencies]} if a.frequencies else {}),
        "required": _required(a),
        "checks": [{
            "kind": c.kind, "target": c.target, "actual": float(c.actual), "allowed": float(c.allowed),
            "unit": c.unit, "ratio": c.ratio, "pass": c.passed,
            "x_m": _f(c.x), "basis": c.basis, **_check_extra(c)} for c in a.checks],
    }


def _check_extra(c) -> dict:
    """Fields added to each check (the first ones above keep their names): its name and input line, the span or
    overhang of a span/N limit (one check each), the side of a jump the governing value is taken on."""
    out = {"label": c.label, "input_line": c.span.line, "side": (c.at.side or None) if c.at is not None else None}
    if c.parts is not None:
        out.update({"bending_part_m": float(c.parts[0]), "shear_part_m": float(c.parts[1])})
    if c.place:
        out.update({"place": c.place, "region": c.region, "from_m": float(c.lo), "to_m": float(c.hi),
                    "divisor": float(c.divisor), "length_m": float(c.length)})
    return out


def _frequency(found) -> dict:
    f = found.frequency
    return {"mass": found.limit.text, "input_line": found.limit.span.line, "limit_Hz": float(found.limit.value),
            "f1_Hz": _g(f.hz), "method": f.method, "finite_elements_Hz": _g(f.fe_hz), "elements": f.elements,
            "relative_change": float(f"{f.change:.2g}"), "tolerance": 1e-6,
            "line_masses": [{"from_m": float(x1), "to_m": float(x2), "start_kg_per_m": float(m1), "end_kg_per_m": float(m2)}
                            for x1, x2, m1, m2 in found.masses.lines],
            "point_masses": [{"x_m": float(x), "kg": float(mass)} for x, mass in found.masses.points]}


def _g(hz: float) -> float:
    """A float eigenvalue's frequency to 9 digits: far below its 1e-6 tolerance, above the LAPACK build's noise."""
    return float(f"{hz:.9g}")


def _required(a: Analysis) -> dict:
    req = a.required
    name = lambda c: c.label if c else None  # noqa: E731
    return {"I_m4": _f(req.I), "S_m3": _f(req.S), "governed_by": {"I": name(req.I_check), "S": name(req.S_check)},
            "note": req.note}


def _f(value: Fraction | None) -> float | None:
    return None if value is None else float(value)


def _at(located, key: str) -> dict | None:
    if located is None:
        return None
    out = {"x_m": float(located.x), key: float(located.value),
           "x_exact": str(located.x) if located.exact else None}
    if len(located.x_all) > 1:
        out["x_all_m"] = [float(x) for x in located.x_all]
    return out


def _target(r: TargetResult) -> dict:
    out = _static(r)
    if r.envelope is not None:  # the values above are extremes over every position of the moving group
        env = r.envelope
        out["moving"] = {
            "envelope": "each value is the extreme over every position of the moving group, reached with the "
                        "group where given; the values are not simultaneous",
            "input_line": env.load.span.line, "factor": float(env.factor),
            "critical": {field: {**_position(c), "places": [_position(p, True) for p in r.places_of(field)]}
                         for field, c in r.positions},
            "reactions": [_reach(f, mo) for f, mo in zip(r.reaches, r.moment_reaches)]}
        for entry, f, mo in zip(out["reactions"], r.reaches, r.moment_reaches):
            entry.update({"envelope": True, "max_force_N": float(f.largest), "min_force_N": float(f.smallest)})
            if mo.largest or mo.smallest:  # a support that resists moment
                entry.update({"max_moment_Nm": float(mo.largest), "min_moment_Nm": float(mo.smallest)})
    if r.pattern is not None:  # the values above are extremes over every arrangement of the patterned cases
        out["pattern"] = {
            "cases": list(r.pattern.cases),
            "parts": [{"case": case, "region": region} for case, region in r.pattern.parts],
            "arrangements": 2 ** len(r.pattern.parts),
            "governing": [{"extreme": e, "loaded": how, "x_m": _f(x), "value_SI": float(v)}
                          for e, how, x, v, _ in r.pattern.arrangements]}
    return out


def _position(c, value: bool = False) -> dict:
    """Where a moving extreme is reached: the place, the first force's position and the travel direction."""
    out = {"x_m": float(c.x), "first_force_at_m": float(c.position), "reversed": c.reversed, "found": c.how}
    return {**out, "value": float(c.value)} if value else out


def _reach(force, moment) -> dict:
    """A support over every position: its largest and smallest force and moment, each with every position."""
    at = lambda items: [{"first_force_at_m": float(c.position), "reversed": c.reversed} for c in items]  # noqa: E731
    out = {"x_m": float(force.x), "max_force_N": float(force.largest),
           "max_at_first_force_m": float(force.largest_at[0].position), "max_positions": at(force.largest_at),
           "min_force_N": float(force.smallest), "min_at_first_force_m": float(force.smallest_at[0].position),
           "min_positions": at(force.smallest_at)}
    if moment.largest or moment.smallest:  # a support that resists moment
        out.update({"max_moment_Nm": float(moment.largest), "max_moment_positions": at(moment.largest_at),
                    "min_moment_Nm": float(moment.smallest), "min_moment_positions": at(moment.smallest_at)})
    return out


def _static(r: TargetResult) -> dict:
    return {
        "kind": r.kind,
        "reactions": [{"x_m": float(x), "force_N": float(f), "moment_Nm": float(mo)} for x, f, mo in r.reactions],
        "deflection": {"max_down": _at(r.max_down, "value_m"), "max_up": _at(r.max_up, "value_m")},
        "slope": {"max_abs": _at(r.slope_max, "value_rad"),
                  "at_supports": [{"x_m": float(x), "value_rad": float(t)} for x, t in r.slope_at_supports]},
        "moment": {"max_positive": _at(r.moment_positive, "value_Nm"),
                   "max_negative": _at(r.moment_negative, "value_Nm")},
        "shear": {"max_abs": _at(r.shear_max, "value_N")},
        "points": [{"x_m": float(x), "deflection_m": float(v), "slope_rad": float(t)} for x, v, t in r.points],
        "stress": {"bending_Pa": _f(r.stress.bending), "shear_Pa": _f(r.stress.shear),
                   "yield_Pa": None if r.stress.allowable else _f(r.stress.yield_strength),
                   "allowable_bending_Pa": _f(r.stress.yield_strength) if r.stress.allowable else None,
                   "shear_strength_Pa": _f(r.stress.shear_strength),
                   "elastic": r.stress.elastic},
        "cross_check": {"max_rel_diff": reported(r.cross_check)},  # a bound: at most this, at least 1e-12
    }

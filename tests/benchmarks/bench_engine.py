"""Engine benchmark: prints a table of engine times per member, beside sympy's beam module.

Run: python tests/benchmarks/bench_engine.py   (not a test; machines are noisy, read the table)
Targets: (a) under 10 ms, (b) under 100 ms after imports, at least 50x faster than sympy on (a).
"""

from __future__ import annotations

import statistics
import sys
import time
from fractions import Fraction
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
sys.path.insert(0, str(HERE.parent.parent))

from engine_helpers import member_text  # noqa: E402

from beamlang.language.build import build  # noqa: E402
from beamlang.analysis.checks import run_checks  # noqa: E402
from beamlang.language.parse import parse  # noqa: E402
from beamlang.analysis.results import evaluate  # noqa: E402
from beamlang.engine.solve import solve  # noqa: E402
from beamlang.source import Source  # noqa: E402

SIMPLE = member_text("6 m", ["pin at 0 m", "roller at span"],
                     {"a": ["point 10 kN down at 2 m", "uniform 3 kN/m down from 1 m to 5 m",
                            "moment 4 kN*m clockwise at 4.5 m"]},
                     extra=[f"report deflection at {k * 6 / 101:.4f} m" for k in range(1, 101)])


def continuous() -> str:
    cases = {}
    for c, name in enumerate(["dead", "live", "snow"]):
        loads = [f"point {3 + k} kN down at {0.7 + 0.83 * k + 0.1 * c:.2f} m" for k in range(5)]
        loads += [f"uniform {1 + c} kN/m down", f"linear 0 kN/m to 2 kN/m down from {c + 1} m to {c + 6} m"]
        cases[name] = loads[: 7 if c < 2 else 6]
    return member_text("16 m", ["pin at 0 m", "roller at 4 m", "roller at 8 m", "roller at 12 m", "roller at span"],
                       cases, extra=["combine service = dead + live + snow", "combine strength = 1.2 dead + 1.6 live + 0.5 snow",
                                     "limit deflection service span/360", "check stress strength"])


def front(text: str):
    return build(parse(Source("b.beam", text)))


def large() -> str:
    """200 loads over 10 supports (the hardening target: a few seconds)."""
    sup = ["pin at 0 m"] + [f"roller at {4 * k} m" for k in range(1, 10)]
    loads = {"a": [f"point {1 + k % 7} kN down at {0.173 * k + 0.05:.3f} m" for k in range(100)],
             "b": [f"uniform {1 + k % 3} kN/m down from {0.34 * k:.2f} m to {0.34 * k + 1.1:.2f} m" for k in range(100)]}
    return member_text("36 m", sup, loads, extra=["combine c = a + b", "limit deflection c span/360", "check stress c"])


def six_span_stepped() -> str:
    """Six spans of 5 m, a deeper section over the four inner supports, a frequency limit (engine/frequency.py)."""
    sup = ["pin at 0 m"] + [f"roller at {5 * k} m" for k in range(1, 7)]
    lines = ['member T-6 "six spans"', "span 30 m", "material steel E 200 GPa"]
    cuts = [0, 4, 6, 9, 11, 14, 16, 19, 21, 24, 26, 30]
    for k, (a, b) in enumerate(zip(cuts, cuts[1:])):
        lines.append(f"section properties I {'1.2e8' if k % 2 else '8e7'} mm^4 depth 300 mm from {a} m to {b} m")
    lines += [f"support {s}" for s in sup]
    lines += ["case dead", "  uniform 2.5 kN/m down", "  point 4 kN down at 12.5 m", "case live",
              "  uniform 3 kN/m down from 5 m to 10 m", "limit frequency 5 Hz mass dead + 0.3 live"]
    return "\n".join(lines) + "\n"


def frequency(member) -> None:
    from beamlang.analysis.frequency import natural_frequencies
    natural_frequencies(member)


def patterned() -> str:
    """6 spans, 3 patterned cases (dead fixed): the pattern envelope of every case and of 2 combinations."""
    sup = ["pin at 0 m"] + [f"roller at {4 * k} m" for k in range(1, 7)]
    cases = {"dead": ["uniform 2 kN/m down"], "live": ["uniform 5 kN/m down", "point 8 kN down at 10 m"],
             "snow": ["uniform 1.5 kN/m down from 2 m to 22 m"],
             "plant": [f"point {3 + k} kN down at {1.3 + 3.7 * k:.1f} m" for k in range(6)]}
    return member_text("24 m", sup, cases, extra=[
        "pattern live", "pattern snow", "pattern plant", "combine service = dead + live + snow + plant",
        "combine strength = 1.2 dead + 1.6 live + 0.5 snow + 1.6 plant", "limit deflection service span/360",
        "check stress strength"])


def engine(member) -> None:
    run_checks(member, evaluate(solve(member)))


def sympy_simple() -> None:
    import sympy
    from sympy.physics.continuum_mechanics.beam import Beam
    b = Beam(6, sympy.Rational(200 * 10**9), sympy.Rational(8, 10**5))
    r1, r2 = sympy.symbols("R1 R2")
    b.apply_load(r1, 0, -1)
    b.apply_load(r2, 6, -1)
    b.apply_load(-10000, 2, -1)
    b.apply_load(-3000, 1, 0, end=5)
    b.apply_load(4000, sympy.Rational(9, 2), -2)
    b.bc_deflection = [(0, 0), (6, 0)]
    b.solve_for_reaction_loads(r1, r2)
    d = b.deflection()
    x = sympy.Symbol("x")
    for k in range(1, 101):
        d.subs(x, Fraction(6 * k, 101)).doit()


def timed(fn, repeat: int) -> tuple[float, float]:
    """(median, best) of `repeat` runs: on a shared machine the best is the closer estimate of the cost."""
    times = []
    for _ in range(repeat):
        t0 = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t0)
    return statistics.median(times), min(times)


def main() -> None:
    simple, cont = front(SIMPLE), front(continuous())
    engine(simple)  # warm the imports and caches
    a = timed(lambda: engine(simple), 20)
    b = timed(lambda: engine(cont), 5)
    c = timed(lambda: [engine(simple if k % 2 else cont) for k in range(100)], 1)
    p = timed(lambda: front(SIMPLE), 5)
    big = front(large())
    d = timed(lambda: engine(big), 1)
    pat = front(patterned())
    e = timed(lambda: engine(pat), 3)
    s = timed(sympy_simple, 3)
    six = front(six_span_stepped())
    frequency(six)  # scipy's import, once
    f = timed(lambda: frequency(six), 5)
    rows = [("(a) simply supported, 3 loads, 100 points", a, "< 10 ms"),
            ("(b) 4-span continuous, 20 loads, 3 cases, 2 combinations", b, "< 100 ms"),
            ("(c) 100 members (half (a), half (b))", c, ""),
            ("(d) 200 loads over 10 supports, 2 cases, 1 combination", d, "a few seconds"),
            ("(e) pattern envelope: 6 spans, 3 patterned cases, 2 combinations", e, ""),
            ("front end (parse + build) of (a), 110 lines, for reference", p, ""),
            ("(f) first frequency, 6 spans, 11 stretches, to 1e-6 relative", f, ""),
            ("sympy beam module on (a): reactions + 100 deflections", s, "")]
    print(f"{'case':58} {'median':>12} {'best':>12}  target")
    for name, (median, best), target in rows:
        print(f"{name:58} {median * 1000:9.1f} ms {best * 1000:9.1f} ms  {target}")
    print(f"{'ratio sympy / engine on (a), medians and bests':58} {s[0] / a[0]:10.0f} x {s[1] / a[1]:10.0f} x   >= 50x")


if __name__ == "__main__":
    main()

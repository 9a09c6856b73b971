"""Performance at scale: how build and check grow with cases, loads, supports and moving wheels, in one
run, with each target beside its measurement. Not a test; machines are noisy, read the table.

Run: python tests/benchmarks/bench_scale.py [--quick]
Whole-process rows are CPU seconds (user + system of the child process) and its peak memory, each with an
empty formula cache (a first build) unless the row says the formulas were kept; in-process
rows are the least CPU time of a few runs (on a shared machine the closer estimate of the cost).
--quick skips the sympy rows and runs each in-process row once; --in-process skips the whole-process rows.

Targets (issue 22): 20 cases within 4x of 1 case and under 150 MiB; 200 loads within 3x of 1; 300 supports
under 5 s; 20 supports with a moving pair under 3 s; the moving envelope of a two-span member on a spring with
a settlement combination under 0.2 s in-process; the engine at least 100x sympy's beam module on 1, 10 and 50
point loads and the three-span member, and within 5x of the float finite-element solve.
"""

from __future__ import annotations

import os
import resource
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "tests"))

HEAD = ['member S-1 "benchmark member (invented)"', "material E 200 GPa yield 250 MPa",
        "section properties I 8e7 mm^4 depth 300 mm"]


def text(span: float, supports: list[str], body: list[str]) -> str:
    return "\n".join(HEAD + [f"span {span:g} m"] + [f"support {s}" for s in supports] + body) + "\n"


def many_cases(n: int) -> str:
    """A two-span member with n cases of three load kinds and n + 1 combinations (n = 20: 21)."""
    body = []
    for k in range(n):
        body += [f"case c{k}", f"  point {3 + k % 5} kN down at {1 + 0.37 * k:.2f} m", f"  uniform {1 + k % 3} kN/m down",
                 f"  linear 0 kN/m to {2 + k % 4} kN/m down from {0.5 + 0.2 * k:.1f} m to {6 + 0.2 * k:.1f} m"]
    names = [f"c{k}" for k in range(n)]
    body += [f"combine s{k} = 1.2 {names[k]} + 1.6 {names[(k + 1) % n]}" if n > 1 else f"combine s{k} = 1.4 c0"
             for k in range(n)]
    body += ["combine total = " + " + ".join(names), "limit deflection total span/360", "check stress total"]
    return text(12, ["pin at 0 m", "roller at 6 m", "roller at span"], body)


def point_loads(n: int, span: float = 10) -> str:
    loads = [f"  point {1 + k % 7} kN down at {span * (k + 1) / (n + 1):.4f} m" for k in range(n)]
    return text(span, ["pin at 0 m", "roller at span"], ["case a"] + loads + ["limit deflection a span/360",
                                                                             "check stress a"])


def supports(n: int, moving: bool = False) -> str:
    sup = ["pin at 0 m"] + [f"roller at {2 * k} m" for k in range(1, n)]
    body = ["case a", "  uniform 3 kN/m down", "  point 5 kN down at 1.3 m"]
    if moving:
        body += ["case m", "  moving 11 kN and 9 kN down spaced 0.45 m", "combine c = a + m"]
    return text(2 * (n - 1), sup, body + ["limit deflection a span/360", "check stress a"])


def three_spans() -> str:
    return text(15, ["pin at 0 m", "roller at 5 m", "roller at 10 m", "roller at span"],
                ["case a", "  uniform 3 kN/m down"])


def moving_member(wheels: int, spans: int) -> str:
    loads = " and ".join(f"{10 - k} kN" for k in range(wheels))
    spacing = (" spaced " + " and ".join(["0.6 m"] * (wheels - 1))) if wheels > 1 else ""
    sup = ["pin at 0 m"] + [f"roller at {5 * k} m" for k in range(1, spans + 1)]
    return text(5 * spans, sup, ["case m", f"  moving {loads} down{spacing}"])


def spring_settlement() -> str:
    return text(10, ["pin at 0 m", "spring 5 kN/mm at 5 m", "roller at span"],
                ["case d", "  uniform 2 kN/m down", "case s", "  settlement 4 mm down at 5 m",
                 "case m", "  moving 12 kN and 8 kN down spaced 1.2 m", "combine c = d + s + m"])


def child(argv: list[str], folder: Path, cache: str = "") -> tuple[float, float]:
    """(CPU seconds, peak MiB) of one `python -m beamlang ...` process, with the kept formulas of `cache` (a
    folder under `folder`); by default an empty one of its own, as a first build: every formula derived."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    kept = folder / "caches" / (cache or f"cold-{time.perf_counter_ns()}")
    env = {**os.environ, "BEAMLANG_CACHE": str(kept)}
    subprocess.run([sys.executable, "-m", "beamlang", *argv], cwd=folder, capture_output=True, check=False, env=env)
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return cpu, after.ru_maxrss / 1024  # maxrss of the largest child so far (kB on Linux)


def best(fn, runs: int) -> float:
    """The least CPU time of this process over `runs` calls (the engine runs in one thread; on a shared
    machine CPU time moves far less than the wall clock)."""
    times = []
    for _ in range(runs):
        t0 = time.process_time()
        fn()
        times.append(time.process_time() - t0)
    return min(times)


def member_of(source: str):
    from beamlang.language.build import build
    from beamlang.language.parse import parse
    from beamlang.source import Source
    return build(parse(Source("b.beam", source)))


def engine(member) -> None:
    from beamlang.analysis.results import evaluate
    from beamlang.engine.solve import solve
    evaluate(solve(member))


def fe_only(member) -> None:
    from beamlang.engine.fem import fe_nodes, nodal_solution
    from beamlang.engine.statics import breakpoints
    loads = [(1, ld) for ld in member.cases[0].loads]
    nodal_solution(member, fe_nodes(member, breakpoints(member)), loads)


def sympy_beam(member) -> None:
    """sympy's beam module on the same member: reactions, then the deflection at every support and load."""
    import sympy
    from sympy.physics.continuum_mechanics.beam import Beam
    from beamlang.model import LineLoad, PointLoad

    def r(v):
        return sympy.Rational(int(v.numerator), int(v.denominator))
    b = Beam(r(member.length), r(member.material.E), r(member.section.I))
    rs = sympy.symbols(f"R0:{len(member.supports)}")
    for R, sp in zip(rs, member.supports):
        b.apply_load(R, r(sp.x), -1)
    for ld in member.cases[0].loads:
        if isinstance(ld, PointLoad):
            b.apply_load(r(ld.force), r(ld.x), -1)
        elif isinstance(ld, LineLoad):
            b.apply_load(r(ld.w1), r(ld.x1), 0, end=r(ld.x2))
    b.bc_deflection = [(r(sp.x), 0) for sp in member.supports]
    b.solve_for_reaction_loads(*rs)
    d = b.deflection()
    x = sympy.Symbol("x")
    for ld in member.cases[0].loads:
        d.subs(x, r(ld.x if isinstance(ld, PointLoad) else ld.x1)).doit()


def moving_envelope(member) -> None:
    """The envelope of every case and combination with a moving group (the engine alone, solve included)."""
    from beamlang.engine.moving import envelope
    from beamlang.engine.solve import solve
    sol = solve(member)
    for t in sol.targets:
        if member.moving(t.name) is not None:
            envelope(sol, t)


class Rows:
    """Prints each row as soon as it is measured, under one header."""

    def __init__(self) -> None:
        print(f"{'row':60}{'measured':34}target (ratio measured)", flush=True)

    def append(self, row: tuple[str, str, str]) -> None:
        print(f"{row[0]:60}{row[1]:34}{row[2]}", flush=True)

    def __iadd__(self, rows):
        for row in rows:
            self.append(row)
        return self


def main() -> None:
    quick = "--quick" in sys.argv
    runs = 1 if quick else 3
    rows = Rows()
    if "--in-process" not in sys.argv:
        whole_process(rows)
    in_process(rows, runs, quick)


def whole_process(rows: "Rows") -> None:
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        files = {"cases20": many_cases(20), "cases1": many_cases(1), "loads200": point_loads(200),
                 "loads1": point_loads(1), "sup10": supports(10), "sup100": supports(100), "sup300": supports(300),
                 "sup20m": supports(20, True)}
        for name, source in files.items():
            (folder / f"{name}.beam").write_text(source, encoding="utf-8")
        out = str(folder / "out")
        c20, m20 = child(["build", "cases20.beam", "-o", out], folder)
        c1, _ = child(["build", "cases1.beam", "-o", out], folder)
        rows += [("build, 20 cases + 21 combinations", f"{c20:.2f} s CPU, {m20:.0f} MiB peak",
                  f"<= 4x of 1 case ({c20 / c1:.1f}x), < 150 MiB"),
                 ("build, its 1-case sibling", f"{c1:.2f} s CPU", "")]
        for name in ("cases20", "cases1"):  # again, with the formulas a first build kept
            child(["build", f"{name}.beam", "-o", out, "--force"], folder, f"warm-{name}")
        w20, _ = child(["build", "cases20.beam", "-o", out, "--force"], folder, "warm-cases20")
        w1, _ = child(["build", "cases1.beam", "-o", out, "--force"], folder, "warm-cases1")
        rows += [("  the same two, formulas kept from a first build", f"{w20:.2f} s and {w1:.2f} s CPU",
                  f"({w20 / w1:.1f}x)")]
        l200, _ = child(["build", "loads200.beam", "-o", out], folder)
        l1, _ = child(["build", "loads1.beam", "-o", out], folder)
        rows += [("build, simple span with 200 point loads", f"{l200:.2f} s CPU", f"<= 3x of 1 load ({l200 / l1:.1f}x)"),
                 ("build, simple span with 1 point load", f"{l1:.2f} s CPU", "")]
        for n in (10, 100, 300):
            cpu, _ = child(["check", f"sup{n}.beam"], folder)
            rows.append((f"check, {n} supports", f"{cpu:.2f} s CPU", "< 5 s" if n == 300 else ""))
        cpu, _ = child(["check", "sup20m.beam"], folder)
        rows.append(("check, 20 supports + moving wheel pair", f"{cpu:.2f} s CPU", "< 3 s"))


def in_process(rows: "Rows", runs: int, quick: bool) -> None:
    if not quick:
        sympy_beam(member_of(point_loads(3, span=7)))  # sympy's imports, on a member not timed (sympy caches results)
    for wheels in (1, 2, 3, 5):
        for spans in (1, 2, 3):
            m = member_of(moving_member(wheels, spans))
            rows.append((f"moving envelope, {wheels} wheel(s), {spans} span(s)", f"{best(lambda: moving_envelope(m), runs) * 1000:.0f} ms", ""))
    m = member_of(spring_settlement())
    rows.append(("moving envelope, 2 spans, spring, settlement combination",
                 f"{best(lambda: moving_envelope(m), runs) * 1000:.0f} ms", "< 200 ms in-process"))
    members = [("1 point load", point_loads(1)), ("10 point loads", point_loads(10)),
               ("50 point loads", point_loads(50)), ("three spans, uniform load", three_spans())]
    for name, source in members:
        m = member_of(source)
        engine(m)
        e = best(lambda: engine(m), runs)
        f = best(lambda: fe_only(m), runs)
        rows.append((f"engine (solve + results), {name}", f"{e * 1000:.1f} ms", f"<= 5x float FE ({e / f:.1f}x)"))
        if not quick:
            s = best(lambda: sympy_beam(m), 1)
            rows.append((f"  sympy's beam module, {name}", f"{s * 1000:.0f} ms", f">= 100x engine ({s / e:.0f}x)"))


if __name__ == "__main__":
    main()

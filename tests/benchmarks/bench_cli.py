"""Whole-process timings: prints medians for `check` and `build` of one example and `build --jobs 2` of
100 generated members, with the engine-only time beside them. Not a test; read the table.

Run: python tests/benchmarks/bench_cli.py [RUNS]
Budget on a 2-core machine: check of one member < 1.0 s, build of one < 2.5 s, 100 members < 60 s."""

from __future__ import annotations

import random
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
EXAMPLE = ROOT / "examples" / "mezzanine-edge-beam.beam"
sys.path.insert(0, str(ROOT))


def wall(argv: list[str], runs: int) -> float:
    times = []
    for _ in range(runs):
        t0 = time.perf_counter()
        subprocess.run([sys.executable, "-m", "beamlang", *argv], cwd=ROOT, capture_output=True, check=False)
        times.append(time.perf_counter() - t0)
    return statistics.median(times)


def engine_only(path: Path) -> float:
    from beamlang.pipeline import analyse
    analyse(path)
    t0 = time.perf_counter()
    analyse(path)
    return time.perf_counter() - t0


def generated(folder: Path, n: int) -> None:
    rng = random.Random(1)
    base = EXAMPLE.read_text(encoding="utf-8")
    for k in range(n):
        text = base.replace("member B-3", f"member G-{k:03d}").replace("12 kN", f"{rng.randint(5, 20)} kN")
        text = text.replace("at 2.0 m", f"at {rng.randint(5, 49) / 10} m")
        (folder / f"g{k:03d}.beam").write_text(text, encoding="utf-8")


def main() -> None:
    runs = int(sys.argv[1]) if len(sys.argv) > 1 else 5
    with tempfile.TemporaryDirectory() as tmp:
        out = Path(tmp) / "out"
        rows = [("check, one member", wall(["check", str(EXAMPLE)], runs), 1.0),
                ("build, one member", wall(["build", str(EXAMPLE), "-o", str(out), "--force"], runs), 2.5)]
        folder = Path(tmp) / "many"
        folder.mkdir()
        generated(folder, 100)
        rows.append(("build --jobs 2, 100 members", wall(["build", str(folder), "-o", str(out), "--jobs", "2"], 1), 60.0))
    eng = engine_only(EXAMPLE)
    print(f"{'command':34} {'median wall':>12} {'budget':>8}  verdict")
    for name, t, budget in rows:
        verdict = "within budget" if t <= budget else "OVER: see the stage timings below"
        print(f"{name:34} {t:10.2f} s {budget:6.1f} s  {verdict}")
    print(f"{'engine only (solve + results), one member':44} {eng * 1000:8.0f} ms")
    print(stage_line(EXAMPLE))


def stage_line(path: Path) -> str:
    """The stages of one build in this process, first call (imports included) then a second, warm one."""
    import json

    from beamlang.report.jsonout import member_json
    from beamlang.pipeline import analyse
    from beamlang.report.figures import all_figures, figure_names
    from beamlang.report.html import member_html
    from beamlang.report.markdown import member_markdown
    rows = []
    for _ in range(2):
        t = [time.perf_counter()]
        a = analyse(path)
        t.append(time.perf_counter())
        svgs = all_figures(a)
        t.append(time.perf_counter())
        text = member_markdown(a, {k: f"figures/{f}" for k, f in figure_names(a).items()}, [])
        t.append(time.perf_counter())
        member_html(text, "bench", {f"figures/{k}": v for k, v in svgs.items()})
        t.append(time.perf_counter())
        json.dumps(member_json(a))
        t.append(time.perf_counter())
        rows.append([b - a for a, b in zip(t, t[1:])])
    names = ("analyse", "figures", "Markdown (sympy formulas)", "HTML (MathML)", "JSON")
    return "stages of one build, first / warm: " + ", ".join(
        f"{n} {first * 1000:.0f} / {warm * 1000:.0f} ms" for n, first, warm in zip(names, *rows))

if __name__ == "__main__":
    main()

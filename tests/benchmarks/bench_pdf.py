"""PDF timings: the sheets of each example (typesetting only, in process, median of RUNS after one warm-up),
then whole-process builds of a calc set of 100 generated members with --jobs 2 (packages, PDFs, index and set
PDF), the no-change rebuild of the same 100, and the calc set alone of those 100 built members (`write_set` in
process, its index.json removed first, least of RUNS). Not a test; read the table.

Run: python tests/benchmarks/bench_pdf.py [RUNS]
Target (issue): under 2 s for each line."""

from __future__ import annotations

import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))
sys.path.insert(0, str(ROOT / "tests" / "benchmarks"))

from bench_cli import generated  # noqa: E402  (the same 100 members as the build benchmark)


def per_member(runs: int) -> list[tuple[str, int, float]]:
    from beamlang.pipeline import analyse
    from beamlang.report.figures import all_figures, figure_names
    from beamlang.report.markdown import member_markdown
    from beamlang.report.pdf import member_pdf
    rows = []
    for path in sorted((ROOT / "examples").glob("*.beam")):
        a = analyse(path)
        svgs = {f"figures/{k}": v for k, v in all_figures(a).items()}
        names = {key: f"figures/{file}" for key, file in figure_names(a).items()}
        text = member_markdown(a, names, [])
        pdf = member_pdf(a.loaded.member, text, svgs)
        times = []
        for _ in range(runs):
            t0 = time.perf_counter()
            member_pdf(a.loaded.member, text, svgs)
            times.append(time.perf_counter() - t0)
        rows.append((a.loaded.member.mark, pdf.count(b"/Type/Page/"), statistics.median(times)))
    return rows


def wall(argv: list[str], cache: Path) -> float:
    """Wall seconds of one `python -m beamlang ...` with its kept formulas in `cache` (empty before the first)."""
    t0 = time.perf_counter()
    subprocess.run([sys.executable, "-m", "beamlang", *argv], cwd=ROOT, capture_output=True, check=False,
                   env={**os.environ, "BEAMLANG_CACHE": str(cache)})
    return time.perf_counter() - t0


def main() -> None:
    runs = int(sys.argv[1]) if len(sys.argv) > 1 else 3
    print(f"{'member':8} {'sheets':>6} {'PDF (median)':>13}")
    for mark, sheets, t in per_member(runs):
        print(f"{mark:8} {sheets:6d} {t * 1000:10.0f} ms")
    with tempfile.TemporaryDirectory() as tmp:
        folder, out = Path(tmp) / "many", Path(tmp) / "out"
        folder.mkdir()
        generated(folder, 100)
        cache = Path(tmp) / "cache"
        first = wall(["build", str(folder), "-o", str(out), "--jobs", "2"], cache)
        again = wall(["build", str(folder), "-o", str(out), "--jobs", "2"], cache)
        sheets = subprocess.run(["pdfinfo", str(out / "calc-set.pdf")], capture_output=True, text=True).stdout
        count = next((line.split()[-1] for line in sheets.splitlines() if line.startswith("Pages:")), "?")
        alone = calc_set(out, runs)
    print()
    print(f"{'command':52} {'wall':>8}")
    print(f"{'build --jobs 2, 100 members (set of ' + count + ' sheets)':52} {first:7.1f} s")
    print(f"{'build --jobs 2, 100 members, nothing changed':52} {again:7.1f} s")
    print(f"{'calc set of 100 built members (write_set)':52} {alone:7.2f} s")


def calc_set(out: Path, runs: int) -> float:
    """Least wall seconds of writing the set of the packages in `out` again (index.json removed each time)."""
    from beamlang.report.pdf.calcset import write_set
    folders = [p.name for p in sorted(out.iterdir()) if (p / "build.json").is_file()]
    times = []
    for _ in range(runs):
        (out / "index.json").unlink()
        t0 = time.perf_counter()
        write_set(out, folders, "a4")
        times.append(time.perf_counter() - t0)
    return min(times)


if __name__ == "__main__":
    main()

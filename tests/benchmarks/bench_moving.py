"""Moving-load benchmark: prints a table of `check` times for one moving group, by number of wheels and spans.

Run: python tests/benchmarks/bench_moving.py [repeats]   (not a test; machines are noisy, read the table)
Each member: 6 m spans (pin, then rollers), one case holding a group of 1, 2, 3 or 5 wheels that travels the
whole member (asymmetric groups are searched in both directions), a combination with a uniform dead load, and a
deflection limit on each. The time is front end, engine, moving envelopes, checks and the terminal table, as
`beamlang check` runs them: the best of the repeats (and their median).
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE.parent))
sys.path.insert(0, str(HERE.parent.parent))

from engine_helpers import member_text  # noqa: E402

from beamlang.language.frontend import from_source  # noqa: E402
from beamlang.pipeline import analyse_loaded  # noqa: E402
from beamlang.report.table import member_table  # noqa: E402
from beamlang.source import Source  # noqa: E402

FORCES = ["40 kN", "60 kN", "50 kN", "30 kN", "45 kN"]  # invented demo wheel loads
SPACINGS = ["1.2 m", "2 m", "0.9 m", "1.5 m"]


def member(wheels: int, spans: int) -> str:
    supports = ["pin at 0 m"] + [f"roller at {6 * k} m" for k in range(1, spans + 1)]
    group = " and ".join(FORCES[:wheels]) + " down"
    if wheels > 1:
        group += " spaced " + " and ".join(SPACINGS[: wheels - 1])
    return member_text(f"{6 * spans} m", supports, {"dead": ["uniform 3 kN/m down"], "crane": [f"moving {group}"]},
                       ["combine service = dead + crane", "limit deflection crane span/600",
                        "limit deflection service span/360"])


def check_once(text: str) -> tuple[float, float]:
    """Wall-clock and processor seconds of one check (the processor time is steadier on a shared machine)."""
    start, cpu = time.perf_counter(), time.process_time()
    a = analyse_loaded(from_source(Source("bench.beam", text), None))
    member_table(a)
    return time.perf_counter() - start, time.process_time() - cpu


def main() -> None:
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 3
    check_once(member(1, 1))  # warm the imports
    print(f"moving-load check time, seconds: best wall-clock of {repeats} / its processor time (median wall-clock)")
    print("| wheels | 1 span | 2 spans | 3 spans |")
    print("|---|---|---|---|")
    for wheels in (1, 2, 3, 5):
        cells = []
        for spans in (1, 2, 3):
            times = [check_once(member(wheels, spans)) for _ in range(repeats)]
            wall, cpu = min(times)
            cells.append(f"{wall:.3f} / {cpu:.3f} ({statistics.median(t for t, _ in times):.3f})")
        print(f"| {wheels} | " + " | ".join(cells) + " |")


if __name__ == "__main__":
    main()

"""The PDF of a long member typeset in one compile against the same member typeset in parts (`report/pdf/parts.py`),
each in a fresh process: CPU seconds of the PDF stage (this process and its children) and the peak memory of this
process and of its largest child. Not a test; machines are noisy, read the table.

Run: python tests/benchmarks/bench_parts.py [cases ...]   (default: 20; the two-span member of bench_scale.py)
"""

from __future__ import annotations

import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT / "tests" / "benchmarks"))

RUN = """
import resource, sys, time
from pathlib import Path
import beamlang.report.pdf.parts as parts
from beamlang.pipeline import analyse
from beamlang.report.figures import all_figures, figure_names
from beamlang.report.markdown import member_markdown
from beamlang.report.pdf import member_pdf
from beamlang.report.pdf.joined import sheet_count
from beamlang.report.pdf.sheet import compile_pdf
a = analyse(Path(sys.argv[1]))
svgs = {f"figures/{k}": v for k, v in all_figures(a).items()}
names = {key: f"figures/{file}" for key, file in figure_names(a).items()}
text = member_markdown(a, names, [])
compile_pdf("#let x = 1\\n", {})  # typst's import and fonts, in both variants before the clock starts
if sys.argv[2] == "parts":
    parts.SPLIT_ABOVE = 0
else:  # the one compile in a child of its own, as the parts are
    parts.SPLIT_ABOVE = 10 ** 12
    import beamlang.report.pdf as pdf
    pdf.compile_pdf = parts.typeset_apart
before = resource.getrusage(resource.RUSAGE_SELF)
t = time.process_time()
out = member_pdf(a.loaded.member, text, svgs)
me, kids = resource.getrusage(resource.RUSAGE_SELF), resource.getrusage(resource.RUSAGE_CHILDREN)
print(time.process_time() - t, kids.ru_utime + kids.ru_stime, me.ru_maxrss / 1024, kids.ru_maxrss / 1024,
      sheet_count(out))
"""


def main() -> None:
    from bench_scale import many_cases
    cases = [int(a) for a in sys.argv[1:]] or [20]
    print(f"{'member':<22} {'variant':<10} {'CPU here':>9} {'CPU children':>13} {'peak here':>10} {'largest child':>14} {'sheets':>7}")
    with tempfile.TemporaryDirectory() as tmp:
        for n in cases:
            path = Path(tmp) / f"c{n}.beam"
            path.write_text(many_cases(n), encoding="utf-8")
            for variant in ("one", "parts"):
                run = subprocess.run([sys.executable, "-c", RUN, str(path), variant], capture_output=True, text=True,
                                     check=True)
                here, kids, peak, child, sheets = run.stdout.split()
                print(f"{f'{n} cases':<22} {variant:<10} {float(here):>8.2f}s {float(kids):>12.2f}s "
                      f"{float(peak):>7.0f} MiB {float(child):>10.0f} MiB {sheets:>7}")


if __name__ == "__main__":
    main()

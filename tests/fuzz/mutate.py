"""Mutation fuzzing: damage the examples (delete, duplicate, swap tokens, flip units and directions,
insert random bytes and Unicode, control characters, other line ends, look-alike digits, spaces and letters)
and check that beamlang answers with a result or a clean error, prints no control character raw and writes
JUnit XML that parses.

Run any number: python tests/fuzz/mutate.py 10000 [SEED] [--build]   (prints a summary; exit 1 on a crash).
With --build, every input that checks is also built into a calc package (figures, Markdown, HTML), about
ten times slower."""

from __future__ import annotations

import random
import re
import sys
import time
import unicodedata
import xml.etree.ElementTree as ET
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
sys.path.insert(0, str(ROOT))

ERROR_LINE = re.compile(r"^(?P<file>[^:\n]+):(?P<line>\d+):(?P<col>\d+): error: .+$", re.M)
UNITS = ["m", "mm", "ft", "in", "kN", "kip", "lbf", "kN/m", "kip/ft", "kN*m", "GPa", "ksi", "mm^4", "kg/m^3", "s", "furlong"]
WORDS = ["down", "up", "clockwise", "counterclockwise", "span", "at", "from", "to", "case", "fixed", "pin", "-", "/", "+", "="]
JUNK = ["\x00", "\t", "  ", "é", "µ", "·", "\u202e", "\ufeff", "#", '"', "\\", "1e99", "-1", "0", "999999999999", "x"]
# Control characters, other line ends and look-alikes of what the grammar reads: none may crash, hide a statement
# or reach the terminal raw.
CONTROL = ["\x0b", "\x0c", "\r", "\x1c", "\x1d", "\x1e", "\x85", "\u2028", "\u2029", "\x1b[2J", "\x1b]0;x\x07",
           "\x7f", "\x9b", "\x08", "\u200b", "\u200d", "\u2066", "\ufffe", "\U0010ffff", "\ue000"]
FOREIGN = ["\u00a0", "\u2007", "\u202f", "\u3000", "\uff15", "\u0664", "\u0966", "\U0001d7d3", "\uff4d", "\u2212",
           "\u00bd", "\u00b2", "\u2074", "\uff0e", "\u066b", "\u2044", "\u0430", "\u03bc", "\u00b5", "\u212b",
           "\\c", "\\n", '\\"', "\\\\", "\U0001f600", "\u0301"]


def mutate(text: str, rng: random.Random) -> str:
    lines = text.splitlines(keepends=True)
    for _ in range(rng.randint(1, 4)):
        if not lines:
            lines = ["\n"]
        i = rng.randrange(len(lines))
        op = rng.choice(["delete", "duplicate", "swap", "unit", "word", "junk", "number", "indent", "truncate",
                         "control", "foreign"])
        tokens = lines[i].split(" ")
        if op == "delete":
            del lines[i]
        elif op == "duplicate":
            lines.insert(i, lines[i])
        elif op == "swap" and len(tokens) > 2:
            a, b = rng.sample(range(len(tokens)), 2)
            tokens[a], tokens[b] = tokens[b], tokens[a]
            lines[i] = " ".join(tokens)
        elif op == "unit":
            lines[i] = re.sub(r"(?<=\d )[A-Za-z][A-Za-z0-9*/^]*", rng.choice(UNITS), lines[i], count=1)
        elif op == "word" and tokens:
            tokens[rng.randrange(len(tokens))] = rng.choice(WORDS)
            lines[i] = " ".join(tokens)
        elif op == "junk":
            k = rng.randrange(len(lines[i]) + 1)
            lines[i] = lines[i][:k] + rng.choice(JUNK) + lines[i][k:]
        elif op in ("control", "foreign"):
            k = rng.randrange(len(lines[i]) + 1)
            lines[i] = lines[i][:k] + rng.choice(CONTROL if op == "control" else FOREIGN) + lines[i][k:]
        elif op == "number":
            lines[i] = re.sub(r"\d+(\.\d+)?", rng.choice(["0", "1e30", "0.000001", "7", "12.5", "1e-30"]), lines[i], count=1)
        elif op == "indent":
            lines[i] = ("  " + lines[i]) if not lines[i].startswith(" ") else lines[i].lstrip()
        elif op == "truncate":
            lines[i] = lines[i][: rng.randrange(len(lines[i]) + 1)]
    return "".join(lines)


def check_one(text: str, workdir: Path, build: bool = False) -> str | None:
    """None when beamlang behaved; otherwise a description of the problem."""
    import contextlib
    import io
    from beamlang.cli import main
    path = workdir / "fuzz.beam"
    path.write_text(text, encoding="utf-8", errors="surrogatepass")
    n_lines = text.count("\n") + 1  # lines end at LF only
    commands = [["fmt", "--check", "fuzz.beam"], ["check", "fuzz.beam", "--junit", "fuzz.xml"]]
    for argv in commands:
        err, out = io.StringIO(), io.StringIO()
        with contextlib.redirect_stderr(err), contextlib.redirect_stdout(out):
            code = main(argv)
        stderr = err.getvalue()
        if code == 3 or "Traceback" in stderr or "internal error" in stderr:
            return f"{argv[0]}: internal error: {stderr[:500]}"
        raw = [ch for ch in stderr + out.getvalue() if ch != "\n" and unicodedata.category(ch) in ("Cc", "Cf")]
        if raw:
            return f"{argv[0]}: a control character reached the terminal raw: {raw[0]!r}"
        if argv[0] == "check":
            try:
                ET.parse(workdir / "fuzz.xml")
            except ET.ParseError as exc:
                return f"check --junit wrote XML that does not parse: {exc}"
        if code == 2:
            found = list(ERROR_LINE.finditer(stderr))
            if not found:
                return f"{argv[0]}: exit 2 without an error line: {stderr[:300]}"
            for m in found:
                if not (1 <= int(m["line"]) <= n_lines + 1 and int(m["col"]) >= 1):
                    return f"{argv[0]}: position outside the file: {m.group(0)}"
        elif code not in (0, 1):
            return f"{argv[0]}: unexpected exit code {code}"
        elif build and argv[0] == "check":  # a member that checks must also build
            commands.append(["build", "fuzz.beam", "-o", "fuzz-out"])
    return None


def run(count: int, seed: int = 0, workdir: Path | None = None, build: bool = False,
        progress=None) -> tuple[int, list[str]]:
    import os
    import tempfile
    rng = random.Random(seed)
    examples = [p.read_text(encoding="utf-8") for p in sorted((ROOT / "examples").glob("*.beam"))]
    problems: list[str] = []
    with tempfile.TemporaryDirectory() as tmp:
        here = os.getcwd()
        os.chdir(workdir or tmp)
        try:
            for done in range(count):
                if progress is not None and done and done % 500 == 0:
                    progress(done, len(problems))
                text = mutate(rng.choice(examples), rng)
                problem = check_one(text, Path(workdir or tmp), build)
                if problem:
                    problems.append(problem + "\n--- input ---\n" + text)
        finally:
            os.chdir(here)
    return count, problems


if __name__ == "__main__":
    args = [a for a in sys.argv[1:] if a != "--build"]
    n = int(args[0]) if args else 1000
    seed = int(args[1]) if len(args) > 1 else 0
    build = "--build" in sys.argv
    t0 = time.perf_counter()
    count, problems = run(n, seed, build=build,
                          progress=lambda done, bad: print(f"{done} inputs, {bad} problems", file=sys.stderr, flush=True))
    print(f"{count} mutated inputs{' (built when they check)' if build else ''}, seed {seed}, "
          f"{time.perf_counter() - t0:.0f} s, {len(problems)} problems")
    for p in problems[:5]:
        print(p)
    sys.exit(1 if problems else 0)

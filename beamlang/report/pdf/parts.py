"""Parts: a long member's Typst body -> its sheets, typeset part by part, each part in a child process of its own,
then joined into one PDF (`joined.py`).

Typst keeps every page it has laid out until its process ends (measured 2026-12-05: the 141 sheets of a member with
20 cases took 589 MiB in one compile, about 4 MiB a sheet of formulas and tables), so the memory of one compile grows
with the member; so does that of joining PDFs (qpdf holds every object: 124 MiB for those 141 sheets). A body longer than SPLIT_ABOVE is cut before its level-2 headings (and, inside a section longer than
PART_CHARACTERS, before its level-3 headings) into parts of at most PART_CHARACTERS where the sections allow; each
part is typeset in a fresh process, one after another, and starts on a sheet of its own. Its title blocks leave the sheet
number blank; one more small compile draws "Sheet k of n" through the whole member over them, and the join too runs
in a process of its own. Every example is one
part, typeset in this process exactly as before."""

from __future__ import annotations

import pickle
import re
import subprocess
import sys
from collections.abc import Callable

# A body longer than SPLIT_ABOVE characters (a member of about 170 sheets) is typeset in parts of at most
# PART_CHARACTERS (about 20 sheets; 95 to 185 MiB a part for the 20-case member). Below it one compile costs less CPU
# time: the parts of the 141-sheet member with 20 cases cost 0.4 s more Typst time than its one compile, and their
# joining 1.1 s (measured 2026-12-05; tests/benchmarks/bench_parts.py).
SPLIT_ABOVE = 500_000
PART_CHARACTERS = 60_000

_HEADING = re.compile(r"^#heading\(level: (\d)\)", re.M)
_LEVEL = {2: re.compile(r"^#heading\(level: 2\)", re.M), 3: re.compile(r"^#heading\(level: 3\)", re.M)}


def _cut(text: str, level: int) -> list[str]:
    """`text` cut before each heading of `level` that starts a line (the pieces join to `text`)."""
    starts = [m.start() for m in _LEVEL[level].finditer(text) if m.start() > 0]
    return [text[a:b] for a, b in zip([0, *starts], [*starts, len(text)])]


def split(body: str) -> list[str]:
    """The body's parts: one part if the body is at most SPLIT_ABOVE characters long; else its sections (a section
    longer than PART_CHARACTERS cut at its level-3 headings) packed in order into parts of at most PART_CHARACTERS,
    a piece longer than that a part of its own. The parts join to `body`."""
    if len(body) <= SPLIT_ABOVE:
        return [body]
    pieces = [p for section in _cut(body, 2) for p in (_cut(section, 3) if len(section) > PART_CHARACTERS else [section])]
    parts: list[str] = []
    for piece in pieces:
        if parts and len(parts[-1]) + len(piece) <= PART_CHARACTERS:
            parts[-1] += piece
        else:
            parts.append(piece)
    return parts


# The child: (module, function, args, keyword args) pickled on stdin; (True, result) or (False, (the exception's
# module, class and message)) pickled on stdout.
_CHILD = """import importlib, pickle, sys
module, name, args, kwargs = pickle.load(sys.stdin.buffer)
try:
    result = (True, getattr(importlib.import_module(module), name)(*args, **kwargs))
except Exception as error:
    result = (False, (type(error).__module__, type(error).__name__, str(error)))
sys.stdout.buffer.write(pickle.dumps(result))
"""


def apart(module: str, name: str, *args, **kwargs):
    """`module.name(*args, **kwargs)` in a fresh Python process (isolated mode: no user site, no PYTHONPATH), so that
    the memory it takes ends with it. Typst's error is raised again as TypstError (our bug); any other failure as
    RuntimeError."""
    run = subprocess.run([sys.executable, "-I", "-c", _CHILD], input=pickle.dumps((module, name, args, kwargs)),
                         capture_output=True, check=False)
    if run.returncode == 0 and run.stdout:
        done, value = pickle.loads(run.stdout)
        if done:
            return value
        if value[:2] == ("typst", "TypstError"):
            import typst
            raise typst.TypstError(value[2])
        raise RuntimeError(f"{value[1]} in a child process: {value[2]}")
    tail = run.stderr.decode("utf-8", "replace").strip().splitlines()[-3:]
    raise RuntimeError(f"a child process ended with code {run.returncode}: {' / '.join(tail)}")


def typeset_apart(source: str, figures: dict[str, str]) -> bytes:
    """`sheet.compile_pdf` in a process of its own that imports only typst."""
    return apart("typst", "compile", source.encode("utf-8"), format="pdf", sys_inputs=figures,
                 ignore_system_fonts=True)


def typeset_parts(sources: list[str], figures: dict[str, str], numbers: Callable[[int], str]) -> bytes:
    """The member's PDF from its parts' sources: each typeset apart, with only the figures it shows, then
    `numbers(n)` (the frame of n sheet numbers, `template.typ` bl-part-sheets) typeset apart, and the parts joined
    with the frame drawn over their sheets, also apart (qpdf holds every object of every part)."""
    from beamlang.report.pdf.joined import sheet_count
    pdfs = [typeset_apart(source, {k: v for k, v in figures.items() if f'"{k}"' in source}) for source in sources]
    frame = typeset_apart(numbers(sum(sheet_count(pdf) for pdf in pdfs)), {})
    levels = [[int(m) for m in _HEADING.findall(source)] for source in sources]
    return apart("beamlang.report.pdf.joined", "joined", pdfs, levels, frame)

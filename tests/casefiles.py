"""Case files: `==== name` section markers -> {name: text}; helpers shared by the tests."""

from __future__ import annotations

import os
from pathlib import Path

HERE = Path(__file__).resolve().parent
CASES = HERE / "cases"
EXAMPLES = HERE.parent / "examples"
UPDATE = os.environ.get("BEAMLANG_UPDATE_GOLDEN") == "1"


def read_case(path: Path) -> dict[str, str]:
    sections: dict[str, list[str]] = {}
    current = None
    for line in path.read_text(encoding="utf-8").splitlines(keepends=True):
        if line.startswith("==== "):
            current = line[5:].strip()
            sections[current] = []
        elif current is not None:
            sections[current].append(line)
    return {k: "".join(v) for k, v in sections.items()}


def write_case(path: Path, sections: dict[str, str]) -> None:
    text = "".join(f"==== {k}\n{v}" + ("" if v.endswith("\n") or not v else "\n") for k, v in sections.items())
    path.write_text(text, encoding="utf-8")


def case_files(folder: str) -> list[Path]:
    return sorted((CASES / folder).glob("*.case"))

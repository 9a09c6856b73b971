"""Watch: `.beam` files and folders -> rebuild the packages of members whose files change, one line each."""

from __future__ import annotations

import sys
import threading
from pathlib import Path
from typing import Callable

from beamlang.errors import BeamError


def rebuild(paths: list[Path], out: Path, previous: dict[str, dict[str, bool]]) -> list[str]:
    """Build each path; one summary line per member, naming every check whose status changed.

    `previous` maps a path to {check: passed} from the last build and is updated in place."""
    from beamlang.language.frontend import load
    from beamlang.pipeline import analyse_loaded
    from beamlang.report.package import write_package
    lines = []
    for path in paths:
        key = path.as_posix()
        try:
            a = analyse_loaded(load(path))
        except BeamError as exc:
            lines.append(f"{key}: input errors, package not rebuilt\n{exc.render()}")
            continue
        folder = write_package(a, out)
        now = {c.label: c.passed for c in a.checks}
        before = previous.get(key, {})
        changed = [f"{name} {'PASS' if before[name] else 'FAIL'} -> {'PASS' if ok else 'FAIL'}"
                   for name, ok in now.items() if name in before and before[name] != ok]
        previous[key] = now
        passed = sum(now.values())
        lines.append(f"rebuilt {folder.as_posix()}: {passed} of {len(now)} checks pass"
                     + ("; " + "; ".join(changed) if changed else ""))
    return lines


def watch_loop(targets: list[str], out: Path, stop: threading.Event | None = None,
               say: Callable[[str], None] = lambda s: print(s, file=sys.stderr, flush=True)) -> None:
    """Build everything once, then rebuild changed members until interrupted (or `stop` is set)."""
    from watchfiles import Change, watch
    from beamlang.language.frontend import expand
    previous: dict[str, dict[str, bool]] = {}
    for line in rebuild(expand(targets), out, previous):
        say(line)
    say("watching for changes (Ctrl-C to stop)")
    out_resolved = out.resolve()
    for changes in watch(*targets, stop_event=stop, debounce=200, rust_timeout=500, yield_on_timeout=False):
        changed = sorted({Path(p) for kind, p in changes if kind != Change.deleted and p.endswith(".beam")
                          and out_resolved not in Path(p).resolve().parents})
        if changed:
            for line in rebuild([_relative(p) for p in changed], out, previous):
                say(line)


def _relative(path: Path) -> Path:
    try:
        return path.resolve().relative_to(Path.cwd().resolve())
    except ValueError:
        return path

"""Watch: `.beam` files and folders -> rebuild the packages of members whose files change, one line each."""

from __future__ import annotations

import os
import sys
import threading
from pathlib import Path
from typing import Callable

from beamlang.errors import BeamError


def rebuild(paths: list[Path], out: Path, previous: dict[str, dict[str, bool]],
            owners: dict[str, str] | None = None) -> list[str]:
    """Build each path; one summary line per member, naming every check whose status changed.

    `previous` maps a path to {check: passed} from the last build and is updated in place. `owners` maps an
    output folder (as `marks.folder_key` compares it) to the path whose member last claimed it: a second file
    whose mark gives the same folder is refused, as `build` refuses it, instead of overwriting the other package."""
    from beamlang.language.frontend import load
    from beamlang.language.marks import folder_key, folder_name
    from beamlang.pipeline import analyse_loaded
    from beamlang.report.package import write_package
    owners = {} if owners is None else owners
    lines = []
    for path in paths:
        key = path.as_posix()
        try:
            loaded = load(path)
        except BeamError as exc:
            lines.append(f"{key}: input errors, package not rebuilt\n{exc.render()}")
            continue
        mark = loaded.member.mark
        owner = owners.get(folder_key(mark))
        if owner is not None and owner != key and Path(owner).is_file():
            lines.append(f"{key}: member mark '{mark}' gives the output folder "
                         f"{(out / folder_name(mark)).as_posix()} of {owner}; package not rebuilt "
                         "(marks name the output folders and must differ)")
            continue
        for folder in [f for f, p in owners.items() if p == key]:
            del owners[folder]
        owners[folder_key(mark)] = key
        a = analyse_loaded(loaded)
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
    """Build everything once, then rebuild changed members until interrupted (or `stop` is set).

    A file or folder given on the command line may be replaced rather than written: an editor's atomic save
    (a temporary file renamed over the watched one) or a branch switch that swaps a folder. The operating
    system's watch follows the old file, which no longer changes; so every half second each target's identity
    (device and inode) is compared with the one watched, and a replaced target is rebuilt, said, and watched
    again. A target that disappears is waited for."""
    from watchfiles import Change, watch
    from beamlang.language.frontend import expand
    previous: dict[str, dict[str, bool]] = {}
    owners: dict[str, str] = {}
    stop = stop or threading.Event()
    for line in rebuild(expand(targets), out, previous, owners):
        say(line)
    say("watching for changes (Ctrl-C to stop)")
    out_resolved = out.resolve()
    built = {t: _identity(t) for t in targets}  # what each target was when its members were last built
    while not stop.is_set():
        back = [t for t in targets if _identity(t) is not None and _identity(t) != built[t]]
        for target in back:
            say(f"{target} was replaced (an editor's save or a branch switch); watching it again")
            built[target] = _identity(target)
        if back:
            for line in rebuild([_relative(p) for p in expand(back)], out, previous, owners):
                say(line)
        watched = {t: _identity(t) for t in targets}
        present = [t for t, ident in watched.items() if ident is not None]
        if not present:
            stop.wait(0.5)
            continue
        for changes in watch(*present, stop_event=stop, debounce=200, rust_timeout=500, yield_on_timeout=True):
            replaced = [t for t in targets if _identity(t) != watched[t]]
            changed = {_relative(Path(p)) for kind, p in changes if kind != Change.deleted and p.endswith(".beam")
                       and Path(p).is_file() and out_resolved not in Path(p).resolve().parents
                       and not any(_within(Path(p), t) for t in replaced)}  # those are rebuilt whole, above
            if changed:
                for line in rebuild(sorted(changed), out, previous, owners):
                    say(line)
            for target in replaced:
                if _identity(target) is None:
                    say(f"{target} is gone; waiting for it to come back")
                    built[target] = None
            if replaced:
                break  # watch the new files and folders


def _within(path: Path, target: str) -> bool:
    top, here = Path(target).resolve(), path.resolve()
    return here == top or top in here.parents


def _identity(target: str) -> tuple[int, int] | None:
    try:
        st = os.stat(target)
    except OSError:
        return None
    return st.st_dev, st.st_ino


def _relative(path: Path) -> Path:
    try:
        return path.resolve().relative_to(Path.cwd().resolve())
    except ValueError:
        return path



"""`beamlang watch`: a changed member is rebuilt with a one-line summary naming checks that changed status."""

from __future__ import annotations

import os
import shutil
import threading
import time
from pathlib import Path

from beamlang.tools.watch import rebuild, watch_loop
from casefiles import EXAMPLES


def test_rebuild_reports_status_changes(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    shutil.copy(EXAMPLES / "mezzanine-edge-beam.beam", tmp_path / "b3.beam")
    previous: dict = {}
    assert rebuild([Path("b3.beam")], Path("out"), previous) == ["rebuilt out/B-3: 4 of 4 checks pass"]
    beam = tmp_path / "b3.beam"
    beam.write_text(beam.read_text(encoding="utf-8").replace("point 12 kN", "point 60 kN"), encoding="utf-8")
    (line,) = rebuild([Path("b3.beam")], Path("out"), previous)
    assert line == "rebuilt out/B-3: 3 of 4 checks pass; deflection live span 1 (line 30) PASS -> FAIL"
    beam.write_text("span 4\n", encoding="utf-8")
    (line,) = rebuild([Path("b3.beam")], Path("out"), previous)
    assert line.startswith("b3.beam: input errors, package not rebuilt\nb3.beam:1:6: error: this number needs its unit")


def test_watch_loop_rebuilds_on_save(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "beams").mkdir()
    shutil.copy(EXAMPLES / "lintel-propped.beam", tmp_path / "beams" / "l4.beam")
    said: list[str] = []
    stop = threading.Event()
    worker = threading.Thread(target=watch_loop, args=(["beams"], Path("out"), stop, said.append), daemon=True)
    worker.start()
    deadline = time.monotonic() + 60
    while "watching for changes (Ctrl-C to stop)" not in said and time.monotonic() < deadline:
        time.sleep(0.1)
    time.sleep(0.5)
    beam = tmp_path / "beams" / "l4.beam"
    beam.write_text(beam.read_text(encoding="utf-8").replace("span/500", "span/10000"), encoding="utf-8")
    while len(said) < 3 and time.monotonic() < deadline:
        time.sleep(0.1)
    stop.set()
    worker.join(timeout=10)
    assert said[0] == "rebuilt out/L-4: 3 of 3 checks pass"
    assert said[2] == "rebuilt out/L-4: 2 of 3 checks pass; deflection dead span 1 (line 19) PASS -> FAIL"


def _start(targets, said):
    stop = threading.Event()
    worker = threading.Thread(target=watch_loop, args=(targets, Path("out"), stop, said.append), daemon=True)
    worker.start()
    _wait_for(said, lambda: "watching for changes (Ctrl-C to stop)" in said)
    time.sleep(0.5)
    return stop, worker


def _wait_for(said, condition, seconds=60):
    deadline = time.monotonic() + seconds
    while not condition() and time.monotonic() < deadline:
        time.sleep(0.1)
    assert condition(), said


def _atomic_save(path: Path, text: str) -> None:
    """What many editors do: write a temporary file beside the file, rename it over the file."""
    temporary = path.with_name(f".{path.name}.tmp-save")
    temporary.write_text(text, encoding="utf-8")
    os.replace(temporary, path)


def test_watch_follows_a_watched_file_through_atomic_saves(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    beam = tmp_path / "l4.beam"
    shutil.copy(EXAMPLES / "lintel-propped.beam", beam)
    text = beam.read_text(encoding="utf-8")
    said: list[str] = []
    stop, worker = _start(["l4.beam"], said)
    try:
        _atomic_save(beam, text.replace("span/500", "span/10000"))
        _wait_for(said, lambda: any("2 of 3 checks pass" in s for s in said))
        assert "l4.beam was replaced (an editor's save or a branch switch); watching it again" in said
        time.sleep(0.5)
        _atomic_save(beam, text)  # the second save is heard too: the watch follows the new file
        _wait_for(said, lambda: said[-1].startswith("rebuilt out/L-4: 3 of 3 checks pass"))
        beam.write_text(text.replace("span/500", "span/10000"), encoding="utf-8")  # and a plain write after it
        _wait_for(said, lambda: said[-1].startswith("rebuilt out/L-4: 2 of 3 checks pass"))
    finally:
        stop.set()
        worker.join(timeout=10)


def test_watch_follows_a_replaced_folder(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "beams").mkdir()
    shutil.copy(EXAMPLES / "lintel-propped.beam", tmp_path / "beams" / "l4.beam")
    text = (tmp_path / "beams" / "l4.beam").read_text(encoding="utf-8")
    said: list[str] = []
    stop, worker = _start(["beams"], said)
    try:
        (tmp_path / "next").mkdir()  # a branch switch: another folder takes the watched one's place
        (tmp_path / "next" / "l4.beam").write_text(text.replace("span/500", "span/10000"), encoding="utf-8")
        os.rename(tmp_path / "beams", tmp_path / "before")
        os.rename(tmp_path / "next", tmp_path / "beams")
        _wait_for(said, lambda: any("2 of 3 checks pass" in s for s in said))
        assert "beams was replaced (an editor's save or a branch switch); watching it again" in said
        time.sleep(0.5)
        (tmp_path / "beams" / "l4.beam").write_text(text, encoding="utf-8")  # edits in the new folder are heard
        _wait_for(said, lambda: said[-1].startswith("rebuilt out/L-4: 3 of 3 checks pass"))
    finally:
        stop.set()
        worker.join(timeout=10)


def test_watch_refuses_a_second_file_with_an_existing_mark(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "beams").mkdir()
    shutil.copy(EXAMPLES / "lintel-propped.beam", tmp_path / "beams" / "a.beam")
    said: list[str] = []
    stop, worker = _start(["beams"], said)
    try:
        package = (tmp_path / "out" / "L-4" / "L-4.md").read_bytes()
        copy = (tmp_path / "beams" / "a.beam").read_text(encoding="utf-8").replace("Workshop door lintel", "Other")
        (tmp_path / "beams" / "b.beam").write_text(copy, encoding="utf-8")
        _wait_for(said, lambda: any(s.startswith("beams/b.beam: member mark") for s in said))
        assert ("beams/b.beam: member mark 'L-4' gives the output folder out/L-4 of beams/a.beam; package not "
                "rebuilt (marks name the output folders and must differ)") in said
        assert (tmp_path / "out" / "L-4" / "L-4.md").read_bytes() == package
    finally:
        stop.set()
        worker.join(timeout=10)


def test_rebuild_lets_a_file_take_a_mark_its_owner_gave_up(tmp_path, monkeypatch):
    monkeypatch.chdir(tmp_path)
    text = (EXAMPLES / "lintel-propped.beam").read_text(encoding="utf-8")
    (tmp_path / "a.beam").write_text(text, encoding="utf-8")
    (tmp_path / "b.beam").write_text(text, encoding="utf-8")
    previous, owners = {}, {}
    first = rebuild([Path("a.beam"), Path("b.beam")], Path("out"), previous, owners)
    assert first[0].startswith("rebuilt out/L-4") and first[1].startswith("b.beam: member mark 'L-4'")
    (tmp_path / "a.beam").write_text(text.replace("member L-4", "member L-5"), encoding="utf-8")
    assert rebuild([Path("a.beam"), Path("b.beam")], Path("out"), previous, owners)[1].startswith("rebuilt out/L-4")

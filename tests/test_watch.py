"""`beamlang watch`: a changed member is rebuilt with a one-line summary naming checks that changed status."""

from __future__ import annotations

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

"""Nothing lost on a kill or a misbehaving disk: fmt and size --write rewrite atomically, the package swap leaves
each member with its old package or its new one at every step, and file-system errors say what, where and why."""

from __future__ import annotations

import errno
import os
import signal
import subprocess
import sys
import threading
import time
from pathlib import Path

import pytest

from beamlang.cli import main

MEMBER = """member T-1 "Test beam"

span 4 m
material steel E 200 GPa yield 250 MPa density 7850 kg/m^3
section rectangle width 100 mm depth 200 mm

support pin at 0 m
support roller at span

case dead
  uniform 2 kN/m down
"""
UNFORMATTED = MEMBER.replace("span 4 m", "span    4 m") + ("# " + "x" * 100 + "\n") * 1500
ROOT = Path(__file__).resolve().parents[1]
KILL = "os.kill(os.getpid(), signal.SIGKILL)"


def _python(tmp_path: Path, script: str) -> subprocess.CompletedProcess:
    prelude = f"import os, signal, sys\nsys.path.insert(0, {str(ROOT)!r})\nos.chdir({str(tmp_path)!r})\n"
    return subprocess.run([sys.executable, "-c", prelude + script], capture_output=True, text=True, timeout=300)


def test_fmt_killed_while_writing_leaves_the_old_file(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    beam = tmp_path / "m.beam"
    beam.write_text(UNFORMATTED, encoding="utf-8")
    os.chmod(beam, 0o640)
    script = f"""
import beamlang.tools.files as files
real = files.os.fdopen
def fdopen(fd, *a, **k):
    handle = real(fd, *a, **k)
    def write(data):
        handle.raw.write(data[: len(data) // 2]) if hasattr(handle, "raw") else None
        {KILL}
    handle.write = write
    return handle
files.os.fdopen = fdopen
from beamlang.cli import main
main(["fmt", "m.beam"])
"""
    done = _python(tmp_path, script)
    assert done.returncode == -signal.SIGKILL, done.stderr
    assert beam.read_text(encoding="utf-8") == UNFORMATTED  # the old file, whole
    assert main(["fmt", "m.beam"]) == 0
    assert beam.read_text(encoding="utf-8").startswith(MEMBER)
    assert oct(beam.stat().st_mode & 0o777) == oct(0o640)  # the mode is kept


def test_fmt_killed_before_the_rename_leaves_the_old_file(tmp_path):
    beam = tmp_path / "m.beam"
    beam.write_text(UNFORMATTED, encoding="utf-8")
    done = _python(tmp_path, f"""
import beamlang.tools.files as files
files.os.replace = lambda *a: {KILL}
from beamlang.cli import main
main(["fmt", "m.beam"])
""")
    assert done.returncode == -signal.SIGKILL, done.stderr
    assert beam.read_text(encoding="utf-8") == UNFORMATTED


def test_size_write_is_atomic(tmp_path, monkeypatch, capsys):
    import beamlang.tools.files as files
    monkeypatch.chdir(tmp_path)
    source = (ROOT / "examples" / "floor-joist-sized-us.beam").read_text(encoding="utf-8")
    heavier = 'section "2x12" rectangle width 1.5 in depth 11.25 in'
    source = source.replace('section "2x10" rectangle width 1.5 in depth 9.25 in', heavier)
    assert heavier in source
    (tmp_path / "j.beam").write_text(source, encoding="utf-8")
    os.chmod(tmp_path / "j.beam", 0o600)
    calls = []
    real = files.os.replace
    monkeypatch.setattr(files.os, "replace", lambda a, b: calls.append((Path(a).parent, Path(b).name)) or real(a, b))
    assert main(["size", "j.beam", "--write"]) == 0
    capsys.readouterr()
    written = (tmp_path / "j.beam").read_text(encoding="utf-8")
    assert 'section "2x10" rectangle width 1.5 in depth 9.25 in' in written and heavier not in written
    assert calls == [(tmp_path, "j.beam")]  # written beside the file, then renamed over it
    assert (tmp_path / "j.beam").stat().st_mode & 0o777 == 0o600


def _package(folder: Path) -> dict[str, bytes]:
    return {p.relative_to(folder).as_posix(): p.read_bytes() for p in sorted(folder.rglob("*")) if p.is_file()}


@pytest.fixture
def old_and_new(tmp_path, monkeypatch):
    """A member built once (the old package) and its edited file, with the package each gives alone."""
    monkeypatch.chdir(tmp_path)
    beam = tmp_path / "m.beam"
    beam.write_text(MEMBER.replace("2 kN/m", "5 kN/m"), encoding="utf-8")
    assert main(["build", "m.beam", "-o", "ref-old"]) == 0
    beam.write_text(MEMBER, encoding="utf-8")
    assert main(["build", "m.beam", "-o", "ref-new"]) == 0
    beam.write_text(MEMBER.replace("2 kN/m", "5 kN/m"), encoding="utf-8")
    assert main(["build", "m.beam", "-o", "out"]) == 0
    beam.write_text(MEMBER, encoding="utf-8")
    return _package(tmp_path / "ref-old" / "T-1"), _package(tmp_path / "ref-new" / "T-1")


@pytest.mark.parametrize("exchange, step", [(True, "written"), (True, "swapped"),
                                            (False, "written"), (False, "aside"), (False, "swapped")])
def test_a_kill_between_the_swap_steps_leaves_a_whole_package(exchange, step, tmp_path, old_and_new, capsys):
    old, new = old_and_new
    done = _python(tmp_path, f"""
import beamlang.report.package as package
{'' if exchange else 'package._exchange = lambda a, b: False'}
def at(name):
    if name == {step!r}:
        {KILL}
package._step = at
from beamlang.cli import main
main(["build", "m.beam", "-o", "out"])
""")
    assert done.returncode == -signal.SIGKILL, done.stderr
    out = tmp_path / "out"
    leftovers = [p.name for p in out.iterdir() if p.name.startswith(".")]
    assert leftovers  # the killed run left its hidden folder
    import beamlang.report.package as package
    if step == "aside":  # the one moment without an exchange: no folder until the next build puts the old back
        assert not (out / "T-1").exists()
        package._clean_leftovers(out / "T-1")
    assert _package(out / "T-1") == (new if step == "swapped" else old)
    assert main(["build", "m.beam", "-o", "out"]) == 0
    capsys.readouterr()
    assert [p.name for p in out.iterdir()] == ["T-1"]  # leftovers cleaned by the next build
    assert _package(out / "T-1") == new


@pytest.mark.parametrize("step", ["written", "swapped"])
def test_ctrl_c_during_the_swap_keeps_a_whole_package(step, tmp_path, old_and_new, monkeypatch, capsys):
    import beamlang.report.package as package
    old, new = old_and_new

    def at(name):
        if name == step:
            raise KeyboardInterrupt
    monkeypatch.setattr(package, "_step", at)
    assert main(["build", "m.beam", "-o", "out"]) == 130
    assert [p.name for p in (tmp_path / "out").iterdir()] == ["T-1"]
    assert _package(tmp_path / "out" / "T-1") == (new if step == "swapped" else old)


def test_builds_into_one_folder_take_turns(tmp_path, old_and_new, monkeypatch):
    """A second writer of the same folder waits for the first one's swap (the lock), then goes ahead."""
    import beamlang.report.package as package
    old, new = old_and_new
    inside, release = threading.Event(), threading.Event()
    first = threading.current_thread()

    def at(name):
        if name == "written" and threading.current_thread() is not first and not inside.is_set():
            inside.set()
            release.wait(30)
    monkeypatch.setattr(package, "_step", at)
    target = tmp_path / "out" / "T-1"
    worker = threading.Thread(target=package.swap_in, args=({"a.txt": b"first"}, target))
    worker.start()
    assert inside.wait(30)
    second = threading.Thread(target=package.swap_in, args=({"b.txt": b"second"}, target))
    second.start()
    time.sleep(0.5)
    assert second.is_alive()  # waiting for the lock, not racing the first writer
    assert _package(target) == old
    release.set()
    worker.join(30)
    second.join(30)
    assert _package(target) == {"b.txt": b"second"}
    assert [p.name for p in target.parent.iterdir()] == ["T-1"]


def test_four_concurrent_builds_into_one_folder_all_succeed(tmp_path, old_and_new):
    script = "from beamlang.cli import main\nsys.exit(main(['build', 'm.beam', '-o', 'out']))\n"
    prelude = f"import os, sys\nsys.path.insert(0, {str(ROOT)!r})\nos.chdir({str(tmp_path)!r})\n"
    procs = [subprocess.Popen([sys.executable, "-c", prelude + script], stderr=subprocess.PIPE, text=True)
             for _ in range(4)]
    results = [(p.wait(timeout=300), p.stderr.read()) for p in procs]
    assert all(code == 0 for code, _ in results), results
    assert [p.name for p in (tmp_path / "out").iterdir()] == ["T-1"]


def test_package_folders_follow_the_umask(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.beam").write_text(MEMBER, encoding="utf-8")
    old = os.umask(0o022)
    try:
        assert main(["build", "m.beam", "-o", "out"]) == 0
    finally:
        os.umask(old)
    for path in [tmp_path / "out" / "T-1", *(tmp_path / "out" / "T-1").rglob("*")]:
        expected = 0o755 if path.is_dir() else 0o644
        assert path.stat().st_mode & 0o777 == expected, path


def test_dangling_links_where_the_swap_works_are_harmless(tmp_path, old_and_new, monkeypatch, capsys):
    out = tmp_path / "out"
    (out / ".T-1.old").symlink_to(tmp_path / "nowhere")  # where earlier versions put the old package
    (out / ".T-1.beamlang-old-0000").symlink_to(tmp_path / "nowhere")
    (out / "U-1").symlink_to(tmp_path / "nowhere")
    assert main(["build", "m.beam", "-o", "out"]) == 0
    assert _package(out / "T-1") == old_and_new[1]
    assert not os.path.lexists(out / ".T-1.beamlang-old-0000")
    (tmp_path / "u.beam").write_text(MEMBER.replace("T-1", "U-1"), encoding="utf-8")
    assert main(["build", "u.beam", "-o", "out"]) == 0  # a link in the package's place is replaced, not followed
    assert (out / "U-1").is_dir() and not (out / "U-1").is_symlink()


COLLIDING = [("Q-1", "Q-1."), ("CON", "CON_"), ("b-3", "B-3"), ("A_B", "A B")]


@pytest.mark.parametrize("jobs", ["1", "7"])
@pytest.mark.parametrize("first, second", COLLIDING[:2])
def test_marks_whose_folders_collide_are_refused_before_building(first, second, jobs, tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    mark = second if " " not in second else "A-B"
    (tmp_path / "a.beam").write_text(MEMBER.replace("T-1", first), encoding="utf-8")
    (tmp_path / "b.beam").write_text(MEMBER.replace("T-1", mark), encoding="utf-8")
    (tmp_path / "c.beam").write_text(MEMBER.replace("T-1", "OTHER"), encoding="utf-8")
    code = main(["build", "a.beam", "b.beam", "c.beam", "-o", "out", "--jobs", jobs])
    err = capsys.readouterr().err
    assert code == 2
    assert (f"b.beam:1:8: error: member mark '{second}' gives the same output folder" in err
            and f"as '{first}' in a.beam:1" in err), err
    assert sorted(p.name for p in (tmp_path / "out").iterdir()) == ["OTHER"]  # neither colliding one is built


def test_jobs_over_many_members_with_distinct_folders(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    for i in range(8):
        (tmp_path / f"m{i}.beam").write_text(MEMBER.replace("T-1", f"T-{i}"), encoding="utf-8")
    assert main(["build", *(f"m{i}.beam" for i in range(8)), "-o", "out", "--jobs", "7"]) == 0
    assert sorted(p.name for p in (tmp_path / "out").iterdir()) == [f"T-{i}" for i in range(8)]


def test_file_system_errors_say_what_where_and_why(tmp_path, monkeypatch, capsys):
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.beam").write_text(MEMBER, encoding="utf-8")
    (tmp_path / "afile").write_text("", encoding="utf-8")
    assert main(["build", "m.beam", "-o", "afile/out"]) == 4
    assert capsys.readouterr().err == ("beamlang: file-system error on afile/out: a part of the path is a file, "
                                       "not a folder (ENOTDIR)\n")
    (tmp_path / "folder").mkdir()
    assert main(["check", "m.beam", "--junit", "folder"]) == 4
    assert capsys.readouterr().err.splitlines()[-1] == ("beamlang: file-system error on folder: it is a folder, "
                                                        "not a file (EISDIR)")


@pytest.mark.parametrize("code, why", [(errno.ENOSPC, "no space left on the device (ENOSPC)"),
                                       (errno.EROFS, "the file system is read-only (EROFS)"),
                                       (errno.EACCES, "permission denied (EACCES)")])
def test_a_full_or_read_only_disk_is_reported_not_an_internal_error(code, why, tmp_path, monkeypatch, capsys):
    import beamlang.report.package as package
    import beamlang.tools.files as files
    monkeypatch.chdir(tmp_path)
    (tmp_path / "m.beam").write_text(UNFORMATTED, encoding="utf-8")

    def refuse(*args, **kwargs):
        raise OSError(code, os.strerror(code))
    (tmp_path / "out").mkdir()
    monkeypatch.setattr(package.os, "mkdir", refuse)
    assert main(["build", "m.beam", "-o", "out"]) == 4
    assert capsys.readouterr().err.endswith(f"beamlang: file-system error on out/T-1: {why}\n")
    monkeypatch.setattr(files.os, "fsync", refuse)
    assert main(["fmt", "m.beam"]) == 4
    assert capsys.readouterr().err == f"beamlang: file-system error on m.beam: {why}\n"
    assert (tmp_path / "m.beam").read_text(encoding="utf-8") == UNFORMATTED
    assert [p.name for p in tmp_path.iterdir() if p.name.startswith(".")] == []  # no temporary file left


@pytest.mark.parametrize("in_repository", [True, False])
def test_a_package_is_the_same_from_any_folder_and_any_spelling_of_the_path(in_repository, tmp_path, monkeypatch,
                                                                            capsys):
    project = tmp_path / "project"
    (project / "beams").mkdir(parents=True)
    if in_repository:
        (project / ".git").mkdir()
    (project / "beams" / "m.beam").write_text(MEMBER, encoding="utf-8")
    monkeypatch.chdir(project)
    assert main(["build", "beams/m.beam", "-o", str(tmp_path / "a")]) == 0
    monkeypatch.chdir(tmp_path)
    assert main(["build", str(project / "beams" / "m.beam"), "-o", "b"]) == 0
    monkeypatch.chdir(project / "beams")
    assert main(["build", "./m.beam", "-o", str(tmp_path / "c")]) == 0
    capsys.readouterr()
    packages = [_package(tmp_path / side / "T-1") for side in "abc"]
    assert packages[0] == packages[1] == packages[2]
    recorded = "beams/m.beam" if in_repository else "m.beam"
    from beamlang.report.tex import md
    assert f"Input file {md(recorded)}, SHA-256" in packages[0]["T-1.md"].decode("utf-8")
    import json
    assert json.loads(packages[0]["results.json"])["file"] == recorded
    assert str(tmp_path).encode() not in b"".join(packages[0].values())

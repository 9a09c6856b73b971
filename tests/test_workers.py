"""The build's worker processes: stale members are built in workers that are replaced after each batch of
jobs x workers.MEMBERS_PER_WORKER members (the typesetter's caches grow with every compile and are never
emptied), with the results in the members' order, for --jobs 1 as for --jobs 2."""

from __future__ import annotations

import os

import pytest

from beamlang import cli
from beamlang.tools import workers


def _pid_of(k: int) -> tuple[int, int]:
    """Runs in a worker: the call's number and the process that ran it."""
    return k, os.getpid()


@pytest.mark.parametrize("jobs", [1, 2])
def test_a_worker_is_replaced_after_the_stated_number_of_members(jobs, monkeypatch):
    monkeypatch.setattr(workers, "MEMBERS_PER_WORKER", 3)
    n = 2 * jobs * 3 + 1  # two full batches and one call more
    done = list(workers.in_workers(_pid_of, [(k,) for k in range(n)], jobs))
    assert [k for k, _pid in done] == list(range(n))  # in order
    pids = [pid for _k, pid in done]
    assert os.getpid() not in pids
    for pid in set(pids):
        ran = [k for k, p in done if p == pid]
        assert len({k // (jobs * 3) for k in ran}) == 1  # no worker outlived its batch of jobs x 3 members
        assert len(ran) <= jobs * 3
    if jobs == 1:
        assert [pids.count(pid) for pid in dict.fromkeys(pids)] == [3, 3, 1]  # one worker per batch
    assert len(set(pids)) >= 3  # each of the three batches had workers of its own


def test_several_stale_members_are_built_in_workers_even_with_one_job(tmp_path, monkeypatch, capsys):
    from pathlib import Path
    root = Path(__file__).resolve().parents[1]
    src = tmp_path / "src"
    src.mkdir()
    for name in ("lintel-propped", "canopy-cantilever"):
        (src / f"{name}.beam").write_text((root / "examples" / f"{name}.beam").read_text(encoding="utf-8"),
                                          encoding="utf-8")
    calls = []
    real = workers.in_workers
    monkeypatch.setattr(workers, "in_workers", lambda function, batch, jobs: calls.append(len(batch)) or
                        real(function, batch, jobs))
    assert cli.main(["build", str(src), "-o", str(tmp_path / "out")]) == 0
    assert calls == [2]
    assert cli.main(["build", str(src / "lintel-propped.beam"), "-o", str(tmp_path / "out"), "--force"]) == 0
    assert calls == [2]  # a single member is built in this process
    assert "built " in capsys.readouterr().err


def test_an_input_error_in_a_worker_reaches_the_building_process_whole():
    import pickle

    from beamlang.errors import BeamError, Diagnostic
    from beamlang.source import Source, Span
    source = Source("m.beam", "span 4 q\n")
    error = BeamError([Diagnostic(Span("m.beam", 1, 8, 9), "unknown unit 'q'", "write m or ft")], source)
    again = pickle.loads(pickle.dumps(error))
    assert isinstance(again, BeamError) and again.render() == error.render() and "^" in again.render()

"""Workers: calls run in order in worker processes that are replaced batch by batch, so that what a worker
keeps between calls (the typesetter's caches, never emptied) cannot grow without end."""

from __future__ import annotations

MEMBERS_PER_WORKER = 10  # members a build worker builds, on average, before fresh processes take over (DEVELOPERS.md)


def in_workers(function, calls: list[tuple], jobs: int):
    """function(*call) for each call, in order, in `jobs` worker processes that are replaced after each batch of
    jobs x MEMBERS_PER_WORKER calls (each batch has a pool of its own): a worker runs MEMBERS_PER_WORKER calls on
    average and never more than its batch. (ProcessPoolExecutor's own max_tasks_per_child hangs with a backlog of
    calls before Python 3.13, gh-115634.)"""
    import multiprocessing
    from concurrent.futures import ProcessPoolExecutor
    # forkserver, not fork: this process already runs threads (BLAS, the PDF typesetter), and a forked child
    # inherits their locks held, which hung builds with --jobs
    methods = multiprocessing.get_all_start_methods()
    context = multiprocessing.get_context("forkserver" if "forkserver" in methods else "spawn")
    size = jobs * MEMBERS_PER_WORKER
    for start in range(0, len(calls), size):
        batch = calls[start:start + size]
        with ProcessPoolExecutor(max_workers=min(jobs, len(batch)), mp_context=context) as pool:
            yield from pool.map(function, *zip(*batch))

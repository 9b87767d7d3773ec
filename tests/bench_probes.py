"""Solvers that misbehave on purpose, to test the benchmark runner's limits and executors.

They are test fixtures, not part of the package: the runner imports a task's
``solver`` by name in its child process, and the test directory is on the
import path there (pytest puts it on ``sys.path`` before the children start;
tests that start the command line in a subprocess add it to ``PYTHONPATH``).

Each has the signature of a task ``solver`` (see
:class:`~sweepwidth.bench.tasks.Task`): ``fn(obj, *, method, time_limit,
seed, progress, **options)``.  Use them as ``solver="bench_probes:NAME"``.

``stubborn``   reports bounds through ``progress`` and then ignores its time limit
``silent``     ignores its time limit without reporting anything
``greedy``     allocates memory until it fails
``crash``      kills itself with SIGSEGV
``broken``     raises ValueError
``honest``     the real cutwidth solver, after sleeping ``delay`` seconds
               (and writing its process id into ``pid_dir`` when given)
"""

from __future__ import annotations

import os
import signal
import time
from typing import Any, Callable

__all__ = ["stubborn", "silent", "greedy", "crash", "broken", "honest"]


def stubborn(obj: Any, *, progress: Callable[[Any], None] | None = None, lower: float = 1, upper: float = 9, **_: Any) -> Any:
    """Report ``[lower, upper]`` and then sleep far beyond any time limit."""
    if progress is not None:
        progress({"lower": lower, "upper": upper, "witness": None})
    time.sleep(3600)
    raise AssertionError("unreachable")  # pragma: no cover


def silent(obj: Any, **_: Any) -> Any:
    """Sleep far beyond any time limit and report nothing."""
    time.sleep(3600)
    raise AssertionError("unreachable")  # pragma: no cover


def greedy(obj: Any, **_: Any) -> Any:
    """Allocate 64 MiB blocks until the memory limit stops it."""
    blocks = []
    while True:
        blocks.append(bytearray(64 * 1024 * 1024))


def crash(obj: Any, **_: Any) -> Any:
    """Die by SIGSEGV without reporting."""
    os.kill(os.getpid(), signal.SIGSEGV)
    time.sleep(10)
    raise AssertionError("unreachable")  # pragma: no cover


def broken(obj: Any, **_: Any) -> Any:
    """Raise a ValueError."""
    raise ValueError("this probe always fails")


def honest(
    obj: Any,
    *,
    delay: float = 0.0,
    pid_dir: str | None = None,
    method: str = "auto",
    time_limit: float | None = None,
    seed: Any = None,
    progress: Any = None,
    **options: Any,
) -> Any:
    """Sleep ``delay`` seconds, then solve cutwidth for real."""
    from sweepwidth.bench.loading import solve_object

    if pid_dir:
        with open(os.path.join(pid_dir, f"{os.getpid()}.pid"), "w") as fh:
            fh.write(str(os.getpid()))
    time.sleep(delay)
    return solve_object(obj, "cutwidth", method=method, time_limit=time_limit, seed=seed, options=options)

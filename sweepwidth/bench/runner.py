"""Running a list of tasks on an executor and writing each result as it finishes.

Executors
---------
Anything with ``submit(fn, *args) -> Future`` works (a
:class:`concurrent.futures.Executor`, or a dask.distributed
``Client.get_executor()``).  :func:`make_executor` builds one from a spec:

``None`` / ``"local"``     a pool of ``jobs`` threads, each watching one limited
                           child process (so ``jobs`` solves run at once)
``"dask://HOST:PORT"``     an existing dask.distributed scheduler
``"dask-local"``           a throw-away in-process dask ``LocalCluster``

Whatever runs a task, the task itself runs in its own child process with its
time and memory limits (:func:`sweepwidth.bench.child.execute_task`).
"""

from __future__ import annotations

import concurrent.futures as cf
import time
from dataclasses import dataclass, field
from typing import Any, Callable, Iterable, Mapping, Sequence, cast

from ..errors import InvalidArgumentError, MissingDependencyError, StorageError, SweepwidthError, UnsupportedOptionError
from .child import cancel_all, execute_task, reset_cancel
from .db import ResultsDB
from .meta import run_metadata
from .summary import verdict
from .tasks import Task

__all__ = ["run_tasks", "RunReport", "make_executor", "task_row"]


@dataclass
class RunReport:
    """What a call of :func:`run_tasks` did.

    Attributes
    ----------
    run_id : str
    total : int
        Tasks asked for (after removing duplicates).
    skipped : int
        Tasks already in the database (with ``resume=True``).
    finished : int
        Tasks run and recorded now.
    rows : list of dict
        The rows recorded now.
    seconds : float
    interrupted : bool
    """

    run_id: str
    total: int
    skipped: int
    finished: int
    rows: list = field(default_factory=list)
    seconds: float = 0.0
    interrupted: bool = False


def task_row(task: Task, outcome: Mapping[str, Any]) -> dict:
    """The database row of a finished task."""
    row = {
        "instance_hash": task.instance_hash,
        "config_hash": task.config_hash(),
        "instance": task.instance,
        "name": task.name,
        "parameter": task.parameter,
        "method": task.method,
        "seed": task.seed,
        "time_limit": task.time_limit,
        "options": dict(task.options),
        "known": dict(task.known) or None,
    }
    for k in ("status", "value", "lower", "upper", "seconds", "wall", "checked", "message", "result"):
        row[k] = outcome.get(k)
    solved = outcome.get("instance_hash")
    if solved and solved != task.instance_hash:
        # the file changed after the task was created: the row belongs to what was solved
        row["instance_hash"] = solved
        note = "the instance file changed after the task was created; row stored under the content that was solved"
        row["message"] = f"{row['message']}; {note}" if row.get("message") else note
    row["result_method"] = outcome.get("method", "")
    row["verdict"] = verdict(row, task.known)
    return row


def _default_sat_solver() -> str:
    """The python-sat solver the cutwidth SAT engine uses when none is named."""
    from ..solve.ordering.sat import SOLVERS

    return str(SOLVERS[0])


class _Owned:
    """An executor we created (and must shut down), with its cleanup."""

    def __init__(self, executor: Any, close: Callable[[], None]) -> None:
        self.executor = executor
        self.close = close


def make_executor(spec: Any = None, *, jobs: int = 1) -> _Owned:
    """An executor for ``spec`` (see the module docstring), wrapped with its cleanup.

    Raises
    ------
    UnsupportedOptionError
        For an unknown spec.
    SweepwidthError
        When dask.distributed is needed but not installed, or the scheduler
        cannot be reached.
    """
    if jobs < 1:
        raise InvalidArgumentError(f"jobs must be at least 1, got {jobs}")
    if spec is None or spec == "local":
        ex = cf.ThreadPoolExecutor(max_workers=jobs, thread_name_prefix="sweepwidth-task")
        return _Owned(ex, lambda: ex.shutdown(wait=True, cancel_futures=True))
    if hasattr(spec, "submit"):
        return _Owned(spec, lambda: None)
    if isinstance(spec, str) and (spec.startswith("dask://") or spec in ("dask-local", "dask")):
        try:
            from distributed import Client, LocalCluster
        except ImportError as err:
            raise MissingDependencyError(
                "the dask executor needs dask.distributed (pip install 'sweepwidth[distributed]')"
            ) from err
        if spec.startswith("dask://"):
            address = "tcp://" + spec[len("dask://"):]
            try:
                client = Client(address, timeout=10)
            except (OSError, TimeoutError) as err:
                raise StorageError(f"cannot reach the dask scheduler at {address}: {err}") from err
            return _Owned(client.get_executor(pure=False), client.close)
        cluster = LocalCluster(n_workers=1, threads_per_worker=jobs, processes=False, dashboard_address=None)
        client = Client(cluster)

        def close() -> None:
            client.close()
            cluster.close()

        return _Owned(client.get_executor(pure=False), close)
    raise UnsupportedOptionError("executor", spec, ["local", "dask://HOST:PORT", "dask-local"])


def run_tasks(
    tasks: Sequence[Task],
    db: ResultsDB | str,
    *,
    jobs: int = 1,
    executor: Any = None,
    resume: bool = False,
    on_row: Callable[[dict], None] | None = None,
    meta: Mapping[str, Any] | None = None,
) -> RunReport:
    """Run ``tasks`` and record each one in ``db`` the moment it finishes.

    Parameters
    ----------
    tasks : sequence of Task
        Duplicates (same key) run once.
    db : ResultsDB or path
    jobs : int
        Tasks running at once on the local pool (or threads of a
        ``dask-local`` cluster).
    executor : None, str or executor
        See :func:`make_executor`.
    resume : bool
        Skip tasks whose key is already in the database.  Without it a task
        that is already there runs again and its row is replaced.
    on_row : callable, optional
        Called with each recorded row (progress bars, live tables).
    meta : dict, optional
        Extra run metadata (stored with versions, machine and git commit).

    Returns
    -------
    RunReport

    Notes
    -----
    One failing task never stops the run: its row says 'error', 'timeout' or
    'memory'.  On KeyboardInterrupt every running child is killed, what has
    finished stays recorded, and the report says ``interrupted``.
    """
    own_db = not isinstance(db, ResultsDB)
    database: ResultsDB = ResultsDB(cast(str, db)) if own_db else cast(ResultsDB, db)  # own_db is isinstance(db, ResultsDB)
    t0 = time.monotonic()
    try:
        database.acquire_lock()
    except BaseException:
        if own_db:
            database.close()
        raise
    try:
        unique: dict[tuple[str, str], Task] = {}
        for t in tasks:
            unique.setdefault(t.key(), t)
        done = database.done_keys() if resume else set()
        todo = [t for k, t in unique.items() if k not in done]
        skipped = len(unique) - len(todo)
        ex_desc = executor if isinstance(executor, str) or executor is None else type(executor).__name__
        sat = sorted({str(t.options.get("solver", _default_sat_solver())) for t in todo if t.parameter == "cutwidth"})
        seeds = sorted({t.seed for t in todo}, key=lambda s: (s is None, s if s is not None else 0))
        run_id = database.start_run(
            run_metadata(
                jobs=jobs,
                executor=ex_desc or "local",
                tasks=len(todo),
                resume=resume,
                sat_solvers=sat,
                seeds=seeds,
                **dict(meta or {}),
            )
        )
        report = RunReport(run_id=run_id, total=len(unique), skipped=skipped, finished=0)
        if not todo:
            database.finish_run(run_id)
            return report
        owned = make_executor(executor, jobs=jobs)
        reset_cancel()
        futures: dict[Any, Task] = {}
        try:
            for t in todo:
                futures[owned.executor.submit(execute_task, t.to_dict())] = t
            for fut in cf.as_completed(list(futures)):
                t = futures[fut]
                try:
                    outcome = fut.result()
                except Exception as err:  # the executor itself failed on this task
                    outcome = {"status": "error", "message": f"executor failed: {type(err).__name__}: {err}"}
                row = task_row(t, outcome)
                database.record(row, run_id)
                report.rows.append(row)
                report.finished += 1
                if on_row is not None:
                    on_row(row)
        except KeyboardInterrupt:
            report.interrupted = True
            for f in futures:
                f.cancel()
            cancel_all()  # also stops children that are still starting
        finally:
            owned.close()
            reset_cancel()
        database.finish_run(run_id)
        report.seconds = time.monotonic() - t0
        return report
    finally:
        database.release_lock()
        if own_db:
            database.close()

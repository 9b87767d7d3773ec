"""Benchmark runs over instance sets: tasks, limited child processes, executors, a results database.

Typical use::

    from sweepwidth.bench import discover, make_tasks, run_tasks
    tasks = make_tasks(discover(["instances/grids"]), ["cutwidth"], time_limit=10)
    report = run_tasks(tasks, "runs.sqlite", jobs=2, resume=True)

Every task runs in its own child process under a time limit and a memory
limit; every finished task is written at once to the SQLite database, keyed
by the instance's content hash and the configuration's hash.
"""

from __future__ import annotations

from .child import OUTCOME_STATUSES, cancel_all, execute_task
from .db import EXPORT_FORMATS, ResultsDB
from .hashing import canonical_json, config_hash, digest, instance_hash
from .loading import PARAMETERS, check_object, load_instance, solve_object
from .meta import run_metadata
from .runner import RunReport, make_executor, run_tasks
from .summary import format_table, summarize, verdict
from .tasks import InstanceEntry, Task, discover, make_tasks

__all__ = [
    "OUTCOME_STATUSES",
    "EXPORT_FORMATS",
    "PARAMETERS",
    "InstanceEntry",
    "ResultsDB",
    "RunReport",
    "Task",
    "canonical_json",
    "cancel_all",
    "check_object",
    "config_hash",
    "digest",
    "discover",
    "execute_task",
    "format_table",
    "instance_hash",
    "load_instance",
    "make_executor",
    "make_tasks",
    "run_metadata",
    "run_tasks",
    "solve_object",
    "summarize",
    "verdict",
]

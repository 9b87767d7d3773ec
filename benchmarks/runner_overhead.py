"""Per-task overhead of the benchmark runner: forkserver children vs fresh interpreters.

Runs the same tiny task (cutwidth of C_6, solved in milliseconds) through
:func:`sweepwidth.bench.execute_task` with both isolation modes and prints
the median wall time per task, the solver's own time, and the ratio between
the modes, plus the throughput of :func:`sweepwidth.bench.run_tasks` with 1
and 2 jobs.  Keep it short: the machine is shared.

    .venv/bin/python benchmarks/runner_overhead.py [--repeat 5]
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time

import networkx as nx

sys.path.insert(0, os.path.dirname(os.path.dirname(os.path.abspath(__file__))))

import sweepwidth as sw  # noqa: E402
from sweepwidth.bench import Task, execute_task, instance_hash, run_tasks  # noqa: E402


def main() -> None:
    ap = argparse.ArgumentParser()
    ap.add_argument("--repeat", type=int, default=5)
    args = ap.parse_args()
    d = tempfile.mkdtemp()
    path = os.path.join(d, "c6.json")
    sw.write(nx.cycle_graph(6), path)
    t = Task(instance=path, instance_hash=instance_hash(path), parameter="cutwidth", time_limit=30)
    execute_task(t)  # start the forkserver once
    rows = []
    for mode in ("fork", "subprocess"):
        walls, solver = [], []
        for _ in range(args.repeat):
            t0 = time.monotonic()
            out = execute_task(t, isolation=mode)
            walls.append(time.monotonic() - t0)
            solver.append(out["seconds"])
            assert out["status"] == "optimal" and out["value"] == 2
        rows.append((mode, statistics.median(walls), statistics.median(solver)))
    print(f"{'isolation':12s} {'median wall s':>14s} {'median solver s':>16s}")
    for mode, w, s in rows:
        print(f"{mode:12s} {w:14.3f} {s:16.3f}")
    print(f"ratio subprocess / fork: {rows[1][1] / rows[0][1]:.1f}x")
    tasks = [Task(**{**t.to_dict(), "seed": i}) for i in range(2 * args.repeat)]
    for jobs in (1, 2):
        t0 = time.monotonic()
        run_tasks(tasks, os.path.join(d, f"runs{jobs}.sqlite"), jobs=jobs)
        dt = time.monotonic() - t0
        print(f"run_tasks, {len(tasks)} tasks, jobs={jobs}: {dt:.2f} s ({len(tasks) / dt:.1f} tasks/s)")


if __name__ == "__main__":
    main()

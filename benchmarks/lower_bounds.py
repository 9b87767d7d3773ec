"""Cutwidth lower bounds: the library's existing ones against the new ones, in one run.

Usage::

    python benchmarks/lower_bounds.py              # 30 s per new bound and instance
    python benchmarks/lower_bounds.py --time 60    # the goals' limit

Columns: instance, vertices / edges, the best of
``sweepwidth.solve.ordering.bounds.lower_bounds`` (``old``, with its seconds),
each new bound of :mod:`sweepwidth.solve.ordering` with its seconds, the
largest of them all (``best``), and the published optimum (``known``) where
one exists.

Instances:

* weighted disks: ``generators.delaunay(n, seed=s)`` with every edge weight an
  integer drawn uniformly from 1..10 by ``numpy.random.default_rng(s)`` (one
  draw per edge id, in order), then the outer face's edges set to 1; the
  problem is the cutwidth of the dual with the outer face's vertex pinned
  first (the homology sweep width of the disk from its boundary);
* networkx's ``les_miserables_graph()`` unweighted and with its ``weight``
  attribute;
* the 100 x 100 grid: cutwidth 101 (cw(P_m x P_n) = m + 1 for 3 <= m <= n,
  Rolim, Sykora and Vrto, WG 1995; from memory).
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import networkx as nx
import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from sweepwidth import generators  # noqa: E402
from sweepwidth.problems.ordering import OrderingProblem  # noqa: E402
from sweepwidth.solve.ordering.flow import flow_bound  # noqa: E402
from sweepwidth.solve.ordering.bounds import lower_bounds  # noqa: E402


def weighted_disk_dual(n: int, seed: int) -> OrderingProblem:
    """The pinned dual of a light-boundary, heavy-interior Delaunay disk (see the module notes)."""
    P = generators.delaunay(n, seed=seed)
    rng = np.random.default_rng(seed)
    w = rng.integers(1, 11, size=P.number_of_edges()).astype(float)
    outer = P.outer_face
    w[list(P.face_edges(outer))] = 1.0
    D = P.with_weights(w.tolist()).dual()
    return OrderingProblem.from_graph(D.to_networkx(), first=outer)


def instances() -> list[tuple[str, OrderingProblem, str]]:
    G = nx.les_miserables_graph()
    return [
        ("disk-100-s1 (dual, pinned)", weighted_disk_dual(100, 1), ""),
        ("disk-100-s2 (dual, pinned)", weighted_disk_dual(100, 2), ""),
        ("disk-200-s1 (dual, pinned)", weighted_disk_dual(200, 1), ""),
        ("les miserables", OrderingProblem.from_graph(G, weight=None), ""),
        ("les miserables, weighted", OrderingProblem.from_graph(G), ""),
        ("grid 100x100", OrderingProblem.from_graph(nx.grid_2d_graph(100, 100)), "101"),
    ]


NEW = [("flow", flow_bound)]


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--time", type=float, default=30.0, help="seconds per new bound and instance")
    args = ap.parse_args()
    # compile the kernels once, outside the timings
    flow_bound(OrderingProblem.from_graph(nx.cycle_graph(5)))
    head = ["instance", "n", "m", "old", "old s"] + [x for name, _ in NEW for x in (name, f"{name} s")] + ["best", "known"]
    rows = []
    for label, P, known in instances():
        t = time.monotonic()
        old = max(lower_bounds(P, deadline=time.monotonic() + args.time).values(), default=0.0)
        row = [label, str(P.n), str(P.m), f"{old:g}", f"{time.monotonic() - t:.1f}"]
        best = old
        for _, fn in NEW:
            t = time.monotonic()
            val = fn(P, time.monotonic() + args.time)
            best = max(best, val)
            row += [f"{val:g}", f"{time.monotonic() - t:.1f}"]
        row += [f"{best:g}", known]
        rows.append(row)
        print(" | ".join(row), flush=True)
    widths = [max(len(r[i]) for r in rows + [head]) for i in range(len(head))]
    print()
    print(" | ".join(h.ljust(wd) for h, wd in zip(head, widths)))
    print("-|-".join("-" * wd for wd in widths))
    for r in rows:
        print(" | ".join(c.ljust(wd) for c, wd in zip(r, widths)))


if __name__ == "__main__":
    main()

"""The face-graph walk bound (``solve.ordering.carving``) against the library's other cutwidth lower bounds.

Usage::

    python benchmarks/carving.py              # 30 s per bound and instance
    python benchmarks/carving.py --time 60

Columns: instance, vertices / edges, the best of
``sweepwidth.solve.ordering.bounds.lower_bounds`` (``cheap+costly``) and
``flow.flow_bound`` with their seconds, then ``carving_bound`` (no upper bound
passed: its levels stop at the width of a breadth-first layout) with its
seconds, ``ratcatcher_bound`` (``solve.ordering.ratcatcher``: the carving width by the
ratcatcher game, a cutwidth bound when it exceeds the largest unpinned degree; 0 when
the game's memory estimate is refused or the graph is not planar) with its seconds, and
the published optimum (``known``) where one exists.

Instances:

* ``generators.weighted_delaunay_disk(n, seed=s)``: the cutwidth of its dual
  with the outer face's vertex pinned first (the homology sweep width of the
  disk from its boundary), the dual's rotation system passed as the embedding;
* the 30 x 30 and 100 x 100 grids: cutwidth m + 1 (cw(P_m x P_m) = m + 1 for
  m >= 3, Rolim, Sykora and Vrto, WG 1995; from memory);
* networkx's ``les_miserables_graph()`` unweighted and weighted (not planar:
  the walk bound uses an arbitrary rotation system there and is weak).
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import networkx as nx

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from sweepwidth import generators  # noqa: E402
from sweepwidth.problems.ordering import OrderingProblem  # noqa: E402
from sweepwidth.solve.ordering.bounds import lower_bounds  # noqa: E402
from sweepwidth.solve.ordering.carving import carving_bound  # noqa: E402
from sweepwidth.solve.ordering.flow import flow_bound  # noqa: E402
from sweepwidth.solve.ordering.ratcatcher import ratcatcher_bound  # noqa: E402


def disk(n: int, seed: int) -> tuple[OrderingProblem, object]:
    P = generators.weighted_delaunay_disk(n, seed=seed)
    D = P.dual()
    return OrderingProblem.from_graph(D.to_networkx(), first=P.outer_face), D


def instances(big: bool) -> list[tuple[str, OrderingProblem, object, str]]:
    out = []
    for n, s in [(100, 1), (100, 2), (200, 1), (200, 2), (400, 1), (400, 2)]:
        Q, D = disk(n, s)
        out.append((f"disk-{n}-s{s} (dual, pinned)", Q, D, ""))
    out.append(("grid 30x30", OrderingProblem.from_graph(nx.grid_2d_graph(30, 30)), None, "31"))
    if big:
        out.append(("grid 100x100", OrderingProblem.from_graph(nx.grid_2d_graph(100, 100)), None, "101"))
    G = nx.les_miserables_graph()
    out.append(("les miserables", OrderingProblem.from_graph(G, weight=None), None, ""))
    out.append(("les miserables, weighted", OrderingProblem.from_graph(G), None, ""))
    return out


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--time", type=float, default=30.0, help="seconds per bound and instance")
    ap.add_argument("--big", action="store_true", help="add the 100 x 100 grid")
    args = ap.parse_args()
    # compile (or load) the kernels once, outside the timings
    tiny = OrderingProblem.from_graph(nx.cycle_graph(5))
    flow_bound(tiny)
    carving_bound(tiny)
    head = ["instance", "n", "m", "lower_bounds", "s", "flow", "s", "walk", "s", "ratcatcher", "s", "known"]
    rows = []
    for label, P, emb, known in instances(args.big):
        t = time.monotonic()
        old = max(lower_bounds(P, deadline=time.monotonic() + args.time).values(), default=0.0)
        row = [label, str(P.n), str(P.m), f"{old:g}", f"{time.monotonic() - t:.1f}"]
        t = time.monotonic()
        fl = flow_bound(P, time.monotonic() + args.time)
        row += [f"{fl:g}", f"{time.monotonic() - t:.1f}"]
        t = time.monotonic()
        cb = carving_bound(P, time.monotonic() + args.time, planar_embedding=emb)
        row += [f"{cb:g}", f"{time.monotonic() - t:.1f}"]
        t = time.monotonic()
        rb = ratcatcher_bound(P, time.monotonic() + args.time, planar_embedding=emb)
        row += [f"{rb:g}", f"{time.monotonic() - t:.1f}", known]
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

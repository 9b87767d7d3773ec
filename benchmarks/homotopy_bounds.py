"""Homotopy bounds: the constructed homotopy and the gap, against a plain baseline in the same run.

Baseline: the same sweep construction with one face order only, breadth-first
from the holes (the simplest order that always works).  Ours: ``sw.homotopy_height(P,
method='bounds')``, which tries several orders (spectral, straight-line,
greedy, homology witness) and adds the homology lower bound.

Columns: faces, proven lower bound, upper bound of ours and of the baseline,
the ratio baseline/ours (> 1: ours is better), the gap of ours, seconds
(ours, with its time limit) and whether the witness replays (checker).

Usage::

    python benchmarks/homotopy_bounds.py            # quick: up to ~2000 faces
    python benchmarks/homotopy_bounds.py --full     # the goal: ~10^4 faces under 60 s
"""

from __future__ import annotations

import argparse
import statistics
import time

from sweepwidth import generators
from sweepwidth.problems.homotopy import HomotopyProblem
from sweepwidth.solve.homotopy import bfs_rank, construct_homotopy, homotopy_height


def _instances(full: bool):
    yield "trigrid-10", generators.triangulated_grid(10)
    yield "delaunay-300", generators.delaunay(300, seed=1)
    yield "trigrid-30", generators.triangulated_grid(30)
    yield "delaunay-1000", generators.delaunay(1000, seed=2)
    if full:
        yield "trigrid-70", generators.triangulated_grid(70)
        yield "delaunay-5000", generators.delaunay(5000, seed=1)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true", help="include the ~10^4-face instances")
    ap.add_argument("--time-limit", type=float, default=60.0)
    args = ap.parse_args()
    head = f"{'instance':16} {'faces':>6} {'lower':>7} {'upper':>7} {'base':>7} {'base/ours':>9} {'gap':>6} {'sec':>6} {'base s':>7} check"
    print(head)
    print("-" * len(head))
    ratios = []
    for name, P in _instances(args.full):
        H = HomotopyProblem.build(P)
        t = time.monotonic()
        base = construct_homotopy(H, bfs_rank(H))
        tb = time.monotonic() - t
        t = time.monotonic()
        r = homotopy_height(P, method="bounds", time_limit=args.time_limit)
        tr = time.monotonic() - t
        ok = r.witness is not None and abs(r.check(P) - r.upper) < 1e-9
        b = None if base is None else base[0]
        ratio = None if (b is None or not r.upper) else b / r.upper
        if ratio is not None:
            ratios.append(ratio)
        print(
            f"{name:16} {H.n_faces - 1:>6} {r.lower:>7g} {r.upper if r.upper is not None else '-':>7} "
            f"{b if b is not None else '-':>7} {ratio if ratio is not None else '-':>9.3} {r.gap if r.gap is not None else '-':>6} "
            f"{tr:>6.1f} {tb:>7.2f} {'ok' if ok else 'FAILED'}",
            flush=True,
        )
    if ratios:
        print(f"median baseline/ours upper-bound ratio: {statistics.median(ratios):.3f}")


if __name__ == "__main__":
    main()

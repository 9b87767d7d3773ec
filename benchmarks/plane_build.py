"""Building plane graphs and their duals: linear growth, vectorised paths against the plain loops.

For Delaunay triangulations of n uniform random points (n = 10^3 .. 10^6) it
times, separately from scipy's triangulation itself:

* ``from_faces``   PlaneGraph.from_faces on the triangle array
* ``rotation``     the low-level constructor from rotation arrays (validation + face tracing)
* ``dual``         P.dual()

and prints the CPU seconds of from_faces + dual and CPU microseconds per
vertex (flat when growth is linear; CPU time is less disturbed than wall time
when other processes share the machine) and, for the
sizes where it is affordable, the same steps with the plain Python loops
(the baseline, run in this process) with the speed-up ratio of CPU times.  Medians of
``--repeat`` runs.  The machine may be shared: read ratios, not absolutes.

Usage::

    python benchmarks/plane_build.py                 # 10^3 .. 10^6, baseline up to 10^5
    python benchmarks/plane_build.py --sizes 1000 100000 --baseline-max 10000
"""

from __future__ import annotations

import argparse
import statistics
import time

import numpy as np
from scipy.spatial import Delaunay

from sweepwidth.plane import PlaneGraph, _arrays


def triangles(n: int, seed: int = 0) -> tuple[np.ndarray, dict]:
    rng = np.random.default_rng(seed)
    pts = rng.random((n, 2))
    simp = Delaunay(pts).simplices
    a, b, c = pts[simp[:, 0]], pts[simp[:, 1]], pts[simp[:, 2]]
    cross = (b[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1]) - (b[:, 1] - a[:, 1]) * (c[:, 0] - a[:, 0])
    simp = np.where((cross < 0)[:, None], simp[:, [0, 2, 1]], simp)
    xy = pts.tolist()
    return simp, {v: tuple(xy[v]) for v in range(n)}


def steps(simp: np.ndarray, pos: dict) -> dict[str, float]:
    c0, t0 = time.process_time(), time.perf_counter()
    P = PlaneGraph.from_faces(simp, pos=pos)
    c1, t1 = time.process_time(), time.perf_counter()
    ends = np.array([(P.index(e.u), P.index(e.v)) for e in P.edges], dtype=np.int64)
    nxt = np.asarray(P._next, dtype=np.int64)  # noqa: SLF001 - the rotation arrays themselves
    t2 = time.perf_counter()
    PlaneGraph(P.vertices, ends, P.weights, nxt)
    t3 = time.perf_counter()
    c4a, t4a = time.process_time(), time.perf_counter()
    D = P.dual()
    c4, t4 = time.process_time(), time.perf_counter()
    assert D.number_of_vertices() == P.number_of_faces()
    return {
        "from_faces": t1 - t0,
        "rotation": t3 - t2,
        "dual": t4 - t4a,
        "cpu": (c1 - c0) + (c4 - c4a),
    }


def median_steps(simp: np.ndarray, pos: dict, repeat: int, plain: bool) -> dict[str, float]:
    saved = _arrays.FAST_MIN_DARTS
    _arrays.FAST_MIN_DARTS = 10**12 if plain else saved
    try:
        runs = [steps(simp, pos) for _ in range(repeat)]
    finally:
        _arrays.FAST_MIN_DARTS = saved
    return {k: statistics.median(r[k] for r in runs) for k in runs[0]}


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--sizes", type=int, nargs="+", default=[10**3, 10**4, 10**5, 10**6])
    ap.add_argument("--baseline-max", type=int, default=10**5, help="largest n timed with the plain loops")
    ap.add_argument("--repeat", type=int, default=3, help="runs per size up to 10^4 (one above)")
    args = ap.parse_args()
    head = (
        f"{'n':>8} {'edges':>8} {'delaunay s':>10} {'from_faces s':>12} {'rotation s':>10} {'dual s':>8} "
        f"{'faces+dual s':>12} {'cpu s':>7} {'us/vertex':>9} {'plain cpu':>9} {'speed-up':>8}"
    )
    print(head)
    print("-" * len(head))
    for n in args.sizes:
        t = time.perf_counter()
        simp, pos = triangles(n)
        tri = time.perf_counter() - t
        rep = args.repeat if n <= 10**4 else 1
        fast = median_steps(simp, pos, rep, plain=False)
        total = fast["from_faces"] + fast["dual"]
        edges = int(simp.shape[0] * 3 + (2 * n - 2 - simp.shape[0])) // 2  # 3T + hull = 2E
        plain_s, ratio = "-", "-"
        if n <= args.baseline_max:
            slow = median_steps(simp, pos, rep, plain=True)
            plain_s, ratio = f"{slow['cpu']:9.2f}", f"{slow['cpu'] / fast['cpu']:7.1f}x"
        print(
            f"{n:>8} {edges:>8} {tri:>10.2f} {fast['from_faces']:>12.3f} {fast['rotation']:>10.3f} "
            f"{fast['dual']:>8.3f} {total:>12.3f} {fast['cpu']:>7.3f} {1e6 * fast['cpu'] / n:>9.2f} {plain_s:>9} {ratio:>8}",
            flush=True,
        )


if __name__ == "__main__":
    main()

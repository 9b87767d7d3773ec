"""Homotopy width: exact search against the brute-force reference, and bounds on large disks.

Part 1 (exact): weighted Delaunay disks with A and B boundary arcs (default
leashes).  Ours: ``sw.homotopy_width(P, a, b, method='search')``.  Baseline
in the same run: the brute-force reference of ``tests/reference_width.py``
(bottleneck search over exact leash states, moves enumerated from the
rules), given the optimum as its cap, so it only has to prove it.  Columns:
faces, width, seconds of ours and of the reference, the ratio, and whether
the values agree and the witness replays.  Larger disks (up to 40 faces)
are solved by ours alone with a 10 s limit.

Part 2 (bounds): disks of about 500 faces; ``method='bounds'`` with a 60 s
limit; columns: lower, upper, gap (upper / lower - 1), seconds, replay.

Usage::

    python benchmarks/width.py            # quick
    python benchmarks/width.py --full     # more seeds, the 500-face rows with 60 s limits
"""

from __future__ import annotations

import argparse
import os
import random
import sys
import time

sys.path.insert(0, os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "tests"))

import sweepwidth as sw  # noqa: E402
from sweepwidth import generators  # noqa: E402
from sweepwidth.problems.width import WidthProblem  # noqa: E402

from reference_width import reference_width  # noqa: E402


def disk(points: int, seed: int):
    rng = random.Random(seed)
    P = generators.delaunay(points, seed=seed)
    P = P.with_weights([rng.choice((1, 1, 1, 2, 3)) for _ in range(P.number_of_edges())])
    cyc = [P.tail(d) for d in P.face_darts(P.outer_face)]
    k = len(cyc)
    p = max(1, k // 3)
    q = max(0, k // 3)
    a = cyc[: p + 1]
    b = cyc[p + 1 + (k - p - q - 2) // 2: p + 1 + (k - p - q - 2) // 2 + q + 1][::-1]
    return P, {"vertices": a}, {"vertices": b}


def exact_rows(full: bool) -> None:
    print("exact search vs reference BFS")
    print(f"{'instance':>16} {'faces':>5} {'width':>6} {'ours s':>8} {'ref s':>8} {'ratio':>8} ok")
    sizes: list = [(7, 2), (8, 0)] + ([(6, s) for s in range(3)] + [(7, s) for s in range(2)] if full else [])
    here = os.path.dirname(os.path.abspath(__file__))
    sizes += ["frechet-gap-delaunay-0", "reflip-delaunay-1010", "backstep-delaunay-1037"]
    for item in sizes:
        if isinstance(item, str):
            P = sw.read(os.path.join(here, "..", "instances", "leashes", item + ".json"))
            c = P.meta["curves"]
            a, b, kw = c["a"], c["b"], {"start": c["start"], "end": c["end"]}
            name = item[:16]
        else:
            n, seed = item
            P, a, b = disk(n, seed)
            kw = {}
            name = f"delaunay-{n}-{seed}"
        t = time.perf_counter()
        r = sw.homotopy_width(P, a, b, method="search", **kw)
        ours = time.perf_counter() - t
        W = WidthProblem.build(P, a, b, **kw)
        t = time.perf_counter()
        try:
            ref = reference_width(W, r.value, max_states=1_000_000)
        except RuntimeError:
            ref = "too many states"
        rs = time.perf_counter() - t
        ok = ref == r.value and r.check(P) == r.value
        print(f"{name:>16} {P.number_of_faces() - 1:>5} {r.value:>6g} {ours:>8.3f} {rs:>8.3f} "
              f"{rs / max(ours, 1e-6):>8.0f} {ok}", flush=True)
    print("exact search alone, 10 s limit")
    for n, seed in [(12, 0), (16, 0), (22, 1), (24, 1), (26, 2)] + ([(24, 2), (26, 3)] if full else []):
        P, a, b = disk(n, seed)
        t = time.perf_counter()
        r = sw.homotopy_width(P, a, b, method="search", time_limit=10)
        s = time.perf_counter() - t
        print(f"{f'delaunay-{n}-{seed}':>16} {P.number_of_faces() - 1:>5} {r.status:>9} [{r.lower:g}, {r.upper:g}] "
              f"{s:.2f} s states={r.stats.get('search', {}).get('states')} replay={r.check(P) == r.upper}", flush=True)


def bound_rows(full: bool) -> None:
    print("bounds on large disks")
    rows = [(270, 1)] + ([(270, 2), (270, 3)] if full else [])
    for n, seed in rows:
        P, a, b = disk(n, seed)
        t = time.perf_counter()
        r = sw.homotopy_width(P, a, b, method="bounds", time_limit=60)
        s = time.perf_counter() - t
        gap = r.upper / r.lower - 1 if r.upper is not None else float("inf")
        print(f"delaunay-{n}-{seed} faces={P.number_of_faces() - 1} p={r.stats['p']} q={r.stats['q']} "
              f"lower={r.lower:g} upper={r.upper} gap={100 * gap:.1f}% {s:.1f} s "
              f"replay={r.check(P) == r.upper if r.upper is not None else None} upper from: {r.stats['bounds']['upper']}",
              flush=True)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true")
    ap.add_argument("--part", choices=("exact", "bounds", "all"), default="all")
    args = ap.parse_args()
    if args.part in ("exact", "all"):
        exact_rows(args.full)
    if args.part in ("bounds", "all"):
        bound_rows(args.full)


if __name__ == "__main__":
    main()

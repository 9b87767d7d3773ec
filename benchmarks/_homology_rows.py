"""Benchmark rows for the homology sweep width (imported by ``benchmarks/sweeps.py``).

Four tables, each with a baseline measured in the same run:

1. exact small sweeps: the subset DP beside the reduction to the cutwidth
   engine (same value required; time ratio);
2. the speed goal: triangulated disks with about 200 faces from their
   boundary, ``homology_width`` (pinned reduction) beside the literal
   identity ``sw.cutwidth(P.dual(), first=outer)``, both under the same limit;
3. non-monotone search beside the monotone DP (values and time ratio);
4. crossing sweeps: the exact subset DP beside the relaxed cutwidth bounds.

Run alone: ``.venv/bin/python benchmarks/_homology_rows.py [--quick]``.
"""

from __future__ import annotations

import argparse
import statistics
import sys
import time

import sweepwidth as sw
from sweepwidth import generators


def _fmt(x):
    if x is None:
        return "-"
    if isinstance(x, float):
        return f"{x:g}"
    return str(x)


def _line(*cols, widths=(26, 6, 12, 10, 7, 7, 9, 9)):
    out = []
    for c, w in zip(cols, widths):
        s = _fmt(c)
        out.append(s.ljust(w) if w == widths[0] else s.rjust(w))
    print(" ".join(out), flush=True)


def _timed(fn, repeats=1):
    ts, r = [], None
    for _ in range(repeats):
        t = time.monotonic()
        r = fn()
        ts.append(time.monotonic() - t)
    return r, statistics.median(ts)


def _inner(P):
    return [f for f in P.faces if f != P.outer_face]


def _bnd(P, faces):
    c = set()
    for f in faces:
        c ^= set(P.face_boundary_cycle(f))
    return c


def table_exact(quick):
    print("\n[homology 1] exact small sweeps: subset DP vs reduction to the cutwidth engine")
    _line("instance", "faces", "method", "width", "lower", "upper", "seconds", "ratio")
    cases = [
        ("grid-4x5 boundary", generators.grid(4, 5)),
        ("trigrid-2 boundary", generators.triangulated_grid(2)),
        ("delaunay-10 boundary", generators.delaunay(10, seed=3)),
        ("wheel-12 boundary", generators.wheel(12)),
    ]
    if not quick:
        cases.append(("delaunay-12 boundary", generators.delaunay(12, seed=8)))
    for name, P in cases:
        rd, td = _timed(lambda: sw.homology_width(P, method="subset-dp"), 3)
        rc, tc = _timed(lambda: sw.homology_width(P, method="cutwidth"), 1)
        rd.check(P)
        rc.check(P)
        same = "ok" if rd.value == rc.value else "DIFFER"
        _line(name, len(_inner(P)), "subset-dp", rd.status[:3] + f" {_fmt(rd.value)}", rd.lower, rd.upper, round(td, 4), "base")
        _line("", "", "cutwidth", rc.status[:3] + f" {_fmt(rc.value)}", rc.lower, rc.upper, round(tc, 4), f"{tc / max(td, 1e-6):.1f}x {same}")


def table_goal(quick):
    limit = 15.0 if quick else 60.0
    print(f"\n[homology 2] speed goal: disks with ~200 faces from the boundary, time limit {limit:g} s")
    print("             baseline: sw.cutwidth(P.dual(), first=outer) under the same limit")
    _line("instance", "faces", "method", "status", "lower", "upper", "seconds", "ratio")
    cases = [("trigrid-10", generators.triangulated_grid(10)), ("delaunay-108", generators.delaunay(108, seed=1))]
    if quick:
        cases = cases[:1] + [("delaunay-60", generators.delaunay(60, seed=5))]
    for name, P in cases:
        r, t = _timed(lambda: sw.homology_width(P, time_limit=limit, seed=0))
        r.check(P)
        b, tb = _timed(lambda: sw.cutwidth(P.dual(), first=P.outer_face, time_limit=limit, seed=0))
        _line(name, len(_inner(P)), r.method, r.status, r.lower, r.upper, round(t, 2), "")
        _line("", "", "dual cw", b.status, b.lower, b.upper, round(tb, 2), f"{tb / max(t, 1e-6):.2f}x")
        print(f"    bounds: {r.stats.get('bounds')}")


def table_non_monotone(quick):
    print("\n[homology 3] non-monotone toggle search vs monotone subset DP (from the boundary)")
    _line("instance", "faces", "method", "width", "lower", "upper", "seconds", "ratio")
    cases = [
        ("grid-3x4", generators.grid(3, 4)),
        ("trigrid-2", generators.triangulated_grid(2)),
        ("delaunay-9", generators.delaunay(9, seed=2)),
    ]
    if not quick:
        cases.append(("grid-4x5", generators.grid(4, 5)))
        cases.append(("delaunay-11", generators.delaunay(11, seed=4)))
    for name, P in cases:
        rm, tm = _timed(lambda: sw.homology_width(P, method="subset-dp"), 3)
        rn, tn = _timed(lambda: sw.homology_width(P, monotone=False), 3)
        rn.check(P)
        tag = "equal" if rn.value == rm.value else f"non-monotone better by {rm.value - rn.value:g}"
        _line(name, len(_inner(P)), "subset-dp", rm.value, rm.lower, rm.upper, round(tm, 4), "base")
        _line("", "", "face-sets", rn.value, rn.lower, rn.upper, round(tn, 4), f"{tn / max(tm, 1e-6):.1f}x {tag}")


def table_crossing(quick):
    print("\n[homology 4] crossing sweeps (start and end share edges with swept faces on both sides)")
    _line("instance", "faces", "method", "status", "lower", "upper", "seconds", "ratio")
    P = generators.grid(5, 6)
    sq = {min(P.boundary_walk(f)): f for f in _inner(P)}
    cases = []
    for k, (a, b) in enumerate([((0, 0), (1, 1)), ((0, 0), (1, 2)), ((0, 1), (2, 2))]):
        A = [sq[(a[0] + i, a[1] + j)] for i in range(3) for j in range(3) if (a[0] + i, a[1] + j) in sq]
        B = [sq[(b[0] + i, b[1] + j)] for i in range(2) for j in range(3) if (b[0] + i, b[1] + j) in sq]
        cases.append((f"grid-5x6 blocks #{k}", P, _bnd(P, A), _bnd(P, B)))
    if quick:
        cases = cases[:2]
    for name, G, c0, c1 in cases:
        rd, td = _timed(lambda: sw.homology_width(G, start=c0, end=c1, method="subset-dp"))
        rc, tc = _timed(lambda: sw.homology_width(G, start=c0, end=c1, method="cutwidth"))
        rd.check(G)
        rc.check(G)
        k = len(rd.stats["swept"])
        _line(name, k, "subset-dp", rd.status, rd.lower, rd.upper, round(td, 3), "base")
        _line("", "", "cutwidth", rc.status, rc.lower, rc.upper, round(tc, 3), f"{tc / max(td, 1e-6):.1f}x")


def main(quick: bool | None = None) -> None:
    """Print the homology tables (``quick`` defaults to ``--quick`` on the command line)."""
    if quick is None:
        quick = "--quick" in sys.argv
    t = time.monotonic()
    table_exact(quick)
    table_non_monotone(quick)
    table_crossing(quick)
    table_goal(quick)
    print(f"\n[homology] total {time.monotonic() - t:.1f} s")


if __name__ == "__main__":
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer instances, shorter limits")
    main(ap.parse_args().quick)

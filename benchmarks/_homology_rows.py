"""Benchmark rows for the homology sweep width (imported by ``benchmarks/sweeps.py``).

Four tables, each with a baseline measured in the same run:

1. exact small sweeps: the subset DP beside the reduction to the cutwidth
   engine (same value required; time ratio);
2. the speed goal: triangulated disks with about 200 faces from their
   boundary, ``homology_width`` (pinned reduction) beside the literal
   identity ``sw.cutwidth(P.dual(), first=outer)``, both under the same limit;
3. non-monotone search beside the monotone DP (values and time ratio);
4. crossing sweeps: the exact subset DP beside the relaxed cutwidth bounds;
5. large crossing sweeps: the greedy sweep beside relaxed bounds + local search.

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
        rd, td = _timed(lambda P=P: sw.homology_width(P, method="subset-dp"), 3)
        rc, tc = _timed(lambda P=P: sw.homology_width(P, method="dual-cutwidth"), 1)
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
    D = generators.delaunay(108, seed=1)
    cases = [
        ("trigrid-10", generators.triangulated_grid(10)),
        ("delaunay-108", D),
        ("delaunay-108 weights 1..5", D.with_weights([1 + (e * 7919) % 5 for e in range(D.number_of_edges())])),
    ]
    if quick:
        cases = cases[:1] + [("delaunay-60", generators.delaunay(60, seed=5))]
    for name, P in cases:
        r, t = _timed(lambda P=P: sw.homology_width(P, time_limit=limit, seed=0))
        r.check(P)
        b, tb = _timed(lambda P=P: sw.cutwidth(P.dual(), first=P.outer_face, time_limit=limit, seed=0))
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
        rm, tm = _timed(lambda P=P: sw.homology_width(P, method="subset-dp"), 3)
        rn, tn = _timed(lambda P=P: sw.homology_width(P, monotone=False), 3)
        rn.check(P)
        tag = "equal" if rn.value == rm.value else f"non-monotone better by {rm.value - rn.value:g}"
        _line(name, len(_inner(P)), "subset-dp", rm.value, rm.lower, rm.upper, round(tm, 4), "base")
        _line("", "", "face-sets", rn.value, rn.lower, rn.upper, round(tn, 4), f"{tn / max(tm, 1e-6):.1f}x {tag}")


def _crossing_cases(count, lo=12, hi=20):
    """Deterministic crossing sweeps: two overlapping round face sets of a Delaunay disk.

    Start and end are the boundaries of the faces whose centroids lie within
    ``r`` of two nearby centres; kept when the sweep is crossing and swept
    sets have ``lo..hi`` faces.
    """
    import numpy as np

    from sweepwidth.problems.cycles import FaceSweep, HomologyProblem

    out = []
    for seed in range(200):
        P = generators.delaunay(40, seed=seed)
        cen = {}
        for f in _inner(P):
            pts = np.array([P.pos[v] for v in P.boundary_walk(f)], dtype=float)
            cen[f] = pts.mean(axis=0)
        lo_xy = np.min(list(cen.values()), axis=0)
        hi_xy = np.max(list(cen.values()), axis=0)
        mid = (lo_xy + hi_xy) / 2
        span = float(np.max(hi_xy - lo_xy))
        for r in (0.18, 0.22, 0.26):
            a = mid - [0.12 * span, 0]
            b = mid + [0.12 * span, 0]
            X = [f for f, c in cen.items() if np.linalg.norm(c - a) < r * span]
            Y = [f for f, c in cen.items() if np.linalg.norm(c - b) < r * span]
            c0, c1 = _bnd(P, X), _bnd(P, Y)
            hp = HomologyProblem.build(P, c0, c1)
            if not hp.swept:
                continue
            fs = FaceSweep.build(P, hp.start, hp.swept[0])
            if not fs.nested and lo <= fs.k <= hi:
                out.append((f"delaunay-40 s{seed} r{r}", P, c0, c1))
                break
        if len(out) == count:
            break
    return out


def table_crossing(quick):
    print("\n[homology 4] crossing sweeps (start and end share edges with swept faces on both sides)")
    print("             exact subset DP vs relaxed cutwidth bounds (the crossing edges dropped)")
    _line("instance", "faces", "method", "status", "lower", "upper", "seconds", "ratio")
    for name, G, c0, c1 in _crossing_cases(2 if quick else 4):
        rd, td = _timed(lambda G=G, c0=c0, c1=c1: sw.homology_width(G, start=c0, end=c1, method="subset-dp"), 3)  # median: no compile
        rc, tc = _timed(lambda G=G, c0=c0, c1=c1: sw.homology_width(G, start=c0, end=c1, method="dual-cutwidth"), 3)
        rd.check(G)
        rc.check(G)
        k = len(rd.stats["swept"])
        _line(name, k, "subset-dp", rd.status, rd.lower, rd.upper, round(td, 3), "base")
        _line("", "", "cutwidth", rc.status, rc.lower, rc.upper, round(tc, 3), f"{tc / max(td, 1e-6):.1f}x")


def table_crossing_large(quick):
    print("\n[homology 5] large crossing sweeps: the left half of a Delaunay disk to the right half")
    print("             baseline: the greedy sweep alone; ours: relaxed cutwidth bounds + local search")
    _line("instance", "faces", "method", "status", "lower", "upper", "seconds", "ratio")
    import numpy as np

    from sweepwidth.problems.cycles import FaceSweep
    from sweepwidth.solve.homology.face_sets import greedy_sweep

    for n in ((80,) if quick else (80, 120)):
        P = generators.delaunay(n, seed=1)
        cen = {f: np.mean([P.pos[v] for v in P.boundary_walk(f)], axis=0) for f in _inner(P)}
        mx = float(np.median([c[0] for c in cen.values()]))
        c0 = _bnd(P, [f for f, c in cen.items() if c[0] < mx])
        c1 = _bnd(P, [f for f, c in cen.items() if c[0] >= mx])
        (gw, _), tg = _timed(lambda P=P, c0=c0: greedy_sweep(FaceSweep.build(P, c0, _inner(P)), seed=0))
        r, t = _timed(lambda P=P, c0=c0, c1=c1: sw.homology_width(P, start=c0, end=c1, time_limit=20, seed=0))
        r.check(P)
        _line(f"delaunay-{n} halves", len(r.stats["swept"]), "greedy", "upper", "-", gw, round(tg, 3), "base")
        _line("", "", r.method, r.status, r.lower, r.upper, round(t, 2), f"{gw / r.upper:.2f} (ub ratio)")
        print(f"    bounds: {r.stats.get('bounds')}")


def main(quick: bool | None = None) -> None:
    """Print the homology tables (``quick`` defaults to ``--quick`` on the command line)."""
    if quick is None:
        quick = "--quick" in sys.argv
    t = time.monotonic()
    table_exact(quick)
    table_non_monotone(quick)
    table_crossing(quick)
    table_crossing_large(quick)
    table_goal(quick)
    print(f"\n[homology] total {time.monotonic() - t:.1f} s")


if __name__ == "__main__":
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="fewer instances, shorter limits")
    main(ap.parse_args().quick)

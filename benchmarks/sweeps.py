"""Benchmark: exact homotopy height (walk-state search) beside the reference BFS.

Prints one table: instance, faces, method, height (status), lower, upper,
seconds, states explored, and the time ratio reference / search on the
instances where the reference finishes within its budget.  Then the speed
goals (triangulated grid disks from their boundary), the homology rows of
``benchmarks/_homology_rows.py`` when present, and the bounded dispatcher on a
large disk.

Run: ``.venv/bin/python benchmarks/sweeps.py [--quick]``
"""

from __future__ import annotations

import argparse
import os
import random
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.join(HERE, "..", "tests"))
sys.path.insert(0, HERE)

from sweepwidth import generators
from sweepwidth.problems.homotopy import HomotopyProblem
from sweepwidth.solve.homotopy.search import search_homotopy
from sweepwidth.verify.homotopy import replay_homotopy


def _fmt(x):
    if x is None:
        return "-"
    if isinstance(x, float):
        return f"{x:g}"
    return str(x)


ROWS: list[tuple] = []


def row(name, faces, method, status, lower, upper, seconds, states, ratio=None):
    ROWS.append((name, faces, method, status, lower, upper, seconds, states, ratio))
    print(f"{name:28s} {faces:>6} {method:10s} {status:>14s} {_fmt(lower):>6} {_fmt(upper):>6} "
          f"{seconds:9.3f} {_fmt(states):>9} {('%.1fx' % ratio) if ratio else '-':>8}", flush=True)


def header():
    print(f"{'instance':28s} {'faces':>6} {'method':10s} {'height':>14s} {'lower':>6} {'upper':>6} "
          f"{'seconds':>9} {'states':>9} {'ref/ours':>8}")
    print("-" * 104)


def _opts(H):
    o = H.options()
    return {k: o[k] for k in ("start", "end", "closed", "holes", "spikes", "simple", "monotone", "length")}


def run_search(name, H, *, deadline_s=None, ref_budget=None, ref_below=False):
    F = H.graph.number_of_faces() - len(H.holes)
    t = time.perf_counter()
    dl = None if deadline_s is None else time.monotonic() + deadline_s
    out = search_homotopy(H, deadline=dl)
    sec = time.perf_counter() - t
    if out.witness is not None:
        h = replay_homotopy(H.graph, out.witness, **_opts(H))
        assert abs(h - out.upper) < 1e-9, (h, out.upper)
    status = (f"{_fmt(out.upper)} (optimal)" if out.optimal else "bounded")
    ratio = None
    if ref_below:
        # the reference proves only the exhaustive half: no homotopy below the optimum
        from reference_homotopy import reference_height

        t = time.perf_counter()
        ref, _ = reference_height(H, out.upper - 1)
        rsec = time.perf_counter() - t
        assert ref is None
        row(name, F, "ref <OPT", "none below", out.upper, None, rsec, None)
        ratio = rsec / max(sec, 1e-6)
    if ref_budget is not None:
        from reference_homotopy import reference_height

        t = time.perf_counter()
        ref, _ = reference_height(H, out.upper if out.upper is not None else 1e9)
        rsec = time.perf_counter() - t
        assert ref == out.upper, (ref, out.upper)
        row(name, F, "reference", f"{_fmt(ref)} (optimal)", ref, ref, rsec, None)
        ratio = rsec / max(sec, 1e-6)
    row(name, F, "search", status, out.lower, out.upper, sec, out.stats.get("states", 0) + out.stats.get("dive_states", 0), ratio)
    return out


def interior_instance(seed, n, wmax):
    rng = random.Random(seed)
    P = generators.delaunay(n, seed=seed)
    P = P.with_weights([rng.randint(1, wmax) for _ in range(P.number_of_edges())])
    inner = [f for f in P.faces if f != P.outer_face]
    f = inner[len(inner) // 2]
    d = P.face_darts(f)
    return P, {"vertex": P.tail(d[0]), "darts": d}


def main(argv=None):
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true", help="skip the largest rows")
    args = ap.parse_args(argv)
    header()
    # 1. beside the reference, on instances where it finishes
    for k in (1, 2):
        P = generators.triangulated_grid(k)
        run_search(f"trigrid-{k} boundary", HomotopyProblem.build(P), ref_budget=60)
    for seed in (1, 2, 3):
        P = generators.delaunay(6, seed=seed)
        rng = random.Random(seed)
        P = P.with_weights([rng.randint(1, 4) for _ in range(P.number_of_edges())])
        run_search(f"delaunay-6-s{seed} w1..4", HomotopyProblem.build(P), ref_budget=60)
        run_search(f"delaunay-6-s{seed} nospike", HomotopyProblem.build(P, spikes=False), ref_budget=60)
    P, s = interior_instance(4, 6, 4)
    run_search("delaunay-6-s4 interior", HomotopyProblem.build(P, start=s), ref_budget=60)
    # 2. goals: triangulated k x k grid disks (2k^2 triangles) from their boundary
    ks = (3, 4, 5) if args.quick else (3, 4, 5, 6, 8)
    for k in ks:
        P = generators.triangulated_grid(k)
        run_search(f"trigrid-{k} boundary", HomotopyProblem.build(P), deadline_s=120)
    for k in (3, 4):
        P = generators.triangulated_grid(k)
        rng = random.Random(k)
        P = P.with_weights([rng.randint(1, 3) for _ in range(P.number_of_edges())])
        run_search(f"trigrid-{k} w1..3", HomotopyProblem.build(P), deadline_s=120)
    # research instances (instances/sweeps): the search exhausts whole levels here
    import sweepwidth as sw

    for name, opts in (("split-delaunay-171", {}), ("backtrack-delaunay-2454", {}),
                       ("backtrack-delaunay-2454", {"monotone": True}), ("backtrack-delaunay-2026", {})):
        P = sw.read(os.path.join(HERE, "..", "instances", "sweeps", name + ".json"))
        H = HomotopyProblem.build(P, start=P.meta["curves"]["start"], **opts)
        run_search(name + (" monotone" if opts else ""), H, deadline_s=30,
                   ref_below=(name == "split-delaunay-171"))
    # 3. the homology developer's rows
    try:
        import _homology_rows  # type: ignore

        print()
        _homology_rows.main() if hasattr(_homology_rows, "main") else None
    except ImportError:
        print("(benchmarks/_homology_rows.py not present)")
    # 4. the bounded dispatcher on a large disk
    if not args.quick:
        try:
            import sweepwidth as sw

            P = generators.delaunay(5000, seed=1)
            t = time.perf_counter()
            r = sw.homotopy_height(P, method="bounds", time_limit=60)
            row("delaunay-5000 boundary", P.number_of_faces() - 1, "bounds", r.status, r.lower, r.upper,
                time.perf_counter() - t, None)
        except Exception as err:  # report, do not hide
            print(f"bounded mode row failed: {type(err).__name__}: {err}")


if __name__ == "__main__":
    main()

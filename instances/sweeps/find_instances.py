"""Regenerate the research instances of ``instances/sweeps/`` (deterministic).

Run from the repository root::

    .venv/bin/python instances/sweeps/find_instances.py            # write the JSON files
    .venv/bin/python instances/sweeps/find_instances.py --scan 300 # rerun the random scans

Each instance comes from a seeded random scan over small weighted Delaunay
disks (``sweepwidth.generators.delaunay``), solved with the exact walk-state
search (:func:`sweepwidth.solve.homotopy.search.search_homotopy`); the chosen
seeds are recorded below so that the files are rebuilt without rescanning.
Every recorded value is re-solved when the files are written, every witness
is replayed by the independent checker, and the homology widths come from
:func:`sweepwidth.homology_width` (a different solver).
"""

from __future__ import annotations

import argparse
import json
import os
import random
import sys
import time

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, os.path.dirname(os.path.dirname(HERE)))
sys.path.insert(0, os.path.join(os.path.dirname(os.path.dirname(HERE)), "tests"))

from reference_homotopy import legal_moves

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.problems.homotopy import Curve, HomotopyProblem
from sweepwidth.solve.homotopy.walks import WalkSpace
from sweepwidth.solve.homotopy.search import search_homotopy
from sweepwidth.verify.homotopy import replay_homotopy

#: seeds found by the scans (see ``scan_split`` and ``scan_backtrack``)
SPLIT_SEED = 171
BACKTRACK_SEEDS = (1169, 3091, 2454, 2026)
#: instances small enough for the reference BFS of tests/reference_homotopy.py (seconds)
REFERENCE_CHECKED = (1169, 3091)


# ------------------------------------------------------------------ instance makers
def split_disk(seed: int):
    """A weighted Delaunay disk (5..9 points, weights from {1,1,1,2,3,5,8})."""
    rng = random.Random(seed)
    n = rng.randint(5, 9)
    P = generators.delaunay(n, seed=seed)
    return P.with_weights([rng.choice([1, 1, 1, 2, 3, 5, 8]) for _ in range(P.number_of_edges())])


def backtrack_instance(seed: int, max_darts: int = 10):
    """A weighted Delaunay disk and an interior closed walk with winding numbers in {-1, 0, 1}.

    The walk starts as one face's boundary and takes 1..6 random flips, keeping
    at most 10 darts, no spike (``d`` followed by ``d^1``) and winding numbers
    of absolute value at most 1 (so that monotone homotopies can exist).
    """
    rng = random.Random(seed)
    n = rng.randint(5, 8)
    P = generators.delaunay(n, seed=seed)
    P = P.with_weights([rng.choice([1, 1, 1, 2, 3, 5]) for _ in range(P.number_of_edges())])
    sp = WalkSpace.build(P)
    H0 = HomotopyProblem.build(P)
    inner = [f for f in P.faces if f != P.outer_face]
    d = P.face_darts(rng.choice(inner))
    c = Curve(tuple(d), P.tail_index(d[0]))

    def ok(w):
        L = len(w)
        return 0 < L <= max_darts and all(w[(i + 1) % L] != w[i] ^ 1 for i in range(L)) and \
            max(map(abs, sp.winding(w))) <= 1

    for _ in range(rng.randint(1, 6)):
        # every legal flip, enumerated by brute force (the tests' reference move list)
        cands = [(mv, new, nv) for mv, new, nv in legal_moves(H0, c.darts, c.vertex)
                 if mv["op"] == "flip" and ok(new)]
        if not cands:
            break
        _, new, nv = rng.choice(cands)
        c = Curve(new, nv)
    return P, H0.to_json(c)


#: weights of the ladder family (edge kinds: top, bottom, diagonal, detour halves, rungs)
LADDER_WEIGHTS = {"t": 1, "b": 3, "d": 6, "ta": 5, "tb": 5, "ba": 1, "bb": 1, "r0": 3, "r1": 1, "ri": 4}


def ladder(k: int, w: dict | None = None):
    """k squares in a row, each cut by the diagonal b_i - t_(i+1), with a detour triangle
    outside every top and bottom edge; the start curve is the ladder's boundary.

    The weights were found by a random scan over one square (every weight in 1..6)
    for a square whose optimal homotopies must re-flip a detour face.
    """
    from sweepwidth.plane import PlaneGraph

    w = LADDER_WEIGHTS if w is None else w
    faces, W = [], {}
    for i in range(k):
        b0, b1, t0, t1 = ("b", i), ("b", i + 1), ("t", i), ("t", i + 1)
        faces += [[b0, b1, t1], [b0, t1, t0], [t1, ("a", i), t0], [b0, ("c", i), b1]]
        W[(t0, t1)], W[(b0, b1)], W[(b0, t1)] = w["t"], w["b"], w["d"]
        W[(t0, ("a", i))], W[(("a", i), t1)] = w["ta"], w["tb"]
        W[(b0, ("c", i))], W[(("c", i), b1)] = w["ba"], w["bb"]
    for i in range(k + 1):
        W[(("b", i), ("t", i))] = w["r0"] if i == 0 else (w["r1"] if i == k else w["ri"])
    pos = {}
    for i in range(k + 1):
        pos[("b", i)], pos[("t", i)] = (float(i), 0.0), (float(i), 1.0)
    for i in range(k):
        pos[("a", i)], pos[("c", i)] = (i + 0.5, 1.6), (i + 0.5, -0.6)
    P = PlaneGraph.from_faces(faces, weights=W, pos=pos)
    start = [("b", i) for i in range(k + 1)] + [("t", i) for i in range(k, -1, -1)]
    return P, start


def min_repeated_faces(H, general: float, seconds: float) -> tuple:
    """(least r, proof notes): the least number of faces re-flipped by an optimal homotopy.

    For r below the answer the search with ``max_repeated_faces=r`` explored every
    walk of a homotopy of height <= ``general`` without reaching the end.  Returns
    ``(None, notes)`` when some search ran out of time.
    """
    notes = []
    for r in range(0, 6):
        b = search_homotopy(H, max_repeated_faces=r, upper=general + 1, deadline=time.monotonic() + seconds)
        if b.optimal and b.upper == general:
            return r, notes
        if b.lower > general:
            notes.append(f"r={r}: no homotopy of height <= {general:g} ({b.stats['states']} states)")
            continue
        notes.append(f"r={r}: undecided within {seconds:g} s")
        return None, notes
    return None, notes


# ------------------------------------------------------------------ scans
def scan_split(count: int) -> list:
    """Disks where the homotopy height from the boundary exceeds the homology width."""
    hits = []
    for seed in range(count):
        P = split_disk(seed)
        hw = sw.homology_width(P)
        out = search_homotopy(HomotopyProblem.build(P), lower=hw.value, deadline=time.monotonic() + 10)
        if out.optimal and out.upper > hw.value:
            hits.append((seed, hw.value, out.upper))
    return hits


def scan_backtrack(count: int, seconds: float = 20.0) -> list:
    """Interior curves whose monotone homotopy height exceeds the general one.

    Curves with no monotone homotopy at all (found by the search's obstacle
    test) are skipped: the hits have a finite monotone optimum when the
    search finds it within ``seconds``.
    """
    hits = []
    for seed in range(count):
        P, start = backtrack_instance(seed)
        Hg = HomotopyProblem.build(P, start=start)
        a = search_homotopy(Hg, deadline=time.monotonic() + 3)
        if not a.optimal:
            continue
        Hm = HomotopyProblem.build(P, start=start, monotone=True)
        b = search_homotopy(Hm, deadline=time.monotonic() + 3, upper=a.upper + 1)
        if b.stats.get("infeasible") or b.lower <= a.upper:
            continue
        # a strict gap: now look for the monotone optimum itself
        b = search_homotopy(Hm, deadline=time.monotonic() + seconds)
        hits.append((seed, a.upper, b.lower, b.upper if b.optimal else None))
        print("hit", hits[-1], flush=True)
    return hits


def scan_repeated(count: int, need: int = 2, max_darts: int = 12, seconds: float = 3.0, first: int = 0) -> list:
    """Interior curves where every optimal homotopy re-flips at least ``need`` faces.

    Proved by the search with ``max_repeated_faces = need - 1`` exhausting every
    walk below the general optimum + 1 (so the optimum is not reachable with
    fewer repeated faces).
    """
    hits = []
    for seed in range(first, first + count):
        P, start = backtrack_instance(seed, max_darts=max_darts)
        Hg = HomotopyProblem.build(P, start=start)
        a = search_homotopy(Hg, deadline=time.monotonic() + seconds)
        if not a.optimal:
            continue
        b = search_homotopy(Hg, deadline=time.monotonic() + seconds, upper=a.upper + 1,
                            max_repeated_faces=need - 1)
        if b.lower > a.upper:
            hits.append((seed, a.upper, b.lower))
            print("hit", seed, a.upper, b.lower, flush=True)
    return hits


# ------------------------------------------------------------------ writing
def _options(H):
    o = H.options()
    return {k: o[k] for k in ("start", "end", "closed", "holes", "spikes", "simple", "monotone", "length")}


def _solve_checked(H, **kw):
    out = search_homotopy(H, **kw)
    if out.witness is not None:
        h = replay_homotopy(H.graph, out.witness, **_options(H))
        assert abs(h - out.upper) < 1e-9, (h, out.upper)
    return out


def write_all(folder: str, monotone_seconds: float = 60.0) -> list:
    entries = []
    # 1. homotopy height > homology width, from the boundary of a disk
    P = split_disk(SPLIT_SEED)
    hw = sw.homology_width(P)
    H = HomotopyProblem.build(P)
    t = time.perf_counter()
    out = _solve_checked(H)  # no lower bound given: the search clamps at its own bounds
    sec = time.perf_counter() - t
    assert out.optimal and out.upper > hw.value
    name = f"split-delaunay-{SPLIT_SEED}"
    P.meta["name"] = name
    P.meta["provenance"] = {"generator": "split_disk", "seed": SPLIT_SEED, "script": "instances/sweeps/find_instances.py"}
    P.meta["curves"] = {"start": H.to_json(H.start)}
    P.meta["known"] = {
        "homology": {"value": hw.value, "source": f"sweepwidth.homology_width ({hw.method})"},
        "homotopy": {
            "value": out.upper,
            "source": f"exact walk-state search (sweepwidth.solve.homotopy.search, {out.stats['states']} states, "
                      f"{sec:.1f} s), witness replayed by sweepwidth.verify.homotopy",
        },
    }
    sw.write(P, os.path.join(folder, name + ".json"))
    entries.append({"path": name + ".json", "name": name, "known": P.meta["known"],
                    "description": "disk whose homotopy height from the boundary exceeds its homology width"})
    # 2. interior curves: the monotone optimum exceeds the general one
    for seed in BACKTRACK_SEEDS:
        P, start = backtrack_instance(seed)
        Hg = HomotopyProblem.build(P, start=start)
        a = _solve_checked(Hg)
        Hm = HomotopyProblem.build(P, start=start, monotone=True)
        t = time.perf_counter()
        b = _solve_checked(Hm, deadline=time.monotonic() + monotone_seconds)
        sec = time.perf_counter() - t
        assert a.optimal and (b.stats.get("infeasible") or b.lower > a.upper)
        name = f"backtrack-delaunay-{seed}"
        P.meta["name"] = name
        P.meta["provenance"] = {"generator": "backtrack_instance", "seed": seed,
                                "script": "instances/sweeps/find_instances.py"}
        P.meta["curves"] = {"start": start}
        if b.stats.get("infeasible"):
            mono = {"feasible": False, "source": "search_homotopy(monotone=True): " + b.stats["reason"]}
        else:
            mono = {"lower": b.lower, "source": f"exact walk-state search with monotone=True: every walk of a "
                                                f"homotopy of smaller height was explored ({b.stats['states']} "
                                                f"states, {sec:.0f} s)"}
        if b.optimal:
            mono = {"value": b.upper, "source": "exact walk-state search with monotone=True, witness replayed "
                                                "by sweepwidth.verify.homotopy"}
        elif b.upper is not None:
            mono["upper"] = b.upper
        gsrc = "exact walk-state search, witness replayed by sweepwidth.verify.homotopy"
        if seed in REFERENCE_CHECKED:
            from reference_homotopy import reference_height

            rg, _ = reference_height(Hg, a.upper)
            assert rg == a.upper
            gsrc += "; the same value from the reference BFS of tests/reference_homotopy.py"
            if b.optimal:
                rm, _ = reference_height(Hm, b.upper)
                assert rm == b.upper
                mono["source"] += "; the same value from the reference BFS of tests/reference_homotopy.py"
        P.meta["known"] = {"homotopy": {"value": a.upper, "source": gsrc}}
        if "value" in mono:
            P.meta["known"]["homotopy_monotone"] = mono
        else:
            # 'known' holds exact values only: a proven bound goes beside it
            P.meta["bounds"] = {"homotopy_monotone": mono}
        sw.write(P, os.path.join(folder, name + ".json"))
        entries.append({"path": name + ".json", "name": name, "known": P.meta["known"],
                        "bounds": P.meta.get("bounds", {}),
                        "description": "interior curve: every optimal homotopy flips some face twice"
                                       + ("" if b.optimal else " (no monotone homotopy exists)"
                                          if b.stats.get("infeasible") else "")})
    # 3. the ladder family: the least number of re-flipped faces grows (1, 1, 2 for k = 1, 2, 3)
    for k in (1, 2, 3):
        P, start = ladder(k)
        H = HomotopyProblem.build(P, start=start)
        a = _solve_checked(H)
        assert a.optimal
        r, notes = min_repeated_faces(H, a.upper, 60.0)
        gsrc = "exact walk-state search, witness replayed by sweepwidth.verify.homotopy"
        if k == 1:
            from reference_homotopy import reference_height

            assert reference_height(H, a.upper)[0] == a.upper
            gsrc += "; the same value from the reference BFS of tests/reference_homotopy.py"
        name = f"detour-ladder-{k}"
        P.meta["name"] = name
        P.meta["provenance"] = {"generator": "ladder", "k": k, "weights": LADDER_WEIGHTS,
                                "script": "instances/sweeps/find_instances.py"}
        P.meta["curves"] = {"start": H.to_json(H.start)}
        m = _solve_checked(HomotopyProblem.build(P, start=start, monotone=True), deadline=time.monotonic() + 60)
        P.meta["known"] = {"homotopy": {"value": a.upper, "source": gsrc}}
        if m.optimal:
            msrc = "exact walk-state search with monotone=True, witness replayed by sweepwidth.verify.homotopy"
            if k == 1:
                assert reference_height(HomotopyProblem.build(P, start=start, monotone=True), m.upper)[0] == m.upper
                msrc += "; the same value from the reference BFS"
            P.meta["known"]["homotopy_monotone"] = {"value": m.upper, "source": msrc}
        P.meta["bounds"] = {"min_repeated_faces": {
            "value": r, "source": "search_homotopy(max_repeated_faces=r): " + "; ".join(notes)
            + (f"; r={r} reaches the optimum" if r is not None else "")}}
        sw.write(P, os.path.join(folder, name + ".json"))
        entries.append({"path": name + ".json", "name": name, "known": P.meta["known"], "bounds": P.meta["bounds"],
                        "description": f"ladder of {k} squares with detour triangles: optimal homotopies must "
                                       f"re-flip {r} faces"})
    with open(os.path.join(folder, "manifest.json"), "w", encoding="utf-8") as fh:
        json.dump({"format": "sweepwidth-manifest", "version": 1, "instances": entries}, fh, indent=1)
        fh.write("\n")
    return entries


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--scan", type=int, default=0, help="rerun both random scans over this many seeds")
    ap.add_argument("--monotone-seconds", type=float, default=60.0)
    ap.add_argument("--only-backtrack", action="store_true", help="with --scan: skip the split scan")
    ap.add_argument("--first", type=int, default=0, help="first seed of --scan-repeated")
    ap.add_argument("--max-darts", type=int, default=12, help="longest start walk of --scan-repeated")
    ap.add_argument("--scan-repeated", type=int, default=0,
                    help="scan this many seeds for curves needing two re-flipped faces")
    args = ap.parse_args(argv)
    if args.scan_repeated:
        print("repeated:", scan_repeated(args.scan_repeated, first=args.first, max_darts=args.max_darts))
        return 0
    if args.scan:
        if not args.only_backtrack:
            print("split:", scan_split(args.scan))
        print("backtrack:", scan_backtrack(args.scan))
        return 0
    for e in write_all(HERE, args.monotone_seconds):
        print(e["name"], json.dumps(e["known"]), json.dumps(e.get("bounds", {})))
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

"""Homotopy width: exact search against the brute-force reference, and bounds on large disks.

Part 1 (exact): weighted Delaunay disks with A and B boundary arcs (default
leashes).  Ours: ``sw.homotopy_width(P, a, b, method='search')``.  Baseline
in the same run: the brute-force reference of ``tests/reference_width.py``
(bottleneck search over exact leash states, moves enumerated from the
rules), given the optimum as its cap, so it only has to prove it.  Columns:
faces, width, seconds of ours and of the reference, the ratio, and whether
the values agree and the witness replays.  Larger disks (up to 40 faces)
are solved by ours alone with a 10 s limit.

Part 1b (goal): every disk of 30-42 faces among the seeds, of two families
(``disk``: weights 1-3, A and B short arcs; ``heavy_disk``: weights 1-10, arcs
of a third of the boundary each), solved by 'auto' and by 'search' with a
10 s limit; the count proven and the median seconds.

Part 2 (bounds): disks of about 500 faces (``disk(270, seed)``);
``method='bounds'`` with a 60 s limit (``--time-limit``), the code before the
split sweeps (commit ``d57dc19``, exported with ``git archive`` into a
temporary directory first on the child's ``PYTHONPATH``) and this tree, each
in its own child process, one after the other, in the same run.  Columns:
lower, upper, both gaps (``upper / lower - 1`` and ``(upper - lower) /
upper``), seconds, whether both witnesses replay, where the new upper bound
came from; then the median gaps and their ratio old / new.

Usage::

    python benchmarks/width.py            # quick
    python benchmarks/width.py --full     # more seeds (1, 2, 3 for the 500-face rows)
    python benchmarks/width.py --part bounds --seeds 1,2,3 --time-limit 60
"""

from __future__ import annotations

import argparse
import json
import os
import random
import statistics
import subprocess
import sys
import tempfile
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
    # the last three: disks where the reference needs seconds (it is given the optimum as its cap)
    sizes: list = [(7, 2), (8, 0), (14, 1), (16, 0), (18, 0)]
    sizes += [(6, s) for s in range(3)] + [(7, s) for s in range(2)] + [(18, 1)] if full else []
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


def heavy_disk(points: int, seed: int):
    """Delaunay disk, every edge weight uniform in 1..10, A and B boundary arcs of a third each."""
    rng = random.Random(seed)
    P = generators.delaunay(points, seed=seed)
    P = P.with_weights([rng.randint(1, 10) for _ in range(P.number_of_edges())])
    cyc = [P.tail(d) for d in P.face_darts(P.outer_face)]
    k = len(cyc)
    p = q = max(1, k // 3)
    s = p + 1 + (k - p - q - 2) // 2
    return P, {"vertices": cyc[: p + 1]}, {"vertices": cyc[s: s + q + 1][::-1]}


def goal_rows(full: bool) -> None:
    """Every disk of both families with 30-42 faces among the seeds: proven within 10 s by 'auto' and 'search'?"""
    print("disks of 30-42 faces, 10 s limit: 'auto' and 'search'")
    print(f"{'instance':>16} {'faces':>5} | {'auto':>16} {'s':>6} | {'search':>16} {'s':>6}")
    seeds = range(8 if full else 4)
    tally: dict = {"auto": [], "search": []}
    for fam, make in (("light", disk), ("heavy", heavy_disk)):
        for n in (20, 24, 26):
            for seed in seeds:
                P, a, b = make(n, seed)
                faces = P.number_of_faces() - 1
                if not 30 <= faces <= 42:
                    continue
                cells = []
                for m in ("auto", "search"):
                    t = time.perf_counter()
                    r = sw.homotopy_width(P, a, b, method=m, time_limit=10)
                    dt = time.perf_counter() - t
                    assert r.upper is None or r.check(P) == r.upper
                    tally[m].append((r.status == "optimal", dt))
                    cells.append(f"{r.status[:7]:>7} [{r.lower:g}, {r.upper:g}]".rjust(16) + f" {dt:>6.2f}")
                print(f"{f'{fam}-{n}-{seed}':>16} {faces:>5} | {cells[0]} | {cells[1]}", flush=True)
    for m, rows in tally.items():
        print(f"{m}: proven {sum(ok for ok, _ in rows)} of {len(rows)}, median {statistics.median(dt for _, dt in rows):.2f} s")


BASELINE_COMMIT = "d57dc19"  # the constructions before the split sweeps

# the child: builds disk(points, seed) with this file's disk() and runs method='bounds' on it
CHILD = r"""
import json, sys, time
sys.path.insert(0, sys.argv[1])
from width import disk
import sweepwidth as sw
n, seed, limit = int(sys.argv[2]), int(sys.argv[3]), float(sys.argv[4])
P, a, b = disk(n, seed)
t = time.monotonic()
r = sw.homotopy_width(P, a, b, method="bounds", time_limit=limit)
wall = time.monotonic() - t
replay = None if r.upper is None else r.check(P) == r.upper
print("RESULT " + json.dumps({"faces": P.number_of_faces() - 1, "p": r.stats["p"], "q": r.stats["q"],
                              "lower": r.lower, "upper": r.upper, "wall": wall, "replay": replay,
                              "source": r.stats["bounds"]["upper"]}))
"""


def _export_old(tmp: str) -> str:
    dest = os.path.join(tmp, "old")
    os.makedirs(dest)
    root = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    archive = subprocess.run(["git", "-C", root, "archive", BASELINE_COMMIT, "sweepwidth"], check=True,
                             capture_output=True).stdout
    subprocess.run(["tar", "-x", "-C", dest], input=archive, check=True)
    return dest


def _child(pythonpath: str, n: int, seed: int, limit: float) -> dict:
    here = os.path.dirname(os.path.abspath(__file__))
    env = dict(os.environ, PYTHONPATH=pythonpath)
    try:
        p = subprocess.run([sys.executable, "-c", CHILD, here, str(n), str(seed), str(limit)], capture_output=True,
                           text=True, env=env, cwd=tempfile.gettempdir(), timeout=3 * limit + 120)
    except subprocess.TimeoutExpired:
        return {"error": "no answer"}
    for line in p.stdout.splitlines():
        if line.startswith("RESULT "):
            return json.loads(line[len("RESULT "):])
    return {"error": ((p.stderr.strip().splitlines() or ["no output"])[-1])[:80]}


def _gaps(d: dict) -> tuple[float, float]:
    """(upper / lower - 1, (upper - lower) / upper), in per cent."""
    lo, up = d.get("lower"), d.get("upper")
    if lo is None or up is None or not lo or not up:
        return float("inf"), float("inf")
    return 100.0 * (up / lo - 1.0), 100.0 * (up - lo) / up


def bound_rows(full: bool, limit: float, seeds: list[int], points: list[int]) -> None:
    """Before (commit ``BASELINE_COMMIT``, exported with git archive) and after, each in its own child, same run."""
    print(f"bounds on large disks: method='bounds', {limit:g} s; old = {BASELINE_COMMIT}, new = this tree")
    print("gap1 = upper / lower - 1, gap2 = (upper - lower) / upper (per cent)")
    head = (f"{'instance':>18} {'faces':>5} {'p,q':>5} | {'old lo':>6} {'old up':>6} {'gap1':>6} {'gap2':>6} {'s':>5} | "
            f"{'new lo':>6} {'new up':>6} {'gap1':>6} {'gap2':>6} {'s':>5} replay  upper from (new)")
    print(head)
    here_root = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    new_gaps, old_gaps = [], []
    with tempfile.TemporaryDirectory() as tmp:
        old_path = _export_old(tmp)
        for n in points:
            for seed in seeds:
                old = _child(old_path, n, seed, limit)
                new = _child(here_root, n, seed, limit)
                if "error" in old or "error" in new:
                    print(f"delaunay-{n}-{seed}: old {old.get('error', 'ok')} / new {new.get('error', 'ok')}")
                    continue
                og, ng = _gaps(old), _gaps(new)
                old_gaps.append(og)
                new_gaps.append(ng)
                print(f"{f'delaunay-{n}-{seed}':>18} {new['faces']:>5} {str(new['p']) + ',' + str(new['q']):>5} | "
                      f"{old['lower']:>6g} {old['upper'] if old['upper'] is not None else '-':>6} {og[0]:>6.1f} "
                      f"{og[1]:>6.1f} {old['wall']:>5.1f} | {new['lower']:>6g} "
                      f"{new['upper'] if new['upper'] is not None else '-':>6} {ng[0]:>6.1f} {ng[1]:>6.1f} "
                      f"{new['wall']:>5.1f} {str(old['replay']) + '/' + str(new['replay']):>11}  {new['source']}",
                      flush=True)
    if new_gaps:
        for k, name in ((0, "upper / lower - 1"), (1, "(upper - lower) / upper")):
            o = statistics.median(g[k] for g in old_gaps)
            nn = statistics.median(g[k] for g in new_gaps)
            print(f"median gap ({name}): old {o:.1f} %, new {nn:.1f} %, ratio old/new "
                  f"{(o / nn) if nn else float('inf'):.2f}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true")
    ap.add_argument("--part", choices=("exact", "goal", "bounds", "all"), default="all")
    ap.add_argument("--time-limit", type=float, default=60.0, help="seconds per bounds call (default 60)")
    ap.add_argument("--seeds", default=None, help="comma-separated disk seeds (default 1 quick, 1,2,3 full)")
    ap.add_argument("--points", default=None, help="comma-separated disk sizes in points (default 270)")
    args = ap.parse_args()
    if args.part in ("exact", "all"):
        exact_rows(args.full)
    if args.part in ("goal", "all"):
        goal_rows(args.full)
    if args.part in ("bounds", "all"):
        seeds = [int(x) for x in args.seeds.split(",")] if args.seeds else ([1, 2, 3] if args.full else [1])
        points = [int(x) for x in args.points.split(",")] if args.points else [270]
        bound_rows(args.full, args.time_limit, seeds, points)


if __name__ == "__main__":
    main()

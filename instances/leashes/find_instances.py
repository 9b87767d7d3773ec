"""Find and write the research instances of homotopy width in this folder.

Run from the repository root: ``python instances/leashes/find_instances.py``
writes the instances found for the recorded seeds; ``--scan N`` reruns the
scans over seeds ``0..N-1`` and prints the hits.

Every instance is a weighted Delaunay disk with walks ``a`` and ``b`` on its
outer boundary (the default leashes: the two boundary arcs between them).
Three kinds, each decided by the exact leash-state search
(``sweepwidth.solve.width.exact.search_width``) and replayed by the checker:

* ``frechet-gap-*``: the homotopy width exceeds the geodesic discrete
  Fréchet bound;
* ``reflip-*``: the least width with every face flipped at most once
  (the search with ``allow_reflip=False``) exceeds the homotopy width, so
  every optimal sweep flips some face back;
* ``backstep-*``: the width with backward endpoint steps is below the
  forward-only width.
"""

from __future__ import annotations

import argparse
import json
import os
import random
import sys
import time

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.problems.width import WidthProblem
from sweepwidth.solve.width.bounds import frechet_bound
from sweepwidth.solve.width.exact import search_width

WEIGHTS = (1, 1, 1, 2, 3, 5, 8)
#: seeds from here on give random walks instead of boundary arcs
WALK_SEEDS = 1000
#: seeds found by ``--scan`` for each kind (first hits)
SEEDS = {"frechet-gap": 0, "reflip": 1010, "backstep": 1037}


def instance(seed: int):
    """A weighted Delaunay disk and walks a, b (vertex lists) with their leashes, from a seed.

    Seeds below ``WALK_SEEDS`` give two boundary arcs (default leashes); from
    ``WALK_SEEDS`` on, two random walks of 2..4 edges with shortest-path leashes.
    """
    if seed >= WALK_SEEDS:
        return walk_instance(seed)
    rng = random.Random(seed)
    n = rng.randint(6, 9)
    P = generators.delaunay(n, seed=seed)
    P = P.with_weights([rng.choice(WEIGHTS) for _ in range(P.number_of_edges())])
    cyc = [P.tail(d) for d in P.face_darts(P.outer_face)]
    k = len(cyc)
    if k < 4:
        return None
    p = rng.randint(1, k - 3)
    q = rng.randint(0, k - 3 - p)
    g = rng.randint(1, k - 2 - p - q)
    a = cyc[: p + 1]
    b = cyc[p + g: p + g + q + 1][::-1]
    return P, {"vertices": a}, {"vertices": b}, None, None


def walk_instance(seed: int):
    import networkx as nx

    rng = random.Random(seed)
    P = generators.delaunay(rng.randint(6, 9), seed=seed)
    P = P.with_weights([rng.choice(WEIGHTS) for _ in range(P.number_of_edges())])
    G = nx.Graph()
    for e in range(P.number_of_edges()):
        u, v = P.edge_ends(e)
        G.add_edge(u, v, weight=P.weight(e))
    vs = sorted(G.nodes)

    def walk(k):
        v = rng.choice(vs)
        out = [v]
        for _ in range(k):
            v = rng.choice(sorted(G[v]))
            out.append(v)
        return out

    a, b = walk(rng.randint(2, 4)), walk(rng.randint(2, 4))

    def leash(u, v):
        if u == v:
            return {"vertex": u, "darts": []}
        return {"vertices": nx.dijkstra_path(G, u, v)}

    return P, {"vertices": a}, {"vertices": b}, leash(a[0], b[0]), leash(a[-1], b[-1])


def classify(seed: int, seconds: float = 5.0) -> dict | None:
    got = instance(seed)
    if got is None:
        return None
    P, a, b, st, en = got
    out: dict = {}
    r = sw.homotopy_width(P, a, b, start=st, end=en, method="search", time_limit=seconds)
    if r.status != "optimal":
        return None
    r.check(P)
    W = WidthProblem.build(P, a, b, start=st, end=en)
    out["width"] = r.value
    out["frechet"] = frechet_bound(W)[0]
    rb = sw.homotopy_width(P, a, b, start=st, end=en, method="search", backward=True, time_limit=seconds)
    if rb.status == "optimal":
        rb.check(P)
        out["backward_width"] = rb.value
    mono = search_width(W, allow_reflip=False, lower=r.value, deadline=time.monotonic() + seconds)
    if mono.optimal:
        out["single_flip_width"] = mono.upper
    elif mono.stats.get("infeasible"):
        out["single_flip_width"] = None
    return out


def kinds(c: dict) -> list:
    ks = []
    if c["width"] > c["frechet"]:
        ks.append("frechet-gap")
    if "single_flip_width" in c and (c["single_flip_width"] is None or c["single_flip_width"] > c["width"]):
        ks.append("reflip")
    if "backward_width" in c and c["backward_width"] < c["width"]:
        ks.append("backstep")
    return ks


def scan(count: int, first_seed: int = 0) -> dict:
    first: dict = {}
    for seed in range(first_seed, first_seed + count):
        c = classify(seed)
        if c is None:
            continue
        for k in kinds(c):
            if k not in first:
                first[k] = seed
                print(k, seed, json.dumps(c), flush=True)
        if len(first) == 3:
            break
    return first


def write_all(folder: str, seeds: dict) -> list:
    entries = []
    for kind, seed in seeds.items():
        if seed is None:
            continue
        P, a, b, st, en = instance(seed)
        c = classify(seed)
        W = WidthProblem.build(P, a, b, start=st, end=en)
        opts = W.options()
        name = f"{kind}-delaunay-{seed}"
        P.meta["name"] = name
        P.meta["provenance"] = {"generator": "instance", "seed": seed, "script": "instances/leashes/find_instances.py"}
        P.meta["curves"] = {k: opts[k] for k in ("a", "b", "start", "end")}
        src = "exact leash-state search (sweepwidth.solve.width.exact), witness replayed by the checker"
        P.meta["known"] = {
            "width": {"value": c["width"], "source": src},
            "width_backward": {"value": c.get("backward_width"), "source": src + ", backward=True"},
        }
        P.meta["facts"] = {  # values of no parameter variant: kept beside the known values
            "single_flip_width": {"value": c.get("single_flip_width"),
                                  "source": "exact search with every face flipped at most once (allow_reflip=False)"},
            "geodesic_frechet_bound": {"value": c["frechet"], "source": "sweepwidth.solve.width.bounds.frechet_bound"},
        }
        sw.write(P, os.path.join(folder, name + ".json"))
        entries.append({"path": name + ".json", "name": name, "kind": "plane", "role": kind, "known": P.meta["known"],
                        "facts": P.meta["facts"]})
    with open(os.path.join(folder, "manifest.json"), "w", encoding="utf-8") as fh:
        json.dump({"format": "sweepwidth-manifest", "version": 1, "instances": entries}, fh, indent=1)
    return entries


def main(argv=None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--scan", type=int, default=0, help="scan seeds 0..N-1 and print the first hit of each kind")
    args = ap.parse_args(argv)
    seeds = dict(SEEDS)
    if args.scan:
        seeds.update(scan(args.scan))
        seeds.update({k: v for k, v in scan(args.scan, WALK_SEEDS).items() if seeds.get(k) is None})
    for e in write_all(os.path.dirname(os.path.abspath(__file__)), seeds):
        print(e["name"], json.dumps(e["known"]))
    return 0


if __name__ == "__main__":
    sys.exit(main())

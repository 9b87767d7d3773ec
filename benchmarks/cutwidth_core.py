"""Cutwidth core methods: exact search, subset DP and heuristics against baselines.

Two tables, each with baselines run in this same process:

* exact: the compiled prefix-set search (``method='bnb'``) against the same
  search in pure Python and against the subset DP where it fits; the ratio
  column is baseline time / our time.
* bounds: the heuristic portfolio plus local search and the lower bounds on
  large meshes, against a single breadth-first level ordering from a random
  vertex (the usual quick upper bound); the ratio column is baseline width /
  our width.

Known values: grid P_m x P_n = m + 1 (Rolim, Sykora, Vrto, WG 1995), Q_d =
floor(2^(d+1)/3) (Harper; Nakano), complete binary tree of height h =
ceil(h/2) + 1 (Lengauer 1982), K_n = floor(n^2/4) (common practice).

Usage::

    python benchmarks/cutwidth_core.py            # quick, about two minutes
    python benchmarks/cutwidth_core.py --full     # larger instances and limits
"""

from __future__ import annotations

import argparse
import math
import random
import statistics
import time

import networkx as nx
import numpy as np

import sweepwidth as sw
from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.bnb import solve_bnb
from sweepwidth.solve.ordering.dp import dp_estimate, solve_dp
from sweepwidth.solve.ordering.heuristics import level_ordering


def shuffled(G: nx.Graph, seed: int) -> nx.Graph:
    rnd = random.Random(seed)
    nodes = list(G.nodes())
    rnd.shuffle(nodes)
    edges = list(G.edges())
    rnd.shuffle(edges)
    H = nx.Graph()
    H.add_nodes_from(nodes)
    H.add_edges_from(edges)
    return H


def triangulation(n: int, seed: int) -> nx.Graph:
    from scipy.spatial import Delaunay

    pts = np.random.default_rng(seed).random((n, 2))
    G = nx.Graph()
    for s in Delaunay(pts).simplices:
        for i in range(3):
            G.add_edge(int(s[i]), int(s[(i + 1) % 3]))
    return G


def timed(fn, reps: int = 1):
    times, out = [], None
    for _ in range(reps):
        t = time.perf_counter()
        out = fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times), out


def exact_table(full: bool) -> None:
    inst = [
        ("grid 6x6", shuffled(nx.grid_2d_graph(6, 6), 1), 7, "Rolim-Sykora-Vrto"),
        ("grid 7x7", shuffled(nx.grid_2d_graph(7, 7), 2), 8, "Rolim-Sykora-Vrto"),
        ("grid 8x8", shuffled(nx.grid_2d_graph(8, 8), 3), 9, "Rolim-Sykora-Vrto"),
        ("Q_4", nx.hypercube_graph(4), 10, "Harper/Nakano"),
        ("Q_5", nx.hypercube_graph(5), 21, "Harper/Nakano"),
        ("bintree h=5", nx.balanced_tree(2, 5), 4, "Lengauer"),
        ("bintree h=6", nx.balanced_tree(2, 6), 4, "Lengauer"),
        ("K_9", nx.complete_graph(9), 20, "common practice"),
        ("triang n=30 #1", triangulation(30, 1), None, ""),
        ("triang n=30 #2", triangulation(30, 2), None, ""),
        ("cubic n=22", nx.random_regular_graph(3, 22, seed=1), None, ""),
    ]
    if full:
        inst += [
            ("grid 10x10", shuffled(nx.grid_2d_graph(10, 10), 4), 11, "Rolim-Sykora-Vrto"),
            ("bintree h=7", nx.balanced_tree(2, 7), 5, "Lengauer"),
            ("triang n=60", triangulation(60, 3), None, ""),
        ]
    py_limit = 60.0 if full else 15.0
    print("\nExact: compiled prefix-set search vs the same search in Python, and the subset DP")
    hdr = f"{'instance':16} {'n':>4} {'m':>4} {'known':>6} {'ours':>6} {'ours s':>8} {'python s':>9} {'ratio':>7} {'dp s':>7} {'dp/ours':>8}"
    print(hdr)
    print("-" * len(hdr))
    ratios = []
    for name, G, known, _src in inst:
        P = OrderingProblem.from_graph(G)
        solve_bnb(P)  # warm up the compiled kernel (its compile time is not the method's)
        t_ours, out = timed(lambda: solve_bnb(P), reps=3)
        assert out.optimal and (known is None or out.upper == known), (name, out)
        t_py, out_py = timed(lambda: solve_bnb(P, force_python=True, deadline=time.monotonic() + py_limit))
        py_cell = f"{t_py:9.2f}" if out_py.optimal else f">{py_limit:8.0f}"
        ratio = t_py / max(t_ours, 1e-6)
        ratios.append(ratio)
        dp_cell, dp_ratio = "-", "-"
        if dp_estimate(P)[0] <= 1 << 28:
            t_dp, (w, _, _) = timed(lambda: solve_dp(P))
            assert w == out.upper
            dp_cell, dp_ratio = f"{t_dp:7.2f}", f"{t_dp / max(t_ours, 1e-6):8.1f}"
        print(
            f"{name:16} {P.n:4d} {P.m:4d} {known if known is not None else '?':>6} {out.upper:6.0f} "
            f"{t_ours:8.3f} {py_cell} {('>' if not out_py.optimal else '') + format(ratio, '.1f'):>7} {dp_cell:>7} {dp_ratio:>8}"
        )
    print(f"median speed-up of the compiled search over Python: {statistics.median(ratios):.1f}x")


def bounds_table(full: bool) -> None:
    sizes = [30, 60, 100] if not full else [30, 60, 100, 150]
    print("\nBounds on large grids (optimum m + 1): portfolio + local search vs one BFS level ordering")
    hdr = f"{'instance':14} {'n':>6} {'opt':>5} {'lower':>6} {'upper':>6} {'gap %':>6} {'seconds':>8} {'BFS width':>10} {'BFS/ours':>9}"
    print(hdr)
    print("-" * len(hdr))
    for m in sizes:
        G = shuffled(nx.grid_2d_graph(m, m), m)
        t = time.perf_counter()
        r = sw.cutwidth(G, time_limit=30, seed=0)
        secs = time.perf_counter() - t
        r.check(G)
        P = OrderingProblem.from_graph(G)
        start = random.Random(m).randrange(P.n)
        base = P.width(level_ordering(P, start))
        gap = 100.0 * (r.upper - (m + 1)) / (m + 1)
        print(
            f"grid {m}x{m:<8} {P.n:6d} {m + 1:5d} {r.lower:6.0f} {r.upper:6.0f} {gap:6.1f} {secs:8.2f} "
            f"{base:10.0f} {base / r.upper:9.2f}"
        )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--full", action="store_true", help="larger instances and longer limits")
    args = ap.parse_args()
    exact_table(args.full)
    bounds_table(args.full)


if __name__ == "__main__":
    main()

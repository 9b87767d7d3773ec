"""Cutwidth upper bounds: the window search against the current engine, side by side.

Usage::

    python benchmarks/upper_bounds.py              # T = 20 s per call (about 10 minutes)
    python benchmarks/upper_bounds.py --full       # T = 60 s, plus larger trees and the 100 x 100 grid
    python benchmarks/upper_bounds.py --limit 5    # any other T

For every instance the baseline is ``sweepwidth.cutwidth(G, time_limit=T)`` (what
users get today; its lower bound is shown for context) and the new upper bound
is :func:`sweepwidth.solve.ordering.local_search.search_orderings` with the
same limit (for unit-weight trees :func:`~sweepwidth.solve.ordering.trees.tree_cutwidth`,
which stops when its bounds meet).  Both witnesses are recomputed by
``sweepwidth.verify.ordering_width``.  "ratio" is old upper / new upper.

Instances: duals of ``generators.weighted_delaunay_disk(n, seed=s)`` with the
outer face's dual vertex pinned first (their pinned cutwidth is the homology
sweep width of the disk from its boundary); networkx's ``les_miserables_graph()``
unweighted and weighted by its 'weight' attribute; the complete binary tree of
height 8 (cutwidth 5: ceil(h/2) + 1, Lengauer 1982, from memory); uniformly
random labelled trees (networkx); with ``--full`` the 100 x 100 grid (cutwidth
101 = m + 1, Rolim, Sykora and Vrto 1995, from memory).

Measured (default run, seed 0, 2 cores shared with other jobs; one run)::

    time limit 20 s per call
    instance                        n old lower old upper  old s new upper  new s  ratio  new lower / note
    ------------------------------------------------------------------------------------------------------
    disk-100-s1 dual              184        50        79   19.9        58   20.0   1.36  window 18, 31286 kicks
    disk-100-s2 dual              187        49        65   19.9        55   20.0   1.18  window 18, 25742 kicks
    disk-100-s3 dual              189        47        88   19.9        61   20.0   1.44  window 18, 21260 kicks
    disk-200-s1 dual              384        46       101   19.9        76   20.0   1.33  window 18, 13238 kicks
    disk-200-s2 dual              388        41       100   19.6        74   20.0   1.35  window 18, 14428 kicks
    disk-200-s3 dual              390        40        93   19.9        74   20.0   1.26  window 18, 17708 kicks
    disk-400-s1 dual              782        44       140   20.5       109   20.0   1.28  window 18, 11793 kicks
    disk-400-s2 dual              786        41       123   20.6        96   20.0   1.28  window 18, 15200 kicks
    disk-400-s3 dual              782        43       120   20.4       101   20.0   1.19  window 18, 15774 kicks
    les-miserables                 77        18        40   19.9        36   20.0   1.11  window 18, 14103 kicks
    les-miserables weighted        77        79       143   19.9       141   20.0   1.01  window 18, 8299 kicks
    binary-tree-h8                511         5         8    3.6         5    0.4   1.60  5 (optimal)
    random-tree-1000             1000         4         9    3.7         5   20.0   1.80  4
    random-tree-10000           10000         4        11   15.8         7   20.0   1.57  6

The old engine here splits its 20 s between bounds, heuristics and exact
search; the new column spends all of it on upper bounds (trees: until the
bounds meet), so the comparison is of the upper bound available after the
same wall time.
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

import networkx as nx

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import sweepwidth as sw  # noqa: E402
from sweepwidth import generators  # noqa: E402
from sweepwidth.problems.ordering import OrderingProblem  # noqa: E402
from sweepwidth.solve.ordering.local_search import search_orderings  # noqa: E402
from sweepwidth.solve.ordering.trees import tree_cutwidth  # noqa: E402
from sweepwidth.verify.ordering import ordering_width  # noqa: E402


def instances(full: bool):
    for n in (100, 200, 400):
        for s in (1, 2, 3):
            P = generators.weighted_delaunay_disk(n, seed=s)
            yield f"disk-{n}-s{s} dual", P.dual().to_simple_graph(), "weight", P.outer_face, False
    L = nx.les_miserables_graph()
    yield "les-miserables", L, None, None, False
    yield "les-miserables weighted", L, "weight", None, False
    yield "binary-tree-h8", nx.balanced_tree(2, 8), None, None, True
    for n in ((1000, 10000, 100000) if full else (1000, 10000)):
        yield f"random-tree-{n}", nx.random_labeled_tree(n, seed=1), None, None, True
    if full:
        G = nx.convert_node_labels_to_integers(nx.grid_2d_graph(100, 100), ordering="sorted")
        yield "grid-100x100", G, None, None, False


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--full", action="store_true", help="60 s per call and the larger instances")
    ap.add_argument("--limit", type=float, default=None, help="seconds per call (default 20, 60 with --full)")
    ap.add_argument("--seed", type=int, default=0)
    args = ap.parse_args()
    T = args.limit if args.limit is not None else (60.0 if args.full else 20.0)
    head = f"{'instance':26} {'n':>6} {'old lower':>9} {'old upper':>9} {'old s':>6} {'new upper':>9} {'new s':>6} {'ratio':>6}  new lower / note"
    print(f"time limit {T:g} s per call")
    print(head)
    print("-" * len(head))
    for name, G, weight, first, tree in instances(args.full):
        t0 = time.monotonic()
        r = sw.cutwidth(G, time_limit=T, weight=weight, first=first, seed=args.seed)
        t_old = time.monotonic() - t0
        old_up = ordering_width(G, r.witness, weight=weight, first=first)
        P = OrderingProblem.from_graph(G, weight=weight, first=first)
        t0 = time.monotonic()
        note = ""
        if tree:
            out = tree_cutwidth(P, t0 + T, seed=args.seed)
            new_up, order = out.upper, out.order
            note = f"{out.lower:g}" + (" (optimal)" if out.optimal else "")
        else:
            new_up, order, st = search_orderings(P, t0 + T, seed=args.seed, target=r.lower)
            note = f"window {st['window']}, {st['kicks']} kicks"
        t_new = time.monotonic() - t0
        check = ordering_width(G, [P.labels[v] for v in order], weight=weight, first=first)
        assert abs(check - new_up) <= 1e-9 * max(1.0, new_up), (name, check, new_up)
        ratio = old_up / new_up if new_up > 0 else float("nan")
        print(f"{name:26} {G.number_of_nodes():>6} {r.lower:>9g} {old_up:>9g} {t_old:>6.1f} {new_up:>9g} {t_new:>6.1f} {ratio:>6.2f}  {note}", flush=True)


if __name__ == "__main__":
    main()

"""Exact cutwidth of unit-weight trees against the bounds-and-search it replaced, in one run.

For each tree: the exact heights method (:func:`sweepwidth.solve.ordering.tree_heights.tree_cutwidth_exact`)
and, as the baseline, :func:`sweepwidth.solve.ordering.trees.tree_cutwidth` with ``exact=False`` (block
layouts, path and three-branch lower bounds, window search) under the same time limit.  Every ordering is
re-measured by the independent checker.  Usage: ``python benchmarks/trees.py [--time T]``.
"""

from __future__ import annotations

import argparse
import math
import time

import networkx as nx

from sweepwidth.problems.ordering import OrderingProblem
from sweepwidth.solve.ordering.tree_heights import tree_cutwidth_exact
from sweepwidth.solve.ordering.trees import tree_cutwidth
from sweepwidth.verify.ordering import ordering_width


def rows() -> list[tuple[str, nx.Graph]]:
    out = [(f"binary tree h={h}", nx.balanced_tree(2, h)) for h in (6, 8, 10)]
    out += [(f"random tree n={n} seed={s}", nx.random_labeled_tree(n, seed=s)) for n in (1000, 10000) for s in (0, 1, 2)]
    out += [("star 5000", nx.star_graph(5000))]
    return out


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--time", type=float, default=20.0, help="seconds per baseline call (default 20)")
    args = ap.parse_args()
    print(f"{'tree':<26} {'n':>6} {'exact':>5} {'s':>6}   {'baseline [lo, up]':>18} {'s':>6}")
    for name, T in rows():
        P = OrderingProblem.from_graph(T)
        t0 = time.monotonic()
        value, order = tree_cutwidth_exact(P, time.monotonic() + 600)
        t_exact = time.monotonic() - t0
        assert ordering_width(T, [P.labels[i] for i in order]) == value
        if name.startswith("binary"):
            h = int(name.split("=")[1])
            assert value == math.ceil(h / 2) + 1  # Lengauer 1982 (from memory)
        t0 = time.monotonic()
        base = tree_cutwidth(P, time.monotonic() + args.time, seed=0, exact=False)
        t_base = time.monotonic() - t0
        print(f"{name:<26} {P.n:>6} {value:>5} {t_exact:>6.2f}   {f'[{base.lower:g}, {base.upper:g}]':>18} {t_base:>6.2f}")


if __name__ == "__main__":
    main()

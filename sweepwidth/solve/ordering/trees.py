"""Cutwidth of unit-weight forests: fast constructive layouts, lower bounds, and search between them.

What is known
-------------
(:func:`tree_cutwidth` now first calls the exact method of
:mod:`.tree_heights`; the layouts and bounds below remain as its fallback for
pins and time-outs and as a fast baseline.)

The cutwidth of a tree with unit weights can be computed in polynomial time:
Yannakakis [1]_ gives an ``O(n log n)`` algorithm (Chung [2]_ an earlier one
for bounded degree).  With edge weights the problem is NP-hard already on
trees (Monien and Sudborough [3]_; stated from memory).  This module
gives

* :func:`block_layout` -- the best *subtree-contiguous* layout, exactly, in
  ``O(n log n)``: rooted at some vertex ``r``, every subtree (w.r.t. ``r``)
  occupies consecutive positions.  On every tree of at most 12 vertices this
  is optimal (checked against the subset DP in the tests), but not in
  general: complete binary trees of height ``h`` get ``h`` instead of
  ``ceil(h/2) + 1``, because their optimal layouts split subtrees around the
  vertices of a long path.
* :func:`branch_bound` -- a lower bound from the path argument below, and
  the three-branch bound of :func:`sweepwidth.solve.ordering.bounds.tree_bound`;
* :func:`tree_cutwidth` -- the exact method of :mod:`.tree_heights` when there
  are no pins (always ``optimal`` unless the deadline passes); otherwise (or
  with ``exact=False``) both bounds above, then the window search of
  :mod:`.local_search` from the block layout until the bounds meet or time is
  up, exact only when they meet.  Weighted forests are refused here and belong
  to the general methods.

Block layouts
-------------
For a vertex ``v`` whose parent lies to the right of ``v``'s block, let
``B(v)`` be the least width of a block layout of ``T_v`` plus its parent edge.
Children blocks go left or right of ``v``; a child block at left rank ``r``
(``r`` blocks further out) is crossed by ``r`` edges from ``v``, one at right
rank ``r`` by ``r`` edges and the parent edge.  Filling the cheapest slots
with the largest children first is optimal (pair the largest values with the
smallest additive costs), so with the children's values ``x_0 >= x_1 >= ...``::

    B(v) = max( (d + 2) // 2,  max_k x_k + (k + 1) // 2 ),   B(leaf) = 1

and at a root ``max(ceil(d / 2), max_k x_k + k // 2)``.  Re-rooting gives the
values of all roots in ``O(n log n)``.

The path bound
--------------
In a layout of width ``k`` with first vertex ``x`` and last ``y``, every gap is
crossed by an edge of the ``x``-``y`` path ``P``.  So for each ``p`` on ``P``
the tree ``H_p`` made of ``p`` and its branches that contain no edge of ``P``
has a layout (the restriction) of width at most ``k - 1``.  For a tree made of
a vertex ``p`` and branches whose cutwidths are at least ``x_1 >= x_2 >= ...``,
either ``p`` is on ``P`` (which enters at most two branches) or ``P`` runs
inside one branch (and the rest hangs on it); both leave at least the
branches other than the two largest in some ``H_q``, hence::

    F(X) = max( x_1, ceil(|X| / 2), 1 + F(X minus its two largest) )

is a lower bound (``F`` is monotone, which the argument needs); unrolled,
``F(X) = max(ceil(m/2), max_j j + x_{2j})`` (0-based, sorted decreasingly).
A branch at ``p`` through the edge ``pu`` is bounded by ``F`` of ``u``'s other
branches plus the single edge ``pu`` (value 1).  On every tree of at most 12
vertices this bound equals the cutwidth (tests), but it stays at 3 on complete
binary trees, where the three-branch bound is exact.

References
----------
.. [1] M. Yannakakis, "A polynomial algorithm for the min-cut linear
   arrangement of trees", Journal of the ACM 32(4), 1985.
.. [2] F. R. K. Chung, "On the cutwidth and the topological bandwidth of a
   tree", SIAM J. Algebraic Discrete Methods 6(2), 1985.
.. [3] B. Monien and I. H. Sudborough, "Min cut is NP-complete for edge
   weighted trees", Theoretical Computer Science 58, 1988 (from memory).
.. [4] J. A. Ellis, I. H. Sudborough and J. S. Turner, "The vertex
   separation and search number of a graph", Information and Computation
   113, 1994 (the path argument, there for vertex separation).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from ...errors import InvalidArgumentError, ProblemTooLargeError, SweepwidthError
from ...problems.ordering import OrderingProblem
from .tree_heights import _check_unit_forest
from .windows import OnImprove, pinned_order

__all__ = ["block_layout", "branch_bound", "tree_cutwidth", "TreeOutcome"]



def _bfs(adj: list[list[int]], n: int) -> tuple[list[list[int]], list[int]]:
    """Components as BFS orders, and the BFS parent of every vertex (-1 at roots)."""
    parent = [-1] * n
    seen = [False] * n
    comps = []
    for r in range(n):
        if seen[r]:
            continue
        seen[r] = True
        order = [r]
        for v in order:
            for u in adj[v]:
                if not seen[u]:
                    seen[u] = True
                    parent[u] = v
                    order.append(u)
        comps.append(order)
    return comps, parent


def _adjacency(problem: OrderingProblem) -> list[list[int]]:
    adj: list[list[int]] = [[] for _ in range(problem.n)]
    for u, v in problem.edges.tolist():
        adj[u].append(v)
        adj[v].append(u)
    return adj


def _block_values(adj: list[list[int]], comp: list[int], parent: list[int]) -> tuple[dict, dict]:
    """``val[(v, p)] = B(v)`` with parent ``p`` for every directed edge, and each root's value."""
    val: dict[tuple[int, int], int] = {}
    for v in reversed(comp):
        p = parent[v]
        if p < 0:
            continue
        xs = sorted((val[(c, v)] for c in adj[v] if c != p), reverse=True)
        b = (len(xs) + 2) // 2
        for k, x in enumerate(xs):
            b = max(b, x + (k + 1) // 2)
        val[(v, p)] = b
    root: dict[int, int] = {}
    for v in comp:
        nb = adj[v]
        d = len(nb)
        xs = [val[(u, v)] for u in nb]
        idx = sorted(range(d), key=lambda i: -xs[i])
        s = [xs[i] for i in idx]
        r = (d + 1) // 2
        for k in range(d):
            r = max(r, s[k] + k // 2)
        root[v] = r
        pre = [0] * (d + 1)
        for k in range(d):
            pre[k + 1] = max(pre[k], s[k] + (k + 1) // 2)
        suf = [0] * (d + 1)
        for k in range(d - 1, -1, -1):
            suf[k] = max(suf[k + 1], s[k] + k // 2)
        for i in range(d):
            u = nb[idx[i]]
            if u != parent[v]:
                val[(v, u)] = max((d + 1) // 2, pre[i], suf[i + 1])
    return val, root


def _emit(adj: list[list[int]], val: dict, r: int) -> list[int]:
    """The block layout rooted at ``r`` (children placed by the slot rule of the module notes)."""
    out: list[int] = []
    # stack items: (vertex, parent, mirrored) for a block, or (vertex, -2, False) for the vertex itself
    stack: list[tuple[int, int, bool]] = [(r, -1, False)]
    while stack:
        v, p, mir = stack.pop()
        if p == -2:
            out.append(v)
            continue
        kids = sorted((u for u in adj[v] if u != p), key=lambda u: -val[(u, v)])
        left: list[int] = []
        right: list[int] = []  # right[r] = rank r counted from the far end
        for k, u in enumerate(kids):
            if p < 0:
                (left if k % 2 == 0 else right).append(u)
            elif k == 0 or k % 2 == 1:
                left.append(u)
            else:
                right.append(u)
        items: list[tuple[int, int, bool]] = [(u, v, False) for u in left]
        items.append((v, -2, False))
        items += [(u, v, True) for u in reversed(right)]
        if mir:
            items = [(a, b, (not m) if b != -2 else m) for a, b, m in reversed(items)]
        stack.extend(reversed(items))
    return out


def block_layout(problem: OrderingProblem) -> tuple[float, list[int]]:
    """The best subtree-contiguous layout of a unit-weight forest (see the module notes).

    Components are laid out one after the other.  Pins are put in place
    afterwards (the width may then rise); the returned width is recomputed.

    Returns
    -------
    (width, order)

    Notes
    -----
    ``O(n log n)`` time (sorting at every vertex), ``O(n)`` memory.

    Examples
    --------
    >>> import networkx as nx
    >>> block_layout(OrderingProblem.from_graph(nx.star_graph(7)))[0]   # K_{1,7}: ceil(7/2)
    4.0
    >>> block_layout(OrderingProblem.from_graph(nx.path_graph(9)))[0]
    1.0
    """
    _check_unit_forest(problem, "block_layout")
    n = problem.n
    adj = _adjacency(problem)
    comps, parent = _bfs(adj, n)
    order: list[int] = []
    for comp in comps:
        if len(comp) == 1:
            order.append(comp[0])
            continue
        val, root = _block_values(adj, comp, parent)
        r = min(comp, key=lambda v: (root[v], v))
        order.extend(_emit(adj, val, r))
    order = pinned_order(problem, order)
    return problem.width(order), order


def _f(xs: list[int]) -> int:
    """``F`` of a decreasingly sorted list (module notes)."""
    m = len(xs)
    best = (m + 1) // 2
    for j in range(0, (m + 1) // 2):
        best = max(best, j + xs[2 * j])
    return best


def branch_bound(problem: OrderingProblem) -> float:
    """The path lower bound of the module notes for a unit-weight forest.

    Returns
    -------
    float
        A lower bound on the cutwidth (pinned or not: pins only raise it).

    Notes
    -----
    ``O(sum of deg^2)`` time with a shortcut above degree 64 (the largest
    branch is dropped instead of each one in turn, which only lowers ``F``).

    Examples
    --------
    >>> import networkx as nx
    >>> branch_bound(OrderingProblem.from_graph(nx.star_graph(9)))
    5.0
    """
    _check_unit_forest(problem, "branch_bound")
    n = problem.n
    if problem.m == 0:
        return 0.0
    adj = _adjacency(problem)
    comps, parent = _bfs(adj, n)
    best = 0
    for comp in comps:
        val: dict[tuple[int, int], int] = {}
        for v in reversed(comp):
            p = parent[v]
            if p < 0:
                continue
            xs = sorted([val[(c, v)] for c in adj[v] if c != p] + [1], reverse=True)
            val[(v, p)] = _f(xs)
        for v in comp:
            nb = adj[v]
            xs = [val[(u, v)] for u in nb]
            s = sorted(xs, reverse=True)
            best = max(best, _f(s))
            kids = [u for u in nb if u != parent[v]]
            if not kids:
                continue
            if len(nb) > 64:
                # dropping the largest branch gives the smallest value: sound for every child
                low = _f(sorted(s[1:] + [1], reverse=True))
                for u in kids:
                    val[(v, u)] = low
                continue
            for u in kids:
                ys = list(xs)
                ys.remove(val[(u, v)])
                ys.append(1)
                ys.sort(reverse=True)
                val[(v, u)] = _f(ys)
    return float(best)


@dataclass
class TreeOutcome:
    """Bounds and the best ordering of :func:`tree_cutwidth`."""

    lower: float
    upper: float
    order: list[int]
    optimal: bool
    stats: dict[str, Any] = field(default_factory=dict)


def tree_cutwidth(
    problem: OrderingProblem,
    deadline: float | None = None,
    *,
    seed: int | None = None,
    on_improve: OnImprove | None = None,
    exact: bool = True,
) -> TreeOutcome:
    """Cutwidth of a unit-weight forest: exact without pins, else bounds (module notes).

    Without pins (and ``exact=True``, the default) the exact method of
    :func:`.tree_heights.tree_cutwidth_exact` decides it, so ``optimal`` is
    True unless ``deadline`` passes first; then its proven lower bound joins
    the bounds below.  The rest of this docstring describes those bounds,
    which are also what ``exact=False`` and pinned problems get.

    Lower bound: the largest of :func:`branch_bound`, the three-branch bound
    and the degree bound ``ceil(max degree / 2)``.  Upper bound: the block
    layout, then the window search (:func:`.local_search.search_orderings`)
    from it until the bounds meet or ``deadline`` passes.  With pins the same
    bounds hold (pins only raise the cutwidth) and the search keeps them, but
    the block layout ignores them, so exact answers are rarer.

    Parameters
    ----------
    problem : OrderingProblem
        A forest with unit weights.
    deadline : float, optional
        ``time.monotonic()`` value; without one the search gets ``1 + n / 1000`` s.
    seed : int, optional
    on_improve : callable, optional
        ``on_improve(width, order)`` for the block layout and each later improvement.
    exact : bool, default True
        Try the exact method first (ignored with pins).

    Returns
    -------
    TreeOutcome
        ``optimal`` is True when ``lower == upper``.

    Raises
    ------
    SweepwidthError
        A cycle or a weight other than 1.

    Examples
    --------
    >>> import networkx as nx
    >>> out = tree_cutwidth(OrderingProblem.from_graph(nx.balanced_tree(2, 4)))
    >>> out.lower, out.upper, out.optimal
    (3.0, 3.0, True)
    """
    from .bounds import tree_bound
    from .local_search import search_orderings

    t0 = time.monotonic()
    _check_unit_forest(problem, "tree_cutwidth")
    stats: dict[str, Any] = {}
    if problem.m == 0:
        o = pinned_order(problem, list(range(problem.n)))
        return TreeOutcome(0.0, 0.0, o, True, {"trivial": True})
    proven = 0.0
    if exact and not problem.first and not problem.last:
        from .tree_heights import TreeDeadlineError, tree_cutwidth_exact

        try:
            k, order = tree_cutwidth_exact(problem, deadline)
        except (TreeDeadlineError, ProblemTooLargeError) as e:
            proven = float(getattr(e, "lower", 0))
            stats["exact_stopped"] = str(e)
        else:
            if on_improve is not None:
                on_improve(float(k), list(order))
            return TreeOutcome(float(k), float(k), order, True, {"method": "exact", "seconds": time.monotonic() - t0})
    deg = problem.degrees()
    lbs = {"degree": float(np.ceil(deg.max() / 2.0)), "branch": branch_bound(problem)}
    tb = tree_bound(problem, max_n=10**9)
    if tb is not None:
        lbs["three-branch"] = float(tb)
    if proven:
        lbs["exact-levels"] = proven
    lower = max(lbs.values())
    stats["lower_bounds"] = lbs
    width, order = block_layout(problem)
    stats["block_width"] = width
    stats["bounds_seconds"] = time.monotonic() - t0
    if on_improve is not None:
        on_improve(width, list(order))
    if width > lower:
        end = deadline if deadline is not None else time.monotonic() + 1.0 + problem.n / 1000.0
        if end > time.monotonic():
            w2, o2, st = search_orderings(problem, end, start_orders=[order], seed=seed, on_improve=on_improve, target=lower)
            stats["search"] = st
            if w2 < width:
                width, order = w2, o2
    stats["seconds"] = time.monotonic() - t0
    return TreeOutcome(lower, width, order, width <= lower, stats)

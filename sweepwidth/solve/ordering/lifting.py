"""Lower bounds for cutwidth from a smaller graph: lifting edge pairs off low-degree vertices.

Lifting
-------
*Lifting* (splitting off) an amount ``x`` from two edges ``uv`` and ``vw``
lowers both weights by ``x`` and adds ``x`` to the edge ``uw``.  Lifting
every edge at a vertex ``v`` in pairs, with amounts ``x_ij >= 0`` between
neighbours ``i`` and ``j`` and ``sum_j x_ij <= w(v i)``, and then deleting
``v`` together with what is left on its edges, never raises the cutwidth,
with or without pinned ends (``v`` unpinned): take any ordering and drop
``v`` from it.  At a gap of the ordering, the lifted weight crossing it is
``sum x_ij`` over the pairs whose ends lie on opposite sides; one end of each
such pair, ``i``, lies on the side away from ``v``, so the sum is at most
``sum over i away from v of sum_j x_ij <= w(v, side away from v)``, the
weight of ``v``'s edges that crossed the gap before.  Every other edge is
unchanged.  So the cutwidth of the lifted graph is a lower bound (weighted
cutwidth is closed under immersions; [1]_ for the unweighted statement,
[2]_ for its use in cutwidth algorithms).

The choice here: an independent set of unpinned vertices of degree at most
3 (so the lifts do not interact), each replaced by the pairing that keeps
the most of its cut function.  At a degree-3 vertex with weights ``a, b, c``
satisfying the triangle inequalities the pairing is ``(a + b - c) / 2`` etc.
(a star-to-triangle exchange): then every gap that separates one neighbour
from the other two keeps the least weight ``v`` can contribute there, so
the lifted graph loses only what a misplaced ``v`` would cost.  Otherwise
(one weight above the sum of the others) and at degree 2, the lighter edges
are lifted fully onto the heaviest; at degree 1 the vertex is deleted.

The bound is then the prefix-set search (:mod:`.bnb`) on the smaller graph:
with 30-45 % fewer vertices it settles several more thresholds in the same
time (``benchmarks/NOTES.md``, "lifted prefix sets").  Its settled threshold
is a proven lower bound of the lifted graph and so of the original one.

References
----------
.. [1] N. Robertson and P. D. Seymour, "Graph minors XXIII. Nash-Williams'
   immersion conjecture", J. Combin. Theory Ser. B 100(2), 2010
   (immersion order; cutwidth is closed under it).
.. [2] D. M. Thilikos, M. Serna and H. L. Bodlaender, "Cutwidth I: A linear
   time fixed parameter algorithm", J. Algorithms 56(1), 2005.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from ...problems.ordering import OrderingProblem
from .bnb import solve_bnb, states_for_memory

__all__ = ["lift_problem", "lifted_bound"]


def lift_problem(problem: OrderingProblem, *, max_share: float = 0.45) -> tuple[OrderingProblem, int]:
    """The problem with an independent set of unpinned vertices of degree <= 3 lifted away.

    Returns ``(lifted problem, number of vertices removed)``; the lifted
    problem's cutwidth (pins kept) is at most the original's (module
    docstring).  At most ``max_share`` of the vertices are removed, lightest
    weighted degree first.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(6))
    >>> Q, k = lift_problem(P, max_share=0.5)
    >>> k, Q.n, sorted(Q.weights.tolist())   # every other vertex lifted: a triangle
    (3, 3, [1.0, 1.0, 1.0])
    """
    n = problem.n
    nbrs = problem.neighbours()
    pinned = problem.first | problem.last
    deg = problem.degrees()
    cap = int(max_share * n)
    taken: list[int] = []
    blocked = np.zeros(n, dtype=bool)
    for v in sorted(range(n), key=lambda v: (len(nbrs[v]), deg[v], v)):
        if len(taken) >= cap:
            break
        if v in pinned or blocked[v] or not (1 <= len(nbrs[v]) <= 3):
            continue
        taken.append(v)
        blocked[v] = True
        for u in nbrs[v]:
            blocked[u] = True
    if not taken:
        return problem, 0
    gone = set(taken)
    acc: dict[tuple[int, int], float] = {}
    for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        if u in gone or v in gone:
            continue
        acc[(u, v)] = acc.get((u, v), 0.0) + w

    def add(x: int, y: int, w: float) -> None:
        if w > 0 and x != y:
            key = (x, y) if x < y else (y, x)
            acc[key] = acc.get(key, 0.0) + w

    for v in taken:
        items = sorted(nbrs[v].items(), key=lambda t: -t[1])
        if len(items) == 3 and items[0][1] <= items[1][1] + items[2][1]:
            (p, a), (q, b), (r, c) = items
            add(p, q, (a + b - c) / 2)
            add(p, r, (a + c - b) / 2)
            add(q, r, (b + c - a) / 2)
        elif len(items) >= 2:
            top = items[0][0]
            for u, w in items[1:]:
                add(top, u, w)
    keep = [v for v in range(n) if v not in gone]
    idx = {v: i for i, v in enumerate(keep)}
    keys = sorted(acc)
    edges = np.array([(idx[u], idx[v]) for u, v in keys], dtype=np.int64).reshape(-1, 2)
    wts = np.array([acc[k] for k in keys], dtype=np.float64)
    Q = OrderingProblem(
        labels=tuple(problem.labels[v] for v in keep),
        edges=edges,
        weights=wts,
        first=frozenset(idx[v] for v in problem.first),
        last=frozenset(idx[v] for v in problem.last),
    )
    return Q, len(taken)


def lifted_bound(
    problem: OrderingProblem,
    deadline: float | None,
    *,
    lower: float = 0.0,
    upper: float | None = None,
    max_states: int = 4_000_000,
    share: float = 0.45,
    max_memory: float | None = None,
) -> tuple[float, dict[str, Any]]:
    """A proven lower bound: the prefix-set search on :func:`lift_problem`'s smaller graph.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each.
    deadline : float, optional
        ``time.monotonic()`` value; the search returns its settled threshold there.
    lower : float
        A known lower bound of the original problem; the search starts there.
    upper : float, optional
        A known upper bound of the original: the result never exceeds it.
    max_states : int
        Cap of the search's table of failed sets (its memory, see :mod:`.bnb`).
    share : float
        Largest share of the vertices lifted away (:func:`lift_problem`).
    max_memory : float, optional
        Bytes the search's table may take: raises ``max_states`` to what fits
        (:func:`.bnb.states_for_memory`, for the lifted graph's size), never lowers it.

    Returns
    -------
    (bound, stats)
        ``bound >= lower``; rounded up to an integer when every weight of
        ``problem`` is one (then the cutwidth is an integer too).

    Examples
    --------
    >>> import networkx as nx, time
    >>> P = OrderingProblem.from_graph(nx.grid_2d_graph(6, 6))
    >>> lifted_bound(P, time.monotonic() + 5)[0] <= 7   # the 6 x 6 grid has cutwidth 7
    True
    """
    Q, k = lift_problem(problem, max_share=share)
    stats: dict[str, Any] = {"removed": k, "n": Q.n, "m": Q.m}
    if k == 0 or Q.m == 0:
        return float(lower), stats
    if max_memory is not None:
        max_states = max(int(max_states), states_for_memory(Q.n, max_memory))
    stats["max_states"] = int(max_states)
    # starting at the original's lower bound is sound: a threshold the search refutes is a
    # fact about the lifted graph alone, and an ordering found at the first threshold gives
    # no more than ``lower`` back
    out = solve_bnb(Q, lower=float(lower), deadline=deadline, max_states=max_states)
    stats["bnb"] = {key: out.stats.get(key) for key in ("expanded", "remembered", "stopped")}
    stats["optimal"] = out.optimal
    got = float(out.upper if out.optimal else out.lower)
    if problem.integral:
        got = float(math.ceil(got - 1e-9 * max(1.0, got)))
    stats["value"] = got
    if upper is not None:
        got = min(got, float(upper))
    return max(float(lower), got), stats

"""The neighbourhood split bound: the cheapest way to sit a vertex between its neighbours.

Statement
---------
Let ``v`` be a vertex and ``D = w(delta(v))``.  In any ordering let ``S`` be
the set of vertices placed before ``v`` and ``T = V - S - v`` the ones after.
The two cuts around ``v`` are

* ``cut(S)     = w_{G-v}(S, T) + w(v, S)``  (``v`` is still outside the prefix),
* ``cut(S + v) = w_{G-v}(S, T) + w(v, T)``,

so the width of the ordering is at least

    ``h(v) = min over S of  w_{G-v}(S, T) + max(w(v, S), w(v, T))``,

the minimum taken over all splits ``(S, T)`` of ``V - v`` (with pins:
``first`` inside ``S`` and ``last`` inside ``T`` when ``v`` is neither; a pinned
``v`` gives its whole boundary, the degree bound's pin rule).  Both cuts are
counted prefixes (``S`` contains the first pin and ``S + v`` avoids the last
one), so ``cw >= max_v h(v)``.  Since ``max(a, D - a) >= D / 2`` the bound is
never below the degree bound's ``D / 2``; it is larger when the neighbours of
``v`` cannot be split evenly without cutting edges among them (a hub whose
neighbours are tied to each other), which is what weighted social networks
look like (networkx's Les Miserables co-occurrence graph: ``D / 2 = 79`` for
its hub, ``h = 110``).

Computation
-----------
``h(v)`` is a small mixed-integer program: a binary ``x_u`` per vertex
``u != v`` (1 for ``S``), ``y_e >= |x_a - x_b|`` per edge away from ``v`` and
``z >= w(v, S)``, ``z >= w(v, T)``; minimise ``sum w_e y_e + z``.  It is
solved by HiGHS through :func:`scipy.optimize.milp` with a time limit; when
the limit cuts it short, the solver's proven dual bound is used, so the
returned value is a lower bound either way.  Without pins the complement
symmetry ``S <-> T`` is broken by fixing one vertex into ``S``.  Only
vertices whose boundary exceeds the bound known so far can raise it
(``h(v) <= D``), so they are tried heaviest first and the loop stops at the
first one that cannot.

The value is rounded down with a relative margin (the solver works in floating
point) and, for integral weights, to the integer at or above it.

References
----------
.. [1] F. R. K. Chung, "Labelings of graphs", in Selected Topics in Graph
   Theory 3, Academic Press 1988 (the degree lower bound ``D / 2`` on the
   cutwidth that the split bound strengthens).
.. [2] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised simplex
   method", Mathematical Programming Computation 10 (2018) (HiGHS, the
   solver behind :func:`scipy.optimize.milp`).
"""

from __future__ import annotations

import math
import time

import numpy as np

from ...problems.ordering import OrderingProblem

__all__ = ["split_value", "split_bound"]

_REL = 1e-6  # relative safety margin on the solver's floating-point value


def _safe(x: float, integral: bool, scale: float = 0.0) -> float:
    """``x`` lowered by a margin relative to ``|x|`` and the weight ``scale``, then rounded for integers."""
    if not math.isfinite(x) or x <= 0:
        return 0.0
    x = x - _REL * (1.0 + abs(x) + scale)
    if integral:
        return float(max(0, math.ceil(x)))
    return max(0.0, x)


def split_value(problem: OrderingProblem, v: int, time_limit: float = 10.0) -> tuple[float, bool]:
    """``h(v)``: the least width of the two cuts around ``v`` over all splits of the rest.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each (``contract_pins`` first).
    v : int
        The vertex.
    time_limit : float
        Seconds for the mixed-integer program; when it runs out the solver's
        proven dual bound is returned.

    Returns
    -------
    (value, exact)
        ``value`` is a proven lower bound of the cutwidth (rounded down safely);
        ``exact`` says the program was solved to optimality (then ``value`` is
        ``h(v)`` itself, up to the safety margin).

    Notes
    -----
    ``n - 1`` binary and ``m`` continuous variables, ``2m + 2`` constraints;
    exponential in the worst case, seconds on graphs of a few hundred vertices.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.wheel_graph(9))   # hub 0 on a cycle of 8
    >>> split_value(P, 0)      # 4 + 4 spokes, and the rim cut twice
    (6.0, True)
    """
    from scipy.optimize import Bounds, LinearConstraint, milp
    from scipy.sparse import coo_matrix

    n, m = problem.n, problem.m
    D = float(problem.degrees()[v]) if m else 0.0
    if n < 2 or m == 0 or (D <= 0 and not (problem.first and problem.last)):
        return 0.0, True  # S = everything (or nothing) cuts no edge
    if v in problem.first or v in problem.last:
        return D, True
    E = problem.edges
    W = problem.weights
    at = (E[:, 0] == v) | (E[:, 1] == v)
    # weights to v, per other vertex
    others = np.array([u for u in range(n) if u != v], dtype=np.int64)
    col = np.full(n, -1, dtype=np.int64)
    col[others] = np.arange(n - 1)
    c_v = np.zeros(n - 1)
    ends = np.where(E[at, 0] == v, E[at, 1], E[at, 0])
    np.add.at(c_v, col[ends], W[at])
    away = ~at
    Ea, Wa = E[away], W[away]
    k = Ea.shape[0]
    nx_ = n - 1
    nvar = nx_ + k + 1
    zc = nvar - 1
    a_, b_ = col[Ea[:, 0]], col[Ea[:, 1]]
    ye = nx_ + np.arange(k)
    # y_e - x_a + x_b >= 0 and y_e + x_a - x_b >= 0
    r1 = np.arange(k)
    r2 = k + np.arange(k)
    rows = [r1, r1, r1, r2, r2, r2]
    cols = [ye, a_, b_, ye, a_, b_]
    vals = [np.ones(k), -np.ones(k), np.ones(k), np.ones(k), np.ones(k), -np.ones(k)]
    # z - c.x >= 0 and z + c.x >= D
    nz = np.flatnonzero(c_v)
    for r, sign in ((2 * k, -1.0), (2 * k + 1, 1.0)):
        rows += [np.array([r]), np.full(nz.size, r)]
        cols += [np.array([zc]), nz]
        vals += [np.ones(1), sign * c_v[nz]]
    A = coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(2 * k + 2, nvar)).tocsr()
    lo = np.concatenate([np.zeros(2 * k), [0.0, D]])
    cost = np.zeros(nvar)
    cost[nx_ : nx_ + k] = Wa
    cost[zc] = 1.0
    integrality = np.zeros(nvar)
    integrality[:nx_] = 1
    lb = np.zeros(nvar)
    ub = np.ones(nvar)
    ub[zc] = math.inf
    for a in problem.first:
        lb[col[a]] = 1.0  # the first pin is before v
    for b in problem.last:
        ub[col[b]] = 0.0  # the last pin is after v
    if not problem.first and not problem.last:
        # S <-> T swaps the two cuts: fix the heaviest other vertex into S
        deg = problem.degrees()
        deg[v] = -1.0
        lb[col[int(np.argmax(deg))]] = 1.0
    res = milp(cost, constraints=LinearConstraint(A, lo, np.full(2 * k + 2, math.inf)), integrality=integrality,
               bounds=Bounds(lb, ub), options={"time_limit": max(0.01, float(time_limit)), "mip_rel_gap": 1e-9})
    exact = res.status == 0
    if exact and res.fun is not None:
        val = float(res.fun)
    else:
        db = getattr(res, "mip_dual_bound", None)
        val = float(db) if db is not None and math.isfinite(db) else 0.0
    # the solver's tolerances act on every constraint: the margin grows with the total weight
    half = D / 2.0
    safe = _safe(val, problem.integral, scale=float(W.sum()))
    return max(safe, float(math.ceil(half - 1e-9)) if problem.integral else half * (1 - _REL)), exact


def split_bound(problem: OrderingProblem, *, deadline: float | None = None, known: float = 0.0,
                max_vertices: int = 8, max_n: int = 2000, per_vertex: float = 5.0) -> tuple[float, dict]:
    """``max_v h(v)`` over the heaviest vertices that can raise ``known``.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each.
    deadline : float, optional
        ``time.monotonic()`` value; no program starts after it and each gets at
        most the time left.
    known : float
        A lower bound already proven; vertices with ``w(delta(v)) <= known``
        cannot raise it (``h(v) <= w(delta(v))``) and are skipped.
    max_vertices : int
        At most this many programs are solved.
    max_n : int
        Larger problems return ``(0, {...})`` at once (the programs grow with
        ``n + m``).
    per_vertex : float
        Seconds per program at most.

    Returns
    -------
    (bound, info)
        ``bound`` is a proven lower bound of the cutwidth (0 when nothing was
        tried); ``info`` has ``tried`` (vertices), ``exact`` (how many were
        solved to optimality), ``seconds``.

    Examples
    --------
    >>> import networkx as nx
    >>> split_bound(OrderingProblem.from_graph(nx.wheel_graph(9)))[0]
    6.0
    """
    t0 = time.monotonic()
    info: dict = {"tried": 0, "exact": 0}
    best = 0.0
    if problem.n < 3 or problem.m == 0 or problem.n > max_n:
        info["seconds"] = 0.0
        return 0.0, info
    deg = problem.degrees()
    for v in np.argsort(-deg, kind="stable")[:max_vertices].tolist():
        if float(deg[v]) <= max(known, best) + 1e-9:
            break
        left = per_vertex if deadline is None else min(per_vertex, deadline - time.monotonic())
        if left <= 0.05:
            break
        val, exact = split_value(problem, int(v), time_limit=left)
        info["tried"] += 1
        info["exact"] += int(exact)
        best = max(best, val)
    info["seconds"] = time.monotonic() - t0
    return best, info

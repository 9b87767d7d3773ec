"""Edge-isoperimetric level bounds solved as integer programs.

Statement
---------
Every ordering has a prefix of each counted size ``i``, so

    ``cw >= b(i) = min { w(delta(S)) : |S| = i, first <= S, S & last = {} }``

for each ``i`` from ``|first|`` to ``n - |last|`` (the edge-isoperimetric
bound of :func:`.bounds.isoperimetric_bound`, which enumerates subsets and so
stops at 20 vertices).  Here ``b(i)`` is a mixed-integer program (a binary per
vertex, ``y_e >= |x_a - x_b|`` per edge, ``sum x = i``) solved by HiGHS
(:func:`scipy.optimize.milp`); a time limit leaves the solver's proven dual
bound, still a lower bound of ``b(i)``.

On the hypercube ``Q_n`` Harper's edge-isoperimetric theorem makes the level
bound exact: the least boundary of ``k`` vertices is attained by the first
``k`` vertices in binary order, and ``cw(Q_n) = max_k b(k) = floor(2^(n+1) / 3)``
(42 for ``Q_6``, reached at ``k = 21``).  On other graphs it can be far below
the cutwidth (a graph with one heavy hub has small balanced cuts).

Which levels
------------
The levels where the best ordering known has its heaviest cuts are tried
first (without pins only ``i <= n / 2``: ``S`` and its complement have the same
boundary); the stage stops when the bound reaches the target, when the time is
spent, or after a few levels in a row solved exactly without raising it.

Symmetry
--------
Without a pinned first vertex, an automorphism (preserving the pins) maps any
feasible ``S`` to one of the same size and boundary, so ``S`` may be assumed to
meet the set of orbit representatives (orbits from
:mod:`.sat_encoding`, found with VF2; only automorphisms actually found are
used).  On a vertex-transitive graph this fixes one vertex ``r`` into ``S``,
and then, for the orbit ``O`` of a neighbour of ``r`` under the automorphisms
fixing ``r``, ``S`` may be assumed to contain the least vertex of ``O`` when it
meets ``O`` at all (map a vertex of ``S & O`` onto it, ``r`` staying put).

References
----------
.. [1] L. H. Harper, "Optimal assignments of numbers to vertices", J. SIAM
   12 (1964) (the edge-isoperimetric problem on the hypercube).
.. [2] Q. Huangfu and J. A. J. Hall, "Parallelizing the dual revised simplex
   method", Mathematical Programming Computation 10 (2018) (HiGHS).
.. [3] J. Crawford, M. Ginsberg, E. Luks and A. Roy, "Symmetry-breaking
   predicates for search problems", KR 1996 (why fixing orbit
   representatives is sound).
"""

from __future__ import annotations

import math
import time
from typing import Sequence

import numpy as np

from ...errors import InvalidArgumentError
from ...problems.ordering import OrderingProblem
from .split_bound import _safe

__all__ = ["level_value", "level_bound", "symmetry_rows"]


def symmetry_rows(problem: OrderingProblem, time_budget: float = 0.3) -> tuple[list[int], tuple[int, list[int]] | None]:
    """Orbit representatives, and on a vertex-transitive graph one stabiliser orbit.

    Returns ``(reps, extra)``: some vertex of ``reps`` may be assumed in ``S``
    (empty list: nothing to assume, e.g. with a pinned first vertex), and
    ``extra = (leader, orbit)`` says ``x_leader >= x_u`` for ``u`` in ``orbit``
    may be assumed as well (None when the graph has several orbits).

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(6))
    >>> reps, extra = symmetry_rows(P)
    >>> reps, extra
    ([0], (1, [5]))
    """
    from .sat_encoding import _orbits

    n = problem.n
    if problem.first or n < 2:
        return [], None
    t_end = time.monotonic() + time_budget
    cache: dict = {}
    rep = _orbits(problem, time_budget / 2, cache=cache)
    free = [v for v in range(n) if v not in problem.last]
    reps = sorted(set(rep[v] for v in free))
    if len(reps) >= len(free):
        return [], None
    if len(reps) != 1:
        return reps, None
    r = reps[0]
    left = t_end - time.monotonic()
    if left <= 0:
        return reps, None
    rep2 = _orbits(problem, left, fixed=(r,), cache=cache)
    nb = sorted(problem.neighbours()[r])
    if not nb:
        return reps, None
    lead = rep2[nb[0]]
    orbit = [u for u in range(n) if rep2[u] == lead and u != lead and u != r]
    return reps, ((lead, orbit) if orbit else None)


def _symmetry_child(problem: OrderingProblem, budget: float, *, progress=None):
    return symmetry_rows(problem, budget)


def _symmetry_limited(problem: OrderingProblem, budget: float) -> tuple[list[int], tuple[int, list[int]] | None] | None:
    """:func:`symmetry_rows` in a child process killed soon after ``budget`` seconds.

    One VF2 search for an automorphism can run far beyond any budget (its
    time is only checked between searches), so it never runs in this
    process.  Returns None when the child did not finish or could not start.
    """
    from .._deadline import run_limited

    try:
        finished, value, _ = run_limited(_symmetry_child, (problem, budget), {}, deadline=time.monotonic() + budget + 1.5)
    except (OSError, RuntimeError, AssertionError):
        return None  # e.g. inside a daemonic process: no symmetry, still a valid bound
    return value if finished else None


def level_value(problem: OrderingProblem, i: int, time_limit: float = 10.0,
                symmetry: tuple[list[int], tuple[int, list[int]] | None] | None = None) -> tuple[float, bool]:
    """``b(i)``: the least boundary of a counted prefix set of ``i`` vertices.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each.
    i : int
        Prefix size, ``|first| <= i <= n - |last|``.
    time_limit : float
        Seconds for the program; on time-out the proven dual bound is used.
    symmetry : optional
        The output of :func:`symmetry_rows` (computed by the caller once).

    Returns
    -------
    (value, exact)
        ``value`` a proven lower bound of the cutwidth (rounded down safely),
        ``exact`` when the program was solved to optimality.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.hypercube_graph(4))
    >>> level_value(P, 5)      # Harper: 5 vertices of Q_4 span at most 5 edges, so 20 - 10 leave
    (10.0, True)
    """
    from scipy.optimize import Bounds, LinearConstraint, milp
    from scipy.sparse import coo_matrix

    n, m = problem.n, problem.m
    f, l = len(problem.first), len(problem.last)
    if not (f <= i <= n - l):
        raise InvalidArgumentError(f"level {i} is not a counted prefix size ({f}..{n - l})")
    if m == 0 or n < 2:
        return 0.0, True
    E, W = problem.edges, problem.weights
    nvar = n + m
    r = np.arange(m)
    rows = [r, r, r, m + r, m + r, m + r, np.full(n, 2 * m)]
    cols = [n + r, E[:, 0], E[:, 1], n + r, E[:, 0], E[:, 1], np.arange(n)]
    vals = [np.ones(m), -np.ones(m), np.ones(m), np.ones(m), np.ones(m), -np.ones(m), np.ones(n)]
    lo = [np.zeros(2 * m), np.array([float(i)])]
    hi = [np.full(2 * m, math.inf), np.array([float(i)])]
    nrow = 2 * m + 1
    lb = np.zeros(nvar)
    ub = np.ones(nvar)
    for a in problem.first:
        lb[a] = 1.0
    for b in problem.last:
        ub[b] = 0.0
    if symmetry is not None and i >= 1:
        reps, extra = symmetry
        if len(reps) == 1:
            lb[reps[0]] = 1.0
        elif reps:
            rows.append(np.full(len(reps), nrow))
            cols.append(np.array(reps))
            vals.append(np.ones(len(reps)))
            lo.append(np.array([1.0]))
            hi.append(np.array([math.inf]))
            nrow += 1
        if extra is not None and len(reps) == 1:
            lead, orbit = extra
            k = len(orbit)
            rr = nrow + np.arange(k)
            rows += [rr, rr]
            cols += [np.full(k, lead), np.array(orbit)]
            vals += [np.ones(k), -np.ones(k)]
            lo.append(np.zeros(k))
            hi.append(np.full(k, math.inf))
            nrow += k
    A = coo_matrix((np.concatenate(vals), (np.concatenate(rows), np.concatenate(cols))), shape=(nrow, nvar)).tocsr()
    cost = np.concatenate([np.zeros(n), W])
    integrality = np.concatenate([np.ones(n), np.zeros(m)])
    res = milp(cost, constraints=LinearConstraint(A, np.concatenate(lo), np.concatenate(hi)), integrality=integrality,
               bounds=Bounds(lb, ub), options={"time_limit": max(0.01, float(time_limit)), "mip_rel_gap": 1e-9})
    exact = res.status == 0
    if exact and res.fun is not None:
        val = float(res.fun)
    elif res.status == 2:  # infeasible: no such set (cannot happen for a counted size), bound nothing
        return 0.0, False
    else:
        db = getattr(res, "mip_dual_bound", None)
        val = float(db) if db is not None and math.isfinite(db) else 0.0
    return _safe(val, problem.integral, scale=float(W.sum())), exact


def level_bound(problem: OrderingProblem, order: Sequence[int] | None = None, *, deadline: float | None = None,
                known: float = 0.0, target: float = math.inf, max_idle: int = 4, max_n: int = 400) -> tuple[float, dict]:
    """The largest ``b(i)`` over levels tried in order of the heaviest cuts of ``order``.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each.
    order : sequence of int, optional
        An ordering (pins at the ends); its cut profile ranks the levels.
        Without one, levels nearest ``n / 3`` and ``n / 2`` come first.
    deadline : float, optional
        ``time.monotonic()`` value; each program gets the time left.
    known : float
        A proven lower bound; levels that do not exceed it count as idle.
    target : float
        Stop once the bound reaches it (the width of the best ordering).
    max_idle : int
        Stop after this many levels in a row solved exactly without
        raising ``max(known, bound)``.
    max_n : int
        Larger problems return ``(0, ...)`` at once.

    Returns
    -------
    (bound, info)
        ``info``: ``levels`` (list of ``(i, value, exact, seconds)``),
        ``symmetry`` (whether orbit representatives were used: only with
        more than 5 s left, found in a child process), ``seconds``.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.hypercube_graph(4))
    >>> level_bound(P, target=10)[0]    # cw(Q_4) = floor(32 / 3) = 10 (Harper)
    10.0
    """
    t0 = time.monotonic()
    info: dict = {"levels": []}
    n = problem.n
    f, l = len(problem.first), len(problem.last)
    if n < 3 or problem.m == 0 or n > max_n:
        info["seconds"] = 0.0
        return 0.0, info
    lo, hi = f, n - l
    if not f and not l:
        hi = n // 2
    cand = list(range(max(lo, 1), hi + 1))
    if order is not None:
        prof = problem.cut_profile(list(order))
        def weight(i: int) -> float:
            return float(max(prof[i], prof[n - i])) if not f and not l else float(prof[i])
        cand.sort(key=lambda i: (-weight(i), i))
    else:
        cand.sort(key=lambda i: min(abs(i - n / 3), abs(i - n / 2)))
    left = (lambda: math.inf) if deadline is None else (lambda: deadline - time.monotonic())
    sym = _symmetry_limited(problem, min(1.0, 0.1 * left())) if left() > 5.0 else None
    info["symmetry"] = sym is not None
    best = 0.0
    idle = 0
    for i in cand:
        rest = left()
        if rest <= 0.1 or best >= target - 1e-9:
            break
        t = time.monotonic()
        val, exact = level_value(problem, i, time_limit=min(rest, 600.0), symmetry=sym)
        info["levels"].append((i, val, exact, round(time.monotonic() - t, 3)))
        if val > max(known, best) + 1e-9:
            idle = 0
        elif exact:
            idle += 1
        best = max(best, val)
        if idle >= max_idle:
            break
    info["seconds"] = time.monotonic() - t0
    return best, info

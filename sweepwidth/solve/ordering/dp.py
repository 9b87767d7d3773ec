"""Exact cutwidth by dynamic programming over vertex subsets.

For a set ``S`` of vertices let ``best(S)`` be the least width of an ordering
of ``S`` placed first (counting the cuts of its prefixes in the whole graph).
Then ``best(empty) = 0`` and::

    best(S) = max( w(delta(S)), min_{v in S} best(S - v) )

and the cutwidth is ``best(V)``.  A pinned first vertex ``a`` is put in every
set from the start; a pinned last vertex ``b`` is left out of every set.
Real (non-integer) weights are handled exactly as they are: the recurrence
only adds and compares them.
"""

from __future__ import annotations

from ...tables import size

import time
from typing import Any

import numpy as np

from ...errors import ProblemTooLargeError
from ...problems.ordering import OrderingProblem
from . import kernels as _kernels

__all__ = ["dp_estimate", "solve_dp", "DEFAULT_MAX_MEMORY"]

#: default memory limit of the subset DP, bytes
DEFAULT_MAX_MEMORY = 1 << 30


def _free(problem: OrderingProblem) -> list[int]:
    return [v for v in range(problem.n) if v not in problem.first and v not in problem.last]


def dp_estimate(problem: OrderingProblem) -> tuple[int, float]:
    """Estimated (bytes, seconds) of :func:`solve_dp` on ``problem``.

    Examples
    --------
    >>> import networkx as nx
    >>> dp_estimate(OrderingProblem.from_graph(nx.path_graph(12)))[0]
    65536
    """
    k = len(_free(problem))
    per = 16 if _kernels.HAVE_NUMBA else 48
    nbytes = per * (1 << k) if k < 62 else 1 << 62
    rate = 4e-9 if _kernels.HAVE_NUMBA else 1.5e-7
    seconds = (1 << min(k, 62)) * (k + 2) * rate
    return nbytes, seconds


def solve_dp(
    problem: OrderingProblem, *, max_memory: int = DEFAULT_MAX_MEMORY
) -> tuple[float, list[int], dict[str, Any]]:
    """Exact (pinned) cutwidth with its optimal ordering, by the subset recurrence.

    Parameters
    ----------
    problem : OrderingProblem
        At most one first and one last vertex (``contract_pins`` first).
    max_memory : int
        Refuse when the two tables would need more bytes than this.

    Returns
    -------
    (width, order, stats)

    Raises
    ------
    ProblemTooLargeError
        When the tables of ``16 * 2^k`` bytes (``k`` unpinned vertices) exceed
        ``max_memory``.

    Notes
    -----
    ``O(2^k k)`` time with numba (``O(2^k (k + m))`` vectorised numpy
    otherwise) and ``16 * 2^k`` bytes of tables (256 MiB at ``k = 24``).

    References
    ----------
    .. [1] Bodlaender, Fomin, Koster, Kratsch and Thilikos, "A note on exact
       algorithms for vertex ordering problems on graphs", Theory of Computing
       Systems 50 (2012).

    Examples
    --------
    >>> import networkx as nx
    >>> solve_dp(OrderingProblem.from_graph(nx.complete_graph(5)))[0]
    6.0
    """
    if len(problem.first) > 1 or len(problem.last) > 1:
        raise ValueError("solve_dp needs pinned sets of at most one vertex; call contract_pins() first")
    t0 = time.perf_counter()
    free = _free(problem)
    k = len(free)
    nbytes, _ = dp_estimate(problem)
    if nbytes > max_memory:
        raise ProblemTooLargeError(
            f"subset DP over {k} free vertices needs about {size(nbytes)}, "
            f"more than the limit of {size(max_memory)}; use method='sat' or 'bnb', "
            "or raise max_memory"
        )
    local = {v: i for i, v in enumerate(free)}
    a = next(iter(problem.first)) if problem.first else None
    b = next(iter(problem.last)) if problem.last else None
    deg_all = problem.degrees()
    deg = np.array([deg_all[v] for v in free], dtype=np.float64)
    base_in = np.zeros(k)
    rows: list[list[tuple[int, float]]] = [[] for _ in range(k)]
    for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist()):
        if u in local and v in local:
            rows[local[u]].append((local[v], w))
            rows[local[v]].append((local[u], w))
        elif u in local and v == a:
            base_in[local[u]] += w
        elif v in local and u == a:
            base_in[local[v]] += w
    indptr = np.zeros(k + 1, dtype=np.int64)
    for i, r in enumerate(rows):
        indptr[i + 1] = indptr[i] + len(r)
    indices = np.array([x for r in rows for x, _ in r], dtype=np.int64)
    wts = np.array([w for r in rows for _, w in r], dtype=np.float64)
    cut0 = float(deg_all[a]) if a is not None else 0.0
    cut, best = _kernels.subset_dp(k, indptr, indices, wts, deg, base_in, cut0)
    # walk back from the full set
    S = (1 << k) - 1
    rev: list[int] = []
    while S:
        target = best[S]
        T = S
        while T:
            bit = T & (-T)
            if best[S ^ bit] <= target:
                break
            T ^= bit
        v = bit.bit_length() - 1
        rev.append(free[v])
        S ^= bit
    order = ([a] if a is not None else []) + rev[::-1] + ([b] if b is not None else [])
    width = problem.width(order)
    stats = {"states": 1 << k, "free_vertices": k, "memory_bytes": nbytes, "dp_seconds": time.perf_counter() - t0}
    return width, order, stats

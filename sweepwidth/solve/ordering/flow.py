"""A concurrent-flow lower bound on (pinned, weighted) cutwidth.

Every prefix of a linear ordering is a vertex set ``S`` of some size ``k``,
and its cut carries every unit of flow that a routing sends between ``S`` and
the rest.  A routing with small congestion therefore forces a large cut at
the middle prefix.  The routing is built by multiplicative weights (each
source in turn along shortest paths for lengths that grow exponentially with
the load already placed on an edge), and only the routing's final loads enter
the bound, so the bound is proven whatever the heuristic does.
"""

from __future__ import annotations

import math
import time
from typing import Hashable, Iterable

import numpy as np

from ...problems.ordering import OrderingProblem
from . import kernels

__all__ = ["flow_bound"]


def _sound(x: float, integral: bool) -> float:
    """Round a computed bound down by a margin that covers float error.

    With integral weights every cut is an integer, so the integer at or above
    ``x`` (less a tolerance) is still a bound.
    """
    if not math.isfinite(x) or x <= 0:
        return 0.0
    if integral:
        return float(max(0, math.ceil(x - 1e-7 * (1.0 + x))))
    return x * (1.0 - 1e-9)


def _separated(u: int, mu: np.ndarray, kind: np.ndarray, lo: int, hi: int) -> float:
    """Least flow across the cut of some counted prefix, maximised over the prefix's size.

    ``mu[s]`` is how often terminal ``s`` was routed (one unit to every other
    terminal each time) and ``kind[s]`` is 0 (free), 1 (pinned first) or 2
    (pinned last), over the ``u`` terminals.  A counted prefix ``S`` holding
    ``j`` terminals contains the ``f`` terminals pinned first and ``j - f``
    free ones, and the units it separates are
    ``(u - j)(mu_F + X) + j (mu_L + mu_O - X)``, ``X`` the multiplicity of the
    free terminals inside.  The least value over ``S`` takes for ``X`` the
    ``j - f`` smallest free multiplicities when ``u >= 2j``, the largest
    otherwise.  Every ``j`` in ``lo..hi`` is met by a counted prefix, so the
    largest of these least values is forced.  ``O(u log u)``.
    """
    free = np.sort(mu[kind == 0])
    f = int(np.sum(kind == 1))
    mu_f = float(mu[kind == 1].sum())
    mu_l = float(mu[kind == 2].sum())
    mu_o = float(free.sum())
    small = np.concatenate([[0.0], np.cumsum(free)])
    large = np.concatenate([[0.0], np.cumsum(free[::-1])])
    j = np.arange(max(lo, f), min(hi, f + free.shape[0]) + 1)
    if j.shape[0] == 0:
        return 0.0
    t = j - f
    X = np.where(u >= 2 * j, small[t], large[t])
    return float(np.max((u - j) * (mu_f + X) + j * (mu_l + mu_o - X)))


def flow_bound(
    problem: OrderingProblem,
    deadline: float | None = None,
    *,
    seed: int = 0,
    alpha: float = 8.0,
    terminals: Iterable[Hashable] | None = None,
    target: float | None = None,
) -> float:
    """Concurrent multicommodity-flow lower bound on the cutwidth.

    Definition and argument: let every routed source ``s`` send one unit to
    each other vertex of its component, along one path per target, and let
    ``load(e)`` be the units crossing edge ``e``; put
    ``c = max_e load(e) / w(e)``.  For any vertex set ``S`` the units between
    ``S`` and its complement all cross ``delta(S)``, so
    ``w(delta(S)) >= (units separated by S) / c``.  A source routed ``mu_s``
    times inside a prefix ``S`` of size ``k`` sends ``mu_s (n - k)`` units
    across, one outside sends ``mu_s k``.  Every ordering has a counted prefix
    of every size ``k`` from ``|first|`` to ``n - |last|``; it contains the
    sources pinned first, avoids those pinned last, and the least separated
    amount over the ways the free sources can fall on the two sides is found
    by sorting their multiplicities (:func:`_separated`).  The cutwidth is at
    least the largest of these least amounts over ``k``, divided by ``c``.
    With one routing per vertex and no pins this is
    ``2 floor(n/2) ceil(n/2) / c``: the bisection bound of Leighton and Rao.
    The bound never exceeds the minimum bisection cut.

    A disconnected graph is bounded by its components (the restriction of an
    ordering to a component has no larger cuts, and keeps the pins inside
    it), each bounded separately; the largest counts.

    The routing is chosen by multiplicative weights: sources are taken in a
    random order, in repeated passes, each along a shortest-path tree for the
    lengths ``exp(alpha * load(e) / (w(e) C)) / w(e)``, ``C`` the current
    largest ratio (a sequential variant of the Garg-Koenemann scheme).  The
    bound is evaluated both on all routings so far and on the last complete
    pass alone (both are routings), and the better is kept.

    Parameters
    ----------
    problem : OrderingProblem
        Any weights (zero or negative ones are ignored, which only removes
        edges); pins of any size.  Pins strengthen the count of separated
        units for pinned sources (see above); the bound is valid for the
        unpinned problem too.
    deadline : float, optional
        ``time.monotonic()`` value.  Work proceeds in chunks of about 0.1 s
        and stops at the deadline with the best bound so far, or earlier
        once 100 passes are done and the last 30 gained under 0.2 %.  Without
        a deadline also at most 60 passes and ``2e9`` arc relaxations.
    seed : int
        Order of the sources.
    alpha : float
        Steepness of the lengths (a heuristic choice: no effect on soundness).
    terminals : iterable, optional
        Labels (entries of ``problem.labels``) of the vertices that send and
        receive flow; the argument above then runs with ``U`` the terminals
        and ``k = |S & U|`` (every value between ``|first & U|`` and
        ``|U - last|`` is met by a counted prefix).  By default all vertices,
        then the three densest k-cores (a k-core of a dense part makes the
        bound see that part alone), each in its share of the time.
    target : float, optional
        Stop as soon as the bound reaches this value (a known upper bound:
        more work cannot help then).

    Returns
    -------
    float
        Rounded down by a relative ``1e-9`` (and to the integer at or above,
        less a tolerance, for integral weights).

    Notes
    -----
    Each source costs one Dijkstra run, ``O(m log n)``, compiled with numba
    (a 100 x 100 grid: about 1 ms).  Loads are integers below ``2^53``, so
    they are exact.

    References
    ----------
    .. [1] Leighton and Rao, "Multicommodity max-flow min-cut theorems and
       their use in designing approximation algorithms", J. ACM 46 (1999).
    .. [2] Garg and Koenemann, "Faster and simpler algorithms for
       multicommodity flow and other fractional packing problems", SIAM J.
       Computing 37 (2007).

    Examples
    --------
    >>> import networkx as nx
    >>> flow_bound(OrderingProblem.from_graph(nx.cycle_graph(8)))
    2.0
    >>> flow_bound(OrderingProblem.from_graph(nx.complete_graph(6)))
    9.0
    """
    n = problem.n
    if n < 2 or problem.m == 0:
        return 0.0
    # Edges far lighter than the heaviest one are dropped as well: a subgraph's cutwidth is no
    # larger, so the bound stays sound, and the routing's load / weight ratios stay finite.
    top = float(problem.weights.max()) if problem.m else 0.0
    keep = problem.weights > top * 1e-12
    if not keep.all():
        problem = OrderingProblem(problem.labels, problem.edges[keep], problem.weights[keep], problem.first, problem.last)
        if problem.m == 0:
            return 0.0
    if terminals is not None:
        terminals = list(terminals)  # read once per component
    comps = [c for c in problem.components() if len(c) >= 2]
    comps.sort(key=len, reverse=True)
    best = 0.0
    for i, c in enumerate(comps):
        sub_deadline = deadline
        if deadline is not None:
            left = deadline - time.monotonic()
            if left <= 0:
                break
            rest = sum(len(x) for x in comps[i:])
            sub_deadline = time.monotonic() + left * len(c) / max(rest, 1)
        sub = problem if len(c) == n else problem.subproblem(c)
        best = max(best, _flow_component(sub, sub_deadline, seed, alpha, terminals, target))
        if target is not None and best >= target:
            break
    return best


def _terminal_sets(problem: OrderingProblem) -> list[np.ndarray]:
    """Terminal sets to try: all vertices, then up to three nested k-cores (densest last).

    Only a heuristic choice of demands; every set gives a valid bound.
    """
    import networkx as nx

    n = problem.n
    out = [np.ones(n, dtype=bool)]
    G = nx.Graph()
    G.add_nodes_from(range(n))
    G.add_edges_from(problem.edges.tolist())
    cn = nx.core_number(G)
    core = np.array([cn[v] for v in range(n)])
    levels = sorted(set(core.tolist()))[1:]
    for k in levels[-3:]:
        U = core >= k
        if 4 <= U.sum() < n:
            out.append(U)
    return out


def _flow_component(
    problem: OrderingProblem, deadline: float | None, seed: int, alpha: float, terminals: Iterable[Hashable] | None,
    target: float | None = None,
) -> float:
    if terminals is not None:
        U = np.zeros(problem.n, dtype=bool)
        idx = {lab: i for i, lab in enumerate(problem.labels)}
        for t in terminals:
            if t in idx:
                U[idx[t]] = True
        sets = [U]
    else:
        sets = _terminal_sets(problem)
    best = 0.0
    for i, U in enumerate(sets):
        d = deadline
        if deadline is not None:
            left = deadline - time.monotonic()
            if left <= 0:
                break
            # half the time for all vertices, the rest shared by the cores
            share = left if i == len(sets) - 1 else (0.5 * left if i == 0 else left / (len(sets) - i))
            d = time.monotonic() + share
        best = max(best, _flow_connected(problem, U, d, seed, alpha, target))
        if target is not None and best >= target:
            break
    return best


def _flow_connected(
    problem: OrderingProblem, U: np.ndarray, deadline: float | None, seed: int, alpha: float, target: float | None = None
) -> float:
    n, m = problem.n, problem.m
    if n < 2 or m == 0:
        return 0.0
    integral = problem.integral
    w = problem.weights.astype(np.float64)
    indptr, indices, eid = kernels.csr_with_ids(n, problem.edges)
    u = int(U.sum())
    if u < 2:
        return 0.0
    lo = sum(1 for v in problem.first if U[v])
    hi = u - sum(1 for v in problem.last if U[v])
    pi = U.astype(np.float64)
    srcs = np.flatnonzero(U).astype(np.int64)
    kind = np.zeros(n, dtype=np.int64)  # 0 free, 1 first, 2 last
    for v in problem.first:
        kind[v] = 1
    for v in problem.last:
        kind[v] = 2
    load = np.zeros(m)
    rng = np.random.default_rng(seed)
    scale = 0.0
    mu_total = np.zeros(n)
    best = 0.0
    history: list[float] = []
    work_cap = 2e9
    work = 0.0
    per_source: float | None = None  # measured seconds per source
    calls = 0
    passes = 0
    while True:
        order = rng.permutation(srcs)
        pass_load = np.zeros(m)
        mu_pass = np.zeros(n)
        pos = 0
        while pos < u:
            if deadline is not None and time.monotonic() >= deadline:
                break
            if per_source is None:
                chunk = 1
            else:
                chunk = int(max(1, min(u - pos, 0.1 / max(per_source, 1e-7))))
            part = order[pos : pos + chunk]
            t0 = time.monotonic()
            scale = kernels.route_sources(n, indptr, indices, eid, w, pi, load, pass_load, part, alpha, scale)
            dt = time.monotonic() - t0
            if calls == 0 and dt > 0.2:
                per_source = None  # the first call may have compiled the kernel: measure again
            else:
                per_source = max(dt / len(part), 1e-8)
            calls += 1
            mu_total[part] += 1.0
            mu_pass[part] += 1.0
            pos += len(part)
            work += len(part) * 2.0 * m
            c = float(np.max(load / w))
            if c > 0 and math.isfinite(c):  # 0 or inf only when weights underflow: no bound from this pass
                best = max(best, _separated(u, mu_total[srcs], kind[srcs], lo, hi) / c)
            if target is not None and _sound(best, integral) >= target:
                return _sound(best, integral)
        if pos >= u:
            passes += 1
            c = float(np.max(pass_load / w))
            if c > 0 and math.isfinite(c):  # 0 or inf only when weights underflow: no bound from this pass
                best = max(best, _separated(u, mu_pass[srcs], kind[srcs], lo, hi) / c)
        history.append(best)
        if deadline is not None and time.monotonic() >= deadline:
            break
        if len(history) > 100 and history[-1] <= history[-31] * 1.002:
            break  # stalled: under 0.2 % in thirty passes
        if deadline is None and (passes >= 60 or work >= work_cap):
            break
    return _sound(best, integral)

"""Upper bounds for cutwidth: constructive orderings and local improvement.

Every function returns orderings of ``0..n-1`` that respect the problem's
pinned ends (after :meth:`~sweepwidth.problems.OrderingProblem.contract_pins`
they have at most one vertex each).  Randomness comes only from the ``seed``.

Constructions
-------------
* level orderings: breadth-first search from pseudo-peripheral vertices,
  each level sorted by the number of earlier neighbours;
* two-source orderings: vertices sorted by ``d(p, v) - d(q, v)`` for well
  spread vertices ``p, q`` (ties by ``d(p, v)``), which sweeps a mesh with a
  straight front rather than a diagonal one;
* spectral orderings: vertices sorted by the Fiedler vector, or by mixtures of
  the two lowest non-trivial eigenvectors when the eigenvalue is (nearly)
  repeated, as on square grids;
* greedy growth: extend a prefix by the vertex whose addition gives the
  smallest cut, ties by a reference ordering.

Improvement: passes of best single-vertex moves (remove one vertex, insert it
at the position minimising width, then the number of gaps at that width, then
the total cut), with a compiled kernel (:mod:`sweepwidth.solve.ordering.kernels`).
"""

from __future__ import annotations

import heapq
import math
import time
from typing import Any, Callable

import numpy as np

from ...problems.ordering import OrderingProblem
from . import kernels as _kernels

__all__ = [
    "level_ordering",
    "two_source_ordering",
    "spectral_orderings",
    "greedy_ordering",
    "improve_ordering",
    "heuristic_ordering",
]


def _pin(problem: OrderingProblem, order: list[int]) -> list[int]:
    """Move the pinned first vertices to the front and the last ones to the end."""
    F, L = problem.first, problem.last
    if not F and not L:
        return list(order)
    mid = [v for v in order if v not in F and v not in L]
    return sorted(F) + mid + sorted(L)


def _bfs_dist(indptr: np.ndarray, indices: np.ndarray, n: int, sources: list[int]) -> np.ndarray:
    import scipy.sparse as sp
    from scipy.sparse.csgraph import shortest_path

    data = np.ones(indices.shape[0])
    A = sp.csr_matrix((data, indices, indptr), shape=(n, n))
    d = shortest_path(A, method="D", unweighted=True, indices=sources, directed=False)
    d = np.atleast_2d(d)
    return d


def level_ordering(problem: OrderingProblem, start: int) -> list[int]:
    """Breadth-first ordering from ``start``; inside a level, most earlier neighbours first.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.path_graph(5))
    >>> level_ordering(P, 0)
    [0, 1, 2, 3, 4]
    """
    n = problem.n
    indptr, indices, wts = problem.csr()
    seen = np.zeros(n, dtype=bool)
    order: list[int] = []
    back = np.zeros(n)
    for s in [start] + list(range(n)):
        if seen[s]:
            continue
        seen[s] = True
        level = [s]
        while level:
            # most weight towards earlier vertices first
            level.sort(key=lambda v: -back[v])
            nxt: list[int] = []
            for v in level:
                order.append(v)
                for j in range(indptr[v], indptr[v + 1]):
                    u = int(indices[j])
                    back[u] += wts[j]
                    if not seen[u]:
                        seen[u] = True
                        nxt.append(u)
            level = nxt
    return _pin(problem, order)


def _spread_points(problem: OrderingProblem, k: int, rng: np.random.Generator) -> list[int]:
    """``k`` vertices far apart: farthest-point traversal from a pseudo-peripheral vertex."""
    n = problem.n
    indptr, indices, _ = problem.csr()
    start = int(rng.integers(n))
    d = _bfs_dist(indptr, indices, n, [start])[0]
    d[~np.isfinite(d)] = -1
    pts = [int(np.argmax(d))]
    mind = _bfs_dist(indptr, indices, n, pts)[0]
    mind[~np.isfinite(mind)] = -1
    # the ends of the bisector {x : d(u, x) ~ d(v, x)} of a pseudo-diameter u, v
    # (on a grid: the two corners that the diameter misses, so that two-source
    # orderings between neighbouring corners sweep with a straight front)
    u = pts[0]
    du = mind.copy()
    v = int(np.argmax(du))
    dv = _bfs_dist(indptr, indices, n, [v])[0]
    dv[~np.isfinite(dv)] = -1
    if v == u:
        return pts
    pts.append(v)
    bis = np.nonzero((np.abs(du - dv) <= 1) & (du >= 0) & (dv >= 0))[0]
    if bis.shape[0] > 1:
        mid = int(bis[np.argmin(np.abs(du[bis] - du[bis].mean()))])
        dm = _bfs_dist(indptr, indices, n, [mid])[0]
        w1 = int(bis[np.argmax(np.where(np.isfinite(dm[bis]), dm[bis], -1))])
        d1 = _bfs_dist(indptr, indices, n, [w1])[0]
        w2 = int(bis[np.argmax(np.where(np.isfinite(d1[bis]), d1[bis], -1))])
        for w in (w1, w2):
            if w not in pts:
                pts.append(w)
    mind = np.minimum(mind, dv)
    for w in pts[2:]:
        dw = _bfs_dist(indptr, indices, n, [w])[0]
        dw[~np.isfinite(dw)] = -1
        mind = np.minimum(mind, dw)
    while len(pts) < min(k, n):
        nxt = int(np.argmax(mind))
        if mind[nxt] <= 0:
            break
        pts.append(nxt)
        dn = _bfs_dist(indptr, indices, n, [nxt])[0]
        dn[~np.isfinite(dn)] = -1
        mind = np.minimum(mind, dn)
    return pts


def two_source_ordering(problem: OrderingProblem, p: int, q: int) -> list[int]:
    """Vertices by ``d(p, v) - d(q, v)``, ties by ``d(p, v)`` then index.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.grid_2d_graph(3, 3))
    >>> P.width(two_source_ordering(P, 0, 2))  # corners (0,0) and (0,2)
    4.0
    """
    n = problem.n
    indptr, indices, _ = problem.csr()
    d = _bfs_dist(indptr, indices, n, [p, q])
    big = float(n + 1)
    dp = np.where(np.isfinite(d[0]), d[0], big)
    dq = np.where(np.isfinite(d[1]), d[1], big)
    order = np.lexsort((np.arange(n), dp, dp - dq)).tolist()
    return _pin(problem, order)


def spectral_orderings(problem: OrderingProblem, angles: int = 8) -> list[list[int]]:
    """Orderings by the Fiedler vector, and by mixtures with the next eigenvector.

    For ``n <= 300`` the dense eigensolver is used, above that sparse Lanczos.
    Returns an empty list when the eigensolver fails (the orderings are only a
    heuristic).

    References
    ----------
    .. [1] Juvan and Mohar, "Optimal linear labelings and eigenvalues of graphs",
       Discrete Applied Mathematics 36 (1992).
    """
    import scipy.sparse as sp

    n = problem.n
    if n < 3 or problem.m == 0:
        return []
    u, v = problem.edges[:, 0], problem.edges[:, 1]
    w = problem.weights
    A = sp.coo_matrix((np.concatenate([w, w]), (np.concatenate([u, v]), np.concatenate([v, u]))), shape=(n, n)).tocsr()
    L = (sp.diags(np.asarray(A.sum(axis=1)).ravel()) - A).astype(float)
    from .bounds import _factor_cheap

    try:
        if n <= 300 or (n <= 2500 and not _factor_cheap(problem)):
            vals, vecs = np.linalg.eigh(L.toarray())
            vals, vecs = vals[1:3], vecs[:, 1:3]
        elif not _factor_cheap(problem):
            return []
        else:
            from scipy.sparse.linalg import eigsh

            vals, vecs = eigsh(L.tocsc(), k=3, sigma=-1e-3, which="LM", tol=1e-8)
            idx = np.argsort(vals)
            vals, vecs = vals[idx][1:3], vecs[:, idx][:, 1:3]
    except Exception:
        return []
    out = []
    f = vecs[:, 0]
    out.append(np.lexsort((np.arange(n), vecs[:, 1], np.round(f, 9))).tolist())
    if vecs.shape[1] > 1 and vals[1] - vals[0] <= 0.05 * max(vals[1], 1e-12):
        for k in range(1, angles):
            t = math.pi * k / angles
            g = math.cos(t) * vecs[:, 0] + math.sin(t) * vecs[:, 1]
            h = -math.sin(t) * vecs[:, 0] + math.cos(t) * vecs[:, 1]
            out.append(np.lexsort((np.arange(n), h, np.round(g, 9))).tolist())
    return [_pin(problem, o) for o in out]


def greedy_ordering(problem: OrderingProblem, reference: list[int]) -> list[int]:
    """Grow a prefix by the vertex giving the smallest next cut; ties by ``reference``.

    Starts at the pinned first vertex, else at ``reference[0]``.  A vertex
    pinned last is added last.

    Notes
    -----
    ``O(m log n)`` with a heap of lazily updated cut increments.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(6))
    >>> P.width(greedy_ordering(P, list(range(6))))
    2.0
    """
    n = problem.n
    if n == 0:
        return []
    indptr, indices, wts = problem.csr()
    deg = problem.degrees()
    rank = np.empty(n, dtype=np.int64)
    rank[np.asarray(reference, dtype=np.int64)] = np.arange(n)
    inside = np.zeros(n)
    placed = np.zeros(n, dtype=bool)
    last = set(problem.last)
    heap: list[tuple[float, int, int]] = []
    for v in range(n):
        if v not in last:
            heap.append((float(deg[v]), int(rank[v]), v))
    heapq.heapify(heap)
    order: list[int] = []
    forced = sorted(problem.first)
    while len(order) < n - len(last):
        if forced:
            v = forced.pop()
        else:
            while True:
                key, _, v = heapq.heappop(heap)
                if not placed[v] and abs(key - (deg[v] - 2 * inside[v])) < 1e-9:
                    break
        if placed[v]:
            continue
        placed[v] = True
        order.append(v)
        for j in range(indptr[v], indptr[v + 1]):
            u = int(indices[j])
            inside[u] += wts[j]
            if not placed[u] and u not in last:
                heapq.heappush(heap, (float(deg[u] - 2 * inside[u]), int(rank[u]), u))
    order.extend(sorted(last))
    return order


def improve_ordering(
    problem: OrderingProblem,
    order: list[int],
    *,
    deadline: float | None = None,
    max_passes: int = 50,
    seed: int | None = None,
) -> list[int]:
    """Local search by single-vertex moves until no move helps or time is up.

    Each pass tries, for every movable vertex in a random order, all insertion
    positions (``O(n + deg v)`` per vertex with prefix and suffix maxima) and
    applies the best move when it lowers (width, gaps at the width, total cut)
    lexicographically.  Pinned vertices stay in place.

    Returns
    -------
    list of int
        An ordering whose width is at most that of ``order``.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(8))
    >>> P.width(improve_ordering(P, [0, 2, 4, 6, 1, 3, 5, 7], seed=1))
    2.0
    """
    n = problem.n
    if n < 3 or problem.m == 0:
        return list(order)
    rng = np.random.default_rng(seed)
    indptr, indices, wts = problem.csr()
    arr = np.asarray(order, dtype=np.int64).copy()
    nf, nl = len(problem.first), len(problem.last)
    tol = 1e-9 * max(1.0, float(problem.weights.max()))
    budget_vertices = max(1, int(3e6 // max(1, n)))  # keep one kernel call short (~0.1 s)
    for _ in range(max_passes):
        if deadline is not None and time.monotonic() > deadline:
            break
        cand = rng.permutation(n).astype(np.int64)
        moved = 0
        for start in range(0, n, budget_vertices):
            if deadline is not None and time.monotonic() > deadline:
                break
            moved += _kernels.move_pass(arr, indptr, indices, wts, nf, nl, cand[start : start + budget_vertices], tol)
        if moved == 0:
            break
    out = arr.tolist()
    return out if problem.width(out) <= problem.width(order) else list(order)


def heuristic_ordering(
    problem: OrderingProblem,
    *,
    seed: int | None = None,
    deadline: float | None = None,
    improve: bool = True,
    effort: int = 6,
    target: float | None = None,
) -> tuple[float, list[int], dict[str, Any]]:
    """The best ordering found by all constructions, then improved by local search.

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each.
    seed : int, optional
        Makes the result reproducible.
    deadline : float, optional
        ``time.monotonic()`` value; improvement stops there.
    improve : bool
        Run the local search on the best construction.
    effort : int
        Number of spread vertices used for level and two-source orderings.
    target : float, optional
        A proven lower bound: stop as soon as an ordering of this width is found.

    Returns
    -------
    (width, order, stats)
        ``stats['construction']`` names the winning construction.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.grid_2d_graph(6, 6))
    >>> heuristic_ordering(P, seed=0)[0]
    7.0
    """
    n = problem.n
    stats: dict[str, Any] = {}
    if n <= 1:
        return 0.0, list(range(n)), {"construction": "trivial"}
    rng = np.random.default_rng(seed)

    cands: list[tuple[str, list[int]]] = [("identity", _pin(problem, list(range(n))))]
    reached = [target is not None and problem.width(cands[0][1]) <= target + 1e-9]

    def add(name: str, order: list[int]) -> None:
        cands.append((name, order))
        if target is not None and not reached[0] and problem.width(order) <= target + 1e-9:
            reached[0] = True

    def late(margin: float = 0.0) -> bool:
        if reached[0]:
            return True
        return deadline is not None and time.monotonic() > deadline - margin

    pts: list[int] = []
    if problem.first:
        pts.append(next(iter(problem.first)))
    if problem.last:
        pts.append(next(iter(problem.last)))
    if not late():
        pts += [p for p in _spread_points(problem, effort, rng) if p not in pts]
    pairs = [(p, q) for i, p in enumerate(pts) for q in pts[i + 1 :]]
    if problem.first or problem.last:
        pairs = [pr for pr in pairs if not (pr[0] in problem.last or pr[1] in problem.first)]
        if problem.first and problem.last:
            pairs.insert(0, (next(iter(problem.first)), next(iter(problem.last))))
    for p, q in pairs[: 3 * effort]:
        if late():
            break
        add(f"two sources {p},{q}", two_source_ordering(problem, p, q))
        add(f"two sources {q},{p}", two_source_ordering(problem, q, p))
    for p in pts[: effort + 2]:
        if late():
            break
        add(f"levels from {p}", level_ordering(problem, p))
    if n <= 20000 and not late(margin=1.0 + n / 10000.0):
        for i, o in enumerate(spectral_orderings(problem)):
            add(f"spectral {i}", o)
    if not late():
        # beam search over prefix sets (strong on sparse planar duals), in part of the time left
        from .beam import beam_ordering

        share = 0.4 if n <= 1000 else 0.15  # on large graphs the local search below pays more
        beam_end = None if deadline is None else time.monotonic() + share * max(0.0, deadline - time.monotonic())
        out = beam_ordering(problem, deadline=beam_end, seed=int(rng.integers(2**31)), target=target)
        if out is not None:
            add("beam search", out[1])
            stats["beam"] = {"width": out[0], "runs": len(out[2]["runs"])}
    scored = sorted(((problem.width(o), i, name, o) for i, (name, o) in enumerate(cands)), key=lambda t: (t[0], t[1]))
    best_w, _, best_name, best = scored[0]
    # greedy growth with the best few constructions as tie-breakers
    for w0, _, name, o in scored[:3]:
        if late():
            break
        g = greedy_ordering(problem, o)
        wg = problem.width(g)
        if wg < best_w:
            best_w, best_name, best = wg, f"greedy after {name}", g
    stats["construction"] = best_name
    stats["constructions_tried"] = len(cands)
    stats["construction_width"] = best_w
    if improve and not reached[0]:
        imp = improve_ordering(problem, best, deadline=deadline, seed=int(rng.integers(2**31)))
        wi = problem.width(imp)
        if wi < best_w:
            best_w, best = wi, imp
            stats["improved"] = True
    return float(best_w), list(map(int, best)), stats

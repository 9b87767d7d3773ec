"""Proven lower bounds on the homotopy width.

Every leash of a sweep at state ``(i, j, L)`` is a walk from ``a_i`` to
``b_j``, so its length is at least the shortest-path distance
``d(a_i, b_j)`` in P (under the problem's length convention).  Along a
sweep the index pair ``(i, j)`` changes by one unit step at a time, starting
at ``(0, 0)`` and ending at ``(p, q)``.

* Forward steps only: the pairs visited contain a monotone lattice path with
  unit steps, so the width is at least the *geodesic discrete Fréchet
  distance* ``D(p, q)`` of the recurrence
  ``D(i, j) = max(d(a_i, b_j), min(D(i-1, j), D(i, j-1)))``.  This is the
  recurrence of Eiter and Mannila [1]_ with the graph distance as ground
  distance and without its diagonal term, because one end moves at a time
  (so it is at least their value).
* Backward steps allowed: the pairs visited contain a path of the grid
  graph on ``{0..p} x {0..q}`` (4-neighbours), so the width is at least the
  bottleneck value ``min over grid paths of max d(a_i, b_j)``, the discrete
  analogue of the weak Fréchet distance of Alt and Godau [2]_.

Both also include the lengths of the start and end leashes.

References
----------
.. [1] T. Eiter and H. Mannila, "Computing discrete Fréchet distance",
   Technical Report CD-TR 94/64, Technische Universität Wien, 1994.
.. [2] H. Alt and M. Godau, "Computing the Fréchet distance between two
   polygonal curves", Int. J. Computational Geometry & Applications 5, 1995.
.. [3] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1, 1959.
"""

from __future__ import annotations

import heapq
from typing import Any

__all__ = ["distances_from", "frechet_bound", "leash_distances"]


def distances_from(W: Any, source: int) -> tuple[list[float], list[int]]:
    """Dijkstra [3]_ from vertex index ``source`` with the problem's dart costs.

    Returns the distances (sum of dart costs; ``inf`` if unreachable) and the
    parent dart of each vertex (``-1`` at the source and unreachable ones).
    """
    P = W.graph
    n = P.number_of_vertices()
    cost, head = W.cost, W.head
    out = _out(W)
    dist = [float("inf")] * n
    par = [-1] * n
    dist[source] = 0.0
    heap = [(0.0, source)]
    while heap:
        dv, v = heapq.heappop(heap)
        if dv > dist[v]:
            continue
        for d in out[v]:
            u = head[d]
            nd = dv + cost[d]
            if nd < dist[u]:
                dist[u] = nd
                par[u] = d
                heapq.heappush(heap, (nd, u))
    return dist, par


def _out(W: Any) -> list[list[int]]:
    cached = getattr(W, "_out_cache", None)
    if cached is not None:
        return cached
    n = W.graph.number_of_vertices()
    out: list[list[int]] = [[] for _ in range(n)]
    for d, t in enumerate(W.tail):
        out[t].append(d)
    object.__setattr__(W, "_out_cache", out)
    return out


def leash_distances(W: Any) -> list[list[float]]:
    """``D[i][j]``: the least length of a walk from ``a_i`` to ``b_j`` (the length convention applied)."""
    extra = 1.0 if W.weight == "vertices" else 0.0
    rows: dict[int, list[float]] = {}
    D = []
    for a in W.a_vertices:
        if a not in rows:
            rows[a] = distances_from(W, a)[0]
        r = rows[a]
        D.append([r[b] + extra for b in W.b_vertices])
    return D


def frechet_bound(W: Any, D: list[list[float]] | None = None) -> tuple[float, list[tuple[int, int]]]:
    """The geodesic discrete Fréchet bound and a grid path attaining it.

    Forward-only problems: the monotone recurrence (see the module
    docstring); with ``W.backward``: the grid bottleneck path.  The value
    includes the start and end leash lengths.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(3, 3)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(2, 0), (2, 1), (2, 2)]})
    >>> frechet_bound(W)[0]
    3.0
    """
    if D is None:
        D = leash_distances(W)
    p, q = W.p, W.q
    base = max(W.length_of(W.start.darts), W.length_of(W.end.darts))
    if not W.backward:
        F = [[0.0] * (q + 1) for _ in range(p + 1)]
        for i in range(p + 1):
            for j in range(q + 1):
                if i == 0 and j == 0:
                    best = D[0][0]
                elif i == 0:
                    best = F[0][j - 1]
                elif j == 0:
                    best = F[i - 1][0]
                else:
                    best = min(F[i - 1][j], F[i][j - 1])
                F[i][j] = max(D[i][j], best)
        path = [(p, q)]
        i, j = p, q
        while (i, j) != (0, 0):
            if i == 0:
                j -= 1
            elif j == 0:
                i -= 1
            elif F[i - 1][j] <= F[i][j - 1]:
                i -= 1
            else:
                j -= 1
            path.append((i, j))
        path.reverse()
        return max(base, F[p][q]), path
    # bottleneck path in the grid graph
    dist: dict = {(0, 0): D[0][0]}
    par: dict = {(0, 0): None}
    heap = [(D[0][0], 0, 0)]
    done = set()
    while heap:
        f, i, j = heapq.heappop(heap)
        if (i, j) in done:
            continue
        done.add((i, j))
        if (i, j) == (p, q):
            break
        for x, y in ((i + 1, j), (i - 1, j), (i, j + 1), (i, j - 1)):
            if 0 <= x <= p and 0 <= y <= q and (x, y) not in done:
                g = max(f, D[x][y])
                if g < dist.get((x, y), float("inf")):
                    dist[(x, y)] = g
                    par[(x, y)] = (i, j)
                    heapq.heappush(heap, (g, x, y))
    path = []
    c: Any = (p, q)
    while c is not None:
        path.append(c)
        c = par[c]
    path.reverse()
    return max(base, dist[(p, q)]), path

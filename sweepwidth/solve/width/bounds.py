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

* Face passage (:func:`passage_bound`): every face that the sweep must
  flip is flipped by a leash that runs through it, so the width is at
  least ``max_f min`` over the ways a leash can meet ``f`` of the length of
  the leash before and after that flip (proved in the function's docstring).
  On disks where A and B are short arcs and the leash must cross a large
  interior, this is the strong bound: the Fréchet bounds only look at the
  ends.

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

import numpy as np

__all__ = ["StateBound", "distances_from", "frechet_bound", "leash_distances", "multi_source_distances", "odd_faces", "passage_bound"]


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


def multi_source_distances(W: Any, sources: Any) -> list[float]:
    """Dijkstra [3]_ from a set of vertex indices at once: ``dist[v] = min over sources s of d(s, v)``."""
    n = W.graph.number_of_vertices()
    cost, head = W.cost, W.head
    out = _out(W)
    dist = [float("inf")] * n
    heap = []
    for s in set(sources):
        dist[s] = 0.0
        heap.append((0.0, s))
    heapq.heapify(heap)
    while heap:
        dv, v = heapq.heappop(heap)
        if dv > dist[v]:
            continue
        for d in out[v]:
            u = head[d]
            nd = dv + cost[d]
            if nd < dist[u]:
                dist[u] = nd
                heapq.heappush(heap, (nd, u))
    return dist


def odd_faces(W: Any) -> list[list[int]] | None:
    """The possible sets of faces that a leash sweep flips an odd number of times.

    Write ``ell(i, j, L)`` for the closed walk ``A[0..i] . L . B[0..j]^-1 .
    L_start^-1``.  Mod 2 (as a set of edges) it is unchanged by spikes and
    unspikes (a dart and its reverse) and by endpoint steps (the joint dart
    is added or removed on both sides of the junction: ``A[0..i+1] .
    alpha^-1 . L`` equals ``A[0..i] . L`` mod 2), and a flip of face ``f``
    adds the boundary of ``f``.  It starts empty and ends as ``Z = A . L_end
    . B^-1 . L_start^-1``, so the faces flipped an odd number of times form
    a set X of non-hole faces whose mod-2 boundary is Z.  Two such sets
    differ by a set of faces with empty boundary, which in a connected plane
    graph is no face or every face.  So with a hole X is unique (found by a
    breadth-first search of the dual from a hole, choosing each side by the
    parity of Z on the edge crossed); without holes it is X or its
    complement, and both are returned.

    Returns
    -------
    list of face lists, or None
        None when no set has boundary Z (then no sweep exists).
    """
    P = W.graph
    m = P.number_of_edges()
    z = [0] * m
    loop = list(W.a.darts) + list(W.end.darts) + [d ^ 1 for d in reversed(W.b.darts)] \
        + [d ^ 1 for d in reversed(W.start.darts)]
    for d in loop:
        z[d >> 1] ^= 1
    holes = W.holes
    F = P.number_of_faces()
    df = [P.face_of_dart(d) for d in range(2 * m)]
    adj: list[list[tuple[int, int]]] = [[] for _ in range(F)]
    for e in range(m):
        f, g = df[2 * e], df[2 * e + 1]
        if f != g:
            adj[f].append((g, e))
            adj[g].append((f, e))
    side: list[int] = [-1] * F
    root = min(holes) if holes else 0
    side[root] = 0
    order = [root]
    for f in order:
        for g, e in adj[f]:
            if side[g] < 0:
                side[g] = side[f] ^ z[e]
                order.append(g)
    for e in range(m):
        f, g = df[2 * e], df[2 * e + 1]
        if side[f] < 0 or side[g] < 0 or (side[f] ^ side[g]) != z[e]:
            return None
    if any(side[h] for h in holes):
        return None
    X = [f for f in range(F) if side[f] == 1]
    if holes:
        return [X]
    return [X, [f for f in range(F) if side[f] == 0]]


def passage_bound(W: Any) -> tuple[float, int | None]:
    """The face-passage lower bound on the homotopy width and the face attaining it.

    Statement.  Let ``dA(v)`` and ``dB(v)`` be the distances from vertex v
    to the nearest vertex of A and of B, ``e`` the length convention's
    extra (1 for 'vertices', else 0), and for a face f with boundary walk
    of length ``|f|`` let ``g(f)`` be the least, over the runs R of the
    boundary walk of f (consecutive darts, in either direction, from vertex
    u to vertex v; 0 to ``|∂f|`` darts, so ``u = v`` is allowed), of
    ``dA(u) + max(|R|, |f| - |R|) + dB(v) + e``.  Then every leash sweep
    has width at least ``g(f)`` for every face f that it flips an odd number
    of times (:func:`odd_faces`), and so at least ``min over the possible
    odd sets of max over their faces of g(f)``.

    Proof.  Such a face is flipped at least once.  Take one flip of f at
    state ``(i, j, L)``.  A flip replaces a piece R of L (``take`` darts) by
    a walk Q with ``R . Q^-1`` the boundary walk of f up to rotation and
    orientation; so R is a run of f's boundary from some u to some v, and Q
    is the rest of it, from u to v the other way round, of length ``|f| -
    |R|``.  (With ``take = 0`` the piece is the vertex u = v at which the
    whole boundary is inserted.)  So ``L = L1 . R . L2`` before and ``L1 . Q
    . L2`` after, with L1 a walk from ``a_i`` to u and L2 from v to ``b_j``,
    hence ``|L1| >= dA(u)`` and ``|L2| >= dB(v)``, and both leashes belong
    to the sweep: its width is at least ``|L1| + max(|R|, |Q|) + |L2| + e
    >= g(f)``.  QED.

    Time: two runs of Dijkstra's algorithm [3]_ and ``O(sum |f|^2)``.

    Returns
    -------
    (bound, face)
        ``face`` is None when no face needs a flip (the bound is then 0).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(3, 3)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(2, 0), (2, 1), (2, 2)]})
    >>> passage_bound(W)[0]
    3.0
    """
    sets = odd_faces(W)
    if not sets:
        return 0.0, None
    runs = _face_runs(W)
    gv = runs.values(multi_source_distances(W, W.a_vertices), multi_source_distances(W, W.b_vertices))

    def g(f: int) -> float:
        return float(gv[f])

    out: tuple[float, int | None] | None = None
    for X in sets:
        if not X:
            return 0.0, None
        f = max(X, key=g)
        if out is None or g(f) < out[0]:
            out = (g(f), f)
    assert out is not None
    return out


class _FaceRuns:
    """Every run of every face boundary as flat arrays, for the passage values of all faces at once.

    A run from ``u`` to ``v`` with ``big = max(|R|, |f| - |R|)`` is stored in
    both directions (``dA(u) + dB(v)`` and ``dA(v) + dB(u)``); ``values``
    takes the least ``dA + dB + big`` per face (:func:`passage_bound`).
    Faces with more than ``RUN_LIMIT`` darts get the weaker value
    ``min dA + min dB + |f| / 2`` over their vertices (every run has
    ``big >= |f| / 2``), so memory stays linear; holes (never flipped) get 0.
    """

    RUN_LIMIT = 200

    def __init__(self, W: Any) -> None:
        P = W.graph
        cost, tail = W.cost, W.tail
        us: list[int] = []
        vs_: list[int] = []
        bigs: list[float] = []
        starts: list[int] = []
        self.large: list[tuple[int, list[int], float]] = []
        self.holes = sorted(W.holes)
        for f in range(P.number_of_faces()):
            starts.append(len(us))
            walk = list(P.face_darts(f))
            n = len(walk)
            vs = [tail[d] for d in walk]
            c = [cost[d] for d in walk]
            per = sum(c)
            if f in W.holes or n > self.RUN_LIMIT:
                us.append(0)
                vs_.append(0)
                bigs.append(0.0)
                if f not in W.holes:
                    self.large.append((f, sorted(set(vs)), per / 2))
                continue
            for s in range(n):
                run = 0.0
                for k in range(n + 1):
                    u, v = vs[s], vs[(s + k) % n]
                    big = max(run, per - run)
                    us += (u, v)
                    vs_ += (v, u)
                    bigs += (big, big)
                    if k < n:
                        run += c[(s + k) % n]
        self.u = np.asarray(us, dtype=np.int64)
        self.v = np.asarray(vs_, dtype=np.int64)
        self.big = np.asarray(bigs, dtype=float)
        self.starts = np.asarray(starts, dtype=np.int64)
        self.extra = 1.0 if W.weight == "vertices" else 0.0

    def values(self, dA: Any, dB: Any) -> Any:
        """``g(f)`` of every face (numpy array) for the distance lists ``dA`` and ``dB``."""
        a = np.asarray(dA, dtype=float)
        b = np.asarray(dB, dtype=float)
        g = np.minimum.reduceat(a[self.u] + b[self.v] + self.big, self.starts) + self.extra
        for f, verts, half in self.large:
            g[f] = a[verts].min() + b[verts].min() + half + self.extra
        if self.holes:
            g[self.holes] = 0.0
        return g


def _face_runs(W: Any) -> _FaceRuns:
    cached = getattr(W, "_runs_cache", None)
    if cached is None:
        cached = _FaceRuns(W)
        object.__setattr__(W, "_runs_cache", cached)
    return cached


class StateBound:
    """A lower bound on the rest of a leash sweep from a state, for the exact search's keys.

    Statement.  Let the sweep be at ``(i, j, L)`` having flipped the face set
    ``M`` an odd number of times so far.  Write ``A_i`` for the vertices
    ``a_i..a_p`` and ``B_j`` for ``b_j..b_q`` (forward steps only; with
    backward steps all of A and B), and ``g_ij(f)`` for the face-passage value
    of :func:`passage_bound` with ``dA``, ``dB`` the distances to ``A_i``
    and ``B_j``.  Then every continuation to the end state has width at
    least

        ``h(i, j, M) = max(D_ij, min over the odd sets X of max over f in X xor M of g_ij(f))``

    with ``D_ij`` the geodesic Fréchet value of the suffix pairs (the
    recurrence of :func:`frechet_bound` run backwards from ``(p, q)``; the
    grid bottleneck with backward steps).

    Proof.  The faces the continuation flips an odd number of times form a
    set Y with ``M xor Y`` one of the odd sets of the whole sweep
    (:func:`odd_faces`: the mod-2 class of ``ell`` depends only on the state,
    and each flip adds one face boundary), so ``Y = X xor M`` for some X.
    Each face of Y is flipped at a later state ``(i', j', L')`` with
    ``i' >= i`` and ``j' >= j`` when steps only go forward, so the proof of
    :func:`passage_bound` applies with ``dA``, ``dB`` measured to ``A_i`` and
    ``B_j``.  The later index pairs form a lattice path from ``(i, j)`` to
    ``(p, q)`` (any grid path with backward steps), and every leash is at
    least as long as the distance between its ends: ``D_ij``.  QED.

    The bound depends on ``(i, j, M)`` only; values are cached.  Because a
    flip can add a face back to the odd rest, ``h`` may rise along a move:
    the search (:func:`.exact.search_width`) uses it as an admissible key,
    for which the first end state settled is still optimal in bottleneck
    form (every settled key is at most the optimum).
    """

    #: cached values of ``h`` and per-index-pair face orders kept at most (cleared when full)
    CACHE_ENTRIES = 1 << 20
    ORDER_ENTRIES = 1 << 22

    def __init__(self, W: Any, D: list[list[float]] | None = None) -> None:
        self.W = W
        self.p, self.q = W.p, W.q
        sets = odd_faces(W)
        self.sets = [] if not sets else [sum(1 << f for f in X) for X in sets]
        self.runs = _face_runs(W)
        if D is None:
            D = leash_distances(W)
        self.suffix = _suffix_frechet(D, self.p, self.q, W.backward)
        self._dA: dict[int, Any] = {}
        self._dB: dict[int, Any] = {}
        self._order: dict[tuple[int, int], list[tuple[float, int]]] = {}
        self._cache: dict[tuple[int, int, int], float] = {}

    def _dist(self, side: str, k: int) -> Any:
        memo = self._dA if side == "a" else self._dB
        key = 0 if self.W.backward else k
        if key not in memo:
            verts = self.W.a_vertices if side == "a" else self.W.b_vertices
            memo[key] = multi_source_distances(self.W, verts[key:])
        return memo[key]

    def _faces(self, i: int, j: int) -> list[tuple[float, int]]:
        got = self._order.get((i, j))
        if got is None:
            g = self.runs.values(self._dist("a", i), self._dist("b", j))
            if (len(self._order) + 1) * len(g) > self.ORDER_ENTRIES:
                self._order.clear()  # bounded memory: recomputed when needed again
            idx = np.argsort(-g, kind="stable")
            got = [(float(g[f]), 1 << int(f)) for f in idx]
            self._order[(i, j)] = got
        return got

    def __call__(self, i: int, j: int, mask: int) -> float:
        """``h(i, j, mask)`` (see the class docstring); ``inf`` when no odd set is left."""
        key = (i, j, mask)
        v = self._cache.get(key)
        if v is not None:
            return v
        if not self.sets:
            v = float("inf")
        else:
            faces = self._faces(i, j)
            v = float("inf")
            for X in self.sets:
                rest = X ^ mask
                here = 0.0
                if rest:
                    for g, bit in faces:
                        if rest & bit:
                            here = g
                            break
                v = min(v, here)
            v = max(v, self.suffix[i][j])
        if len(self._cache) >= self.CACHE_ENTRIES:
            self._cache.clear()
        self._cache[key] = v
        return v


def _suffix_frechet(D: list[list[float]], p: int, q: int, backward: bool) -> list[list[float]]:
    """``S[i][j]``: the least over index paths from ``(i, j)`` to ``(p, q)`` of the largest ``D`` on them."""
    if not backward:
        S = [[0.0] * (q + 1) for _ in range(p + 1)]
        for i in range(p, -1, -1):
            for j in range(q, -1, -1):
                if i == p and j == q:
                    best = 0.0
                elif i == p:
                    best = S[i][j + 1]
                elif j == q:
                    best = S[i + 1][j]
                else:
                    best = min(S[i + 1][j], S[i][j + 1])
                S[i][j] = max(D[i][j], best)
        return S
    inf = float("inf")
    S = [[inf] * (q + 1) for _ in range(p + 1)]
    S[p][q] = D[p][q]
    heap = [(D[p][q], p, q)]
    while heap:
        f, i, j = heapq.heappop(heap)
        if f > S[i][j]:
            continue
        for x, y in ((i + 1, j), (i - 1, j), (i, j + 1), (i, j - 1)):
            if 0 <= x <= p and 0 <= y <= q:
                g = max(f, D[x][y])
                if g < S[x][y]:
                    S[x][y] = g
                    heapq.heappush(heap, (g, x, y))
    return S

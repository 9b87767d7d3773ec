"""Carving width of plane graphs by a ratcatcher game, and the cutwidth lower bound it gives.

Carving width.  A carving decomposition of a graph ``G`` (``n >= 2``
vertices, edge weights ``w >= 0``) is a tree of maximum degree 3 whose leaves
are the vertices; a tree edge splits the leaves into ``X, V - X`` and carries
the cut weight ``w(delta(X))``; the carving width is the least, over the
decompositions, of the largest carried weight.  Loops are never cut and
parallel edges only add up, so the problem's simple weighted graph has the
same carving width.  Every leaf edge carries a weighted degree, so carving
width ``>= max degree``.

The game (our formulation of the ratcatcher game of Seymour and Thomas [1]_,
played on a plane embedding of ``G``; ``k > max degree``, ``G`` connected):

* ``G*`` is the face graph (one node per face, one edge ``e*`` of length
  ``w(e)`` per edge ``e``, joining the faces on its two sides);
* the catcher stands on a face ``c``; an edge ``e`` is *noisy* at ``c`` when
  some closed walk of ``G*`` through ``c`` and ``e*`` is shorter than ``k``,
  and *noisy at the pair* ``c, c'`` when some closed walk through ``c``,
  ``c'`` and ``e*`` is shorter than ``k`` (every closed walk of ``G*`` is a
  cut of ``G``, so noise marks the edges of small cuts passing the catcher);
* the rat holds a component ``R`` of ``G`` minus the edges noisy at ``c``;
  the catcher announces a new face ``c'``; the rat may then take any
  component of ``G`` minus the edges noisy at ``c'`` that lies in the same
  component of ``G`` minus the edges noisy at the pair as ``R`` (it crosses
  no small cut through both positions);
* the rat is caught when it holds a single vertex ``u`` with ``c`` on the
  boundary of a face at ``u`` (the cut around ``u``, of weight ``deg(u) <
  k``, passes ``c``); the catcher chooses his first face, then the rat its
  first component.

Claim: carving width ``>= k`` exactly when the rat escapes forever.  This
is the min-max theorem of [1]_ (a carving of width ``< k`` walked down from
a tree edge gives the catcher a strategy; a rat strategy gives a tilt, the
obstruction to width ``< k``) for their version of the game; for the version
above we have not written the proof out, and its agreement with carving
width is checked against a brute force over all carving decompositions on
random plane multigraphs with weights (``tests/test_ratcatcher.py``), with no
disagreement found.  The results are therefore labelled by this module as
game values; every use as a *bound* in the library goes through that check.

Solving.  The catcher's winning positions are the least fixed point of one
step (retrograde analysis over the ``faces x components`` positions, each
step trying every face); it is polynomial: ``O(F^2 (n + m))`` per sweep of
the positions with ``F`` faces, at most ``F n`` sweeps, Gauss-Seidel order
(far fewer in practice).  Memory is the ``F x F`` face distances and the
``F x n`` component labels, estimated before anything is allocated.  The
carving width is then found by binary search on ``k`` (integer weights are
scaled to integers; otherwise the search stops at a relative gap of
``1e-9`` and reports the proven interval).

Disconnected graphs: the carving width is the largest over the components
(join the components' trees by an edge carrying 0).  The game is played on
each component with two or more vertices.

Cutwidth.  A linear layout ``v_1 .. v_n`` is a caterpillar carving: a path
of ``n - 2`` internal nodes, node ``i`` carrying the leaf ``v_{i+1}``, with
``v_1`` and ``v_n`` hung at the two ends.  Its spine edge between nodes
``i - 1`` and ``i`` carries the prefix cut of ``{v_1 .. v_i}`` and its leaf
edges carry the degrees (the leaf edges of ``v_1`` and ``v_n`` are also the
prefix cuts of sizes 1 and ``n - 1``).  So carving width ``<= max(cutwidth,
max degree)``, and ``cutwidth >= carving width`` whenever the carving width
exceeds the largest degree.  With pinned ends (after
:meth:`OrderingProblem.contract_pins`, at most one vertex ``a`` first and
one ``b`` last): the counted prefixes of a pinned layout are those of sizes
``1 .. n - 1`` (the pinned sets are single vertices), which include
``delta(a) = delta({v_1})`` and ``delta(b) = delta(V - {v_n})``; so the
caterpillar's every edge carries a counted prefix except the leaf edges of
the unpinned vertices, and pinned cutwidth ``>= carving width`` of the
contracted graph whenever that exceeds the largest degree of an unpinned
vertex (:func:`ratcatcher_bound`).  Contracting a pinned set keeps a plane
graph plane, but the embedding is then recomputed (networkx
``check_planarity``).  A stronger form (splitting heavy vertices) is not
used: we have no proof for it.

References
----------
.. [1] P. D. Seymour and R. Thomas, "Call routing and the ratcatcher",
   Combinatorica 14(2):217-241, 1994.
.. [2] Q.-P. Gu and H. Tamaki, "Optimal branch-decomposition of planar graphs
   in O(n^3) time", ACM Transactions on Algorithms 4(3):30, 2008 (the
   faster construction; not used here, the game is solved directly).
"""

from __future__ import annotations

import math
import time
from typing import Any

import numpy as np
import scipy.sparse
import scipy.sparse.csgraph

from ...errors import ProblemTooLargeError
from ...problems.ordering import OrderingProblem
from .carving import _rotation

__all__ = ["carving_width_game", "rat_escapes", "ratcatcher_bound", "ratcatcher_method"]

DEFAULT_MAX_MEMORY = 1 << 29


class _Board:
    """A connected plane graph prepared for the game: faces, dual distances, edge sides."""

    def __init__(self, problem: OrderingProblem, planar_embedding: Any, max_memory: int) -> None:
        n, m = problem.n, problem.m
        nf_est = max(1, m - n + 2)
        need = 8 * nf_est * nf_est + 8 * nf_est * n * 3 + 64 * m
        if need > max_memory:
            raise ProblemTooLargeError(
                f"the ratcatcher game on {n} vertices and {nf_est} faces needs about {need} bytes, "
                f"more than max_memory={max_memory}"
            )
        rot = _rotation(problem, planar_embedding)
        where = [{u: k for k, u in enumerate(rot[v])} for v in range(n)]
        face: dict[tuple[int, int], int] = {}
        nf = 0
        for v in range(n):
            for u in rot[v]:
                if (v, u) in face:
                    continue
                a, b = v, u
                while (a, b) not in face:
                    face[(a, b)] = nf
                    k = (where[b][a] + 1) % len(rot[b])
                    a, b = b, rot[b][k]
                nf += 1
        self.n, self.m, self.nf = n, m, nf
        self.eu = problem.edges[:, 0].astype(np.int64)
        self.ev = problem.edges[:, 1].astype(np.int64)
        self.w = problem.weights.astype(np.float64)
        self.fa = np.array([face[(int(u), int(v))] for u, v in zip(self.eu, self.ev)], dtype=np.int64)
        self.fb = np.array([face[(int(v), int(u))] for u, v in zip(self.eu, self.ev)], dtype=np.int64)
        # faces at each vertex
        self.faces_at = [sorted({face[(v, u)] for u in rot[v]}) for v in range(n)]
        # dual distances (parallel dual edges: the shortest one; a loop never shortens a path)
        keep = self.fa != self.fb
        if np.any(keep):
            a, b, ln = self.fa[keep], self.fb[keep], self.w[keep]
            key = np.minimum(a, b) * nf + np.maximum(a, b)
            o = np.lexsort((ln, key))
            key, ln = key[o], ln[o]
            first = np.ones(key.shape[0], dtype=bool)
            first[1:] = key[1:] != key[:-1]
            key, ln = key[first], ln[first]
            # the problem's weights are all > 0, so no entry of the sparse matrix vanishes
            mat = scipy.sparse.csr_matrix((ln, (key // nf, key % nf)), shape=(nf, nf))
            D = scipy.sparse.csgraph.dijkstra(mat, directed=False)
        else:
            D = np.zeros((nf, nf))
        self.D = D


def _components(n: int, eu: np.ndarray, ev: np.ndarray, keep: np.ndarray) -> np.ndarray:
    """Component labels 0..r-1 of the graph on n vertices with the kept edges."""
    if not np.any(keep):
        return np.arange(n, dtype=np.int64)
    mat = scipy.sparse.coo_matrix((np.ones(int(keep.sum())), (eu[keep], ev[keep])), shape=(n, n))
    _, lab = scipy.sparse.csgraph.connected_components(mat, directed=False)
    return lab.astype(np.int64)


def _catcher_wins(B: _Board, k: float, deadline: float | None) -> bool | None:
    """True when the catcher wins the game with parameter ``k`` (None: deadline passed)."""
    n, nf, D = B.n, B.nf, B.D
    fa, fb, w = B.fa, B.fb, B.w
    slack = 1e-12 * (1.0 + abs(k))
    # noise and components per catcher face
    lab = np.empty((nf, n), dtype=np.int64)
    ncomp = np.empty(nf, dtype=np.int64)
    for c in range(nf):
        noisy = D[c, fa] + w + D[c, fb] < k - slack
        lab[c] = _components(n, B.eu, B.ev, ~noisy)
        ncomp[c] = int(lab[c].max()) + 1
    win = [np.zeros(int(ncomp[c]), dtype=bool) for c in range(nf)]
    # caught positions: a single vertex u, c a face at u
    for c in range(nf):
        sizes = np.bincount(lab[c], minlength=int(ncomp[c]))
        for u in range(n):
            if sizes[lab[c, u]] == 1 and c in B.faces_at[u]:
                win[c][lab[c, u]] = True
    allwin = np.array([bool(win[c].all()) for c in range(nf)])
    if allwin.any():
        return True
    changed = True
    while changed:
        changed = False
        for c in range(nf):
            if deadline is not None and time.monotonic() > deadline:
                return None
            if win[c].all():
                continue
            for c2 in range(nf):
                if c2 == c:
                    continue
                if 2 * D[c, c2] >= k - slack:
                    # no closed walk through both is short: the rat may take any component at c2
                    if allwin[c2]:
                        win[c][:] = True
                        break
                    continue
                pair = np.minimum(D[c, fa] + w + D[c2, fb], D[c, fb] + w + D[c2, fa]) + D[c, c2] < k - slack
                plab = _components(n, B.eu, B.ev, ~pair)
                # a pair component is good when every c2 component inside it is winning
                bad = np.zeros(int(plab.max()) + 1, dtype=bool)
                bad[plab[~win[c2][lab[c2]]]] = True
                good_here = ~bad[plab]  # per vertex
                new = np.zeros(int(ncomp[c]), dtype=bool)
                new[lab[c][good_here]] = True
                add = new & ~win[c]
                if add.any():
                    win[c] |= add
                    changed = True
                    if win[c].all():
                        break
            if win[c].all() and not allwin[c]:
                allwin[c] = True
                return True
    return False


def rat_escapes(
    problem: OrderingProblem,
    k: float,
    *,
    planar_embedding: Any = None,
    deadline: float | None = None,
    max_memory: int = DEFAULT_MAX_MEMORY,
) -> bool | None:
    """Whether the game (module notes) says carving width ``>= k``; None when the deadline passes.

    ``k <= max degree`` is answered True without a game (a leaf edge carries the degree).
    The problem's pins are ignored.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.complete_graph(4))
    >>> rat_escapes(P, 4), rat_escapes(P, 5)      # carving width of K_4 is 4
    (True, False)
    """
    if problem.n <= 1 or problem.m == 0:
        return k <= 0
    if k <= float(problem.degrees().max()):
        return True
    for comp in problem.components():
        if len(comp) < 2:
            continue
        Q = problem.subproblem(comp) if len(comp) < problem.n else problem
        B = _Board(Q, planar_embedding, max_memory)
        res = _catcher_wins(B, float(k), deadline)
        if res is None:
            return None
        if not res:
            return True
    return False


def carving_width_game(
    problem: OrderingProblem,
    *,
    planar_embedding: Any = None,
    deadline: float | None = None,
    max_memory: int = DEFAULT_MAX_MEMORY,
) -> tuple[float, float]:
    """Carving width by binary search on the game: ``(lower, upper)``, equal when solved.

    ``lower`` is the largest ``k`` the rat was seen to escape at (at least the
    largest weighted degree), ``upper`` the least value the catcher was seen to
    win above (``inf`` if none finished).  With integer weights (after
    :meth:`OrderingProblem.integer_scale`) the search runs over integers and
    ends with ``lower == upper``; otherwise it stops at a relative gap of 1e-9.
    The problem's pins are ignored (see :func:`ratcatcher_bound` for cutwidth).

    Raises
    ------
    ProblemTooLargeError
        When the estimated memory of the game exceeds ``max_memory``.

    Examples
    --------
    >>> import networkx as nx
    >>> carving_width_game(OrderingProblem.from_graph(nx.grid_2d_graph(3, 3)))   # as a brute force finds
    (4.0, 4.0)
    """
    if problem.n <= 1 or problem.m == 0:
        return 0.0, 0.0
    deg = float(problem.degrees().max())
    scale = problem.integer_scale()
    total = float(problem.weights.sum())
    lo, hi = deg, total  # rat escapes at lo (a leaf edge); carving width <= total weight
    if scale is not None:
        # integers: carving width = largest integer K with rat_escapes(K); search K in [lo, hi]
        a, b = int(round(lo * scale)), int(round(hi * scale))
        while a < b:
            kk = (a + b + 1) // 2
            res = rat_escapes(problem, kk / scale, planar_embedding=planar_embedding, deadline=deadline,
                              max_memory=max_memory)
            if res is None:
                return a / scale, b / scale
            if res:
                a = kk
            else:
                b = kk - 1
        return a / scale, a / scale
    while hi - lo > 1e-9 * max(1.0, hi):
        mid = 0.5 * (lo + hi)
        res = rat_escapes(problem, mid, planar_embedding=planar_embedding, deadline=deadline, max_memory=max_memory)
        if res is None:
            break
        if res:
            lo = mid
        else:
            hi = mid
    return lo, hi


def ratcatcher_bound(
    problem: OrderingProblem,
    deadline: float | None = None,
    *,
    planar_embedding: Any = None,
    max_memory: int = DEFAULT_MAX_MEMORY,
) -> float:
    """Lower bound on the (pinned) cutwidth from the carving width (module notes, "Cutwidth").

    The carving width ``c`` of the pin-contracted graph bounds the pinned
    cutwidth from below when ``c`` exceeds the largest degree of an unpinned
    vertex; otherwise the bound is that of the pinned vertices' own cuts
    (which every pinned layout counts).  The embedding is used only when no
    pinned set had to be contracted; a non-planar graph gives 0.

    Examples
    --------
    >>> import networkx as nx
    >>> ratcatcher_bound(OrderingProblem.from_graph(nx.complete_graph(4)))   # cutwidth 4
    4.0
    """
    import networkx as nx

    if problem.n <= 1 or problem.m == 0:
        return 0.0
    contracted = len(problem.first) > 1 or len(problem.last) > 1
    Q = problem.contract_pins().problem if contracted else problem
    emb = None if contracted else planar_embedding
    if emb is None:
        G = nx.Graph()
        G.add_nodes_from(range(Q.n))
        G.add_edges_from(Q.edges.tolist())
        if not nx.check_planarity(G)[0]:
            return 0.0
    deg = Q.degrees()
    pinned = set(Q.first) | set(Q.last)
    free_deg = max((float(deg[v]) for v in range(Q.n) if v not in pinned), default=0.0)
    pin_cut = max((float(deg[v]) for v in pinned), default=0.0)
    try:
        lo, _ = carving_width_game(Q, planar_embedding=emb, deadline=deadline, max_memory=max_memory)
    except ProblemTooLargeError:
        return pin_cut
    return max(pin_cut, lo) if lo > free_deg else pin_cut


class _Bounds:
    """What a registered cutwidth method returns: bounds, the ordering, stats."""

    def __init__(self, lower: float, upper: float, order: list[int], stats: dict) -> None:
        self.lower, self.upper, self.order, self.stats = lower, upper, order, stats


def ratcatcher_method(
    problem: OrderingProblem,
    *,
    lower: float,
    upper: float,
    upper_order: list[int],
    deadline: float | None,
    seed: int | None,
    max_memory: int = DEFAULT_MAX_MEMORY,
    **_: Any,
) -> _Bounds:
    """The registered cutwidth method 'ratcatcher': the dispatcher's bounds and ordering plus
    :func:`ratcatcher_bound` (non-planar graphs keep the dispatcher's bounds)."""
    t0 = time.monotonic()
    b = ratcatcher_bound(problem, deadline, max_memory=max_memory)
    stats = {"ratcatcher": {"bound": b, "seconds": round(time.monotonic() - t0, 3)}}
    return _Bounds(max(float(lower), b), float(upper), list(upper_order), stats)

"""Lower bounds for cutwidth and carving width from short closed walks in the face graph.

The method (an exact isoperimetric profile would be NP-hard; this is a
relaxation of it that is computed by shortest paths):

Let ``H`` be the graph of an :class:`OrderingProblem` (``n`` vertices, weights
``w >= 0``) and fix any rotation system of ``H`` (a cyclic order of the
neighbours at each vertex; a planar embedding gives the strongest bound, but
the argument below never uses planarity).  Its faces are traced as usual; the
*face graph* ``F`` has one vertex per face and one edge ``e*`` per edge ``e =
uv`` of ``H``, joining the faces of the two darts ``u -> v`` and ``v -> u``,
with length ``w(e)``.  Orient ``e*`` from the face of ``u -> v`` to the face
of ``v -> u`` and call ``u`` its *left end*.

Cuts are circulations.  For ``S`` a vertex set of ``H`` put ``x(e*) =
1_S(u) - 1_S(v)`` (``u`` the left end; reversing ``e*`` negates ``x``).  At a
face with boundary walk ``v_0 v_1 ... v_k = v_0`` the outflow is ``sum_i
(1_S(v_i) - 1_S(v_{i+1})) = 0``, so ``x`` is an integer circulation in ``F``
with ``|x| = 1`` exactly on the edges of the cut ``delta(S)``: it splits into
closed walks of ``F`` of total length ``w(delta(S))``.

Area.  Fix a base vertex ``b`` and a spanning tree of ``H`` rooted at ``b``;
``size(c)`` is the number of vertices below and at ``c``.  Give the dual of a
tree edge ``pc`` (``p`` the parent) the value ``phi = size(c)`` when oriented
with ``c`` as left end (``-size(c)`` the other way) and every other edge
``phi = 0``.  Then ``sum phi * x = sum_c size(c) (1_S(c) - 1_S(p)) = |S|`` when
``b`` is not in ``S`` (telescoping over the tree), ``|S| - n`` when it is.

Bound.  Let ``g(r)`` be the least total length of a finite family of closed
walks of ``F`` whose ``phi``-sums add up to ``r`` modulo ``M``.  By the two
facts, ``w(delta(S)) >= g(|S| mod M)`` when ``b`` is not in ``S`` and ``>=
g((|S| - n) mod M)`` otherwise.  A linear layout has a counted prefix of
every size ``t`` from ``|first|`` to ``n - |last|``, so its width is at least
``max_t value(t)``, where ``value(t)`` is the least of the two readings that
are possible for a prefix of size ``t``: only the second when ``b`` is pinned
first, only the first when ``b`` is pinned last, both otherwise.  That is the
bound of :func:`carving_bound`.  ``M = n`` without a pinned base (both
readings then agree); with one, ``M = 2 n``: the readings of sizes in
``1..n-1`` never collide with those of the reversed walks, and since residues
mod ``2 n`` refine residues mod ``n`` the pinned bound is never below the
unpinned one.  Pins do strengthen it: for the dual of a disk with the outer
face pinned first, a region cut off near the cheap boundary no longer counts
as a small prefix.

Areas.  Everything above holds with ``|S|`` read as ``mu(S)`` for any integer
vertex areas ``mu >= 0`` (``size(c)`` the area below ``c``, ``n`` the total)
provided the counted prefixes still take every area in between: true for 0/1
areas, whose prefix areas grow by steps of at most 1.  When one unit per
vertex does not fit in memory, :func:`carving_bound` gives area 1 to every
``q``-th vertex only.

Carving width.  In a carving decomposition (a tree of maximum degree 3 whose
leaves are the ``n >= 2`` vertices) some tree edge has at least ``ceil(n / 3)``
and at most ``floor(2 n / 3)`` leaves on each side (take the edge whose larger
side is least: if that side had more than ``2n/3`` leaves, one of the two
edges below it would be better), and every leaf edge carries a weighted
degree; so carving width is at least ``max(max degree, min over t in
[ceil(n/3), floor(2n/3)] of g(t))`` with ``M = n``
(:func:`carving_width_lower_bound`).  A linear layout is a caterpillar
carving whose spine edges are its prefix cuts and whose leaf edges carry the
weighted degrees, so carving width ``<= max(cutwidth, max degree)``, and
cutwidth ``>=`` carving width whenever the latter exceeds the largest degree.
For cutwidth the walk bound of :func:`carving_bound` is the stronger use of
``g`` (it takes the largest value over all prefix sizes, not the least over
the balanced ones), so the ordering solvers call that.

Computation.  ``g`` is the min-plus closure over ``Z_M`` of ``h(r)``, the
shortest single closed walk of residue ``r``: one Dijkstra per face over the
states ``(face, residue)`` from ``(s, 0)``, restricted to faces ``>= s`` (every
closed walk can start at its least face), with states that cannot return to
``s`` within the level pruned by plain face distances.  The search is capped
at a level ``K``: walks longer than ``K`` are never explored, which changes no
value of ``min(g, K)`` (an optimal family of total length ``<= K`` has only
walks of length ``<= K``), so a finished level proves ``min(bound, K)``.
Levels rise by factors of 1.25 from a known lower bound until the bound falls
below the level (then it is exact for ``g``) or reaches the upper bound.
Time ``O(|F| * |F| M log(|F| M))`` per level in the worst case, memory
``O(|F| M)`` (estimated before the search starts), where ``|F| = m - n + 2``
faces; the cap makes it much faster in practice.

Soundness conditions: real and zero weights, parallel edges and loops (the
problem merges and drops them: cuts are unchanged), disconnected graphs
(components are joined by weight-0 edges, which changes no cut), any rotation
system.  For a non-planar graph no planar embedding exists; the bound is then
computed with networkx's neighbour order as the rotation system: still a valid
lower bound, but usually weak.

References
----------
.. [1] P. D. Seymour and R. Thomas, "Call routing and the ratcatcher",
   Combinatorica 14(2):217-241, 1994 (carving width; its duality with
   planar cuts and cycles of the dual).
.. [2] J. K. Park and C. A. Phillips, "Finding minimum-quotient cuts in planar
   graphs", Proc. 25th ACM STOC, 766-775, 1993 (the area of a dual cycle as a
   sum of spanning-tree values; shortest paths over (vertex, area) states).
.. [3] F. R. K. Chung, "Labelings of graphs", in Selected Topics in Graph
   Theory 3, Academic Press, 1988 (cutwidth at least the edge-isoperimetric
   profile; from memory).
"""

from __future__ import annotations

import math
import time
from typing import Any

import networkx as nx
import numpy as np
import scipy.sparse
import scipy.sparse.csgraph

from ...errors import InvalidArgumentError, ProblemTooLargeError
from ...problems.ordering import OrderingProblem
from . import kernels

__all__ = ["carving_bound", "carving_width_lower_bound", "walk_profile"]


def _rotation(problem: OrderingProblem, planar_embedding: Any) -> list[list[int]]:
    """A rotation system of the problem's graph: cyclic neighbour lists by index.

    Taken from ``planar_embedding`` (a PlaneGraph, a networkx PlanarEmbedding or a
    ``{label: [neighbour labels in cyclic order]}`` mapping) when given, else from
    ``networkx.check_planarity``, else networkx's neighbour order (non-planar).
    Neighbours absent from the problem (zero weights, loops) and repeats are dropped:
    the result lists each problem edge once at each end.
    """
    n = problem.n
    adj = problem.neighbours()
    index = {v: i for i, v in enumerate(problem.labels)}
    raw: list[list[int]] | None = None
    if planar_embedding is not None:
        raw = [[] for _ in range(n)]
        if hasattr(planar_embedding, "rotation") and hasattr(planar_embedding, "head"):
            for lab, darts in planar_embedding.rotation().items():
                if lab in index:
                    raw[index[lab]] = [index.get(planar_embedding.head(d), -1) for d in darts]
        elif isinstance(planar_embedding, nx.PlanarEmbedding):
            for lab in planar_embedding.nodes():
                if lab in index:
                    raw[index[lab]] = [index.get(x, -1) for x in planar_embedding.neighbors_cw_order(lab)]
        elif isinstance(planar_embedding, dict):
            for lab, nbrs in planar_embedding.items():
                if lab in index:
                    raw[index[lab]] = [index.get(x, -1) for x in nbrs]
        else:
            raise InvalidArgumentError(
                f"planar_embedding must be a PlaneGraph, a networkx PlanarEmbedding or a mapping, "
                f"got {type(planar_embedding).__name__}"
            )
    else:
        G = nx.Graph()
        G.add_nodes_from(range(n))
        G.add_edges_from(problem.edges.tolist())
        planar, emb = nx.check_planarity(G)
        if planar:
            raw = [list(emb.neighbors_cw_order(v)) if v in emb else [] for v in range(n)]
        else:
            raw = [sorted(adj[v]) for v in range(n)]
    rot: list[list[int]] = []
    for v in range(n):
        seen: set[int] = set()
        out = []
        for u in raw[v]:
            if u in adj[v] and u not in seen:
                seen.add(u)
                out.append(u)
        # a neighbour the embedding missed (it should not happen) is appended: any rotation is sound
        out.extend(u for u in sorted(adj[v]) if u not in seen)
        rot.append(out)
    return rot


def _face_graph(
    rot: list[list[int]], weight: dict[tuple[int, int], float], base: int, mu: np.ndarray
) -> tuple[int, np.ndarray, np.ndarray, np.ndarray, np.ndarray]:
    """Faces, the dual arcs (tail, head, length, phi) of every edge, for a connected graph."""
    n = len(rot)
    # darts: (v, k) is v -> rot[v][k]
    offs = np.zeros(n + 1, dtype=np.int64)
    for v in range(n):
        offs[v + 1] = offs[v] + len(rot[v])
    where = [{u: k for k, u in enumerate(rot[v])} for v in range(n)]
    nd = int(offs[n])
    face = np.full(nd, -1, dtype=np.int64)
    nf = 0
    for d0 in range(nd):
        if face[d0] >= 0:
            continue
        d = d0
        while face[d] < 0:
            face[d] = nf
            v = int(np.searchsorted(offs, d, side="right") - 1)
            u = rot[v][d - offs[v]]
            # next dart of the face: at u, the neighbour after v in u's cyclic order
            k = (where[u][v] + 1) % len(rot[u])
            d = int(offs[u] + k)
        nf += 1
    # spanning tree from the base (BFS), subtree sizes
    parent = np.full(n, -1, dtype=np.int64)
    parent[base] = base
    order = [base]
    for v in order:
        for u in rot[v]:
            if parent[u] < 0:
                parent[u] = v
                order.append(u)
    size = np.array(mu, dtype=np.int64)  # area below and at each vertex
    for v in reversed(order[1:]):
        size[parent[v]] += size[v]
    tails, heads, lens, phis = [], [], [], []
    for (u, v), w in weight.items():
        fu = int(face[offs[u] + where[u][v]])  # face of u -> v
        fv = int(face[offs[v] + where[v][u]])
        # oriented fu -> fv, left end u: value 1_S(u) - 1_S(v)
        if parent[u] == v and u != base:
            p = int(size[u])
        elif parent[v] == u and v != base:
            p = -int(size[v])
        else:
            p = 0
        tails.append(fu)
        heads.append(fv)
        lens.append(w)
        phis.append(p)
    return nf, np.array(tails, dtype=np.int64), np.array(heads, dtype=np.int64), np.array(lens), np.array(phis, dtype=np.int64)


def _cheap_upper(problem: OrderingProblem) -> float:
    """Width of a breadth-first layout that respects the pins (an upper bound on the cutwidth)."""
    n = problem.n
    adj = problem.neighbours()
    A, B = sorted(problem.first), set(problem.last)
    seen = set(A) | B
    order = list(A)
    queue = list(A)
    head = 0
    while len(order) < n - len(B):
        if head == len(queue):  # start a new component (or the first one)
            v0 = next(v for v in range(n) if v not in seen)
            seen.add(v0)
            order.append(v0)
            queue.append(v0)
        while head < len(queue):
            v = queue[head]
            head += 1
            for u in sorted(adj[v], key=lambda x: -adj[v][x]):
                if u not in seen:
                    seen.add(u)
                    order.append(u)
                    queue.append(u)
    order += sorted(B)
    return problem.width(order)


def _face_distances(nf: int, a: np.ndarray, b: np.ndarray, ln: np.ndarray) -> np.ndarray:
    """A lower bound on the distance between any two faces (used only to prune).

    Parallel arcs keep their shortest length (a sparse matrix would add them), and
    every length gets ``eps`` added so that zero lengths stay edges; ``eps`` times
    the number of faces is subtracted again, so no entry exceeds the true distance.
    """
    eps = 1e-9 * (1.0 + float(ln.max(initial=0.0)))
    key = a * nf + b
    o = np.lexsort((ln, key))
    key, ln = key[o], ln[o]
    keep = np.ones(key.shape[0], dtype=bool)
    keep[1:] = key[1:] != key[:-1]
    key, ln = key[keep], ln[keep]
    D = scipy.sparse.csr_matrix((ln + eps, (key // nf, key % nf)), shape=(nf, nf))
    back = scipy.sparse.csgraph.dijkstra(D, directed=False)
    return np.maximum(back - eps * (nf + 1), 0.0)


STATE_BYTES = 32  # per (face, residue) state: distance, heap position, heap slot, touched list
DEFAULT_MAX_MEMORY = 1 << 29  # 512 MiB for the walk search (states and face distances)


def _face_count(problem: OrderingProblem) -> int:
    """Faces of a plane embedding of the (joined) graph, by Euler's formula: an estimate otherwise."""
    ncomp, _ = problem.component_labels()
    return max(1, problem.m + (ncomp - 1) - problem.n + 2)


def walk_profile(
    problem: OrderingProblem,
    *,
    base: int = 0,
    modulus: int | None = None,
    cap: float = math.inf,
    area: np.ndarray | None = None,
    planar_embedding: Any = None,
    deadline: float | None = None,
    max_memory: int = DEFAULT_MAX_MEMORY,
) -> np.ndarray | None:
    """``min(g, cap)``: least length of closed face-graph walks per area residue.

    See the module notes for the definition of ``g`` (base vertex ``base``,
    residues mod ``modulus``, default the total area).  ``area`` gives every
    vertex a non-negative integer area (default 1 each; the notes' argument
    holds word for word with ``|S|`` read as the area of ``S`` and ``n`` as the
    total area).  Every cut ``S`` avoiding the base weighs at least
    ``g[area(S) % modulus]``, one containing it at least ``g[(area(S) - total)
    % modulus]``.  Returns None when the deadline passes first.

    Raises
    ------
    ProblemTooLargeError
        When the ``faces x modulus`` states need more than ``max_memory`` bytes
        (estimated before anything is allocated).

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(6))
    >>> [float(x) for x in walk_profile(P)]   # every proper cut of a cycle has two edges
    [0.0, 2.0, 2.0, 2.0, 2.0, 2.0]
    """
    n = problem.n
    mu = np.ones(n, dtype=np.int64) if area is None else np.asarray(area, dtype=np.int64)
    if mu.shape != (n,) or (n and mu.min() < 0):
        raise InvalidArgumentError(f"area must give a non-negative integer to each of the {n} vertices")
    total = int(mu.sum())
    M = int(modulus or max(total, 1))
    if not (0 <= base < max(n, 1)) or M < 1:
        raise InvalidArgumentError(f"base {base} must be a vertex index and modulus {M} positive")
    if n <= 1:
        return np.zeros(M)
    nf_est = _face_count(problem)
    need = STATE_BYTES * nf_est * M
    if need > max_memory:
        raise ProblemTooLargeError(
            f"the closed-walk search needs about {need / 2**20:.0f} MiB for {nf_est} faces x {M} residues "
            f"(max_memory {max_memory / 2**20:.0f} MiB)"
        )
    weight = {(int(u), int(v)): float(w) for (u, v), w in zip(problem.edges.tolist(), problem.weights.tolist())}
    rot = _rotation(problem, planar_embedding)
    # join the components by weight-0 edges (no cut changes), inserted anywhere in the rotations
    ncomp, lab = problem.component_labels()
    if ncomp > 1:
        reps = [int(np.flatnonzero(lab == c)[0]) for c in range(ncomp)]
        for a, b in zip(reps, reps[1:]):
            key = (min(a, b), max(a, b))
            weight[key] = 0.0
            rot[a].append(b)
            rot[b].append(a)
    nf, tail, head, length, phi = _face_graph(rot, weight, base, mu)
    # arcs both ways, residues taken mod M
    src = np.concatenate([tail, head])
    dst = np.concatenate([head, tail])
    ln = np.concatenate([length, length])
    ph = np.concatenate([phi, -phi]) % M
    order = np.argsort(src, kind="stable")
    indptr = np.zeros(nf + 1, dtype=np.int64)
    np.add.at(indptr, src + 1, 1)
    indptr = np.cumsum(indptr)
    dst, ln, ph = dst[order], ln[order], ph[order].astype(np.int64)
    # plain distances between faces, for the can-it-still-close test (skipped when too big)
    if 8 * nf * nf + STATE_BYTES * nf * M <= max_memory:
        back = _face_distances(nf, src[order], dst, ln)
    else:
        back = np.zeros((0, 0))
    K = float(cap) if math.isfinite(cap) else float(np.sum(problem.weights)) + 1.0
    h = np.full(M, np.inf)
    h[0] = 0.0
    step = 1  # sources per compiled call, grown so that a call takes about 0.1 s
    s = 0
    while s < nf:
        if deadline is not None and time.monotonic() > deadline:
            return None
        e = min(nf, s + step)
        t0 = time.monotonic()
        kernels.walk_areas(nf, indptr, dst, ln, ph, M, K * (1 + 1e-12) + 1e-12, back, s, e, h)
        dt = time.monotonic() - t0
        s = e
        if dt < 0.05:
            step *= 2
        elif dt > 0.2 and step > 1:
            step //= 2
    g = kernels.residue_closure(h, M)
    return np.minimum(g, K)


def _pinned_base(problem: OrderingProblem) -> tuple[int, int]:
    """The base vertex and its role: +1 pinned first, -1 pinned last, 0 free."""
    if problem.first:
        return min(problem.first), 1
    if problem.last:
        return min(problem.last), -1
    return 0, 0


def _levels(start: float, cap: float) -> list[float]:
    """Increasing search levels from ``start`` up to ``cap`` (each about 1.25 times the last)."""
    out = []
    K = max(start, 1e-9)
    while K < cap:
        out.append(K)
        K *= 1.25
    out.append(cap)
    return out


def carving_bound(
    problem: OrderingProblem,
    deadline: float | None = None,
    *,
    planar_embedding: Any = None,
    upper: float | None = None,
    lower: float = 0.0,
    max_memory: int = DEFAULT_MAX_MEMORY,
) -> float:
    """Lower bound on the (pinned) cutwidth from short closed walks of the face graph.

    Definition and proof: the module notes.  In short, with ``g`` of
    :func:`walk_profile` and the base vertex chosen pinned where a pin exists,
    the width of every layout is at least the largest, over the counted prefix
    sizes ``t``, of the least cut weight a prefix of size ``t`` can have
    according to ``g``.

    Parameters
    ----------
    problem : OrderingProblem
    deadline : float, optional
        ``time.monotonic()`` value.  The search runs at increasing levels ``K``
        (walks up to length ``K``); each finished level proves
        ``min(bound, K)``, a level the deadline cuts short is dropped, so the
        answer is always proven (``0.0`` if no level finished).
    planar_embedding : optional
        A plane embedding of the problem's graph (PlaneGraph, networkx
        PlanarEmbedding, or ``{label: [neighbours in cyclic order]}``).  Without
        one, ``networkx.check_planarity`` is used; non-planar graphs get a weak
        but valid bound (see the module notes).
    upper : float, optional
        A known upper bound on the cutwidth: the last level (default: the width
        of a breadth-first layout).
    lower : float
        A known lower bound: the first level starts just above it.
    max_memory : int
        Bytes allowed for the search.  When one area unit per vertex does not
        fit, every ``q``-th vertex (in index order) gets area 1 and the others 0,
        with ``q`` as small as fits (the argument holds for any 0/1 areas:
        prefix areas still run through every integer).

    Returns
    -------
    float
        A proven lower bound (for pinned problems, on the pinned cutwidth).

    Examples
    --------
    >>> import networkx as nx
    >>> carving_bound(OrderingProblem.from_graph(nx.grid_2d_graph(6, 6)))   # cutwidth 7
    7.0
    """
    n = problem.n
    if n <= 1 or problem.m == 0:
        return 0.0
    base, role = _pinned_base(problem)
    pinned = role != 0
    # areas: one per vertex if the states fit, else every q-th vertex
    nf_est = _face_count(problem)
    q = 1
    while True:
        total = -(-n // q)
        M = 2 * total if pinned else total
        if STATE_BYTES * nf_est * M <= max_memory or total <= 2:
            break
        q += 1
    mu = np.zeros(n, dtype=np.int64)
    mu[::q] = 1
    total = int(mu.sum())
    M = max(1, 2 * total if pinned else total)
    if STATE_BYTES * nf_est * M > max_memory:
        return 0.0
    lo = int(mu[sorted(problem.first)].sum())
    hi = total - int(mu[sorted(problem.last)].sum())
    cap = float(upper) if upper is not None else _cheap_upper(problem)
    start = max(float(lower) * 1.02, 2 * float(problem.degrees().max()), 1e-9)
    best = 0.0
    for K in _levels(min(start, cap), cap):
        g = walk_profile(
            problem, base=base, modulus=M, cap=K, area=mu, planar_embedding=planar_embedding,
            deadline=deadline, max_memory=max_memory,
        )
        if g is None:
            break
        val = 0.0
        for k in range(lo, hi + 1):
            out_of_s = float(g[k % M])  # a prefix of area k without the base
            with_base = float(g[(k - total) % M])  # one containing it
            v = with_base if role == 1 else out_of_s if role == -1 else min(out_of_s, with_base)
            val = max(val, v)
        best = max(best, float(val))
        if val < K:
            break  # the profile stayed below this level: higher levels give the same value
    return best


def carving_width_lower_bound(
    problem: OrderingProblem, deadline: float | None = None, *, planar_embedding: Any = None
) -> float:
    """Lower bound on the carving width (pins ignored): balanced tree edges and leaf edges.

    ``max(max weighted degree, min over t in [ceil(n/3), floor(2n/3)] of
    g(t))`` with ``g`` of :func:`walk_profile` taken mod ``n`` (where ``g(t) =
    g(n - t)``); the argument is in the module notes.

    Examples
    --------
    >>> import networkx as nx
    >>> carving_width_lower_bound(OrderingProblem.from_graph(nx.cycle_graph(7)))
    2.0
    """
    n = problem.n
    if n <= 1:
        return 0.0
    deg = float(problem.degrees().max()) if problem.m else 0.0
    if n <= 2:
        return deg
    free = OrderingProblem(problem.labels, problem.edges, problem.weights, frozenset(), frozenset())
    cap = max(_cheap_upper(free), deg)  # carving width <= max(cutwidth, max degree)
    g = walk_profile(free, modulus=n, cap=cap, planar_embedding=planar_embedding, deadline=deadline)
    if g is None:
        return deg
    lo, hi = -(-n // 3), (2 * n) // 3
    bal = min(float(g[t % n]) for t in range(lo, hi + 1)) if lo <= hi else 0.0
    return max(deg, bal)

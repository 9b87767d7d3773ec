"""Leash sweeps built by splitting the region between two leashes with a middle leash.

Construction
------------
Between two leashes ``L1`` at ``(i1, j1)`` and ``L2`` at ``(i2, j2)`` (with
``i1 <= i2`` and ``j1 <= j2``) lies the *region* X: the faces on the odd side
of the closed walk ``L1 . B[j1..j2] . L2^-1 . A[i1..i2]^-1`` (its mod-2
boundary, the side away from the holes).  When X has more than ``leaf``
faces, a *middle leash* M is chosen inside X and the construction recurses on
``(L1, M)`` and ``(M, L2)``; a small region is crossed directly: the ends
step along A and B to the next leash's indices, and the path-form homotopy of
:func:`sweepwidth.solve.homotopy.construct_homotopy` (greedy by length) sweeps
the leash onto it.

The middle leash runs through a vertex ``x`` of X halfway between the two
leashes: with distances measured inside X (only edges on a face of X),
``x`` is an interior vertex with ``|d(L1, x) - d(L2, x)|`` smallest and,
among those, ``dA(x) + dB(x)`` smallest, where ``dA`` is the distance from
``a_{i1} .. a_{i2}`` and ``dB`` from ``b_{j1} .. b_{j2}``.  M is the shortest
path from A to x followed by the shortest path from x to B (inside X), freely
reduced and with its loops cut out, so that it is a simple path from some
``a_i`` to some ``b_j`` with ``i1 <= i <= i2`` and ``j1 <= j <= j2``.  Every
leash of the sweep is then a shortest path through a point of the region it
splits, so its length is about ``dA(x) + dB(x)``: the same quantity as the
face-passage lower bound of :mod:`.bounds` (every face is flipped by a leash
running through it, of length at least ``dA + dB`` there), measured inside
the shrinking regions instead of the whole graph.  The width comes from the
middle leashes and the small crossings at the leaves.

This is a divide-and-conquer sweep in the spirit of the separator recursion
of Har-Peled, Nayyeri, Salavatipour and Sidiropoulos [1]_ (there with
balanced shortest-path separators and an ``O(log n)`` factor), here as a
heuristic with a replayed witness, not an approximation guarantee.  When a
region cannot be split (no interior vertex, a middle leash that does not
cut it, holes inside), it is crossed directly.

Time: each level of the recursion runs four restricted Dijkstra searches
[2]_ over its region, so ``O(F log F)`` per level and about ``log F`` levels
on balanced splits, plus the small crossings.

References
----------
.. [1] S. Har-Peled, A. Nayyeri, M. Salavatipour and A. Sidiropoulos, "How to
   walk your dog in the mountains with no magic leash", Discrete &
   Computational Geometry 55(1), 2016 (SoCG 2012).
.. [2] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1, 1959.
"""

from __future__ import annotations

import dataclasses
import heapq
import time
from typing import Any, Sequence

from ...problems.homotopy import Curve
from ..homotopy import bfs_rank, construct_homotopy

__all__ = ["split_sweep", "region_faces", "middle_leash"]

#: regions of at most this many faces are crossed directly
LEAF_FACES = 2
#: candidate middle vertices tried per region before it is crossed directly
CANDIDATES = 8
#: a middle vertex has |d(L1, x) - d(L2, x)| at most this share of d(L1, x) + d(L2, x)
MIDDLE = 0.4
#: a split is balanced when each side holds at least this share of the region's faces
BALANCE = 0.2

_INF = float("inf")


def region_faces(W: Any, closed: Sequence[int]) -> set[int] | None:
    """The faces on the odd side of a closed walk (mod 2), the holes' side being even.

    Two faces across an edge are on the same side unless the walk uses the
    edge an odd number of times.  None when the holes do not all get side 0
    (the walk winds around a hole) or the sides disagree.
    """
    P = W.graph
    m = P.number_of_edges()
    z = bytearray(m)
    for d in closed:
        z[d >> 1] ^= 1
    F = P.number_of_faces()
    df = W.path.dart_face
    adj: list[list[tuple[int, int]]] = [[] for _ in range(F)]
    for e in range(m):
        f, g = df[2 * e], df[2 * e + 1]
        if f != g:
            adj[f].append((g, e))
            adj[g].append((f, e))
        elif z[e]:
            return None
    holes = sorted(W.holes)
    root = holes[0] if holes else 0
    side = [-1] * F
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
    return {f for f in range(F) if side[f] == 1}


def _restricted(W: Any, allowed: Sequence[bool], sources: dict[int, int]) -> tuple[dict, dict, dict]:
    """Dijkstra [2]_ along the allowed edges from several sources: distance, parent dart, source tag."""
    cost, head = W.cost, W.head
    out = _out(W)
    dist: dict[int, float] = {}
    par: dict[int, int] = {}
    tag: dict[int, int] = {}
    heap = []
    for v, t in sources.items():
        dist[v] = 0.0
        par[v] = -1
        tag[v] = t
        heap.append((0.0, v))
    heapq.heapify(heap)
    while heap:
        dv, v = heapq.heappop(heap)
        if dv > dist[v]:
            continue
        for d in out[v]:
            if not allowed[d >> 1]:
                continue
            u = head[d]
            nd = dv + cost[d]
            if nd < dist.get(u, _INF):
                dist[u] = nd
                par[u] = d
                tag[u] = tag[v]
                heapq.heappush(heap, (nd, u))
    return dist, par, tag


def _out(W: Any) -> list[list[int]]:
    cached = getattr(W, "_split_out", None)
    if cached is not None:
        return cached
    n = W.graph.number_of_vertices()
    out: list[list[int]] = [[] for _ in range(n)]
    for d, t in enumerate(W.tail):
        out[t].append(d)
    object.__setattr__(W, "_split_out", out)
    return out


def _trace(par: dict, tail: Sequence[int], v: int) -> list[int]:
    """Darts from the search's source to v."""
    out = []
    while par.get(v, -1) >= 0:
        d = par[v]
        out.append(d)
        v = tail[d]
    out.reverse()
    return out


def _simplify(darts: list[int], tail: Sequence[int], head: Sequence[int]) -> list[int]:
    """Free reduction, then cut every closed sub-walk out (a simple path with the same ends)."""
    red: list[int] = []
    for d in darts:
        if red and red[-1] == d ^ 1:
            red.pop()
        else:
            red.append(d)
    if not red:
        return red
    out: list[int] = []
    seen: dict[int, int] = {tail[red[0]]: 0}
    for d in red:
        v = head[d]
        if v in seen:
            k = seen[v]
            for x in out[k:]:
                seen.pop(head[x], None)
            del out[k:]
            seen[v] = k
            if not out:
                seen = {v: 0}
        else:
            out.append(d)
            seen[v] = len(out)
    return out


def middle_leash(W: Any, X: set[int], i1: int, i2: int, j1: int, j2: int, L1: Sequence[int], L2: Sequence[int],
                 *, tries: int = CANDIDATES) -> list[tuple[int, int, tuple]]:
    """Candidate middle leashes ``(i, j, darts)`` of region X (see the module docstring).

    The candidates run through interior vertices about halfway between the
    two leashes, spread from the shallowest to the deepest (farthest from
    both); each is a shortest path from A to x inside X and then a shortest
    path from x to B inside X that avoids the first one (so it is simple).
    """
    P = W.graph
    m = P.number_of_edges()
    df = W.path.dart_face
    tail, head = W.tail, W.head
    allowed = [df[2 * e] in X or df[2 * e + 1] in X for e in range(m)]
    # the leashes and the pieces of A and B bound the region (shared pieces of the leashes included)
    for d in list(L1) + list(L2) + list(W.a.darts[i1:i2]) + list(W.b.darts[j1:j2]):
        allowed[d >> 1] = True
    inside: dict[int, bool] = {}
    for f in X:
        for d in W.path.face_walks[f]:
            inside.setdefault(tail[d], True)
    out_ = _out(W)
    interior = [v for v in inside if all(df[d] in X for d in out_[v])]
    if not interior:
        return []
    A, B = W.a_vertices, W.b_vertices
    srcA: dict[int, int] = {}
    for k in range(i2, i1 - 1, -1):
        srcA[A[k]] = k
    srcB: dict[int, int] = {}
    for k in range(j1, j2 + 1):
        srcB[B[k]] = k
    dA, pA, tA = _restricted(W, allowed, srcA)
    ends1 = {tail[d] for d in L1} | ({head[L1[-1]]} if L1 else {A[i1]})
    ends2 = {tail[d] for d in L2} | ({head[L2[-1]]} if L2 else {A[i2]})
    d1 = _restricted(W, allowed, {v: 0 for v in ends1})[0]
    d2 = _restricted(W, allowed, {v: 0 for v in ends2})[0]
    cand = [v for v in interior if v in dA and v in d1 and v in d2]
    if not cand:
        return []

    def off(v: int) -> float:  # how far from halfway between the two leashes
        t = d1[v] + d2[v]
        return abs(d1[v] - d2[v]) / t if t > 0 else 0.0

    near = [v for v in cand if off(v) <= MIDDLE]
    if not near:
        near = sorted(cand, key=off)[:tries]
    near.sort(key=lambda v: (min(d1[v], d2[v]), -dA[v]))
    if len(near) > tries:  # spread over the depths, the deepest included
        step = (len(near) - 1) / (tries - 1) if tries > 1 else 0
        near = [near[round(k * step)] for k in range(tries)] if tries > 1 else [near[-1]]
    out: list[tuple[int, int, tuple]] = []
    seen: set = set()
    for v in reversed(near):
        up = _trace(pA, tail, v)
        block = [False] * P.number_of_vertices()
        for d in up:
            block[tail[d]] = True
        ok = [allowed[e] and not block[tail[2 * e]] and not block[head[2 * e]] for e in range(m)]
        dB, pB, tB = _restricted(W, ok, {u: k for u, k in srcB.items() if not block[u]})
        if v not in dB:
            continue
        down = [d ^ 1 for d in reversed(_trace(pB, tail, v))]
        M = tuple(_simplify(up + down, tail, head))
        if M in seen or M == tuple(L1) or M == tuple(L2):
            continue
        seen.add(M)
        out.append((tA[v], tB[v], M))
    return out


def split_sweep(W: Any, *, leaf: int = LEAF_FACES, deadline: float | None = None,
                tries: int = CANDIDATES) -> tuple[float, dict] | None:
    """A leash sweep by recursive splitting (see the module docstring); ``(width, witness)`` or None.

    The witness is not replayed here (the caller does that).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(4, 4)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]},
    ...                        {"vertices": [(3, 0), (3, 1), (3, 2), (3, 3)]})
    >>> split_sweep(W)[0]
    4.0
    """
    tail = W.tail
    A, B = W.a.darts, W.b.darts
    p, q = W.p, W.q

    def closed(i1: int, j1: int, L1: Sequence[int], i2: int, j2: int, L2: Sequence[int]) -> list[int]:
        return (list(L1) + list(B[j1:j2]) + [d ^ 1 for d in reversed(L2)]
                + [d ^ 1 for d in reversed(A[i1:i2])])

    # keyframes by an explicit stack: (i1, j1, L1) .. (i2, j2, L2) with the region between
    frames: list[tuple[int, int, tuple]] = [(0, 0, tuple(W.start.darts))]
    stack = [(p, q, tuple(W.end.darts))]
    while stack:
        if deadline is not None and time.monotonic() > deadline:
            return None
        i1, j1, L1 = frames[-1]
        i2, j2, L2 = stack[-1]
        X = region_faces(W, closed(i1, j1, L1, i2, j2, L2))
        best = None
        if X is not None and len(X) > leaf:
            for i, j, M in middle_leash(W, X, i1, i2, j1, j2, L1, L2, tries=tries):
                X1 = region_faces(W, closed(i1, j1, L1, i, j, M))
                X2 = region_faces(W, closed(i, j, M, i2, j2, L2))
                if X1 is None or X2 is None or not X1 or not X2 or len(X1) >= len(X) or len(X2) >= len(X):
                    continue
                if len(X1) + len(X2) != len(X) or X1 | X2 != X:  # the middle leash leaves the region
                    continue
                share = min(len(X1), len(X2)) / len(X)
                key = (share < BALANCE, W.length_of(M) if share >= BALANCE else -share)
                if best is None or key < best[0]:
                    best = (key, (i, j, M))
        if best is not None:
            stack.append(best[1])
        else:
            frames.append(stack.pop())
    return _realise(W, frames, deadline)


def _realise(W: Any, frames: list[tuple[int, int, tuple]], deadline: float | None) -> tuple[float, dict] | None:
    """Walk through the keyframe leashes: steps to their indices, then a constructed homotopy onto each."""
    H0 = W.path
    rank = bfs_rank(H0)
    s = W.initial()
    moves: list = []
    width = W.length_of(s.darts)
    for i, j, L in frames[1:]:
        for walk, to, cur in (("a", i, s.i), ("b", j, s.j)):
            for k in range(cur + 1, to + 1):
                mv = {"op": "step", "walk": walk, "to": k}
                s = W.step(s, walk, k)
                moves.append(mv)
                width = max(width, W.length_of(s.darts))
        if s.darts == tuple(L):
            continue
        H = dataclasses.replace(H0, start=Curve(s.darts, s.vertex), end=Curve(tuple(L), s.vertex))
        got = construct_homotopy(H, rank, greedy=True, deadline=deadline)
        if got is None:
            return None
        h, wit = got
        moves.extend(wit["moves"])
        width = max(width, h)
        s = dataclasses.replace(s, darts=tuple(L))
    if not W.is_final(s):
        return None
    return width, {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}


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

The middle leash runs through a vertex ``x`` of X about halfway between the
two leashes: with distances measured inside X (the edges on a face of X and
those of the two leashes and of the walks' pieces),
``|d(L1, x) - d(L2, x)| <= middle * (d(L1, x) + d(L2, x))``; up to ``tries``
such interior vertices, spread from the deepest (farthest from both
leashes) to the shallowest, are tried.  For each, M is the shortest path
inside X from ``a_{i1} .. a_{i2}`` to x followed by the shortest path inside
X from x to ``b_{j1} .. b_{j2}`` that avoids the first one's vertices, so a
simple path from some ``a_i`` to some ``b_j`` with ``i1 <= i <= i2`` and
``j1 <= j <= j2``.  A candidate counts when it cuts X into two non-empty
parts (the odd sides of ``L1 .. M`` and ``M .. L2`` partition X); the
shortest M among the *balanced* ones (each part at least ``balance`` of
X's faces) is taken, else the most balanced.  Every leash of the sweep is
then a shortest path through a point of the region it splits, so its
length is about ``dA(x) + dB(x)``: the same quantity as the face-passage
lower bound of :mod:`.bounds` (every face is flipped by a leash running
through it, of length at least ``dA + dB`` there), measured inside the
shrinking regions instead of the whole graph.  The width comes from the
middle leashes and the small crossings at the leaves.

This is a divide-and-conquer sweep in the spirit of the separator recursion
of Har-Peled, Nayyeri, Salavatipour and Sidiropoulos [1]_ (there with
balanced shortest-path separators and an ``O(log n)`` factor), here as a
heuristic with a replayed witness, not an approximation guarantee.  When a
region cannot be split (no interior vertex, a middle leash that does not
cut it, holes inside), it is crossed directly.

Local improvement
-----------------
:func:`improve` takes the widest crossing between two consecutive
keyframes and re-solves the window of crossings around it (widened one
crossing on each side at a time, up to ``WINDOW_FACES`` faces) exactly, as a
width problem of its own: the walks' pieces between the window's ends, its
first and last leash, every face outside the window's region a hole
(:func:`sub_problem`).  The exact search of :mod:`.exact` is asked only for
a sweep narrower than the current width, with ``WINDOW_SECONDS`` per window;
a narrower one replaces the window (its step indices shifted back).  This
repeats on the new widest crossing until none can be narrowed.  Every
result is replayed by the caller.

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
from ...problems.width import WidthState
from ..homotopy import bfs_rank, construct_homotopy
from .bounds import _out

__all__ = ["split_sweep", "keyframes", "realise", "region_faces", "middle_leash", "leaf_size", "VARIANTS"]

#: regions of at most this many faces are crossed directly (at least; see :func:`leaf_size`)
LEAF_FACES = 2
#: above this many faces the leaves get larger (see :func:`leaf_size`)
MANY_FACES = 4000
#: candidate middle vertices tried per region
CANDIDATES = 8
#: a middle vertex has |d(L1, x) - d(L2, x)| at most this share of d(L1, x) + d(L2, x)
MIDDLE = 0.4
#: a split is balanced when each side holds at least this share of the region's faces
BALANCE = 0.2
#: the variants tried by :func:`split_variants`: (middle, balance, candidates), the most often best first
VARIANTS = ((0.4, 0.2, 8), (0.4, 0.1, 4), (0.6, 0.1, 16), (0.4, 0.3, 4), (0.2, 0.1, 8), (0.6, 0.3, 8),
            (0.2, 0.2, 4), (0.4, 0.4, 16), (0.6, 0.1, 8), (0.2, 0.3, 8), (0.4, 0.3, 16), (0.2, 0.1, 16))

_INF = float("inf")


def leaf_size(W: Any) -> int:
    """Faces of the regions crossed directly: ``LEAF_FACES``, more on large graphs.

    About ``F / 250`` faces up to ``MANY_FACES`` faces and ``F / 100`` above
    (fewer crossings: each costs a pass over the whole graph to find its
    2-chain, so at ``10^4`` faces 160 crossings take 5 s against 400 in 9 s).
    """
    F = W.graph.number_of_faces()
    return max(LEAF_FACES, F // (250 if F <= MANY_FACES else 100))


def region_faces(W: Any, closed: Sequence[int], within: set[int] | None = None) -> set[int] | None:
    """The faces on the odd side of a closed walk (mod 2), the holes' side being even.

    Two faces across an edge are on the same side unless the walk uses the
    edge an odd number of times.  With ``within``, a set of faces known to
    contain the odd side, only those faces are searched (every other face
    is even); the walk must then use each edge outside ``within`` an even
    number of times.  None when the sides disagree or a hole is odd (the
    walk winds around a hole, or leaves ``within``).
    """
    P = W.graph
    df = W.path.dart_face
    z: dict[int, int] = {}
    for d in closed:
        e = d >> 1
        z[e] = z.get(e, 0) ^ 1
    walks = W.path.face_walks
    if within is None:
        within = {f for f in range(P.number_of_faces()) if f not in W.holes}
    elif any(h in within for h in W.holes):
        return None
    for e, odd in z.items():
        if odd and df[2 * e] not in within and df[2 * e + 1] not in within:
            return None
    side: dict[int, int] = {}
    order: list[int] = []
    # faces of `within` next to an outside face get their side from the edge between
    for f in within:
        for d in walks[f]:
            g = df[d ^ 1]
            if g not in within:
                v = z.get(d >> 1, 0)
                if side.setdefault(f, v) != v:
                    return None
                order.append(f)
                break
    for f in order:
        for d in walks[f]:
            g = df[d ^ 1]
            v = side[f] ^ z.get(d >> 1, 0)
            if g not in within:
                if side[f] != z.get(d >> 1, 0):
                    return None
            elif g not in side:
                side[g] = v
                order.append(g)
            elif side[g] != v:
                return None
    if len(side) != len(within):  # faces cut off from the outside (no holes): decide from any one
        rest = [f for f in within if f not in side]
        seed = rest[0]
        side[seed] = 0
        order = [seed]
        for f in order:
            for d in walks[f]:
                g = df[d ^ 1]
                if g in within and g not in side:
                    side[g] = side[f] ^ z.get(d >> 1, 0)
                    order.append(g)
    return {f for f, v in side.items() if v}


def _restricted(W: Any, allowed: set[int], sources: dict[int, int],
                block: set[int] | None = None) -> tuple[dict, dict, dict]:
    """Dijkstra [2]_ along the allowed edges (avoiding blocked vertices) from several sources.

    Returns the distance, the parent dart and the source's tag of every vertex reached.
    """
    cost, head = W.cost, W.head
    out = _out(W)
    dist: dict[int, float] = {}
    par: dict[int, int] = {}
    tag: dict[int, int] = {}
    heap = []
    for v, t in sources.items():
        if block is not None and v in block:
            continue
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
            if (d >> 1) not in allowed:
                continue
            u = head[d]
            if block is not None and u in block:
                continue
            nd = dv + cost[d]
            if nd < dist.get(u, _INF):
                dist[u] = nd
                par[u] = d
                tag[u] = tag[v]
                heapq.heappush(heap, (nd, u))
    return dist, par, tag


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
        else:
            out.append(d)
            seen[v] = len(out)
    return out


def middle_leash(W: Any, X: set[int], i1: int, i2: int, j1: int, j2: int, L1: Sequence[int], L2: Sequence[int],
                 *, tries: int = CANDIDATES, middle: float = MIDDLE) -> list[tuple[int, int, tuple]]:
    """Candidate middle leashes ``(i, j, darts)`` of region X (see the module docstring).

    The candidates run through interior vertices about halfway between the
    two leashes (``|d1 - d2| <= middle * (d1 + d2)``), spread from the
    deepest (farthest from both) to the shallowest; each is a shortest path
    from A to x inside X and then a shortest path from x to B inside X that
    avoids the first one (so it is simple).
    """
    df = W.path.dart_face
    tail, head = W.tail, W.head
    walks = W.path.face_walks
    allowed: set[int] = set()
    inside: set[int] = set()
    for f in X:
        for d in walks[f]:
            allowed.add(d >> 1)
            inside.add(tail[d])
    # the leashes and the pieces of A and B bound the region (shared pieces of the leashes included)
    for d in list(L1) + list(L2) + list(W.a.darts[i1:i2]) + list(W.b.darts[j1:j2]):
        allowed.add(d >> 1)
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

    near = [v for v in cand if off(v) <= middle]
    if not near:
        near = sorted(cand, key=off)[:tries]
    near.sort(key=lambda v: (min(d1[v], d2[v]), -dA[v], v))
    if len(near) > tries:  # spread over the depths, the deepest included
        if tries > 1:
            step = (len(near) - 1) / (tries - 1)
            near = [near[round(k * step)] for k in range(tries)]
        else:
            near = [near[-1]]
    out: list[tuple[int, int, tuple]] = []
    seen: set = set()
    for v in reversed(near):
        up = _trace(pA, tail, v)
        block = {tail[d] for d in up}
        dB, pB, tB = _restricted(W, allowed, srcB, block)
        if v not in dB:
            continue
        down = [d ^ 1 for d in reversed(_trace(pB, tail, v))]
        M = tuple(_simplify(up + down, tail, head))
        if M in seen or M == tuple(L1) or M == tuple(L2):
            continue
        seen.add(M)
        out.append((tA[v], tB[v], M))
    return out


def split_sweep(W: Any, *, leaf: int | None = None, deadline: float | None = None, tries: int = CANDIDATES,
                middle: float = MIDDLE, balance: float = BALANCE) -> tuple[float, dict] | None:
    """A leash sweep by recursive splitting (see the module docstring); ``(width, witness)`` or None.

    Parameters
    ----------
    W : WidthProblem
    leaf : int, optional
        Regions of at most this many faces are crossed directly (default :func:`leaf_size`).
    deadline : float, optional
        ``time.monotonic()`` value; None is returned when it passes.
    tries, middle, balance
        Candidates per region, how far from halfway a middle vertex may be,
        and the least share of faces on each side of a balanced split (the
        shortest middle leash among balanced splits is taken, else the most
        balanced split).

    Returns
    -------
    (width, witness) or None
        None when a crossing cannot be constructed (the witness is not
        replayed here: the caller does that).

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth.problems.width import WidthProblem
    >>> P = grid(4, 4)
    >>> W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]},
    ...                        {"vertices": [(3, 0), (3, 1), (3, 2), (3, 3)]})
    >>> from sweepwidth.solve.width.exact import search_width
    >>> split_sweep(W)[0], search_width(W).upper     # a heuristic: one more than the optimum here
    (5.0, 4.0)
    """
    frames = keyframes(W, leaf=leaf, deadline=deadline, tries=tries, middle=middle, balance=balance)
    if frames is None:
        return None
    return realise(W, frames, deadline)


def keyframes(W: Any, *, leaf: int | None = None, deadline: float | None = None, tries: int = CANDIDATES,
              middle: float = MIDDLE, balance: float = BALANCE) -> list[tuple[int, int, tuple]] | None:
    """The leashes ``(i, j, darts)`` the split sweep passes through, start and end included (None at the deadline)."""
    if leaf is None:
        leaf = leaf_size(W)
    A, B = W.a.darts, W.b.darts

    def closed(i1: int, j1: int, L1: Sequence[int], i2: int, j2: int, L2: Sequence[int]) -> list[int]:
        return (list(L1) + list(B[j1:j2]) + [d ^ 1 for d in reversed(L2)]
                + [d ^ 1 for d in reversed(A[i1:i2])])

    frames: list[tuple[int, int, tuple]] = [(0, 0, tuple(W.start.darts))]
    top = (W.p, W.q, tuple(W.end.darts))
    stack: list[tuple[tuple[int, int, tuple], set[int] | None]] = [
        (top, region_faces(W, closed(0, 0, frames[0][2], *top)))]
    while stack:
        if deadline is not None and time.monotonic() > deadline:
            return None
        i1, j1, L1 = frames[-1]
        (i2, j2, L2), X = stack[-1]
        best = None
        if X is not None and len(X) > leaf:
            for i, j, M in middle_leash(W, X, i1, i2, j1, j2, L1, L2, tries=tries, middle=middle):
                X1 = region_faces(W, closed(i1, j1, L1, i, j, M), X)
                if X1 is None or not X1 or len(X1) >= len(X):
                    continue
                X2 = X - X1
                # the rest must be exactly the region between M and L2 (M stays inside X)
                if region_faces(W, closed(i, j, M, i2, j2, L2), X) != X2:
                    continue
                share = min(len(X1), len(X2)) / len(X)
                key = (share < balance, W.length_of(M) if share >= balance else -share)
                if best is None or key < best[0]:
                    best = (key, (i, j, M), X1, X2)
        if best is not None:
            _, mid, X1, X2 = best
            stack[-1] = ((i2, j2, L2), X2)
            stack.append((mid, X1))
        else:
            frames.append(stack.pop()[0])
    return frames


def _steps(W: Any, s: Any, i: int, j: int) -> tuple[Any, list, float]:
    """Forward endpoint steps from state s to indices (i, j), A first: (state, moves, widest leash)."""
    moves: list = []
    width = W.length_of(s.darts)
    for walk, to, cur in (("a", i, s.i), ("b", j, s.j)):
        for k in range(cur + 1, to + 1):
            s = W.step(s, walk, k)
            moves.append({"op": "step", "walk": walk, "to": k})
            width = max(width, W.length_of(s.darts))
    return s, moves, width


def crossing(W: Any, s: Any, target: tuple[int, int, tuple], rank: Sequence[float],
             deadline: float | None) -> tuple[float, list] | None:
    """Moves from state s to the leash ``target = (i, j, darts)``: steps, then a greedy constructed homotopy.

    Returns ``(widest leash, moves)`` or None when the homotopy cannot be constructed.
    """
    i, j, L = target
    s, moves, width = _steps(W, s, i, j)
    if s.darts == tuple(L):
        return width, moves
    H = dataclasses.replace(W.path, start=Curve(s.darts, s.vertex), end=Curve(tuple(L), s.vertex))
    got = construct_homotopy(H, rank, greedy=True, deadline=deadline)
    if got is None:
        return None
    return max(width, got[0]), moves + list(got[1]["moves"])


def realise(W: Any, frames: list[tuple[int, int, tuple]], deadline: float | None) -> tuple[float, dict] | None:
    """Walk through the keyframe leashes: steps to their indices, then a constructed homotopy onto each."""
    segs = crossings(W, frames, deadline)
    if segs is None:
        return None
    return join(W, segs)


def crossings(W: Any, frames: list[tuple[int, int, tuple]], deadline: float | None) -> list[tuple[float, list]] | None:
    """One ``(widest leash, moves)`` per pair of consecutive keyframes (None when one cannot be built)."""
    rank = bfs_rank(W.path)
    out = []
    for (i1, j1, L1), target in zip(frames, frames[1:]):
        s = _state(W, i1, j1, L1)
        got = crossing(W, s, target, rank, deadline)
        if got is None:
            return None
        out.append(got)
    return out


def _state(W: Any, i: int, j: int, L: tuple) -> WidthState:
    return WidthState(i, j, tuple(L), W.tail[L[0]] if L else W.a_vertices[i])


def join(W: Any, segs: list[tuple[float, list]]) -> tuple[float, dict]:
    """The whole sweep from its crossings: ``(width, witness)``."""
    width = max([W.length_of(W.start.darts)] + [h for h, _ in segs])
    moves = [mv for _, ms in segs for mv in ms]
    return width, {"start": W.leash_json(W.start.darts, W.start.vertex), "moves": moves}


#: the local improvement re-solves windows of at most this many faces exactly
WINDOW_FACES = 60
#: seconds per exact re-solve of a window
WINDOW_SECONDS = 0.5


def sub_problem(W: Any, first: tuple[int, int, tuple], last: tuple[int, int, tuple]) -> tuple[Any, set[int]] | None:
    """The width problem from leash ``first`` to leash ``last`` inside the region between them.

    Walks ``A[i1..i2]`` and ``B[j1..j2]``, start ``first``, end ``last``, every
    face outside the region a hole; the options of W otherwise.  Returns
    ``(problem, region)`` or None when the region is not defined.
    """
    from ...errors import SweepwidthError
    from ...problems.width import WidthProblem

    (i1, j1, L1), (i2, j2, L2) = first, last
    A, B = W.a.darts, W.b.darts
    cl = list(L1) + list(B[j1:j2]) + [d ^ 1 for d in reversed(L2)] + [d ^ 1 for d in reversed(A[i1:i2])]
    X = region_faces(W, cl)
    if X is None:
        return None
    P = W.graph
    lab = P.label
    holes = [f for f in range(P.number_of_faces()) if f not in X]
    try:
        S = WidthProblem.build(P, {"vertex": lab(W.a_vertices[i1]), "darts": list(A[i1:i2])},
                               {"vertex": lab(W.b_vertices[j1]), "darts": list(B[j1:j2])},
                               start={"vertex": lab(W.a_vertices[i1]), "darts": list(L1)},
                               end={"vertex": lab(W.a_vertices[i2]), "darts": list(L2)},
                               holes=holes, spikes=W.spikes, simple=W.simple, weight=W.weight)
    except SweepwidthError:
        return None
    return S, X


def improve(W: Any, frames: list[tuple[int, int, tuple]], segs: list[tuple[float, list]], *,
            deadline: float | None, window_faces: int = WINDOW_FACES,
            seconds: float = WINDOW_SECONDS) -> tuple[list, list, dict]:
    """Local improvement: re-solve windows of crossings around the widest one exactly.

    The widest crossing, then the window of crossings ``k - r .. k + r``
    around it (``r = 0, 1, ...`` while the window's region has at most
    ``window_faces`` faces) is solved by the exact search of :mod:`.exact`
    as a width problem of its own (:func:`sub_problem`), asked only for a
    sweep narrower than the current width; the first narrower one replaces
    the window's crossings (and the keyframes inside it).  Stops when no
    widest crossing can be narrowed or at the deadline.

    Returns ``(frames, segs, stats)``.
    """
    from .exact import search_width

    frames, segs = list(frames), list(segs)
    stats = {"windows": 0, "narrowed": 0}
    stuck: set = set()
    while segs:
        if deadline is not None and time.monotonic() > deadline:
            break
        w = max(h for h, _ in segs)
        ks = [k for k, (h, _) in enumerate(segs) if h >= w - 1e-9]
        done = False
        for k in ks:
            for r in range(0, len(segs)):
                lo, hi = max(0, k - r), min(len(segs), k + 1 + r)
                if r and lo == 0 and hi == len(segs) and r > 1:
                    break
                key = (frames[lo], frames[hi])
                if key in stuck:
                    continue
                got = sub_problem(W, frames[lo], frames[hi])
                if got is None or len(got[1]) > window_faces:
                    break
                S, _ = got
                now = time.monotonic()
                if deadline is not None and now > deadline:
                    return frames, segs, stats
                until = now + seconds if deadline is None else min(deadline, now + seconds)
                stats["windows"] += 1
                ends = max(W.length_of(frames[lo][2]), W.length_of(frames[hi][2]))
                try:
                    out = search_width(S, lower=ends, upper=w, deadline=until)
                except Exception:  # noqa: BLE001 - a window that cannot be searched is left as it is
                    stuck.add(key)
                    continue
                if out.witness is None or out.upper is None or out.upper >= w - 1e-9:
                    stuck.add(key)
                    continue
                i1, j1 = frames[lo][0], frames[lo][1]
                moves = []
                for mv in out.witness["moves"]:
                    mv = dict(mv)
                    if mv.get("op") == "step":
                        mv["to"] = int(mv["to"]) + (i1 if mv["walk"] == "a" else j1)
                    moves.append(mv)
                frames[lo + 1:hi] = []
                segs[lo:hi] = [(float(out.upper), moves)]
                stats["narrowed"] += 1
                done = True
                break
            if done:
                break
        if not done:
            break
    return frames, segs, stats

"""Discrete homotopy height: the dispatcher, proven bounds and constructed homotopies.

Definition
----------
A homotopy moves a closed walk (or a walk with fixed ends) of a plane graph
by face flips, spikes and unspikes (see :mod:`sweepwidth.problems.homotopy`);
its height is the largest length of a walk along it, start and end included.
The homotopy height of a problem is the least height of a homotopy from the
start curve to the end condition.

Methods
-------
'bounds'
    Lower bound: the homology sweep width with the same start, end and holes
    (:func:`sweepwidth.solve.homology.homology_width`; reducing every walk of
    a homotopy mod 2 gives a homology sweep of no greater width, so the bound
    is proved), and the lengths of the start and end curves.  The reduction
    may toggle a face more than once, so the bound is the *non-monotone*
    homology width, except from the outer boundary to a point with only the
    outer face as a hole, where face orders are optimal (Brightwell and
    Winkler) and the faster monotone width is used.  A lone call gives the
    homology bound only a share of its time, so its lower bound can be below
    what :func:`sweepwidth.homology_width` proves in the same time; solved
    together (:func:`sweepwidth.solve_parameters`) the homotopy lower bound is
    at least the homology one by construction.  (From an interior curve a
    homotopy can beat every face order: see ``test_interior_start_beats_face_orders``.)  Upper bound: an
    explicit homotopy, built by sweeping faces one at a time (below) for
    several face orders, keeping the best.
'search'
    The exact bottleneck search of :mod:`sweepwidth.solve.homotopy.search`.
'auto'
    'bounds' first; when a gap remains, the exact search (given the
    constructed homotopy as its upper bound) in the time left (without a time
    limit only up to ``AUTO_SEARCH_FACES`` sweepable faces).  When the search
    stops early its settled level is kept as the lower bound: the search is a
    bottleneck Dijkstra over walk states with keys clamped at the proven lower
    bound, so when it pops a state of key ``h`` every homotopy of height
    below ``h`` would have reached an end state earlier; none has, so the
    height is at least ``h`` (``stats['bounds']['lower']`` says "exact search
    (bottleneck levels settled)"; tested against the brute force in
    ``tests/test_joint.py``).
    ``stats['auto']`` says what ran and why.

Constructing a homotopy
-----------------------
The integer chain of ``start - end`` is the boundary of a unique 2-chain
``sum c_f f`` vanishing on the holes (with no holes, the one with the
fewest flips).  The sweep repeatedly picks a face ``f`` with ``c_f != 0`` that
the current walk runs along (a *run*: consecutive darts of the walk that are
consecutive darts of f's boundary, with f on the side that reduces
``|c_f|``) and flips that run to the rest of f's boundary.  When the swept
region splits, the walk stays one curve: the flip leaves the two pieces
joined by a path traversed both ways, which later flips and unspikes
remove.  After every flip all adjacent ``d, d^1`` pairs are unspiked.  At the
end the walk must reduce to the (reduced) end curve; the reduction of the end
curve is replayed backwards with spikes, and a point end is reached by moving
the point along a shortest path (spike + unspike per edge).

Face orders tried: the Fiedler vector of the dual (spectral order, both
signs), straight-line sweeps across the drawing (when it has positions), the
homology witness order, breadth-first order of the dual from the holes, and
greedy by the change in length (ties by the breadth-first order).  An order
is followed strictly, or within a window: among the flippable faces at most
``2 sqrt(F)`` places after the earliest one, the flip that lengthens the walk
least (on Delaunay disks of 10^4 faces this lowers the height by about 15%).
With ``simple=True`` only flips that keep the walk
simple are used ("peeling"), with no spikes; when none applies, no
homotopy is reported.  A constructed homotopy that does not end where it
should (possible with several holes) is discarded.

Infeasibility
-------------
Curves are homotopic iff they are equal in the fundamental group of the
2-complex made of the graph and the non-hole faces, a free group of rank
``holes - 1`` (trivial with at most one hole).  The group is computed from a
primal spanning tree (its complement is a spanning tree of the dual); the
relator of each non-hole face eliminates the dual tree edge to its parent,
bottom-up from a root hole, so every edge gets a reduced word in the free
generators (one per non-root hole).  Closed curves are compared by cyclically
reduced words up to rotation (free homotopy = conjugacy), open curves by the
reduced word of ``start * end^-1`` (homotopy rel ends).  The variants can only
be harder: ``simple=True`` with a non-simple start or end curve is
infeasible; other variant restrictions are left to the search.

References
----------
Reidemeister-Schreier / Tietze elimination as in R. C. Lyndon and P. E. Schupp,
"Combinatorial Group Theory", Springer 1977 (free groups, cyclic reduction and
conjugacy).  D. Eppstein, "Dynamic generators of topologically embedded
graphs", SODA 2003 (tree-cotree decompositions).  E. W. Chambers, G. R. Chambers,
A. de Mesmay, T. Ophelders, R. Rotman, "Constructing monotone homotopies and
sweepouts", J. Geom. Anal. 2021 (monotone sweeps from a disk boundary suffice).
G. Brightwell and P. Winkler, "Submodular percolation", SIAM J. Discrete Math.
23(3), 2009.
"""

from __future__ import annotations

import heapq
import math
import pickle
import time
from collections import deque
from typing import Any, Callable, Iterable, Sequence

from ...errors import InputTypeError, InvalidArgumentError, OperationError, SweepwidthError
from ...problems.homotopy import Curve, HomotopyProblem, apply_move
from ...result import Result
from ..contract import Deadline, builtin_names, check_seed, get_method, make_result, method_label, methods, reject_unknown_keywords, resolve_weight
from .free_group import homotopy_classes_equal

__all__ = [
    "homotopy_height",
    "homotopy_bounds",
    "homotopy_classes_equal",
    "construct_homotopy",
    "bfs_rank",
    "METHODS",
]

#: built-in method names of :func:`homotopy_height` (from the method registry,
#: :mod:`sweepwidth.solve.contract`; the functions are in ``_METHODS``)
METHODS = tuple(sorted(builtin_names("homotopy"), key=list(methods("homotopy")).index))

#: without a time limit, 'auto' runs the exact search after the bounds only up to
#: this many sweepable faces (with a limit it always uses the time left)
AUTO_SEARCH_FACES = 40
#: share of the time limit given to the homology lower bound in 'bounds' (it runs beside the constructions)
HOMOLOGY_SHARE = 0.6
#: the homology solver is asked for this share of its budget (its set-up time
#: comes on top, whatever the limit: benchmarks/NOTES.md)
HOMOLOGY_ASK = 0.25
#: window of the windowed orders, in units of sqrt(number of faces)
WINDOW_FACTOR = 2.0
#: up to this many faces every order is also tried strictly (without a window)
SMALL_FACES = 2000
#: up to this many sweepable faces the homology bound runs in this process
#: (starting a child process costs more than the bound there: benchmarks/NOTES.md)
HOMOLOGY_INPROCESS_FACES = 200
#: homology budget (s) when no time limit is given
HOMOLOGY_DEFAULT_BUDGET = 8.0

_EPS = 1e-9




# ====================================================================== construction
def _chain_coefficients(problem: HomotopyProblem, a: Sequence[int], b: Sequence[int]) -> list[int] | None:
    """``c`` with ``chain(a) - chain(b) = sum c_f boundary(f)``, zero on the holes (None if impossible)."""
    m = len(problem.tail) // 2
    x = [0] * m
    for d in a:
        x[d >> 1] += 1 if d % 2 == 0 else -1
    for d in b:
        x[d >> 1] -= 1 if d % 2 == 0 else -1
    F = problem.n_faces
    df = problem.dart_face
    adj: list[list[int]] = [[] for _ in range(F)]
    for e in range(m):
        adj[df[2 * e]].append(e)
        adj[df[2 * e + 1]].append(e)
    holes = problem.holes
    root = min(holes) if holes else 0
    c: list[int | None] = [None] * F
    c[root] = 0
    queue = deque([root])
    while queue:
        f = queue.popleft()
        for e in adj[f]:
            left, right = df[2 * e], df[2 * e + 1]
            # coefficient of dart 2e in sum c_g boundary(g) is c_left - c_right
            if left == f and c[right] is None:
                c[right] = c[f] - x[e]  # type: ignore[operator]
                queue.append(right)
            elif right == f and c[left] is None:
                c[left] = c[f] + x[e]  # type: ignore[operator]
                queue.append(left)
    cc = [int(v or 0) for v in c]
    for e in range(m):
        if cc[df[2 * e]] - cc[df[2 * e + 1]] != x[e]:
            return None
    if holes:
        if any(cc[h] != 0 for h in holes):
            return None
    else:
        vals = sorted(cc)
        med = vals[len(vals) // 2]
        cc = [v - med for v in cc]
    return cc


class _Run:
    __slots__ = ("face", "pos", "take", "right", "gain")

    def __init__(self, face: int, pos: int, take: int, right: bool, gain: float) -> None:
        self.face, self.pos, self.take, self.right, self.gain = face, pos, take, right, gain


class _Sweeper:
    """Greedy face-by-face sweep of one curve (see the module docstring)."""

    def __init__(self, problem: HomotopyProblem, deadline: float | None) -> None:
        self.H = problem
        self.deadline = deadline
        self.face_len = [sum(problem.cost[d] for d in w) for w in problem.face_walks]

    # -- lengths
    def length(self, darts: Sequence[int]) -> float:
        return self.H.length_of(darts)

    # -- runs
    def _succ(self, d: int, f: int, right: bool) -> int:
        H = self.H
        B = H.face_walks[f]
        n = len(B)
        if right:
            return B[(H.dart_slot[d ^ 1] - 1) % n] ^ 1
        return B[(H.dart_slot[d] + 1) % n]

    def runs(self, W: tuple, c: list[int]) -> list[_Run]:
        H = self.H
        L = len(W)
        if L == 0:
            return []
        df = H.dart_face
        closed = H.closed
        holes = H.holes
        found: list[_Run] = []
        had_start: set = set()
        present: dict = {}
        for i in range(L):
            d = W[i]
            for f, right in ((df[d ^ 1], True), (df[d], False)):
                cf = c[f]
                if cf == 0 or (cf < 0) != right or f in holes:
                    continue
                key = (f, right)
                present.setdefault(key, i)
                if closed or i > 0:
                    pd = W[i - 1]
                    pf = df[pd ^ 1] if right else df[pd]
                    if pf == f and self._succ(pd, f, right) == d:
                        continue
                had_start.add(key)
                found.append(self._extend(W, i, f, right))
        for key, i in present.items():
            if key not in had_start:  # the whole closed walk runs along f
                found.append(self._extend(W, i, key[0], key[1]))
        return found

    def _extend(self, W: tuple, i: int, f: int, right: bool) -> _Run:
        H = self.H
        L = len(W)
        n = len(H.face_walks[f])
        k = 1
        g = H.cost[W[i]]
        while k < n and k < L:
            j = i + k
            if j >= L:
                if not H.closed:
                    break
                j -= L
            prev = W[(i + k - 1) % L]
            if W[j] != self._succ(prev, f, right):
                break
            g += H.cost[W[j]]
            k += 1
        return _Run(f, i, k, right, g)

    def flip_move(self, W: tuple, run: _Run) -> dict:
        H = self.H
        f = run.face
        B = H.face_walks[f]
        n = len(B)
        d0 = W[run.pos]
        if run.right:
            j0 = H.dart_slot[d0 ^ 1]
            O = [B[(j0 - x) % n] ^ 1 for x in range(n)]
        else:
            j0 = H.dart_slot[d0]
            O = [B[(j0 + x) % n] for x in range(n)]
        rest = O[run.take:]
        q = [d ^ 1 for d in reversed(rest)]
        return {"op": "flip", "face": f, "pos": run.pos, "take": run.take, "put": q}

    # -- unspikes
    def cancel(self, W: tuple, moves: list, touched: list | None) -> tuple[tuple, int]:
        """Unspike adjacent d, d^1 pairs until none is left (each recorded); returns the walk and its vertex.

        Darts next to each removed pair are appended to ``touched``.
        """
        H = self.H
        closed = H.closed
        w = list(W)
        vertex = H.tail[w[0]] if w else None
        changed = True
        while changed and len(w) >= 2:
            changed = False
            i = 0
            while len(w) >= 2 and i < len(w):
                L = len(w)
                if i + 1 < L:
                    j = i + 1
                elif closed:
                    j = 0
                else:
                    break
                if w[j] == w[i] ^ 1:
                    moves.append({"op": "unspike", "pos": i})
                    vertex = H.tail[w[i]]
                    if touched is not None:
                        touched.extend((w[i], w[j], w[i - 1], w[(j + 1) % L]))
                    if j == i + 1:
                        del w[i:i + 2]
                        i = max(i - 1, 0)
                    else:
                        w = w[1:L - 1]
                        i = max(len(w) - 2, 0)
                    changed = True
                else:
                    i += 1
        return tuple(w), vertex  # type: ignore[return-value]

    def needs_cancel(self, w: tuple, lo: int, hi: int) -> bool:
        """Whether some pair (i, i+1), lo <= i <= hi (mod L for closed walks), is d, d^1."""
        L = len(w)
        if L < 2:
            return False
        closed = self.H.closed
        for i in range(lo, hi + 1):
            if closed:
                a, b = w[i % L], w[(i + 1) % L]
            else:
                if i < 0 or i + 1 >= L:
                    continue
                a, b = w[i], w[i + 1]
            if b == a ^ 1:
                return True
        return False

    # -- runs found from one face's boundary (needs a walk with distinct darts)
    def face_best_run(self, f: int, right: bool, nxt: dict) -> tuple[float, int, int] | None:
        """Best run of face f against the walk given by its successor map: (gain, start dart, take)."""
        H = self.H
        B = H.face_walks[f]
        n = len(B)
        if right:
            O = [B[(-1 - x) % n] ^ 1 for x in range(n)]
        else:
            O = list(B)
        cost = H.cost
        best = None
        anyin = -1
        for idx in range(n):
            x = O[idx]
            if x not in nxt:
                continue
            if anyin < 0:
                anyin = idx
            prev = O[idx - 1]
            if nxt.get(prev, -2) == x and n > 1:
                continue
            k, g, cur = 1, cost[x], x
            while k < n and nxt.get(cur, -2) == O[(idx + k) % n]:
                cur = O[(idx + k) % n]
                g += cost[cur]
                k += 1
            if best is None or g > best[0] + _EPS or (abs(g - best[0]) <= _EPS and k > best[2]):
                best = (g, x, k)
        if best is None and anyin >= 0:  # the whole walk runs around f
            x = O[anyin]
            k, g, cur = 1, cost[x], x
            while k < n and nxt.get(cur, -2) == O[(anyin + k) % n]:
                cur = O[(anyin + k) % n]
                g += cost[cur]
                k += 1
            best = (g, x, k)
        return best

    # -- the sweep
    def sweep(
        self,
        start: Curve,
        coeff: list[int],
        rank: Sequence[float],
        *,
        greedy: bool,
        simple: bool,
        window: int = 0,
    ) -> tuple[Curve, list, float] | None:
        """Sweep until every coefficient is 0.  Returns (final curve, moves, height) or None.

        ``window > 0`` (order mode, not simple): among the flippable faces whose
        position in the order is within ``window`` of the earliest one, take
        the one that lengthens the walk least.
        """
        H = self.H
        closed = H.closed
        df = H.dart_face
        holes = H.holes
        c = list(coeff)
        if H.monotone and any(abs(v) > 1 for v in c):
            return None
        remaining = sum(1 for f, v in enumerate(c) if v != 0)
        W = start
        moves: list = []
        height = self.length(W.darts)
        use_unspikes = H.spikes and not simple
        if use_unspikes and W.darts:
            darts, vtx = self.cancel(W.darts, moves, None)
            W = Curve(darts, H.tail[darts[0]] if darts else vtx)
        fast = len(set(W.darts)) == len(W.darts)
        fl = self.face_len
        cost = H.cost
        total = sum(cost[d] for d in W.darts)
        heap: list = []

        def successor_map(w: tuple) -> dict:
            if not w:
                return {}
            nx_ = dict(zip(w, w[1:]))
            nx_[w[-1]] = w[0] if closed else -1
            return nx_

        nxt = successor_map(W.darts) if fast else {}

        windowed = window > 0 and not greedy and not simple
        if windowed:
            order = sorted(range(len(c)), key=lambda f: rank[f])
            posr = [0] * len(c)
            for i_, f_ in enumerate(order):
                posr[f_] = i_
        cache: dict = {}

        def push(f: int) -> None:
            if c[f] == 0 or f in holes:
                cache.pop(f, None)
                return
            right = c[f] < 0
            br = self.face_best_run(f, right, nxt)
            if br is None:
                cache.pop(f, None)
                return
            delta = fl[f] - 2 * br[0]
            if windowed:
                cache[f] = (delta, br[1], br[2], right, br[0])
                heapq.heappush(heap, (posr[f], f))
                return
            key = (delta, rank[f]) if greedy else (rank[f], delta)
            heapq.heappush(heap, (key, f, br[1], br[2], right))

        def push_darts(ds: Iterable[int]) -> None:
            seen: set = set()
            for d in ds:
                for f in (df[d], df[d ^ 1]):
                    if f not in seen:
                        seen.add(f)
                        push(f)

        if fast:
            push_darts(W.darts)
        steps = 0
        while remaining:
            steps += 1
            if self.deadline is not None and (steps & 15) == 0 and time.monotonic() > self.deadline:
                return None
            chosen = None
            if fast and windowed:
                while heap and heap[0][1] not in cache:
                    heapq.heappop(heap)
                if heap:
                    m0 = heap[0][0]
                    best = None
                    for f in order[m0:m0 + window + 1]:
                        e = cache.get(f)
                        if e is not None and (best is None or (e[0], posr[f]) < (best[1][0], posr[best[0]])):
                            best = (f, e)
                    assert best is not None
                    f, (delta, d0, k, right, gain) = best
                    r = _Run(f, W.darts.index(d0), k, right, gain)
                    mv = self.flip_move(W.darts, r)
                    chosen = (r, mv, apply_move(H, W, mv, check=False))
            elif fast:
                rejected = []
                while heap:
                    entry = heapq.heappop(heap)
                    key, f, d0, k, right = entry
                    if c[f] == 0 or (c[f] < 0) != right:
                        continue
                    br = self.face_best_run(f, right, nxt)
                    if br is None or br[1] != d0 or br[2] != k:
                        continue
                    delta = fl[f] - 2 * br[0]
                    if key != ((delta, rank[f]) if greedy else (rank[f], delta)):
                        continue
                    pos = W.darts.index(d0)
                    r = _Run(f, pos, k, right, br[0])
                    mv = self.flip_move(W.darts, r)
                    nw = apply_move(H, W, mv, check=False)
                    if simple and not self._simple_ok(nw, remaining, c, f):
                        rejected.append(entry)
                        continue
                    chosen = (r, mv, nw)
                    break
                for entry in rejected:
                    heapq.heappush(heap, entry)
            else:
                cand = self.runs(W.darts, c)
                if windowed and cand:
                    m0 = min(posr[r_.face] for r_ in cand)
                    cand = [r_ for r_ in cand if posr[r_.face] <= m0 + window]
                    cand.sort(key=lambda r: (fl[r.face] - 2 * r.gain, posr[r.face], r.pos))
                elif greedy:
                    cand.sort(key=lambda r: (fl[r.face] - 2 * r.gain, rank[r.face], r.pos))
                else:
                    cand.sort(key=lambda r: (rank[r.face], fl[r.face] - 2 * r.gain, r.pos))
                for r in cand:
                    mv = self.flip_move(W.darts, r)
                    nw = apply_move(H, W, mv, check=False)
                    if simple and not self._simple_ok(nw, remaining, c, r.face):
                        continue
                    chosen = (r, mv, nw)
                    break
            if chosen is None:
                if simple:
                    return None
                ins = self._insertion(W, c, rank)
                if ins is None:
                    return None
                ins_moves, f, right = ins
                for m_ in ins_moves:
                    W = apply_move(H, W, m_, check=False)
                    moves.append(m_)
                    height = max(height, self.length(W.darts))
                c[f] += 1 if right else -1
                if c[f] == 0:
                    remaining -= 1
                if use_unspikes and W.darts:
                    darts, vtx = self.cancel(W.darts, moves, None)
                    W = Curve(darts, H.tail[darts[0]] if darts else vtx)
                total = sum(cost[d] for d in W.darts)
                fast = len(set(W.darts)) == len(W.darts)
                if fast:
                    nxt = successor_map(W.darts)
                    heap.clear()
                    cache.clear()
                    push_darts(W.darts)
                continue
            r, mv, nw = chosen
            old = W.darts
            L = len(old)
            touched = [old[(r.pos + x) % L] for x in range(-1, r.take + 1)] + list(mv["put"])
            if fast and any(d in nxt for d in mv["put"]) and not set(mv["put"]) <= set(touched[1:-1]):
                fast = False  # a dart would appear twice: fall back to scanning the walk
            W = nw
            moves.append(mv)
            c[r.face] += 1 if r.right else -1
            if c[r.face] == 0:
                remaining -= 1
            total += sum(cost[d] for d in mv["put"]) - r.gain
            height = max(height, self._len(total, len(W.darts)))
            if use_unspikes and W.darts:
                j = len(mv["put"])
                lo = r.pos - 1 if r.pos + r.take <= L else -1
                if self.needs_cancel(W.darts, lo, lo + j + 1):
                    darts, vtx = self.cancel(W.darts, moves, touched)
                    W = Curve(darts, H.tail[darts[0]] if darts else vtx)
                    total = sum(cost[d] for d in darts)
            if fast:
                if len(set(W.darts)) != len(W.darts):
                    fast = False
                else:
                    nxt = successor_map(W.darts)
                    push_darts(touched)
        return W, moves, height

    def _insertion(self, W: Curve, c: list[int], rank: Sequence[float]) -> tuple[list, int, bool] | None:
        """No run to flip: insert a whole face boundary as a loop (after carrying a point to it).

        The loop goes round a face f with ``c_f != 0`` in the orientation that
        moves ``c_f`` towards 0; on a nonempty walk it is inserted only at a
        visit of a vertex of f whose corner on the correct side contains f.
        Returns (moves, face, right) or None.
        """
        H = self.H
        P = H.graph
        faces = sorted((f for f, v in enumerate(c) if v != 0 and f not in H.holes), key=lambda f: rank[f])
        if not faces:
            return None

        def loop_at(f: int, v: int) -> list[int] | None:
            B = H.face_walks[f]
            O = list(B) if c[f] < 0 else [d ^ 1 for d in reversed(B)]
            k = next((i for i, d in enumerate(O) if H.tail[d] == v), None)
            return None if k is None else O[k:] + O[:k]

        if not W.darts:
            # carry the point to the nearest vertex of such a face
            want: dict[int, int] = {}
            for f in faces:
                for d in H.face_walks[f]:
                    want.setdefault(H.tail[d], f)
            dist = {W.vertex: 0.0}
            heap = [(0.0, W.vertex)]
            target = None
            while heap:
                dd, a = heapq.heappop(heap)
                if dd > dist.get(a, math.inf):
                    continue
                if a in want:
                    target = a
                    break
                for d in P.darts_at(P.label(a)):
                    b = H.head[d]
                    nd = dd + H.cost[d]
                    if nd < dist.get(b, math.inf):
                        dist[b] = nd
                        heapq.heappush(heap, (nd, b))
            if target is None:
                return None
            moves = _transport(H, W.vertex, target)
            if moves is None:
                return None
            f = want[target]
            q = loop_at(f, target)
            moves.append({"op": "flip", "face": f, "pos": 0, "take": 0, "put": q})
            return moves, f, c[f] < 0
        w = W.darts
        L = len(w)
        last = L if not H.closed else L - 1  # an open walk also has its end vertex at position L
        for f in faces:
            need_right = c[f] < 0
            on_f = {H.tail[d] for d in H.face_walks[f]}
            for i in range(last + 1):
                v = H.tail[w[i]] if i < L else H.head[w[-1]]
                if v not in on_f:
                    continue
                if H.closed or 0 < i < L:
                    right_faces = self._right_corners(w[i - 1], w[i])
                    if (f in right_faces) != need_right:
                        continue
                q = loop_at(f, v)
                if q is not None:
                    return [{"op": "flip", "face": f, "pos": i, "take": 0, "put": q}], f, need_right
        if not H.spikes:
            return None
        return self._reach_by_spikes(W, c, faces, loop_at)

    def _reach_by_spikes(self, W: Curve, c: list[int], faces: list[int], loop_at: Callable) -> tuple | None:
        """No face with ``c_f != 0`` touches the walk: spike a shortest path from the walk to one,
        leaving the walk on the side that face needs, and insert the face's loop at the tip."""
        H = self.H
        P = H.graph
        w = W.darts
        L = len(w)
        last = L if not H.closed else L - 1
        best = None
        for need_right in (True, False):
            target: dict[int, int] = {}
            for f in faces:
                if (c[f] < 0) == need_right:
                    for d in H.face_walks[f]:
                        target.setdefault(H.tail[d], f)
            if not target:
                continue
            dist: dict[int, float] = {}
            via: dict[int, tuple] = {}  # vertex -> (previous vertex or None, dart, source position)
            heap: list = []
            for i in range(last + 1):
                v = H.tail[w[i]] if i < L else H.head[w[-1]]
                if H.closed or 0 < i < L:
                    first = self._side_darts(w[i - 1], w[i], need_right)
                else:
                    first = P.darts_at(P.label(v))
                for d in first:
                    nd, h = H.cost[d], H.head[d]
                    if nd < dist.get(h, math.inf):
                        dist[h] = nd
                        via[h] = (None, d, i)
                        heapq.heappush(heap, (nd, h))
            while heap:
                dd, x = heapq.heappop(heap)
                if dd > dist.get(x, math.inf):
                    continue
                if x in target:
                    if best is None or dd < best[0]:
                        best = (dd, x, target[x], via, need_right)
                    break
                for d in P.darts_at(P.label(x)):
                    h = H.head[d]
                    nd = dd + H.cost[d]
                    if nd < dist.get(h, math.inf):
                        dist[h] = nd
                        via[h] = (x, d, None)
                        heapq.heappush(heap, (nd, h))
        if best is None:
            return None
        _, x, f, via, need_right = best
        path: list[int] = []
        while True:
            prev, d, src = via[x]
            path.append(d)
            if prev is None:
                break
            x = prev
        path.reverse()
        q = loop_at(f, H.head[path[-1]])
        if q is None:
            return None
        moves = [{"op": "spike", "pos": src + k, "dart": d} for k, d in enumerate(path)]
        moves.append({"op": "flip", "face": f, "pos": src + len(path), "take": 0, "put": q})
        return moves, f, need_right

    def _side_darts(self, a: int, b: int, right: bool) -> list[int]:
        """Darts leaving ``head(a)`` on one side of the walk ``a, b`` (both walk darts included)."""
        P = self.H.graph
        start, stop = (b, a ^ 1) if right else (a ^ 1, b)
        out = [start]
        y = start
        for _ in range(len(self.H.tail)):
            if y == stop:
                break
            y = P.prev_dart(y)
            out.append(y)
        return out

    def _right_corners(self, a: int, b: int) -> set[int]:
        """Faces in the corners on the right of the walk ``a, b`` at ``head(a) = tail(b)``."""
        P = self.H.graph
        df = self.H.dart_face
        out: set[int] = set()
        y = b
        stop = a ^ 1
        for _ in range(len(self.H.tail)):
            z = P.prev_dart(y)
            out.add(df[z])
            if z == stop:
                break
            y = z
        return out

    def _len(self, total: float, ndarts: int) -> float:
        if self.H.length == "vertices":
            if self.H.closed:
                return float(ndarts) if ndarts else 1.0
            return float(ndarts + 1)
        return total

    def _simple_ok(self, nw: Curve, remaining: int, c: list[int], f: int) -> bool:
        last = remaining == 1 and abs(c[f]) == 1
        if not nw.darts:
            return last
        return self.H.is_simple(nw)


def _rotation(H: HomotopyProblem, a: Curve, b: Curve) -> int | None:
    """r with a == b[r:] + b[:r] (closed), 0 when equal (open); None if not."""
    x, y = a.darts, b.darts
    if not x or not y:
        return 0 if (not x and not y and a.vertex == b.vertex) else None
    if len(x) != len(y):
        return None
    if not H.closed:
        return 0 if x == y else None
    L = len(y)
    for r in range(L):
        if y[r] == x[0] and y[r:] + y[:r] == x:
            return r
    return None


def _inverse_move(H: HomotopyProblem, before: Curve, mv: dict, after: Curve) -> dict:
    """A move on ``after`` (exact coordinates) giving ``before`` up to rotation."""
    W, W2 = before.darts, after.darts
    L, L2 = len(W), len(W2)
    closed = H.closed

    def at_end(i: int) -> int:
        return 0 if (closed and i >= L2) else i

    op = mv["op"]
    if op == "flip":
        i, k, q = mv["pos"], mv["take"], list(mv["put"])
        j = len(q)
        if i + k <= L:
            p = list(W[i:i + k])
            pos = i if j else at_end(i)
        else:
            p = list(W[i:]) + list(W[:(i + k) % L])
            pos = 0
        return {"op": "flip", "face": mv["face"], "pos": pos, "take": j, "put": p}
    if op == "spike":
        return {"op": "unspike", "pos": mv["pos"]}
    # unspike
    i = mv["pos"]
    if i + 2 <= L:
        return {"op": "spike", "pos": at_end(i), "dart": W[i]}
    return {"op": "spike", "pos": 0, "dart": W[L - 1]}


def _shift(mv: dict, r: int, L: int) -> dict:
    if r == 0 or L == 0:
        return mv
    out = dict(mv)
    out["pos"] = (mv["pos"] - r) % L
    return out


def _reverse_homotopy(H: HomotopyProblem, start: Curve, moves: list, current: Curve) -> tuple[list, Curve] | None:
    """Moves from ``current`` (equal to the end of ``moves`` up to rotation) back to ``start``."""
    curves = [start]
    for mv in moves:
        curves.append(apply_move(H, curves[-1], mv, check=False))
    r = _rotation(H, current, curves[-1])
    if r is None:
        return None
    out = []
    cur = current
    for t in range(len(moves), 0, -1):
        inv = _shift(_inverse_move(H, curves[t - 1], moves[t - 1], curves[t]), r, len(curves[t].darts))
        cur = apply_move(H, cur, inv, check=False)
        out.append(inv)
        r = _rotation(H, cur, curves[t - 1])
        if r is None:  # pragma: no cover - would be a bug in the inverse moves
            return None
    return out, cur


def _transport(H: HomotopyProblem, u: int, v: int) -> list | None:
    """Spike/unspike moves carrying a point from u to v along a shortest path."""
    if u == v:
        return []
    if not H.spikes:
        return None
    n = H.graph.number_of_vertices()
    out: list[list[int]] = [[] for _ in range(n)]
    for d, a in enumerate(H.tail):
        out[a].append(d)
    dist = [math.inf] * n
    via = [-1] * n
    dist[u] = 0.0
    heap = [(0.0, u)]
    while heap:
        dd, a = heapq.heappop(heap)
        if dd > dist[a]:
            continue
        if a == v:
            break
        for d in out[a]:
            b = H.head[d]
            nd = dd + H.cost[d]
            if nd < dist[b]:
                dist[b] = nd
                via[b] = d
                heapq.heappush(heap, (nd, b))
    path = []
    x = v
    while x != u:
        d = via[x]
        path.append(d)
        x = H.tail[d]
    moves = []
    for d in reversed(path):
        moves.append({"op": "spike", "pos": 0, "dart": d})
        moves.append({"op": "unspike", "pos": 1})
    return moves


def bfs_rank(H: HomotopyProblem, seed: int | None = None) -> list[float]:
    """Breadth-first order of the dual from the holes (random tie-breaking with a seed)."""
    import random

    rng = random.Random(seed) if seed is not None else None
    F = H.n_faces
    df = H.dart_face
    adj: list[list[int]] = [[] for _ in range(F)]
    for e in range(len(H.tail) // 2):
        a, b = df[2 * e], df[2 * e + 1]
        adj[a].append(b)
        adj[b].append(a)
    rank = [math.inf] * F
    sources = sorted(H.holes) if H.holes else [0]
    queue = deque(sources)
    k = 0
    for s in sources:
        rank[s] = -1
    while queue:
        a = queue.popleft()
        nb = list(adj[a])
        if rng is not None:
            rng.shuffle(nb)
        for b in nb:
            if rank[b] == math.inf:
                rank[b] = k
                k += 1
                queue.append(b)
    return [x if x != math.inf else F + i for i, x in enumerate(rank)]


def _spectral_ranks(H: HomotopyProblem) -> list[list[float]]:
    """Fiedler vector of the dual restricted to the non-hole faces, as two ranks (both signs)."""
    import numpy as np

    F = H.n_faces
    keep = [f for f in range(F) if f not in H.holes]
    if len(keep) < 3:
        return []
    idx = {f: i for i, f in enumerate(keep)}
    df = H.dart_face
    rows: list[int] = []
    cols: list[int] = []
    for e in range(len(H.tail) // 2):
        a, b = df[2 * e], df[2 * e + 1]
        if a != b and a in idx and b in idx:
            rows += [idx[a], idx[b]]
            cols += [idx[b], idx[a]]
    n = len(keep)
    try:
        if n <= 300:
            A = np.zeros((n, n))
            for a, b in zip(rows, cols):
                A[a, b] += 1.0
            Lap = np.diag(A.sum(axis=1)) - A
            vals, vecs = np.linalg.eigh(Lap)
            v = vecs[:, 1]
        else:
            import scipy.sparse as sp
            import scipy.sparse.linalg as sla

            A = sp.csr_matrix((np.ones(len(rows)), (rows, cols)), shape=(n, n))
            Lap = (sp.diags(np.asarray(A.sum(axis=1)).ravel()) - A).tocsc()
            vals, vecs = sla.eigsh(Lap + sp.identity(n) * 1e-9, k=2, sigma=-1e-3, which="LM")
            v = vecs[:, int(np.argsort(vals)[1])]
    except Exception:  # pragma: no cover - numerical failure: the other orders remain
        return []
    out = []
    for sgn in (1.0, -1.0):
        rank = [float(F)] * F
        for f, i in idx.items():
            rank[f] = sgn * float(v[i])
        out.append(rank)
    return out


def _direction_ranks(H: HomotopyProblem, angles: Sequence[float] = (0, 45, 90, 135)) -> list[tuple[float, list[float]]]:
    """Straight-line sweeps across the drawing (needs vertex positions): rank = centroid projection."""
    P = H.graph
    if P.pos is None:
        return []
    cent = []
    for f, walk in enumerate(H.face_walks):
        pts = [P.pos.get(P.label(H.tail[d])) for d in walk]
        pts = [p for p in pts if p is not None]
        if not pts:
            return []
        cent.append((sum(p[0] for p in pts) / len(pts), sum(p[1] for p in pts) / len(pts)))
    out = []
    for ang in angles:
        a = math.radians(ang)
        ux, uy = math.cos(a), math.sin(a)
        out.append((ang, [x * ux + y * uy for x, y in cent]))
    return out


def construct_homotopy(
    problem: HomotopyProblem,
    rank: Sequence[float],
    *,
    greedy: bool = False,
    simple: bool | None = None,
    deadline: float | None = None,
    window: int = 0,
) -> tuple[float, dict] | None:
    """Build one homotopy from the problem's start to its end by sweeping faces.

    Parameters
    ----------
    problem : HomotopyProblem
    rank : sequence of float
        Priority of each face (smaller first); with ``greedy`` only a tie-breaker.
    greedy : bool
        Choose the flip that lengthens the walk least.
    window : int
        With ``greedy=False``: choose the flip that lengthens the walk least
        among the faces at most ``window`` places after the earliest flippable
        face of the order (0: strictly in order).
    simple : bool, optional
        Only flips that keep the walk simple, no spikes (default: ``problem.simple``).
    deadline : float, optional
        ``time.monotonic()`` value; None is returned when it passes.

    Returns
    -------
    (height, witness) or None
        None when this order does not give a homotopy (stuck, wrong class, deadline).

    Notes
    -----
    O(M * L) time for M moves and walks of length at most L.

    Examples
    --------
    >>> from sweepwidth.generators import triangulated_grid
    >>> H = HomotopyProblem.build(triangulated_grid(3))
    >>> h, wit = construct_homotopy(H, bfs_rank(H), greedy=True)
    >>> h >= H.length_of(H.start)
    True
    """
    H = problem
    simple = H.simple if simple is None else simple
    end = H.end
    coeff = _chain_coefficients(H, H.start.darts, end.darts if end is not None else ())
    if coeff is None:
        return None
    S = _Sweeper(H, deadline)
    res = S.sweep(H.start, coeff, rank, greedy=greedy, simple=simple, window=window)
    if res is None:
        return None
    W, moves, height = res
    if end is not None:
        if simple:
            if _rotation(H, W, end) is None:
                return None
        else:
            # reduce the end curve too and replay its reduction backwards
            red: list = []
            if H.spikes and end.darts:
                darts, vtx = S.cancel(end.darts, red, None)
                R = Curve(darts, H.tail[darts[0]] if darts else vtx)
            else:
                R = end
            if not W.darts and not R.darts and W.vertex != R.vertex:
                tr = _transport(H, W.vertex, R.vertex)
                if tr is None:
                    return None
                for mv in tr:
                    W = apply_move(H, W, mv, check=False)
                    height = max(height, S.length(W.darts))
                moves.extend(tr)
            back = _reverse_homotopy(H, end, red, W)
            if back is None:
                return None
            bm, W = back
            # the replayed reduction passes through the end's reduction backwards
            moves.extend(bm)
            height = max(height, _replay_height(H, end, red))
    elif W.darts:
        return None
    if not all(float(x).is_integer() for x in H.cost):
        # lengths were updated incrementally: recompute them exactly as sums along each walk
        height = _replay_height(H, H.start, moves)
    witness = {"start": H.to_json(H.start), "moves": moves}
    return height, witness


def _replay_height(H: HomotopyProblem, start: Curve, moves: list) -> float:
    h = H.length_of(start)
    c = start
    for mv in moves:
        c = apply_move(H, c, mv, check=False)
        h = max(h, H.length_of(c))
    return h


# ====================================================================== bounds
def _z2(darts: Sequence[int]) -> set[int]:
    out: set[int] = set()
    for d in darts:
        out ^= {d >> 1}
    return out


def _homology_child(problem: Any, monotone: bool, limit: float, *, progress: Callable) -> Result:
    """In a child process: the homology bound of a built problem (it crossed pickled, once)."""
    from ..homology import solve_problem

    return solve_problem(problem, deadline=Deadline.from_limit(limit), monotone=monotone)


def _homology_lower(
    H: HomotopyProblem, budget: float, hard_deadline: float | None = None
) -> tuple[float | None, dict, list | None]:
    """Homology width with the same start/end/holes as a lower bound (closed curves).

    With ``hard_deadline`` (and more than ``HOMOLOGY_INPROCESS_FACES`` faces)
    the homology solver runs in a child process killed then; it is asked for ``HOMOLOGY_ASK * budget`` seconds because its
    set-up time comes on top of its time limit.
    """
    info: dict = {}
    if not H.closed:
        info["homology"] = "not used: the homology sweep is defined for cycles, these are paths"
        return None, info, None
    from ...problems.cycles import HomologyProblem
    from ..homology import solve_problem as solve_homology

    P = H.graph
    if H.length == "vertices":
        P = P.with_weights([1.0] * P.number_of_edges())
    z0 = _z2(H.start.darts)
    z1 = _z2(H.end.darts) if H.end is not None else set()
    # Face orders (monotone sweeps) are optimal among all Z2 sweeps only when the width is a
    # cut function of the swept set (Brightwell-Winkler): from the outer boundary to nothing
    # with the outer face the only hole.  Otherwise a homotopy's reduction may toggle a face
    # twice and beat every face order, so only the non-monotone width is a lower bound.
    # (A monotone homotopy flips each face at most once: its reduction is a face order.)
    disk = H.monotone or ((not z1) and H.holes == frozenset({H.graph.outer_face}) and z0 == set(
        H.graph.face_boundary_cycle(H.graph.outer_face)))
    limit = max(budget * HOMOLOGY_ASK, 0.3)
    info["homology_monotone"] = disk
    try:
        problem = HomologyProblem.build(P, z0, z1, sorted(H.holes))
        if hard_deadline is None or len(H.sweepable_faces) <= HOMOLOGY_INPROCESS_FACES:
            r = solve_homology(problem, deadline=Deadline.from_limit(limit), monotone=disk)
        else:
            from .._deadline import run_limited

            done, r, _ = run_limited(_homology_child, (problem, disk, limit), deadline=hard_deadline)
            if not done:
                info["homology"] = "stopped at its time budget without a result"
                return None, info, None
    except SweepwidthError as err:
        info["homology"] = f"failed: {err}"
        return None, info, None
    info["homology"] = {"status": r.status, "lower": r.lower, "upper": r.upper, "method": r.method,
                        "seconds": round(r.seconds, 3)}
    if r.status == "infeasible" or r.lower is None:
        return None, info, None
    order = list(r.witness) if (disk and isinstance(r.witness, (list, tuple))) else None
    return float(r.lower), info, order


def homotopy_bounds(
    problem: HomotopyProblem,
    *,
    deadline: float | None = None,
    seed: int | None = None,
    homology_budget: float | None = None,
    hard_deadline: float | None = None,
    homology: tuple[float | None, dict, list | None] | None = None,
) -> dict:
    """Proven lower bound, best constructed homotopy and how each was obtained.

    Parameters
    ----------
    problem : HomotopyProblem
    deadline : float, optional
        ``time.monotonic()`` value for the whole computation.
    seed : int, optional
        Adds a breadth-first order with random tie-breaking.
    homology_budget : float, optional
        Seconds for the homology lower bound (default: a share of the time left).
    hard_deadline : float, optional
        Until no homotopy is built, constructions may run until this later
        deadline (so that a short time limit still ends with a witness).
    homology : (lower, info, face order), optional
        A homology result computed elsewhere (by :func:`sweepwidth.solve_parameters`):
        its lower bound must be one for this homotopy problem (the
        non-monotone width, or the monotone width from the outer boundary to
        a point) and its face order is tried as a construction order.  The
        homology bound is then not computed again.

    Returns
    -------
    dict
        ``lower``, ``upper`` (None if no homotopy was built), ``witness``,
        ``bounds`` (sources), ``orders`` (height per face order tried), ``homology``.

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> b = homotopy_bounds(HomotopyProblem.build(wheel(5)))
    >>> b["lower"] <= b["upper"]
    True
    """
    import threading

    H = problem
    t0 = time.monotonic()
    left = None if deadline is None else deadline - t0
    if homology_budget is None:
        homology_budget = HOMOLOGY_DEFAULT_BUDGET if left is None else max(0.2, HOMOLOGY_SHARE * left)
    trivial = max(H.length_of(H.start), H.length_of(H.end) if H.end is not None else 0.0)
    lower = trivial
    sources = {"lower": "length of the start and end curves"}
    # the homology bound: in a time-limited child, beside the constructions
    hom: dict = {}

    def run_homology() -> None:
        hard = None if deadline is None else min(deadline - 0.3, t0 + homology_budget)
        try:
            hom["result"] = _homology_lower(H, homology_budget, hard)
        except Exception as err:  # a child that cannot start (e.g. unguarded __main__): no bound
            hom["result"] = (None, {"homology": f"failed: {type(err).__name__}: {err}"}, None)

    worker = None
    if homology is not None:
        hom["result"] = homology
    elif deadline is None:
        run_homology()
    else:
        worker = threading.Thread(target=run_homology, daemon=True)
        worker.start()
    F = H.n_faces
    bfs = bfs_rank(H)
    # (name, rank, greedy, window); windows of 2 sqrt(F) faces beat strict orders on
    # Delaunay disks (benchmarks/homotopy_bounds.py); strict orders are kept on small inputs
    win = max(2, round(WINDOW_FACTOR * math.sqrt(F)))
    small = F <= SMALL_FACES
    orders: list[tuple[str, Any, bool, int]] = []
    geo = [(f"spectral order of the dual ({'+-'[k]})", rank) for k, rank in enumerate(_spectral_ranks(H))]
    angles = (0, 45, 90, 135) if small else (0, 90)
    geo += [(f"straight sweep of the drawing at {ang:g} degrees", rank) for ang, rank in _direction_ranks(H, angles)]
    if geo:  # the fastest reliable one first: a witness early under short time limits
        orders.append((geo[0][0], geo[0][1], False, 0))
    for name, rank in geo:
        orders.append((f"{name}, window {win}", rank, False, win))
    orders.append(("greedy by length", bfs, True, 0))
    orders.append(("homology order", None, False, 0))
    if small:
        for name, rank in geo[1:]:
            orders.append((name, rank, False, 0))
        orders.append(("homology order, window", None, False, win))
    orders.append(("breadth-first from the holes", bfs, False, 0))
    if seed is not None:
        orders.append((f"greedy, random breadth-first ties (seed {seed})", bfs_rank(H, seed), True, 0))
    best: tuple[float, dict] | None = None
    best_name = None
    tried: dict = {}
    modes = [H.simple]
    if not H.simple and not H.spikes:
        modes.append(True)  # peeling needs no spikes
    for name, rank, greedy, window in orders:
        if rank is None:  # the homology witness order, once the homology bound is in
            if worker is not None:
                worker.join(None if deadline is None else max(0.0, deadline - time.monotonic()))
            horder = hom.get("result", (None, {}, None))[2]
            if not horder:
                tried[name] = "not available"
                continue
            rank = [float(F + f) for f in range(F)]
            for k, f in enumerate(horder):
                if isinstance(f, int) and 0 <= f < F and rank[f] >= F:
                    rank[f] = float(k)
        for simple in modes:
            label = name + (" (peeling)" if simple and not H.simple else "")
            if best is not None and best[0] <= trivial + _EPS:
                tried[label] = "skipped (the best one meets the lower bound)"
                continue
            until = deadline
            if best is None and hard_deadline is not None and deadline is not None:
                until = max(deadline, hard_deadline)
            if until is not None and time.monotonic() > until:
                tried[label] = "skipped (time limit)"
                continue
            got = construct_homotopy(H, rank, greedy=greedy, simple=simple, deadline=until, window=window)
            if got is None:
                stopped = until is not None and time.monotonic() > until
                tried[label] = "stopped (time limit)" if stopped else "no homotopy from this order"
            else:
                tried[label] = got[0]
            if got is not None and (best is None or got[0] < best[0] - _EPS):
                best, best_name = got, label
    if worker is not None:
        worker.join(None if deadline is None else max(0.0, deadline - time.monotonic()))
    hl, info, _ = hom.get("result", (None, {"homology": "still running at the time limit"}, None))
    if "homology_monotone" in info and isinstance(info.get("homology"), dict):
        info["homology"]["monotone"] = info["homology_monotone"]
    if hl is not None:
        extra = 1.0 if (H.length == "vertices" and not H.closed) else 0.0
        if hl + extra > lower:
            lower = hl + extra
            sources["lower"] = "homology sweep width (reduce every walk mod 2)"
    if best is not None:
        sources["upper"] = f"constructed homotopy ({best_name})"
    else:
        sources["upper"] = "no homotopy constructed"
    return {
        "lower": lower,
        "upper": None if best is None else best[0],
        "witness": None if best is None else best[1],
        "bounds": sources,
        "orders": tried,
        "homology": info.get("homology"),
        "seconds": time.monotonic() - t0,
    }


# ====================================================================== search
def _search_here(problem: HomotopyProblem, kw: dict, *, progress: Callable) -> Any:
    from .search import search_homotopy

    return search_homotopy(problem, progress=progress, **kw)


def _run_search(H: HomotopyProblem, deadline: float | None, upper: float | None, witness: dict | None,
                lower: float | None, isolate: bool = False, max_memory: int | None = None) -> tuple[Any, str]:
    """Run the exact search; (outcome or None, note).

    By default in this process under the search's own cooperative deadline
    (starting a child would take a large share of short limits:
    ``benchmarks/NOTES.md``).  ``isolate=True``
    runs it in a child killed at the deadline instead.
    """
    from .._deadline import run_limited

    kw = {"upper": upper, "upper_witness": witness, "lower": lower, "deadline": deadline}
    if max_memory is not None:
        kw["max_memory"] = max_memory
    if deadline is None or not isolate:
        done, value, reports = run_limited(_search_here, (H, kw), deadline=None)
        return value, "finished" if deadline is None else "ran in this process under its own deadline"
    try:
        # the problem crosses to the child once, pickled as it is (no graph rebuilt there)
        done, value, reports = run_limited(_search_here, (H, kw), deadline=deadline + 0.4)
    except (RuntimeError, OSError, TypeError, AttributeError, pickle.PicklingError) as err:
        if isinstance(err, SweepwidthError):
            raise
        # no child process possible (e.g. a script without a __main__ guard)
        done, value, reports = run_limited(_search_here, (H, kw), deadline=None)
        return value, f"ran in this process ({type(err).__name__} starting a child)"
    if done:
        return value, "finished"
    if reports:
        return reports[-1], "stopped at the time limit (best reported bounds)"
    return None, "stopped at the time limit before reporting"


# ====================================================================== dispatcher
def _validate(P: Any, method: str) -> None:
    if not hasattr(P, "face_darts") or not hasattr(P, "outer_face"):
        raise InputTypeError(f"homotopy_height needs a PlaneGraph, got {type(P).__name__}")
    get_method("homotopy", method)


def _summary(H: HomotopyProblem) -> dict:
    def one(c: Curve | None) -> Any:
        if c is None:
            return "a point anywhere"
        return {"darts": len(c.darts), "length": H.length_of(c), "vertex": H.graph.label(c.vertex)}

    return {"holes": sorted(H.holes), "start": one(H.start), "end": one(H.end)}


class _State:
    """What the methods of :func:`homotopy_height` know so far (bounds, witness, notes)."""

    def __init__(self, H: HomotopyProblem, t0: float, deadline: float | None, seed: int | None,
                 stats: dict) -> None:
        self.H, self.t0, self.deadline, self.seed, self.stats = H, t0, deadline, seed, stats
        self.lower: float = max(H.length_of(H.start), H.length_of(H.end) if H.end is not None else 0.0)
        self.upper: float | None = None
        self.witness: dict | None = None
        self.bounds = {"lower": "length of the start and end curves", "upper": "none"}
        self.used = ""
        self.infeasible_reason: str | None = None
        self.max_memory: int | None = None  # None: the search's default
        self.homology: tuple[float | None, dict, list | None] | None = None  # a homology result given from outside

    @property
    def gap_open(self) -> bool:
        return self.upper is None or self.upper - self.lower > _EPS


def _method_bounds(st: _State, share: float = 1.0) -> None:
    """Proven lower bound and the best constructed homotopy (see :func:`homotopy_bounds`)."""
    sub = None if st.deadline is None else st.t0 + share * (st.deadline - st.t0)
    b = homotopy_bounds(st.H, deadline=sub, seed=st.seed, hard_deadline=st.deadline, homology=st.homology)
    st.lower, st.upper, st.witness = b["lower"], b["upper"], b["witness"]
    st.bounds = dict(b["bounds"])
    st.stats["orders"] = b["orders"]
    st.stats["homology"] = b["homology"]
    st.used = "bounds"


def _merge_search(st: _State, out: Any, note: str) -> None:
    st.stats["search"] = {"note": note, **{k: v for k, v in dict(out.stats).items()
                                           if isinstance(v, (int, float, str, bool))}}
    if out.lower is not None and out.lower > st.lower + _EPS:
        st.lower = float(out.lower)
        st.bounds["lower"] = "exact search (bottleneck levels settled)"
    if out.upper is not None and out.witness is not None and (st.upper is None or out.upper < st.upper - _EPS):
        st.upper, st.witness = float(out.upper), out.witness
        st.bounds["upper"] = "exact search witness"
    if out.optimal and out.upper is not None:
        st.lower = max(st.lower, float(out.upper))
    if out.upper is None and dict(out.stats).get("infeasible"):
        st.infeasible_reason = dict(out.stats).get("reason") or "exhaustive search: no homotopy under these rules"


def _method_search(st: _State) -> None:
    """The exact search, started from a quick constructed homotopy."""
    H, deadline = st.H, st.deadline
    quick = None if deadline is None else time.monotonic() + 0.15 * (deadline - time.monotonic())
    got = construct_homotopy(H, bfs_rank(H), greedy=True, deadline=quick)
    if got is not None:
        st.upper, st.witness = got
        st.bounds["upper"] = "constructed homotopy (greedy by length)"
    out, note = _run_search(H, deadline, st.upper, st.witness, st.lower, max_memory=st.max_memory)
    if out is None:
        raise OperationError(f"method 'search': {note}")
    reason = str(dict(out.stats).get("reason") or "")
    if not out.optimal and reason.startswith("memory limit"):
        from ...errors import ProblemTooLargeError

        raise ProblemTooLargeError(
            f"method 'search' stopped: {reason}, with bounds [{out.lower:g}, "
            f"{'none' if out.upper is None else format(out.upper, 'g')}]; raise max_memory or use method='bounds'"
        )
    st.used = "search"
    _merge_search(st, out, note)


def _method_auto(st: _State) -> None:
    """'bounds' in 60% of the time; then the exact search in the rest when a gap remains."""
    _method_bounds(st, share=0.6)
    if not st.gap_open:
        st.stats["auto"] = "the bounds met: no search needed"
        return
    nf = len(st.H.sweepable_faces)
    if st.upper is None and nf > AUTO_SEARCH_FACES:
        st.stats["auto"] = f"exact search skipped: no constructed homotopy to start from on {nf} sweepable faces"
        return
    if st.deadline is None and nf > AUTO_SEARCH_FACES:
        st.stats["auto"] = f"exact search skipped: {nf} sweepable faces > {AUTO_SEARCH_FACES} and no time limit"
        return
    if st.deadline is not None and time.monotonic() > st.deadline - 0.3:
        st.stats["auto"] = "exact search skipped: no time left"
        return
    try:
        out, note = _run_search(st.H, st.deadline, st.upper, st.witness, st.lower, max_memory=st.max_memory)
    except Exception as err:  # noqa: BLE001 - 'auto' keeps its proven bounds whatever the search does
        st.stats["auto"] = f"exact search failed ({type(err).__name__}: {err}); bounds kept"
        return
    if out is None:
        st.stats["auto"] = note
        return
    st.used = "bounds+search"
    _merge_search(st, out, note)
    st.stats["auto"] = f"exact search: {note}"


def _method_added(st: _State, fn: Callable[..., Any], name: str) -> None:
    """A registered method: ``fn(problem, deadline=Deadline, seed=seed)`` returns a mapping or object
    with ``lower``, ``upper``, ``witness`` (``{"start": walk, "moves": [...]}``) and optionally ``stats``."""
    out = fn(st.H, deadline=Deadline.at_time(st.deadline), seed=st.seed)
    get = out.get if isinstance(out, dict) else (lambda k, d=None: getattr(out, k, d))
    lower, upper = get("lower", None), get("upper", None)
    if lower is not None:
        st.lower = max(st.lower, float(lower))
    if upper is not None:
        st.upper, st.witness = float(upper), get("witness", None)
    st.stats[name] = get("stats", None) or {}
    st.bounds = {"lower": f"method {name!r}", "upper": f"method {name!r}"}
    st.used = name


#: the built-in methods of :func:`homotopy_height`, by name
_METHODS: dict[str, Callable[[_State], None]] = {
    "auto": _method_auto,
    "bounds": _method_bounds,
    "search": _method_search,
}
assert set(_METHODS) == builtin_names("homotopy"), "registry and dispatcher disagree"


@reject_unknown_keywords
def homotopy_height(
    P: Any,
    *,
    start: Any = None,
    end: Any = None,
    spikes: bool = True,
    simple: bool = False,
    monotone: bool = False,
    weight: str = "weight",
    holes: Any = None,
    s: Any = None,
    t: Any = None,
    method: str = "auto",
    time_limit: float | None = None,
    seed: int | None = None,
    length: str | None = None,
    max_memory: int | None = None,
) -> Result:
    """The discrete homotopy height of a plane graph, exact or with proven bounds, with a witness.

    A homotopy moves a closed walk (or a walk from ``s`` to ``t``) by face
    flips, spikes and unspikes; its height is the largest walk length along it.
    This computes the least height from ``start`` to the end condition.

    Parameters
    ----------
    P : PlaneGraph
    start, end : curve, optional
        Dart lists, vertex lists or ``{"vertex": v, "darts": [...]}`` (see
        :mod:`sweepwidth.problems.homotopy`).  Default: the outer boundary to a
        point anywhere; with ``s`` and ``t``: the outer boundary path from s to t
        one way to the other way.
    spikes : bool
        Allow spike and unspike moves.
    simple : bool
        Every walk but a final point must be a simple cycle (path).
    monotone : bool
        Each face flipped at most once.
    weight : {'weight', 'vertices'}
        How a walk is measured: the edge weights, or the vertices it visits
        (graph-drawing convention).  The same keyword as in
        :func:`~sweepwidth.solve.cutwidth` and :func:`~sweepwidth.solve.homology_width`.
    length : {'weight', 'vertices'}, optional
        Deprecated spelling of ``weight`` (warns with :class:`DeprecationWarning`).
    holes : collection of face ids, optional
        Faces never flipped; default ``{P.outer_face}``.
    s, t : vertex labels, optional
        Fixed ends (on the outer face) of open walks.
    method : {'auto', 'bounds', 'search'}
        See the module docstring.
    time_limit : float, optional
        Seconds; the answer comes within about a second of it ('bounded' with
        the best witness when the optimum is not proved).
    seed : int, optional
        Adds a randomised face order to the constructions.
    max_memory : int, optional
        Bytes the exact search may fill with stored walk states (default 1 GiB,
        as for the cutwidth subset DP).  'search' refuses a problem whose
        forced states alone exceed it, and raises when the limit is reached
        before the optimum is proved; 'auto' keeps the bounds reached then.

    Returns
    -------
    Result
        ``parameter='homotopy'``; ``witness = {"start": walk, "moves": [...]}``;
        ``stats`` holds ``options`` (what the checker replays against),
        ``holes``, ``start``, ``end``, ``bounds`` (how each bound was obtained),
        ``orders`` and, for 'auto', ``auto``.  Not homotopic: status
        'infeasible' with ``stats['reason']``.

    Raises
    ------
    InvalidCurveError
        A start or end that is not a walk of P, s or t off the outer face.
    UnsupportedOptionError
        Unknown method or length convention.
    SweepwidthError
        Bad holes, time limit or seed; method 'search' when it is not installed.
    ProblemTooLargeError
        Method 'search' whose stored states are estimated (before it starts)
        or counted (while it runs) above ``max_memory``.

    Notes
    -----
    'bounds' runs in O(F * L) per face order for F faces and walks of length
    at most L, plus the homology bound's budget.  'search' is exponential.

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> r = homotopy_height(wheel(4), method="bounds")
    >>> r.lower <= r.upper, r.check(wheel(4)) == r.upper
    (True, True)
    """
    t0 = time.monotonic()
    dl = Deadline.from_limit(time_limit, start=t0)
    seed = check_seed(seed)
    if length is None:
        weight = resolve_weight("homotopy", weight, allowed=("weight", "vertices"))
    else:
        weight = resolve_weight("homotopy", weight, allowed=("weight", "vertices"), length=length)
    _validate(P, method)
    if max_memory is not None:
        if isinstance(max_memory, bool) or not isinstance(max_memory, int) or max_memory <= 0:
            raise InvalidArgumentError(f"max_memory must be a positive number of bytes, got {max_memory!r}")
    H = HomotopyProblem.build(P, start=start, end=end, spikes=spikes, simple=simple, monotone=monotone,
                              length=weight, holes=holes, s=s, t=t)
    return solve_problem(H, method=method, deadline=dl, seed=seed, started=t0, max_memory=max_memory)


def solve_problem(H: HomotopyProblem, *, method: str = "auto", deadline: Deadline, seed: int | None = None,
                  started: float | None = None, max_memory: int | None = None,
                  homology: tuple[float | None, dict, list | None] | None = None) -> Result:
    """Homotopy height of a built :class:`~sweepwidth.problems.homotopy.HomotopyProblem` under a :class:`Deadline`.

    The internal entry point behind :func:`homotopy_height`: arguments are
    already checked and the deadline is passed down as it is.  ``homology``
    (lower bound, info, face order) is a homology result computed by the
    caller, used instead of computing the homology bound again (see
    :func:`homotopy_bounds`; :func:`sweepwidth.solve_parameters` passes it).
    """
    t0 = time.monotonic() if started is None else started
    entry = get_method("homotopy", method)
    stats: dict = {"options": H.options(), **_summary(H), "seed": seed}
    ok, reason = homotopy_classes_equal(H)
    if not ok:
        return make_result("homotopy", lower=None, upper=None, witness=None, method=method,
                           seconds=time.monotonic() - t0, stats=stats, infeasible=reason)
    stats["feasibility"] = reason
    st = _State(H, t0, deadline.at, seed, stats)
    st.max_memory = max_memory
    st.homology = homology
    if entry.function is not None:
        _method_added(st, entry.load(), entry.name)  # type: ignore[arg-type]
    else:
        _METHODS[method](st)
    lower, upper, witness, bounds, used = st.lower, st.upper, st.witness, st.bounds, st.used
    infeasible_reason = st.infeasible_reason
    stats["bounds"] = bounds
    seconds = time.monotonic() - t0
    if infeasible_reason is not None and upper is None:
        return make_result("homotopy", lower=None, upper=None, witness=None, method=used, seconds=seconds,
                           stats=stats, infeasible=infeasible_reason)
    if upper is not None and lower > upper + _EPS:  # pragma: no cover - would be a bug in a bound
        stats["warning"] = f"lower bound {lower:g} above the witness height {upper:g}: lowered to it"
        lower = upper
    if method == "auto" and isinstance(stats.get("auto"), str):
        stats["auto"] = {"choice": used, "reason": stats["auto"]}
    return make_result("homotopy", lower=lower, upper=upper, witness=witness, method=method_label(method, used),
                       seconds=seconds, stats=stats, optimal=upper is not None and upper - lower <= _EPS)

"""Homotopies built face by face: the upper-bound witnesses of homotopy height.

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

See Also
--------
sweepwidth.solve.homotopy.bounds.homotopy_bounds : tries several face orders and keeps the best.
"""

from __future__ import annotations

import heapq
import math
import time
from collections import deque
from typing import Callable, Iterable, Sequence

from ...problems.homotopy import Curve, HomotopyProblem, apply_move

__all__ = ["construct_homotopy", "bfs_rank"]

_EPS = 1e-9


# ====================================================================== construction
# the faces' edge lists for the last dart-to-face table seen (shared by problems made with dataclasses.replace)
_LAST_ADJ: list = [None, None]


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
    if _LAST_ADJ[0] is df:
        adj: list[list[int]] = _LAST_ADJ[1]
    else:
        adj = [[] for _ in range(F)]
        for e in range(m):
            adj[df[2 * e]].append(e)
            adj[df[2 * e + 1]].append(e)
        _LAST_ADJ[:] = [df, adj]
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


# the face lengths and whether every cost is an integer, for the last (cost, face walks) pair seen:
# problems made by dataclasses.replace share these tuples, so repeated constructions skip the O(F) work
_LAST_COSTS: list = [None, None, None, False]


def _cost_facts(problem: HomotopyProblem) -> tuple[list[float], bool]:
    last = _LAST_COSTS
    if last[0] is not problem.cost or last[1] is not problem.face_walks:
        cost = problem.cost
        last[:] = [cost, problem.face_walks, [sum(cost[d] for d in w) for w in problem.face_walks],
                   all(float(x).is_integer() for x in cost)]
    return last[2], last[3]


def _face_lengths(problem: HomotopyProblem) -> list[float]:
    return _cost_facts(problem)[0]


class _Sweeper:
    """Greedy face-by-face sweep of one curve (see the module docstring)."""

    def __init__(self, problem: HomotopyProblem, deadline: float | None) -> None:
        self.H = problem
        self.deadline = deadline
        self.face_len = _face_lengths(problem)

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
    if not _cost_facts(H)[1]:
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


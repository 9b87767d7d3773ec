"""Compiled inner loops for the ordering solvers (numba), with numpy fallbacks.

Most kernels exist twice: a numba-compiled version used when numba imports,
and a plain numpy / Python version with the same results (slower, and used
with smaller size limits); the window and routing kernels run as plain Python
without numba (same results, slower).  Nothing outside :mod:`sweepwidth.solve` imports
this module.
"""

from __future__ import annotations

import math

import numpy as np

try:  # pragma: no cover - depends on the installation
    import numba

    HAVE_NUMBA = True
except Exception:  # pragma: no cover
    numba = None  # type: ignore[assignment]  # optional dependency: no module when numba is missing
    HAVE_NUMBA = False

__all__ = [
    "HAVE_NUMBA", "csr_with_ids", "edge_betweenness", "subset_dp", "move_pass", "prefix_search",
    "profile", "window_pass", "route_sources",
]


def _jit(fn):
    if HAVE_NUMBA:
        return numba.njit(cache=True, nogil=True)(fn)
    return fn


def csr_with_ids(n: int, edges: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Adjacency in compressed rows with the edge id of every slot."""
    m = edges.shape[0]
    src = np.concatenate([edges[:, 0], edges[:, 1]]).astype(np.int64)
    dst = np.concatenate([edges[:, 1], edges[:, 0]]).astype(np.int64)
    ids = np.concatenate([np.arange(m), np.arange(m)]).astype(np.int64)
    order = np.argsort(src, kind="stable")
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.add.at(indptr, src + 1, 1)
    return np.cumsum(indptr), dst[order], ids[order]


# ---------------------------------------------------------------- betweenness


def _betweenness_py(n, indptr, indices, eid, m, sources):  # pragma: no cover - fallback
    load = np.zeros(m)
    for s in sources:
        dist = np.full(n, -1, dtype=np.int64)
        sigma = np.zeros(n)
        stack = []
        dist[s] = 0
        sigma[s] = 1.0
        queue = [s]
        head = 0
        while head < len(queue):
            v = queue[head]
            head += 1
            stack.append(v)
            for j in range(indptr[v], indptr[v + 1]):
                w = indices[j]
                if dist[w] < 0:
                    dist[w] = dist[v] + 1
                    queue.append(w)
                if dist[w] == dist[v] + 1:
                    sigma[w] += sigma[v]
        delta = np.zeros(n)
        for w in reversed(stack):
            for j in range(indptr[w], indptr[w + 1]):
                v = indices[j]
                if dist[v] == dist[w] - 1:
                    c = sigma[v] / sigma[w] * (1.0 + delta[w])
                    load[eid[j]] += c
                    delta[v] += c
    return load


@_jit
def _betweenness_nb(n, indptr, indices, eid, m, sources):  # pragma: no cover - compiled
    load = np.zeros(m)
    dist = np.empty(n, dtype=np.int64)
    sigma = np.empty(n)
    delta = np.empty(n)
    queue = np.empty(n, dtype=np.int64)
    for s in sources:
        for i in range(n):
            dist[i] = -1
            sigma[i] = 0.0
            delta[i] = 0.0
        dist[s] = 0
        sigma[s] = 1.0
        queue[0] = s
        head = 0
        tail = 1
        while head < tail:
            v = queue[head]
            head += 1
            for j in range(indptr[v], indptr[v + 1]):
                w = indices[j]
                if dist[w] < 0:
                    dist[w] = dist[v] + 1
                    queue[tail] = w
                    tail += 1
                if dist[w] == dist[v] + 1:
                    sigma[w] += sigma[v]
        for q in range(tail - 1, -1, -1):
            w = queue[q]
            for j in range(indptr[w], indptr[w + 1]):
                v = indices[j]
                if dist[v] == dist[w] - 1:
                    c = sigma[v] / sigma[w] * (1.0 + delta[w])
                    load[eid[j]] += c
                    delta[v] += c
    return load


def edge_betweenness(
    n: int, indptr: np.ndarray, indices: np.ndarray, eid: np.ndarray, m: int, sources: np.ndarray | None = None
) -> np.ndarray:
    """Shortest-path (hop count) load of every edge from the given sources.

    Each pair ``(s, t)`` with ``s`` in ``sources`` (default: all vertices)
    sends one unit split evenly over the shortest ``s``-``t`` paths (Brandes'
    accumulation).  ``O(|sources| m)``.
    """
    if sources is None:
        sources = np.arange(n, dtype=np.int64)
    fn = _betweenness_nb if HAVE_NUMBA else _betweenness_py
    return fn(n, indptr, indices, eid, m, np.asarray(sources, dtype=np.int64))


# ---------------------------------------------------------------- subset DP


@_jit
def _subset_dp_nb(k, indptr, indices, wts, deg, base_in, cut0):  # pragma: no cover - compiled
    size = 1 << k
    cut = np.empty(size)
    best = np.empty(size)
    cut[0] = cut0
    best[0] = cut0
    for S in range(1, size):
        low = S & (-S)
        v = 0
        while (1 << v) != low:
            v += 1
        inside = base_in[v]
        rest = S ^ low
        for j in range(indptr[v], indptr[v + 1]):
            u = indices[j]
            if (rest >> u) & 1:
                inside += wts[j]
        c = cut[rest] + deg[v] - 2.0 * inside
        cut[S] = c
        m = np.inf
        T = S
        while T:
            b = T & (-T)
            x = best[S ^ b]
            if x < m:
                m = x
            T ^= b
        best[S] = c if c > m else m
    return cut, best


def _subset_dp_np(k, indptr, indices, wts, deg, base_in, cut0):  # pragma: no cover - fallback
    size = 1 << k
    S = np.arange(size, dtype=np.int64)
    cut = np.full(size, float(cut0))
    # cut(T + pinned) = cut0 + sum_{v in T} (deg v - 2 base_in v) - 2 * w(inside T)
    for v in range(k):
        bit = (S >> v) & 1
        cut += bit * (deg[v] - 2.0 * base_in[v])
        for j in range(indptr[v], indptr[v + 1]):
            u = indices[j]
            if u > v:
                cut -= 2.0 * wts[j] * (bit & ((S >> u) & 1))
    pc = np.zeros(size, dtype=np.int64)
    for v in range(k):
        pc += (S >> v) & 1
    layers = np.argsort(pc, kind="stable")
    starts = np.searchsorted(pc[layers], np.arange(k + 2))
    best = np.empty(size)
    best[0] = cut[0]
    for level in range(1, k + 1):
        idx = layers[starts[level] : starts[level + 1]]
        m = np.full(idx.shape[0], np.inf)
        for v in range(k):
            has = ((idx >> v) & 1).astype(bool)
            cand = np.where(has, best[idx ^ (1 << v)], np.inf)
            np.minimum(m, cand, out=m)
        best[idx] = np.maximum(cut[idx], m)
    return cut, best


def subset_dp(k, indptr, indices, wts, deg, base_in, cut0):
    """Tables ``cut[T]`` and ``best[T]`` over the subsets ``T`` of ``k`` free vertices.

    ``cut[T]`` is the cut of ``T`` plus the pinned first vertex (``cut0`` is
    that vertex's own cut, ``base_in[v]`` the weight from ``v`` to it), and
    ``best[T]`` the least width of an ordering of ``T`` after the pinned vertex:
    ``best[T] = max(cut[T], min_{v in T} best[T - v])``.
    """
    fn = _subset_dp_nb if HAVE_NUMBA else _subset_dp_np
    return fn(k, indptr, indices, wts, deg, base_in, cut0)


# ---------------------------------------------------------------- local search


@_jit
def _profile_nb(order, indptr, indices, wts):  # pragma: no cover - compiled
    n = order.shape[0]
    pos = np.empty(n, dtype=np.int64)
    for i in range(n):
        pos[order[i]] = i
    diff = np.zeros(n + 2)
    for i in range(n):
        v = order[i]
        for j in range(indptr[v], indptr[v + 1]):
            pu = pos[indices[j]]
            if pu > i:
                diff[i + 1] += wts[j]
                diff[pu + 1] -= wts[j]
    prof = np.empty(n + 1)
    run = 0.0
    for i in range(n + 1):
        run += diff[i]
        prof[i] = run
    return prof, pos


@_jit
def _move_pass_nb(order, indptr, indices, wts, nf, nl, cand, tol):  # pragma: no cover - compiled
    """One pass of best single-vertex moves; returns the number of accepted moves.

    The objective is lexicographic: (width, number of counted gaps at the
    width, total of counted cuts).  ``order`` is changed in place.
    """
    n = order.shape[0]
    lo = nf
    hi = n - nl
    prof, pos = _profile_nb(order, indptr, indices, wts)
    A = np.empty(n)
    B = np.empty(n)
    Lv = np.empty(n + 1)
    pmax = np.empty(n)
    pcnt = np.empty(n, dtype=np.int64)
    psum = np.empty(n)
    smax = np.empty(n + 1)
    scnt = np.empty(n + 1, dtype=np.int64)
    ssum = np.empty(n + 1)
    moves = 0
    for ci in range(cand.shape[0]):
        v = cand[ci]
        p = pos[v]
        if p < nf or p > n - nl - 1:
            continue
        # current objective
        W = -1.0
        cnt = 0
        tot = 0.0
        for g in range(lo, hi + 1):
            c = prof[g]
            tot += c
            if c > W + tol:
                W = c
                cnt = 1
            elif c > W - tol:
                cnt += 1
        deg = 0.0
        for g in range(n + 1):
            Lv[g] = 0.0
        for j in range(indptr[v], indptr[v + 1]):
            pu = pos[indices[j]]
            if pu > p:
                pu -= 1
            Lv[pu + 1] += wts[j]
            deg += wts[j]
        run = 0.0
        for g in range(n):
            run += Lv[g]
            Lv[g] = run
        for g in range(n):
            if g <= p:
                r = prof[g] - Lv[g]
            else:
                r = prof[g + 1] - (deg - Lv[g])
            A[g] = r + Lv[g]
            B[g] = r + deg - Lv[g]
        # prefix maxima of A over [lo, q], suffix maxima of B over [q, hi-1]
        mx = -1.0
        ct = 0
        sm = 0.0
        for g in range(lo, n):
            c = A[g]
            sm += c
            if c > mx + tol:
                mx = c
                ct = 1
            elif c > mx - tol:
                ct += 1
            pmax[g] = mx
            pcnt[g] = ct
            psum[g] = sm
        mx = -1.0
        ct = 0
        sm = 0.0
        smax[hi] = -1.0
        scnt[hi] = 0
        ssum[hi] = 0.0
        for g in range(hi - 1, lo - 1, -1):
            c = B[g]
            sm += c
            if c > mx + tol:
                mx = c
                ct = 1
            elif c > mx - tol:
                ct += 1
            smax[g] = mx
            scnt[g] = ct
            ssum[g] = sm
        bq = -1
        bW = W
        bc = cnt
        bt = tot
        for q in range(nf, n - nl):
            if q == p:
                continue
            a = pmax[q]
            b = smax[q]
            if a > b + tol:
                w2 = a
                c2 = pcnt[q]
            elif b > a + tol:
                w2 = b
                c2 = scnt[q]
            else:
                w2 = a
                c2 = pcnt[q] + scnt[q]
            t2 = psum[q] + ssum[q]
            better = False
            if w2 < bW - tol:
                better = True
            elif w2 < bW + tol:
                if c2 < bc:
                    better = True
                elif c2 == bc and t2 < bt - tol:
                    better = True
            if better:
                bq = q
                bW = w2
                bc = c2
                bt = t2
        if bq >= 0:
            # move v from p to slot bq of the order without v
            if bq > p:
                for i in range(p, bq):
                    order[i] = order[i + 1]
                order[bq] = v
            else:
                for i in range(p, bq, -1):
                    order[i] = order[i - 1]
                order[bq] = v
            prof, pos = _profile_nb(order, indptr, indices, wts)
            moves += 1
    return moves


def move_pass(order, indptr, indices, wts, nf, nl, cand, tol=1e-9):
    """One pass of best single-vertex moves over the vertices ``cand`` (in place)."""
    if not HAVE_NUMBA:  # pragma: no cover - fallback keeps the pass short
        cand = cand[: max(1, min(len(cand), 2000000 // max(1, len(order)) // 20))]
    return _move_pass_nb(order, indptr, indices, wts, nf, nl, cand, tol)


# ---------------------------------------------------------------- prefix-set search


@_jit
def _hash_key(key, W):  # pragma: no cover - compiled
    h = np.uint64(0x9E3779B97F4A7C15)
    for i in range(W):
        x = key[i] + np.uint64(0x632BE59BD9B4E019) * np.uint64(i + 1)
        x ^= x >> np.uint64(33)
        x *= np.uint64(0xFF51AFD7ED558CCD)
        x ^= x >> np.uint64(33)
        h ^= x
        h *= np.uint64(0xC4CEB9FE1A85EC53)
    h ^= h >> np.uint64(29)
    return h


@_jit
def _memo_find(table, used, key, W, mask):  # pragma: no cover - compiled
    """Slot of ``key`` (found=True) or of the empty slot where it would go."""
    h = np.int64(_hash_key(key, W) & np.uint64(mask))
    while True:
        if not used[h]:
            return h, False
        same = True
        for i in range(W):
            if table[h, i] != key[i]:
                same = False
                break
        if same:
            return h, True
        h = (h + 1) & mask


@_jit
def _prefix_search_nb(n, indptr, indices, wts, deg, a, b, k, tol, rep, table, used, stored, node_budget, sx, st):  # pragma: no cover
    """Depth-first "width <= k?" search over prefix sets (see bnb).

    Returns (status, order, rejected, nodes): status 1 found (order filled),
    0 refuted, -1 node budget spent, -2 memo table full, -3 candidate stack
    full.  ``sx >= 0`` breaks the reversal symmetry: vertex ``sx`` joins only
    prefixes of at least ``st`` vertices and never by a free move.  ``table``/``used``
    (failed sets) and ``stored[0]`` (their number) persist between calls.
    """
    W = table.shape[1]
    mask = table.shape[0] - 1
    limit = table.shape[0] // 2
    inS = np.zeros(n, dtype=np.bool_)
    wS = np.zeros(n)
    key = np.zeros(W, dtype=np.uint64)
    csize = min(n * (n + 1) + 1, 1 << 24)
    cand = np.empty(csize, dtype=np.int64)
    work = np.empty(n + indices.shape[0] + 1, dtype=np.int64)
    candc = np.empty(n, dtype=np.float64)
    cand_start = np.zeros(n + 2, dtype=np.int64)
    cand_pos = np.zeros(n + 2, dtype=np.int64)
    cand_end = np.zeros(n + 2, dtype=np.int64)
    added = np.empty(n + 1, dtype=np.int64)
    added_start = np.zeros(n + 2, dtype=np.int64)
    added_end = np.zeros(n + 2, dtype=np.int64)
    chosen = np.zeros(n + 2, dtype=np.int64)
    cut_base = np.zeros(n + 2)
    stamp = np.zeros(n, dtype=np.int64)
    order = np.full(n, -1, dtype=np.int64)
    rejected = np.inf
    nodes = 0
    placed = 0
    goal = n if b < 0 else n - 1
    final_cut = 0.0 if b < 0 else deg[b]
    cut = 0.0
    if a >= 0:
        inS[a] = True
        placed = 1
        key[a >> 6] ^= np.uint64(1) << np.uint64(a & 63)
        for j in range(indptr[a], indptr[a + 1]):
            wS[indices[j]] += wts[j]
        cut = deg[a]
    d = 0
    n_added = 0
    entering = True
    while True:
        if entering:
            nodes += 1
            if nodes > node_budget:
                return -1, order, rejected, nodes
            # free moves: at the root any vertex may be free; deeper, only the
            # neighbours of the vertex just chosen (and of those moved for free)
            added_start[d] = n_added
            wtop = 0
            if d == 0:
                for v in range(n):
                    work[wtop] = v
                    wtop += 1
            else:
                pv = chosen[d - 1]
                for j in range(indptr[pv], indptr[pv + 1]):
                    work[wtop] = indices[j]
                    wtop += 1
            while wtop > 0:
                wtop -= 1
                v = work[wtop]
                if inS[v] or v == b or v == sx:
                    continue
                dl = deg[v] - 2.0 * wS[v]
                if dl <= tol:
                    inS[v] = True
                    placed += 1
                    key[v >> 6] ^= np.uint64(1) << np.uint64(v & 63)
                    for j in range(indptr[v], indptr[v + 1]):
                        u = indices[j]
                        wS[u] += wts[j]
                        if not inS[u]:
                            work[wtop] = u
                            wtop += 1
                    cut += dl
                    added[n_added] = v
                    n_added += 1
            added_end[d] = n_added
            cut_base[d] = cut
            dead = False
            if placed == goal:
                if final_cut <= k + tol:
                    # success: rebuild the ordering from the path
                    p = 0
                    if a >= 0:
                        order[p] = a
                        p += 1
                    for dd in range(d + 1):
                        for i in range(added_start[dd], added_end[dd]):
                            order[p] = added[i]
                            p += 1
                        if dd < d:
                            order[p] = chosen[dd]
                            p += 1
                    if b >= 0:
                        order[p] = b
                    return 1, order, rejected, nodes
                if final_cut < rejected:
                    rejected = final_cut
                dead = True
            else:
                slot, found = _memo_find(table, used, key, W, mask)
                if found:
                    dead = True
            if not dead:
                # candidates, one per twin class, sorted by next cut then weight into S
                start = cand_start[d]
                if start + n > csize:
                    return -3, order, rejected, nodes
                cnt = 0
                for v in range(n):
                    if inS[v] or v == b or (v == sx and placed < st):
                        continue
                    nc = cut + deg[v] - 2.0 * wS[v]
                    if nc > k + tol:
                        if nc < rejected:
                            rejected = nc
                        continue
                    r = rep[v]
                    if stamp[r] == nodes:
                        continue
                    stamp[r] = nodes
                    # insertion by (nc, -wS)
                    i = cnt
                    while i > 0:
                        u = cand[start + i - 1]
                        cu = candc[i - 1]
                        if cu > nc + tol or (abs(cu - nc) <= tol and wS[u] < wS[v]):
                            cand[start + i] = u
                            candc[i] = cu
                            i -= 1
                        else:
                            break
                    cand[start + i] = v
                    candc[i] = nc
                    cnt += 1
                cand_pos[d] = start
                cand_end[d] = start + cnt
                cand_start[d + 1] = start + cnt
            else:
                cand_pos[d] = cand_start[d]
                cand_end[d] = cand_start[d]
                cand_start[d + 1] = cand_start[d]
            entering = False
        # try the next candidate at depth d
        if cand_pos[d] < cand_end[d]:
            v = cand[cand_pos[d]]
            cand_pos[d] += 1
            chosen[d] = v
            inS[v] = True
            placed += 1
            key[v >> 6] ^= np.uint64(1) << np.uint64(v & 63)
            for j in range(indptr[v], indptr[v + 1]):
                wS[indices[j]] += wts[j]
            cut = cut_base[d] + deg[v] - 2.0 * wS[v]  # wS[v]: weight from v into the old set
            d += 1
            entering = True
            continue
        # all candidates failed: remember the set, undo the free moves, go up
        if placed != goal:
            slot, found = _memo_find(table, used, key, W, mask)
            if not found:
                if stored[0] >= limit:
                    return -2, order, rejected, nodes
                used[slot] = True
                for i in range(W):
                    table[slot, i] = key[i]
                stored[0] += 1
        for i in range(added_end[d] - 1, added_start[d] - 1, -1):
            v = added[i]
            inS[v] = False
            placed -= 1
            key[v >> 6] ^= np.uint64(1) << np.uint64(v & 63)
            for j in range(indptr[v], indptr[v + 1]):
                wS[indices[j]] -= wts[j]
        n_added = added_start[d]
        if d == 0:
            return 0, order, rejected, nodes
        d -= 1
        v = chosen[d]
        inS[v] = False
        placed -= 1
        key[v >> 6] ^= np.uint64(1) << np.uint64(v & 63)
        for j in range(indptr[v], indptr[v + 1]):
            wS[indices[j]] -= wts[j]
        cut = cut_base[d]


def prefix_search(n, indptr, indices, wts, deg, a, b, k, tol, rep, table, used, stored, node_budget, sx=-1, st=0):
    """Compiled "width <= k?" search; see :func:`_prefix_search_nb` (numba only)."""
    return _prefix_search_nb(n, indptr, indices, wts, deg, a, b, k, tol, rep, table, used, stored, node_budget, sx, st)


profile = _profile_nb
"""``(prof, pos)``: the cut after each prefix (length n + 1) and every vertex's position."""


# ------------------------------------------------- window re-optimisation (see windows.py)
@_jit
def _window_dp(order, pos, prof, indptr, indices, wts, s, w, T, tol, cut, cost, choice):  # type: ignore[no-untyped-def]  # pragma: no cover
    """Re-arrange ``order[s:s+w]`` optimally for the window objective; True when it changed.

    Objective of an arrangement (additive over the ``w - 1`` gaps inside the
    window): a gap whose cut exceeds ``T`` is forbidden, a gap at ``T`` (up
    to ``tol``) costs ``big``, and every gap adds ``cut**2`` (so that heavy
    cuts are pushed down even below ``T``).  The prefix ``order[:s]`` and the
    suffix ``order[s+w:]`` stay fixed: the cut after ``order[:s]`` plus a set
    ``X`` of window vertices is ``prof[s] + sum_{x in X} (d_B(x) - d_A(x) +
    d_W(x)) - 2 w(E(X))`` (``A`` the prefix, ``B`` the suffix, ``W`` the
    window).  The new arrangement is taken only when it costs strictly less.
    ``order``, ``pos`` and ``prof`` are updated in place.
    """
    full = (1 << w) - 1
    verts = order[s : s + w].copy()
    delta = np.zeros(w)
    # window neighbours of each window vertex (local indices) with weights
    maxd = 1
    for i in range(w):
        v = verts[i]
        d = indptr[v + 1] - indptr[v]
        if d > maxd:
            maxd = d
    nb = np.empty((w, maxd), dtype=np.int64)
    nw = np.empty((w, maxd))
    nc = np.zeros(w, dtype=np.int64)
    for i in range(w):
        v = verts[i]
        for p in range(indptr[v], indptr[v + 1]):
            q = pos[indices[p]]
            if q < s:
                delta[i] -= wts[p]
            elif q >= s + w:
                delta[i] += wts[p]
            else:
                delta[i] += wts[p]
                nb[i, nc[i]] = q - s
                nw[i, nc[i]] = wts[p]
                nc[i] += 1
    big = (w + 1.0) * (T * T + 1.0) * 4.0 + 1.0
    lim = T + tol
    at = T - tol
    inf = np.inf
    cut[0] = prof[s]
    cost[0] = 0.0
    for X in range(1, full + 1):
        # lowest set bit
        i = 0
        while not (X >> i) & 1:
            i += 1
        rest = X ^ (1 << i)
        c = cut[rest] + delta[i]
        for t in range(nc[i]):
            if (rest >> nb[i, t]) & 1:
                c -= 2.0 * nw[i, t]
        cut[X] = c
        if X == full:
            g = 0.0
        elif c > lim:
            cost[X] = inf
            choice[X] = -1
            continue
        else:
            g = c * c
            if c >= at:
                g += big
        best = inf
        bi = -1
        r = X
        j = 0
        while r:
            if r & 1:
                val = cost[X ^ (1 << j)]
                if val < best:
                    best = val
                    bi = j
            r >>= 1
            j += 1
        cost[X] = best + g
        choice[X] = bi
    # cost of the current arrangement
    cur = 0.0
    X = 0
    for k in range(w - 1):
        X |= 1 << k
        c = cut[X]
        if c > lim:
            cur = inf
            break
        cur += c * c + (big if c >= at else 0.0)
    new = cost[full]
    if not new < cur - 1e-9 * (1.0 + abs(cur)):
        return False
    X = full
    seq = np.empty(w, dtype=np.int64)
    for k in range(w - 1, -1, -1):
        i = choice[X]
        seq[k] = i
        X ^= 1 << i
    X = 0
    for k in range(w):
        v = verts[seq[k]]
        order[s + k] = v
        pos[v] = s + k
        X |= 1 << seq[k]
        if k < w - 1:
            prof[s + k + 1] = cut[X]
    return True


@_jit
def window_pass(order, pos, prof, indptr, indices, wts, starts, w, T, tol):  # type: ignore[no-untyped-def]  # pragma: no cover
    """Run the window re-optimisation at each start position in turn; returns the number changed.

    ``T`` is the threshold of the objective (the current width); windows
    never create a gap above it.
    """
    size = 1 << w
    cut = np.empty(size)
    cost = np.empty(size)
    choice = np.empty(size, dtype=np.int8)
    changed = 0
    for t in range(starts.shape[0]):
        s = starts[t]
        if _window_dp(order, pos, prof, indptr, indices, wts, s, w, T, tol, cut, cost, choice):
            changed += 1
    return changed


# ------------------------------------------------- concurrent-flow routing (see flow.py)
@_jit
def route_sources(n, indptr, indices, eid, w, pi, load, pass_load, sources, alpha, scale):  # type: ignore[no-untyped-def]
    """Route ``pi[t]`` units from every source in ``sources`` to every other vertex ``t``, one source at a time.

    Each source sends along a shortest-path tree for the lengths
    ``exp(alpha * load[e] / (w[e] * scale)) / w[e]`` (``scale`` is the
    current largest ratio ``load / w``, updated as loads grow; lengths are
    ``1 / w`` while it is 0), so later sources avoid the edges earlier ones
    filled.  The tree edge above vertex ``v`` carries the sum of ``pi`` over
    the subtree of ``v``; these units are added to ``load`` and to
    ``pass_load``.  Only the tree matters for soundness, not the lengths.

    Returns the updated ``scale``.  ``O(|sources| m log n)``.
    """
    INF = 1.0e300
    dist = np.empty(n)
    done = np.zeros(n, dtype=np.bool_)
    pedge = np.empty(n, dtype=np.int64)
    parent = np.empty(n, dtype=np.int64)
    settled = np.empty(n, dtype=np.int64)
    sub = np.empty(n)
    cap = 2 * indptr[n] + 16
    hk = np.empty(cap)
    hv = np.empty(cap, dtype=np.int64)
    for si in range(sources.shape[0]):
        s = sources[si]
        for v in range(n):
            dist[v] = INF
            done[v] = False
            pedge[v] = -1
            parent[v] = -1
        dist[s] = 0.0
        size = 0
        # push (0, s)
        hk[0] = 0.0
        hv[0] = s
        size = 1
        cnt = 0
        while size > 0:
            # pop min
            d = hk[0]
            v = hv[0]
            size -= 1
            if size > 0:
                lk = hk[size]
                lv = hv[size]
                i = 0
                while True:
                    c = 2 * i + 1
                    if c >= size:
                        break
                    if c + 1 < size and hk[c + 1] < hk[c]:
                        c += 1
                    if hk[c] < lk:
                        hk[i] = hk[c]
                        hv[i] = hv[c]
                        i = c
                    else:
                        break
                hk[i] = lk
                hv[i] = lv
            if done[v] or d > dist[v]:
                continue
            done[v] = True
            settled[cnt] = v
            cnt += 1
            for j in range(indptr[v], indptr[v + 1]):
                u = indices[j]
                if done[u]:
                    continue
                e = eid[j]
                if scale > 0.0:
                    le = math.exp(alpha * load[e] / (w[e] * scale)) / w[e]
                else:
                    le = 1.0 / w[e]
                nd = d + le
                if nd < dist[u]:
                    dist[u] = nd
                    pedge[u] = e
                    parent[u] = v
                    if size >= cap:
                        continue  # cannot happen: at most one push per arc
                    i = size
                    size += 1
                    while i > 0:
                        p = (i - 1) // 2
                        if hk[p] > nd:
                            hk[i] = hk[p]
                            hv[i] = hv[p]
                            i = p
                        else:
                            break
                    hk[i] = nd
                    hv[i] = u
        for i in range(cnt):
            sub[settled[i]] = pi[settled[i]]
        for i in range(cnt - 1, 0, -1):
            v = settled[i]
            e = pedge[v]
            load[e] += sub[v]
            pass_load[e] += sub[v]
            sub[parent[v]] += sub[v]
            r = load[e] / w[e]
            if r > scale:
                scale = r
    return scale


_WARM = [False]


def warm_up() -> None:
    """Load (or compile) every kernel once on a tiny input.

    The first call of a numba function in a process loads its machine code
    from the cache (``benchmarks/NOTES.md``); doing it up front lets the
    callers' time checks see that cost instead of overrunning after it.
    """
    if _WARM[0] or not HAVE_NUMBA:
        _WARM[0] = True
        return
    edges = np.array([[0, 1], [1, 2]], dtype=np.int64)
    indptr, indices, eid = csr_with_ids(3, edges)
    wts = np.ones(indices.shape[0])
    deg = np.array([1.0, 2.0, 1.0])
    edge_betweenness(3, indptr, indices, eid, 2, np.arange(3, dtype=np.int64))
    subset_dp(3, indptr, indices, wts, deg, np.zeros(3), 0.0)
    move_pass(np.arange(3, dtype=np.int64), indptr, indices, wts, 0, 0, np.arange(3, dtype=np.int64))
    table = np.zeros((1024, 1), dtype=np.uint64)
    used = np.zeros(1024, dtype=np.bool_)
    prefix_search(3, indptr, indices, wts, deg, -1, -1, 1.0, 1e-9, np.arange(3, dtype=np.int64), table,
                  used, np.zeros(1, dtype=np.int64), 100)
    memo_grow(table, used)
    order = np.arange(3, dtype=np.int64)
    prof, pos = profile(order, indptr, indices, wts)
    window_pass(order, pos, prof, indptr, indices, wts, np.array([0], dtype=np.int64), 3, 2.0, 1e-9)
    route_sources(3, indptr, indices, eid, np.ones(2), np.ones(3), np.zeros(2), np.zeros(2),
                  np.array([0], dtype=np.int64), 8.0, 0.0)
    _WARM[0] = True


@_jit
def _memo_grow_nb(table, used, new_table, new_used):  # pragma: no cover - compiled
    W = table.shape[1]
    mask = new_table.shape[0] - 1
    for h in range(table.shape[0]):
        if used[h]:
            slot, found = _memo_find(new_table, new_used, table[h], W, mask)
            new_used[slot] = True
            for i in range(W):
                new_table[slot, i] = table[h, i]


def memo_grow(table: np.ndarray, used: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The failed-set table rehashed into one of twice the capacity."""
    new_table = np.zeros((2 * table.shape[0], table.shape[1]), dtype=np.uint64)
    new_used = np.zeros(2 * table.shape[0], dtype=np.bool_)
    _memo_grow_nb(table, used, new_table, new_used)
    return new_table, new_used


# ------------------------------------------------- closed walks by area residue (see carving.py)


def _walk_areas_py(nv, indptr, head, length, phi, M, K, back, s_lo, s_hi, h):  # type: ignore[no-untyped-def]
    """Shortest closed walk of every area residue, walks starting at their least vertex.

    For each source ``s`` in ``s_lo..s_hi-1``: Dijkstra over the states
    ``(v, r)`` (vertex ``v >= s``, residue ``r`` mod ``M``) from ``(s, 0)``
    (``phi`` already reduced mod ``M``);
    reaching ``(s, r)`` at length ``d`` closes a walk of area ``r``, so
    ``h[r] = min(h[r], d)``.  States that cannot close within ``K`` (their
    length plus the plain distance ``back[v, s]`` exceeds ``K``) are not
    pushed (an empty ``back`` turns that test off).  Runs compiled with numba, as plain Python without it.
    """
    NS = nv * M
    dist = np.full(NS, np.inf)
    hpos = np.full(NS, -1, dtype=np.int64)
    heap = np.empty(NS, dtype=np.int64)
    touched = np.empty(NS, dtype=np.int64)
    for s in range(s_lo, s_hi):
        nt = 0
        size = 0
        x0 = s * M
        dist[x0] = 0.0
        touched[nt] = x0
        nt += 1
        heap[0] = x0
        hpos[x0] = 0
        size = 1
        while size > 0:
            x = heap[0]
            d = dist[x]
            size -= 1
            hpos[x] = -2
            if size > 0:  # sift the last entry down from the root
                y = heap[size]
                dy = dist[y]
                i = 0
                while True:
                    c = 2 * i + 1
                    if c >= size:
                        break
                    if c + 1 < size and dist[heap[c + 1]] < dist[heap[c]]:
                        c += 1
                    if dist[heap[c]] < dy:
                        heap[i] = heap[c]
                        hpos[heap[i]] = i
                        i = c
                    else:
                        break
                heap[i] = y
                hpos[y] = i
            if d > K:
                break
            v = x // M
            r = x - v * M
            if v == s and r != 0 and d < h[r]:
                h[r] = d
            for a in range(indptr[v], indptr[v + 1]):
                u = head[a]
                if u < s:
                    continue
                nd = d + length[a]
                if back.shape[0] > 0 and nd + back[u, s] > K:
                    continue
                ru = r + phi[a]
                if ru >= M:
                    ru -= M
                y = u * M + ru
                if hpos[y] == -2 or nd >= dist[y]:
                    continue
                if hpos[y] == -1:
                    if dist[y] == np.inf:
                        touched[nt] = y
                        nt += 1
                    i = size
                    size += 1
                else:
                    i = hpos[y]
                dist[y] = nd
                while i > 0:  # sift up
                    p = (i - 1) // 2
                    if dist[heap[p]] > nd:
                        heap[i] = heap[p]
                        hpos[heap[i]] = i
                        i = p
                    else:
                        break
                heap[i] = y
                hpos[y] = i
        for j in range(nt):
            dist[touched[j]] = np.inf
            hpos[touched[j]] = -1
    return h


_walk_areas_nb = _jit(_walk_areas_py)


def walk_areas(nv, indptr, head, length, phi, M, K, back, s_lo, s_hi, h):  # type: ignore[no-untyped-def]
    """Update ``h`` (length ``M``) with the closed walks found from sources ``s_lo..s_hi-1``."""
    return _walk_areas_nb(nv, indptr, head, length, phi, M, float(K), back, s_lo, s_hi, h)


def _residue_closure_py(h, M):  # type: ignore[no-untyped-def]
    """Least total length of a multiset of walks per residue: Dijkstra on Z_M, steps ``h``."""
    g = np.full(M, np.inf)
    done = np.zeros(M, dtype=np.bool_)
    g[0] = 0.0
    for _ in range(M):
        best = np.inf
        x = -1
        for i in range(M):
            if not done[i] and g[i] < best:
                best = g[i]
                x = i
        if x < 0:
            break
        done[x] = True
        for r in range(1, M):
            if h[r] < np.inf:
                y = x + r
                if y >= M:
                    y -= M
                nd = best + h[r]
                if nd < g[y]:
                    g[y] = nd
    return g


_residue_closure_nb = _jit(_residue_closure_py)


def residue_closure(h, M):  # type: ignore[no-untyped-def]
    """The min-plus closure of ``h`` over the residues mod ``M`` (entry 0 is 0)."""
    return _residue_closure_nb(np.asarray(h, dtype=np.float64), int(M))


# ---------------------------------------------------------------- beam search over prefix sets (see beam.py)


@_jit
def _beam_nb(n, indptr, indices, wts, deg, a, b, B, tol, noise, seed, free):  # pragma: no cover - compiled
    """Beam search over prefix sets with free moves; returns (width, order).

    Every generation expands each kept prefix by one vertex (then the free
    moves of :mod:`.bnb`), scores the children by (largest cut so far, cut
    now) with a little seeded noise on the second key, drops repeated sets
    and keeps the ``B`` best.  ``order`` lists the vertices of the best
    complete prefix (pins at the ends).
    """
    np.random.seed(seed)
    W = (n + 63) // 64
    goal = n if b < 0 else n - 1
    # parent generation
    pk = np.zeros((B, W), dtype=np.uint64)
    pws = np.zeros((B, n))
    pcut = np.zeros(B)
    pwid = np.zeros(B)
    pcnt = np.zeros(B, dtype=np.int64)
    pord = np.full((B, n), -1, dtype=np.int64)
    # child generation
    ck = np.zeros((B, W), dtype=np.uint64)
    cws = np.zeros((B, n))
    ccut = np.zeros(B)
    cwid = np.zeros(B)
    ccnt = np.zeros(B, dtype=np.int64)
    cord = np.full((B, n), -1, dtype=np.int64)
    inS = np.zeros(n, dtype=np.bool_)
    work = np.empty(n + indices.shape[0] + 1, dtype=np.int64)
    best_w = np.inf
    best_o = np.full(n, -1, dtype=np.int64)
    size = 1
    if a >= 0:
        pk[0, a >> 6] |= np.uint64(1) << np.uint64(a & 63)
        for j in range(indptr[a], indptr[a + 1]):
            pws[0, indices[j]] += wts[j]
        pcut[0] = deg[a]
        pwid[0] = deg[a]
        pord[0, 0] = a
        pcnt[0] = 1
    final_cut = 0.0 if b < 0 else deg[b]
    ccap = B * n
    c_par = np.empty(ccap, dtype=np.int64)
    c_v = np.empty(ccap, dtype=np.int64)
    c_s1 = np.empty(ccap)
    c_s2 = np.empty(ccap)
    hsize = 1
    while hsize < 4 * B:
        hsize *= 2
    hkeys = np.zeros((hsize, W), dtype=np.uint64)
    hused = np.zeros(hsize, dtype=np.int64)
    stamp = 0
    while size > 0:
        # candidates of every parent
        nc = 0
        for s in range(size):
            any_front = False
            for v in range(n):
                if v == b:
                    continue
                if (pk[s, v >> 6] >> np.uint64(v & 63)) & np.uint64(1):
                    continue
                if pws[s, v] > 0.0:
                    any_front = True
                    break
            for v in range(n):
                if v == b:
                    continue
                if (pk[s, v >> 6] >> np.uint64(v & 63)) & np.uint64(1):
                    continue
                if any_front and pws[s, v] <= 0.0:
                    continue
                cut = pcut[s] + deg[v] - 2.0 * pws[s, v]
                wd = max(pwid[s], cut)
                if wd >= best_w - tol:
                    continue
                c_par[nc] = s
                c_v[nc] = v
                c_s1[nc] = wd
                c_s2[nc] = cut + noise * np.random.random()
                nc += 1
        if nc == 0:
            break
        # best first: by width so far, then by cut now
        idx0 = np.argsort(c_s2[:nc], kind="mergesort")
        idx = idx0[np.argsort(c_s1[:nc][idx0], kind="mergesort")]
        stamp += 1
        size2 = 0
        for t in range(nc):
            if size2 >= B:
                break
            i = idx[t]
            s = c_par[i]
            v = c_v[i]
            # build the child in slot size2
            for w_ in range(W):
                ck[size2, w_] = pk[s, w_]
            for u in range(n):
                cws[size2, u] = pws[s, u]
                inS[u] = False
            cnt = pcnt[s]
            for p in range(cnt):
                cord[size2, p] = pord[s, p]
                inS[pord[s, p]] = True
            cut = pcut[s]
            wid = pwid[s]
            # place v, then the free moves around it
            wtop = 0
            work[wtop] = v
            wtop += 1
            first = True
            while wtop > 0:
                wtop -= 1
                u = work[wtop]
                if inS[u] or u == b:
                    continue
                dl = deg[u] - 2.0 * cws[size2, u]
                if not first and (dl > tol or not free):
                    continue
                first = False
                inS[u] = True
                ck[size2, u >> 6] |= np.uint64(1) << np.uint64(u & 63)
                cord[size2, cnt] = u
                cnt += 1
                cut += dl
                if cut > wid:
                    wid = cut
                for j in range(indptr[u], indptr[u + 1]):
                    x = indices[j]
                    cws[size2, x] += wts[j]
                    if not inS[x]:
                        work[wtop] = x
                        wtop += 1
            if wid >= best_w - tol:
                continue
            if cnt == goal:
                total = max(wid, final_cut)
                if total < best_w - tol:
                    best_w = total
                    for p in range(cnt):
                        best_o[p] = cord[size2, p]
                    if b >= 0:
                        best_o[cnt] = b
                continue
            # drop a repeated set
            h = np.uint64(1469598103934665603)
            for w_ in range(W):
                h = (h ^ ck[size2, w_]) * np.uint64(1099511628211)
            slot = np.int64(h >> np.uint64(40)) & np.int64(hsize - 1)
            dup = False
            while hused[slot] == stamp:
                same = True
                for w_ in range(W):
                    if hkeys[slot, w_] != ck[size2, w_]:
                        same = False
                        break
                if same:
                    dup = True
                    break
                slot = (slot + np.int64(1)) & np.int64(hsize - 1)
            if dup:
                continue
            hused[slot] = stamp
            for w_ in range(W):
                hkeys[slot, w_] = ck[size2, w_]
            ccut[size2] = cut
            cwid[size2] = wid
            ccnt[size2] = cnt
            size2 += 1
        # the children become the parents
        pk, ck = ck, pk
        pws, cws = cws, pws
        pcut, ccut = ccut, pcut
        pwid, cwid = cwid, pwid
        pcnt, ccnt = ccnt, pcnt
        pord, cord = cord, pord
        size = size2
    return best_w, best_o


def beam_orderings(n, indptr, indices, wts, deg, a, b, B, tol=1e-9, noise=0.0, seed=0, free=True):
    """Compiled beam search over prefix sets; see :func:`_beam_nb` (numba only)."""
    if not HAVE_NUMBA:  # pragma: no cover - the wrapper in beam.py checks first
        raise RuntimeError("beam search needs numba")
    return _beam_nb(n, indptr, indices, wts, deg, a, b, B, tol, noise, seed, free)

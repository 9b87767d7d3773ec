"""Compiled inner loops of the window re-optimisation and the tree layouts (numba).

When numba does not import, the same functions run as plain Python (slow but
identical results), so callers should keep windows small then.
"""

from __future__ import annotations

import numpy as np

try:  # pragma: no cover - depends on the installation
    import numba

    HAVE_NUMBA = True
except Exception:  # pragma: no cover
    numba = None  # type: ignore[assignment]  # optional dependency
    HAVE_NUMBA = False

__all__ = ["HAVE_NUMBA", "window_pass", "profile", "warm_up"]


def _jit(fn):  # type: ignore[no-untyped-def]
    if HAVE_NUMBA:
        return numba.njit(cache=True, nogil=True)(fn)
    return fn


@_jit
def profile(order, indptr, indices, wts):  # type: ignore[no-untyped-def]  # pragma: no cover - compiled
    """``(prof, pos)``: the cut after each prefix (length n + 1) and every vertex's position."""
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


def warm_up() -> None:
    """Load (or compile) the kernels once on a tiny input."""
    order = np.arange(3, dtype=np.int64)
    indptr = np.array([0, 1, 3, 4], dtype=np.int64)
    indices = np.array([1, 0, 2, 1], dtype=np.int64)
    wts = np.ones(4)
    prof, pos = profile(order, indptr, indices, wts)
    window_pass(order, pos, prof, indptr, indices, wts, np.array([0], dtype=np.int64), 3, 2.0, 1e-9)

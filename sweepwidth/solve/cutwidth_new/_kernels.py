"""Compiled inner loops of the new cutwidth lower bounds (numba, with plain-Python fallbacks).

Every kernel is written once as plain Python on numpy arrays and compiled by
numba when numba imports; without numba the same code runs interpreted (much
slower, and the callers give it smaller budgets).  Nothing outside
:mod:`sweepwidth.solve.cutwidth_new` imports this module.
"""

from __future__ import annotations

import math

import numpy as np

try:  # pragma: no cover - depends on the installation
    import numba

    HAVE_NUMBA = True
except Exception:  # pragma: no cover
    numba = None  # type: ignore[assignment]
    HAVE_NUMBA = False

__all__ = ["HAVE_NUMBA", "csr_with_ids", "route_sources"]


def _jit(fn):  # type: ignore[no-untyped-def]
    if HAVE_NUMBA:
        return numba.njit(cache=True, nogil=True)(fn)
    return fn


def csr_with_ids(n: int, edges: np.ndarray) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Adjacency in compressed rows (both directions) with the edge id of every slot."""
    m = edges.shape[0]
    src = np.concatenate([edges[:, 0], edges[:, 1]]).astype(np.int64)
    dst = np.concatenate([edges[:, 1], edges[:, 0]]).astype(np.int64)
    ids = np.concatenate([np.arange(m), np.arange(m)]).astype(np.int64)
    order = np.argsort(src, kind="stable")
    indptr = np.zeros(n + 1, dtype=np.int64)
    np.add.at(indptr, src + 1, 1)
    return np.cumsum(indptr), dst[order], ids[order]


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

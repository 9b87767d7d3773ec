"""Searches over toggled face sets: the exact monotone subset DP and the non-monotone search.

Both work on a :class:`~sweepwidth.problems.cycles.FaceSweep`: ``k`` free
faces, and for every subset ``T`` of them the weight ``W(T)`` of the cycle
``c0 + dT``.  States are bitmasks; ``W`` of all ``2^k`` states is tabulated
once (``W(T) = W(T - v) + delta_v(T - v)`` for the lowest face ``v`` of ``T``).

* :func:`monotone_sweep` — the least width of a sweep toggling every face of
  the target set exactly once (face orderings), by the recurrence
  ``best(T) = max(W(T), min_{v in T} best(T - v))`` over subsets of the
  target.  Handles the crossing case (anti pairs) that is not a cutwidth
  problem.
* :func:`toggle_search` — the least width of any sequence of toggles (a face
  may be toggled several times) from the empty set to a target set: a
  bottleneck shortest path in the hypercube on all free faces, by a
  Dijkstra-type search whose key is the largest weight on the path.
* :func:`greedy_sweep` — a quick monotone sweep for upper bounds.
* :func:`improve_sweep` — local search on a face order (one face moved near
  the widest step at a time), with the exact weights, crossing or not.

References
----------
.. [1] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J.
   Discrete Math. 23(3), 2009 (for a submodular weight on the lattice of
   face sets, such as a cut function, a path from the bottom to the top
   never needs to toggle an element twice).
.. [2] E. W. Dijkstra, "A note on two problems in connexion with graphs",
   Numerische Mathematik 1, 1959 (the search order; here with max instead
   of sum, the bottleneck path variant).
"""

from __future__ import annotations

from ...tables import size

import heapq
import math
import time
from typing import Any, Sequence

import numpy as np

from ...errors import InvalidArgumentError, OperationError, ProblemTooLargeError, SweepwidthError
from ...problems.cycles import FaceSweep

try:  # pragma: no cover - depends on the installation
    import numba

    HAVE_NUMBA = True
except Exception:  # pragma: no cover
    numba = None  # type: ignore[assignment]
    HAVE_NUMBA = False

__all__ = [
    "monotone_sweep",
    "toggle_search",
    "greedy_sweep",
    "improve_sweep",
    "sweep_arrays",
    "MAX_MONOTONE_FACES",
    "MAX_TOGGLE_FACES",
    "MAX_TABLE_BYTES",
    "estimate_seconds",
]

#: Largest target set for :func:`monotone_sweep` (two float64 tables of 2^k).
MAX_MONOTONE_FACES = 22 if HAVE_NUMBA else 16
#: Largest free face count for :func:`toggle_search` (tables of 2^k plus a heap).
MAX_TOGGLE_FACES = 20 if HAVE_NUMBA else 14

#: Tables larger than this are refused whatever ``max_faces`` says (bytes).
MAX_TABLE_BYTES = 1 << 30

# seconds per state and face of the subset DP, calibrated by benchmarks/_homology_rows.py
# (benchmarks/NOTES.md); the toggle search is allowed 6x that for its heap work
_NS_PER_STATE_FACE = 5.0 if HAVE_NUMBA else 4000.0


def _jit(fn: Any) -> Any:
    if HAVE_NUMBA:
        return numba.njit(cache=True, nogil=True)(fn)
    return fn


def estimate_seconds(k: int, toggles: bool = False) -> float:
    """Rough running time of the table searches on ``k`` faces (seconds)."""
    per = _NS_PER_STATE_FACE * (6.0 if toggles else 1.0)
    return (2.0**k) * max(k, 1) * per * 1e-9


def sweep_arrays(fs: FaceSweep) -> tuple[np.ndarray, np.ndarray, np.ndarray, np.ndarray, float]:
    """Compressed neighbour lists of a face sweep: ``(indptr, indices, signed_w, lin, w0)``.

    Toggling face ``i`` into a state ``T`` (``i`` not in ``T``) changes the
    weight by ``lin[i] + sum_j signed_w[i, j] * (1 - 2 [j in T])``; ``w0`` is
    the weight of the empty state (the start cycle).
    """
    k = fs.k
    nb: list[list[tuple[int, float]]] = [[] for _ in range(k)]
    for i, j, wt, s in fs.pairs:
        nb[i].append((j, s * wt))
        nb[j].append((i, s * wt))
    indptr = np.zeros(k + 1, dtype=np.int64)
    for i in range(k):
        indptr[i + 1] = indptr[i] + len(nb[i])
    indices = np.array([j for row in nb for j, _ in row], dtype=np.int64)
    sw = np.array([w for row in nb for _, w in row], dtype=np.float64)
    lin = np.array([fs.to_last[i] - fs.to_first[i] for i in range(k)], dtype=np.float64)
    w0 = fs.const + sum(fs.to_first) + sum(wt for _, _, wt, s in fs.pairs if s < 0)
    return indptr, indices, sw, lin, float(w0)


@_jit
def _state_weights(k, indptr, indices, sw, lin, w0):  # pragma: no cover - compiled
    size = 1 << k
    W = np.empty(size)
    W[0] = w0
    for T in range(1, size):
        low = T & (-T)
        v = 0
        while (1 << v) != low:
            v += 1
        R = T ^ low
        d = lin[v]
        for p in range(indptr[v], indptr[v + 1]):
            if (R >> indices[p]) & 1:
                d -= sw[p]
            else:
                d += sw[p]
        W[T] = W[R] + d
    return W


@_jit
def _monotone_table(k, W):  # pragma: no cover - compiled
    size = 1 << k
    best = np.empty(size)
    best[0] = W[0]
    for T in range(1, size):
        m = np.inf
        R = T
        while R:
            b = R & (-R)
            x = best[T ^ b]
            if x < m:
                m = x
            R ^= b
        best[T] = W[T] if W[T] > m else m
    return best


@_jit
def _monotone_path(k, best, full):  # pragma: no cover - compiled
    order = np.empty(k, dtype=np.int64)
    T = full
    n = 0
    while T:
        # start from a real candidate: with NaN or inf entries no comparison succeeds, and
        # arg = -1 would make the bit search below loop forever
        arg = T & (-T)
        m = best[T ^ arg]
        R = T ^ arg
        while R:
            b = R & (-R)
            x = best[T ^ b]
            if x < m:
                m = x
                arg = b
            R ^= b
        v = 0
        while (1 << v) != arg:
            v += 1
        order[n] = v
        n += 1
        T ^= arg
    return order[:n][::-1].copy()


@_jit
def _bottleneck(k, W, t0, t1):  # pragma: no cover - compiled
    """Least largest weight of a hypercube path from state 0 to t0 or t1 (t1 = -1: none)."""
    size = 1 << k
    key = np.full(size, np.inf)
    parent = np.full(size, -1, dtype=np.int8)
    seen = np.zeros(size, dtype=np.bool_)
    key[0] = W[0]
    seen[0] = True
    heap = [(W[0], np.int64(0))]
    found = -1
    popped = 0
    while len(heap) > 0:
        r, T = heapq.heappop(heap)
        popped += 1
        if T == t0 or T == t1:
            found = T
            break
        for v in range(k):
            U = T ^ (1 << v)
            if not seen[U]:
                seen[U] = True
                c = W[U] if W[U] > r else r
                key[U] = c
                parent[U] = v
                heapq.heappush(heap, (c, np.int64(U)))
    if found < 0:
        return np.inf, np.empty(0, dtype=np.int64), popped
    path = []
    T = found
    while T != 0:
        v = np.int64(parent[T])
        path.append(np.int64(v))
        T ^= 1 << v
    out = np.empty(len(path), dtype=np.int64)
    for i in range(len(path)):
        out[i] = path[len(path) - 1 - i]
    return key[found], out, popped


def _tables(fs: FaceSweep) -> np.ndarray:
    indptr, indices, sw, lin, w0 = sweep_arrays(fs)
    fn = _state_weights if (HAVE_NUMBA and fs.k > 12) else getattr(_state_weights, "py_func", _state_weights)
    return fn(fs.k, indptr, indices, sw, lin, w0)


def monotone_sweep(fs: FaceSweep, *, max_faces: int | None = None) -> tuple[float, list[int]]:
    """Least width of a sweep toggling each free face of ``fs`` exactly once.

    Parameters
    ----------
    fs : FaceSweep
        Its free faces are the swept set ``S``.
    max_faces : int, optional
        Refuse larger sets (default :data:`MAX_MONOTONE_FACES`).

    Returns
    -------
    width : float
    order : list of int
        Face ids in sweep order.

    Raises
    ------
    ProblemTooLargeError
        More than ``max_faces`` faces (the tables need ``16 * 2^k`` bytes).

    Notes
    -----
    ``O(2^k k)`` time, ``16 * 2^k`` bytes.  Exact also for crossing sweeps,
    whose weight is not a cut function.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.problems.cycles import FaceSweep
    >>> P = generators.grid(2, 4)                       # three squares in a row
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> monotone_sweep(FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), inner))[0]
    8.0
    """
    k = fs.k
    cap = MAX_MONOTONE_FACES if max_faces is None else max_faces
    if 16 * 2**k > MAX_TABLE_BYTES:
        raise ProblemTooLargeError(
            f"monotone subset search on {k} faces needs {size(16 * 2**k)} of tables; "
            f"the limit is {size(MAX_TABLE_BYTES)}"
        )
    if k > cap:
        raise ProblemTooLargeError(
            f"monotone subset search on {k} faces needs 2^{k} states ({size(16 * 2**k)}); the limit is {cap} faces"
        )
    if k == 0:
        return fs.start_weight, []
    W = _tables(fs)
    small = not HAVE_NUMBA or k <= 12
    tab = getattr(_monotone_table, "py_func", _monotone_table) if small else _monotone_table
    path = getattr(_monotone_path, "py_func", _monotone_path) if small else _monotone_path
    best = tab(k, W)
    order = path(k, best, (1 << k) - 1)
    return float(best[(1 << k) - 1]), [fs.faces[int(i)] for i in order]


def toggle_search(
    fs: FaceSweep, targets: Sequence[Sequence[int]], *, max_faces: int | None = None
) -> tuple[float, list[int], dict]:
    """Least width of a toggle sequence (faces may repeat) from the empty set to a target set.

    Parameters
    ----------
    fs : FaceSweep
        Its free faces are the faces that may be toggled (all non-hole faces).
    targets : sequence of face-id collections
        One or two admissible final toggled sets (e.g. ``S`` and, without
        holes, its complement).
    max_faces : int, optional
        Refuse more free faces (default :data:`MAX_TOGGLE_FACES`).

    Returns
    -------
    width : float
    toggles : list of int
        Face ids in toggle order (a shortest such sequence among the
        optimal ones found first by the search).
    stats : dict
        ``states`` (popped), ``faces``.

    Raises
    ------
    ProblemTooLargeError
        More than ``max_faces`` free faces.

    Notes
    -----
    ``O(2^k k log 2^k)`` time, about ``25 * 2^k`` bytes.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.problems.cycles import FaceSweep
    >>> P = generators.grid(2, 4)
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> fs = FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), inner)
    >>> toggle_search(fs, [inner])[0]
    8.0
    """
    k = fs.k
    cap = MAX_TOGGLE_FACES if max_faces is None else max_faces
    if 40 * 2**k > MAX_TABLE_BYTES:
        raise ProblemTooLargeError(
            f"toggle search on {k} free faces needs about {size(40 * 2**k)}; "
            f"the limit is {size(MAX_TABLE_BYTES)}"
        )
    if k > cap:
        raise ProblemTooLargeError(
            f"toggle search on {k} free faces needs 2^{k} states (about {size(25 * 2**k)}); the limit is {cap} faces"
        )
    masks = []
    for t in targets:
        m = 0
        for i in fs.local(t):
            m |= 1 << i
        masks.append(m)
    if not masks:
        raise InvalidArgumentError("toggle_search needs at least one target set")
    if 0 in masks or k == 0:
        return fs.start_weight, [], {"states": 1, "faces": k}
    W = _tables(fs)
    t0 = masks[0]
    t1 = masks[1] if len(masks) > 1 else -1
    fn = _bottleneck if (HAVE_NUMBA and k > 10) else getattr(_bottleneck, "py_func", _bottleneck)
    width, path, popped = fn(k, W, t0, t1)
    if not math.isfinite(width):  # pragma: no cover - the hypercube is connected
        raise OperationError("no toggle sequence reaches the target")
    return float(width), [fs.faces[int(i)] for i in path], {"states": int(popped), "faces": k}


def greedy_sweep(fs: FaceSweep, *, seed: int | None = None, rounds: int = 4, deadline: float | None = None) -> tuple[float, list[int]]:
    """A monotone sweep built greedily: always toggle a face giving the lightest next cycle.

    Ties are broken by preferring faces next to toggled ones, then by index
    (first round) or at random (later rounds, from ``seed``); the best of
    ``rounds`` runs is returned.  An upper bound only.

    Notes
    -----
    ``O(rounds * (k + pairs) log k)`` time: the weight change of toggling
    each face is kept in a heap and updated for the neighbours of each
    toggled face.  Later rounds are skipped after ``deadline``.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.problems.cycles import FaceSweep
    >>> P = generators.grid(2, 4)
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> greedy_sweep(FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), inner), seed=0)[0]
    8.0
    """
    k = fs.k
    if k == 0:
        return fs.start_weight, []
    indptr, indices, sw, lin, w0 = sweep_arrays(fs)
    ip = indptr.tolist()
    nbr = indices.tolist()
    wts = sw.tolist()
    base = lin.tolist()
    for i in range(k):
        base[i] += float(sum(wts[ip[i] : ip[i + 1]]))
    rng = np.random.default_rng(seed)
    best_w, best_o = math.inf, list(range(k))
    for r in range(max(1, rounds)):
        if r and deadline is not None and time.monotonic() > deadline:
            break
        noise = rng.random(k).tolist() if r else [0.0] * k
        delta = list(base)  # weight change of toggling i into the current state
        touched = [0] * k
        done = [False] * k
        heap = [(delta[i], 0, noise[i], i) for i in range(k)]
        heapq.heapify(heap)
        w = width = w0
        order: list[int] = []
        while heap:
            d, t, _, i = heapq.heappop(heap)
            if done[i] or d != delta[i] or t != -touched[i]:
                continue  # stale entry
            done[i] = True
            w += d
            if w > width:
                width = w
            order.append(i)
            for p in range(ip[i], ip[i + 1]):
                j = nbr[p]
                if done[j]:
                    continue
                delta[j] -= 2.0 * wts[p]
                touched[j] = 1
                heapq.heappush(heap, (delta[j], -1, noise[j], j))
        if width < best_w:
            best_w, best_o = width, order
    return float(best_w), [fs.faces[i] for i in best_o]


@_jit
def _order_profile_max(order, indptr, indices, sw, lin, w0, state):  # pragma: no cover - compiled
    """Largest weight along a monotone order and how many steps attain it (state: scratch array)."""
    k = order.shape[0]
    for i in range(state.shape[0]):
        state[i] = False
    w = w0
    best = w0
    count = 1
    for t in range(k):
        v = order[t]
        d = lin[v]
        for p in range(indptr[v], indptr[v + 1]):
            if state[indices[p]]:
                d -= sw[p]
            else:
                d += sw[p]
        w += d
        state[v] = True
        if w > best + 1e-9:
            best = w
            count = 1
        elif w > best - 1e-9:
            count += 1
    return best, count


@_jit
def _improve_rounds(order, indptr, indices, sw, lin, w0, window, rounds):  # pragma: no cover - compiled
    """First-improvement moves of one face to a nearby position around the widest step."""
    k = order.shape[0]
    state = np.zeros(k, dtype=np.bool_)
    best, count = _order_profile_max(order, indptr, indices, sw, lin, w0, state)
    trial = order.copy()
    for _ in range(rounds):
        # the first widest step (prefix length p)
        for i in range(state.shape[0]):
            state[i] = False
        w = w0
        p = 0
        top = w0
        for t in range(k):
            v = order[t]
            d = lin[v]
            for q in range(indptr[v], indptr[v + 1]):
                if state[indices[q]]:
                    d -= sw[q]
                else:
                    d += sw[q]
            w += d
            state[v] = True
            if w > top + 1e-9:
                top = w
                p = t + 1
        lo = max(0, p - window)
        hi = min(k, p + window)
        moved = False
        for a in range(lo, hi):
            for b in range(lo, hi):
                if a == b:
                    continue
                # trial = order with the element at a moved to position b
                x = order[a]
                if a < b:
                    for t in range(a):
                        trial[t] = order[t]
                    for t in range(a, b):
                        trial[t] = order[t + 1]
                    trial[b] = x
                    for t in range(b + 1, k):
                        trial[t] = order[t]
                else:
                    for t in range(b):
                        trial[t] = order[t]
                    trial[b] = x
                    for t in range(b + 1, a + 1):
                        trial[t] = order[t - 1]
                    for t in range(a + 1, k):
                        trial[t] = order[t]
                nb, nc = _order_profile_max(trial, indptr, indices, sw, lin, w0, state)
                if nb < best - 1e-9 or (nb < best + 1e-9 and nc < count):
                    for t in range(k):
                        order[t] = trial[t]
                    best, count = nb, nc
                    moved = True
                    break
            if moved:
                break
        if not moved:
            return best, order, False
    return best, order, True


def improve_sweep(
    fs: FaceSweep, order: Sequence[int], *, deadline: float | None = None, window: int = 6, max_rounds: int = 2000
) -> tuple[float, list[int]]:
    """Local search on a monotone face order: move one face near the widest step while that helps.

    A move is kept when it lowers the width, or keeps it and lowers the
    number of steps attaining it.  Works for crossing sweeps too (the weight
    is evaluated exactly, not as a cut).  An upper bound only.

    Parameters
    ----------
    fs : FaceSweep
    order : sequence of int
        Face ids, each free face once.
    deadline : float, optional
        ``time.monotonic()`` value; the search stops at the first chunk of
        moves after it.
    window, max_rounds : int
        Positions tried on each side of the widest step; improving moves made
        at most.

    Returns
    -------
    (width, order)

    Notes
    -----
    Each round costs ``O(window^2 * (k + pairs))``.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.problems.cycles import FaceSweep
    >>> P = generators.grid(3, 5)
    >>> inner = [f for f in P.faces if f != P.outer_face]
    >>> fs = FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), inner)
    >>> w, order = improve_sweep(fs, inner)
    >>> w == max(fs.profile(order)) and sorted(order) == sorted(inner)
    True
    """
    idx = np.array(fs.local(order), dtype=np.int64)
    if idx.shape[0] != fs.k or len(set(idx.tolist())) != fs.k:
        raise InvalidArgumentError("improve_sweep needs every free face exactly once")
    if fs.k < 2:
        return float(max(fs.profile(order))), list(order)
    indptr, indices, sw, lin, w0 = sweep_arrays(fs)
    fn = _improve_rounds if HAVE_NUMBA else getattr(_improve_rounds, "py_func", _improve_rounds)
    chunk = 20 if HAVE_NUMBA else 2
    done = 0
    best = math.inf
    while done < max_rounds:
        best, idx, more = fn(idx, indptr, indices, sw, lin, w0, int(window), chunk)
        done += chunk
        if not more or (deadline is not None and time.monotonic() > deadline):
            break
    faces = [fs.faces[int(i)] for i in idx]
    return float(max(fs.profile(faces))), faces

"""Vectorised building blocks of PlaneGraph: cycles of permutations, face tracing, face meshes.

Everything here works on numpy integer arrays of darts and returns exactly
what the pure-Python loops of :mod:`._graph` compute (cycle orders starting
at the smallest element, ids in order of the smallest element); the tests
compare the two on random inputs.  When an input is invalid, these
functions only *detect* it and return ``None``; the caller then reruns the
plain loops, which raise the precise error message.
"""

from __future__ import annotations

from typing import Hashable, Sequence

import numpy as np

__all__ = ["cycles", "split", "Ragged", "components", "mesh_arrays", "FAST_MIN_DARTS", "LOCKSTEP_STEPS"]

#: below this many darts the plain Python loops are faster than numpy's overhead
FAST_MIN_DARTS = 256


#: cycles up to this length are ranked by walking them in lockstep; longer ones by pointer jumping
LOCKSTEP_STEPS = 64


def cycles(perm: np.ndarray, inverse: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """The smallest element of each element's cycle, and its distance from it along ``perm``.

    Parameters
    ----------
    perm : ndarray of int64
        A permutation of ``0..k-1``.
    inverse : ndarray of int64
        Its inverse.

    Returns
    -------
    head, rank : ndarray
        ``head[x]`` is the least element of the cycle through ``x`` and
        ``perm^rank[x](head[x]) == x``.

    Notes
    -----
    Cycles are the connected components of the functional graph (scipy,
    linear time); each cycle's least element is its head.  Ranks come from
    walking every cycle from its head in lockstep for up to
    ``LOCKSTEP_STEPS`` steps (the walkers of finished cycles drop out), and
    for the few longer cycles from list ranking by pointer jumping, which
    takes O(s log L) for s elements on cycles of length at most L.  In all
    O(k + s log L).
    """
    from scipy.sparse import csr_matrix
    from scipy.sparse.csgraph import connected_components

    k = perm.shape[0]
    ar = np.arange(k, dtype=np.int64)
    A = csr_matrix((np.ones(k, dtype=np.int8), (ar, perm)), shape=(k, k))
    nc, lab = connected_components(A, directed=True, connection="weak")
    mins = np.full(nc, k, dtype=np.int64)
    np.minimum.at(mins, lab, ar)
    head = mins[lab]
    rank = np.zeros(k, dtype=np.int64)
    walker_head = mins.copy()  # one walker per cycle, starting at its head
    at = walker_head.copy()
    for step in range(1, LOCKSTEP_STEPS + 1):
        at = perm[at]
        alive = at != walker_head
        at, walker_head = at[alive], walker_head[alive]
        if at.size == 0:
            return head, rank
        rank[at] = step
    # cycles longer than LOCKSTEP_STEPS: list ranking backwards towards the head
    long_cycle = np.zeros(nc, dtype=bool)
    long_cycle[lab[walker_head]] = True
    members = np.flatnonzero(long_cycle[lab])
    local = np.full(k, -1, dtype=np.int64)
    local[members] = np.arange(members.shape[0], dtype=np.int64)
    is_head = head[members] == members
    lr = np.arange(members.shape[0], dtype=np.int64)
    q = np.where(is_head, lr, local[inverse[members]])
    r = (~is_head).astype(np.int64)
    while not is_head[q].all():
        r = r + r[q]
        q = q[q]
    rank[members] = r
    return head, rank


class Ragged(Sequence):  # type: ignore[type-arg]
    """A read-only list of int lists stored flat: ``R[i]`` is a fresh list, slices of one flat list.

    Stands in for the list of lists of the plain path (``len``, indexing,
    iteration) without building a Python list per face or vertex up front.
    """

    __slots__ = ("_flat", "_off")

    def __init__(self, flat: list[int], offsets: list[int]) -> None:
        self._flat = flat
        self._off = offsets

    def __len__(self) -> int:
        return len(self._off) - 1

    def __getitem__(self, i: int) -> list[int]:  # type: ignore[override]
        if i < 0:
            i += len(self._off) - 1
        if not 0 <= i < len(self._off) - 1:
            raise IndexError(i)
        return self._flat[self._off[i] : self._off[i + 1]]

    def __iter__(self):  # type: ignore[no-untyped-def]
        f, o = self._flat, self._off
        for i in range(len(o) - 1):
            yield f[o[i] : o[i + 1]]

    def __eq__(self, other: object) -> bool:
        try:
            return len(self) == len(other) and all(a == b for a, b in zip(self, other))  # type: ignore
        except TypeError:
            return NotImplemented

    def lengths(self) -> np.ndarray:
        return np.diff(np.asarray(self._off, dtype=np.int64))


def split(flat: np.ndarray, counts: np.ndarray) -> Ragged:
    """Consecutive pieces of ``flat`` with the given lengths, as a :class:`Ragged` list."""
    off = np.zeros(counts.shape[0] + 1, dtype=np.int64)
    np.cumsum(counts, out=off[1:])
    return Ragged(flat.tolist(), off.tolist())


def components(n: int, eu: np.ndarray, ev: np.ndarray) -> np.ndarray:
    """Connected-component label of each of ``n`` vertices (scipy, linear time)."""
    from scipy.sparse import coo_matrix
    from scipy.sparse.csgraph import connected_components

    m = eu.shape[0]
    A = coo_matrix((np.ones(m, dtype=np.int8), (eu, ev)), shape=(n, n))
    _, lab = connected_components(A, directed=False)
    return lab


def mesh_arrays(
    faces: Sequence[Sequence[Hashable]] | np.ndarray,
) -> tuple[list[Hashable], np.ndarray, np.ndarray] | None:
    """Labels in order of first appearance, the flat vertex-index array and the face lengths.

    Returns None when the input is not a plain list of faces (the caller
    then takes the plain path, which reports any problem).
    """
    if isinstance(faces, np.ndarray):
        if faces.ndim != 2 or faces.shape[1] < 1 or faces.dtype.kind not in "iu":
            return None
        flat_raw = faces.reshape(-1).astype(np.int64)
        uniq, first, inv = np.unique(flat_raw, return_index=True, return_inverse=True)
        order = np.argsort(first, kind="stable")
        rank = np.empty(len(uniq), dtype=np.int64)
        rank[order] = np.arange(len(uniq))
        labels = uniq[order].tolist()
        lens = np.full(faces.shape[0], faces.shape[1], dtype=np.int64)
        return labels, rank[inv.reshape(-1)], lens
    try:
        lists = [list(fc) for fc in faces]
        index: dict[Hashable, int] = {}
        for fc in lists:
            for v in fc:
                if v not in index:
                    index[v] = len(index)
        flat = np.fromiter((index[v] for fc in lists for v in fc), dtype=np.int64)
    except TypeError:
        return None
    lens = np.fromiter((len(fc) for fc in lists), dtype=np.int64, count=len(lists))
    return list(index), flat, lens

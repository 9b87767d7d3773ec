"""Geometry of straight-line drawings: angular rotation and crossing detection (numpy)."""

from __future__ import annotations

from typing import Hashable, Sequence

import numpy as np

from ..errors import CrossingEdgesError, InvalidEmbeddingError

__all__ = ["drawing_rotation", "find_crossing"]


def drawing_rotation(
    xy: np.ndarray, ends: Sequence[tuple[int, int]], labels: Sequence[Hashable]
) -> tuple[list[int], int | None]:
    """Counterclockwise rotation of a straight-line drawing and a dart of its unbounded face.

    Raises CrossingEdgesError when two edges cross, overlap, or an edge runs
    through a vertex; InvalidEmbeddingError when two vertices coincide.
    """
    m = len(ends)
    if m == 0:
        return [], None
    E = np.asarray(ends, dtype=np.int64).reshape(m, 2)
    # coincident vertices
    order = np.lexsort((xy[:, 1], xy[:, 0]))
    sx = xy[order]
    same = np.all(sx[1:] == sx[:-1], axis=1)
    if same.any():
        k = int(np.argmax(same))
        raise InvalidEmbeddingError(
            f"vertices {labels[order[k]]!r} and {labels[order[k + 1]]!r} are drawn at the same point {tuple(sx[k])}"
        )
    tail = np.empty(2 * m, dtype=np.int64)
    head = np.empty(2 * m, dtype=np.int64)
    tail[0::2], head[0::2] = E[:, 0], E[:, 1]
    tail[1::2], head[1::2] = E[:, 1], E[:, 0]
    vec = xy[head] - xy[tail]
    ang = np.arctan2(vec[:, 1], vec[:, 0])
    srt = np.lexsort((ang, tail))
    st = tail[srt]
    # overlapping edges at a common vertex: equal directions
    same_tail = st[1:] == st[:-1]
    a, b = srt[:-1][same_tail], srt[1:][same_tail]
    cross = vec[a, 0] * vec[b, 1] - vec[a, 1] * vec[b, 0]
    dot = vec[a, 0] * vec[b, 0] + vec[a, 1] * vec[b, 1]
    bad = (cross == 0) & (dot > 0)
    if bad.any():
        k = int(np.argmax(bad))
        d1, d2 = int(a[k]), int(b[k])
        raise CrossingEdgesError(
            f"edges {_name(d1 >> 1, E, labels)} and {_name(d2 >> 1, E, labels)} overlap "
            f"(they leave {labels[int(tail[d1])]!r} in the same direction)",
            (_pair(d1 >> 1, E, labels), _pair(d2 >> 1, E, labels)),
        )
    # next in sorted order within each tail group, cyclically
    nxt = np.empty(2 * m, dtype=np.int64)
    starts = np.flatnonzero(np.r_[True, st[1:] != st[:-1]])
    stops = np.r_[starts[1:], 2 * m]
    nxt[srt[:-1]] = srt[1:]
    nxt[srt[stops - 1]] = srt[starts]
    hit = find_crossing(xy, E)
    if hit is not None:
        e1, e2 = hit
        raise CrossingEdgesError(
            f"edges {_name(e1, E, labels)} and {_name(e2, E, labels)} cross or touch in the drawing",
            (_pair(e1, E, labels), _pair(e2, E, labels)),
        )
    # leftmost (then lowest) vertex: its largest-angle dart has the unbounded face on its left
    v0 = int(order[0])
    mask = tail == v0
    if not mask.any():
        return nxt.tolist(), None
    darts = np.flatnonzero(mask)
    outer = int(darts[np.argmax(ang[darts])])
    return nxt.tolist(), outer


def _pair(e: int, E: np.ndarray, labels: Sequence[Hashable]) -> tuple:
    return (labels[int(E[e, 0])], labels[int(E[e, 1])])


def _name(e: int, E: np.ndarray, labels: Sequence[Hashable]) -> str:
    u, v = _pair(e, E, labels)
    return f"({u!r}, {v!r})"


def _orient(ax, ay, bx, by, cx, cy):  # type: ignore[no-untyped-def]
    return np.sign((bx - ax) * (cy - ay) - (by - ay) * (cx - ax))


def find_crossing(xy: np.ndarray, E: np.ndarray) -> tuple[int, int] | None:
    """A pair of edges that intersect anywhere except at a shared end, or None.

    A uniform grid over the bounding box buckets the segments; only segments
    sharing a cell are compared (vectorised), so well-spread drawings take
    near-linear time.
    """
    m = E.shape[0]
    if m < 2:
        return None
    P0 = xy[E[:, 0]]
    P1 = xy[E[:, 1]]
    lo = np.minimum(P0, P1)
    hi = np.maximum(P0, P1)
    bmin = lo.min(axis=0)
    bmax = hi.max(axis=0)
    span = np.maximum(bmax - bmin, 1e-300)
    g = int(max(1, min(4096, np.sqrt(m))))
    cell = span / g
    c0 = np.clip(((lo - bmin) / cell).astype(np.int64), 0, g - 1)
    c1 = np.clip(((hi - bmin) / cell).astype(np.int64), 0, g - 1)
    nx_ = c1[:, 0] - c0[:, 0] + 1
    ny_ = c1[:, 1] - c0[:, 1] + 1
    counts = nx_ * ny_
    total = int(counts.sum())
    if total > 50 * m + 10**6:
        # very long edges: fall back to fewer cells
        g = max(1, g // 8)
        cell = span / g
        c0 = np.clip(((lo - bmin) / cell).astype(np.int64), 0, g - 1)
        c1 = np.clip(((hi - bmin) / cell).astype(np.int64), 0, g - 1)
        nx_ = c1[:, 0] - c0[:, 0] + 1
        ny_ = c1[:, 1] - c0[:, 1] + 1
        counts = nx_ * ny_
        total = int(counts.sum())
    seg = np.repeat(np.arange(m), counts)
    offs = np.arange(total) - np.repeat(np.cumsum(counts) - counts, counts)
    cx = c0[seg, 0] + offs % nx_[seg]
    cy = c0[seg, 1] + offs // nx_[seg]
    key = cx * g + cy
    o = np.argsort(key, kind="stable")
    key, seg = key[o], seg[o]
    pa: list[np.ndarray] = []
    pb: list[np.ndarray] = []
    j = 1
    while j < len(key):
        same = key[j:] == key[:-j]
        if not same.any():
            break
        pa.append(seg[:-j][same])
        pb.append(seg[j:][same])
        j += 1
        if sum(len(x) for x in pa) > 5 * 10**7:
            break
    if not pa:
        return None
    A = np.concatenate(pa)
    B = np.concatenate(pb)
    a, b = np.minimum(A, B), np.maximum(A, B)
    keep = a != b
    a, b = a[keep], b[keep]
    # drop pairs sharing an end (their overlap is found from the angles)
    share = (
        (E[a, 0] == E[b, 0]) | (E[a, 0] == E[b, 1]) | (E[a, 1] == E[b, 0]) | (E[a, 1] == E[b, 1])
    )
    a, b = a[~share], b[~share]
    if len(a) == 0:
        return None
    # bounding boxes overlap?
    ov = np.all((lo[a] <= hi[b]) & (lo[b] <= hi[a]), axis=1)
    a, b = a[ov], b[ov]
    if len(a) == 0:
        return None
    p, q = P0[a], P1[a]
    r, s = P0[b], P1[b]
    o1 = _orient(p[:, 0], p[:, 1], q[:, 0], q[:, 1], r[:, 0], r[:, 1])
    o2 = _orient(p[:, 0], p[:, 1], q[:, 0], q[:, 1], s[:, 0], s[:, 1])
    o3 = _orient(r[:, 0], r[:, 1], s[:, 0], s[:, 1], p[:, 0], p[:, 1])
    o4 = _orient(r[:, 0], r[:, 1], s[:, 0], s[:, 1], q[:, 0], q[:, 1])
    proper = (o1 * o2 <= 0) & (o3 * o4 <= 0)
    # collinear pairs: bounding boxes already overlap; all four orientations zero means overlap
    colinear = (o1 == 0) & (o2 == 0) & (o3 == 0) & (o4 == 0)
    hit = proper | colinear
    if not hit.any():
        return None
    k = int(np.argmax(hit))
    return int(a[k]), int(b[k])

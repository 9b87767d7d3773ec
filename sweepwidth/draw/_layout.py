"""Where things go: vertex positions, edge curves (arcs for parallels, petals for loops), face points.

Everything here is plain numpy; matplotlib is not needed to compute a
layout, so these functions can be tested and reused without the ``plot``
extra.
"""

from __future__ import annotations

import math
from typing import Hashable

import networkx as nx
import numpy as np

from ..errors import InvalidArgumentError, OperationError, SweepwidthError
from ..plane import PlaneGraph

__all__ = ["layout_positions", "Geometry"]

_SAMPLES = 33  # points sampled along a curved edge


# ----------------------------------------------------------------- positions
def _simple_rotation(P: PlaneGraph) -> dict[Hashable, list[Hashable]]:
    """Counterclockwise neighbour lists of the simple underlying graph.

    Loops are dropped and, of each bundle of parallel edges, the one with the
    smallest id is kept *at both ends*, so the result is again a planar
    rotation system (deleting edges keeps an embedding planar).
    """
    rep: dict[frozenset, int] = {}
    for e in range(P.number_of_edges()):
        u, v = P.edge_ends(e)
        if u == v:
            continue
        key = frozenset((u, v))
        if key not in rep:
            rep[key] = e
    keep = set(rep.values())
    return {v: [P.head(d) for d in P.darts_at(v) if (d >> 1) in keep] for v in P.vertices}


def _angular_orders(rot: dict[Hashable, list[Hashable]], pos: dict[Hashable, np.ndarray]) -> dict:
    out = {}
    for v, nbrs in rot.items():
        ang = {w: math.atan2(pos[w][1] - pos[v][1], pos[w][0] - pos[v][0]) for w in nbrs}
        out[v] = sorted(nbrs, key=lambda w: ang[w])
    return out


def _cyclic_equal(a: list, b: list) -> bool:
    if len(a) != len(b):
        return False
    if not a:
        return True
    try:
        k = b.index(a[0])
    except ValueError:
        return False
    return b[k:] + b[:k] == a


def _drawing_agrees(rot: dict[Hashable, list[Hashable]], pos: dict[Hashable, np.ndarray]) -> int:
    """+1 if the straight-line drawing ``pos`` has rotation ``rot``, -1 if its mirror, 0 otherwise.

    Crossings are checked too (a drawing with the right rotation at every
    vertex can still cross itself).
    """
    from ..plane import find_crossing

    verts = list(rot)
    index = {v: i for i, v in enumerate(verts)}
    xy = np.array([pos[v] for v in verts], dtype=float)
    if len(verts) > 1:
        srt = np.lexsort((xy[:, 1], xy[:, 0]))
        if np.any(np.all(xy[srt[1:]] == xy[srt[:-1]], axis=1)):
            return 0
    edges = sorted({(min(index[u], index[w]), max(index[u], index[w])) for u in rot for w in rot[u]})
    if edges and find_crossing(xy, np.asarray(edges, dtype=np.int64)) is not None:
        return 0
    # two edges leaving a vertex in the same direction overlap (or one runs through the other's end)
    for v in verts:
        if len(rot[v]) < 2:
            continue
        ang = np.sort([math.atan2(pos[w][1] - pos[v][1], pos[w][0] - pos[v][0]) for w in rot[v]])
        gaps = np.diff(np.concatenate([ang, ang[:1] + 2 * math.pi]))
        if gaps.min() < 1e-9:
            return 0
    orders = _angular_orders(rot, pos)
    if all(_cyclic_equal(rot[v], orders[v]) for v in verts):
        return 1
    if all(_cyclic_equal(rot[v][::-1], orders[v]) for v in verts):
        return -1
    return 0


def _outer_cycle(P: PlaneGraph, rot: dict[Hashable, list[Hashable]]) -> list[Hashable] | None:
    """The outer face's boundary as a simple vertex cycle (in traversal order), or None."""
    walk = P.boundary_walk(P.outer_face)
    if len(walk) < 3 or len(set(walk)) != len(walk):
        return None
    return walk


def _tutte(
    P: PlaneGraph, rot: dict[Hashable, list[Hashable]], cycle: list[Hashable], rounds: int = 12,
    power: float = 1.0,
) -> dict[Hashable, np.ndarray]:
    """Barycentric (Tutte) drawing with the outer cycle fixed on a circle.

    Plain barycentres crowd vertices exponentially towards some corners; a few
    rounds reweight every edge by its current length (longer edges pull
    harder), which spreads the crowds.  Any positive weights keep the drawing
    planar for 3-connected graphs (Floater's convex combination theorem);
    the caller checks the result anyway.
    """
    from scipy.sparse import coo_matrix
    from scipy.sparse.linalg import spsolve

    k = len(cycle)
    pos: dict[Hashable, np.ndarray] = {}
    # the outer face lies on the left of its boundary darts, so the walk runs
    # clockwise around the drawing: place it at decreasing angles
    # sides next to a busy vertex get short arcs, which opens its inner angle
    # (an inscribed polygon's angle at v is pi minus half the arcs beside v)
    deg = [max(len(rot[v]), 1) for v in cycle]
    arcs = np.array([1.0 / (deg[i] + deg[(i + 1) % k]) for i in range(k)]) if k > 3 else np.ones(k)
    arcs = 2 * math.pi * arcs / arcs.sum()
    t = math.pi / 2
    for i, v in enumerate(cycle):
        pos[v] = np.array([math.cos(t), math.sin(t)])
        t -= float(arcs[i])
    inner = [v for v in rot if v not in pos]
    if not inner:
        return pos
    if any(not rot[v] for v in inner):
        raise InvalidArgumentError("an interior vertex has no neighbours")
    ni = len(inner)
    idx = {v: i for i, v in enumerate(inner)}
    fixed = [v for v in rot if v not in idx]
    fidx = {v: i for i, v in enumerate(fixed)}
    fxy = np.array([pos[v] for v in fixed], dtype=float).reshape(-1, 2)
    src, dst_inner, dst_fixed = [], [], []
    for v in inner:
        for w in rot[v]:
            src.append(idx[v])
            dst_inner.append(idx.get(w, -1))
            dst_fixed.append(fidx.get(w, -1))
    src_a = np.asarray(src)
    di = np.asarray(dst_inner)
    df = np.asarray(dst_fixed)
    to_inner = di >= 0
    weights = np.ones(len(src_a))
    xy = np.zeros((ni, 2))
    for r in range(rounds + 1):
        diag = np.bincount(src_a, weights=weights, minlength=ni)
        rows = np.concatenate([src_a[to_inner], np.arange(ni)])
        cols = np.concatenate([di[to_inner], np.arange(ni)])
        vals = np.concatenate([-weights[to_inner], diag])
        A = coo_matrix((vals, (rows, cols)), shape=(ni, ni)).tocsr()
        b = np.zeros((ni, 2))
        if (~to_inner).any():
            np.add.at(b, src_a[~to_inner], weights[~to_inner, None] * fxy[df[~to_inner]])
        sol = np.atleast_2d(spsolve(A, b)).reshape(ni, 2)
        if not np.all(np.isfinite(sol)):
            raise OperationError("singular barycentric system")
        xy = sol
        if r < rounds:
            other = np.where(to_inner[:, None], xy[np.maximum(di, 0)], fxy[np.maximum(df, 0)] if len(fxy) else 0.0)
            lengths = np.hypot(*(xy[src_a] - other).T)
            weights = np.maximum(lengths, 1e-9) ** power
            weights = weights / weights.mean()
    for v in inner:
        pos[v] = np.asarray(xy[idx[v]], dtype=float)
    return pos


_FRAME = "__sweepwidth_frame__"


def _framed_tutte(P: PlaneGraph, rot: dict[Hashable, list[Hashable]]) -> dict[Hashable, np.ndarray]:
    """Barycentric drawing inside a frame: one helper vertex per corner of the outer face.

    The helpers form a cycle around the graph and each is joined to its
    corner, so the outer boundary becomes a simple cycle even when the outer
    face's walk repeats vertices (trees, loops, cut vertices).
    """
    walk = P.face_darts(P.outer_face)
    k = len(walk)
    if k < 3:
        raise InvalidArgumentError("outer face too short for a frame")
    frame = [(_FRAME, i) for i in range(k)]
    frot = {v: list(nbrs) for v, nbrs in rot.items()}
    # the corner of the outer face at tail(d) follows head(d) counterclockwise
    inserts: dict[Hashable, list[tuple[Hashable, Hashable]]] = {}
    for i, d in enumerate(walk):
        inserts.setdefault(P.tail(d), []).append((P.head(d), frame[i]))
    for u, items in inserts.items():
        lst = frot[u]
        for w, fv in items:
            j = lst.index(w)
            lst.insert(j + 1, fv)
    for i in range(k):
        frot[frame[i]] = [frame[i - 1], P.tail(walk[i]), frame[(i + 1) % k]]
    Pf = PlaneGraph.from_rotation(frot, outer=list(frame))
    cycle = Pf.boundary_walk(Pf.outer_face)
    # a helper in every inner face, joined to each of its corners, keeps degree-2
    # vertices (bends of loops and parallel edges) off the lines through their neighbours
    adj = {v: list(nbrs) for v, nbrs in frot.items()}
    for f in Pf.faces:
        if f == Pf.outer_face:
            continue
        z = (_FRAME, "face", f)
        corners = Pf.boundary_walk(f)
        adj[z] = list(corners)
        for c in corners:
            adj[c].append(z)
    pos = _tutte(Pf, adj, cycle)
    return {v: pos[v] for v in rot}


def _chrobak_payne(P: PlaneGraph, rot: dict[Hashable, list[Hashable]]) -> dict[Hashable, np.ndarray]:
    """networkx's grid drawing of the simple rotation, with our outer face made outer.

    networkx takes the face with the most vertices as the outer one; a pendant
    path of helper vertices hung into a corner of our outer face makes it the
    largest.  The helpers are dropped afterwards.
    """
    verts = list(rot)
    emb = nx.PlanarEmbedding()
    emb.add_nodes_from(verts)
    cw = {v: list(reversed(rot[v])) for v in verts}
    helpers: list[tuple] = []
    walk = P.face_darts(P.outer_face)
    corner = None
    for d in walk:
        u, w = P.tail(d), P.head(d)
        if u != w and w in rot[u]:
            corner = (u, w)
            break
    if corner is not None and len(verts) >= 3:
        u, w = corner
        helpers = [("__sweepwidth_helper__", i) for i in range(len(verts) + 1)]
        # the outer face's corner at u follows w counterclockwise: insert there
        ccw = list(rot[u])
        j = ccw.index(w)
        ccw.insert(j + 1, helpers[0])
        cw[u] = list(reversed(ccw))
        chain = [u] + helpers
        for a, b in zip(chain[1:], chain[2:] + [None]):
            prev = chain[chain.index(a) - 1]
            cw[a] = [prev] if b is None else [prev, b]
    data = {v: cw[v] for v in cw}
    emb.set_data(data)
    raw = nx.combinatorial_embedding_to_pos(emb)
    return {v: np.array(raw[v], dtype=float) for v in verts}


def _needs_bends(P: PlaneGraph) -> bool:
    """Whether drawing ``P`` needs bend vertices: a loop whose two darts are separated by a
    non-loop dart, or a bundle of parallel edges whose darts are not consecutive at an end."""
    for u in P.vertices:
        ring = P.darts_at(u)
        k = len(ring)
        isloop = [P.head(d) == u for d in ring]
        if any(isloop) and not all(isloop):
            start = (isloop.index(False) + 1) % k
            lin = ring[start:] + ring[:start]
            gap_of, g = {}, 0
            for d in lin:
                if P.head(d) == u:
                    gap_of[d] = g
                else:
                    g += 1
            if any(gap_of[2 * (d >> 1)] != gap_of[2 * (d >> 1) + 1] for d in gap_of):
                return True
        heads = [P.head(d) for d in ring]
        for w in set(heads):
            if w == u or heads.count(w) < 2:
                continue
            inb = [h == w for h in heads]
            starts = sum(1 for i in range(k) if inb[i] and not inb[i - 1])
            if starts > 1:
                return True
    return False


def _given_positions(P: PlaneGraph) -> dict[Hashable, tuple[float, float]] | None:
    """``P.pos`` when it covers every vertex and its straight segments realise the rotation."""
    if P.pos is None or not all(v in P.pos for v in P.vertices):
        return None
    given = {v: (float(P.pos[v][0]), float(P.pos[v][1])) for v in P.vertices}
    if _drawing_agrees(_simple_rotation(P), {v: np.array(p) for v, p in given.items()}) != 1:
        return None
    if P.number_of_edges():
        unbounded = _unbounded_face(P, given)
        if unbounded is not None and unbounded != P.outer_face:
            return None  # the drawing would put another face outside
    return given


def _unbounded_face(P: PlaneGraph, pos: dict) -> int | None:
    """The face that a straight-line drawing ``pos`` leaves unbounded (loops ignored)."""
    v0 = min(P.vertices, key=lambda v: (pos[v][0], pos[v][1]))
    darts = [d for d in P.darts_at(v0) if P.head(d) != v0]
    if not darts:
        return None
    x0, y0 = pos[v0]
    # the dart turning furthest counterclockwise from straight down has the unbounded face on its left
    best = max(darts, key=lambda d: math.atan2(pos[P.head(d)][1] - y0, pos[P.head(d)][0] - x0))
    return P.face_of_dart(best)


def _layout_simple(P: PlaneGraph) -> dict[Hashable, tuple[float, float]]:
    """A planar straight-line layout of the simple underlying graph of ``P`` (ignores ``P.pos``)."""
    verts = P.vertices
    n = len(verts)
    if n == 1:
        return {verts[0]: (0.0, 0.0)}
    if n == 2:
        return {verts[0]: (0.0, 0.0), verts[1]: (1.0, 0.0)}
    rot = _simple_rotation(P)
    cycle = _outer_cycle(P, rot)
    makers = []
    if cycle is not None:
        makers.append(lambda: _tutte(P, rot, cycle))
    makers.append(lambda: _framed_tutte(P, rot))
    makers.append(lambda: _chrobak_payne(P, rot))
    for make in makers:
        try:
            pos = make()
        except Exception:  # a singular system or a frame that does not fit: try the next drawing
            continue
        sign = _drawing_agrees(rot, pos)
        if sign:
            return {v: (float(sign * p[0]), float(p[1])) for v, p in pos.items()}
    # the grid drawing always realises the rotation; reaching here means a bug upstream
    raise OperationError("could not lay out the embedding without crossings")




_DUMMY = "__sweepwidth_bend__"


def _subdivided(P: PlaneGraph) -> tuple[PlaneGraph, list[list[Hashable]]]:
    """``P`` with bend vertices on loops (two) and on all but one edge of each parallel bundle (one).

    The result is a simple plane graph with the same rotation (each dart
    replaced by the first piece of its subdivided edge) and the same outer
    face; ``chains[e]`` lists the vertices along edge ``e`` from
    ``edge_ends(e)[0]`` to ``edge_ends(e)[1]``.
    """
    m = P.number_of_edges()
    seen: set[frozenset] = set()
    chains: list[list[Hashable]] = []
    for e in range(m):
        u, v = P.edge_ends(e)
        if u == v:
            chains.append([u, (_DUMMY, e, 0), (_DUMMY, e, 1), v])
            continue
        key = frozenset((u, v))
        if key in seen:
            chains.append([u, (_DUMMY, e, 0), v])
        else:
            seen.add(key)
            chains.append([u, v])
    rot: dict[Hashable, list[Hashable]] = {}
    for v in P.vertices:
        lst = []
        for d in P.darts_at(v):
            ch = chains[d >> 1]
            lst.append(ch[1] if d % 2 == 0 else ch[-2])
        rot[v] = lst
    for ch in chains:
        for i in range(1, len(ch) - 1):
            rot[ch[i]] = [ch[i - 1], ch[i + 1]]
    outer_darts = P.face_darts(P.outer_face)
    outer = None
    if outer_darts:
        d = outer_darts[0]
        ch = chains[d >> 1]
        outer = (ch[0], ch[1]) if d % 2 == 0 else (ch[-1], ch[-2])
    S = PlaneGraph.from_rotation(rot, outer=outer)
    return S, chains


def layout_positions(P: PlaneGraph, *, keep_pos: bool = False) -> dict[Hashable, tuple[float, float]]:
    """Vertex positions for drawing ``P``: its own drawing, else a planar layout of its rotation.

    ``P.pos`` is used when it covers every vertex and its straight segments
    realise the rotation without crossings (always so for graphs built with
    ``from_positions``); with ``keep_pos=True`` it is used whenever it covers
    every vertex.  Positions that do not fit the rotation, such as the face
    points a dual carries, are replaced by a layout: loops and parallel
    edges get bend vertices, and the resulting simple graph is drawn with a
    barycentric drawing with the outer face on a circle when that keeps the
    rotation and has no crossings (always the case for 3-connected graphs),
    else with the Chrobak-Payne grid drawing.  The result is checked against
    the rotation and mirrored when needed, so the picture shows *this*
    embedding, with ``P.outer_face`` outside.

    Parameters
    ----------
    P : PlaneGraph
    keep_pos : bool
        Use ``P.pos`` whenever it covers every vertex, without checking it.

    Returns
    -------
    dict
        ``{vertex: (x, y)}``.

    Notes
    -----
    O(n + m) for the grid drawing, a few sparse solves for the barycentric
    one, and a near-linear crossing check.

    References
    ----------
    .. [1] W. T. Tutte, "How to draw a graph", Proc. London Math. Soc. 13, 1963.
    .. [2] M. S. Floater, "One-to-one piecewise linear mappings over
       triangulations", Mathematics of Computation 72(242), 2003.
    .. [3] M. Chrobak and T. H. Payne, "A linear-time algorithm for drawing a
       planar graph on a grid", Information Processing Letters 54(4), 1995.

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.octahedral_graph())
    >>> pos = layout_positions(P)
    >>> sorted(pos) == sorted(P.vertices)
    True
    """
    if keep_pos and P.pos is not None and all(v in P.pos for v in P.vertices):
        return {v: (float(P.pos[v][0]), float(P.pos[v][1])) for v in P.vertices}
    given = _given_positions(P)
    if given is not None:
        return given
    if not _needs_bends(P):
        return _layout_simple(P)
    plan = _plan(P)
    return {v: plan[0][v] for v in P.vertices}


def _plan(P: PlaneGraph) -> tuple[dict[Hashable, tuple[float, float]], list[list[Hashable]]]:
    """Positions of the vertices and bend points of a computed layout, and the chains of each edge."""
    S, chains = _subdivided(P)
    return _layout_simple(S), chains


# ----------------------------------------------------------------- geometry
def _bezier2(a: np.ndarray, c: np.ndarray, b: np.ndarray, n: int = _SAMPLES) -> np.ndarray:
    t = np.linspace(0.0, 1.0, n)[:, None]
    return (1 - t) ** 2 * a + 2 * (1 - t) * t * c + t**2 * b


def _bezier3(a: np.ndarray, c1: np.ndarray, c2: np.ndarray, b: np.ndarray, n: int = _SAMPLES) -> np.ndarray:
    t = np.linspace(0.0, 1.0, n)[:, None]
    return (1 - t) ** 3 * a + 3 * (1 - t) ** 2 * t * c1 + 3 * (1 - t) * t**2 * c2 + t**3 * b


def _through(points: list[np.ndarray], per: int = 16) -> np.ndarray:
    """A smooth curve through ``points`` (Catmull-Rom); closed when the first and last coincide."""
    if len(points) == 2:
        return np.vstack(points)
    closed = bool(np.allclose(points[0], points[-1]))
    pts = points[:-1] if closed else points
    k = len(pts)
    out = []
    segs = k if closed else k - 1
    for i in range(segs):
        if closed:
            p0, p1, p2, p3 = pts[(i - 1) % k], pts[i], pts[(i + 1) % k], pts[(i + 2) % k]
        else:
            p1, p2 = pts[i], pts[i + 1]
            p0 = pts[i - 1] if i > 0 else 2 * p1 - p2
            p3 = pts[i + 2] if i + 2 < k else 2 * p2 - p1
        t = np.linspace(0.0, 1.0, per, endpoint=False)[:, None]
        t2, t3 = t * t, t * t * t
        seg = 0.5 * (2 * p1 + (-p0 + p2) * t + (2 * p0 - 5 * p1 + 4 * p2 - p3) * t2 + (-p0 + 3 * p1 - 3 * p2 + p3) * t3)
        out.append(seg)
    out.append((pts[0] if closed else pts[-1])[None, :])
    return np.vstack(out)


def _petal(a: np.ndarray, lo: float, hi: float, radius: float, n: int = 41) -> np.ndarray:
    """A loop at ``a`` filling the angular sector ``lo..hi`` (counterclockwise), ``radius`` deep.

    In polar form r(t) = radius * sin(pi t) ** 0.35 for t in 0..1: the curve
    stays inside its sector, so loops with nested sectors and smaller radii
    are drawn nested.
    """
    t = np.linspace(0.0, 1.0, n)
    th = lo + (hi - lo) * t
    r = radius * np.sin(np.pi * t).clip(0.0) ** 0.35
    pts = a + np.column_stack([r * np.cos(th), r * np.sin(th)])
    pts[0] = a
    pts[-1] = a
    return pts


def _unit(v: np.ndarray) -> np.ndarray:
    n = float(np.hypot(v[0], v[1]))
    return v / n if n > 0 else np.array([1.0, 0.0])


def _left(v: np.ndarray) -> np.ndarray:
    return np.array([-v[1], v[0]])


def _polyline_point(pts: np.ndarray, t: float) -> np.ndarray:
    """The point at fraction ``t`` of the arc length of a polyline."""
    seg = np.hypot(*(pts[1:] - pts[:-1]).T)
    total = float(seg.sum())
    if total == 0:
        return pts[0].copy()
    target = t * total
    acc = np.concatenate([[0.0], np.cumsum(seg)])
    i = int(np.searchsorted(acc, target, side="right") - 1)
    i = min(max(i, 0), len(seg) - 1)
    r = (target - acc[i]) / seg[i] if seg[i] > 0 else 0.0
    return pts[i] + r * (pts[i + 1] - pts[i])


def _point_in_polygon(p: np.ndarray, poly: np.ndarray) -> bool:
    x, y = p
    xs, ys = poly[:, 0], poly[:, 1]
    xj, yj = np.roll(xs, 1), np.roll(ys, 1)
    cond = (ys > y) != (yj > y)
    with np.errstate(divide="ignore", invalid="ignore"):
        xint = (xj - xs) * (y - ys) / (yj - ys) + xs
    return bool(np.count_nonzero(cond & (x < xint)) % 2)


def _dist_to_polyline(p: np.ndarray, poly: np.ndarray) -> float:
    a = poly
    b = np.roll(poly, -1, axis=0)
    ab = b - a
    L2 = (ab**2).sum(axis=1)
    L2[L2 == 0] = 1.0
    t = np.clip(((p - a) * ab).sum(axis=1) / L2, 0.0, 1.0)
    proj = a + t[:, None] * ab
    return float(np.min(np.hypot(*(p - proj).T)))


class Geometry:
    """The drawn shape of every edge and face of a plane graph, in data coordinates.

    Straight segments for simple edges, quadratic arcs fanned out in rotation
    order for parallel edges, and cubic petals for loops, placed in the
    angular gap the rotation gives them (nested loops drawn nested).

    Parameters
    ----------
    P : PlaneGraph
    pos : dict, optional
        Vertex positions; default :func:`layout_positions`.

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.cycle_graph(3)).dual()   # two vertices, three parallel edges
    >>> g = Geometry(P, {0: (0.0, 0.0), 1: (1.0, 0.0)})
    >>> sorted(round(float(g.midpoint(e)[1]), 2) for e in range(3))
    [-0.25, 0.0, 0.25]
    """

    def __init__(self, P: PlaneGraph, pos: dict | None = None) -> None:
        self.P = P
        chains = None
        if pos is None:
            pos = _given_positions(P)
            if pos is None:
                if _needs_bends(P):
                    pos, chains = _plan(P)
                else:
                    pos = _layout_simple(P)
        self.xy: dict[Hashable, np.ndarray] = {v: np.asarray(pos[v], dtype=float) for v in P.vertices}
        m = P.number_of_edges()
        lengths = []
        if chains is None:
            for e in range(m):
                u, v = P.edge_ends(e)
                if u != v:
                    lengths.append(float(np.hypot(*(self.xy[v] - self.xy[u]))))
        else:
            for ch in chains:
                for a, b in zip(ch, ch[1:]):
                    lengths.append(float(np.hypot(*(np.asarray(pos[b]) - np.asarray(pos[a])))))
        pts = np.array(list(self.xy.values()))
        span = float(np.max(pts.max(axis=0) - pts.min(axis=0))) if len(pts) > 1 else 0.0
        positive = [x for x in lengths if x > 0]
        self.scale = float(np.median(positive)) if positive else (span / 3 if span > 0 else 1.0)
        self._curves: list[np.ndarray] = [np.zeros((2, 2))] * m
        if chains is None:
            self._build_bundles()
            self._build_loops()
        else:
            for e, ch in enumerate(chains):
                self._curves[e] = _through([np.asarray(pos[x], dtype=float) for x in ch])
        self._face_pts: dict[int, np.ndarray] = {}

    # ------------------------------------------------------------ edges
    def _build_bundles(self) -> None:
        P = self.P
        bundles: dict[frozenset, list[int]] = {}
        for e in range(P.number_of_edges()):
            u, v = P.edge_ends(e)
            if u != v:
                bundles.setdefault(frozenset((u, v)), []).append(e)
        for key, es in bundles.items():
            e0 = es[0]
            u, v = P.edge_ends(e0)
            if repr(u) > repr(v):
                u, v = v, u
            a, b = self.xy[u], self.xy[v]
            if len(es) == 1:
                seg = np.vstack([a, b])
                self._curves[e0] = seg if P.edge_ends(e0)[0] == u else seg[::-1].copy()
                continue
            # counterclockwise order of the bundle's darts at u, cut where the run starts
            ring = P.darts_at(u)
            inb = [(d >> 1) in set(es) and P.head(d) == v for d in ring]
            start = 0
            for i in range(len(ring)):
                if inb[i] and not inb[i - 1]:
                    start = i
                    break
            order = [ring[(start + i) % len(ring)] >> 1 for i in range(len(ring)) if inb[(start + i) % len(ring)]]
            k = len(order)
            length = float(np.hypot(*(b - a))) or self.scale
            step = 0.5 * length / max(k - 1, 1) if k <= 3 else 0.9 * length / (k - 1)
            direction = _unit(b - a)
            mid = 0.5 * (a + b)
            for i, e in enumerate(order):
                # counterclockwise at u = further to the left of u -> v
                off = (i - (k - 1) / 2) * step
                ctrl = mid + _left(direction) * (2.0 * off)  # the arc passes off to the side at its middle
                curve = _bezier2(a, ctrl, b) if abs(off) > 1e-12 else np.vstack([a, b])
                self._curves[e] = curve if P.edge_ends(e)[0] == u else curve[::-1].copy()

    def _leaving_angle(self, d: int) -> float:
        c = self.dart_points(d)
        v = c[1] - c[0]
        return math.atan2(v[1], v[0])

    def _loop_rings(self) -> dict[Hashable, list[int]]:
        """At each vertex with loops, its darts counterclockwise, starting where drawing may cut the ring.

        The cut is just after a non-loop dart (so loops are nested within the
        gaps between non-loop darts) or, at a vertex with only loops, at a
        corner of the outer face (so the outer face stays unbounded).
        """
        P = self.P
        rings = {}
        for u in P.vertices:
            ring = P.darts_at(u)
            if not any(P.head(d) == u for d in ring):
                continue
            fixed = [i for i, d in enumerate(ring) if P.head(d) != u]
            if fixed:
                start = (fixed[0] + 1) % len(ring)
            else:
                start = 0
                for d in P.face_darts(P.outer_face):
                    if P.tail(d) == u:
                        start = (ring.index(d) + 1) % len(ring)
                        break
            rings[u] = ring[start:] + ring[:start]
        return rings

    def _build_loops(self) -> None:
        P = self.P
        rings = self._loop_rings()
        for u, ring in rings.items():
            a = self.xy[u]
            isloop = [P.head(d) == u for d in ring]
            if all(isloop):
                gaps = [(ring, -math.pi / 2 + 1e-3, 2 * math.pi - 2e-3)]
            else:
                gaps = []
                k = len(ring)
                # the ring starts just after a non-loop dart and ends with one
                idx = [i for i in range(k) if not isloop[i]]
                prev = ring[-1]
                lo = 0
                for i in idx:
                    run = ring[lo:i]
                    if run:
                        a0 = self._leaving_angle(prev)
                        a1 = self._leaving_angle(ring[i])
                        gap = (a1 - a0) % (2 * math.pi) or 2 * math.pi
                        gaps.append((run, a0, gap))
                    prev = ring[i]
                    lo = i + 1
            for run, a0, gap in gaps:
                where = {d: r for r, d in enumerate(run)}
                ang = {d: a0 + gap * (r + 1) / (len(run) + 1) for r, d in enumerate(run)}
                loops = sorted({d >> 1 for d in run})
                span = {e: tuple(sorted((where[2 * e], where[2 * e + 1]))) for e in loops if 2 * e in where and 2 * e + 1 in where}
                height: dict[int, int] = {}
                for e in sorted(span, key=lambda e: span[e][1] - span[e][0]):
                    lo_, hi_ = span[e]
                    height[e] = 1 + max(
                        (height[f] for f in span if f in height and f != e and lo_ < span[f][0] and span[f][1] < hi_),
                        default=0,
                    )
                step = gap / (len(run) + 1)
                for e, (i, j) in span.items():
                    lo_a = ang[run[i]] - 0.42 * step
                    hi_a = ang[run[j]] + 0.42 * step
                    radius = self.scale * (0.38 + 0.2 * (height[e] - 1))
                    curve = _petal(a, lo_a, hi_a, radius)
                    # dart 2e leaves along the first side when it comes first counterclockwise
                    self._curves[e] = curve if where[2 * e] == i else curve[::-1].copy()

    def needs_bends(self) -> bool:
        """True when arcs and petals cannot show the rotation (a loop or a bundle enclosing other edges)."""
        return _needs_bends(self.P)

    # ------------------------------------------------------------ queries
    def edge_points(self, e: int) -> np.ndarray:
        """Points along edge ``e`` from ``edge_ends(e)[0]`` to ``edge_ends(e)[1]``."""
        return self._curves[e]

    def dart_points(self, d: int) -> np.ndarray:
        """Points along dart ``d`` from its tail to its head."""
        c = self._curves[d >> 1]
        return c if d % 2 == 0 else c[::-1]

    def midpoint(self, e: int) -> np.ndarray:
        """The point halfway along edge ``e`` (by arc length)."""
        return _polyline_point(self._curves[e], 0.5)

    def point_on(self, d: int, t: float) -> np.ndarray:
        """The point at fraction ``t`` of dart ``d``, measured from its tail."""
        return _polyline_point(self.dart_points(d), t)

    def dart_normal(self, d: int, t: float = 0.5) -> np.ndarray:
        """Unit vector to the left of dart ``d`` at fraction ``t``."""
        pts = self.dart_points(d)
        a = _polyline_point(pts, max(0.0, t - 0.02))
        b = _polyline_point(pts, min(1.0, t + 0.02))
        return _left(_unit(b - a))

    def face_polygon(self, f: int) -> np.ndarray:
        """The boundary walk of face ``f`` as a closed polygon (curves sampled)."""
        darts = self.P.face_darts(f)
        if not darts:
            return np.array([self.xy[self.P.vertices[0]]])
        parts = [self.dart_points(d)[:-1] for d in darts]
        return np.vstack(parts)

    def bounds(self) -> tuple[np.ndarray, np.ndarray]:
        """Lower-left and upper-right corners of everything drawn."""
        pts = np.vstack([np.array(list(self.xy.values()))] + [c for c in self._curves if len(c)])
        return pts.min(axis=0), pts.max(axis=0)

    #: direction (radians) from the centre of the drawing to the outer face's point
    OUTER_ANGLE = 0.8 * np.pi

    def ring(self) -> tuple[np.ndarray, float]:
        """Centre and radius of a circle around the whole drawing (dual edges to the outer face run on it)."""
        cached: tuple[np.ndarray, float] | None = getattr(self, "_ring", None)
        if cached is not None:
            return cached
        lo, hi = self.bounds()
        c = 0.5 * (lo + hi)
        pts = np.vstack([np.array(list(self.xy.values()))] + [x for x in self._curves if len(x)])
        R = float(np.max(np.hypot(*(pts - c).T))) if len(pts) else 0.0
        ring = (c, R + 0.3 * self.scale)
        self._ring = ring
        return ring

    def face_point(self, f: int) -> np.ndarray:
        """A point inside face ``f`` (for the outer face: outside the drawing), cached.

        For an inner face the candidate farthest from the boundary among the
        centroid and points just left of each boundary dart is chosen; the
        face lies on the left of its darts, so such points are inside it.
        """
        if f in self._face_pts:
            return self._face_pts[f]
        P = self.P
        if f == P.outer_face:
            c, R = self.ring()
            p = c + (R + 0.45 * self.scale) * np.array([np.cos(self.OUTER_ANGLE), np.sin(self.OUTER_ANGLE)])
            self._face_pts[f] = p
            return p
        poly = self.face_polygon(f)
        darts = P.face_darts(f)
        if len(poly) < 3:
            p = poly.mean(axis=0) + np.array([0.0, 0.3 * self.scale])
            self._face_pts[f] = p
            return p
        if len(poly) == len(darts) and len(set(P.boundary_walk(f))) == len(darts):
            # straight edges: a strictly convex counterclockwise polygon contains its centroid
            a = poly
            b = np.roll(poly, -1, axis=0)
            c = np.roll(poly, -2, axis=0)
            turn = (b[:, 0] - a[:, 0]) * (c[:, 1] - b[:, 1]) - (b[:, 1] - a[:, 1]) * (c[:, 0] - b[:, 0])
            if np.all(turn > 0):
                p = poly.mean(axis=0)
                self._face_pts[f] = p
                return p
        cands = [poly.mean(axis=0)]
        for d in darts:
            for t in (0.5,):
                base = self.point_on(d, t)
                nrm = self.dart_normal(d, t)
                for r in (0.08, 0.2, 0.35):
                    cands.append(base + nrm * r * self.scale)
        best, best_r = None, -1.0
        for c in cands:
            if not _point_in_polygon(c, poly):
                continue
            r = _dist_to_polyline(c, poly)
            if r > best_r:
                best, best_r = c, r
        if best is None:
            best = cands[1] if len(cands) > 1 else cands[0]
        self._face_pts[f] = best
        return best

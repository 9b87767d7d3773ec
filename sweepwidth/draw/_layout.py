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

from ..errors import SweepwidthError
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
    from ..plane._geometry import find_crossing

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
    for i, v in enumerate(cycle):
        t = math.pi / 2 - 2 * math.pi * i / k
        pos[v] = np.array([math.cos(t), math.sin(t)])
    inner = [v for v in rot if v not in pos]
    if not inner:
        return pos
    idx = {v: i for i, v in enumerate(inner)}
    pairs = [(v, w) for v in inner for w in rot[v]]
    if any(not rot[v] for v in inner):
        raise SweepwidthError("an interior vertex has no neighbours")
    weights = np.ones(len(pairs))
    for r in range(rounds + 1):
        rows, cols, vals = [], [], []
        diag = np.zeros(len(inner))
        b = np.zeros((len(inner), 2))
        for (v, w), wt in zip(pairs, weights):
            i = idx[v]
            diag[i] += wt
            if w in idx:
                rows.append(i)
                cols.append(idx[w])
                vals.append(-wt)
            else:
                b[i] += wt * pos[w]
        rows += list(range(len(inner)))
        cols += list(range(len(inner)))
        vals += diag.tolist()
        A = coo_matrix((vals, (rows, cols)), shape=(len(inner), len(inner))).tocsr()
        sol = np.atleast_2d(spsolve(A, b))
        if not np.all(np.isfinite(sol)):
            raise SweepwidthError("singular barycentric system")
        for v in inner:
            pos[v] = np.asarray(sol[idx[v]], dtype=float)
        if r < rounds:
            lengths = np.array([float(np.hypot(*(pos[v] - pos[w]))) for v, w in pairs])
            weights = np.maximum(lengths, 1e-9) ** power
            weights = weights / weights.mean()
    return pos


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


def layout_positions(P: PlaneGraph, *, keep_pos: bool = False) -> dict[Hashable, tuple[float, float]]:
    """Vertex positions for drawing ``P``: its own drawing, else a planar layout of its rotation.

    ``P.pos`` is used when it covers every vertex and its straight segments
    realise the rotation without crossings (always so for graphs built with
    ``from_positions``); with ``keep_pos=True`` it is used whenever it covers
    every vertex.  Positions that do not fit the rotation, such as the face
    points a dual carries, are replaced by a layout.  Otherwise the
    simple underlying graph (loops dropped, one edge per bundle of parallel
    edges) is laid out from the rotation: a barycentric drawing with the outer
    face on a circle when that keeps the rotation and has no crossings (always
    the case for 3-connected graphs), else the Chrobak-Payne grid drawing.
    The result is checked against the rotation and mirrored when needed, so
    the picture shows *this* embedding, with ``P.outer_face`` outside.

    Parameters
    ----------
    P : PlaneGraph

    Returns
    -------
    dict
        ``{vertex: (x, y)}``.

    Notes
    -----
    O(n) for the grid drawing, a sparse solve for the barycentric one, and a
    near-linear crossing check.

    References
    ----------
    .. [1] W. T. Tutte, "How to draw a graph", Proc. London Math. Soc. 13, 1963.
    .. [2] M. Chrobak and T. H. Payne, "A linear-time algorithm for drawing a
       planar graph on a grid", Information Processing Letters 54(4), 1995.

    Examples
    --------
    >>> import networkx as nx
    >>> P = PlaneGraph.from_graph(nx.octahedral_graph())
    >>> pos = layout_positions(P)
    >>> sorted(pos) == sorted(P.vertices)
    True
    """
    if P.pos is not None and all(v in P.pos for v in P.vertices):
        given = {v: (float(P.pos[v][0]), float(P.pos[v][1])) for v in P.vertices}
        if keep_pos or _drawing_agrees(_simple_rotation(P), {v: np.array(p) for v, p in given.items()}) == 1:
            return given
    verts = P.vertices
    n = len(verts)
    if n == 1:
        return {verts[0]: (0.0, 0.0)}
    if n == 2:
        return {verts[0]: (0.0, 0.0), verts[1]: (1.0, 0.0)}
    rot = _simple_rotation(P)
    cycle = _outer_cycle(P, rot)
    candidates = []
    if cycle is not None:
        try:
            candidates.append(_tutte(P, rot, cycle))
        except Exception:  # a singular system (disconnected interior): use the grid drawing
            pass
    candidates.append(_chrobak_payne(P, rot))
    for pos in candidates:
        sign = _drawing_agrees(rot, pos)
        if sign:
            return {v: (float(sign * p[0]), float(p[1])) for v, p in pos.items()}
    # the grid drawing always realises the rotation; reaching here means a bug upstream
    raise SweepwidthError("could not lay out the embedding without crossings")


# ----------------------------------------------------------------- geometry
def _bezier2(a: np.ndarray, c: np.ndarray, b: np.ndarray, n: int = _SAMPLES) -> np.ndarray:
    t = np.linspace(0.0, 1.0, n)[:, None]
    return (1 - t) ** 2 * a + 2 * (1 - t) * t * c + t**2 * b


def _bezier3(a: np.ndarray, c1: np.ndarray, c2: np.ndarray, b: np.ndarray, n: int = _SAMPLES) -> np.ndarray:
    t = np.linspace(0.0, 1.0, n)[:, None]
    return (1 - t) ** 3 * a + 3 * (1 - t) ** 2 * t * c1 + 3 * (1 - t) * t**2 * c2 + t**3 * b


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
        raw = layout_positions(P) if pos is None else pos
        self.xy: dict[Hashable, np.ndarray] = {v: np.asarray(raw[v], dtype=float) for v in P.vertices}
        m = P.number_of_edges()
        lengths = []
        for e in range(m):
            u, v = P.edge_ends(e)
            if u != v:
                lengths.append(float(np.hypot(*(self.xy[v] - self.xy[u]))))
        pts = np.array(list(self.xy.values()))
        span = float(np.max(pts.max(axis=0) - pts.min(axis=0))) if len(pts) > 1 else 0.0
        positive = [x for x in lengths if x > 0]
        self.scale = float(np.median(positive)) if positive else (span / 3 if span > 0 else 1.0)
        self._curves: list[np.ndarray] = [np.zeros((2, 2))] * m
        self._build_bundles()
        self._build_loops()
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
                ctrl = mid + _left(direction) * off
                curve = _bezier2(a, ctrl, b) if abs(off) > 1e-12 else np.vstack([a, b])
                self._curves[e] = curve if P.edge_ends(e)[0] == u else curve[::-1].copy()

    def _leaving_angle(self, d: int) -> float:
        c = self.dart_points(d)
        v = c[1] - c[0]
        return math.atan2(v[1], v[0])

    def _build_loops(self) -> None:
        P = self.P
        loops = [e for e in range(P.number_of_edges()) if P.edge_ends(e)[0] == P.edge_ends(e)[1]]
        if not loops:
            return
        loopset = set(loops)
        angle: dict[int, float] = {}
        by_vertex: dict[Hashable, list[int]] = {}
        for e in loops:
            by_vertex.setdefault(P.edge_ends(e)[0], []).append(e)
        for u in by_vertex:
            ring = P.darts_at(u)
            fixed = [i for i, d in enumerate(ring) if (d >> 1) not in loopset]
            if not fixed:
                for i, d in enumerate(ring):
                    angle[d] = math.pi / 2 + 2 * math.pi * i / len(ring)
                continue
            for j, i0 in enumerate(fixed):
                i1 = fixed[(j + 1) % len(fixed)]
                a0 = self._leaving_angle(ring[i0])
                a1 = self._leaving_angle(ring[i1])
                gap = (a1 - a0) % (2 * math.pi)
                if gap < 1e-9:
                    gap = 2 * math.pi
                run = []
                i = (i0 + 1) % len(ring)
                while i != i1:
                    run.append(ring[i])
                    i = (i + 1) % len(ring)
                for r, d in enumerate(run):
                    angle[d] = a0 + gap * (r + 1) / (len(run) + 1)
        # nesting height: a loop whose darts enclose other loops' darts is drawn bigger
        height: dict[int, int] = {}
        for u, es in by_vertex.items():
            ring = P.darts_at(u)
            where = {d: i for i, d in enumerate(ring)}

            def inside(e: int, f: int) -> bool:
                lo, hi = sorted((where[2 * e], where[2 * e + 1]))
                return lo < where[2 * f] < hi and lo < where[2 * f + 1] < hi

            for e in sorted(es, key=lambda e: abs(where[2 * e] - where[2 * e + 1])):
                height[e] = 1 + max((height[f] for f in es if f != e and f in height and inside(e, f)), default=0)
        for e in loops:
            u = P.edge_ends(e)[0]
            a = self.xy[u]
            ta, tb = angle[2 * e], angle[2 * e + 1]
            spread = abs(((tb - ta + math.pi) % (2 * math.pi)) - math.pi)
            size = self.scale * (0.38 + 0.22 * (height[e] - 1)) * (1.0 if spread > 0.6 else 1.25)
            # widen narrow petals symmetrically so that they stay visible
            mid = ta + (((tb - ta + math.pi) % (2 * math.pi)) - math.pi) / 2
            half = max(spread / 2, 0.35)
            sgn = 1.0 if ((tb - ta) % (2 * math.pi)) < math.pi else -1.0
            t1, t2 = mid - sgn * half, mid + sgn * half
            c1 = a + 1.6 * size * np.array([math.cos(t1), math.sin(t1)])
            c2 = a + 1.6 * size * np.array([math.cos(t2), math.sin(t2)])
            self._curves[e] = _bezier3(a, c1, c2, a)

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
        lo, hi = self.bounds()
        c = 0.5 * (lo + hi)
        pts = np.vstack([np.array(list(self.xy.values()))] + [x for x in self._curves if len(x)])
        R = float(np.max(np.hypot(*(pts - c).T))) if len(pts) else 0.0
        return c, R + 0.3 * self.scale

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

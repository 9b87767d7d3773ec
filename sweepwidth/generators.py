"""Seeded generators of plane graphs for experiments, tests and the curated instances.

Every generator returns a :class:`~sweepwidth.plane.PlaneGraph` with vertex
positions, so that it can be drawn, and is reproducible from its ``seed``.
"""

from __future__ import annotations

import math
from typing import Hashable

import networkx as nx
import numpy as np

from .errors import InvalidArgumentError, SweepwidthError
from .plane import PlaneGraph

__all__ = [
    "grid",
    "triangulated_grid",
    "delaunay",
    "weighted_delaunay_disk",
    "random_plane_graph",
    "wheel",
    "fan",
    "nested_triangles",
    "cycle_with_chords",
    "random_tree",
]


def _rng(seed: int | np.random.Generator | None) -> np.random.Generator:
    return seed if isinstance(seed, np.random.Generator) else np.random.default_rng(seed)


def grid(rows: int, cols: int, *, weights: tuple[int, int] | None = None, seed: int | None = None) -> PlaneGraph:
    """The grid P_rows x P_cols drawn on integer points; vertices ``(i, j)``.

    ``weights=(lo, hi)`` draws integer edge weights uniformly from lo..hi.

    Examples
    --------
    >>> grid(3, 4).number_of_faces()
    7
    """
    if rows < 1 or cols < 1:
        raise InvalidArgumentError(f"grid needs rows, cols >= 1, got {rows} x {cols}")
    G = nx.grid_2d_graph(rows, cols)
    if weights is not None:
        rng = _rng(seed)
        for u, v in G.edges():
            G[u][v]["weight"] = int(rng.integers(weights[0], weights[1] + 1))
    pos = {(i, j): (float(j), float(-i)) for i, j in G.nodes()}
    return PlaneGraph.from_positions(G, pos, meta={"name": f"grid-{rows}x{cols}"})


def triangulated_grid(k: int, *, diagonal: str = "main") -> PlaneGraph:
    """The k x k grid disk with every unit square split by one diagonal (2 k^2 triangles).

    Vertices are ``(i, j)`` for ``0 <= i, j <= k``; ``diagonal='main'`` draws
    the diagonal from ``(i, j)`` to ``(i+1, j+1)`` in every square, ``'alternate'``
    flips it on alternate squares.

    Examples
    --------
    >>> P = triangulated_grid(2)
    >>> P.number_of_faces() - 1        # inner faces
    8
    """
    if k < 1:
        raise InvalidArgumentError(f"triangulated_grid needs k >= 1, got {k}")
    if diagonal not in ("main", "alternate"):
        from .errors import UnsupportedOptionError

        raise UnsupportedOptionError("diagonal", diagonal, ["main", "alternate"])
    faces = []
    for i in range(k):
        for j in range(k):
            a, b, c, d = (i, j), (i + 1, j), (i + 1, j + 1), (i, j + 1)
            if diagonal == "main" or (i + j) % 2 == 0:
                faces += [[a, b, c], [a, c, d]]
            else:
                faces += [[a, b, d], [b, c, d]]
    pos = {(i, j): (float(i), float(j)) for i in range(k + 1) for j in range(k + 1)}
    return PlaneGraph.from_faces(faces, pos=pos, meta={"name": f"trigrid-{k}"})


def delaunay(n: int, *, seed: int | np.random.Generator | None = None) -> PlaneGraph:
    """The Delaunay triangulation of ``n`` uniform random points in the unit square (scipy).

    A triangulated disk whose outer face is the convex hull.

    Examples
    --------
    >>> P = delaunay(20, seed=1)
    >>> P.number_of_vertices()
    20
    """
    from scipy.spatial import Delaunay

    if n < 3:
        raise InvalidArgumentError(f"delaunay needs n >= 3 points, got {n}")
    rng = _rng(seed)
    pts = rng.random((n, 2))
    tri = Delaunay(pts)
    simp = tri.simplices
    # orient every triangle counterclockwise
    a, b, c = pts[simp[:, 0]], pts[simp[:, 1]], pts[simp[:, 2]]
    cross = (b[:, 0] - a[:, 0]) * (c[:, 1] - a[:, 1]) - (b[:, 1] - a[:, 1]) * (c[:, 0] - a[:, 0])
    simp = np.where((cross < 0)[:, None], simp[:, [0, 2, 1]], simp)
    keep = np.abs(cross) > 1e-14
    faces = simp[keep]
    used = np.unique(faces).tolist()
    xy = pts.tolist()
    pos = {v: tuple(xy[v]) for v in used}
    return PlaneGraph.from_faces(faces, pos=pos, meta={"name": f"delaunay-{n}-s{seed}"})


def weighted_delaunay_disk(n: int, *, seed: int | None = None, heavy: tuple[int, int] = (1, 10)) -> PlaneGraph:
    """A Delaunay disk with a light boundary and a heavy interior.

    The family, exactly: the plane graph ``delaunay(n, seed=seed)``; every
    edge of its outer boundary (an edge with the outer face on a side) gets
    weight 1; the other edges, taken in increasing edge id, get the integers
    ``numpy.random.default_rng(seed).integers(lo, hi + 1, size=k)`` (``k``
    inner edges, ``(lo, hi) = heavy``, default 1..10), drawn from a fresh
    generator seeded with the same ``seed`` as the points.  With ``seed`` fixed
    the graph, its ids and its weights are reproducible.

    Sweeping such a disk from its boundary is hard: the boundary is cheap, so
    its length says little, and the dual (about ``2 n`` faces) is heavy.

    Parameters
    ----------
    n : int
        Number of random points (at least 3).
    seed : int, optional
        Seed of both the points and the weights.
    heavy : (int, int)
        Inclusive range of the inner edge weights.

    Examples
    --------
    >>> P = weighted_delaunay_disk(30, seed=1)
    >>> outer = P.outer_face
    >>> sorted({P.weight(e) for e in P.face_edges(outer)})
    [1.0]
    >>> int(P.weights.max()) <= 10
    True
    """
    lo, hi = heavy
    if isinstance(seed, np.random.Generator):
        raise InvalidArgumentError("weighted_delaunay_disk needs an integer seed (points and weights use it twice)")
    if not (isinstance(lo, (int, np.integer)) and isinstance(hi, (int, np.integer)) and 0 <= lo <= hi):
        raise InvalidArgumentError(f"heavy must be a range (lo, hi) of integers with 0 <= lo <= hi, got {heavy!r}")
    P = delaunay(n, seed=seed)
    outer = P.outer_face
    m = P.number_of_edges()
    boundary = np.array([outer in P.edge_faces(e) for e in range(m)], dtype=bool)
    inner = np.flatnonzero(~boundary)
    w = np.ones(m, dtype=np.int64)
    w[inner] = np.random.default_rng(seed).integers(int(lo), int(hi) + 1, size=inner.shape[0])
    Q = P.with_weights([int(x) for x in w])
    Q.meta["name"] = f"weighted-disk-{n}-s{seed}"
    return Q


def random_plane_graph(
    n: int,
    *,
    remove: float = 0.3,
    seed: int | np.random.Generator | None = None,
    weights: tuple[int, int] | None = None,
) -> PlaneGraph:
    """A Delaunay triangulation with a fraction ``remove`` of its edges deleted, kept connected.

    A random spanning tree (minimum spanning tree for random edge keys) is
    kept; ``round(remove * E)`` of the other edges, chosen at random, are
    deleted (all of them when fewer remain).  ``weights=(lo, hi)`` draws
    integer weights uniformly from lo..hi.

    Notes
    -----
    O(E log E) (scipy's spanning tree), so large instances stay cheap.

    Examples
    --------
    >>> P = random_plane_graph(15, seed=3)
    >>> P.number_of_vertices()
    15
    """
    from scipy.sparse import coo_matrix
    from scipy.sparse.csgraph import minimum_spanning_tree

    if not 0 <= remove <= 1:
        raise InvalidArgumentError(f"remove must be a fraction in [0, 1], got {remove!r}")
    rng = _rng(seed)
    T = delaunay(n, seed=rng)
    labels = T.vertices
    index = {v: i for i, v in enumerate(labels)}
    E = np.array([(index[e.u], index[e.v]) for e in T.edges], dtype=np.int64)
    m = E.shape[0]
    key = rng.random(m) + 1.0  # positive: zero entries would vanish from the sparse matrix
    tree = minimum_spanning_tree(coo_matrix((key, (E[:, 0], E[:, 1])), shape=(n, n))).tocoo()
    in_tree = np.zeros(m, dtype=bool)
    pair_id = {(int(a), int(b)): k for k, (a, b) in enumerate(E.tolist())}
    for a, b in zip(tree.row.tolist(), tree.col.tolist()):
        in_tree[pair_id[(a, b)] if (a, b) in pair_id else pair_id[(b, a)]] = True
    others = np.flatnonzero(~in_tree)
    rng.shuffle(others)
    drop = set(others[: min(len(others), int(round(remove * m)))].tolist())
    G = nx.Graph()
    G.add_nodes_from(labels)
    for k in range(m):
        if k not in drop:
            G.add_edge(labels[int(E[k, 0])], labels[int(E[k, 1])])
    if weights is not None:
        for u, v in G.edges():
            G[u][v]["weight"] = int(rng.integers(weights[0], weights[1] + 1))
    return PlaneGraph.from_positions(G, T.pos, meta={"name": f"plane-{n}"})


def wheel(k: int) -> PlaneGraph:
    """The wheel: hub 0 joined to the cycle 1..k (k >= 3).

    Examples
    --------
    >>> wheel(5).number_of_faces()
    6
    """
    if k < 3:
        raise InvalidArgumentError(f"wheel needs k >= 3 rim vertices, got {k}")
    G = nx.wheel_graph(k + 1)
    pos = {0: (0.0, 0.0)}
    for i in range(1, k + 1):
        t = 2 * math.pi * (i - 1) / k
        pos[i] = (math.cos(t), math.sin(t))
    return PlaneGraph.from_positions(G, pos, meta={"name": f"wheel-{k}"})


def fan(k: int) -> PlaneGraph:
    """The fan: vertex 0 joined to every vertex of the path 1..k (k >= 2).

    Examples
    --------
    >>> fan(4).number_of_faces()
    4
    """
    if k < 2:
        raise InvalidArgumentError(f"fan needs k >= 2 path vertices, got {k}")
    G = nx.path_graph(range(1, k + 1))
    G.add_edges_from((0, i) for i in range(1, k + 1))
    pos = {0: (0.0, -1.0)}
    for i in range(1, k + 1):
        t = math.pi * (0.1 + 0.8 * (i - 1) / (k - 1))
        pos[i] = (-math.cos(t), math.sin(t))
    return PlaneGraph.from_positions(G, pos, meta={"name": f"fan-{k}"})


def nested_triangles(k: int) -> PlaneGraph:
    """k nested triangles, consecutive ones joined corner to corner (k >= 1).

    Vertices ``(level, corner)``; level 0 is the outermost triangle.

    Examples
    --------
    >>> nested_triangles(3).number_of_faces()
    8
    """
    if k < 1:
        raise InvalidArgumentError(f"nested_triangles needs k >= 1, got {k}")
    G = nx.Graph()
    pos: dict[Hashable, tuple[float, float]] = {}
    for lv in range(k):
        r = float(k - lv)
        for c in range(3):
            t = math.pi / 2 + 2 * math.pi * c / 3
            pos[(lv, c)] = (r * math.cos(t), r * math.sin(t))
            G.add_edge((lv, c), (lv, (c + 1) % 3))
            if lv > 0:
                G.add_edge((lv, c), (lv - 1, c))
    return PlaneGraph.from_positions(G, pos, meta={"name": f"nested-triangles-{k}"})


def cycle_with_chords(n: int, chords: int, *, seed: int | None = None) -> PlaneGraph:
    """The cycle C_n drawn convex with ``chords`` random non-crossing chords inside.

    Examples
    --------
    >>> P = cycle_with_chords(8, 3, seed=0)
    >>> P.number_of_edges()
    11
    """
    if n < 3:
        raise InvalidArgumentError(f"cycle_with_chords needs n >= 3, got {n}")
    rng = _rng(seed)
    G = nx.cycle_graph(n)
    pos = {i: (math.cos(2 * math.pi * i / n), math.sin(2 * math.pi * i / n)) for i in range(n)}
    placed: list[tuple[int, int]] = []
    tries = 0
    while len(placed) < chords and tries < 200 * (chords + 1):
        tries += 1
        a, b = sorted(int(x) for x in rng.choice(n, 2, replace=False))
        if b - a < 2 or (a == 0 and b == n - 1) or G.has_edge(a, b):
            continue
        if any((a < c < b) != (a < d < b) and len({a, b, c, d}) == 4 for c, d in placed):
            continue
        placed.append((a, b))
        G.add_edge(a, b)
    return PlaneGraph.from_positions(G, pos, meta={"name": f"cycle-{n}-chords-{len(placed)}"})


def random_tree(n: int, *, seed: int | None = None) -> PlaneGraph:
    """A uniformly random labelled tree on ``n`` vertices (Pruefer code), drawn by BFS layers.

    Examples
    --------
    >>> random_tree(6, seed=2).number_of_faces()
    1
    """
    if n < 1:
        raise InvalidArgumentError(f"random_tree needs n >= 1, got {n}")
    rng = _rng(seed)
    if n == 1:
        T = nx.Graph()
        T.add_node(0)
    elif n == 2:
        T = nx.path_graph(2)
    else:
        T = nx.from_prufer_sequence([int(x) for x in rng.integers(0, n, n - 2)])
    return PlaneGraph.from_graph(T, meta={"name": f"tree-{n}"})

"""Hypothesis strategies for plane graphs and weighted graphs, shared by every test module.

All randomness comes from integers drawn by hypothesis (seeds, sizes, counts),
so failing examples shrink towards small graphs and replay exactly.

``plane_graphs``
    connected plane multigraphs drawn from four families: Delaunay
    triangulations of random points with some edges removed (kept connected),
    trees, convex cycles with non-crossing chords, and duals of those
    (loops from bridges, parallel edges from faces sharing several edges).
``triangulated_disks``
    triangulated disks: Delaunay triangulations of random points (outer face
    the convex hull) and staircase-shaped pieces of the triangulated grid with
    a random diagonal in each square.
``weighted_graphs``
    small networkx graphs with integer edge weights (not necessarily planar
    or connected), for cutwidth.
"""

from __future__ import annotations

import networkx as nx
import numpy as np
from hypothesis import strategies as st
from scipy.spatial import Delaunay

from sweepwidth import generators
from sweepwidth.plane import PlaneGraph

__all__ = ["plane_graphs", "triangulated_disks", "weighted_graphs", "PLANE_KINDS"]

PLANE_KINDS = ("delaunay", "tree", "chords", "dual")


# ---------------------------------------------------------------- helpers
def _points(n: int, seed: int) -> np.ndarray:
    """n random points in the unit square (in general position with probability 1)."""
    return np.random.default_rng(seed).random((n, 2))


def _delaunay_edges(pts: np.ndarray) -> list[tuple[int, int]]:
    tri = Delaunay(pts)
    edges: set[tuple[int, int]] = set()
    for a, b, c in tri.simplices.tolist():
        for u, v in ((a, b), (b, c), (a, c)):
            edges.add((min(u, v), max(u, v)))
    return sorted(edges)


def _thinned_delaunay(n: int, faces: int | None, remove: float, seed: int) -> PlaneGraph:
    """Delaunay triangulation of n points with edges removed (a spanning tree is always kept).

    ``faces`` (when given) fixes the number of faces of the result exactly
    (E - V + 2 = faces); otherwise a fraction ``remove`` of the non-tree
    edges is deleted.
    """
    rng = np.random.default_rng(seed + 1)
    pts = _points(n, seed)
    edges = _delaunay_edges(pts)
    G = nx.Graph()
    G.add_nodes_from(range(n))
    for u, v in edges:
        G.add_edge(u, v, key=float(rng.random()))
    tree = {tuple(sorted(e)) for e in nx.minimum_spanning_edges(G, weight="key", data=False)}
    extra = [e for e in edges if e not in tree]
    rng.shuffle(extra)
    if faces is None:
        keep = len(extra) - int(round(remove * len(extra)))
    else:
        keep = max(0, min(len(extra), faces - 1))
    H = nx.Graph()
    H.add_nodes_from(range(n))
    H.add_edges_from(tree)
    H.add_edges_from(extra[:keep])
    pos = {i: (float(pts[i, 0]), float(pts[i, 1])) for i in range(n)}
    return PlaneGraph.from_positions(H, pos, meta={"name": f"thinned-delaunay-{n}-s{seed}"})


def _max_faces_of_delaunay(n: int, seed: int) -> int:
    pts = _points(n, seed)
    return len(_delaunay_edges(pts)) - n + 2


def _weighted(draw, P: PlaneGraph, weighted: bool, max_weight: int) -> PlaneGraph:
    if not weighted:
        return P
    w = draw(
        st.lists(
            st.integers(0, max_weight),
            min_size=P.number_of_edges(),
            max_size=P.number_of_edges(),
        )
    )
    return P.with_weights(w)


# ------------------------------------------------------------ strategies
@st.composite
def _delaunay_graph(draw, lo: int, hi: int) -> PlaneGraph:
    n = draw(st.integers(max(3, lo), max(3, hi)))
    seed = draw(st.integers(0, 2**16))
    remove = draw(st.sampled_from([0.0, 0.25, 0.5, 0.75, 1.0]))
    return _thinned_delaunay(n, None, remove, seed)


@st.composite
def _tree(draw, lo: int, hi: int) -> PlaneGraph:
    n = draw(st.integers(max(1, lo), max(1, hi)))
    seed = draw(st.integers(0, 2**16))
    return generators.random_tree(n, seed=seed)


@st.composite
def _chords(draw, lo: int, hi: int) -> PlaneGraph:
    n = draw(st.integers(max(3, lo), max(3, hi)))
    chords = draw(st.integers(0, n - 3))
    seed = draw(st.integers(0, 2**16))
    return generators.cycle_with_chords(n, chords, seed=seed)


@st.composite
def _dual_graph(draw, lo: int, hi: int) -> PlaneGraph:
    """The dual of a tree, a cycle with chords or a thinned Delaunay graph with k faces."""
    k = draw(st.integers(max(1, lo), max(1, hi)))  # vertices of the dual = faces of the primal
    seed = draw(st.integers(0, 2**16))
    if k == 1:
        n = draw(st.integers(1, 6))
        return generators.random_tree(n, seed=seed).dual()
    family = draw(st.sampled_from(["chords", "delaunay"]))
    if family == "chords":
        extra = draw(st.integers(0, 3))
        n = (k - 2) + 3 + extra  # an n-gon holds up to n - 3 chords
        P = generators.cycle_with_chords(n, k - 2, seed=seed)
        if P.number_of_faces() == k:
            return P.dual()
    n = draw(st.integers(3, max(3, k + 2)))
    while _max_faces_of_delaunay(n, seed) < k:
        n += 1
    P = _thinned_delaunay(n, k, 0.0, seed)
    return P.dual()


def plane_graphs(
    min_vertices: int = 1,
    max_vertices: int = 10,
    weighted: bool = False,
    *,
    max_weight: int = 9,
    kinds: tuple[str, ...] = PLANE_KINDS,
) -> st.SearchStrategy[PlaneGraph]:
    """Connected plane multigraphs with between ``min_vertices`` and ``max_vertices`` vertices.

    Parameters
    ----------
    min_vertices, max_vertices : int
        Range of the vertex count (families that need more vertices, such as
        Delaunay graphs with at least 3, start at their own minimum, but never
        exceed ``max_vertices`` when it is at least 3).
    weighted : bool
        Draw integer weights ``0..max_weight`` for the edges (default: all 1).
    kinds : tuple of str
        A subset of ``PLANE_KINDS``: 'delaunay', 'tree', 'chords', 'dual'.
    """
    if min_vertices > max_vertices:
        raise ValueError(f"min_vertices {min_vertices} > max_vertices {max_vertices}")
    bad = set(kinds) - set(PLANE_KINDS)
    if bad or not kinds:
        raise ValueError(f"unknown kinds {sorted(bad)}; valid: {PLANE_KINDS}")
    lo, hi = min_vertices, max_vertices
    options = []
    if "tree" in kinds:
        options.append(_tree(lo, hi))
    if "dual" in kinds:
        options.append(_dual_graph(lo, hi))
    if hi >= 3:
        if "delaunay" in kinds:
            options.append(_delaunay_graph(lo, hi))
        if "chords" in kinds:
            options.append(_chords(lo, hi))
    if not options:
        raise ValueError(f"no family in {kinds} has graphs with {lo}..{hi} vertices")
    base = st.one_of(*options)

    @st.composite
    def build(draw) -> PlaneGraph:
        return _weighted(draw, draw(base), weighted, max_weight)

    return build()


@st.composite
def _delaunay_disk(draw, max_faces: int) -> PlaneGraph:
    # a Delaunay triangulation of n points has 2n - 2 - h <= 2n - 5 inner triangles
    top = max(3, (max_faces + 5) // 2)
    n = draw(st.integers(3, top))
    seed = draw(st.integers(0, 2**16))
    P = generators.delaunay(n, seed=seed)
    return P


@st.composite
def _grid_piece(draw, max_faces: int) -> PlaneGraph:
    """A staircase of unit squares (row lengths non-increasing), each cut by a random diagonal."""
    squares = max(1, max_faces // 2)
    rows = draw(st.integers(1, max(1, min(5, squares))))
    lengths: list[int] = []
    left = squares
    for r in range(rows):
        cap = min(lengths[-1] if lengths else 6, left - (rows - r - 1))
        if cap < 1:
            break
        lengths.append(draw(st.integers(1, cap)))
        left -= lengths[-1]
    faces = []
    pos = {}
    for i, ln in enumerate(lengths):
        for j in range(ln):
            a, b, c, d = (i, j), (i, j + 1), (i + 1, j + 1), (i + 1, j)  # ccw in (x=j, y=-i)? see pos
            if draw(st.booleans()):
                faces += [[a, d, c], [a, c, b]]
            else:
                faces += [[a, d, b], [b, d, c]]
            for v in (a, b, c, d):
                pos[v] = (float(v[1]), float(-v[0]))
    return PlaneGraph.from_faces(faces, pos=pos, meta={"name": f"grid-piece-{'-'.join(map(str, lengths))}"})


def triangulated_disks(
    max_faces: int = 16, weighted: bool = False, *, max_weight: int = 9
) -> st.SearchStrategy[PlaneGraph]:
    """Triangulated disks with at most about ``max_faces`` inner triangles (at least 2).

    The outer face is the disk's boundary; every inner face is a triangle.
    """
    if max_faces < 2:
        raise ValueError(f"max_faces must be >= 2, got {max_faces}")
    base = st.one_of(_delaunay_disk(max_faces), _grid_piece(max_faces))

    @st.composite
    def build(draw) -> PlaneGraph:
        return _weighted(draw, draw(base), weighted, max_weight)

    return build()


@st.composite
def weighted_graphs(
    draw,
    min_nodes: int = 1,
    max_nodes: int = 7,
    *,
    max_weight: int = 5,
    min_weight: int = 1,
    connected: bool = False,
    density: float | None = None,
) -> nx.Graph:
    """Small simple networkx graphs on nodes ``0..n-1`` with integer ``weight`` on every edge.

    ``density`` (when given) is the probability of each edge; otherwise every
    edge set is possible.  ``connected=True`` adds a random spanning path
    first.
    """
    n = draw(st.integers(min_nodes, max_nodes))
    pairs = [(u, v) for u in range(n) for v in range(u + 1, n)]
    if density is None:
        chosen = draw(st.lists(st.booleans(), min_size=len(pairs), max_size=len(pairs)))
    else:
        seed = draw(st.integers(0, 2**16))
        rnd = np.random.default_rng(seed).random(len(pairs))
        chosen = [bool(x < density) for x in rnd]
    G = nx.Graph()
    G.add_nodes_from(range(n))
    for (u, v), c in zip(pairs, chosen):
        if c:
            G.add_edge(u, v)
    if connected and n > 1:
        perm = draw(st.permutations(list(range(n))))
        for a, b in zip(perm, perm[1:]):
            G.add_edge(a, b)
    for u, v in sorted(G.edges()):
        G[u][v]["weight"] = draw(st.integers(min_weight, max_weight))
    return G

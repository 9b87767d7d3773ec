"""Seeded generators: counts from closed formulas, reproducibility, argument errors."""

from __future__ import annotations

import networkx as nx
import numpy as np
import pytest
from scipy.spatial import ConvexHull

from sweepwidth import generators
from sweepwidth.errors import SweepwidthError, UnsupportedOptionError


def _vef(P):
    return P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()


@pytest.mark.parametrize("r,c", [(1, 1), (1, 5), (2, 2), (3, 4), (5, 5)])
def test_grid_counts(r, c):
    P = generators.grid(r, c)
    # P_r x P_c: rc vertices, r(c-1) + c(r-1) edges, (r-1)(c-1) squares + the outer face (common practice)
    assert _vef(P) == (r * c, r * (c - 1) + c * (r - 1), (r - 1) * (c - 1) + 1)
    assert nx.is_isomorphic(P.to_simple_graph(), nx.grid_2d_graph(r, c))


def test_grid_weights_are_seeded_and_in_range():
    a = generators.grid(4, 4, weights=(2, 5), seed=11)
    b = generators.grid(4, 4, weights=(2, 5), seed=11)
    assert a.weights.tolist() == b.weights.tolist()
    assert a.weights.min() >= 2 and a.weights.max() <= 5
    assert generators.grid(4, 4, weights=(2, 5), seed=12).weights.tolist() != a.weights.tolist()


@pytest.mark.parametrize("k", [1, 2, 5])
@pytest.mark.parametrize("diagonal", ["main", "alternate"])
def test_triangulated_grid(k, diagonal):
    P = generators.triangulated_grid(k, diagonal=diagonal)
    # (k+1)^2 vertices, 2k^2 triangles, 3k^2 + 2k edges (k(k+1) per direction twice plus k^2 diagonals)
    assert _vef(P) == ((k + 1) ** 2, 3 * k * k + 2 * k, 2 * k * k + 1)
    assert len(P.boundary_walk(P.outer_face)) == 4 * k
    assert all(len(P.face_darts(f)) == 3 for f in P.faces if f != P.outer_face)


@pytest.mark.parametrize("n,seed", [(3, 0), (20, 1), (300, 2)])
def test_delaunay_outer_face_is_the_convex_hull(n, seed):
    P = generators.delaunay(n, seed=seed)
    pts = np.array([P.pos[v] for v in P.vertices])
    hull = ConvexHull(pts)  # scipy's hull, an outside reference
    outer = P.boundary_walk(P.outer_face)
    assert sorted(outer) == sorted(P.vertices[i] for i in hull.vertices)
    # a triangulation of n points with h on the hull: 2n - 2 - h triangles, 3n - 3 - h edges
    h = len(hull.vertices)
    assert _vef(P) == (n, 3 * n - 3 - h, 2 * n - 2 - h + 1)
    assert generators.delaunay(n, seed=seed).same_embedding(P)


def test_random_plane_graph_is_connected_thinned_and_seeded():
    T = generators.delaunay(40, seed=5)
    P = generators.random_plane_graph(40, remove=0.3, seed=5)
    G = P.to_simple_graph()
    assert nx.is_connected(G) and nx.check_planarity(G)[0]
    assert P.number_of_edges() < T.number_of_edges()
    assert generators.random_plane_graph(40, remove=0.3, seed=5).same_embedding(P)
    # remove=1 keeps exactly a spanning tree, remove=0 the whole triangulation
    tree = generators.random_plane_graph(40, remove=1.0, seed=2)
    assert tree.number_of_edges() == 39 and nx.is_tree(tree.to_simple_graph())
    full = generators.random_plane_graph(40, remove=0.0, seed=2)
    assert full.number_of_edges() == generators.delaunay(40, seed=np.random.default_rng(2)).number_of_edges()
    W = generators.random_plane_graph(15, seed=1, weights=(1, 3))
    assert set(W.weights.tolist()) <= {1.0, 2.0, 3.0}


@pytest.mark.parametrize("k", [3, 4, 8])
def test_wheel_and_fan(k):
    W = generators.wheel(k)
    # the wheel W_k: k + 1 vertices, 2k edges, k triangles + outer (common practice)
    assert _vef(W) == (k + 1, 2 * k, k + 1)
    assert nx.is_isomorphic(W.to_simple_graph(), nx.wheel_graph(k + 1))
    F = generators.fan(k)
    # the fan: k + 1 vertices, 2k - 1 edges, k - 1 triangles + outer
    assert _vef(F) == (k + 1, 2 * k - 1, k)


@pytest.mark.parametrize("k", [1, 2, 4])
def test_nested_triangles(k):
    P = generators.nested_triangles(k)
    # 3k vertices, 3k + 3(k-1) edges, F = 2 - V + E by Euler
    assert _vef(P) == (3 * k, 6 * k - 3, 3 * k - 1)


def test_cycle_with_chords_and_trees():
    P = generators.cycle_with_chords(10, 4, seed=3)
    assert P.number_of_edges() - 10 == P.number_of_faces() - 2  # each chord splits one face
    assert nx.is_isomorphic(
        nx.Graph([(e.u, e.v) for e in P.edges if abs(e.u - e.v) in (1, 9)]), nx.cycle_graph(10)
    )
    for n in (1, 2, 3, 12):
        T = generators.random_tree(n, seed=n)
        assert nx.is_tree(T.to_simple_graph()) and T.number_of_faces() == 1
    assert generators.random_tree(12, seed=4).same_embedding(generators.random_tree(12, seed=4))


BAD = [
    ("grid-zero", lambda: generators.grid(0, 3), SweepwidthError, "rows"),
    ("trigrid-zero", lambda: generators.triangulated_grid(0), SweepwidthError, "k >= 1"),
    ("trigrid-diagonal", lambda: generators.triangulated_grid(2, diagonal="x"), UnsupportedOptionError, "main"),
    ("delaunay-two", lambda: generators.delaunay(2), SweepwidthError, "n >= 3"),
    ("wheel-two", lambda: generators.wheel(2), SweepwidthError, "k >= 3"),
    ("fan-one", lambda: generators.fan(1), SweepwidthError, "k >= 2"),
    ("nested-zero", lambda: generators.nested_triangles(0), SweepwidthError, "k >= 1"),
    ("chords-small", lambda: generators.cycle_with_chords(2, 0), SweepwidthError, "n >= 3"),
    ("tree-zero", lambda: generators.random_tree(0), SweepwidthError, "n >= 1"),
    ("remove-fraction", lambda: generators.random_plane_graph(10, remove=1.5), SweepwidthError, "fraction"),
]


@pytest.mark.parametrize("build,error,pattern", [b[1:] for b in BAD], ids=[b[0] for b in BAD])
def test_bad_arguments(build, error, pattern):
    with pytest.raises(error, match=pattern):
        build()


def test_weighted_delaunay_disk_family():
    # the family as documented: delaunay(n, seed) with boundary weight 1 and inner weights
    # drawn in edge-id order from a fresh numpy default_rng(seed), integers 1..10
    P = generators.weighted_delaunay_disk(60, seed=4)
    T = generators.delaunay(60, seed=4)
    assert _vef(P) == _vef(T) and P.same_embedding(T.with_weights(P.weights.tolist()))
    outer = P.outer_face
    inner = [e for e in range(P.number_of_edges()) if outer not in P.edge_faces(e)]
    expect = np.random.default_rng(4).integers(1, 11, size=len(inner))
    assert P.weights[inner].tolist() == expect.astype(float).tolist()
    bnd = [e for e in range(P.number_of_edges()) if outer in P.edge_faces(e)]
    assert bnd and all(P.weight(e) == 1 for e in bnd)
    # the boundary is the convex hull of the points (scipy), so it has as many edges as hull vertices
    pts = np.random.default_rng(4).random((60, 2))
    assert len(bnd) == len(ConvexHull(pts).vertices)
    assert generators.weighted_delaunay_disk(60, seed=4).weights.tolist() == P.weights.tolist()
    assert generators.weighted_delaunay_disk(60, seed=5).weights.tolist() != P.weights.tolist()


def test_weighted_delaunay_disk_bad_input():
    with pytest.raises(SweepwidthError, match="heavy"):
        generators.weighted_delaunay_disk(10, seed=1, heavy=(5, 2))
    with pytest.raises(SweepwidthError, match="n >= 3"):
        generators.weighted_delaunay_disk(2, seed=1)

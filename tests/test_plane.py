"""PlaneGraph: Euler's formula, duality, the Platonic solids, planarity verdicts, bad inputs.

Check values come from published sources named beside each check.
"""

from __future__ import annotations

import math

import networkx as nx
import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.errors import (
    CrossingEdgesError,
    FileFormatError,
    InvalidEmbeddingError,
    NonPlanarError,
    SweepwidthError,
    WeightError,
)
from sweepwidth.plane import PlaneGraph

from strategies import plane_graphs, triangulated_disks, weighted_graphs


# ------------------------------------------------------------------ Euler
@settings(max_examples=60, deadline=None)
@given(plane_graphs(1, 12))
def test_euler_formula(P):
    # Euler: V - E + F = 2 for a connected plane graph (Euler's formula, R. Diestel, "Graph Theory", Springer, Thm. 4.2.9)
    assert P.number_of_vertices() - P.number_of_edges() + P.number_of_faces() == 2
    # every dart lies on exactly one face walk, and face_next follows it
    darts = sorted(d for f in P.faces for d in P.face_darts(f))
    assert darts == list(range(2 * P.number_of_edges()))
    for f in P.faces:
        walk = P.face_darts(f)
        for a, b in zip(walk, walk[1:] + walk[:1]):
            assert P.face_next(a) == b and P.face_of_dart(a) == f
            assert P.head(a) == P.tail(b)


@settings(max_examples=40, deadline=None)
@given(triangulated_disks(max_faces=20))
def test_triangulated_disks_are_disks(P):
    inner = [f for f in P.faces if f != P.outer_face]
    assert all(len(P.face_darts(f)) == 3 for f in inner)
    # a disk: the outer boundary is a simple cycle
    walk = P.boundary_walk(P.outer_face)
    assert len(set(walk)) == len(walk) >= 3
    # a triangulated disk with b boundary vertices has 2V - 2 - b inner triangles
    # (Euler with 3T + b = 2E; common practice)
    assert len(inner) == 2 * P.number_of_vertices() - 2 - len(walk)


# ------------------------------------------------------------------ duality
@settings(max_examples=60, deadline=None)
@given(plane_graphs(1, 12, weighted=True))
def test_dual_of_dual_is_the_graph(P):
    D = P.dual()
    assert (D.number_of_vertices(), D.number_of_edges(), D.number_of_faces()) == (
        P.number_of_faces(),
        P.number_of_edges(),
        P.number_of_vertices(),
    )
    # dual edge e joins the two faces beside primal edge e, with the same weight
    for e in range(P.number_of_edges()):
        assert sorted(D.edge_ends(e)) == sorted(P.edge_faces(e))
        assert D.weight(e) == P.weight(e)
    # faces of the dual correspond one to one to primal vertices
    assert sorted(D.face_to_primal_vertex.values(), key=repr) == sorted(P.vertices, key=repr)
    DD = D.dual()
    assert DD.same_embedding(P, D.face_to_primal_vertex)
    assert DD.face_to_primal_vertex[DD.outer_face] == P.outer_face
    assert D.face_to_primal_vertex[D.outer_face] in P.boundary_walk(P.outer_face)


def test_dual_of_cycle_is_two_vertices_with_parallel_edges():
    # the dual of C_n is two vertices joined by n parallel edges (definition of the plane dual, Diestel, "Graph Theory", Sec. 4.6)
    for n in (3, 4, 7):
        D = PlaneGraph.from_graph(nx.cycle_graph(n)).dual()
        assert D.number_of_vertices() == 2 and D.number_of_edges() == n
        assert all({e.u, e.v} == {0, 1} for e in D.edges)
        assert D.number_of_faces() == n


def test_dual_of_tree_is_one_vertex_with_loops():
    # the dual of a tree with m edges is one vertex with m loops (definition of the plane dual, Diestel, "Graph Theory", Sec. 4.6)
    for n in (2, 5, 9):
        T = generators.random_tree(n, seed=n)
        D = T.dual()
        assert D.number_of_vertices() == 1 and D.number_of_edges() == n - 1
        assert all(e.u == e.v for e in D.edges)
    single = PlaneGraph.from_graph(nx.empty_graph(1)).dual()
    assert (single.number_of_vertices(), single.number_of_edges(), single.number_of_faces()) == (1, 0, 1)


# Platonic solids (V, E, F) and their duals: H. S. M. Coxeter, "Regular Polytopes", Dover 1973, Table I
PLATONIC = [
    ("tetrahedron", nx.tetrahedral_graph, (4, 6, 4), nx.tetrahedral_graph),
    ("cube", nx.cubical_graph, (8, 12, 6), nx.octahedral_graph),
    ("octahedron", nx.octahedral_graph, (6, 12, 8), nx.cubical_graph),
    ("dodecahedron", nx.dodecahedral_graph, (20, 30, 12), nx.icosahedral_graph),
    ("icosahedron", nx.icosahedral_graph, (12, 30, 20), nx.dodecahedral_graph),
]


@pytest.mark.parametrize("name,make,vef,dual_make", PLATONIC, ids=[p[0] for p in PLATONIC])
@pytest.mark.parametrize("how", ["from_graph", "from_positions"])
def test_platonic_solids(name, make, vef, dual_make, how):
    G = make()
    if how == "from_graph":
        P = PlaneGraph.from_graph(G)
    else:
        P = PlaneGraph.from_positions(G, nx.planar_layout(G))
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == vef
    D = P.dual()
    assert nx.is_isomorphic(D.to_simple_graph(), dual_make())
    # the dual of a 3-connected plane graph is simple (no loops, no parallel edges)
    assert D.to_simple_graph().number_of_edges() == D.number_of_edges()


# ------------------------------------------------------------ planarity
def _is_kuratowski_subdivision(edges) -> bool:
    """Smooth away degree-2 vertices and compare with K5 and K3,3 (independent of the library)."""
    H = nx.MultiGraph(list(edges))
    changed = True
    while changed:
        changed = False
        for v in list(H.nodes()):
            if H.degree(v) == 2 and H.number_of_edges(v, v) == 0:
                a, b = [w for _, w in H.edges(v)]
                H.remove_node(v)
                H.add_edge(a, b)
                changed = True
                break
    S = nx.Graph(H)
    return S.number_of_edges() == H.number_of_edges() and (
        nx.is_isomorphic(S, nx.complete_graph(5)) or nx.is_isomorphic(S, nx.complete_bipartite_graph(3, 3))
    )


@settings(max_examples=60, deadline=None)
@given(st.integers(5, 11), st.floats(0.2, 0.9), st.integers(0, 10**6))
@example(5, 1.0, 0)  # K5
def test_planarity_verdict_agrees_with_networkx(n, p, seed):
    G = nx.gnp_random_graph(n, p, seed=seed)
    if not nx.is_connected(G):
        G.add_edges_from((i, i + 1) for i in range(n - 1))
    planar, _ = nx.check_planarity(G)  # networkx, a general-purpose reference library (Boyer-Myrvold test)
    try:
        P = PlaneGraph.from_graph(G)
    except NonPlanarError as err:
        assert not planar
        # the certificate is a subdivision of K5 or K3,3 inside G
        assert all(G.has_edge(u, v) for u, v in err.kuratowski_edges)
        assert _is_kuratowski_subdivision(err.kuratowski_edges)
        return
    assert planar
    assert P.number_of_vertices() - P.number_of_edges() + P.number_of_faces() == 2
    if G.number_of_edges() > 3 * n - 6:  # Euler's bound for simple planar graphs (common practice)
        pytest.fail("a simple graph with more than 3n - 6 edges was embedded")


@settings(max_examples=30, deadline=None)
@given(weighted_graphs(1, 8, connected=True))
def test_from_graph_keeps_weights(G):
    try:
        P = PlaneGraph.from_graph(G)
    except NonPlanarError:
        assert not nx.check_planarity(G)[0]
        return
    got = sorted((frozenset((e.u, e.v)), e.weight) for e in P.edges)
    want = sorted((frozenset((u, v)), float(d["weight"])) for u, v, d in G.edges(data=True))
    assert got == want


# ----------------------------------------------------------- constructors
def test_from_rotation_multigraph_and_outer_choices():
    # two vertices, three parallel edges and a loop at "a"
    edges = [("a", "b"), ("a", "b"), ("a", "b"), ("a", "a")]
    P = PlaneGraph.from_rotation({"a": [0, 1, 2, (3, 0), (3, 1)], "b": [2, 1, 0]}, edges=edges, weights=[1, 2, 3, 4])
    # V - E + F = 2 - 4 + 4 = 2
    assert P.number_of_faces() == 4
    Q = PlaneGraph.from_rotation(
        {"a": [0, 1, 2, (3, 0), (3, 1)], "b": [2, 1, 0]}, edges=edges, outer=("dart", 6)
    )
    assert Q.outer_face == Q.face_of_dart(6)


def test_with_weights():
    P = generators.grid(2, 2)
    Q = P.with_weights([1, 2, 3, 4])
    assert Q.weights.tolist() == [1, 2, 3, 4] and P.weights.tolist() == [1, 1, 1, 1]
    assert Q.same_embedding(P.with_weights([1, 2, 3, 4]))
    R = Q.with_weights({0: 7})
    assert R.weights.tolist() == [7, 2, 3, 4]
    D = P.dual().with_weights([5, 5, 5, 5])
    assert D.face_to_primal_vertex == P.dual().face_to_primal_vertex
    with pytest.raises(WeightError):
        P.with_weights([1, -1, 1, 1])
    with pytest.raises(InvalidEmbeddingError, match="4 edges but 3"):
        P.with_weights([1, 1, 1])


# ------------------------------------------------------------- bad inputs
def _crossing():
    G = nx.Graph([("a", "c"), ("b", "d"), ("a", "b")])
    PlaneGraph.from_positions(G, {"a": (0, 0), "b": (1, 0), "c": (1, 1), "d": (0, 1)})


def _overlap():
    G = nx.Graph([("a", "b"), ("a", "c")])
    PlaneGraph.from_positions(G, {"a": (0, 0), "b": (1, 0), "c": (2, 0)})


def _one_sided_rotation():
    PlaneGraph.from_rotation({0: [1, 2], 1: [0], 2: [1]})


def _k4_torus():
    # every vertex sees the others in increasing order: 4 - 6 + F with F = 2 (counted in test_io_json)
    PlaneGraph.from_rotation({0: [1, 2, 3], 1: [0, 2, 3], 2: [0, 1, 3], 3: [0, 1, 2]})


def _k33_rotation():
    # K3,3 is not planar, so every rotation system of it has genus >= 1 (Kuratowski; common practice)
    PlaneGraph.from_rotation({0: [3, 4, 5], 1: [3, 4, 5], 2: [3, 4, 5], 3: [0, 1, 2], 4: [0, 1, 2], 5: [0, 1, 2]})


def _weight(value):
    def build():
        G = nx.path_graph(3)
        G[0][1]["weight"] = value
        PlaneGraph.from_graph(G)

    return build


def _disconnected():
    PlaneGraph.from_graph(nx.Graph([(0, 1), (2, 3)]))


def _disconnected_rotation():
    PlaneGraph.from_rotation({0: [1], 1: [0], 2: [3], 3: [2]})


def _truncated_planar_code():
    from sweepwidth.io._planar_code import HEADER, read_planar_code

    read_planar_code(HEADER + bytes([3, 2, 3, 0, 3, 1]), "cut.plc")


def _off_bad_index():
    from sweepwidth.io._mesh import read_mesh

    read_mesh(b"OFF\n3 1 0\n0 0 0\n1 0 0\n0 1 0\n3 0 1 3\n", "off", path="bad.off")


def _mesh_orientation():
    PlaneGraph.from_faces([[0, 1, 2], [0, 1, 3]])


def _rotation_bad_dart():
    PlaneGraph.from_rotation({"a": [0, 0]}, edges=[("a", "b")])


def _nan_position():
    PlaneGraph.from_positions(nx.path_graph(2), {0: (0, 0), 1: (math.nan, 0)})


def _same_point():
    PlaneGraph.from_positions(nx.path_graph(3), {0: (0, 0), 1: (1, 0), 2: (0, 0)})


def _k5():
    PlaneGraph.from_graph(nx.complete_graph(5))


BAD = [
    ("crossing-drawing", _crossing, CrossingEdgesError, r"\('a', 'c'\).*\('b', 'd'\)"),
    ("overlapping-edges", _overlap, CrossingEdgesError, "overlap|cross"),
    ("one-sided-rotation", _one_sided_rotation, InvalidEmbeddingError, "not the other way round"),
    ("k4-toroidal-rotation", _k4_torus, InvalidEmbeddingError, "genus 1"),
    ("k33-rotation", _k33_rotation, InvalidEmbeddingError, "genus [1-9]"),
    ("nan-weight", _weight(float("nan")), WeightError, "NaN"),
    ("negative-weight", _weight(-3), WeightError, "negative"),
    ("infinite-weight", _weight(float("inf")), WeightError, "infinite"),
    ("string-weight", _weight("heavy"), WeightError, "real number"),
    ("disconnected-graph", _disconnected, InvalidEmbeddingError, "not connected"),
    ("disconnected-rotation", _disconnected_rotation, InvalidEmbeddingError, "not connected"),
    ("truncated-planar-code", _truncated_planar_code, FileFormatError, r"cut\.plc.*byte"),
    ("off-bad-index", _off_bad_index, FileFormatError, r"bad\.off, line 6.*index 3"),
    ("mesh-orientation", _mesh_orientation, InvalidEmbeddingError, "same direction"),
    ("rotation-missing-vertex", _rotation_bad_dart, InvalidEmbeddingError, "no rotation"),
    ("nan-position", _nan_position, InvalidEmbeddingError, "not finite"),
    ("coincident-vertices", _same_point, InvalidEmbeddingError, "same point"),
    ("k5-not-planar", _k5, NonPlanarError, "not planar"),
]


@pytest.mark.parametrize("build,error,pattern", [b[1:] for b in BAD], ids=[b[0] for b in BAD])
def test_bad_inputs(build, error, pattern):
    with pytest.raises(error, match=pattern):
        build()


def test_crossing_error_carries_both_edges():
    with pytest.raises(CrossingEdgesError) as info:
        _crossing()
    assert {frozenset(e) for e in info.value.edges} == {frozenset("ac"), frozenset("bd")}
    assert isinstance(info.value, SweepwidthError) and isinstance(info.value, ValueError)


# ---------------------------------------------------- geometry vs. faces
@settings(max_examples=30, deadline=None)
@given(plane_graphs(3, 12, kinds=("delaunay", "chords")))
def test_drawn_faces_are_counterclockwise(P):
    # with positions from a straight-line drawing, inner faces have positive signed area
    # and the outer face negative (shoelace formula; common practice)
    for f in P.faces:
        pts = np.array([P.pos[v] for v in P.boundary_walk(f)])
        area = 0.5 * float(np.sum(pts[:, 0] * np.roll(pts[:, 1], -1) - np.roll(pts[:, 0], -1) * pts[:, 1]))
        if f == P.outer_face:
            assert area <= 1e-12
        elif len(set(P.boundary_walk(f))) == len(P.boundary_walk(f)):
            assert area > 0

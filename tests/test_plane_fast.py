"""The vectorised construction paths against the plain loops they replace (model-based).

``sweepwidth.plane._arrays.FAST_MIN_DARTS`` decides which path a build takes;
each test builds the same input both ways and compares everything a
PlaneGraph holds: rotation, faces (ids and walks), outer face, and the error
raised for a bad input.
"""

from __future__ import annotations

import networkx as nx
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from sweepwidth import generators
from sweepwidth.errors import SweepwidthError
from sweepwidth.plane import PlaneGraph, _arrays

from strategies import plane_graphs, triangulated_disks

SLOW = 10**12


def _state(P: PlaneGraph) -> tuple:
    return (
        P.vertices,
        [tuple(e) for e in P.edges],
        [P.next_dart(d) for d in range(2 * P.number_of_edges())],
        [P.prev_dart(d) for d in range(2 * P.number_of_edges())],
        [P.darts_at(v) for v in P.vertices],
        [P.face_darts(f) for f in P.faces],
        [P.face_of_dart(d) for d in range(2 * P.number_of_edges())],
        P.outer_face,
    )


def _both(build):
    """(result or error text) with the fast path forced, then with the plain loops."""
    out = []
    saved = _arrays.FAST_MIN_DARTS
    try:
        for threshold in (0, SLOW):
            _arrays.FAST_MIN_DARTS = threshold
            try:
                out.append(("ok", build()))
            except SweepwidthError as err:
                out.append(("err", f"{type(err).__name__}: {err}"))
    finally:
        _arrays.FAST_MIN_DARTS = saved
    return out


def _compare(build):
    (ka, a), (kb, b) = _both(build)
    assert ka == kb
    if ka == "ok":
        assert _state(a) == _state(b)
        if a.face_to_primal_vertex is not None or b.face_to_primal_vertex is not None:
            assert a.face_to_primal_vertex == b.face_to_primal_vertex
        if a.pos is None or b.pos is None:
            assert a.pos is None and b.pos is None
        else:
            assert a.pos.keys() == b.pos.keys()
            assert all(np.allclose(a.pos[k], b.pos[k], rtol=1e-12, atol=1e-12) for k in a.pos)
    else:
        assert a == b
    return a


def _rebuild(P: PlaneGraph, nxt=None) -> PlaneGraph:
    ends = [(P.index(e.u), P.index(e.v)) for e in P.edges]
    nd = nxt if nxt is not None else [P.next_dart(d) for d in range(2 * len(ends))]
    return PlaneGraph(P.vertices, ends, P.weights.tolist(), nd)


@settings(max_examples=60, deadline=None)
@given(plane_graphs(1, 14))
def test_constructor_paths_agree(P):
    _compare(lambda: _rebuild(P))


@settings(max_examples=60, deadline=None)
@given(plane_graphs(1, 12), st.data())
def test_constructor_paths_agree_on_scrambled_rotations(P, data):
    # a random permutation of the darts: mostly invalid (wrong tails, other genus), sometimes valid
    m2 = 2 * P.number_of_edges()
    if m2 == 0:
        return
    how = data.draw(st.sampled_from(["shuffle", "swap-at-vertex", "swap-any", "out-of-range"]))
    nxt = [P.next_dart(d) for d in range(m2)]
    if how == "shuffle":
        nxt = data.draw(st.permutations(nxt))
    elif how == "swap-at-vertex":
        v = data.draw(st.sampled_from(P.vertices))
        ds = P.darts_at(v)
        if len(ds) >= 2:
            i, j = data.draw(st.lists(st.sampled_from(ds), min_size=2, max_size=2, unique=True))
            nxt[i], nxt[j] = nxt[j], nxt[i]
    elif how == "swap-any":
        i, j = data.draw(st.integers(0, m2 - 1)), data.draw(st.integers(0, m2 - 1))
        nxt[i], nxt[j] = nxt[j], nxt[i]
    else:
        nxt[data.draw(st.integers(0, m2 - 1))] = data.draw(st.sampled_from([-1, m2, m2 + 5]))
    _compare(lambda: _rebuild(P, nxt))


@settings(max_examples=40, deadline=None)
@given(plane_graphs(1, 12, weighted=True))
def test_dual_paths_agree(P):
    D = _compare(P.dual)
    _compare(D.dual)


@settings(max_examples=40, deadline=None)
@given(triangulated_disks(max_faces=24))
def test_from_faces_paths_agree(T):
    faces = [T.boundary_walk(f) for f in T.faces if f != T.outer_face]
    _compare(lambda: PlaneGraph.from_faces(faces, pos=T.pos))
    # the sphere: every face, the outer one named
    allf = [T.boundary_walk(f) for f in T.faces]
    k = T.outer_face
    _compare(lambda: PlaneGraph.from_faces(allf, outer=k))
    w = {(e.u, e.v): e.id % 3 for e in T.edges}
    _compare(lambda: PlaneGraph.from_faces(faces, weights=w))


BAD_FACES = [
    ("repeat", [[0, 1, 1, 2]]),
    ("same-direction", [[0, 1, 2], [0, 1, 3]]),
    ("pinched", [[0, 1, 2], [0, 3, 4]]),
    ("empty-face", [[0, 1, 2], []]),
    ("two-components", [[0, 1, 2], [3, 4, 5]]),
    ("torus-like", [[0, 1, 2], [0, 2, 1]] + [[0, 1, 3]]),
]


@pytest.mark.parametrize("faces", [b[1] for b in BAD_FACES], ids=[b[0] for b in BAD_FACES])
def test_from_faces_errors_agree(faces):
    _compare(lambda: PlaneGraph.from_faces(faces))


def test_array_faces_give_plain_int_labels():
    arr = np.array([[0, 1, 2], [0, 2, 3]])
    for kind, P in _both(lambda: PlaneGraph.from_faces(arr)):
        assert kind == "ok"
        assert P.vertices == [0, 1, 2, 3] and all(type(v) is int for v in P.vertices)


def test_large_triangulation_paths_agree():
    T = generators.delaunay(400, seed=7)
    faces = [T.boundary_walk(f) for f in T.faces if f != T.outer_face]
    _compare(lambda: PlaneGraph.from_faces(faces, pos=T.pos))
    _compare(T.dual)
    # positions with a key that is not a vertex: the outer face point still looks at every position
    T.pos = dict(T.pos, extra=(5.0, 7.0))
    _compare(T.dual)
    tree = generators.random_tree(300, seed=3)  # one face of length 2m: the longest cycles
    _compare(lambda: _rebuild(tree))
    _compare(tree.dual)


@pytest.mark.parametrize("steps", [1, 3, 64])
def test_cycles_helper_against_a_loop(steps, monkeypatch):
    monkeypatch.setattr(_arrays, "LOCKSTEP_STEPS", steps)  # short walks force the pointer-jumping part
    rng = np.random.default_rng(steps)
    for k in (1, 2, 7, 100, 300):
        perm = rng.permutation(k)
        inv = np.empty(k, dtype=np.int64)
        inv[perm] = np.arange(k)
        head, rank = _arrays.cycles(perm.astype(np.int64), inv)
        for x in range(k):
            # walk the cycle by hand
            cyc = [x]
            while perm[cyc[-1]] != x:
                cyc.append(int(perm[cyc[-1]]))
            h = min(cyc)
            assert head[x] == h
            y, r = h, 0
            while y != x:
                y, r = int(perm[y]), r + 1
            assert rank[x] == r


def test_regression_dual_with_partial_positions():
    # positions for only some vertices used to raise KeyError in the dual's face points
    G = nx.cycle_graph(4)
    P = PlaneGraph.from_graph(G)
    P.pos = {0: (0.0, 0.0), 1: (1.0, 0.0)}
    D = P.dual()
    assert D.pos is None and D.number_of_vertices() == 2


@pytest.mark.slow
def test_large_triangulation_dual_of_dual():
    # 10^5 points: the vectorised paths on a size where the plain loops are not run by default
    P = generators.delaunay(10**5, seed=1)
    assert P.number_of_vertices() - P.number_of_edges() + P.number_of_faces() == 2  # Euler
    D = P.dual()
    DD = D.dual()
    assert DD.same_embedding(P, D.face_to_primal_vertex)
    assert DD.face_to_primal_vertex[DD.outer_face] == P.outer_face


def test_regression_plane_graphs_pickle():
    # the shared empty edge-attribute mapping once made every PlaneGraph unpicklable
    import pickle

    for P in (generators.delaunay(300, seed=2), generators.grid(2, 2), generators.random_tree(200, seed=1)):
        for G in (P, P.dual()):
            Q = pickle.loads(pickle.dumps(G))
            assert _state(Q) == _state(G)
            assert Q.face_to_primal_vertex == G.face_to_primal_vertex
            assert Q.edge_data(0) == G.edge_data(0)
    with pytest.raises(TypeError):
        generators.grid(2, 2)._edata[0]["x"] = 1

"""Our JSON document: round trips, metadata, and a table of malformed documents."""

from __future__ import annotations

import copy
import json

import networkx as nx
import pytest
from hypothesis import given, settings

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import (
    CrossingEdgesError,
    FileFormatError,
    InvalidCurveError,
    InvalidEmbeddingError,
    NonPlanarError,
    SweepwidthError,
    UnsupportedOptionError,
    WeightError,
)
from sweepwidth.io import dumps, from_document, loads, to_document

from strategies import plane_graphs


def _same(P: sw.PlaneGraph, Q: sw.PlaneGraph) -> None:
    assert Q.vertices == P.vertices
    assert Q.same_embedding(P)
    assert Q.outer_face == P.outer_face
    assert [tuple(e) for e in Q.edges] == [tuple(e) for e in P.edges]
    assert [Q.face_darts(f) for f in Q.faces] == [P.face_darts(f) for f in P.faces]


@settings(max_examples=40, deadline=None)
@given(plane_graphs(1, 9, weighted=True))
def test_round_trip_random(P):
    Q = loads(dumps(P))
    _same(P, Q)
    assert Q.pos == P.pos
    # the compact form reads back the same
    _same(P, loads(dumps(P, indent=None)))


def test_round_trip_file_and_metadata(tmp_path):
    P = generators.grid(3, 3, weights=(1, 4), seed=5)
    outer = P.face_darts(P.outer_face)
    P.meta.update(
        provenance={"generator": "grid", "seed": 5},
        known={"cutwidth": {"value": 4, "source": "exhaustive search"}},
        curves={"start": {"vertex": P.tail(outer[0]), "darts": outer}, "cut": {"edges": [0, 3]}},
        holes=[0],
        note="kept under extra",
    )
    path = tmp_path / "g.json"
    sw.write(P, path)
    Q = sw.read(path)
    _same(P, Q)
    assert Q.meta == P.meta
    assert all(isinstance(v, tuple) for v in Q.vertices)  # JSON arrays come back as tuples


def test_labels_of_mixed_types_round_trip():
    G = nx.Graph([("a", 1), (1, (2, "b")), ((2, "b"), "a"), ("a", 2.5), (2.5, True)])
    P = sw.PlaneGraph.from_graph(G)
    Q = loads(dumps(P))
    assert Q.vertices == P.vertices
    assert Q.same_embedding(P)


def test_loops_and_parallel_edges_round_trip():
    D = generators.random_tree(5, seed=1).dual()  # one vertex, four loops
    assert D.number_of_vertices() == 1 and D.number_of_edges() == 4
    _same(D, loads(dumps(D)))
    C = sw.PlaneGraph.from_graph(nx.cycle_graph(5)).dual()  # two vertices, five parallel edges
    _same(C, loads(dumps(C)))


def test_networkx_graph_document():
    G = nx.petersen_graph()  # not planar: read back as a networkx graph
    for u, v in G.edges():
        G[u][v]["weight"] = (u + v) % 3 + 1
    H = loads(dumps(G))
    assert isinstance(H, nx.Graph) and not isinstance(H, sw.PlaneGraph)
    assert nx.utils.graphs_equal(G, H)
    M = nx.MultiGraph([(0, 1), (0, 1), (1, 2)])
    HM = loads(dumps(M))
    assert HM.is_multigraph() and HM.number_of_edges(0, 1) == 2


def test_positions_only_and_edge_list_only_keep_edge_ids():
    P = generators.grid(2, 4)
    doc = to_document(P)
    del doc["rotation"]
    Q = from_document(copy.deepcopy(doc))  # rotation from the drawing
    _same(P, Q)
    del doc["positions"]
    R = from_document(doc)  # rotation from networkx's planarity test
    assert [tuple(e) for e in R.edges] == [tuple(e) for e in P.edges]
    assert R.number_of_faces() == P.number_of_faces()


def test_kind_graph_and_plane(tmp_path):
    P = generators.wheel(5)
    path = tmp_path / "w.json"
    sw.write(P, path)
    G = sw.read(path, kind="graph")
    assert isinstance(G, nx.MultiGraph) and G.number_of_edges() == P.number_of_edges()
    sw.write(nx.complete_graph(5), tmp_path / "k5.json")
    with pytest.raises(NonPlanarError, match="k5.json"):
        sw.read(tmp_path / "k5.json", kind="plane")
    with pytest.raises(UnsupportedOptionError, match="kind"):
        sw.read(path, kind="mesh")


def _good() -> dict:
    return to_document(sw.PlaneGraph.from_graph(nx.cycle_graph(3)))


def _edit(fn):
    doc = _good()
    fn(doc)
    return json.dumps(doc)


BAD = [
    ("not-json", "{", FileFormatError, "line 1"),
    ("top-level-array", "[]", FileFormatError, "top level"),
    ("wrong-format", _edit(lambda d: d.update(format="other")), FileFormatError, "format"),
    ("future-version", _edit(lambda d: d.update(version=7)), FileFormatError, "newer"),
    ("missing-vertices", _edit(lambda d: d.pop("vertices")), FileFormatError, "vertices"),
    ("duplicate-label", _edit(lambda d: d["vertices"].__setitem__(1, 0)), FileFormatError, "repeats"),
    ("unknown-end", _edit(lambda d: d["edges"][0].update(ends=[0, 9])), FileFormatError, r"edges\[0\]\.ends\[1\]"),
    ("duplicate-id", _edit(lambda d: d["edges"][1].update(id=0)), FileFormatError, "used twice"),
    ("negative-weight", _edit(lambda d: d["edges"][0].update(weight=-2)), WeightError, "negative"),
    ("nan-weight", _edit(lambda d: d["edges"][0].update(weight=float("nan"))), WeightError, "NaN"),
    ("bool-weight", _edit(lambda d: d["edges"][0].update(weight=True)), WeightError, "bool"),
    ("dart-missing", _edit(lambda d: d["rotation"][0].pop()), FileFormatError, "missing from the rotation"),
    ("dart-twice", _edit(lambda d: d["rotation"][0].append(d["rotation"][0][0])), FileFormatError, "twice"),
    ("dart-wrong-vertex", _edit(lambda d: d["rotation"].__setitem__(0, d["rotation"][1])), FileFormatError, "leaves"),
    ("bad-dart-end", _edit(lambda d: d.update(outer=[0, 2])), FileFormatError, "outer"),
    ("bad-position", _edit(lambda d: d.update(positions=[[0, 0], [1], [2, 2]])), FileFormatError, r"positions\[1\]"),
    ("label-object", _edit(lambda d: d["vertices"].__setitem__(0, {"a": 1})), FileFormatError, "object"),
    (
        "curve-broken-walk",
        _edit(lambda d: d.update(curves={"c": {"vertex": 0, "darts": [[2, 0]]}})),
        InvalidCurveError,
        "leaves",
    ),
    ("known-no-value", _edit(lambda d: d.update(known={"cutwidth": 3})), FileFormatError, "known.cutwidth"),
]


@pytest.mark.parametrize("text,error,match", [b[1:] for b in BAD], ids=[b[0] for b in BAD])
def test_bad_documents(text, error, match):
    with pytest.raises(error, match=match):
        loads(text, path="bad.json")


def test_genus_one_rotation_is_rejected_with_the_file_name():
    # K4 with the rotation 0:(1,2,3) at every vertex read in one fixed cyclic order
    # gives a toroidal embedding (V - E + F = 4 - 6 + 2 = 0): checked by counting faces below.
    doc = {
        "format": "sweepwidth-plane",
        "version": 1,
        "vertices": [0, 1, 2, 3],
        "edges": [{"id": i, "ends": list(p)} for i, p in enumerate([(0, 1), (0, 2), (0, 3), (1, 2), (1, 3), (2, 3)])],
        # counterclockwise neighbour orders 0:1,2,3  1:0,2,3  2:0,1,3  3:0,1,2 (edge ids)
        "rotation": [[0, 1, 2], [0, 3, 4], [1, 3, 5], [2, 4, 5]],
    }
    # independent count: faces are the orbits of "reverse the dart, then turn once clockwise"
    ends = [e["ends"] for e in doc["edges"]]
    ccw = {}
    for v, lst in enumerate(doc["rotation"]):
        darts = [2 * e + (0 if ends[e][0] == v else 1) for e in lst]
        for i, d in enumerate(darts):
            ccw[darts[(i + 1) % 3]] = d  # clockwise successor
    seen, faces = set(), 0
    for d in range(12):
        if d not in seen:
            faces += 1
            while d not in seen:
                seen.add(d)
                d = ccw[d ^ 1]
    assert 4 - 6 + faces == 0  # Euler characteristic 0: the torus
    with pytest.raises(InvalidEmbeddingError, match=r"k4\.json.*genus 1"):
        from_document(doc, path="k4.json")


def test_crossing_drawing_names_both_edges():
    doc = {
        "format": "sweepwidth-plane",
        "version": 1,
        "vertices": ["a", "b", "c", "d"],
        "edges": [{"id": 0, "ends": ["a", "c"]}, {"id": 1, "ends": ["b", "d"]}, {"id": 2, "ends": ["a", "b"]}],
        "positions": [[0, 0], [1, 0], [1, 1], [0, 1]],
    }
    with pytest.raises(CrossingEdgesError, match=r"x\.json.*'a', 'c'.*'b', 'd'"):
        from_document(doc, path="x.json")


def test_unwritable_label():
    G = nx.Graph([(frozenset({1}), 2)])
    with pytest.raises(SweepwidthError, match="frozenset"):
        dumps(G)


def test_documented_example_reads_and_its_known_value_holds():
    import itertools
    import pathlib

    text = (pathlib.Path(__file__).parents[1] / "docs" / "formats.md").read_text()
    block = text.split("```json\n", 1)[1].split("```", 1)[0]
    P = loads(block, path="docs/formats.md")
    assert (P.number_of_vertices(), P.number_of_edges(), P.number_of_faces()) == (4, 5, 3)
    assert P.meta["curves"]["start"]["vertex"] == "desk" and (2, 0) in P.vertices
    assert P.edge_data(2) == {"kind": "rope"} and P.meta["note"] == "extra keys go under extra"
    # the stated cutwidth, recomputed here by brute force over all 4! orderings
    G = P.to_simple_graph()

    def width(order):
        return max(
            sum(d["weight"] for u, v, d in G.edges(data=True) if (u in order[:i]) != (v in order[:i]))
            for i in range(1, len(order))
        )

    assert min(width(list(o)) for o in itertools.permutations(G.nodes())) == P.meta["known"]["cutwidth"]["value"]


def test_width_walks_and_leashes_round_trip(tmp_path):
    # the leash instances store walks a, b and leashes start, end under 'curves' (docs/formats.md)
    import os

    src = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances", "leashes",
                       "backstep-delaunay-1037.json")
    P = sw.read(src)
    assert set(P.meta["curves"]) == {"a", "b", "start", "end"}
    out = tmp_path / "again.json"
    sw.write(P, str(out))
    Q = sw.read(str(out))
    assert Q.meta["curves"] == P.meta["curves"]
    # the same walks give the same width (6: the manifest's value, found by the exact search)
    from sweepwidth.bench.loading import solve_object

    assert solve_object(Q, "width").value == solve_object(P, "width").value == P.meta["known"]["width"]["value"]

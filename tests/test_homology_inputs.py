"""Reading start and end cycles, and clear errors for bad input."""

from __future__ import annotations

import networkx as nx
import pytest

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import InvalidCurveError, ProblemTooLargeError, SweepwidthError, UnsupportedOptionError
from sweepwidth.problems.cycles import HomologyProblem, bounded_face_sets, check_even, cycle_edges


@pytest.fixture
def square():
    return generators.grid(2, 2)  # one unit square; vertices (i, j)


def test_every_form_of_the_same_cycle(square):
    P = square
    ref = frozenset(P.face_boundary_cycle(P.outer_face))
    walk = P.face_darts(P.outer_face)
    forms = [
        None,
        set(ref),
        sorted(ref),
        tuple(sorted(ref)),
        {"edges": sorted(ref)},
        {"darts": walk},
        {"vertex": P.tail(walk[0]), "darts": walk},
        P.boundary_walk(P.outer_face),
        P.boundary_walk(P.outer_face) + [P.boundary_walk(P.outer_face)[0]],
        {"vertices": P.boundary_walk(P.outer_face)},
        {"faces": [P.outer_face]},
    ]
    for spec in forms:
        assert cycle_edges(P, spec, default="outer") == ref, spec


def test_walk_objects_with_darts_attribute(square):
    class W:
        def __init__(self, darts):
            self.darts = darts

    P = square
    assert cycle_edges(P, W(P.face_darts(0))) == P.face_boundary_cycle(0)


def test_mod_two_reduction(square):
    assert cycle_edges(square, [0, 0, 1, 1]) == frozenset()
    assert cycle_edges(square, {"darts": [0, 1]}) == frozenset()  # there and back


BAD = [
    ("odd-vertex", {0}, InvalidCurveError, r"vertex \(0, 0\) has odd degree"),
    ("no-such-edge", [0, 1, 99], InvalidCurveError, "edge id 99 does not exist"),
    ("no-such-dart", {"darts": [0, 77]}, InvalidCurveError, "dart 77"),
    ("not-closed", {"darts": [0]}, InvalidCurveError, "does not close"),
    ("not-a-walk", {"darts": [0, 0]}, InvalidCurveError, "do not meet"),
    ("wrong-vertex", {"vertex": (1, 1), "darts": [0, 1]}, InvalidCurveError, "said to start"),
    ("not-adjacent", [(0, 0), (1, 1)], InvalidCurveError, "not adjacent"),
    ("unknown-key", {"edgez": [0]}, InvalidCurveError, "unknown key"),
    ("two-keys", {"edges": [0], "faces": [0]}, InvalidCurveError, "exactly one"),
    ("stranger", ["spam"], InvalidCurveError, "neither an edge id nor a vertex"),
    ("wrong-type", 3.5, InvalidCurveError, "cannot read a cycle"),
]


@pytest.mark.parametrize("name,spec,exc,match", BAD, ids=[b[0] for b in BAD])
def test_bad_start_is_refused_clearly(square, name, spec, exc, match):
    with pytest.raises(exc, match=match):
        sw.homology_width(square, start=spec)


def test_odd_end_names_end(square):
    with pytest.raises(InvalidCurveError, match="^end is not a Z2 cycle"):
        sw.homology_width(square, end={1})


def test_ambiguous_integer_list():
    # on K4 the labels 0..3 are also edge ids: [1, 2, 3] reads as three edges or as a triangle
    P = sw.PlaneGraph.from_graph(nx.complete_graph(4))
    with pytest.raises(InvalidCurveError, match="reads both as edge ids and as a closed walk"):
        cycle_edges(P, [1, 2, 3])
    assert cycle_edges(P, {"edges": [1, 2, 3]}) == frozenset({1, 2, 3})
    assert len(cycle_edges(P, {"vertices": [1, 2, 3]})) == 3


def test_parallel_edges_refuse_vertex_walks():
    D = sw.PlaneGraph.from_graph(nx.cycle_graph(3)).dual()  # two vertices, three parallel edges
    with pytest.raises(InvalidCurveError, match="parallel edges"):
        cycle_edges(D, {"vertices": list(D.vertices)})


def test_bad_holes_method_options(square):
    with pytest.raises(SweepwidthError, match="hole 7 is not a face id"):
        sw.homology_width(square, holes={7})
    with pytest.raises(UnsupportedOptionError, match="'subset-dp'"):
        sw.homology_width(square, method="magic")
    with pytest.raises(UnsupportedOptionError, match="dp_limit"):
        sw.homology_width(square, colour=3)
    with pytest.raises(SweepwidthError, match="monotone=False"):
        sw.homology_width(square, method="dual-cutwidth", monotone=False)
    with pytest.raises(SweepwidthError, match="time_limit"):
        sw.homology_width(square, time_limit=-1)
    with pytest.raises(SweepwidthError, match="seed"):
        sw.homology_width(square, seed="x")
    with pytest.raises(SweepwidthError, match="PlaneGraph"):
        sw.homology_width(nx.path_graph(3))


def test_size_limits_are_refused_before_work():
    P = generators.triangulated_grid(4)  # 32 inner faces
    with pytest.raises(ProblemTooLargeError, match="limit"):
        sw.homology_width(P, method="subset-dp")
    inner = [f for f in P.faces if f != P.outer_face]
    with pytest.raises(ProblemTooLargeError, match="monotone=True"):
        # from an interior cycle the toggle search has no shortcut
        sw.homology_width(P, start={"faces": inner[:5]}, monotone=False)


def test_large_bottom_to_top_non_monotone_uses_the_theorem():
    # from the disk boundary the lattice path runs bottom to top: Brightwell and Winkler,
    # "Submodular percolation" (SIAM J. Discrete Math. 2009) make the monotone width the answer
    P = generators.triangulated_grid(4)
    r = sw.homology_width(P, monotone=False)
    assert r.status == "optimal"
    assert "Brightwell-Winkler" in r.method
    assert r.value == sw.homology_width(P).value
    assert r.check(P) == r.value


def test_error_classes_are_builtin_subclasses(square):
    # errors.py: library errors also derive from the matching builtin (DEVELOPERS.md, conventions)
    with pytest.raises(ValueError):
        sw.homology_width(square, start={0})


def test_bounded_face_sets_without_and_with_holes():
    P = generators.grid(2, 3)
    c = P.face_boundary_cycle(P.outer_face)
    both, why = bounded_face_sets(P, c, ())
    assert why is None and len(both) == 2 and both[0] | both[1] == set(P.faces)
    none, why = bounded_face_sets(P, c, P.faces)
    assert none == [] and "not homologous" in why


def test_problem_summary_is_json_ready(square):
    import json

    hp = HomologyProblem.build(square, start=None, end=None, holes=None)
    assert json.loads(json.dumps(hp.summary()))["holes"] == [square.outer_face]
    check_even(square, hp.start)


def test_memory_cap_holds_even_with_a_raised_face_limit():
    P = generators.triangulated_grid(4)  # 32 inner faces: 2^32 states would need tens of GiB
    inner = [f for f in P.faces if f != P.outer_face]
    with pytest.raises(ProblemTooLargeError, match="GiB"):
        sw.homology_width(P, method="subset-dp", max_faces=40)
    with pytest.raises(ProblemTooLargeError, match="GiB"):
        sw.homology_width(P, start={"faces": inner[:5]}, monotone=False, max_faces=40)

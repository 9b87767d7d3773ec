"""The homotopy model: curve parsing, the move rules, the independent replay checker, feasibility.

Sources of the expected values:
* the shared curve/move specification (move semantics; checked against the
  brute-force move enumeration in ``tests/reference_homotopy.py``, written
  separately from ``sweepwidth.problems.homotopy``);
* common practice of combinatorial topology: in an annulus the boundary curve
  is not contractible; a closed curve and its reverse are not freely
  homotopic in an annulus (winding numbers +1 and -1); every closed curve in a
  disk is contractible.
"""

from __future__ import annotations

import copy
import random

import networkx as nx
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from reference_homotopy import legal_moves, reference_height
from strategies import plane_graphs

import sweepwidth as sw
from sweepwidth.errors import (
    InvalidCurveError,
    SweepwidthError,
    UnsupportedOptionError,
    WitnessError,
)
from sweepwidth.generators import (
    grid,
    random_tree,
    triangulated_grid,
    wheel,
)
from sweepwidth.plane import PlaneGraph
from sweepwidth.problems.homotopy import (
    Curve,
    HomotopyProblem,
    IllegalMoveError,
    curve_from_json,
)
from sweepwidth.solve.homotopy import homotopy_classes_equal, homotopy_height
from sweepwidth.verify.homotopy import replay_homotopy


# ------------------------------------------------------------------ parsing
def test_default_problem_is_outer_boundary_to_point():
    P = wheel(5)
    H = HomotopyProblem.build(P)
    assert list(H.start.darts) == P.face_darts(P.outer_face)
    assert H.end is None and H.closed
    assert H.holes == frozenset({P.outer_face})
    assert H.length_of(H.start) == 5.0  # rim of the wheel: 5 unit edges (definition)


def test_curve_forms_agree():
    P = wheel(4)
    outer = P.face_darts(P.outer_face)
    verts = [P.tail(d) for d in outer]
    a = curve_from_json(P, outer)
    b = curve_from_json(P, {"vertex": verts[0], "darts": outer})
    c = curve_from_json(P, {"vertices": verts})
    d = curve_from_json(P, verts + [verts[0]])  # repeated first vertex closes the walk
    assert a == b == c == d


def test_darts_that_do_not_meet_are_named():
    P = triangulated_grid(2)
    d0 = P.face_darts(P.outer_face)[0]
    far = next(d for d in range(2 * P.number_of_edges()) if P.tail(d) != P.head(d0))
    with pytest.raises(InvalidCurveError, match=r"darts 0 and 1 do not meet: head of dart 0 .* tail of dart 1"):
        HomotopyProblem.build(P, start={"darts": [d0, far]})


def test_open_walk_is_not_closed():
    P = wheel(4)
    outer = P.face_darts(P.outer_face)
    with pytest.raises(InvalidCurveError, match="not closed"):
        HomotopyProblem.build(P, start={"darts": outer[:2]})


def test_vertex_list_with_parallel_edges_is_ambiguous():
    G = nx.MultiGraph([(0, 1), (0, 1), (1, 2), (2, 0)])
    P = PlaneGraph.from_graph(G)
    with pytest.raises(InvalidCurveError, match="joined by 2 edges"):
        curve_from_json(P, [0, 1, 2])


def test_not_a_vertex():
    with pytest.raises(InvalidCurveError, match="not a vertex"):
        HomotopyProblem.build(wheel(4), start={"vertices": [1, 2, 99]})


def test_path_form_ends_must_lie_on_outer_face():
    P = triangulated_grid(2)
    with pytest.raises(InvalidCurveError, match=r"s=\(1, 1\) is not on the outer face"):
        HomotopyProblem.build(P, s=(1, 1), t=(2, 2))
    with pytest.raises(InvalidCurveError, match="same vertex"):
        HomotopyProblem.build(P, s=(0, 0), t=(0, 0))
    with pytest.raises(InvalidCurveError, match="both ends"):
        HomotopyProblem.build(P, s=(0, 0))


def test_path_form_default_curves():
    P = triangulated_grid(2)
    H = HomotopyProblem.build(P, s=(0, 0), t=(2, 2))
    outer = P.face_darts(P.outer_face)
    # start + reverse(end) is the outer boundary walk (up to rotation): definition of the path form
    loop = list(H.start.darts) + [d ^ 1 for d in reversed(H.end.darts)]
    k = outer.index(loop[0])
    assert outer[k:] + outer[:k] == loop
    assert P.tail(H.start.darts[0]) == (0, 0) and P.head(H.start.darts[-1]) == (2, 2)


def test_bad_options():
    P = wheel(4)
    with pytest.raises(UnsupportedOptionError, match="'weight'"):
        HomotopyProblem.build(P, length="edges")
    with pytest.raises(SweepwidthError, match="hole 99"):
        HomotopyProblem.build(P, holes={99})
    with pytest.raises(UnsupportedOptionError, match="method"):
        homotopy_height(P, method="magic")
    with pytest.raises(SweepwidthError, match="time_limit"):
        homotopy_height(P, time_limit=-1)
    with pytest.raises(SweepwidthError, match="PlaneGraph"):
        homotopy_height(nx.cycle_graph(4))


def test_lengths():
    P = wheel(4).with_weights([2.0] * 8)
    H = HomotopyProblem.build(P)
    Hv = HomotopyProblem.build(P, length="vertices")
    assert H.length_of(H.start) == 8.0  # four rim edges of weight 2
    assert Hv.length_of(Hv.start) == 4.0  # four vertices visited
    assert Hv.length_of(Curve((), 0)) == 1.0  # a point counts one vertex (spec)
    Ho = HomotopyProblem.build(P, s=1, t=3, length="vertices")
    assert Ho.length_of(Ho.start) == len(Ho.start.darts) + 1


# ------------------------------------------------------------------ moves vs the brute-force enumeration
def _random_walk(H: HomotopyProblem, rng: random.Random, steps: int) -> Curve:
    """A walk reached from the start by random legal moves (reference enumeration)."""
    walk, vertex = tuple(H.start.darts), H.start.vertex
    for _ in range(steps):
        opts = [m for m in legal_moves(H, walk, vertex) if len(m[1]) <= len(H.start.darts) + 4]
        if not opts:
            break
        _, walk, vertex = rng.choice(opts)
    return Curve(walk, vertex)


def _mutations(mv: dict, rng: random.Random, m2: int, F: int) -> list[dict]:
    out = []
    for key in ("pos", "take", "face", "dart"):
        if key in mv:
            bad = dict(mv)
            bad[key] = mv[key] + rng.choice([-1, 1])
            out.append(bad)
    if mv.get("put"):
        bad = copy.deepcopy(mv)
        bad["put"][rng.randrange(len(bad["put"]))] = rng.randrange(m2)
        out.append(bad)
    return out


@settings(max_examples=25, deadline=None)
@given(plane_graphs(min_vertices=2, max_vertices=6), st.integers(0, 10**6), st.booleans())
def test_apply_move_agrees_with_enumeration(P, seed, open_form):
    """Every enumerated legal move is accepted with the same result; mutated moves are legal iff enumerated."""
    rng = random.Random(seed)
    if open_form:
        outer = P.face_darts(P.outer_face)
        vs = sorted({P.tail_index(d) for d in outer})
        if len(vs) < 2:
            return
        s, t = rng.sample(vs, 2)
        H = HomotopyProblem.build(P, s=P.label(s), t=P.label(t))
    else:
        H = HomotopyProblem.build(P)
    c = _random_walk(H, rng, rng.randrange(4))
    legal = {}
    for mv, walk, vertex in legal_moves(H, c.darts, c.vertex):
        legal[repr(sorted(mv.items()))] = (walk, vertex)
        got = H.apply_move(c, mv)
        assert got == Curve(walk, vertex), mv
    m2 = 2 * P.number_of_edges()
    for mv, _, _ in list(legal_moves(H, c.darts, c.vertex))[:30]:
        for bad in _mutations(mv, rng, m2, P.number_of_faces()):
            key = repr(sorted(bad.items()))
            if key in legal:
                assert H.apply_move(c, bad) == Curve(*legal[key])
            else:
                with pytest.raises(IllegalMoveError):
                    H.apply_move(c, bad)


def test_flip_examples_from_the_spec():
    P = wheel(3)
    H = HomotopyProblem.build(P)
    W = H.start
    # k = 0 inserts the whole boundary of a face as a loop at the walk's vertex ...
    f = H.dart_face[W.darts[0] ^ 1]
    B = list(P.face_darts(f))
    on_walk = {P.tail_index(d) for d in W.darts}
    r = next(i for i, d in enumerate(B) if P.tail_index(d) in on_walk)
    loop = B[r:] + B[:r]
    pos = next(i for i, d in enumerate(W.darts) if P.tail_index(d) == P.tail_index(loop[0]))
    W2 = H.apply_move(W, {"op": "flip", "face": f, "pos": pos, "take": 0, "put": loop})
    assert len(W2.darts) == 6 and W2.darts[pos:pos + 3] == tuple(loop)
    # ... and j = 0 removes it again
    assert H.apply_move(W2, {"op": "flip", "face": f, "pos": pos, "take": 3, "put": []}) == W
    # the loop must start at the vertex at that position
    other = (pos + 1) % 3
    with pytest.raises(IllegalMoveError, match="inserted loop starts"):
        H.apply_move(W, {"op": "flip", "face": f, "pos": other, "take": 0, "put": loop})
    with pytest.raises(IllegalMoveError, match="hole"):
        H.apply_move(W, {"op": "flip", "face": P.outer_face, "pos": 0, "take": 3, "put": []})


def test_unspike_to_point_and_wrap():
    P = wheel(3)
    H = HomotopyProblem.build(P)
    d = P.face_darts(P.outer_face)[0]
    pt = Curve((), P.tail_index(d))
    c = H.apply_move(pt, {"op": "spike", "pos": 0, "dart": d})
    assert c.darts == (d, d ^ 1)
    # unspike at pos 1 removes (d^1, d) cyclically: the point at tail(d^1) = head(d)
    assert H.apply_move(c, {"op": "unspike", "pos": 1}) == Curve((), P.head_index(d))
    assert H.apply_move(c, {"op": "unspike", "pos": 0}) == Curve((), P.tail_index(d))


# ------------------------------------------------------------------ the checker
def _solved(P, **kw):
    r = homotopy_height(P, method="bounds", **kw)
    assert r.witness is not None
    return r


def test_checker_accepts_and_recomputes():
    P = triangulated_grid(2)
    r = _solved(P)
    assert r.check(P) == r.upper
    assert replay_homotopy(P, r.witness) == r.upper
    # JSON round trip keeps it checkable (tuple labels become lists)
    r2 = sw.Result.from_dict(r.to_dict())
    assert r2.check(P) == r.upper


def _first(witness, op):
    return next(i for i, m in enumerate(witness["moves"]) if m["op"] == op)


def test_checker_refuses_tampered_witnesses():
    P = triangulated_grid(2)
    r = _solved(P)
    w = r.witness

    def refuse(mut, pattern):
        bad = copy.deepcopy(w)
        mut(bad)
        with pytest.raises(WitnessError, match=pattern):
            replay_homotopy(P, bad)

    i = next(k for k, m in enumerate(w["moves"]) if m["op"] == "flip" and len(m["put"]) >= 2)

    def wrong_put(b):
        b["moves"][i]["put"] = list(reversed(b["moves"][i]["put"]))

    def wrong_face(b):
        b["moves"][i]["face"] = (b["moves"][i]["face"] + 1) % P.number_of_faces() or 1

    def hole(b):
        b["moves"][i]["face"] = P.outer_face

    def discontinuity(b):
        b["moves"].insert(0, {"op": "spike", "pos": 0, "dart": next(
            d for d in range(2 * P.number_of_edges()) if P.tail(d) != P.tail(w["start"]["darts"][0]))})

    def wrong_end(b):
        b["moves"].pop()

    refuse(wrong_put, r"move %d \(flip\): illegal flip" % i)
    refuse(wrong_face, r"move %d \(flip\)" % i)
    refuse(hole, r"move %d \(flip\): face %d is a hole" % (i, P.outer_face))
    refuse(discontinuity, r"move 0 \(spike\): dart \d+ does not leave")
    refuse(wrong_end, "not at a point")
    # the claimed height must match
    with pytest.raises(WitnessError, match="claims upper"):
        r.with_(upper=r.upper + 1).check(P)
    # a witness that does not start at the problem's start
    bad = copy.deepcopy(w)
    bad["start"]["darts"] = list(reversed([d ^ 1 for d in bad["start"]["darts"]]))
    bad["start"]["vertex"] = P.tail(bad["start"]["darts"][0])
    with pytest.raises(WitnessError, match="start"):
        replay_homotopy(P, bad)


def test_checker_enforces_variants():
    P = triangulated_grid(2)
    w = _solved(P).witness
    # a spike inserted at the start breaks spikes=False and simple=True
    d = w["start"]["darts"][0]
    spiked = {"start": w["start"], "moves": [{"op": "spike", "pos": 0, "dart": d}, {"op": "unspike", "pos": 0}] + w["moves"]}
    assert replay_homotopy(P, spiked) >= replay_homotopy(P, w)
    with pytest.raises(WitnessError, match=r"move 0 \(spike\): spikes are not allowed"):
        replay_homotopy(P, spiked, spikes=False)
    with pytest.raises(WitnessError, match=r"move 0 \(spike\): simple homotopy"):
        replay_homotopy(P, spiked, simple=True)
    # flipping a face there and back breaks monotonicity
    i = _first(w, "flip")
    mv = w["moves"][i]
    W = HomotopyProblem.build(P).start
    H = HomotopyProblem.build(P)
    for m in w["moves"][:i]:
        W = H.apply_move(W, m)
    after = H.apply_move(W, mv)
    k = len(mv["put"])
    back = {"op": "flip", "face": mv["face"], "pos": mv["pos"] if mv["pos"] + mv["take"] <= len(W.darts) else 0,
            "take": k, "put": [W.darts[(mv["pos"] + x) % len(W.darts)] for x in range(mv["take"])]}
    H.apply_move(after, back)  # legal
    twice = {"start": w["start"], "moves": w["moves"][:i + 1] + [back] + w["moves"][i:]}
    replay_homotopy(P, twice)
    with pytest.raises(WitnessError, match=rf"move {i + 1} \(flip\): monotone homotopy flips face"):
        replay_homotopy(P, twice, monotone=True)


# ------------------------------------------------------------------ feasibility
def _annulus():
    P = grid(3, 3)
    inner = [f for f in P.faces if f != P.outer_face]
    return P, inner[0]


def test_annulus_boundary_is_not_contractible():
    P, h = _annulus()
    r = homotopy_height(P, holes={P.outer_face, h})
    assert r.status == "infeasible"
    assert "not contractible" in r.stats["reason"]
    assert r.value is None and r.upper is None


def test_annulus_boundary_to_the_hole_boundary():
    P, h = _annulus()
    # the outer walk has the outer face on its left; the hole's boundary walk with the
    # hole on its right runs the same way round (winding number common practice)
    hole_walk = [d ^ 1 for d in reversed(P.face_darts(h))]
    r = homotopy_height(P, holes={P.outer_face, h}, end={"darts": hole_walk})
    assert r.status in ("optimal", "bounded")
    assert r.check(P) == r.upper
    assert r.lower >= 8  # the start has length 8
    wrong = homotopy_height(P, holes={P.outer_face, h}, end={"darts": P.face_darts(h)})
    assert wrong.status == "infeasible" and "not freely homotopic" in wrong.stats["reason"]


def test_paths_on_two_sides_of_a_hole():
    P, h = _annulus()
    # corners (0,0) and (2,2) of the 3x3 grid: the two boundary paths go round the hole on
    # different sides, so they are not homotopic rel ends in the annulus (common practice)
    r = homotopy_height(P, s=(0, 0), t=(2, 2), holes={P.outer_face, h})
    assert r.status == "infeasible" and "relative to their ends" in r.stats["reason"]
    ok = homotopy_height(P, s=(0, 0), t=(2, 2), method="bounds")
    assert ok.status in ("optimal", "bounded") and ok.check(P) == ok.upper


def test_simple_needs_a_simple_start():
    P = random_tree(5, seed=1)  # the boundary walk of a tree repeats vertices
    r = homotopy_height(P, simple=True)
    assert r.status == "infeasible" and "not a simple" in r.stats["reason"]


@settings(max_examples=20, deadline=None)
@given(plane_graphs(min_vertices=3, max_vertices=6), st.integers(0, 10**6))
@example(P=grid(2, 3), seed=0)
def test_feasibility_agrees_with_brute_force(P, seed):
    """The free-group verdict agrees with the reference search (a homotopy found => feasible; a
    verdict of 'feasible' on a disk-like instance is confirmed by a found homotopy)."""
    rng = random.Random(seed)
    faces = [f for f in P.faces]
    holes = set(rng.sample(faces, min(len(faces), rng.randint(1, 2))))
    H = HomotopyProblem.build(P, holes=holes)
    ok, _ = homotopy_classes_equal(H)
    if sum(P.weight(e) for e in range(P.number_of_edges())) == 0:
        return
    h, _ = reference_height(H, H.length_of(H.start) + 2)
    if h is not None:
        assert ok
    hom = sw.homology_width(P, holes=sorted(holes))
    if hom.status == "infeasible":  # Z2 homology is necessary (spec, lower bound relation)
        assert not ok
    if ok and len(holes) == 1:
        # one hole: a disk, every closed curve is contractible and the sweep finds a homotopy
        r = homotopy_height(P, holes=holes, method="bounds")
        assert r.upper is not None and r.check(P) == r.upper


def test_path_result_survives_json_round_trip():
    # regression: tuple vertex labels come back from JSON as lists (s, t, walk vertices)
    P = triangulated_grid(2)
    r = homotopy_height(P, s=(0, 0), t=(2, 2), method="bounds")
    back = sw.Result.from_dict(__import__("json").loads(r.to_json()))
    assert back.check(P) == r.upper
    assert back.stats["options"]["closed"] is False


@settings(max_examples=25, deadline=None)
@given(plane_graphs(min_vertices=4, max_vertices=7, kinds=("delaunay", "chords")), st.integers(0, 10**6))
def test_curves_reached_by_moves_are_homotopic(P, seed):
    """With one or two extra holes, an end reached from the start by legal moves (reference
    enumeration) is in the start's class: never 'infeasible'; a witness found replays."""
    rng = random.Random(seed)
    inner = [f for f in P.faces if f != P.outer_face]
    if len(inner) < 2:
        return
    holes = {P.outer_face} | set(rng.sample(inner, rng.randint(1, min(2, len(inner) - 1))))
    H = HomotopyProblem.build(P, holes=holes)
    walk, vertex = tuple(H.start.darts), H.start.vertex
    for _ in range(rng.randrange(1, 8)):
        opts = [m for m in legal_moves(H, walk, vertex) if len(m[1]) <= len(H.start.darts) + 3]
        if not opts:
            break
        _, walk, vertex = rng.choice(opts)
    end = {"vertex": P.label(vertex), "darts": list(walk)}
    assert homotopy_classes_equal(HomotopyProblem.build(P, end=end, holes=holes))[0]
    r = homotopy_height(P, end=end, holes=holes, method="bounds")
    assert r.status != "infeasible"
    if r.upper is not None:
        assert r.check(P) == r.upper

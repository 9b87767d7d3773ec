"""Bounds and constructed homotopies of ``sw.homotopy_height`` against the brute-force reference.

Sources of the expected relations:
* From the definitions: homology width <= homotopy height <= simple homotopy
  height on every instance (reduce mod 2; simple sweeps are a special case);
  a homotopy's height is at least the length of its start and end curves;
  from the boundary of a disk some optimal homotopy is monotone ("Constructing
  monotone homotopies and sweepouts", J. Geom. Anal. 2021, used for the
  discrete setting in "On the complexity of optimal homotopies", SODA 2018).
* Definitions: every homotopy under a restriction (no spikes, monotone,
  simple) is also an unrestricted one, so restricted heights are >= the
  unrestricted height.
* Exact values come from ``tests/reference_homotopy.py`` (plain brute force
  over walks, written from the spec independently of the library).
"""

from __future__ import annotations

import random
import time

import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from reference_homotopy import legal_moves, reference_height
from strategies import plane_graphs, triangulated_disks

import sweepwidth as sw
from sweepwidth.generators import (
    cycle_with_chords,
    delaunay,
    fan,
    grid,
    triangulated_grid,
    wheel,
)
from sweepwidth.problems.homotopy import HomotopyProblem
from sweepwidth.solve.homotopy import homotopy_bounds, homotopy_height

TINY = plane_graphs(min_vertices=2, max_vertices=5)


def _ref(P, cap, **kw):
    return reference_height(HomotopyProblem.build(P, **kw), cap)[0]


@settings(max_examples=30, deadline=None)
@given(TINY)
@example(P=wheel(3))
@example(P=fan(3))
def test_bounds_bracket_the_reference(P):
    r = homotopy_height(P, method="bounds")
    assert r.upper is not None
    assert r.check(P) == r.upper  # independent replay
    ref = _ref(P, r.upper)
    assert ref is not None  # the constructed homotopy itself stays within r.upper
    hom = sw.homology_width(P)
    assert hom.lower <= ref + 1e-9  # homology width <= homotopy height (reduce the homotopy mod 2)
    assert r.lower <= ref + 1e-9 <= r.upper + 2e-9
    assert ref >= HomotopyProblem.build(P).length_of(HomotopyProblem.build(P).start)  # height >= start length (definition)
    if r.status == "optimal":
        assert r.value == ref


@settings(max_examples=6, deadline=None)
@given(triangulated_disks(max_faces=4), st.integers(0, 10**6))
def test_weighted_disks(P, seed):
    # positive weights: with zero-weight edges the brute force would have endless free spikes
    rng = random.Random(seed)
    P = P.with_weights([rng.randint(1, 3) for _ in range(P.number_of_edges())])
    r = homotopy_height(P, method="bounds")
    assert r.check(P) == r.upper
    ref = _ref(P, r.upper)
    assert r.lower <= ref <= r.upper
    # from a disk's boundary some optimal homotopy is monotone (Chambers et al., J. Geom. Anal. 2021)
    assert _ref(P, r.upper, monotone=True) == ref


@settings(max_examples=20, deadline=None)
@given(TINY)
def test_variants_are_ordered(P):
    H = HomotopyProblem.build(P)
    cap = H.length_of(H.start) + 4
    base = _ref(P, cap)
    if base is None:
        return
    for kw in ({"spikes": False}, {"monotone": True}, {"simple": True}):
        h = _ref(P, cap, **kw)
        # a restricted homotopy is an unrestricted one (definition), simple ones included
        assert h is None or h >= base, kw
        r = homotopy_height(P, method="bounds", **kw)
        if r.status == "infeasible":
            assert h is None
            continue
        if r.upper is not None:
            assert r.check(P) == r.upper
            assert r.lower <= (h if h is not None else r.upper) <= r.upper


@settings(max_examples=15, deadline=None)
@given(TINY, st.integers(0, 10**6))
def test_open_paths(P, seed):
    rng = random.Random(seed)
    outer = P.face_darts(P.outer_face)
    vs = sorted({P.tail_index(d) for d in outer})
    if len(vs) < 2:
        return
    s, t = (P.label(v) for v in rng.sample(vs, 2))
    r = homotopy_height(P, s=s, t=t, method="bounds")
    assert r.upper is not None and r.check(P) == r.upper
    ref = _ref(P, r.upper, s=s, t=t)
    assert ref is not None and r.lower <= ref <= r.upper
    rv = homotopy_height(P, s=s, t=t, method="bounds", weight="vertices")
    assert rv.check(P) == rv.upper
    assert rv.lower <= _ref(P, rv.upper, s=s, t=t, length="vertices") <= rv.upper


@settings(max_examples=30, deadline=None)
@given(plane_graphs(min_vertices=3, max_vertices=6), st.integers(0, 10**6), st.booleans())
def test_interior_starts(P, seed, to_boundary):
    """Starts reached by random legal moves (so contractible), to a point or to the outer boundary."""
    rng = random.Random(seed)
    H = HomotopyProblem.build(P)
    walk, vertex = tuple(H.start.darts), H.start.vertex
    for _ in range(rng.randrange(1, 6)):
        opts = [m for m in legal_moves(H, walk, vertex) if len(m[1]) <= len(H.start.darts) + 3]
        if not opts:
            break
        _, walk, vertex = rng.choice(opts)
    start = {"vertex": P.label(vertex), "darts": list(walk)}
    end = {"darts": list(H.start.darts)} if (to_boundary and H.start.darts) else None
    r = homotopy_height(P, start=start, end=end, method="bounds")
    assert r.upper is not None and r.check(P) == r.upper
    H2 = HomotopyProblem.build(P, start=start, end=end)
    floor = max(H2.length_of(H2.start), H2.length_of(H2.end) if H2.end is not None else 0.0)
    if r.upper > floor + 3 or P.number_of_edges() * r.upper > 40:
        return  # the brute force over walks would take too long (keeps this test fast)
    ref = reference_height(H2, r.upper)[0]
    assert ref is not None and r.lower <= ref <= r.upper


def test_point_start_grows_to_the_boundary():
    # regression: a point start had no face run to flip; the sweep now inserts a face loop
    P = cycle_with_chords(3, 0, seed=0)
    outer = P.face_darts(P.outer_face)
    far = P.label(next(i for i in range(3) if i != P.tail_index(outer[0])))
    r = homotopy_height(P, start={"vertex": far, "darts": []}, end={"darts": outer}, method="bounds")
    assert r.status == "optimal" and r.value == 3  # the end has length 3 (definition: height >= end length)
    assert r.check(P) == 3


def test_curve_to_curve_and_point_end():
    P = triangulated_grid(2)
    inner = next(f for f in P.faces if f != P.outer_face)
    tri = [d ^ 1 for d in reversed(P.face_darts(inner))]
    r = homotopy_height(P, end={"darts": tri}, method="bounds")
    assert r.status in ("optimal", "bounded") and r.check(P) == r.upper
    assert r.lower >= 8  # start length: the 2x2 grid's boundary
    # a point at a given vertex: the point is carried there
    r2 = homotopy_height(P, end={"vertex": (1, 1), "darts": []}, method="bounds")
    assert r2.check(P) == r2.upper
    assert r2.upper >= 8


def test_cycle_is_one_flip():
    # C_n: the inner face's boundary is the whole curve, removed by one flip; height = n
    # (definition: the start has length n and nothing shorter can start)
    P = cycle_with_chords(7, 0, seed=0)
    r = homotopy_height(P)
    assert r.status == "optimal" and r.value == 7
    assert len(r.witness["moves"]) == 1
    assert r.check(P) == 7


@pytest.mark.parametrize("P", [wheel(5), fan(5), grid(3, 4), triangulated_grid(2)], ids=lambda P: P.meta["name"])
def test_auto_uses_search_and_agrees(P):
    r = homotopy_height(P, time_limit=20)
    b = homotopy_height(P, method="bounds")
    assert r.status == "optimal"
    assert b.lower <= r.value <= b.upper
    assert r.check(P) == r.value
    assert "auto" in r.stats


def test_search_method():
    P = wheel(4)
    r = homotopy_height(P, method="search", time_limit=20)
    assert r.status == "optimal" and r.check(P) == r.value
    assert r.value == _ref(P, 10)


def test_time_limit_is_honoured():
    P = triangulated_grid(22)  # 968 triangles
    t0 = time.monotonic()
    r = homotopy_height(P, time_limit=1.5)
    took = time.monotonic() - t0
    assert took < 1.5 + 1.0
    assert r.status in ("optimal", "bounded")
    if r.witness is not None:
        assert r.check(P) == r.upper
    assert r.lower >= 88  # the boundary of the 22 x 22 grid


def test_infeasible_result_has_reason():
    P = grid(3, 3)
    hole = next(f for f in P.faces if f != P.outer_face)
    r = homotopy_height(P, holes={P.outer_face, hole}, method="bounds")
    assert r.status == "infeasible" and r.stats["reason"]
    assert str(r).startswith("homotopy: infeasible")


def test_bounds_record_their_sources():
    P = delaunay(30, seed=4)
    b = homotopy_bounds(HomotopyProblem.build(P), seed=3)
    assert b["lower"] <= b["upper"]
    assert b["bounds"]["upper"].startswith("constructed homotopy")
    assert any(isinstance(v, float) for v in b["orders"].values())


@pytest.mark.slow
def test_ten_thousand_faces_within_a_minute():
    P = triangulated_grid(70)  # 9800 triangles
    t0 = time.monotonic()
    r = homotopy_height(P, method="bounds", time_limit=60)
    assert time.monotonic() - t0 < 61
    assert r.upper is not None and r.lower <= r.upper
    assert r.check(P) == r.upper


def test_interior_start_beats_face_orders():
    # regression: from an interior curve a homotopy that flips two faces twice (height 4,
    # brute force) beats every face order (monotone homology width 5), so the monotone
    # homology width is no lower bound there; the non-monotone one is used
    P = cycle_with_chords(6, 3, seed=5).dual()
    start = {"vertex": 0, "darts": [0, 17, 13, 7]}
    end = {"darts": [0, 5, 7]}
    H = HomotopyProblem.build(P, start=start, end=end)
    ref, _ = reference_height(H, 6)
    assert ref == 4
    assert sw.homology_width(P, start={0, 8, 6, 3}, end={0, 2, 3}).value == 5  # face orders only
    r = homotopy_height(P, start=start, end=end, method="bounds")
    assert r.lower <= 4 <= r.upper and r.check(P) == r.upper
    assert r.stats["homology"]["monotone"] is False


def test_degenerate_graphs():
    import networkx as nx

    from sweepwidth.plane import PlaneGraph

    G = nx.Graph()
    G.add_node("a")
    one = PlaneGraph.from_graph(G)
    # a point is already the end: height 0 with no move, also for simple homotopies (regression)
    for kw in ({}, {"simple": True}):
        r = homotopy_height(one, **kw)
        assert r.status == "optimal" and r.value == 0 and r.check(one) == 0
    assert homotopy_height(one, weight="vertices").value == 1  # a point visits one vertex (spec)
    edge = PlaneGraph.from_graph(nx.path_graph(2))
    r = homotopy_height(edge)
    assert r.value == 2 and r.check(edge) == 2  # the boundary walk u-v-u, then one unspike
    # without spikes the walk u-v-u cannot shrink: no face has it on its boundary as a flip needs
    # (the tree's only face is the outer one, a hole); brute force agrees
    r = homotopy_height(edge, spikes=False)
    assert r.status != "optimal"
    assert _ref(edge, 10, spikes=False) is None


def test_open_path_loop_at_its_end_vertex():
    # regression: the end path carries a loop at t; the sweep must insert the loop's face
    # at position L (the end vertex) of the open walk, which it did not try before
    from strategies import _thinned_delaunay

    P = _thinned_delaunay(5, 4, 0.0, 27).dual()
    r = homotopy_height(P, s=3, t=1, method="bounds")
    assert r.upper is not None and r.check(P) == r.upper
    assert r.lower <= _ref(P, r.upper, s=3, t=1) <= r.upper


def test_open_path_far_from_the_face_to_sweep():
    # regression: the start path 4-1 touches no face to sweep (the triangle hangs off a pendant
    # edge); the sweep now spikes out to the triangle and inserts its loop (brute force: 6)
    from strategies import _thinned_delaunay

    P = _thinned_delaunay(5, 2, 0.0, 0)
    r = homotopy_height(P, s=4, t=1, method="bounds")
    assert r.upper == 6 and r.check(P) == 6
    assert _ref(P, 8, s=4, t=1) == 6

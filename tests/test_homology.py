"""Homology sweep width: brute force, the cutwidth identity, non-monotone sweeps, start/end variants.

References used by the checks:
* width from a disk's boundary = cutwidth of the dual with the outer face first
  (a literal identity from the definition, see the docstring of sweepwidth.solve.homology);
* non-monotone sweeps never beat monotone ones when the weight is a cut
  function: Brightwell and Winkler, "Submodular percolation", SIAM J.
  Discrete Math. 23(3), 2009;
* the brute force below enumerates every face set and every face order
  directly from the definition, using only ``PlaneGraph.face_boundary_cycle``.
"""

from __future__ import annotations

import itertools
import time
import math

import networkx as nx
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.problems.cycles import FaceSweep
from sweepwidth.solve.homology.face_sets import greedy_sweep, improve_sweep, monotone_sweep, toggle_search

from strategies import plane_graphs, triangulated_disks

SETTINGS = dict(
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large, HealthCheck.filter_too_much],
)


# ------------------------------------------------------------------ reference implementations
def _bnd(P, faces):
    c = set()
    for f in faces:
        c ^= set(P.face_boundary_cycle(f))
    return frozenset(c)


def _w(P, edges):
    return float(sum(P.weight(e) for e in edges))


def brute_force(P, c0, c1, holes):
    """Least width over every admissible swept set and every order of it (definition)."""
    free = [f for f in P.faces if f not in holes]
    target = frozenset(c0) ^ frozenset(c1)
    best = math.inf
    found = False
    for r in range(len(free) + 1):
        for S in itertools.combinations(free, r):
            if _bnd(P, S) != target:
                continue
            found = True
            for order in itertools.permutations(S):
                cur = set(c0)
                width = _w(P, cur)
                for f in order:
                    cur ^= set(P.face_boundary_cycle(f))
                    width = max(width, _w(P, cur))
                    if width >= best:
                        break
                best = min(best, width)
    return best if found else None


def brute_force_toggles(P, c0, c1, holes):
    """Least width of any toggle sequence: thresholds in increasing order, plain BFS over face sets."""
    free = [f for f in P.faces if f not in holes]
    target = frozenset(c0) ^ frozenset(c1)
    states = {}
    for r in range(len(free) + 1):
        for T in itertools.combinations(free, r):
            states[frozenset(T)] = _w(P, frozenset(c0) ^ _bnd(P, T))
    goals = {T for T in states if _bnd(P, T) == target}
    for t in sorted(set(states.values())):
        if states[frozenset()] > t:
            continue
        seen = {frozenset()}
        frontier = [frozenset()]
        while frontier:
            nxt = []
            for T in frontier:
                if T in goals:
                    return t
                for f in free:
                    U = T ^ {f}
                    if U not in seen and states[U] <= t:
                        seen.add(U)
                        nxt.append(U)
            frontier = nxt
    return None


def _some_side(P, c):
    """One of the two face sets bounded by the cycle c (plain search over the dual)."""
    side = {0: 0}
    stack = [0]
    while stack:
        f = stack.pop()
        for e in range(P.number_of_edges()):
            a, b = P.edge_faces(e)
            for x, y in ((a, b), (b, a)):
                if x == f and y not in side:
                    side[y] = side[f] ^ (e in c)
                    stack.append(y)
    return {f for f, s in side.items() if s}


def inner_faces(P):
    return [f for f in P.faces if f != P.outer_face]


# ------------------------------------------------------------------ the cutwidth identity
@settings(max_examples=25, **SETTINGS)
@given(plane_graphs(1, 8, weighted=True))
def test_boundary_sweep_equals_pinned_cutwidth_of_dual(P):
    # identity from the definition (docstring of sweepwidth.solve.homology): width from the outer boundary to nothing
    # = cutwidth of the dual with the outer face's dual vertex first
    if len(inner_faces(P)) > 12:
        return
    cw = sw.cutwidth(P.dual(), first=P.outer_face)
    for method in ("subset-dp", "dual-cutwidth"):
        r = sw.homology_width(P, method=method)
        assert r.status == "optimal"
        assert r.value == pytest.approx(cw.value)
        assert r.check(P) == pytest.approx(r.value)


@settings(max_examples=15, **SETTINGS)
@given(triangulated_disks(12, weighted=True))
def test_triangulated_disk_against_brute_force(P):
    c0 = P.face_boundary_cycle(P.outer_face)
    if len(inner_faces(P)) > 7:
        ref = sw.cutwidth(P.dual(), first=P.outer_face).value  # identity; brute force too slow here
    else:
        ref = brute_force(P, c0, set(), {P.outer_face})
    r = sw.homology_width(P)
    assert r.value == pytest.approx(ref)
    assert r.check(P) == pytest.approx(ref)


# ------------------------------------------------------------------ start / end variants
@st.composite
def sweep_instances(draw, max_vertices=8, max_faces=7):
    weighted = draw(st.booleans())
    P = draw(
        st.one_of(
            triangulated_disks(max_faces - 1, weighted=weighted),
            plane_graphs(4, max_vertices, weighted=weighted, kinds=("delaunay", "chords", "dual")),
        ).filter(lambda G: 3 <= G.number_of_faces() <= max_faces)
    )
    F = P.number_of_faces()
    faces = list(range(F))
    holes = draw(st.one_of(st.just({P.outer_face}), st.sets(st.sampled_from(faces), max_size=2)))
    X = {f for f in faces if draw(st.booleans())}
    if draw(st.integers(0, 4)):  # mostly homologous: Y = X + (a set of non-hole faces)
        Y = X ^ {f for f in faces if f not in holes and draw(st.booleans())}
    else:
        Y = {f for f in faces if draw(st.booleans())}
    return P, _bnd(P, X), _bnd(P, Y), frozenset(holes)


@settings(max_examples=60, **SETTINGS)
@given(sweep_instances())
def test_curve_to_curve_against_brute_force(inst):
    P, c0, c1, holes = inst
    ref = brute_force(P, c0, c1, holes)
    for method in ("auto", "subset-dp", "dual-cutwidth"):
        r = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes, method=method)
        if ref is None:
            assert r.status == "infeasible"
            assert r.stats["reason"]
            assert r.check(P) == math.inf
            continue
        assert r.check(P) == pytest.approx(r.upper)
        assert r.lower <= ref + 1e-9 <= r.upper + 2e-9
        if method != "dual-cutwidth" or r.stats["nested"]:
            # exact methods; 'cutwidth' is exact on nested sweeps only
            assert r.status == "optimal"
            assert r.value == pytest.approx(ref)


@settings(max_examples=40, **SETTINGS)
@given(sweep_instances(max_faces=6))
def test_non_monotone_against_bfs_reference(inst):
    P, c0, c1, holes = inst
    ref = brute_force_toggles(P, c0, c1, holes)
    r = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes, monotone=False)
    if ref is None:
        assert r.status == "infeasible"
        return
    assert r.status == "optimal"
    assert r.value == pytest.approx(ref)
    assert r.check(P) == pytest.approx(ref)
    mono = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes)
    # a monotone sweep is one particular toggle sequence
    assert r.value <= mono.value + 1e-9


@settings(max_examples=30, **SETTINGS)
@given(st.one_of(triangulated_disks(14, weighted=True), plane_graphs(3, 9, weighted=True)))
def test_brightwell_winkler_from_the_boundary(P):
    # Brightwell and Winkler, "Submodular percolation", SIAM J. Discrete Math. 2009:
    # the weight is a cut function here, so toggling twice never helps
    if len(inner_faces(P)) > 14:
        return
    mono = sw.homology_width(P)
    free = sw.homology_width(P, monotone=False)
    assert free.value == pytest.approx(mono.value)
    free.check(P)


@settings(max_examples=30, **SETTINGS)
@given(sweep_instances())
def test_brightwell_winkler_when_the_sweep_runs_bottom_to_top(inst):
    # Brightwell and Winkler (SIAM J. Discrete Math. 2009) cover paths from the bottom to the top
    # of the lattice of face sets: here when the sweep covers every non-hole face and the start
    # cycle bounds a set holding all or none of them (e.g. an annulus, outer to inner boundary)
    P, c0, _, holes = inst
    if not holes:
        return
    U = set(P.faces) - set(holes)
    A = {f for f in holes if f in _some_side(P, c0)}  # some subset of the holes
    c0, c1 = _bnd(P, A), _bnd(P, A | U)
    mono = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes)
    assert set(mono.stats["swept"]) == U
    free = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes, monotone=False)
    assert free.value == pytest.approx(mono.value)


def test_interior_start_where_toggling_twice_helps():
    # found by a random search, confirmed by both brute forces below: growing the face set
    # {1, 4, 5} to {0, 1, 2, 4, 5} is cheaper if face 5 is removed first and put back last,
    # so outside the bottom-to-top setting of Brightwell and Winkler monotone sweeps lose
    P = generators.delaunay(6, seed=903)
    c0, c1 = _bnd(P, [1, 4, 5]), _bnd(P, [0, 1, 2, 4, 5])
    holes = {P.outer_face}
    mono = sw.homology_width(P, start=set(c0), end=set(c1))
    free = sw.homology_width(P, start=set(c0), end=set(c1), monotone=False)
    assert mono.stats["nested"]
    assert mono.value == brute_force(P, c0, c1, holes) == 6.0
    assert free.value == brute_force_toggles(P, c0, c1, holes) == 5.0
    assert free.check(P) == 5.0
    assert len(free.witness) > len(set(free.witness))  # some face is toggled twice


def _crossing_instance():
    """Two overlapping 2 x 2 blocks of a grid, swept from one boundary to the other."""
    P = generators.grid(4, 5)
    sq = {}
    for f in inner_faces(P):
        vs = P.boundary_walk(f)
        sq[min(vs)] = f
    A = [sq[(0, 0)], sq[(0, 1)], sq[(1, 0)], sq[(1, 1)]]
    B = [sq[(1, 1)], sq[(1, 2)], sq[(2, 1)], sq[(2, 2)]]
    return P, _bnd(P, A), _bnd(P, B)


def test_crossing_sweep_exact_and_relaxed():
    P, c0, c1 = _crossing_instance()
    ref = brute_force(P, c0, c1, {P.outer_face})
    r = sw.homology_width(P, start=set(c0), end=set(c1))
    assert r.value == pytest.approx(ref)
    assert r.method == "auto:subset-dp"
    rc = sw.homology_width(P, start=set(c0), end=set(c1), method="dual-cutwidth")
    assert rc.lower <= ref + 1e-9 <= rc.upper + 1e-9
    assert rc.check(P) == pytest.approx(rc.upper)


def test_crossing_detected_from_shared_edges():
    # start and end share edges with swept faces on both sides -> crossing (anti pairs)
    P = generators.grid(2, 4)  # three squares in a row: faces a | b | c
    a, b, _c = sorted(inner_faces(P), key=lambda f: min(P.boundary_walk(f)))
    c0 = _bnd(P, [a])
    c1 = _bnd(P, [b])
    fs = FaceSweep.build(P, c0, [a, b])
    assert not fs.nested
    # toggling a first shrinks to nothing, then b appears: width = max(4, 0, 4)
    assert sw.homology_width(P, start=set(c0), end=set(c1)).value == 4.0


def test_face_sweep_weights_match_direct_recomputation():
    P, c0, _ = _crossing_instance()
    free = inner_faces(P)
    fs = FaceSweep.build(P, c0, free)
    for T in ([], free[:1], free[:3], free[2:7], free):
        assert fs.weight_of(T) == _w(P, set(c0) ^ _bnd(P, T))
    prof = fs.profile(free[:5] + free[:2])
    cur = set(c0)
    direct = [_w(P, cur)]
    for f in free[:5] + free[:2]:
        cur ^= set(P.face_boundary_cycle(f))
        direct.append(_w(P, cur))
    assert prof == direct


# ------------------------------------------------------------------ holes, infeasible, trivial
def _annulus():
    P = generators.grid(4, 4)
    mid = P.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    return P, mid


def test_annulus_to_inner_boundary():
    P, mid = _annulus()
    H = {P.outer_face, mid}
    r = sw.homology_width(P, end={"faces": [mid]}, holes=H)
    ref = brute_force(P, P.face_boundary_cycle(P.outer_face), P.face_boundary_cycle(mid), H)
    assert r.value == ref == 12.0  # brute force; the outer boundary (length 12) is the widest cycle
    assert mid not in r.witness
    assert r.check(P) == 12.0


def test_not_homologous_with_a_hole_is_infeasible():
    P, mid = _annulus()
    r = sw.homology_width(P, holes={P.outer_face, mid})
    assert r.status == "infeasible"
    assert r.value is None and r.upper is None and r.witness is None
    assert "not homologous" in r.stats["reason"]
    assert r.check(P) == math.inf


def test_no_holes_uses_the_better_side():
    # without holes a cycle bounds two face sets; sweeping the outer face is allowed
    P = generators.wheel(6)
    hub_faces = inner_faces(P)
    c0 = _bnd(P, hub_faces[:1])
    r = sw.homology_width(P, start=set(c0), end=set(), holes=())
    assert r.value == 3.0  # a triangle toggled away at once: width = its boundary
    assert r.witness == [hub_faces[0]]


def test_start_equals_end_is_trivial():
    P = generators.grid(3, 3)
    r2 = sw.homology_width(P, start={"faces": [0]}, end={"faces": [0]})
    assert r2.value == _w(P, P.face_boundary_cycle(0))
    assert r2.witness == []
    assert r2.check(P) == r2.value


def test_weights_change_the_best_order():
    # a wheel whose spokes weigh 5: the boundary (weight 6) is not the bottleneck
    P = generators.wheel(6)
    hub = [v for v in P.vertices if P.degree(v) == 6][0]
    w = [5.0 if hub in P.edge_ends(e) else 1.0 for e in range(P.number_of_edges())]
    Q = P.with_weights(w)
    ref = brute_force(Q, Q.face_boundary_cycle(Q.outer_face), set(), {Q.outer_face})
    cw = sw.cutwidth(Q.dual(), first=Q.outer_face).value  # the identity again
    r = sw.homology_width(Q)
    assert r.value == ref == cw
    assert r.value > 6.0


def test_vertex_walk_and_dart_walk_starts():
    P = generators.grid(3, 3)
    outer = P.face_darts(P.outer_face)
    a = sw.homology_width(P, start={"vertex": P.tail(outer[0]), "darts": outer})
    b = sw.homology_width(P, start=P.boundary_walk(P.outer_face))
    c = sw.homology_width(P)
    assert a.value == b.value == c.value == 8.0


# ------------------------------------------------------------------ helpers of the search module
def test_greedy_is_an_upper_bound_and_profile_matches():
    P = generators.triangulated_grid(3)
    fs = FaceSweep.build(P, P.face_boundary_cycle(P.outer_face), inner_faces(P))
    gw, order = greedy_sweep(fs, seed=3)
    w, _ = monotone_sweep(fs)
    assert sorted(order) == sorted(inner_faces(P))
    assert max(fs.profile(order)) == gw >= w


def test_regression_toggle_path_with_eight_or_more_faces():
    # regression: the parent table was int8 and `1 << parent` overflowed for face index 7
    # in the pure-Python path (k <= 10), so the path reconstruction never ended
    P = generators.grid(3, 4)
    Q = generators.grid(4, 4)
    for G in (P, Q):
        fs = FaceSweep.build(G, G.face_boundary_cycle(G.outer_face), inner_faces(G))
        w, toggles, _ = toggle_search(fs, [inner_faces(G)])
        assert sorted(toggles) == sorted(inner_faces(G))
        assert w == sw.homology_width(G).value


def test_time_limit_returns_bounded_with_a_witness():
    import time

    P = generators.delaunay(60, seed=5)
    # warm-up: the first call in a process also imports the engine and loads or compiles
    # its numba kernels (seconds when another change invalidated the cache)
    sw.homology_width(P, time_limit=1.0, seed=1)
    t = time.monotonic()
    r = sw.homology_width(P, time_limit=1.0, seed=1)
    took = time.monotonic() - t
    assert took < 1.0 + 1.5  # "returns within about a second" of the limit
    assert r.status in ("optimal", "bounded")
    assert r.lower <= r.upper
    assert r.check(P) == pytest.approx(r.upper)
    assert "bounds" in r.stats and "holes" in r.stats


def test_regression_sw_cutwidth_stays_a_function_after_homology():
    # regression: homology_width imports sweepwidth.solve.cutwidth, after which the lazy
    # facade resolved sw.cutwidth to that submodule instead of the function
    import importlib
    import types

    sw.homology_width(generators.delaunay(9, seed=1), method="dual-cutwidth")
    importlib.import_module("sweepwidth.solve.ordering")
    vars(sw).pop("cutwidth", None)  # forget the cached attribute: resolve afresh
    assert not isinstance(sw.cutwidth, types.ModuleType)
    # the solve facade too: its function name is no longer also a submodule name
    import sweepwidth.solve as solve

    vars(solve).pop("cutwidth", None)
    assert not isinstance(solve.cutwidth, types.ModuleType)
    assert sw.cutwidth(nx.path_graph(3)).value == 1  # P_n has cutwidth 1 (common practice)


def test_paths_between_the_same_ends():
    # sweeping the 2 x 2 grid from its top-right boundary path to its left-bottom one
    P = generators.grid(3, 3)
    top_right = [(0, 0), (0, 1), (0, 2), (1, 2), (2, 2)]
    left_bottom = [(0, 0), (1, 0), (2, 0), (2, 1), (2, 2)]
    r = sw.homology_width(P, start=top_right, end=left_bottom, paths=True)
    c0 = {P.dart_between(u, v) >> 1 for u, v in zip(top_right, top_right[1:])}
    c1 = {P.dart_between(u, v) >> 1 for u, v in zip(left_bottom, left_bottom[1:])}
    assert r.value == brute_force(P, c0, c1, {P.outer_face})  # definition, by enumeration
    assert r.value >= 4.0  # at least the length of the start path
    assert r.stats["paths"] is True
    assert r.check(P) == r.value
    darts = [P.dart_between(u, v) for u, v in zip(top_right, top_right[1:])]
    r2 = sw.homology_width(P, start={"vertex": (0, 0), "darts": darts}, end=left_bottom, paths=True)
    assert r2.value == r.value
    with pytest.raises(sw.InvalidCurveError, match="same ends"):
        sw.homology_width(P, start=top_right, end=left_bottom[:-1], paths=True)
    with pytest.raises(sw.InvalidCurveError, match="does not close|not adjacent"):
        sw.homology_width(P, start=top_right, end=left_bottom)


# ------------------------------------------------------------------ slow checks (make test-slow)
@pytest.mark.slow
@pytest.mark.parametrize("name", ["trigrid-10", "delaunay-108"])
def test_speed_goal_disks_are_solved_exactly(name):
    # the ~200-face goal of benchmarks/_homology_rows.py, cross-checked with the identity
    P = generators.triangulated_grid(10) if name == "trigrid-10" else generators.delaunay(108, seed=1)
    r = sw.homology_width(P, time_limit=60, seed=0)
    assert r.check(P) == r.upper
    cw = sw.cutwidth(P.dual(), first=P.outer_face, time_limit=60, seed=0)
    assert r.lower <= cw.upper + 1e-9 and cw.lower <= r.upper + 1e-9
    if r.status == "optimal" and cw.status == "optimal":
        assert r.value == cw.value


@pytest.mark.slow
@settings(max_examples=200, **SETTINGS)
@given(sweep_instances(max_vertices=9, max_faces=8))
def test_curve_to_curve_against_brute_force_many(inst):
    P, c0, c1, holes = inst
    ref = brute_force(P, c0, c1, holes)
    r = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes)
    if ref is None:
        assert r.status == "infeasible"
    else:
        assert r.value == pytest.approx(ref)
        assert r.check(P) == pytest.approx(ref)
        free = sw.homology_width(P, start=set(c0), end=set(c1), holes=holes, monotone=False)
        assert free.value <= r.value + 1e-9
        assert free.value == pytest.approx(brute_force_toggles(P, c0, c1, holes))


@settings(max_examples=60, **SETTINGS)
@given(plane_graphs(1, 9, weighted=True), st.randoms(use_true_random=False))
def test_face_sweep_model_matches_direct_toggling(P, rnd):
    # model-based: FaceSweep's weight formula against toggling face boundaries edge by edge,
    # on multigraphs with loops, bridges and parallel edges (duals), for cycles and chains
    faces = list(P.faces)
    free = [f for f in faces if rnd.random() < 0.7]
    m = P.number_of_edges()
    if rnd.random() < 0.5:
        c0 = _bnd(P, [f for f in faces if rnd.random() < 0.5])
    else:
        c0 = frozenset(e for e in range(m) if rnd.random() < 0.3)  # any chain
    fs = FaceSweep.build(P, c0, free)
    seq = [rnd.choice(free) for _ in range(rnd.randint(0, 8))] if free else []
    cur = set(c0)
    direct = [_w(P, cur)]
    for f in seq:
        cur ^= set(P.face_boundary_cycle(f))
        direct.append(_w(P, cur))
    assert fs.profile(seq) == pytest.approx(direct)
    odd = set()
    for f in seq:
        odd ^= {f}
    assert fs.weight_of(odd) == pytest.approx(direct[-1])


@settings(max_examples=25, **SETTINGS)
@given(sweep_instances(max_faces=8), st.randoms(use_true_random=False))
def test_local_search_keeps_a_valid_order_and_never_worsens(inst, rnd):
    P, c0, _, holes = inst
    free = [f for f in P.faces if f not in holes]
    if len(free) < 2:
        return
    fs = FaceSweep.build(P, c0, free)
    order = list(free)
    rnd.shuffle(order)
    before = max(fs.profile(order))
    w, out = improve_sweep(fs, order, window=3)
    assert sorted(out) == sorted(free)
    assert w == pytest.approx(max(fs.profile(out)))
    assert w <= before + 1e-9
    assert w >= monotone_sweep(fs)[0] - 1e-9  # exact optimum of the same set (subset DP)


def _two_blocks(cols=4):
    """Two 3 x cols blocks of squares side by side: start one boundary, end the other (crossing)."""
    P = generators.grid(4, 2 * cols + 1)
    sq = {min(P.boundary_walk(f)): f for f in inner_faces(P)}
    A = [sq[(i, j)] for i in range(3) for j in range(cols)]
    B = [sq[(i, j)] for i in range(3) for j in range(cols, 2 * cols)]
    return P, _bnd(P, A), _bnd(P, B)


def test_large_crossing_sweep_gets_valid_bounds():
    P, c0, c1 = _two_blocks(4)  # 24 swept faces: beyond the subset DP, so the relaxation is used
    r = sw.homology_width(P, start=c0, end=c1, time_limit=20, seed=0)
    assert not r.stats["nested"]
    assert len(r.stats["swept"]) == 24
    assert r.method == "auto:dual-cutwidth"
    assert max(_w(P, c0), _w(P, c1)) <= r.lower <= r.upper
    assert r.check(P) == r.upper


@pytest.mark.slow
def test_large_crossing_sweep_against_the_exact_dp():
    P, c0, c1 = _two_blocks(4)
    exact = sw.homology_width(P, start=c0, end=c1, method="subset-dp", max_faces=24)
    r = sw.homology_width(P, start=c0, end=c1, method="dual-cutwidth")
    assert r.lower <= exact.value <= r.upper


def _homology_in_child(P, *, progress):
    return sw.homology_width(P, time_limit=5, seed=0)


def test_runs_inside_a_time_limited_child():
    # the homotopy solver calls homology_width inside a daemonic child process, which may
    # not start children of its own: the engine's SAT stage must not try to
    from sweepwidth.solve._deadline import run_limited

    P = generators.delaunay(30, seed=2)
    done, r, _ = run_limited(_homology_in_child, (P,), deadline=time.monotonic() + 60)
    assert done
    assert r.check(P) == r.upper
    assert "cutwidth_child" not in r.stats["parts"][0]


def test_old_method_name_cutwidth_still_works_with_a_deprecation_warning():
    # regression: the homology method 'cutwidth' read like a cutwidth value; it is now 'dual-cutwidth'
    T = generators.triangulated_grid(2)
    with pytest.warns(DeprecationWarning, match="dual-cutwidth"):
        old = sw.homology_width(T, method="cutwidth")
    new = sw.homology_width(T, method="dual-cutwidth")
    assert old.method == new.method == "dual-cutwidth" and old.value == new.value
    assert sw.homology_width(T).method.startswith("auto:")  # what auto chose, as for cutwidth

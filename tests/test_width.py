"""Tests of the homotopy width (sweepwidth.solve.width, sweepwidth.problems.width, sweepwidth.verify.width).

Independent references:

* ``tests/reference_width.py``: a brute-force bottleneck search over exact
  leash states with moves enumerated from the definition (flips by trying
  every face, orientation, rotation and split; steps written from the rule);
* ``sweepwidth.verify.width``: the replay checker, sharing no move code with
  the solvers;
* networkx's Dijkstra distances for the geodesic Fréchet bound (the
  recurrence of Eiter and Mannila, TU Vienna report CD-TR 94/64, 1994).
"""

from __future__ import annotations

import os
import sys
import time

import networkx as nx
import pytest
from hypothesis import HealthCheck, given, reject, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import InvalidCurveError, ProblemTooLargeError, UnsupportedOptionError, WitnessError
from sweepwidth.problems.width import WidthProblem
from sweepwidth.solve.width.bounds import frechet_bound
from sweepwidth.solve.width.exact import search_width
from sweepwidth.verify.width import replay_width

sys.path.insert(0, os.path.dirname(__file__))
from reference_width import reference_width  # noqa: E402
from strategies import triangulated_disks  # noqa: E402

SLOW = settings(max_examples=25, deadline=None, suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])


def _cycle(P):
    return [P.tail(d) for d in P.face_darts(P.outer_face)]


def _positive(draw, P, weighted):
    """Weights 1..3: zero-weight edges make the sets of leashes of bounded length infinite."""
    if not weighted:
        return P
    m = P.number_of_edges()
    return P.with_weights(draw(st.lists(st.integers(1, 3), min_size=m, max_size=m)))


@st.composite
def boundary_instances(draw, max_faces=8, weighted=True):
    """A small disk with A and B disjoint arcs of its boundary (default leashes)."""
    P = _positive(draw, draw(triangulated_disks(max_faces)), weighted)
    cyc = _cycle(P)
    n = len(cyc)
    k = draw(st.integers(0, n - 1))
    if draw(st.booleans()):
        cyc = cyc[::-1]
    p = draw(st.integers(0, max(0, n - 3)))
    q = draw(st.integers(0, max(0, n - 3 - p)))
    g1 = draw(st.integers(1, n - 1 - p - q))
    rot = cyc[k:] + cyc[:k]
    a = rot[: p + 1]
    b = rot[p + g1: p + g1 + q + 1][::-1]
    return P, {"vertices": a}, {"vertices": b}


@st.composite
def interior_instances(draw, max_faces=5):
    """Short random walks A and B anywhere, with shortest-path leashes."""
    P = _positive(draw, draw(triangulated_disks(max_faces)), True)
    G = P.to_simple_graph()
    vs = sorted(G.nodes)

    def walk(length):
        v = draw(st.sampled_from(vs))
        out = [v]
        for _ in range(length):
            v = draw(st.sampled_from(sorted(G[v])))
            out.append(v)
        return out

    a = walk(draw(st.integers(0, 2)))
    b = walk(draw(st.integers(0, 2)))

    def leash(u, v):
        if u == v:
            return {"vertex": u, "darts": []}
        return {"vertices": nx.shortest_path(G, u, v)}

    return P, {"vertices": a}, {"vertices": b}, leash(a[0], b[0]), leash(a[-1], b[-1])


def _check_all(P, a, b, **kw):
    W = WidthProblem.build(P, a, b, **{k: v for k, v in kw.items() if k in ("start", "end", "backward", "spikes", "simple", "weight")})
    exact = sw.homotopy_width(P, a, b, method="search", **kw)
    assert exact.status == "optimal", exact.stats
    assert exact.check(P) == exact.value
    # the brute-force reference: nothing narrower than the value, and the value is attained
    try:
        ref = reference_width(W, exact.value, max_states=60_000)
    except RuntimeError:
        reject()  # an example too large for the pure-Python reference (it ran for minutes locally): drawn again
    assert ref == exact.value
    bnd = sw.homotopy_width(P, a, b, method="bounds", **kw)
    assert bnd.lower <= exact.value + 1e-9
    if bnd.upper is not None:
        assert bnd.upper >= exact.value - 1e-9
        assert bnd.check(P) == bnd.upper
    return exact


@SLOW
@given(boundary_instances(), st.booleans(), st.booleans(), st.sampled_from(["weight", None, "vertices"]))
def test_exact_matches_reference_on_boundary_arcs(inst, backward, spikes, weight):
    P, a, b = inst
    _check_all(P, a, b, backward=backward, spikes=spikes, weight=weight)


@SLOW
@given(interior_instances(), st.booleans())
def test_exact_matches_reference_on_interior_walks(inst, backward):
    P, a, b, s, e = inst
    _check_all(P, a, b, start=s, end=e, backward=backward)


@settings(max_examples=15, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(boundary_instances(max_faces=5, weighted=False))
def test_simple_leashes_match_reference(inst):
    P, a, b = inst
    _check_all(P, a, b, simple=True, weight=None)


@SLOW
@given(boundary_instances(max_faces=8))
def test_frechet_bound_against_networkx(inst):
    # the geodesic Fréchet recurrence recomputed with networkx's Dijkstra
    P, a, b = inst
    W = WidthProblem.build(P, a, b)
    G = nx.Graph()
    for e in range(P.number_of_edges()):
        u, v = P.edge_ends(e)
        if not G.has_edge(u, v) or G[u][v]["weight"] > P.weight(e):
            G.add_edge(u, v, weight=P.weight(e))
    A, B = a["vertices"], b["vertices"]
    d = [[nx.dijkstra_path_length(G, x, y) for y in B] for x in A]
    F = {}
    for i in range(len(A)):
        for j in range(len(B)):
            prev = [F[c] for c in ((i - 1, j), (i, j - 1)) if c in F]
            F[i, j] = max(d[i][j], min(prev)) if prev else d[i][j]
    ends = max(W.length_of(W.start.darts), W.length_of(W.end.darts))
    assert frechet_bound(W)[0] == max(ends, F[len(A) - 1, len(B) - 1])


def test_backward_bound_is_not_above_forward():
    P = generators.delaunay(12, seed=4)
    cyc = _cycle(P)
    a, b = {"vertices": cyc[:4]}, {"vertices": cyc[8:5:-1]}
    fwd = frechet_bound(WidthProblem.build(P, a, b))[0]
    bwd = frechet_bound(WidthProblem.build(P, a, b, backward=True))[0]
    assert bwd <= fwd


# ----------------------------------------------------------------- infeasible, holes
def _ring():
    # a 3x3 grid of squares: the middle square is face `mid`
    P = generators.grid(4, 4)
    mid = P.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    return P, mid


def test_leash_around_a_hole_is_infeasible():
    P, mid = _ring()
    a = {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]}
    b = {"vertices": [(3, 0), (3, 1), (3, 2), (3, 3)]}
    start = {"vertices": [(0, 0), (1, 0), (2, 0), (3, 0)]}
    right = {"vertices": [(0, 3), (1, 3), (2, 3), (3, 3)]}
    # an end leash that keeps the middle square on its right: the sweep never crosses it
    near = {"vertices": [(0, 3), (0, 2), (0, 1), (1, 1), (2, 1), (3, 1), (3, 2), (3, 3)]}
    holes = {P.outer_face, mid}
    ok = sw.homotopy_width(P, a, b, start=start, end=near, holes=holes)
    assert ok.status == "optimal" and ok.check(P) == ok.value
    # from the left column to the right column the leash must sweep over the hole
    bad = sw.homotopy_width(P, a, b, start=start, end=right, holes=holes)
    assert bad.status == "infeasible" and "homotopic" in bad.stats["reason"]
    # without the hole the same leashes are fine
    r = sw.homotopy_width(P, a, b, start=start, end=right)
    assert r.status == "optimal" and r.check(P) == r.value


# ----------------------------------------------------------------- bad input
def test_bad_input_errors():
    P = generators.grid(3, 3)
    a = {"vertices": [(0, 0), (0, 1), (0, 2)]}
    b = {"vertices": [(2, 0), (2, 1), (2, 2)]}
    with pytest.raises(InvalidCurveError, match="walk a is empty"):
        sw.homotopy_width(P, [], b)
    with pytest.raises(InvalidCurveError, match="walk b is empty"):
        sw.homotopy_width(P, a, {"vertices": []})
    with pytest.raises(InvalidCurveError, match="walk a.*not adjacent"):
        sw.homotopy_width(P, {"vertices": [(0, 0), (1, 1)]}, b)
    with pytest.raises(InvalidCurveError, match="not a vertex"):
        sw.homotopy_width(P, {"vertices": [(0, 0), (9, 9)]}, b)
    with pytest.raises(InvalidCurveError, match="start leash runs from"):
        sw.homotopy_width(P, a, b, start={"vertices": [(0, 1), (1, 1), (2, 1)]},
                          end={"vertices": [(0, 2), (1, 2), (2, 2)]})
    with pytest.raises(InvalidCurveError, match="end leash runs from"):
        sw.homotopy_width(P, a, b, start={"vertices": [(0, 0), (1, 0), (2, 0)]},
                          end={"vertices": [(0, 1), (1, 1), (2, 1)]})
    with pytest.raises(InvalidCurveError, match="hole 99 is not a face"):
        sw.homotopy_width(P, a, b, holes={99})
    with pytest.raises(InvalidCurveError, match="default leashes"):
        sw.homotopy_width(P, a, {"vertices": [(1, 0), (1, 1)]})
    with pytest.raises(UnsupportedOptionError):
        sw.homotopy_width(P, a, b, weight="length")
    with pytest.raises(UnsupportedOptionError):
        sw.homotopy_width(P, a, b, method="magic")
    # errors derive from the matching builtin
    with pytest.raises(ValueError):
        sw.homotopy_width(P, [], b)


def test_checker_rejects_tampered_witness():
    P = generators.grid(3, 3)
    a = {"vertices": [(0, 0), (0, 1), (0, 2)]}
    b = {"vertices": [(2, 0), (2, 1), (2, 2)]}
    r = sw.homotopy_width(P, a, b, weight="vertices")
    assert r.check(P) == r.value
    moves = list(r.witness["moves"])
    bad = r.with_(witness={"start": r.witness["start"], "moves": moves[1:]})
    with pytest.raises(WitnessError):
        bad.check(P)
    steps = [m for m in moves if m["op"] == "step"]
    back = dict(steps[0], to=-1)
    with pytest.raises(WitnessError, match="outside"):
        r.with_(witness={"start": r.witness["start"], "moves": [back]}).check(P)
    with pytest.raises(WitnessError, match="claims"):
        r.with_(upper=r.value + 1).check(P)


def test_memory_estimate_refuses_tiny_budget():
    P = generators.grid(3, 3)
    W = WidthProblem.build(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(2, 0), (2, 1), (2, 2)]})
    with pytest.raises(ProblemTooLargeError, match="max_memory"):
        search_width(W, max_memory=1000)


def _deep_size(obj, seen):
    if id(obj) in seen:
        return 0
    seen.add(id(obj))
    n = sys.getsizeof(obj)
    if isinstance(obj, (list, tuple)):
        n += sum(_deep_size(x, seen) for x in obj)
    return n


@pytest.mark.parametrize("points", [30, 120])
def test_memory_estimate_of_the_walk_space_against_its_measured_size(points):
    # the a-priori table estimate against sys.getsizeof over the compiled walk space actually built
    from sweepwidth.solve.width.exact import memory_estimate, walk_space

    P = generators.delaunay(points, seed=1)
    cyc = _cycle(P)
    n = len(cyc)
    W = WidthProblem.build(P, {"vertices": cyc[: n // 3]}, {"vertices": cyc[n // 2: n // 2 + n // 3][::-1]})
    sp = walk_space(W)
    seen: set = set()
    measured = sum(_deep_size(getattr(sp, k), seen) for k in ("tail", "head", "dlen", "face", "idx", "ridx", "CC",
                                                              "RCC", "flen", "out", "hole", "fweight", "tree"))
    est = memory_estimate(W)
    assert 0.5 * est["tables"] <= measured <= 1.5 * est["tables"]
    assert est["least"] == est["tables"] + est["cells"] * est["per_state"]


def test_search_refusal_names_the_bytes_needed_and_auto_keeps_its_bounds():
    # instances/leashes/reflip-delaunay-1010: the bounds leave a gap, so 'auto' would search
    from sweepwidth.solve.width.exact import memory_estimate

    here = os.path.join(os.path.dirname(__file__), "..", "instances", "leashes", "reflip-delaunay-1010.json")
    P = sw.read(here)
    c = P.meta["curves"]
    kw = {"start": c["start"], "end": c["end"]}
    full = sw.homotopy_width(P, c["a"], c["b"], method="bounds", **kw)
    assert full.upper is not None and full.lower < full.upper
    W = WidthProblem.build(P, c["a"], c["b"], **kw)
    est = memory_estimate(W, full.upper)
    small = est["tables"] + est["per_state"]  # the tables and one state: fewer than the index pairs
    assert small < est["least"]
    with pytest.raises(ProblemTooLargeError, match=r"walk space .* it needs at least \d+ bytes"):
        sw.homotopy_width(P, c["a"], c["b"], method="search", max_memory=small, **kw)
    r = sw.homotopy_width(P, c["a"], c["b"], method="auto", max_memory=small, **kw)
    assert r.status == "bounded" and (r.lower, r.upper) == (full.lower, full.upper)
    assert r.check(P) == r.upper
    assert "max_memory" in r.stats["auto"]["reason"] and r.stats["auto"]["choice"] == "bounds"
    ok = sw.homotopy_width(P, c["a"], c["b"], method="auto", **kw)  # the default budget: solved
    assert ok.status == "optimal"


def test_time_limit_returns_bounds():
    P = generators.delaunay(60, seed=3)
    cyc = _cycle(P)
    n = len(cyc)
    a = {"vertices": cyc[: n // 2 - 1]}
    b = {"vertices": cyc[n // 2 + 1:][::-1]}
    t = time.monotonic()
    r = sw.homotopy_width(P, a, b, method="search", time_limit=1.0)
    assert time.monotonic() - t < 2.5
    assert r.status in ("optimal", "bounded")
    assert r.lower <= (r.upper if r.upper is not None else float("inf"))
    if r.witness is not None:
        assert r.check(P) == r.upper


def test_result_round_trip_and_json():
    P = generators.grid(3, 4)
    r = sw.homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2), (0, 3)]},
                          {"vertices": [(2, 0), (2, 1), (2, 2), (2, 3)]})
    r2 = sw.Result.from_dict(r.to_dict())
    assert r2.parameter == "width" and r2.check(P) == r.value


# ----------------------------------------------------------------- face-passage bound
@SLOW
@given(boundary_instances(max_faces=7), st.booleans(), st.sampled_from(["weight", None, "vertices"]))
def test_passage_bound_never_exceeds_the_optimum(inst, backward, weight):
    # soundness against the brute-force reference (tests/reference_width.py): the least width
    # of a sweep is never below the bound, and the bound is attained or exceeded by it
    from sweepwidth.solve.width.bounds import passage_bound

    P, a, b = inst
    W = WidthProblem.build(P, a, b, backward=backward, weight=weight)
    exact = sw.homotopy_width(P, a, b, method="search", backward=backward, weight=weight)
    ref = reference_width(W, exact.value)
    assert ref == exact.value
    assert passage_bound(W)[0] <= ref + 1e-9


@SLOW
@given(interior_instances())
def test_passage_bound_sound_on_interior_walks(inst):
    from sweepwidth.solve.width.bounds import passage_bound

    P, a, b, s, e = inst
    W = WidthProblem.build(P, a, b, start=s, end=e)
    ref = reference_width(W, sw.homotopy_width(P, a, b, start=s, end=e, method="search").value)
    assert passage_bound(W)[0] <= ref + 1e-9


def test_passage_bound_without_holes_takes_the_cheaper_side():
    # no holes: the odd set is X or its complement, the bound is the smaller of the two maxima
    from sweepwidth.solve.width.bounds import odd_faces, passage_bound

    P = generators.grid(3, 3)
    a = {"vertices": [(0, 0), (0, 1), (0, 2)]}
    b = {"vertices": [(2, 0), (2, 1), (2, 2)]}
    W = WidthProblem.build(P, a, b, holes=[])
    sets = odd_faces(W)
    assert sets is not None and len(sets) == 2
    assert sorted(sets[0] + sets[1]) == list(range(P.number_of_faces()))
    r = sw.homotopy_width(P, a, b, holes=[], method="search")
    assert passage_bound(W)[0] <= r.value


@pytest.mark.parametrize("method", ["search", "auto"])
def test_small_problems_try_the_exact_search_before_the_slow_constructions(method):
    # regression: on this 7-face instance 'search' spent 0.9 s in the window re-solves of the
    # constructions before a 0.08 s exact search; now a construction without them and the exact
    # search come first.  Value: the manifest's (exact search, witness replayed) and the reference BFS.
    here = os.path.join(os.path.dirname(__file__), "..", "instances", "leashes", "reflip-delaunay-1010.json")
    P = sw.read(here)
    c = P.meta["curves"]
    kw = {"start": c["start"], "end": c["end"]}
    r = sw.homotopy_width(P, c["a"], c["b"], method=method, **kw)
    assert r.status == "optimal" and r.value == 9
    assert "quick_search" in r.stats and r.check(P) == 9
    W = WidthProblem.build(P, c["a"], c["b"], **kw)
    assert reference_width(W, r.value) == 9


@SLOW
@given(boundary_instances(max_faces=6), st.sampled_from(["weight", None, "vertices"]))
def test_rest_bound_never_exceeds_the_rest_of_an_optimal_sweep(inst, weight):
    # StateBound(i, j, odd) is a lower bound on any continuation from a state; checked at every
    # state of an optimal sweep against the brute-force reference (tests/reference_width.py) run
    # on the rest as its own problem: A from a_i, B from b_j, the state's leash as start leash
    from sweepwidth.solve.width.bounds import StateBound
    from sweepwidth.verify.width import replay_leashes

    P, a, b = inst
    W = WidthProblem.build(P, a, b, weight=weight)
    r = sw.homotopy_width(P, a, b, method="search", weight=weight)
    assert r.status == "optimal"
    opts = W.options()
    sweep = replay_leashes(P, r.witness, a=opts["a"], b=opts["b"], start=opts["start"], end=opts["end"],
                           weight=weight)
    h = StateBound(W)
    assert h(0, 0, 0) <= r.value + 1e-9
    odd = 0
    for le in sweep.leashes:
        if le.face is not None:
            odd ^= 1 << le.face
        rest = WidthProblem.build(P, {"vertices": list(W.graph.label(v) for v in W.a_vertices[le.i:])},
                                  {"vertices": list(W.graph.label(v) for v in W.b_vertices[le.j:])},
                                  start={"vertex": le.a_end, "darts": list(le.darts)}, end=opts["end"],
                                  weight=weight)
        try:
            ref = reference_width(rest, r.value, max_states=60_000)
        except RuntimeError:
            reject()
        assert ref is not None
        assert h(le.i, le.j, odd) <= ref + 1e-9


@SLOW
@given(boundary_instances(max_faces=7), st.booleans(), st.booleans())
def test_search_with_and_without_the_rest_bound_agree(inst, backward, spikes):
    # the keyed search (rest bound, partial expansion) against plain bottleneck keys: same width
    P, a, b = inst
    W = WidthProblem.build(P, a, b, backward=backward, spikes=spikes)
    lo = frechet_bound(W)[0]
    keyed = search_width(W, lower=lo)
    plain = search_width(W, lower=lo, use_rest=False)
    assert keyed.optimal and plain.optimal
    assert keyed.upper == plain.upper
    assert replay_width(P, keyed.witness, **{k: W.options()[k] for k in ("a", "b", "start", "end")},
                        backward=backward, spikes=spikes) == keyed.upper


def test_partial_expansion_stores_few_states_regression():
    # regression: without an upper bound every expansion stored ~90 longer leashes that were
    # never expanded; this 38-face disk filled the 1 GiB state limit after 17 s.  Now states
    # longer than the current key are built only when the search reaches their key.
    import random

    rng = random.Random(2)
    P = generators.delaunay(24, seed=2)
    P = P.with_weights([rng.choice((1, 1, 1, 2, 3)) for _ in range(P.number_of_edges())])
    cyc = _cycle(P)
    k = len(cyc)
    p = q = k // 3
    s = p + 1 + (k - p - q - 2) // 2
    W = WidthProblem.build(P, {"vertices": cyc[: p + 1]}, {"vertices": cyc[s: s + q + 1][::-1]})
    out = search_width(W, lower=frechet_bound(W)[0], deadline=time.monotonic() + 60)
    assert out.optimal and out.upper == 11.0  # the value the unkeyed search proves (plain keys, no cap)
    assert out.stats["stored"] < 20 * out.stats["states"]


@given(boundary_instances(max_faces=7), st.booleans())
@settings(max_examples=25, deadline=None)
def test_walk_space_grow_is_the_cheapest_insertion(inst, spikes):
    # the per-vertex skip of insertions in the walk space: grow[v] is the least length an insertion
    # at v adds, checked against every move from the point at v (moves from a point are insertions)
    from sweepwidth.solve.width.exact import walk_space

    P, a, b = inst
    W = WidthProblem.build(P, a, b, spikes=spikes)
    sp = walk_space(W)
    for v in range(sp.n):
        lengths = [nl for *_, nl in sp.moves(sp.point(v))]
        assert (min(lengths) if lengths else float("inf")) == sp.grow[v]
        low = [float("inf")]
        assert list(sp.moves(sp.point(v), cap=0.0, low=low)) == [] and low[0] == sp.grow[v]

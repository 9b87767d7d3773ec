"""Homotopies projected to homology sweeps, and homology + homotopy solved together.

Sources of the expected relations:
* From the definitions: reducing every walk of a homotopy mod 2 keeps the Z2
  cycle under spikes and unspikes and adds a face boundary under a flip, and
  an edge met an odd number of times by a walk is met at least once, so the
  projected sweep's width is at most the homotopy's height (non-negative
  weights).
* Brightwell and Winkler, "Submodular percolation", SIAM J. Discrete Math.
  23(3), 2009: from the bottom to the top of the lattice of face sets a face
  order is no wider than any toggle sequence, so from a disk's boundary the
  monotone homology width is at most the homotopy height.
* Exact homotopy heights from ``tests/reference_homotopy.py`` (brute force
  over walks, written independently of the library); the projected sweeps are
  replayed by the homology checker (:mod:`sweepwidth.verify.homology`).
"""

from __future__ import annotations

import random

import time

import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st
from reference_homotopy import reference_height
from strategies import plane_graphs, triangulated_disks

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.problems.homotopy import HomotopyProblem
from sweepwidth.result import Result
from sweepwidth.solve.homotopy.projection import best_face_order, face_orders_of_toggles, toggle_widths
from sweepwidth.verify.homology import sweep_profile

TINY = plane_graphs(min_vertices=2, max_vertices=5, weighted=True, max_weight=4)


def _replay(P, proj, end=frozenset()):
    """The homology checker's replay of a projected sweep: its width, and that it ends at ``end``."""
    prof, final = sweep_profile(P, proj["start"], proj["toggles"], {P.outer_face})
    assert final == set(end)
    return max(prof)


@settings(max_examples=40, deadline=None)
@given(TINY)
@example(P=generators.wheel(4))
def test_projected_constructed_homotopy_is_a_sweep_no_wider(P):
    r = sw.homotopy_height(P, method="bounds")
    assert r.check(P) == r.upper  # the homotopy checker replays the witness
    proj = sw.project_homotopy(P, r.witness)
    width = _replay(P, proj)
    assert width == pytest.approx(proj["width"])
    assert width <= r.upper + 1e-9  # reduction mod 2 (definitions)
    assert width >= sw.homology_width(P, monotone=False).lower - 1e-9  # any sweep is at least the optimum
    # the full homology checker accepts it as a non-monotone sweep result
    from sweepwidth.solve.contract import make_result

    res = make_result("homology", lower=0.0, upper=width, witness=proj["toggles"], method="projection", seconds=0.0,
                      stats={"start": proj["start"], "end": [], "holes": [P.outer_face], "monotone": False})
    assert res.check(P) == pytest.approx(width)


@settings(max_examples=25, deadline=None)
@given(plane_graphs(min_vertices=2, max_vertices=5, weighted=True, max_weight=3))
def test_projected_reference_homotopy(P):
    if any(P.weight(e) == 0 for e in range(P.number_of_edges())):
        P = P.with_weights([P.weight(e) + 1 for e in range(P.number_of_edges())])  # brute force needs > 0
    # the brute-force optimum may flip a face twice: its projection is a non-monotone sweep
    H = HomotopyProblem.build(P)
    ub = sw.homotopy_height(P, method="bounds").upper
    h, wit = reference_height(H, ub)
    assert h is not None
    proj = sw.project_homotopy(P, wit)
    width = _replay(P, proj)
    assert width <= h + 1e-9
    # Brightwell-Winkler: from the outer boundary a face order is no wider; the exact monotone width
    assert sw.homology_width(P).value <= width + 1e-9
    fo = best_face_order(P, proj["start"], proj["toggles"])
    assert fo is not None or not proj["toggles"]
    if fo is not None:
        prof, final = sweep_profile(P, proj["start"], fo[1], {P.outer_face})
        assert final == set() and max(prof) == pytest.approx(fo[0])


def test_projection_from_an_interior_curve_reaches_its_end():
    # a hand-made case: the 3 x 3 grid swept from the middle square's boundary to a point, the middle a hole
    P = generators.grid(4, 4)
    mid = P.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    holes = {P.outer_face}
    start = [int(d) for d in P.face_darts(mid)]
    r = sw.homotopy_height(P, start={"darts": start}, holes=holes, method="bounds")
    proj = sw.project_homotopy(P, r.witness)
    prof, final = sweep_profile(P, proj["start"], proj["toggles"], holes)
    assert final == set() and max(prof) <= r.upper + 1e-9


def test_face_orders_of_toggles_by_hand():
    # worked by hand: 3 toggled three times (odd), 1 and 2 once
    assert face_orders_of_toggles([3, 1, 3, 2, 3]) == [[1, 2, 3], [3, 1, 2]]
    assert face_orders_of_toggles([4, 4]) == [[]]  # a face toggled twice ends where it started


def test_toggle_widths_against_a_hand_count():
    P = generators.grid(3, 3)  # four unit squares; the boundary has 8 unit edges (common practice: grid perimeter)
    inner = [f for f in range(P.number_of_faces()) if f != P.outer_face]
    w = toggle_widths(P, P.face_boundary_cycle(P.outer_face), inner)
    assert w[0] == 8.0 and w[-1] == 0.0


def test_bad_witness_is_refused():
    P = generators.wheel(4)
    with pytest.raises(sw.WitnessError):
        sw.project_homotopy(P, {"moves": []})
    with pytest.raises(sw.WitnessError):
        sw.project_homotopy(P, {"start": {"darts": [0]}, "moves": [{"op": "twist"}]})
    with pytest.raises(sw.WitnessError):
        sw.project_homotopy(P, {"start": {"darts": [0]}, "moves": [{"op": "flip", "face": 99}]})


def _consistent(P, res):
    hom, htp = res["homology"], res["homotopy"]
    assert hom.check(P) == pytest.approx(hom.upper)  # the homology checker replays it
    assert htp.check(P) == pytest.approx(htp.upper)
    assert hom.stats["joint"]["comparable"]
    assert hom.upper <= htp.upper + 1e-9  # projection
    assert hom.lower <= htp.lower + 1e-9  # homology width <= homotopy height
    assert hom.lower <= hom.upper and htp.lower <= htp.upper


@settings(max_examples=25, deadline=None)
@given(TINY)
def test_joint_bounds_never_contradict(P):
    res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=3)
    _consistent(P, res)
    if all(P.weight(e) > 0 for e in range(P.number_of_edges())):
        # (with zero weights the brute force would meet endless free spikes)
        ref = reference_height(HomotopyProblem.build(P), res["homotopy"].upper)[0]
        assert ref is not None and res["homotopy"].lower <= ref + 1e-9  # the joint lower bound is sound


@settings(max_examples=6, deadline=None)
@given(triangulated_disks(max_faces=30, weighted=True), st.integers(0, 3))
def test_joint_on_disks(P, seed):
    _consistent(P, sw.solve_parameters(P, ["homology", "homotopy"], time_limit=2, seed=seed))


@pytest.mark.parametrize("n,seed", [(30, 1), (60, 2)])
def test_joint_on_weighted_delaunay_disks(n, seed):
    P = generators.weighted_delaunay_disk(n, seed=seed)
    res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=3, seed=0)
    _consistent(P, res)


def test_joint_uses_a_better_projected_homotopy():
    # a homology run stopped at once has only its greedy sweep; the joint result is never worse than the
    # projection of the homotopy witness
    P = generators.weighted_delaunay_disk(40, seed=3)
    res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=2)
    proj = sw.project_homotopy(P, res["homotopy"].witness)
    assert res["homology"].upper <= proj["width"] + 1e-9
    assert isinstance(res["homology"], Result)


def test_joint_interior_curves_share_no_monotone_bound():
    P = generators.grid(4, 4)
    mid = P.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    res = sw.solve_parameters(P, ["homology", "homotopy"], start={"darts": [int(d) for d in P.face_darts(mid)]},
                              time_limit=3)
    assert res["homology"].stats["joint"]["comparable"] is False
    assert res["homology"].check(P) == pytest.approx(res["homology"].upper)
    assert res["homotopy"].check(P) == pytest.approx(res["homotopy"].upper)
    nm = sw.solve_parameters(P, ["homology", "homotopy"], start={"darts": [int(d) for d in P.face_darts(mid)]},
                             homology_options={"monotone": False}, time_limit=3)
    _consistent(P, nm)


def test_joint_all_three_and_bad_names():
    P = generators.wheel(5)
    res = sw.solve_parameters(P, ["homotopy", "cutwidth", "homotopy"], time_limit=30)  # ends at once; a long limit so a loaded machine cannot end it early
    assert list(res) == ["homotopy", "cutwidth"]
    assert res["cutwidth"].value == sw.cutwidth(P.to_networkx()).value
    with pytest.raises(sw.UnsupportedOptionError):
        sw.solve_parameters(P, ["treewidth"])
    with pytest.raises(sw.UnsupportedOptionError):
        sw.solve_parameters(P, ["homotopy"], homotopy_options={"colour": 1})
    with pytest.raises(sw.InvalidArgumentError):
        sw.solve_parameters(P, [])


def test_joint_seeds_random_weights():
    rng = random.Random(5)
    P = generators.triangulated_grid(3)
    P = P.with_weights([rng.randint(0, 4) for _ in range(P.number_of_edges())])
    _consistent(P, sw.solve_parameters(P, ["homology", "homotopy"], time_limit=3))


def test_cli_solves_homology_and_homotopy_together(tmp_path, capsys):
    import json

    from sweepwidth.cli import main

    P = generators.weighted_delaunay_disk(25, seed=4)
    path = tmp_path / "disk.json"
    sw.write(P, str(path))
    capsys.readouterr()
    assert main(["solve", str(path), "--param", "homology,homotopy", "--time-limit", "2", "--json"]) == 0
    rows = {r["parameter"]: r for r in map(json.loads, capsys.readouterr().out.splitlines())}
    assert rows["homology"]["stats"]["joint"]["comparable"] is True  # the joint path ran
    assert rows["homology"]["upper"] <= rows["homotopy"]["upper"] + 1e-9
    assert rows["homology"]["lower"] <= rows["homotopy"]["lower"] + 1e-9
    assert rows["homology"]["checked"] is not None and rows["homotopy"]["checked"] is not None


@settings(max_examples=30, deadline=None)
@given(plane_graphs(min_vertices=3, max_vertices=6, weighted=True, max_weight=3), st.integers(1, 40))
def test_search_levels_are_lower_bounds_when_stopped_early(P, budget):
    # the exact search's settled bottleneck levels (the homotopy lower bound beyond homology that
    # 'auto' and solve_parameters keep when the search stops) never exceed the brute-force optimum
    from sweepwidth.solve.homotopy.search import search_homotopy

    P = P.with_weights([P.weight(e) + 1 for e in range(P.number_of_edges())])  # brute force needs > 0
    H = HomotopyProblem.build(P)
    ub = sw.homotopy_height(P, method="bounds").upper
    ref = reference_height(H, ub)[0]
    assert ref is not None
    try:
        out = search_homotopy(H, max_states=budget, use_homology=False, dive=0)
    except sw.ProblemTooLargeError:
        return
    assert out.lower <= ref + 1e-9
    if out.optimal:
        assert out.upper == pytest.approx(ref)


def test_bench_runs_a_paired_task(tmp_path):
    # a benchmark task with the paired solver: one child solves both, the row is the asked parameter
    from sweepwidth.bench import Task, execute_task, instance_hash

    P = generators.weighted_delaunay_disk(20, seed=2)
    path = tmp_path / "disk.json"
    sw.write(P, str(path))
    rows = {}
    for p in ("homology", "homotopy"):
        task = Task(instance=str(path), instance_hash=instance_hash(path), parameter=p, time_limit=4.0,
                    solver=f"sweepwidth.solve.joint:paired_{p}")
        rows[p] = execute_task(task)
        assert rows[p]["check_error"] is None and rows[p]["checked"] is not None
        assert rows[p]["result"]["stats"]["paired_with"]["parameter"] != p
    assert rows["homology"]["upper"] <= rows["homotopy"]["upper"] + 1e-9
    assert rows["homology"]["lower"] <= rows["homotopy"]["lower"] + 1e-9


def test_regression_boundary_edge_ids_that_also_read_as_a_walk():
    # regression: the joint solve passed the boundary's edge ids as a sorted list, which on this dual also
    # reads as a closed walk through vertices (InvalidCurveError); it now passes an edge-id set
    P = generators.delaunay(5, seed=4).dual()
    _consistent(P, sw.solve_parameters(P, ["homology", "homotopy"], time_limit=3))


@pytest.mark.parametrize("limit", [0, 0.05, 0.2, 0.5])
def test_joint_short_limits_regression(limit):
    # regression: a limit spent before the homology share was computed gave a negative time_limit
    # (InvalidArgumentError), and a homotopy side with no time left reported no witness although the
    # homology face order can be lifted to a homotopy
    P = generators.weighted_delaunay_disk(60, seed=2)
    t0 = time.monotonic()
    res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=limit, seed=0)
    assert time.monotonic() - t0 < limit + 1.5
    hom, htp = res["homology"], res["homotopy"]
    assert hom.witness is not None and htp.witness is not None
    _consistent(P, res)

# ---------------------------------------------------------------- the pair's leftover time


def test_regression_pair_spends_its_leftover_time():
    # regression: the homotopy side used to end early (its exact search stops at its memory cap) and the
    # pair returned with much of its limit unused; now the leftover goes to the larger gap.  A tiny
    # memory cap makes the search stop at once, so the leftover path is exercised here.
    import time

    P = generators.weighted_delaunay_disk(100, seed=1)
    limit = 12.0  # 6 s per side
    t = time.monotonic()
    res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=limit,
                              homotopy_options={"max_memory": 1 << 20})
    wall = time.monotonic() - t
    _consistent(P, res)
    assert wall <= limit + 1.5  # time limits are real (the solver contract; loose for a loaded machine)
    left = res["homotopy"].stats["joint"]["leftover"]
    assert left["rounds"], left  # the leftover was used
    # each side reports at least ~70 % of its half of the limit (loose: a loaded machine)
    for p in ("homology", "homotopy"):
        assert res[p].seconds >= 0.6 * limit / 2, (p, res[p].seconds, left)


def test_leftover_rounds_keep_lower_bounds_sound_on_small_disks():
    # the refined lower bounds never exceed the optimum: the homology width from the exact subset DP
    # (an independent method) and the homotopy height, checked against its own witness's replay
    for n, seed in [(12, 1), (14, 2)]:
        P = generators.weighted_delaunay_disk(n, seed=seed)
        res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=10,
                                  homotopy_options={"max_memory": 1 << 16})
        _consistent(P, res)
        exact = sw.homology_width(P, method="subset-dp")
        assert exact.status == "optimal"
        assert res["homology"].lower <= exact.value + 1e-9
        assert res["homotopy"].lower <= res["homotopy"].check(P) + 1e-9


def test_refine_face_order_against_the_subset_dp():
    # refine_face_order's bounds bracket the exact width (subset DP over face sets, an independent method)
    import time as _time

    from sweepwidth.problems.cycles import HomologyProblem
    from sweepwidth.solve.contract import Deadline
    from sweepwidth.solve.homology import refine_face_order

    for n, seed in [(10, 0), (12, 3), (14, 5)]:
        P = generators.weighted_delaunay_disk(n, seed=seed)
        Q = HomologyProblem.build(P, set(P.face_boundary_cycle(P.outer_face)), set(), [P.outer_face])
        exact = sw.homology_width(P, method="subset-dp").value
        faces = sorted(Q.swept[0])
        random.Random(seed).shuffle(faces)
        t = _time.monotonic()
        lo, up, order, _ = refine_face_order(Q, faces, 0.0, deadline=Deadline.from_limit(3), seed=seed)
        assert _time.monotonic() - t <= 3 + 1.0
        assert sorted(order) == sorted(Q.swept[0])
        assert lo <= exact + 1e-9 <= up + 2e-9
        replay, _ = sweep_profile(P, set(P.face_boundary_cycle(P.outer_face)), order, {P.outer_face})
        assert max(replay) == pytest.approx(up)  # the homology checker's replay of the returned order


def test_refine_ordering_against_brute_force():
    # the continued bounds bracket the cutwidth found by trying every ordering (itertools, independent)
    import itertools
    import time as _time

    import networkx as nx

    from sweepwidth.problems.ordering import OrderingProblem
    from sweepwidth.solve.ordering import refine_ordering

    rng = random.Random(7)
    for trial in range(6):
        G = nx.gnm_random_graph(7, 12, seed=trial)
        for u, v in G.edges:
            G[u][v]["weight"] = rng.randint(1, 5)
        P = OrderingProblem.from_graph(G)
        best = min(P.width(list(o)) for o in itertools.permutations(range(7)))
        lo, up, order, _ = refine_ordering(P, list(range(7)), lower=0.0, deadline=_time.monotonic() + 1.0, seed=trial)
        assert sorted(order) == list(range(7))
        assert P.width(order) == pytest.approx(up)
        assert lo <= best + 1e-9 <= up + 2e-9

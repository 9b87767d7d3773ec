"""The independent homology checker: replays witnesses and refuses tampered ones."""

from __future__ import annotations

import json
import math

import pytest
from hypothesis import HealthCheck, given, settings

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import WitnessError
from sweepwidth.result import Result
from sweepwidth.verify.homology import check_homology, sweep_profile

from strategies import triangulated_disks


def _grid_result():
    P = generators.grid(3, 4)
    return P, sw.homology_width(P)


def test_replays_and_returns_the_width():
    P, r = _grid_result()
    assert r.check(P) == r.value == 10.0  # the boundary of the 2 x 3 grid weighs 10 (counted by hand)


def test_round_trip_through_json_still_checks():
    P, r = _grid_result()
    back = Result.from_dict(json.loads(r.to_json()))
    assert back.check(P) == r.value


def test_refuses_a_wrong_claimed_width():
    P, r = _grid_result()
    with pytest.raises(WitnessError, match="claims upper bound"):
        r.with_(upper=9.0, value=9.0, lower=9.0).check(P)


def test_refuses_a_lower_bound_above_the_width():
    P, r = _grid_result()
    bad = Result("homology", "bounded", None, 11.0, 11.0, witness=r.witness, stats=r.stats)
    with pytest.raises(WitnessError):
        bad.check(P)


def test_refuses_a_missing_face():
    P, r = _grid_result()
    with pytest.raises(WitnessError, match="differs from the end"):
        r.with_(witness=r.witness[:-1]).check(P)


def test_refuses_a_repeated_face_in_a_monotone_sweep():
    P, r = _grid_result()
    w = list(r.witness) + [r.witness[0], r.witness[0]]
    with pytest.raises(WitnessError, match="step 6: face .* second time"):
        r.with_(witness=w).check(P)


def test_refuses_a_hole_and_names_the_step():
    P, r = _grid_result()
    w = list(r.witness)
    w.insert(2, P.outer_face)
    with pytest.raises(WitnessError, match="step 2: face .* hole"):
        r.with_(witness=w).check(P)


def test_refuses_a_face_that_does_not_exist():
    P, r = _grid_result()
    with pytest.raises(WitnessError, match="step 0"):
        r.with_(witness=[99] + list(r.witness)).check(P)


def test_refuses_a_missing_witness():
    P, r = _grid_result()
    with pytest.raises(WitnessError, match="no witness"):
        r.with_(witness=None).check(P)


def test_explicit_instance_overrides_the_recorded_one():
    P, r = _grid_result()
    # claiming the sweep ends at one square's boundary: the replay ends empty instead
    f = r.witness[0]
    with pytest.raises(WitnessError):
        check_homology(r, P, end=sorted(P.face_boundary_cycle(f)))
    with pytest.raises(sw.SweepwidthError, match="unknown checker option"):
        check_homology(r, P, colour="red")


def test_non_monotone_witness_may_repeat_faces():
    P = generators.grid(2, 3)
    a, b = [f for f in P.faces if f != P.outer_face]
    stats = {"start": sorted(P.face_boundary_cycle(P.outer_face)), "end": [], "holes": [P.outer_face], "monotone": False}
    # toggling a three times is the same as once; the widest cycle is the 6-edge boundary
    r = Result("homology", "bounded", None, 6.0, 6.0, witness=[a, b, a, a], stats=stats)
    assert r.check(P) == 6.0
    with pytest.raises(WitnessError, match="second time"):
        r.with_(stats=dict(stats, monotone=True)).check(P)


def test_infeasible_claims_are_verified():
    P = generators.grid(4, 4)
    mid = P.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    r = sw.homology_width(P, holes={P.outer_face, mid})
    assert r.status == "infeasible"
    assert r.check(P) == math.inf
    # a false infeasibility claim (no hole in the middle) is refused
    fake = r.with_(stats=dict(r.stats, holes=[P.outer_face]))
    with pytest.raises(WitnessError, match="claims infeasible"):
        fake.check(P)


def test_profile_is_recomputed_from_face_walks():
    P = generators.grid(2, 3)
    a, b = sorted((f for f in P.faces if f != P.outer_face), key=lambda f: min(P.boundary_walk(f)))
    prof, final = sweep_profile(P, P.face_boundary_cycle(P.outer_face), [a, b], {P.outer_face})
    assert prof == [6.0, 4.0, 0.0]  # two unit squares side by side: boundary 6, one square 4, nothing
    assert final == set()


@settings(max_examples=20, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(triangulated_disks(10, weighted=True))
def test_every_result_replays(P):
    for monotone in (True, False):
        r = sw.homology_width(P, monotone=monotone)
        assert r.check(P) == pytest.approx(r.upper)

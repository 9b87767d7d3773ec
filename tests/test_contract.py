"""The one solver contract: shared argument rules, the registries, deadlines and results.

Every public solver validates ``time_limit``, ``seed`` and the weight keyword
through :mod:`sweepwidth.solve.contract`, so the same bad value gets the same
error and message from each of them; the parameter and method registries of
:mod:`sweepwidth.registry` are what the command line and the benchmark
runner list.
"""

from __future__ import annotations

import io
import re
import math
import time
import warnings
from contextlib import redirect_stdout
from decimal import Decimal
from fractions import Fraction

import networkx as nx
import numpy as np
import pytest

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import InvalidArgumentError, SweepwidthError
from sweepwidth.registry import PARAMETERS, Method, get_method, methods, register_method, unregister_method
from sweepwidth.solve.contract import MARGIN, Deadline, check_seed, check_time_limit, make_result


def _call(name, **kw):
    # each public solver on a small instance of its kind
    if name == "cutwidth":
        return sw.cutwidth(nx.path_graph(4), **kw)
    if name == "homology":
        return sw.homology_width(generators.grid(2, 3), **kw)
    if name == "width":
        # two opposite sides of the 3 x 3 grid; the other two sides are the leashes
        return sw.homotopy_width(generators.grid(3, 3), [(0, 0), (0, 1), (0, 2)], [(2, 0), (2, 1), (2, 2)], **kw)
    return sw.homotopy_height(generators.wheel(4), **kw)


def _graph(name):
    return {"cutwidth": nx.path_graph(4), "homology": generators.grid(2, 3), "width": generators.grid(3, 3)}.get(
        name, generators.wheel(4))


SOLVERS = ["cutwidth", "homology", "homotopy", "width"]

BAD_TIME_LIMITS = [-1, -0.5, math.nan, True, "5", [1], complex(1, 0)]
BAD_SEEDS = [1.5, "x", True, -1, [0]]
BAD_WEIGHTS = [3, 1.5, ["weight"], b"weight"]


@pytest.mark.parametrize("bad", BAD_TIME_LIMITS, ids=repr)
@pytest.mark.parametrize("solver", SOLVERS)
def test_bad_time_limit_same_error_everywhere(solver, bad):
    with pytest.raises(InvalidArgumentError) as err:
        _call(solver, time_limit=bad)
    assert str(err.value) == f"time_limit must be a real number of seconds >= 0 or None, got {bad!r}"
    assert isinstance(err.value, ValueError) and isinstance(err.value, SweepwidthError)


@pytest.mark.parametrize("bad", BAD_SEEDS, ids=repr)
@pytest.mark.parametrize("solver", SOLVERS)
def test_bad_seed_same_error_everywhere(solver, bad):
    with pytest.raises(InvalidArgumentError) as err:
        _call(solver, seed=bad)
    assert str(err.value) == f"seed must be a non-negative integer or None, got {bad!r}"


@pytest.mark.parametrize("bad", BAD_WEIGHTS, ids=repr)
@pytest.mark.parametrize("solver", SOLVERS)
def test_bad_weight_same_error_everywhere(solver, bad):
    with pytest.raises(InvalidArgumentError) as err:
        _call(solver, weight=bad)
    assert str(err.value).startswith("weight must be an edge attribute name")
    assert str(err.value).endswith(f"got {bad!r}")


@pytest.mark.parametrize("good", [Fraction(5), 5, 5.0, np.float64(5.0), np.int64(5), Decimal("5"), math.inf, None],
                         ids=repr)
@pytest.mark.parametrize("solver", SOLVERS)
def test_every_real_time_limit_is_accepted(solver, good):
    # regression: homotopy_height(P, time_limit=Fraction(5)) was refused while homology_width took it
    r = _call(solver, time_limit=good)
    assert r.status == "optimal"


@pytest.mark.parametrize("solver", SOLVERS)
def test_zero_time_limit_returns_valid_bounds(solver):
    # a zero limit is allowed: the answer is whatever is proven at once, with a witness that replays
    t = time.monotonic()
    r = _call(solver, time_limit=0)
    assert time.monotonic() - t < 5.0
    assert r.status in ("optimal", "bounded")
    if r.upper is None:  # nothing constructed yet: a proven lower bound and no witness
        assert r.status == "bounded" and r.witness is None and r.lower >= 0
        return
    assert r.lower <= r.upper
    P = _graph(solver)
    assert r.check(P) == pytest.approx(r.upper)


@pytest.mark.parametrize("seed", [0, 7, np.int64(3)], ids=repr)
@pytest.mark.parametrize("solver", SOLVERS)
def test_good_seeds_accepted(solver, seed):
    assert _call(solver, seed=seed).status == "optimal"


def test_homotopy_length_keyword_still_works_with_a_warning():
    P = generators.wheel(4)
    with pytest.warns(DeprecationWarning, match="weight='vertices'"):
        old = sw.homotopy_height(P, length="vertices")
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        new = sw.homotopy_height(P, weight="vertices")
    assert old.value == new.value
    with pytest.raises(InvalidArgumentError), pytest.warns(DeprecationWarning):
        sw.homotopy_height(P, weight="vertices", length="weight")


def test_unknown_weight_names_list_the_valid_ones():
    with pytest.raises(sw.UnsupportedOptionError, match="'vertices'"):
        sw.homotopy_height(generators.wheel(4), weight="edges")
    with pytest.raises(sw.UnsupportedOptionError, match="'weight'"):
        sw.homology_width(generators.grid(2, 3), weight="cost")


# ---------------------------------------------------------------- Deadline and results
def test_deadline_keeps_one_margin():
    t0 = time.monotonic()
    d = Deadline.from_limit(2, start=t0)
    assert d.at == pytest.approx(t0 + 2 - MARGIN)
    assert Deadline.from_limit(None).at is None and Deadline.from_limit(math.inf).at is None
    assert d.within(0.5).at <= time.monotonic() + 0.5
    assert Deadline.from_limit(None).within(1.0).at is not None
    assert check_time_limit(Fraction(1, 4)) == 0.25
    assert check_seed(np.uint8(4)) == 4


def test_make_result_status_rules():
    r = make_result("homotopy", lower=None, upper=None, witness=None, method="x", seconds=0.0, infeasible="why")
    assert r.status == "infeasible" and r.stats["reason"] == "why"
    r = make_result("cutwidth", lower=5.0, upper=4.0, witness=[0], method="x", seconds=0.0, optimal=False)
    assert r.status == "bounded" and r.lower == 4.0  # never above the upper bound


# ---------------------------------------------------------------- registries
def test_parameters_registry_names_every_public_solver():
    assert set(PARAMETERS) == {"cutwidth", "homology", "homotopy", "width"}
    for p in PARAMETERS.values():
        fn = p.solver()
        assert getattr(sw, p.function_name) is fn
    assert get_method("cutwidth", "dp").guarantee == "exact"


def _dummy_cutwidth(P, *, lower, upper, upper_order, deadline, seed, **options):
    # an added method: takes the heuristic ordering as it is (so 'bounded' unless the bounds meet)
    class Out:
        pass

    assert isinstance(deadline, Deadline) and deadline.remaining() > 0  # every room passes the Deadline object down
    out = Out()
    out.lower, out.upper, out.order, out.stats = lower, upper, list(upper_order), {"dummy": True}
    return out


@pytest.fixture
def dummy_method():
    m = register_method(Method("cutwidth", "dummy-probe", "bounds", "a test method that keeps the heuristic order",
                               function=_dummy_cutwidth))
    yield m
    unregister_method("cutwidth", "dummy-probe")
    assert "dummy-probe" not in methods("cutwidth")


def test_added_method_runs_through_the_dispatcher(dummy_method):
    G = nx.cycle_graph(9)
    r = sw.cutwidth(G, method="dummy-probe")
    assert r.method == "dummy-probe"
    assert r.check(G) == pytest.approx(r.upper)
    assert r.lower <= 2 <= r.upper  # cw(C_n) = 2 (common practice)


def test_added_method_appears_in_cli_help(dummy_method):
    from sweepwidth.cli import main

    buf = io.StringIO()
    with redirect_stdout(buf), pytest.raises(SystemExit):
        main(["solve", "--help"])
    # argparse may wrap the help line at the hyphen ("dummy-" / "probe"): join such breaks first
    assert "dummy-probe" in re.sub(r"-\n\s+", "-", buf.getvalue())


def test_added_method_accepted_by_bench_task_creation(dummy_method, tmp_path):
    from sweepwidth.bench import make_tasks
    from sweepwidth.bench.tasks import discover

    path = tmp_path / "p4.json"
    sw.write(generators.grid(2, 3), str(path))
    entries = discover([str(path)])
    tasks = make_tasks(entries, ["cutwidth"], ["auto", "dummy-probe"], time_limit=5)
    assert {t.method for t in tasks} == {"auto", "dummy-probe"}
    with pytest.raises(sw.UnsupportedOptionError, match="dummy-probe"):
        make_tasks(entries, ["cutwidth"], ["no-such-method"], time_limit=5)


def test_unknown_method_lists_the_registry():
    with pytest.raises(sw.UnsupportedOptionError) as err:
        sw.homology_width(generators.grid(2, 3), method="nope")
    for name in methods("homology"):
        assert repr(name) in str(err.value)


@pytest.mark.parametrize("name", ["cutwidth", "homology", "homotopy"])
def test_unknown_keyword_is_a_clear_error_listing_the_valid_ones(name):
    # regression: homotopy_height(T, spike=False) raised a bare TypeError
    from sweepwidth import generators
    from sweepwidth.errors import UnsupportedOptionError
    from sweepwidth.registry import PARAMETERS

    T = generators.triangulated_grid(2)
    with pytest.raises(UnsupportedOptionError, match="spike") as info:
        PARAMETERS[name].solver()(T, spike=False)
    assert isinstance(info.value, TypeError) and isinstance(info.value, ValueError)
    assert "valid:" in str(info.value)


def test_a_missing_file_is_a_file_not_found_error(tmp_path):
    # regression: a missing file raised a FileFormatError that no FileNotFoundError handler caught
    import sweepwidth as sw
    from sweepwidth.errors import FileFormatError, MissingFileError
    from sweepwidth.io.saved import load_result, read_saved

    for reader in (sw.read, read_saved, load_result):
        with pytest.raises(FileNotFoundError) as info:
            reader(str(tmp_path / "absent.json"))
        assert isinstance(info.value, MissingFileError) and isinstance(info.value, FileFormatError)
        assert "absent.json" in str(info.value)


def test_memory_figures_are_short():
    # regression: a 100-digit GiB figure in the subset-search refusal
    from sweepwidth import generators
    from sweepwidth.errors import ProblemTooLargeError
    from sweepwidth.solve.homology.face_sets import FaceSweep, monotone_sweep

    P = generators.triangulated_grid(12)  # 288 faces
    fs = FaceSweep.build(P, set(P.face_boundary_cycle(P.outer_face)), frozenset(f for f in P.faces if f != P.outer_face))
    with pytest.raises(ProblemTooLargeError) as info:
        monotone_sweep(fs)
    assert max(len(w) for w in str(info.value).split()) < 12, str(info.value)


def test_numbers_in_messages_are_plain():
    # regression: "np.float64(0.0)" in an error message
    import numpy as np
    import networkx as nx
    import sweepwidth as sw
    from sweepwidth.errors import InvalidArgumentError, WeightError

    with pytest.raises(InvalidArgumentError) as info:
        sw.cutwidth(nx.path_graph(3), time_limit=np.float64(-2.0))
    assert "np." not in str(info.value) and "-2.0" in str(info.value)
    G = nx.path_graph(3)
    G.edges[0, 1]["weight"] = np.float64(-1.0)
    with pytest.raises(WeightError) as info:
        sw.cutwidth(G)
    assert "np." not in str(info.value)


def test_unknown_width_method_lists_the_registry():
    with pytest.raises(sw.UnsupportedOptionError) as err:
        _call("width", method="nope")
    for name in methods("width"):
        assert repr(name) in str(err.value)
    assert {m.guarantee for m in methods("width").values()} == {"auto", "bounds", "exact"}


def _width_by_search_only(problem, *, deadline, seed):
    # an added width method: the built-in exact search, called on the problem object itself
    from sweepwidth.solve.width.exact import search_width

    out = search_width(problem, deadline=deadline.at)
    return {"lower": out.lower, "upper": out.upper, "witness": out.witness, "stats": {"probe": True}}


def test_added_width_method_runs_through_the_dispatcher():
    register_method(Method("width", "probe-search", "exact", "the exact search as an added method",
                           function=_width_by_search_only))
    try:
        r = _call("width", method="probe-search")
    finally:
        unregister_method("width", "probe-search")
    # the reference breadth-first search of tests/reference_width.py (independent of the solver) gives 3
    import os
    import sys

    sys.path.insert(0, os.path.dirname(__file__))
    from reference_width import reference_width
    from sweepwidth.problems.width import WidthProblem

    W = WidthProblem.build(generators.grid(3, 3), [(0, 0), (0, 1), (0, 2)], [(2, 0), (2, 1), (2, 2)])
    assert reference_width(W, 10.0) == 3.0
    assert r.method == "probe-search" and r.stats["probe"]
    assert r.status == "optimal" and r.value == 3.0
    assert r.check(generators.grid(3, 3)) == 3.0


def test_width_max_memory_must_be_a_positive_integer():
    for bad in (0, -5, 1.5, True, "1"):
        with pytest.raises(InvalidArgumentError, match="max_memory"):
            _call("width", max_memory=bad)

"""Proven bounds of homotopy height: the homology lower bound beside the constructed homotopies.

The lower bound is the homology sweep width with the same start, end and holes
(every walk of a homotopy reduces mod 2 to a homology sweep of no greater width);
the upper bound is the best homotopy built by :mod:`.construct` over several face orders
(see the package docstring of :mod:`sweepwidth.solve.homotopy`).

See Also
--------
sweepwidth.solve.homotopy.construct.construct_homotopy
sweepwidth.homology_width
"""

from __future__ import annotations

import math
import time
from typing import Any, Callable, Sequence

from ...errors import SweepwidthError
from ...problems.homotopy import HomotopyProblem
from ...result import Result
from ..contract import Deadline
from .construct import _EPS, _direction_ranks, _spectral_ranks, bfs_rank, construct_homotopy

__all__ = ["homotopy_bounds"]

#: share of the time limit given to the homology lower bound in 'bounds' (it runs beside the constructions)
HOMOLOGY_SHARE = 0.6
#: the homology solver is asked for this share of its budget (its set-up time
#: comes on top, whatever the limit: benchmarks/NOTES.md)
HOMOLOGY_ASK = 0.25
#: window of the windowed orders, in units of sqrt(number of faces)
WINDOW_FACTOR = 2.0
#: up to this many faces every order is also tried strictly (without a window)
SMALL_FACES = 2000
#: up to this many sweepable faces the homology bound runs in this process
#: (starting a child process costs more than the bound there: benchmarks/NOTES.md)
HOMOLOGY_INPROCESS_FACES = 200
#: homology budget (s) when no time limit is given
HOMOLOGY_DEFAULT_BUDGET = 8.0


# ====================================================================== bounds
def _z2(darts: Sequence[int]) -> set[int]:
    out: set[int] = set()
    for d in darts:
        out ^= {d >> 1}
    return out


def _homology_child(problem: Any, monotone: bool, limit: float, *, progress: Callable) -> Result:
    """In a child process: the homology bound of a built problem (it crossed pickled, once)."""
    from ..homology import solve_problem

    return solve_problem(problem, deadline=Deadline.from_limit(limit), monotone=monotone)


def _homology_lower(
    H: HomotopyProblem, budget: float, hard_deadline: float | None = None
) -> tuple[float | None, dict, list | None]:
    """Homology width with the same start/end/holes as a lower bound (closed curves).

    With ``hard_deadline`` (and more than ``HOMOLOGY_INPROCESS_FACES`` faces)
    the homology solver runs in a child process killed then; it is asked for ``HOMOLOGY_ASK * budget`` seconds because its
    set-up time comes on top of its time limit.
    """
    info: dict = {}
    if not H.closed:
        info["homology"] = "not used: the homology sweep is defined for cycles, these are paths"
        return None, info, None
    from ...problems.cycles import HomologyProblem
    from ..homology import solve_problem as solve_homology

    P = H.graph
    if H.length == "vertices":
        P = P.with_weights([1.0] * P.number_of_edges())
    z0 = _z2(H.start.darts)
    z1 = _z2(H.end.darts) if H.end is not None else set()
    # Face orders (monotone sweeps) are optimal among all Z2 sweeps only when the width is a
    # cut function of the swept set (Brightwell-Winkler): from the outer boundary to nothing
    # with the outer face the only hole.  Otherwise a homotopy's reduction may toggle a face
    # twice and beat every face order, so only the non-monotone width is a lower bound.
    # (A monotone homotopy flips each face at most once: its reduction is a face order.)
    disk = H.monotone or ((not z1) and H.holes == frozenset({H.graph.outer_face}) and z0 == set(
        H.graph.face_boundary_cycle(H.graph.outer_face)))
    limit = max(budget * HOMOLOGY_ASK, 0.3)
    info["homology_monotone"] = disk
    try:
        problem = HomologyProblem.build(P, z0, z1, sorted(H.holes))
        if hard_deadline is None or len(H.sweepable_faces) <= HOMOLOGY_INPROCESS_FACES:
            r = solve_homology(problem, deadline=Deadline.from_limit(limit), monotone=disk)
        else:
            from .._deadline import run_limited

            done, r, _ = run_limited(_homology_child, (problem, disk, limit), deadline=hard_deadline)
            if not done:
                info["homology"] = "stopped at its time budget without a result"
                return None, info, None
    except SweepwidthError as err:
        info["homology"] = f"failed: {err}"
        return None, info, None
    info["homology"] = {"status": r.status, "lower": r.lower, "upper": r.upper, "method": r.method,
                        "seconds": round(r.seconds, 3)}
    if r.status == "infeasible" or r.lower is None:
        return None, info, None
    order = list(r.witness) if (disk and isinstance(r.witness, (list, tuple))) else None
    return float(r.lower), info, order


def homotopy_bounds(
    problem: HomotopyProblem,
    *,
    deadline: float | None = None,
    seed: int | None = None,
    homology_budget: float | None = None,
    hard_deadline: float | None = None,
    homology: tuple[float | None, dict, list | None] | None = None,
) -> dict:
    """Proven lower bound, best constructed homotopy and how each was obtained.

    Parameters
    ----------
    problem : HomotopyProblem
    deadline : float, optional
        ``time.monotonic()`` value for the whole computation.
    seed : int, optional
        Adds a breadth-first order with random tie-breaking.
    homology_budget : float, optional
        Seconds for the homology lower bound (default: a share of the time left).
    hard_deadline : float, optional
        Until no homotopy is built, constructions may run until this later
        deadline (so that a short time limit still ends with a witness).
    homology : (lower, info, face order), optional
        A homology result computed elsewhere (by :func:`sweepwidth.solve_parameters`):
        its lower bound must be one for this homotopy problem (the
        non-monotone width, or the monotone width from the outer boundary to
        a point) and its face order is tried as a construction order.  The
        homology bound is then not computed again.

    Returns
    -------
    dict
        ``lower``, ``upper`` (None if no homotopy was built), ``witness``,
        ``bounds`` (sources), ``orders`` (height per face order tried), ``homology``.

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> b = homotopy_bounds(HomotopyProblem.build(wheel(5)))
    >>> b["lower"] <= b["upper"]
    True
    """
    import threading

    H = problem
    t0 = time.monotonic()
    left = None if deadline is None else deadline - t0
    if homology_budget is None:
        homology_budget = HOMOLOGY_DEFAULT_BUDGET if left is None else max(0.2, HOMOLOGY_SHARE * left)
    trivial = max(H.length_of(H.start), H.length_of(H.end) if H.end is not None else 0.0)
    lower = trivial
    sources = {"lower": "length of the start and end curves"}
    # the homology bound: in a time-limited child, beside the constructions
    hom: dict = {}

    def run_homology() -> None:
        hard = None if deadline is None else min(deadline - 0.3, t0 + homology_budget)
        try:
            hom["result"] = _homology_lower(H, homology_budget, hard)
        except Exception as err:  # a child that cannot start (e.g. unguarded __main__): no bound
            hom["result"] = (None, {"homology": f"failed: {type(err).__name__}: {err}"}, None)

    worker = None
    if homology is not None:
        hom["result"] = homology
    elif deadline is None:
        run_homology()
    else:
        worker = threading.Thread(target=run_homology, daemon=True)
        worker.start()
    F = H.n_faces
    bfs = bfs_rank(H)
    # (name, rank, greedy, window); windows of 2 sqrt(F) faces beat strict orders on
    # Delaunay disks (benchmarks/homotopy_bounds.py); strict orders are kept on small inputs
    win = max(2, round(WINDOW_FACTOR * math.sqrt(F)))
    small = F <= SMALL_FACES
    orders: list[tuple[str, Any, bool, int]] = []
    geo = [(f"spectral order of the dual ({'+-'[k]})", rank) for k, rank in enumerate(_spectral_ranks(H))]
    angles = (0, 45, 90, 135) if small else (0, 90)
    geo += [(f"straight sweep of the drawing at {ang:g} degrees", rank) for ang, rank in _direction_ranks(H, angles)]
    if geo:  # the fastest reliable one first: a witness early under short time limits
        orders.append((geo[0][0], geo[0][1], False, 0))
    for name, rank in geo:
        orders.append((f"{name}, window {win}", rank, False, win))
    orders.append(("greedy by length", bfs, True, 0))
    orders.append(("homology order", None, False, 0))
    if small:
        for name, rank in geo[1:]:
            orders.append((name, rank, False, 0))
        orders.append(("homology order, window", None, False, win))
    orders.append(("breadth-first from the holes", bfs, False, 0))
    if seed is not None:
        orders.append((f"greedy, random breadth-first ties (seed {seed})", bfs_rank(H, seed), True, 0))
    best: tuple[float, dict] | None = None
    best_name = None
    tried: dict = {}
    modes = [H.simple]
    if not H.simple and not H.spikes:
        modes.append(True)  # peeling needs no spikes
    for name, rank, greedy, window in orders:
        if rank is None:  # the homology witness order, once the homology bound is in
            if worker is not None:
                worker.join(None if deadline is None else max(0.0, deadline - time.monotonic()))
            horder = hom.get("result", (None, {}, None))[2]
            if not horder:
                tried[name] = "not available"
                continue
            rank = [float(F + f) for f in range(F)]
            for k, f in enumerate(horder):
                if isinstance(f, int) and 0 <= f < F and rank[f] >= F:
                    rank[f] = float(k)
        for simple in modes:
            label = name + (" (peeling)" if simple and not H.simple else "")
            if best is not None and best[0] <= trivial + _EPS:
                tried[label] = "skipped (the best one meets the lower bound)"
                continue
            until = deadline
            if best is None and hard_deadline is not None and deadline is not None:
                until = max(deadline, hard_deadline)
            if until is not None and time.monotonic() > until:
                tried[label] = "skipped (time limit)"
                continue
            got = construct_homotopy(H, rank, greedy=greedy, simple=simple, deadline=until, window=window)
            if got is None:
                stopped = until is not None and time.monotonic() > until
                tried[label] = "stopped (time limit)" if stopped else "no homotopy from this order"
            else:
                tried[label] = got[0]
            if got is not None and (best is None or got[0] < best[0] - _EPS):
                best, best_name = got, label
    if worker is not None:
        worker.join(None if deadline is None else max(0.0, deadline - time.monotonic()))
    hl, info, _ = hom.get("result", (None, {"homology": "still running at the time limit"}, None))
    if "homology_monotone" in info and isinstance(info.get("homology"), dict):
        info["homology"]["monotone"] = info["homology_monotone"]
    if hl is not None:
        extra = 1.0 if (H.length == "vertices" and not H.closed) else 0.0
        if hl + extra > lower:
            lower = hl + extra
            sources["lower"] = "homology sweep width (reduce every walk mod 2)"
    if best is not None:
        sources["upper"] = f"constructed homotopy ({best_name})"
    else:
        sources["upper"] = "no homotopy constructed"
    return {
        "lower": lower,
        "upper": None if best is None else best[0],
        "witness": None if best is None else best[1],
        "bounds": sources,
        "orders": tried,
        "homology": info.get("homology"),
        "seconds": time.monotonic() - t0,
    }


"""The homology sweep width of a plane graph: Z2 sweeps, face by face.

Definition
----------
Let ``P`` be a plane graph with edge weights, ``c0`` and ``c1`` Z2 cycles
(edge sets with even degree at every vertex) and ``H`` a set of *hole*
faces (default: the outer face).  A *homology sweep* from ``c0`` to ``c1``
lists the faces of a set ``S`` disjoint from ``H`` with ``dS = c0 + c1``
(``dS``: the edges with a face of ``S`` on exactly one side) in some order
``f_1, ..., f_s``; the cycle after ``i`` steps is
``c_i = c0 + d{f_1..f_i}`` and the width of the sweep is the largest weight
of ``c_0, ..., c_s``.  The *homology sweep width* is the least width.  When
no such ``S`` exists (holes on both sides of ``c0 + c1``) the start and end
are not homologous in the complement of the holes and the answer is
'infeasible'.  Without holes there are two choices of ``S`` (complements);
both are solved and the better one wins.

From the outer boundary of a disk to nothing (the default), ``S`` is the set
of inner faces and the width is the cutwidth of the dual graph with the outer
face's dual vertex pinned first.  In general the weight of ``c0 + dT`` for
``T`` a subset of ``S`` is a constant plus a pinned cut in a small graph on
``S`` (:class:`~sweepwidth.problems.cycles.FaceSweep`): faces that leave the
swept region hang on a vertex pinned first, faces that join it on a vertex
pinned last.  Such sweeps are called *nested* here (``stats['nested']``);
they include ``A`` inside ``B`` for ``c0 = dA``, ``c1 = dB`` (an annulus) and
overlapping regions whose boundaries share no edge.  The exception is a
*crossing* sweep: some edge of ``c0`` has faces of ``S`` on both sides (the
regions ``A - B`` and ``B - A`` touch along it), and that edge is present
while both or neither of its faces are toggled, which is no cut.

A *non-monotone* sweep may toggle faces several times (any path of face sets
from the empty set to ``S``); ``monotone=False`` computes the least width of
those.  The face sets ``X`` (``c0 + dT = dX``) form a Boolean lattice on the
non-hole faces, on which the weight of ``dX`` is submodular; Brightwell and
Winkler's submodular percolation theorem concerns paths from the bottom to
the top of it, so it shows that toggling twice never helps when the sweep
covers every non-hole face starting from a cycle that bounds all or none of
them (from a disk's boundary to nothing; from the outer to the inner
boundary of an annulus).  Between interior curves it can help, even in the
nested case (``tests/test_homology.py`` pins a six-face example: monotone
width 6, non-monotone 5).

Methods
-------
=============  ============================================================
'auto'         per swept set: nothing to sweep -> trivial; nested with at
               most ``dp_limit`` (16) faces -> 'subset-dp'; nested -> 'dual-cutwidth';
               crossing and the subset tables fit the memory and time ->
               'subset-dp'; crossing otherwise -> 'dual-cutwidth' (bounded).
               ``monotone=False`` -> 'face-sets'.
'cutwidth'     the reduction to pinned cutwidth, solved by
               :func:`sweepwidth.cutwidth` (the cutwidth engine) under the
               time limit; exact for nested sweeps.  For crossing sweeps the
               engine solves the relaxation without the crossing edges
               (a lower bound) and its ordering, re-evaluated exactly, and a
               greedy sweep give the upper bound.
'subset-dp'    exact monotone subset DP over ``2^|S|`` face sets
               (:func:`~sweepwidth.solve.homology.face_sets.monotone_sweep`).
'face-sets'    exact non-monotone search over ``2^(faces - holes)`` toggle
               states (:func:`~sweepwidth.solve.homology.face_sets.toggle_search`);
               above its size limit a bottom-to-top sweep is answered by
               the monotone methods (equal by Brightwell and Winkler).
=============  ============================================================

Homotopy witnesses
------------------
Every homotopy of the same curves reduces mod 2 to a toggle sequence no
wider than its height (:func:`sweepwidth.project_homotopy`);
:func:`sweepwidth.solve_parameters` uses that projection as an upper bound
here when it is better (as a face order read off it when one is no wider,
else as a non-monotone witness, which from a disk's boundary is the same
width by Brightwell and Winkler).

Performance
-----------
Measured by ``benchmarks/_homology_rows.py``; the last run is in
``benchmarks/NOTES.md``.

References
----------
.. [1] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J.
   Discrete Math. 23(3), 2009.
.. [2] E. W. Chambers, G. R. Chambers, A. de Mesmay, T. Ophelders and
   R. Rotman, "Constructing monotone homotopies and sweepouts", J. Geom.
   Anal. 31, 2021 (arXiv 1704.06175).
.. [3] F. Gavril, "Some NP-complete problems on graphs", Proc. 11th Conf.
   on Information Sciences and Systems, 1977 (cutwidth is NP-hard).
"""

from __future__ import annotations

import math
import numbers
import time
from typing import Any, Callable

from ...errors import InvalidArgumentError, ProblemTooLargeError, SweepwidthError, UnsupportedOptionError
from ...problems.cycles import FaceSweep, HomologyProblem, bounded_face_sets, cycle_weight
from ...result import Result
from ..contract import Deadline, builtin_names, check_seed, get_method, make_result, method_label, methods, resolve_weight
from .face_sets import (
    MAX_MONOTONE_FACES,
    MAX_TABLE_BYTES,
    MAX_TOGGLE_FACES,
    estimate_seconds,
    greedy_sweep,
    improve_sweep,
    monotone_sweep,
    toggle_search,
)

__all__ = ["homology_width", "solve_problem", "validate_arguments", "refine_face_order", "METHODS", "OPTIONS"]

#: the built-in method names (from the method registry, :mod:`sweepwidth.solve.contract`)
METHODS = tuple(sorted(builtin_names("homology"), key=list(methods("homology")).index))

#: extra keyword options and what they do
OPTIONS = {
    "dp_limit": "'auto' uses the subset DP for nested sweeps of at most this many faces (default 16)",
    "max_faces": "largest face count for 'subset-dp' / 'face-sets' (defaults: module limits)",
    "cutwidth_method": "method passed to sweepwidth.cutwidth (default 'auto')",
}

assert all(set(m.options) <= set(OPTIONS) for m in methods("homology").values() if m.function is None)

_DP_LIMIT = 16
_EPS = 1e-9


def _close(a: float, b: float) -> bool:
    return abs(a - b) <= _EPS * max(1.0, abs(a), abs(b))


def _left(deadline: float | None) -> float:
    return math.inf if deadline is None else deadline - time.monotonic()


def _validate(method: Any, monotone: Any, options: dict) -> None:
    entry = get_method("homology", method)
    if entry.function is not None:
        return  # an added method checks its own options
    if not isinstance(monotone, bool):
        raise InvalidArgumentError(f"monotone must be True or False, got {monotone!r}")
    for k in options:
        if k not in OPTIONS:
            raise UnsupportedOptionError("homology_width option", k, sorted(OPTIONS))
    if not monotone and method not in ("auto", "face-sets"):
        raise InvalidArgumentError(
            f"method {method!r} sweeps each face once; use method='face-sets' (or 'auto') with monotone=False"
        )
    for k in ("dp_limit", "max_faces"):
        if k in options:
            v = options[k]
            if isinstance(v, bool) or not isinstance(v, numbers.Integral) or v < 0:
                raise InvalidArgumentError(f"{k} must be a non-negative integer, got {v!r}")


def validate_arguments(method: Any, monotone: Any, options: dict) -> None:
    """Check a method name, the ``monotone`` flag and the options as :func:`homology_width` does.

    Raises
    ------
    UnsupportedOptionError
        An unknown method or option.
    SweepwidthError
        A ``monotone`` that is not a bool, a method that cannot honour it, a bad option value.
    """
    _validate(method, monotone, options)


class _Outcome:
    """Bounds and a face order for one swept set."""

    __slots__ = ("lower", "upper", "order", "method", "info")

    def __init__(self, lower: float, upper: float, order: list[int], method: str, info: dict) -> None:
        self.lower = min(lower, upper)
        self.upper = upper
        self.order = order
        self.method = method
        self.info = info


def _by_cutwidth(fs: FaceSweep, deadline: float | None, seed: int | None, floor: float, options: dict) -> _Outcome:
    """Reduce to the cutwidth engine (exact for nested sweeps, a relaxation otherwise)."""
    nested = fs.nested
    info: dict[str, Any] = {"nested": nested}
    # the greedy sweep is only a fallback witness: a small share, so that the cutwidth engine gets
    # about the time a direct call would (benchmarks/NOTES.md, issue 11 measurements)
    share = None if deadline is None else time.monotonic() + min(0.5, 0.02 * max(0.0, _left(deadline)))
    gw, gorder = greedy_sweep(fs, seed=seed, deadline=share)
    info["greedy_width"] = gw
    left = _left(deadline)
    if left <= 0.05:
        info["bounds"] = {"lower": "weights of start and end", "upper": "greedy sweep"}
        info["cutwidth"] = "skipped: no time left"
        return _Outcome(floor, gw, gorder, "dual-cutwidth", info)
    G, first, last = fs.ordering_graph(drop_anti=not nested)
    up_how = "greedy sweep"
    if gw <= floor + _EPS * max(1.0, floor):
        info["bounds"] = {"lower": "weights of start and end", "upper": "greedy sweep (meets the lower bound)"}
        return _Outcome(floor, gw, gorder, "dual-cutwidth", info)
    kw = {"weight": "weight", "seed": seed, "method": options.get("cutwidth_method", "auto")}
    r = _run_engine(G, first, last, kw, deadline, info)
    if r is None:
        # the engine did not report in time: cheap bounds of the same reduction, heuristic order
        lb = _quick_lower(G, first, last)
        info["bounds"] = {
            "lower": "degree/pin bounds of the pinned reduction + constant" + ("" if nested else " (relaxed)"),
            "upper": up_how,
        }
        return _Outcome(max(floor, fs.const + lb), gw, gorder, "dual-cutwidth", info)
    order = [v for v in r.witness if v != first and v != last]
    prof = fs.profile(order)
    width = max(prof)
    lower = floor
    if r.lower is not None:
        lower = max(lower, fs.const + float(r.lower))
    info["cutwidth"] = {
        "status": r.status,
        "lower": r.lower,
        "upper": r.upper,
        "method": r.method,
        "seconds": round(r.seconds, 4),
        "vertices": G.number_of_nodes(),
        "edges": G.number_of_edges(),
        "constant": fs.const,
    }
    if nested and r.upper is not None and not _close(width, fs.const + float(r.upper)):  # pragma: no cover
        # should not happen; the re-evaluated width is the truth for the witness
        info["note"] = f"engine ordering re-evaluates to {width} instead of {fs.const + float(r.upper)}"
    if gw < width - _EPS:
        width, order = gw, gorder
    else:
        up_how = "cutwidth engine ordering" + ("" if nested else " (re-evaluated with the crossing edges)")
    if not nested and width > lower + _EPS:
        # the engine optimised the relaxation: polish its order on the true (crossing) weights
        left = _left(deadline)
        budget = 2.0 if deadline is None else min(2.0, 0.5 * max(0.0, left))
        if budget > 0.05:
            iw, iorder = improve_sweep(fs, order, deadline=time.monotonic() + budget)
            if iw < width - _EPS:
                width, order, up_how = iw, iorder, up_how + ", then local search on the true weights"
    if r.lower is not None and fs.const + float(r.lower) >= floor:
        low_how = "cutwidth engine lower bound + constant" + ("" if nested else " (relaxation without the crossing edges)")
    else:
        low_how = "weights of start and end"
    info["bounds"] = {"lower": low_how, "upper": up_how}
    return _Outcome(lower, width, order, "dual-cutwidth", info)


def _run_engine(G: Any, first: Any, last: Any, kw: dict, deadline: float | None, info: dict) -> Result | None:
    """Call the cutwidth engine under the time left; None when no time is left for it.

    Under a deadline the engine's SAT stage runs with ``hard_deadline`` (a
    child process killed at the deadline, whose progress reports survive the
    kill); the engine's other stages check the deadline themselves.  In a
    process that may not start children (for instance inside another
    time-limited child) the engine runs without that option.
    """
    from ...problems.ordering import OrderingProblem
    from ..ordering import kernels
    from ..ordering import solve_problem as solve_ordering

    # the compiled kernels load (or compile) on first use: do it before the engine's time checks
    # (a direct cutwidth() call does the same)
    kernels.warm_up()
    Q = OrderingProblem.from_graph(G, weight=kw["weight"], first=[first], last=[last])
    options: dict[str, Any] = {}

    def run(dl: Deadline) -> Result:
        return solve_ordering(Q, method=kw["method"], deadline=dl, seed=kw["seed"], options=options, weight_label=kw["weight"])

    if deadline is None:
        return run(Deadline.at_time(None))
    outer = Deadline.at_time(deadline)
    left = outer.remaining()
    if left <= 0.1:
        info["cutwidth"] = "skipped: no time left"
        return None
    sub = outer.within(max(0.05, left - 0.3))  # room for the engine's overrun (about 0.2 s measured)
    import multiprocessing

    if kw.get("method", "auto") in ("auto", "sat") and not multiprocessing.current_process().daemon:
        # (a daemonic process, e.g. another time-limited child, may not start children)
        options["sat_options"] = {"hard_deadline": True}
    try:
        return run(sub)
    except (AssertionError, OSError, RuntimeError) as err:
        # e.g. "daemonic processes are not allowed to have children"
        info["cutwidth_child"] = f"{type(err).__name__}: {err}; ran without a child process instead"
        options.pop("sat_options", None)
        left = outer.remaining()
        if left <= 0.1:
            return None
        return run(outer.within(max(0.05, left - 0.1)))


def refine_face_order(problem: HomologyProblem, order: list[int], lower: float, *, deadline: Deadline,
                      seed: int | None = None, search_share: float = 0.5) -> tuple[float, float, list[int], dict] | None:
    """Improve a monotone homology result by continuing its cutwidth engine from it.

    For a problem with one swept face set whose sweep is nested (the
    reduction to pinned cutwidth is exact), ``order`` (a face order sweeping
    that set) and ``lower`` (a proven bound) go to
    :func:`sweepwidth.solve.ordering.refine_ordering`: the kick search from
    the order, then the prefix-set search from the bound.  Used by
    :func:`sweepwidth.solve_parameters` with the time the pair has left.

    Returns
    -------
    (lower, upper, order, info) or None
        Proven lower bound, width of the returned face order (never above the
        given one's), the order, and the engine's stats; None when the problem
        does not fit (several swept sets, a crossing sweep, an order of other faces).

    Examples
    --------
    >>> import time
    >>> from sweepwidth import generators
    >>> from sweepwidth.problems.cycles import HomologyProblem
    >>> P = generators.grid(3, 3)
    >>> Q = HomologyProblem.build(P, set(P.face_boundary_cycle(P.outer_face)), set(), [P.outer_face])
    >>> faces = sorted(Q.swept[0])
    >>> lo, up, o, info = refine_face_order(Q, faces, 0.0, deadline=Deadline.from_limit(2))
    >>> lo <= up and sorted(o) == faces
    True
    """
    from ...problems.ordering import OrderingProblem
    from ..ordering import kernels
    from ..ordering import refine_ordering

    if len(problem.swept) != 1 or frozenset(order) != problem.swept[0] or len(order) != len(problem.swept[0]):
        return None
    fs = FaceSweep.build(problem.graph, problem.start, problem.swept[0])
    if not fs.nested:
        return None
    kernels.warm_up()
    G, first, last = fs.ordering_graph()
    Q = OrderingProblem.from_graph(G, weight="weight", first=[first], last=[last])
    index = {lab: i for i, lab in enumerate(Q.labels)}
    q_order = [index[first]] + [index[f] for f in order] + [index[last]]
    at = deadline.at if deadline.at is not None else time.monotonic() + 10.0
    lo, up, q_new, st = refine_ordering(Q, q_order, lower=max(0.0, float(lower) - fs.const), deadline=at,
                                        seed=seed, search_share=search_share)
    new = [Q.labels[v] for v in q_new if v != index[first] and v != index[last]]
    width = max(fs.profile(new))
    old = max(fs.profile(order))
    if width > old + _EPS:  # pragma: no cover - the engine never returns a wider ordering
        new, width = list(order), old
    return max(float(lower), fs.const + lo), width, new, st


def _quick_lower(G: Any, first: Any, last: Any) -> float:
    from ...problems.ordering import OrderingProblem
    from ..ordering.bounds import lower_bounds

    try:
        b = lower_bounds(OrderingProblem.from_graph(G, first=[first], last=[last]), deadline=time.monotonic())
    except SweepwidthError:  # pragma: no cover - defensive
        return 0.0
    return max(b.values()) if b else 0.0


def _by_dp(fs: FaceSweep, max_faces: int | None) -> _Outcome:
    w, order = monotone_sweep(fs, max_faces=max_faces)
    return _Outcome(w, w, order, "subset-dp", {"nested": fs.nested, "states": 2**fs.k, "bounds": "exact subset DP"})


def _solve_swept(
    problem: HomologyProblem,
    S: frozenset,
    method: str,
    deadline: float | None,
    seed: int | None,
    options: dict,
) -> tuple[_Outcome, dict]:
    P = problem.graph
    fs = FaceSweep.build(P, problem.start, S)
    floor = max(cycle_weight(P, problem.start), cycle_weight(P, problem.end))
    k = fs.k
    auto: dict[str, str] = {}
    if k == 0:
        w = fs.start_weight
        return _Outcome(w, w, [], "trivial", {"nested": True, "bounds": "nothing to sweep"}), {
            "choice": "trivial",
            "reason": "start equals end on the non-hole faces",
        }
    max_faces = options.get("max_faces")
    if method == "auto":
        dp_limit = int(options.get("dp_limit", _DP_LIMIT))
        cap = MAX_MONOTONE_FACES if max_faces is None else int(max_faces)
        fits = k <= cap and 16 * 2**k <= MAX_TABLE_BYTES and estimate_seconds(k) <= min(_left(deadline), 60.0)
        if fs.nested and k <= dp_limit and fits:
            method, auto = "subset-dp", {"choice": "subset-dp", "reason": f"nested sweep of {k} faces (<= {dp_limit})"}
        elif fs.nested:
            method, auto = "dual-cutwidth", {"choice": "dual-cutwidth", "reason": f"nested sweep of {k} faces: pinned cutwidth of the dual"}
        elif fits:
            method, auto = "subset-dp", {"choice": "subset-dp", "reason": f"crossing sweep of {k} faces: exact subset DP fits"}
        else:
            method, auto = "dual-cutwidth", {
                "choice": "dual-cutwidth",
                "reason": f"crossing sweep of {k} faces, too many for the subset DP: relaxed cutwidth bounds",
            }
    if method == "subset-dp":
        if deadline is not None and estimate_seconds(k) > _left(deadline):
            gw, gorder = greedy_sweep(fs, seed=seed)
            out = _Outcome(floor, gw, gorder, "subset-dp", {
                "nested": fs.nested,
                "subset-dp": f"skipped: estimated {estimate_seconds(k):.1f} s exceeds the time left",
                "bounds": {"lower": "weights of start and end", "upper": "greedy sweep"},
            })
            return out, auto
        return _by_dp(fs, max_faces), auto
    return _by_cutwidth(fs, deadline, seed, floor, options), auto


def _non_monotone(problem: HomologyProblem, deadline: float | None, seed: int | None, options: dict) -> tuple[float, float, list[int], dict]:
    P = problem.graph
    fs = FaceSweep.build(P, problem.start, problem.free_faces)
    max_faces = options.get("max_faces")
    cap = MAX_TOGGLE_FACES if max_faces is None else int(max_faces)
    if fs.k > cap:
        U = problem.free_faces
        bottom_to_top = any(S == U for S in problem.swept) and bool(bounded_face_sets(P, problem.start, U)[0])
        if not bottom_to_top:
            raise ProblemTooLargeError(
                f"the non-monotone search has {fs.k} free faces, more than its limit of {cap} "
                f"(2^{fs.k} states), and the sweep is not bottom-to-top (where the monotone width "
                "is the answer); use monotone=True"
            )
        # Brightwell-Winkler: from the bottom to the top of the lattice of face sets,
        # toggling twice never helps, so the monotone answer is the non-monotone one
        out, auto = _solve_swept(problem, U, "auto", deadline, seed, options)
        how = out.info.get("bounds")
        return out.lower, out.upper, list(out.order), {
            "faces": fs.k,
            "method": f"monotone {out.method} (Brightwell-Winkler)",
            "bounds": {"theorem": "Brightwell and Winkler, submodular percolation: a bottom-to-top sweep "
                                  "never gains by toggling a face twice", "monotone": how},
            "monotone_auto": auto,
        }
    floor = max(cycle_weight(P, problem.start), cycle_weight(P, problem.end))
    targets = [sorted(S) for S in problem.swept]
    if deadline is not None and estimate_seconds(fs.k, toggles=True) > 0.5:
        from .._deadline import run_limited

        finished, value, _ = run_limited(_toggle_child, (fs, targets), {}, deadline=deadline)
        if not finished:
            # any monotone sweep is a toggle sequence: the greedy one bounds from above
            best = min((greedy_sweep(FaceSweep.build(P, problem.start, S), seed=seed) for S in problem.swept), key=lambda t: t[0])
            return floor, best[0], best[1], {"face-sets": "time limit reached", "bounds": {"lower": "weights of start and end", "upper": "greedy monotone sweep"}}
        w, toggles, st = value
    else:
        w, toggles, st = toggle_search(fs, targets)
    st = dict(st)
    st["bounds"] = "exact bottleneck search over toggle states"
    return w, w, toggles, st


def _toggle_child(fs: FaceSweep, targets: list, *, progress: Callable) -> tuple:
    return toggle_search(fs, targets)


def homology_width(
    P: Any,
    *,
    start: Any = None,
    end: Any = None,
    holes: Any = None,
    method: str = "auto",
    time_limit: float | None = None,
    seed: int | None = None,
    monotone: bool = True,
    paths: bool = False,
    weight: str = "weight",
    **options: Any,
) -> Result:
    """The homology sweep width of a plane graph, exact or with proven bounds, with a witness.

    Parameters
    ----------
    P : PlaneGraph
    start, end : cycle specification, optional
        Z2 cycles as edge-id sets, vertex walks, walk dicts
        (``{"vertex": v, "darts": [...]}``) or ``{"faces": [...]}`` (see
        :mod:`sweepwidth.problems.cycles`).  Default: from the Z2 boundary of
        the outer face to the empty cycle.
    holes : collection of face ids, optional
        Faces that are never swept; default ``{P.outer_face}``; ``()`` for
        none (the sweep may then cover either side of ``start + end``).
    method : {'auto', 'dual-cutwidth' ('cutwidth', deprecated), 'subset-dp', 'face-sets'}
        See the module docstring.
    time_limit : float, optional
        Seconds; when it runs out the result is 'bounded' with the best face
        order found and proven bounds (returned within about a second).
    seed : int, optional
        Seed of the heuristics.
    monotone : bool
        True (default): each face of the swept set is toggled once (face
        orders).  False: faces may be toggled any number of times
        ('face-sets').
    paths : bool
        False (default): start and end are Z2 cycles.  True: they are open
        walks (or chains) with the same ends, such as two boundary paths
        between the same vertices; only ``start + end`` must be a cycle, and
        the weight of the moving chain is measured as before.
    weight : {'weight'}
        How the moving cycle is measured: the edge weights of ``P`` (the one
        weight keyword of the three public solvers; see
        :func:`sweepwidth.solve.contract.resolve_weight`).
    **options
        ``dp_limit``, ``max_faces``, ``cutwidth_method`` (see :data:`OPTIONS`).

    Returns
    -------
    Result
        ``parameter='homology'``; ``witness`` is the list of face ids in
        toggle order; ``stats`` holds ``start``, ``end`` (sorted edge ids),
        ``holes``, ``swept`` (the swept set), ``monotone``, ``nested``,
        ``bounds`` (how each bound was obtained) and, for 'auto', ``auto``
        (the choice and why).  ``result.check(P)`` replays the witness.
        Infeasible problems have ``status='infeasible'`` and
        ``stats['reason']``.

    Raises
    ------
    InvalidCurveError
        A start or end that is not a Z2 cycle (names the odd vertex), an edge,
        dart or vertex that does not exist, a walk that is not closed.
    UnsupportedOptionError
        Unknown method or option.
    ProblemTooLargeError
        'subset-dp' on more faces than its limit; 'face-sets' on more faces
        than its limit unless the sweep is bottom-to-top.
    SweepwidthError
        Bad holes, time limit, seed, or conflicting ``method``/``monotone``.

    Notes
    -----
    The problem is NP-hard in general (it contains cutwidth of planar graphs
    of maximum degree 3 through duality); the exact methods are exponential
    in the worst case: ``O(2^s s)`` for the subset DP on ``s`` swept faces,
    ``O(2^k k log 2^k)`` for the toggle search on ``k`` non-hole faces, and
    whatever the cutwidth engine needs on the ``s + 2``-vertex reduction.

    References
    ----------
    .. [1] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J. Discrete
       Math. 23(3), 2009.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(3, 4)                 # 2 x 3 squares, boundary of length 10
    >>> r = homology_width(P)
    >>> r.status, r.value, len(r.witness)
    ('optimal', 10.0, 6)
    >>> r.check(P)
    10.0
    >>> Q = generators.grid(4, 4)                 # 3 x 3 squares; sweep the annulus around the middle one
    >>> mid = Q.find_face([(1, 1), (1, 2), (2, 2), (2, 1)])
    >>> homology_width(Q, end={"faces": [mid]}, holes={Q.outer_face, mid}).value
    12.0
    >>> homology_width(Q, holes={Q.outer_face, mid}).status   # the hole blocks sweeping to nothing
    'infeasible'
    >>> homology_width(P, monotone=False).value   # toggling faces twice does not help here
    10.0
    """
    t0 = time.monotonic()
    dl = Deadline.from_limit(time_limit, start=t0)
    seed = check_seed(seed)
    resolve_weight("homology", weight, allowed=("weight",))
    _validate(method, monotone, options)
    if not isinstance(paths, bool):
        raise InvalidArgumentError(f"paths must be True or False, got {paths!r}")
    problem = HomologyProblem.build(P, start, end, holes, paths=paths)
    return solve_problem(problem, method=method, deadline=dl, seed=seed, monotone=monotone, options=options, started=t0)


def solve_problem(
    problem: HomologyProblem,
    *,
    method: str = "auto",
    deadline: Deadline,
    seed: int | None = None,
    monotone: bool = True,
    options: dict | None = None,
    started: float | None = None,
) -> Result:
    """Homology width of a built :class:`~sweepwidth.problems.cycles.HomologyProblem` under a :class:`Deadline`.

    The internal entry point behind :func:`homology_width` (and the homotopy
    lower bound): arguments are already checked and the deadline is passed
    down as it is.  Added methods (registered with a function) are called as
    ``fn(problem, deadline=deadline, seed=seed, monotone=monotone, **options)``
    and return a mapping (or object) with ``lower``, ``upper``, ``witness``
    (faces in toggle order) and optionally ``stats``.
    """
    t0 = time.monotonic() if started is None else started
    options = dict(options or {})
    dl = deadline
    at: float | None = dl.at  # the monotonic value for the stages below
    P = problem.graph
    entry = get_method("homology", method)
    method = entry.name  # a deprecated name resolved to the method it names
    stats: dict[str, Any] = problem.summary()
    stats["monotone"] = monotone
    stats["seed"] = seed
    w0 = cycle_weight(P, problem.start)
    w1 = cycle_weight(P, problem.end)
    stats["start_weight"] = w0
    stats["end_weight"] = w1
    if not problem.feasible:
        return make_result("homology", lower=None, upper=None, witness=None, method=method,
                           seconds=time.monotonic() - t0, stats=stats, infeasible=problem.reason)
    if entry.function is not None:
        fn = entry.load()
        out = fn(problem, deadline=dl, seed=seed, monotone=monotone, **options)  # type: ignore[misc]
        get = out.get if isinstance(out, dict) else (lambda k, d=None: getattr(out, k, d))
        stats.update(get("stats", None) or {})
        return make_result("homology", lower=max(float(get("lower", 0.0)), w0, w1), upper=get("upper"),
                           witness=list(get("witness", None) or []), method=entry.name,
                           seconds=time.monotonic() - t0, stats=stats)
    if not monotone or method == "face-sets":
        lo, up, toggles, st = _non_monotone(problem, at, seed, options)
        stats["monotone"] = False
        stats["face-sets"] = st
        stats["bounds"] = st.get("bounds")
        if method == "auto":
            stats["auto"] = {"choice": "face-sets", "reason": "monotone=False asks for the non-monotone search"}
        lo = min(max(lo, max(w0, w1)), up)
        status = "optimal" if _close(lo, up) else "bounded"
        S = _final_set(problem, toggles)
        stats["swept"] = sorted(S)
        return make_result("homology", lower=lo, upper=up, witness=list(toggles), method=method_label(method, st.get("method", "face-sets")),
                           seconds=time.monotonic() - t0, stats=stats, optimal=status == "optimal")
    outcomes = []
    for idx, S in enumerate(problem.swept):
        sub = at
        if at is not None and idx == 0 and len(problem.swept) > 1:
            sub = time.monotonic() + 0.5 * _left(at)
        out, auto = _solve_swept(problem, S, method, sub, seed, options)
        outcomes.append((S, out, auto))
    lower = min(o.lower for _, o, _ in outcomes)
    best_S, best, best_auto = min(outcomes, key=lambda t: (t[1].upper, len(t[0])))
    upper = best.upper
    lower = min(max(lower, max(w0, w1)), upper)
    status = "optimal" if _close(lower, upper) else "bounded"
    stats["swept"] = sorted(best_S)
    stats["nested"] = bool(best.info.get("nested", True))
    stats["bounds"] = best.info.get("bounds")
    stats["parts"] = [
        {"faces": len(S), "method": o.method, "lower": o.lower, "upper": o.upper, **{k: v for k, v in o.info.items() if k != "bounds"}}
        for S, o, _ in outcomes
    ]
    if method == "auto":
        stats["auto"] = best_auto
    return make_result("homology", lower=lower, upper=upper, witness=list(best.order), method=method_label(method, best.method),
                       seconds=time.monotonic() - t0, stats=stats, optimal=status == "optimal")


def _final_set(problem: HomologyProblem, toggles: list[int]) -> frozenset:
    odd: set[int] = set()
    for f in toggles:
        odd ^= {f}
    return frozenset(odd)

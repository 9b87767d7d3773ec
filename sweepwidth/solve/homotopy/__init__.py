"""Discrete homotopy height: the dispatcher.

The room: :mod:`.construct` builds homotopies (upper-bound witnesses),
:mod:`.bounds` runs the proven lower bounds beside the constructions,
:mod:`.search` is the exact search over walk states (:mod:`.walks`),
:mod:`.free_group` decides feasibility and :mod:`.projection` reduces
homotopy witnesses mod 2 to homology sweeps.

Definition
----------
A homotopy moves a closed walk (or a walk with fixed ends) of a plane graph
by face flips, spikes and unspikes (see :mod:`sweepwidth.problems.homotopy`);
its height is the largest length of a walk along it, start and end included.
The homotopy height of a problem is the least height of a homotopy from the
start curve to the end condition.

Methods
-------
'bounds'
    Lower bound: the homology sweep width with the same start, end and holes
    (:func:`sweepwidth.solve.homology.homology_width`; reducing every walk of
    a homotopy mod 2 gives a homology sweep of no greater width, so the bound
    is proved), and the lengths of the start and end curves.  The reduction
    may toggle a face more than once, so the bound is the *non-monotone*
    homology width, except from the outer boundary to a point with only the
    outer face as a hole, where face orders are optimal (Brightwell and
    Winkler) and the faster monotone width is used.  A lone call gives the
    homology bound only a share of its time, so its lower bound can be below
    what :func:`sweepwidth.homology_width` proves in the same time; solved
    together (:func:`sweepwidth.solve_parameters`) the homotopy lower bound is
    at least the homology one by construction.  (From an interior curve a
    homotopy can beat every face order: see ``test_interior_start_beats_face_orders``.)  Upper bound: an
    explicit homotopy, built by sweeping faces one at a time (below) for
    several face orders, keeping the best.
'search'
    The exact bottleneck search of :mod:`sweepwidth.solve.homotopy.search`.
'auto'
    'bounds' first; when a gap remains, the exact search (given the
    constructed homotopy as its upper bound) in the time left (without a time
    limit only up to ``AUTO_SEARCH_FACES`` sweepable faces).  When the search
    stops early its settled level is kept as the lower bound: the search is a
    bottleneck Dijkstra over walk states with keys clamped at the proven lower
    bound, so when it pops a state of key ``h`` every homotopy of height
    below ``h`` would have reached an end state earlier; none has, so the
    height is at least ``h`` (``stats['bounds']['lower']`` says "exact search
    (bottleneck levels settled)"; tested against the brute force in
    ``tests/test_joint.py``).
    ``stats['auto']`` says what ran and why.

Infeasibility
-------------
Curves are homotopic iff they are equal in the fundamental group of the
2-complex made of the graph and the non-hole faces, a free group of rank
``holes - 1`` (trivial with at most one hole).  The group is computed from a
primal spanning tree (its complement is a spanning tree of the dual); the
relator of each non-hole face eliminates the dual tree edge to its parent,
bottom-up from a root hole, so every edge gets a reduced word in the free
generators (one per non-root hole).  Closed curves are compared by cyclically
reduced words up to rotation (free homotopy = conjugacy), open curves by the
reduced word of ``start * end^-1`` (homotopy rel ends).  The variants can only
be harder: ``simple=True`` with a non-simple start or end curve is
infeasible; other variant restrictions are left to the search.

References
----------
.. [1] R. C. Lyndon and P. E. Schupp, "Combinatorial Group Theory", Springer,
   1977 (free groups, Reidemeister-Schreier / Tietze elimination, cyclic
   reduction and conjugacy).
.. [2] D. Eppstein, "Dynamic generators of topologically embedded graphs",
   SODA 2003 (tree-cotree decompositions).
.. [3] E. W. Chambers, G. R. Chambers, A. de Mesmay, T. Ophelders and
   R. Rotman, "Constructing monotone homotopies and sweepouts", J. Geom.
   Anal. 2021 (monotone sweeps from a disk boundary suffice).
.. [4] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J.
   Discrete Math. 23(3), 2009.

See Also
--------
sweepwidth.homology_width : the mod-2 lower bound.
sweepwidth.solve_parameters : homology and homotopy solved together.
sweepwidth.verify.check_homotopy : the independent replay checker.
"""

from __future__ import annotations

import pickle
import time
from typing import Any, Callable

from ...errors import InputTypeError, InvalidArgumentError, OperationError, SweepwidthError
from ...problems.homotopy import Curve, HomotopyProblem
from ...result import Result
from ..contract import Deadline, builtin_names, check_seed, get_method, make_result, method_label, methods, reject_unknown_keywords, resolve_weight
from .free_group import homotopy_classes_equal
from .bounds import homotopy_bounds
from .construct import _EPS, bfs_rank, construct_homotopy

__all__ = [
    "homotopy_height",
    "homotopy_bounds",
    "homotopy_classes_equal",
    "construct_homotopy",
    "bfs_rank",
    "METHODS",
]

#: built-in method names of :func:`homotopy_height` (from the method registry,
#: :mod:`sweepwidth.solve.contract`; the functions are in ``_METHODS``)
METHODS = tuple(sorted(builtin_names("homotopy"), key=list(methods("homotopy")).index))

#: without a time limit, 'auto' runs the exact search after the bounds only up to
#: this many sweepable faces (with a limit it always uses the time left)
AUTO_SEARCH_FACES = 40


# ====================================================================== search
def _search_here(problem: HomotopyProblem, kw: dict, *, progress: Callable) -> Any:
    from .search import search_homotopy

    return search_homotopy(problem, progress=progress, **kw)


def _run_search(H: HomotopyProblem, deadline: float | None, upper: float | None, witness: dict | None,
                lower: float | None, isolate: bool = False, max_memory: int | None = None) -> tuple[Any, str]:
    """Run the exact search; (outcome or None, note).

    By default in this process under the search's own cooperative deadline
    (starting a child would take a large share of short limits:
    ``benchmarks/NOTES.md``).  ``isolate=True``
    runs it in a child killed at the deadline instead.
    """
    from .._deadline import run_limited

    kw = {"upper": upper, "upper_witness": witness, "lower": lower, "deadline": deadline}
    if max_memory is not None:
        kw["max_memory"] = max_memory
    if deadline is None or not isolate:
        done, value, reports = run_limited(_search_here, (H, kw), deadline=None)
        return value, "finished" if deadline is None else "ran in this process under its own deadline"
    try:
        # the problem crosses to the child once, pickled as it is (no graph rebuilt there)
        done, value, reports = run_limited(_search_here, (H, kw), deadline=deadline + 0.4)
    except (RuntimeError, OSError, TypeError, AttributeError, pickle.PicklingError) as err:
        if isinstance(err, SweepwidthError):
            raise
        # no child process possible (e.g. a script without a __main__ guard)
        done, value, reports = run_limited(_search_here, (H, kw), deadline=None)
        return value, f"ran in this process ({type(err).__name__} starting a child)"
    if done:
        return value, "finished"
    if reports:
        return reports[-1], "stopped at the time limit (best reported bounds)"
    return None, "stopped at the time limit before reporting"


# ====================================================================== dispatcher
def _validate(P: Any, method: str) -> None:
    if not hasattr(P, "face_darts") or not hasattr(P, "outer_face"):
        raise InputTypeError(f"homotopy_height needs a PlaneGraph, got {type(P).__name__}")
    get_method("homotopy", method)


def _summary(H: HomotopyProblem) -> dict:
    def one(c: Curve | None) -> Any:
        if c is None:
            return "a point anywhere"
        return {"darts": len(c.darts), "length": H.length_of(c), "vertex": H.graph.label(c.vertex)}

    return {"holes": sorted(H.holes), "start": one(H.start), "end": one(H.end)}


class _State:
    """What the methods of :func:`homotopy_height` know so far (bounds, witness, notes)."""

    def __init__(self, H: HomotopyProblem, t0: float, deadline: float | None, seed: int | None,
                 stats: dict) -> None:
        self.H, self.t0, self.deadline, self.seed, self.stats = H, t0, deadline, seed, stats
        self.lower: float = max(H.length_of(H.start), H.length_of(H.end) if H.end is not None else 0.0)
        self.upper: float | None = None
        self.witness: dict | None = None
        self.bounds = {"lower": "length of the start and end curves", "upper": "none"}
        self.used = ""
        self.infeasible_reason: str | None = None
        self.max_memory: int | None = None  # None: the search's default
        self.homology: tuple[float | None, dict, list | None] | None = None  # a homology result given from outside

    @property
    def gap_open(self) -> bool:
        return self.upper is None or self.upper - self.lower > _EPS


def _method_bounds(st: _State, share: float = 1.0) -> None:
    """Proven lower bound and the best constructed homotopy (see :func:`homotopy_bounds`)."""
    sub = None if st.deadline is None else st.t0 + share * (st.deadline - st.t0)
    b = homotopy_bounds(st.H, deadline=sub, seed=st.seed, hard_deadline=st.deadline, homology=st.homology)
    st.lower, st.upper, st.witness = b["lower"], b["upper"], b["witness"]
    st.bounds = dict(b["bounds"])
    st.stats["orders"] = b["orders"]
    st.stats["homology"] = b["homology"]
    st.used = "bounds"


def _merge_search(st: _State, out: Any, note: str) -> None:
    st.stats["search"] = {"note": note, **{k: v for k, v in dict(out.stats).items()
                                           if isinstance(v, (int, float, str, bool))}}
    if out.lower is not None and out.lower > st.lower + _EPS:
        st.lower = float(out.lower)
        st.bounds["lower"] = "exact search (bottleneck levels settled)"
    if out.upper is not None and out.witness is not None and (st.upper is None or out.upper < st.upper - _EPS):
        st.upper, st.witness = float(out.upper), out.witness
        st.bounds["upper"] = "exact search witness"
    if out.optimal and out.upper is not None:
        st.lower = max(st.lower, float(out.upper))
    if out.upper is None and dict(out.stats).get("infeasible"):
        st.infeasible_reason = dict(out.stats).get("reason") or "exhaustive search: no homotopy under these rules"


def _method_search(st: _State) -> None:
    """The exact search, started from a quick constructed homotopy."""
    H, deadline = st.H, st.deadline
    quick = None if deadline is None else time.monotonic() + 0.15 * (deadline - time.monotonic())
    got = construct_homotopy(H, bfs_rank(H), greedy=True, deadline=quick)
    if got is not None:
        st.upper, st.witness = got
        st.bounds["upper"] = "constructed homotopy (greedy by length)"
    out, note = _run_search(H, deadline, st.upper, st.witness, st.lower, max_memory=st.max_memory)
    if out is None:
        raise OperationError(f"method 'search': {note}")
    reason = str(dict(out.stats).get("reason") or "")
    if not out.optimal and reason.startswith("memory limit"):
        from ...errors import ProblemTooLargeError

        raise ProblemTooLargeError(
            f"method 'search' stopped: {reason}, with bounds [{out.lower:g}, "
            f"{'none' if out.upper is None else format(out.upper, 'g')}]; raise max_memory or use method='bounds'"
        )
    st.used = "search"
    _merge_search(st, out, note)


def _method_auto(st: _State) -> None:
    """'bounds' in 60% of the time; then the exact search in the rest when a gap remains."""
    _method_bounds(st, share=0.6)
    if not st.gap_open:
        st.stats["auto"] = "the bounds met: no search needed"
        return
    nf = len(st.H.sweepable_faces)
    if st.upper is None and nf > AUTO_SEARCH_FACES:
        st.stats["auto"] = f"exact search skipped: no constructed homotopy to start from on {nf} sweepable faces"
        return
    if st.deadline is None and nf > AUTO_SEARCH_FACES:
        st.stats["auto"] = f"exact search skipped: {nf} sweepable faces > {AUTO_SEARCH_FACES} and no time limit"
        return
    if st.deadline is not None and time.monotonic() > st.deadline - 0.3:
        st.stats["auto"] = "exact search skipped: no time left"
        return
    try:
        out, note = _run_search(st.H, st.deadline, st.upper, st.witness, st.lower, max_memory=st.max_memory)
    except Exception as err:  # noqa: BLE001 - 'auto' keeps its proven bounds whatever the search does
        st.stats["auto"] = f"exact search failed ({type(err).__name__}: {err}); bounds kept"
        return
    if out is None:
        st.stats["auto"] = note
        return
    st.used = "bounds+search"
    _merge_search(st, out, note)
    st.stats["auto"] = f"exact search: {note}"


def _method_added(st: _State, fn: Callable[..., Any], name: str) -> None:
    """A registered method: ``fn(problem, deadline=Deadline, seed=seed)`` returns a mapping or object
    with ``lower``, ``upper``, ``witness`` (``{"start": walk, "moves": [...]}``) and optionally ``stats``."""
    out = fn(st.H, deadline=Deadline.at_time(st.deadline), seed=st.seed)
    get = out.get if isinstance(out, dict) else (lambda k, d=None: getattr(out, k, d))
    lower, upper = get("lower", None), get("upper", None)
    if lower is not None:
        st.lower = max(st.lower, float(lower))
    if upper is not None:
        st.upper, st.witness = float(upper), get("witness", None)
    st.stats[name] = get("stats", None) or {}
    st.bounds = {"lower": f"method {name!r}", "upper": f"method {name!r}"}
    st.used = name


#: the built-in methods of :func:`homotopy_height`, by name
_METHODS: dict[str, Callable[[_State], None]] = {
    "auto": _method_auto,
    "bounds": _method_bounds,
    "search": _method_search,
}
assert set(_METHODS) == builtin_names("homotopy"), "registry and dispatcher disagree"


@reject_unknown_keywords
def homotopy_height(
    P: Any,
    *,
    start: Any = None,
    end: Any = None,
    spikes: bool = True,
    simple: bool = False,
    monotone: bool = False,
    weight: str = "weight",
    holes: Any = None,
    s: Any = None,
    t: Any = None,
    method: str = "auto",
    time_limit: float | None = None,
    seed: int | None = None,
    length: str | None = None,
    max_memory: int | None = None,
) -> Result:
    """The discrete homotopy height of a plane graph, exact or with proven bounds, with a witness.

    A homotopy moves a closed walk (or a walk from ``s`` to ``t``) by face
    flips, spikes and unspikes; its height is the largest walk length along it.
    This computes the least height from ``start`` to the end condition.

    Parameters
    ----------
    P : PlaneGraph
    start, end : curve, optional
        Dart lists, vertex lists or ``{"vertex": v, "darts": [...]}`` (see
        :mod:`sweepwidth.problems.homotopy`).  Default: the outer boundary to a
        point anywhere; with ``s`` and ``t``: the outer boundary path from s to t
        one way to the other way.
    spikes : bool
        Allow spike and unspike moves.
    simple : bool
        Every walk but a final point must be a simple cycle (path).
    monotone : bool
        Each face flipped at most once.
    weight : {'weight', 'vertices'}
        How a walk is measured: the edge weights, or the vertices it visits
        (graph-drawing convention).  The same keyword as in
        :func:`~sweepwidth.solve.cutwidth` and :func:`~sweepwidth.solve.homology_width`.
    length : {'weight', 'vertices'}, optional
        Deprecated spelling of ``weight`` (warns with :class:`DeprecationWarning`).
    holes : collection of face ids, optional
        Faces never flipped; default ``{P.outer_face}``.
    s, t : vertex labels, optional
        Fixed ends (on the outer face) of open walks.
    method : {'auto', 'bounds', 'search'}
        See the module docstring.
    time_limit : float, optional
        Seconds; the answer comes within about a second of it ('bounded' with
        the best witness when the optimum is not proved).
    seed : int, optional
        Adds a randomised face order to the constructions.
    max_memory : int, optional
        Bytes the exact search may fill with stored walk states (default 1 GiB,
        as for the cutwidth subset DP).  'search' refuses a problem whose
        forced states alone exceed it, and raises when the limit is reached
        before the optimum is proved; 'auto' keeps the bounds reached then.

    Returns
    -------
    Result
        ``parameter='homotopy'``; ``witness = {"start": walk, "moves": [...]}``;
        ``stats`` holds ``options`` (what the checker replays against),
        ``holes``, ``start``, ``end``, ``bounds`` (how each bound was obtained),
        ``orders`` and, for 'auto', ``auto``.  Not homotopic: status
        'infeasible' with ``stats['reason']``.

    Raises
    ------
    InvalidCurveError
        A start or end that is not a walk of P, s or t off the outer face.
    UnsupportedOptionError
        Unknown method or length convention.
    SweepwidthError
        Bad holes, time limit or seed; method 'search' when it is not installed.
    ProblemTooLargeError
        Method 'search' whose stored states are estimated (before it starts)
        or counted (while it runs) above ``max_memory``.

    Notes
    -----
    'bounds' runs in O(F * L) per face order for F faces and walks of length
    at most L, plus the homology bound's budget.  'search' is exponential.

    Examples
    --------
    >>> from sweepwidth.generators import wheel
    >>> r = homotopy_height(wheel(4), method="bounds")
    >>> r.lower <= r.upper, r.check(wheel(4)) == r.upper
    (True, True)
    """
    t0 = time.monotonic()
    dl = Deadline.from_limit(time_limit, start=t0)
    seed = check_seed(seed)
    if length is None:
        weight = resolve_weight("homotopy", weight, allowed=("weight", "vertices"))
    else:
        weight = resolve_weight("homotopy", weight, allowed=("weight", "vertices"), length=length)
    _validate(P, method)
    if max_memory is not None:
        if isinstance(max_memory, bool) or not isinstance(max_memory, int) or max_memory <= 0:
            raise InvalidArgumentError(f"max_memory must be a positive number of bytes, got {max_memory!r}")
    H = HomotopyProblem.build(P, start=start, end=end, spikes=spikes, simple=simple, monotone=monotone,
                              length=weight, holes=holes, s=s, t=t)
    return solve_problem(H, method=method, deadline=dl, seed=seed, started=t0, max_memory=max_memory)


def solve_problem(H: HomotopyProblem, *, method: str = "auto", deadline: Deadline, seed: int | None = None,
                  started: float | None = None, max_memory: int | None = None,
                  homology: tuple[float | None, dict, list | None] | None = None) -> Result:
    """Homotopy height of a built :class:`~sweepwidth.problems.homotopy.HomotopyProblem` under a :class:`Deadline`.

    The internal entry point behind :func:`homotopy_height`: arguments are
    already checked and the deadline is passed down as it is.  ``homology``
    (lower bound, info, face order) is a homology result computed by the
    caller, used instead of computing the homology bound again (see
    :func:`homotopy_bounds`; :func:`sweepwidth.solve_parameters` passes it).
    """
    t0 = time.monotonic() if started is None else started
    entry = get_method("homotopy", method)
    stats: dict = {"options": H.options(), **_summary(H), "seed": seed}
    ok, reason = homotopy_classes_equal(H)
    if not ok:
        return make_result("homotopy", lower=None, upper=None, witness=None, method=method,
                           seconds=time.monotonic() - t0, stats=stats, infeasible=reason)
    stats["feasibility"] = reason
    st = _State(H, t0, deadline.at, seed, stats)
    st.max_memory = max_memory
    st.homology = homology
    if entry.function is not None:
        _method_added(st, entry.load(), entry.name)  # type: ignore[arg-type]
    else:
        _METHODS[method](st)
    lower, upper, witness, bounds, used = st.lower, st.upper, st.witness, st.bounds, st.used
    infeasible_reason = st.infeasible_reason
    stats["bounds"] = bounds
    seconds = time.monotonic() - t0
    if infeasible_reason is not None and upper is None:
        return make_result("homotopy", lower=None, upper=None, witness=None, method=used, seconds=seconds,
                           stats=stats, infeasible=infeasible_reason)
    if upper is not None and lower > upper + _EPS:  # pragma: no cover - would be a bug in a bound
        stats["warning"] = f"lower bound {lower:g} above the witness height {upper:g}: lowered to it"
        lower = upper
    if method == "auto" and isinstance(stats.get("auto"), str):
        stats["auto"] = {"choice": used, "reason": stats["auto"]}
    return make_result("homotopy", lower=lower, upper=upper, witness=witness, method=method_label(method, used),
                       seconds=seconds, stats=stats, optimal=upper is not None and upper - lower <= _EPS)

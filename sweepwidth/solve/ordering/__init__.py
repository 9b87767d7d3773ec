"""The cutwidth dispatcher: one entry point, a registry of methods, one Result.

Definition
----------
For an ordering ``v1, ..., vn`` of the vertices of a graph ``H`` with edge
weights ``w``, the cut after ``i`` vertices is the total weight of the edges
with one end among ``v1..vi`` and the other after them, and the width of the
ordering is its largest cut.  The cutwidth ``cw(H)`` is the least width.  With
a pinned first set ``A`` (last set ``B``) the orderings start with ``A`` (end
with ``B``) and only the prefixes containing all of ``A`` and none of ``B``
count: ``A`` and ``B`` behave as single merged vertices.  Loops never cross a
cut and parallel edges add up.

Methods
-------
==============  ===========================================================
'auto'          unit-weight forest -> the tree bounds and layouts
                (:mod:`.trees`), then 'bnb' from them if they differ; at
                most 16 unpinned vertices -> 'dp'; otherwise (weighted
                forests too) cheap lower bounds and a heuristic ordering
                (stop if they meet), costly bounds and local search (stop
                if they meet); above 3000 vertices the flow bound
                (:mod:`.flow`, a quarter of the time) and the kick search
                (:mod:`.local_search`) for the rest; else a 'bnb' run (40 %
                of the time left up to 64 and from 100 to 200 vertices, else
                15 % but at least 3 s; 10 s + n / 20 s without a limit), and if it does not
                finish the flow bound (20 %, stopped once it reaches the
                upper bound), up to 400 vertices the edge-isoperimetric
                level bounds (:mod:`.level_bound`, a quarter of the time
                left), the kick search (stopped once it reaches the
                lower bound; a quarter of the time and at most
                0.5 + n / 40 s before 'sat', 60 % above 400 vertices), then
                'sat' (integral weights, or rationals with a small common
                denominator, up to 400 vertices, with at least 1.5 s left)
                or 'bnb' for the rest of the time.  ``stats['auto']`` says
                what was chosen and why (``chain``: the stages run),
                ``stats['lower_bounds']`` each lower bound's value.  The
                flow-bound stage (here and in 'search') starts with the
                neighbourhood split bound (:mod:`.split_bound`, up to 2000
                vertices, at most 60 % of the stage and 10 s) when some
                vertex is heavier than the other bounds.
'dp'            subset dynamic programming (:mod:`.dp`), exact,
                ``O(2^n n)`` time and ``16 * 2^n`` bytes.
'bnb'           threshold search over prefix sets (:mod:`.bnb`),
                exact, handles real weights exactly.
'sat'           incremental SAT (:mod:`.sat`), exact, integral weights
                (rational weights are scaled by their common denominator).
'tree'          for forests: the recursive three-branch lower bound
                (exact on complete binary trees), then the prefix-set search
                from that bound, whose free-move rule places leaves at no
                cost; exact.
'heuristic'     constructions plus local search (:mod:`.heuristics`)
                and the lower bounds of :mod:`.bounds`; bounded.
'search'        as 'heuristic', then the flow bound (a quarter of the
                time) and the kick search of :mod:`.local_search` until the
                time is up or the bounds meet (without a limit
                5 s + n / 100 s); bounded.
callable        ``fn(problem, *, lower, upper, upper_order, deadline, seed,
                **options)`` (``deadline`` a :class:`~sweepwidth.solve.contract.Deadline`) returning an object with ``lower``, ``upper``,
                ``order`` (on the problem's vertex indices) and optionally
                ``optimal`` and ``stats``.
==============  ===========================================================

Disconnected graphs are solved one component at a time (the width is the
largest component width) unless a component holds both pinned ends while
other components exist: then the parts interact (the others must be swept
while the pinned one sits at some non-zero cut) and the graph is solved whole.
"""

from __future__ import annotations

import math
import numbers
import time
from typing import Any, Callable

import numpy as np

from ...errors import InvalidArgumentError, ProblemTooLargeError, SweepwidthError, UnsupportedOptionError
from ...problems.ordering import OrderingProblem
from ...result import Result
from ..contract import Deadline, builtin_names, check_options, check_seed, get_method, make_result, methods, resolve_weight
from .bnb import solve_bnb
from .bounds import lower_bounds
from .dp import DEFAULT_MAX_MEMORY, dp_estimate, solve_dp
from .heuristics import heuristic_ordering, improve_ordering
from .split_bound import split_bound

__all__ = ["cutwidth", "solve_problem", "refine_ordering", "METHODS", "OPTIONS"]

#: options accepted by ``cutwidth`` (besides the named arguments), per built-in method
#: (read from the method registry, :mod:`sweepwidth.solve.contract`)
OPTIONS: dict[str, tuple[str, ...]] = {m.name: m.options for m in methods("cutwidth").values()}

_TINY_DP = 16  # 'auto' uses the DP up to this many unpinned vertices (the search is faster above)
_SAT_MAX_N = 400  # 'auto' does not build SAT encodings (n^2 variables) above this
_BIG = 3000  # above this many vertices 'auto' only runs bounds and heuristics
_SAT_HARD_N = 1500  # method='sat' refuses larger graphs (the encoding alone would not fit)
_LEVEL_MAX_N = 400  # the level programs (n binaries each) are tried up to this size
_SPLIT_MAX_N = 2000  # the split bound's integer programs grow with n + m: not above this

Outcome = tuple[float, float, list[int], dict]  # lower, upper, order, stats


class _Part:
    """Result of one component: bounds, an ordering of its vertices, stats."""

    __slots__ = ("lower", "upper", "order", "stats", "method")

    def __init__(self, lower: float, upper: float, order: list[int], stats: dict, method: str) -> None:
        self.lower, self.upper, self.order, self.stats, self.method = lower, upper, order, stats, method


def _left(deadline: float | None) -> float:
    return math.inf if deadline is None else deadline - time.monotonic()


def _sub_deadline(deadline: float | None, seconds: float) -> float:
    end = time.monotonic() + seconds
    return end if deadline is None else min(deadline, end)


def _heuristic(P: OrderingProblem, seed: int | None, deadline: float | None, improve: bool = True, effort: int = 6, target: float | None = None) -> tuple[float, list[int], dict]:
    # the heuristic gets a fraction of the time: exact methods need the rest
    frac = 0.25 if P.n <= _BIG else 0.7  # exact methods are hopeless on big graphs
    share = frac * _left(deadline) if deadline is not None else 5.0 + P.n / 500.0
    return heuristic_ordering(P, seed=seed, deadline=_sub_deadline(deadline, share), improve=improve, effort=effort, target=target)


_SMALL = 64  # up to this many vertices the prefix-set search keeps its long first slice
# ... and from _SAT_SLOW_N to _MID vertices too: there the SAT stage spends its time building the
# order encoding (about n^2 >= 10^4 prefix variables) and proves nothing in a 30-60 s limit, while
# the prefix-set search settles one or more further thresholds in the longer slice
# (benchmarks/NOTES.md, "the lost lower-bound level"); between _SMALL and _SAT_SLOW_N the SAT
# stage pays (Les Miserables, 77 vertices) and the slice stays short
_SAT_SLOW_N = 100
_MID = 200
_CLIMB = 3  # thresholds the first prefix-set slice must settle for the search to replace SAT


def _flow_stage(P: OrderingProblem, lbs: dict[str, float], lb: float, ub: float, deadline: float | None,
                seconds: float, seed: int | None) -> float:
    """The split bound, the face-walk bound, then the concurrent-flow bound, in their share of the time.

    The neighbourhood split bound (:func:`.split_bound.split_bound`, up to
    2000 vertices, when some vertex is heavier than ``lb``) gets at most 60 %
    of ``seconds`` and 10 s; the walk bound (:func:`.carving.carving_bound`, strong on sparse planar
    graphs such as the duals of the homology reduction) gets 40 % of
    ``seconds``, the flow bound (:func:`.flow.flow_bound`) the rest; each
    stops once it reaches ``ub``.  Records the values in ``lbs['split']``,
    ``lbs['walk']`` and ``lbs['flow']``; returns the new lower bound.
    """
    from .carving import carving_bound
    from .flow import flow_bound

    if seconds <= 0.05 or lb >= ub:
        return lb
    t_end = time.monotonic() + seconds
    if P.n <= _SPLIT_MAX_N and float(P.degrees().max()) > lb + 1e-9:
        # the neighbourhood split bound first: only a vertex heavier than the bound so far can raise it
        share = min(0.6 * seconds, 10.0)  # it usually stops long before (one program on a hub graph)
        sb, sinfo = split_bound(P, deadline=_sub_deadline(deadline, share), known=lb, per_vertex=max(0.2, share / 2))
        if sinfo["tried"]:
            lbs["split"] = sb
            lb = max(lb, sb)
        if lb >= ub:
            return lb
    wb = carving_bound(P, _sub_deadline(deadline, 0.4 * seconds), upper=ub, lower=lb)
    lbs["walk"] = wb
    lb = max(lb, wb)
    rest = t_end - time.monotonic()
    if lb >= ub or rest <= 0.05:
        return lb
    fb = flow_bound(P, _sub_deadline(deadline, rest), seed=0 if seed is None else seed, target=ub)
    lbs["flow"] = fb
    return max(lb, fb)


def _search_stage(P: OrderingProblem, lb: float, ub: float, order: list[int], deadline: float | None,
                  seconds: float, seed: int | None, stats: dict[str, Any]) -> tuple[float, list[int]]:
    """The kick search from ``order`` and the constructions, in its share of the time.

    Stops once it reaches ``lb``; keeps every improvement (so the best ordering
    survives whatever stops the search), records its stats in ``stats['search']``.
    """
    from .local_search import search_orderings, start_orderings

    if seconds <= 0.05:
        return ub, order
    end = _sub_deadline(deadline, seconds)
    best: list[Any] = [ub, order]

    def keep(width: float, o: list[int]) -> None:
        if width < best[0] - 1e-12:
            best[0], best[1] = width, list(o)

    if len(P.first) <= 1 and len(P.last) <= 1 and P.n >= _SAT_SLOW_N:
        # wider beams than the heuristic stage ran, in a third of the share
        from .beam import beam_ordering

        got = beam_ordering(P, deadline=time.monotonic() + 0.33 * max(0.0, end - time.monotonic()), seed=seed,
                            min_width=1024, target=lb)
        if got is not None:
            keep(got[0], got[1])
            stats["beam"] = {"width": got[0], "runs": len(got[2]["runs"])}
            if got[0] <= lb + 1e-9:
                return float(best[0]), best[1]
    starts = [best[1]] + start_orderings(P, seed=seed, deadline=time.monotonic() + 0.1 * max(0.0, end - time.monotonic()))
    w, o, st = search_orderings(P, end, start_orders=starts, seed=seed, on_improve=keep, target=lb)
    keep(w, o)
    st = dict(st, width=best[0])
    stats["search"] = st
    return float(best[0]), best[1]


def _search_rest(P: OrderingProblem, lb: float, ub: float, order: list[int], deadline: float | None,
                 seed: int | None, stats: dict[str, Any], chain: list[str]) -> tuple[float, list[int]]:
    """The time left after the last stage, when more than a second, to :func:`_search_stage`.

    Records in ``stats['search_more']`` and ``chain``; nothing happens without a
    deadline or once the bounds meet.
    """
    if deadline is None or lb >= ub - 1e-9 or _left(deadline) <= 1.0:
        return ub, order
    more: dict[str, Any] = {}
    ub, order = _search_stage(P, lb, ub, order, deadline, _left(deadline), seed, more)
    stats["search_more"] = more
    chain.append("search")
    return ub, order

def refine_ordering(P: OrderingProblem, order: list[int], *, lower: float, deadline: float,
                    seed: int | None = None, search_share: float = 0.5) -> tuple[float, float, list[int], dict]:
    """Continue from known bounds: the kick search from ``order``, then the prefix-set search from ``lower``.

    For callers that already ran the 'auto' chain and have time left (the
    joint solve of :mod:`sweepwidth.solve.joint`): the kick search
    (:mod:`.local_search`) gets ``search_share`` of the time and stops once
    it reaches ``lower``; the prefix-set search (:mod:`.bnb`) settles the
    thresholds from ``lower`` upwards in the rest, each settled threshold a
    proven lower bound.

    Parameters
    ----------
    P : OrderingProblem
        At most one first and one last vertex.
    order : list of int
        An ordering of ``0..n-1`` (pins at the ends).
    lower : float
        A proven lower bound of the cutwidth of ``P``.
    deadline : float
        ``time.monotonic()`` value; returns within about 0.2 s of it.

    Returns
    -------
    (lower, upper, order, stats)
        ``upper`` is the width of the returned ordering (never above the given one).

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.cycle_graph(8))
    >>> lo, up, o, st = refine_ordering(P, list(range(8)), lower=0.0, deadline=time.monotonic() + 2)
    >>> lo, up
    (2.0, 2.0)
    """
    if len(P.first) > 1 or len(P.last) > 1:
        raise InvalidArgumentError("refine_ordering needs at most one first and one last vertex (contract_pins first)")
    stats: dict[str, Any] = {}
    ub = P.width(order)
    lb = float(lower)
    t0 = time.monotonic()
    if lb < ub - 1e-9:
        ub, order = _search_stage(P, lb, ub, list(order), deadline, search_share * _left(deadline), seed, stats)
    if lb < ub - 1e-9 and _left(deadline) > 0.1:
        if P.n >= _SAT_SLOW_N:
            # half of the lower-bound time for the search on the lifted graph (see 'auto')
            from .lifting import lifted_bound

            lb2, lst = lifted_bound(P, _sub_deadline(deadline, 0.5 * _left(deadline)), lower=lb, upper=ub)
            stats["lifted"] = lst
            lb = max(lb, lb2)
    if lb < ub - 1e-9 and _left(deadline) > 0.1:
        out = solve_bnb(P, lower=lb, upper=ub, upper_order=order, deadline=deadline, max_states=4_000_000)
        stats["bnb"] = dict(out.stats)
        lb, ub, order = max(lb, out.lower), out.upper, out.order
        if out.optimal:
            lb = ub
    stats["seconds"] = time.monotonic() - t0
    return min(lb, ub), ub, list(order), stats


def _dp_child(P, max_memory, *, progress=None):
    return solve_dp(P, max_memory=max_memory)


def _m_dp(P, *, lower, upper, upper_order, deadline, seed, max_memory=DEFAULT_MAX_MEMORY, **_):
    nbytes, secs = dp_estimate(P)
    if nbytes > max_memory:
        solve_dp(P, max_memory=max_memory)  # raises ProblemTooLargeError with the numbers
    if deadline is not None and secs > _left(deadline):
        raise _TooSlow(f"subset DP estimated at {secs:.1f} s, more than the {max(0.0, _left(deadline)):.1f} s left")
    if deadline is not None and secs > 0.5:
        from .._deadline import run_limited

        try:
            finished, value, _ = run_limited(_dp_child, (P, max_memory), {}, deadline=deadline)
        except (SweepwidthError, AssertionError, OSError, RuntimeError) as err:
            # the child could not start (e.g. inside a daemonic process) or died: run here instead
            finished, value = True, solve_dp(P, max_memory=max_memory)
            value[2]["child_failed"] = str(err)
        if not finished:
            raise _TooSlow("subset DP did not finish before the time limit")
        w, o, st = value
    else:
        w, o, st = solve_dp(P, max_memory=max_memory)
    return w, w, o, st


class _TooSlow(Exception):
    pass


def _m_bnb(P, *, lower, upper, upper_order, deadline, seed, max_states=4_000_000, **_):
    out = solve_bnb(P, lower=lower, upper=upper, upper_order=upper_order, deadline=deadline, max_states=max_states)
    return out.lower, out.upper, out.order, dict(out.stats)


def _m_sat(P, *, lower, upper, upper_order, deadline, seed, solver="cadical195", sat_options=None, **_):
    from .sat import solve_sat

    if P.n > _SAT_HARD_N:
        raise ProblemTooLargeError(
            f"the SAT encoding of {P.n} vertices needs about n^2 = {P.n * P.n} prefix variables "
            f"(limit {_SAT_HARD_N} vertices); use method='heuristic' or 'bnb'"
        )
    q = P.integer_scale()
    if q is None:
        raise _NeedsOther("weights are not rationals with a common denominator <= 1000")
    Q = P if q == 1 else P.scaled(q)
    lo = int(math.ceil(lower * q - 1e-6))
    up = int(round(upper * q)) if upper is not None else None
    opts = dict(sat_options or {})
    if deadline is not None and sat_options is None and _left(deadline) > 1.5:
        # a child process killed at the deadline keeps the time limit even when
        # building the encoding or one solver call takes long (starting one costs
        # up to a second on a busy machine, so not for the last moments)
        opts["hard_deadline"] = True
    sat_deadline = deadline
    if opts.get("hard_deadline") and deadline is not None:
        sat_deadline = deadline - 0.4  # the child is killed a little after its deadline
    try:
        out = solve_sat(Q, lower=lo, upper=up, upper_order=upper_order, deadline=sat_deadline, solver=solver, **opts)
    except (AssertionError, OSError, RuntimeError) as err:
        if not opts.get("hard_deadline"):
            raise
        # no child process possible here (e.g. inside a daemonic process): run in-process
        opts.pop("hard_deadline")
        out = solve_sat(Q, lower=lo, upper=up, upper_order=upper_order, deadline=deadline, solver=solver, **opts)
        out.stats["child_failed"] = f"{type(err).__name__}: {err}"
    order = out.order if out.order is not None else upper_order
    width = P.width(order)
    st = dict(out.stats)
    if q != 1:
        st["weight_scale"] = q
    lower_val = out.lower / q
    return (width if out.optimal else min(lower_val, width)), width, order, st


class _NeedsOther(Exception):
    pass


#: the built-in exact methods run after the bounds ('auto' and 'heuristic' are in ``_solve_part``)
METHODS: dict[str, Callable[..., Outcome]] = {
    "dp": _m_dp,
    "bnb": _m_bnb,
    "sat": _m_sat,
    "tree": _m_bnb,
}
assert set(METHODS) | {"auto", "heuristic", "search", "ratcatcher"} == builtin_names("cutwidth"), "registry and dispatcher disagree"


class _Named:
    """A registered method function under its registry name (its label in ``result.method``)."""

    def __init__(self, fn: Callable[..., Any], name: str) -> None:
        self.fn, self.__name__ = fn, name

    def __call__(self, *args: Any, **kwargs: Any) -> Any:
        return self.fn(*args, **kwargs)


def _resolve_method(method: Any, options: dict) -> Any:
    """A built-in name, or a callable (given, or a registered method with a function)."""
    if callable(method):
        return method
    entry = get_method("cutwidth", method)
    check_options(entry, options)
    if entry.function is not None:
        return _Named(entry.load(), entry.name)  # type: ignore[arg-type]
    return method


def _validate(options: dict) -> None:
    if "max_memory" in options:
        mm = options["max_memory"]
        if isinstance(mm, bool) or not isinstance(mm, numbers.Real) or mm <= 0:
            raise InvalidArgumentError(f"max_memory must be a positive number of bytes, got {mm!r}")
    if "solver" in options:
        from .sat import SOLVERS

        if options["solver"] not in SOLVERS:
            raise UnsupportedOptionError("SAT solver", options["solver"], list(SOLVERS))


def _solve_part(P: OrderingProblem, method: Any, deadline: float | None, seed: int | None, options: dict) -> _Part:
    """Bounds and an ordering for one (contracted) problem."""
    n = P.n
    trivial_order = sorted(P.first) + [v for v in range(n) if v not in P.first and v not in P.last] + sorted(P.last)
    if n <= 2 or P.m == 0:
        w = P.width(trivial_order)
        return _Part(w, w, trivial_order, {}, method if isinstance(method, str) else "callable")
    opts = dict(options)
    improve = opts.pop("improve", True)
    effort = opts.pop("effort", 6)
    stats: dict[str, Any] = {}
    t0 = time.monotonic()
    if method == "dp":
        try:
            lo, up, order, st = _m_dp(P, lower=0, upper=None, upper_order=None, deadline=deadline, seed=seed, **opts)
            return _Part(lo, up, order, st, "dp")
        except _TooSlow as err:
            # the time limit wins: fall back to bounds and a heuristic ordering
            p = _solve_part(P, "heuristic", deadline, seed, {})
            p.stats["dp"] = {"skipped": str(err)}
            p.method = "dp"
            return p
    if method == "tree" and not P.is_forest():
        raise InvalidArgumentError("method 'tree' needs a forest (a graph without cycles after merging parallel edges)")
    # bounds and a heuristic ordering for everything else, cheapest first:
    # stop as soon as the two meet
    name = method if isinstance(method, str) else "callable"
    lbs = lower_bounds(P, deadline=deadline, which="cheap")
    stats["lower_bounds"] = lbs
    lb = max(lbs.values(), default=0.0)
    hw, horder, hst = _heuristic(P, seed, deadline, improve=False, effort=effort, target=lb)
    stats["heuristic"] = hst
    stats["heuristic_width"] = hw
    met = lb >= hw - 1e-9
    if not met:
        more = lower_bounds(P, deadline=deadline, which="costly")
        lbs.update(more)
        lb = max(lbs.values(), default=0.0)
        met = lb >= hw - 1e-9
    if not met and improve:
        share = (0.25 if P.n <= _BIG else 0.7) * _left(deadline) if deadline is not None else 5.0 + P.n / 500.0
        better = improve_ordering(P, horder, deadline=_sub_deadline(deadline, share), seed=seed)
        wb = P.width(better)
        if wb < hw:
            hw, horder = wb, better
            hst["improved"] = True
            stats["heuristic_width"] = hw
        met = lb >= hw - 1e-9
    stats["bounds_seconds"] = time.monotonic() - t0
    if met:
        return _Part(hw, hw, horder, stats, name)
    if method == "heuristic":
        return _Part(lb, hw, horder, stats, "heuristic")
    if method == "search":
        flow_s = 0.25 * _left(deadline) if deadline is not None else 1.0 + n / 200.0
        lb = _flow_stage(P, lbs, lb, hw, deadline, flow_s, seed)
        if lb < hw - 1e-9:
            search_s = _left(deadline) if deadline is not None else 5.0 + n / 100.0
            hw, horder = _search_stage(P, lb, hw, horder, deadline, search_s, seed, stats)
        stats["bounds_seconds"] = time.monotonic() - t0
        return _Part(hw if lb >= hw - 1e-9 else lb, hw, horder, stats, "search")
    if callable(method):
        # an added method gets the Deadline object, as in every room (built-in stages take its float end)
        out = method(P, lower=lb, upper=hw, upper_order=horder, deadline=Deadline.at_time(deadline), seed=seed, **opts)
        order = list(out.order) if getattr(out, "order", None) is not None else horder
        w = P.width(order)
        if w > hw:
            order, w = horder, hw
        lower = max(lb, float(getattr(out, "lower", lb)))
        stats["callable"] = dict(getattr(out, "stats", {}) or {})
        return _Part(min(lower, w), w, order, stats, getattr(method, "__name__", "callable"))
    fn = METHODS[method]
    try:
        lo, up, order, st = fn(P, lower=lb, upper=hw, upper_order=horder, deadline=deadline, seed=seed, **opts)
    except _NeedsOther as err:
        # 'sat' on weights it cannot scale to integers: the prefix-set search is exact on them
        lo, up, order, st = _m_bnb(P, lower=lb, upper=hw, upper_order=horder, deadline=deadline, seed=seed)
        st = dict(st, fallback=f"sat: {err}; used the prefix-set search instead")
        method = "bnb"
    stats[method] = st
    return _Part(max(lb, lo) if up > lo else up, up, order, stats, method)


def _unit(P: OrderingProblem) -> bool:
    return bool(P.m) and bool(np.all(P.weights == 1.0))


def _tree_part(P: OrderingProblem, deadline: float | None, seed: int | None, max_states: int) -> _Part:
    """A unit-weight forest: the tree bounds and layouts, then the prefix-set search if they differ.

    ``stats['chain']`` lists the stages run.
    """
    from .trees import tree_cutwidth

    share = 0.3 * _left(deadline) if deadline is not None else 1.0 + P.n / 1000.0
    out = tree_cutwidth(P, _sub_deadline(deadline, share), seed=seed)
    stats: dict[str, Any] = {"lower_bounds": dict(out.stats.get("lower_bounds", {})), "tree": out.stats}
    chain = ["tree"]
    if out.optimal:
        stats["chain"] = chain
        return _Part(out.upper, out.upper, out.order, stats, "tree")
    # the prefix-set search from the tree bounds (its free-move rule places leaves at no cost)
    res = solve_bnb(P, lower=out.lower, upper=out.upper, upper_order=out.order, deadline=deadline, max_states=max_states)
    chain.append("bnb")
    stats["bnb"] = dict(res.stats)
    stats["chain"] = chain
    lo, up = max(out.lower, res.lower), res.upper
    return _Part(up if res.optimal or lo >= up - 1e-9 else lo, up, res.order, stats, "tree")


def _auto_part(P: OrderingProblem, deadline: float | None, seed: int | None, options: dict) -> _Part:
    """'auto' on one component: pick by size and structure, record why."""
    n = P.n
    opts = dict(options)
    dp_limit = int(opts.pop("dp_limit", _TINY_DP))
    max_memory = opts.pop("max_memory", DEFAULT_MAX_MEMORY)
    # an explicit max_states is the lifted search's cap too; else its table may fill max_memory
    lift_memory = None if "max_states" in opts else max_memory
    max_states = opts.pop("max_states", 4_000_000)
    solver = opts.pop("solver", "cadical195")
    sat_options = opts.pop("sat_options", None)
    improve = opts.pop("improve", True)
    if n <= 2 or P.m == 0:
        p = _solve_part(P, "bnb", deadline, seed, {})
        p.stats["auto"] = {"choice": "trivial", "reason": "at most two vertices or no edges"}
        p.method = "trivial"
        return p
    free = n - len(P.first) - len(P.last)
    forest = P.is_forest()
    if forest and _unit(P):
        p = _tree_part(P, deadline, seed, max_states)
        p.stats["auto"] = {"choice": "tree", "reason": "a unit-weight forest", "chain": p.stats.pop("chain")}
        return p
    nbytes, secs = dp_estimate(P)
    if free <= dp_limit and nbytes <= max_memory and secs <= _left(deadline):
        p = _solve_part(P, "dp", deadline, seed, {"max_memory": max_memory})
        p.stats["auto"] = {"choice": "dp", "reason": f"{free} unpinned vertices (<= {dp_limit})"}
        return p
    why: list[str] = []
    if forest:
        why.append("a weighted forest: the general methods")
    if free <= dp_limit:
        why.append(f"dp skipped: needs {nbytes / 2**20:.0f} MiB / about {secs:.1f} s")
    p = _solve_part(P, "heuristic", deadline, seed, {"improve": improve})
    stats = p.stats
    if p.lower >= p.upper - 1e-9:
        stats["auto"] = {"choice": "heuristic", "reason": "heuristic ordering meets the lower bound", "notes": why}
        p.method = "heuristic"
        return p
    lb, ub, order = p.lower, p.upper, p.order
    lbs = stats["lower_bounds"]
    chain = ["heuristic"]
    if n > _BIG:
        # exact search is hopeless: the flow bound, then the kick search for the rest
        flow_s = 0.25 * _left(deadline) if deadline is not None else 2.0 + n / 500.0
        lb = _flow_stage(P, lbs, lb, ub, deadline, flow_s, seed)
        chain.append("flow")
        if lb < ub - 1e-9:
            search_s = _left(deadline) if deadline is not None else 5.0 + n / 200.0
            ub, order = _search_stage(P, lb, ub, order, deadline, search_s, seed, stats)
            chain.append("search")
        choice = "search" if "search" in chain else "flow"
        stats["auto"] = {"choice": choice, "reason": f"{n} vertices: only bounds and searches (exact search above {_BIG} vertices is hopeless)", "chain": chain, "notes": why}
        return _Part(ub if lb >= ub - 1e-9 else lb, ub, order, stats, choice)
    from .lifting import lifted_bound

    lb_start = lb
    if n >= _SAT_SLOW_N and _left(deadline) > 1.0:
        # the prefix-set search on a smaller graph (low-degree vertices lifted away): a lower
        # bound several thresholds above what the full search settles in the same time on
        # sparse graphs such as the duals of the homology reduction
        lift_s = 0.25 * _left(deadline) if deadline is not None else 5.0 + n / 50.0
        lb2, lst = lifted_bound(P, _sub_deadline(deadline, lift_s), lower=lb, upper=ub,
                                max_states=max_states, max_memory=lift_memory)
        lbs["lifted"] = lb2
        stats["lifted"] = lst
        chain.append("lifted")
        lb = max(lb, lb2)
        if lb >= ub - 1e-9:
            stats["auto"] = {"choice": "lifted", "reason": "the lifted graph's bound met the upper bound", "chain": chain, "notes": why}
            return _Part(ub, ub, order, stats, "lifted")
    # a prefix-set search first: on sparse graphs of small width it is instant
    if deadline is None:
        slice_s = 10.0 + n / 20.0
    elif n <= _SMALL or _SAT_SLOW_N <= n <= _MID:
        slice_s = 0.4 * _left(deadline)
    else:
        slice_s = min(0.4 * _left(deadline), max(3.0, 0.15 * _left(deadline)))
    out = solve_bnb(P, lower=lb, upper=ub, upper_order=order, deadline=_sub_deadline(deadline, slice_s), max_states=min(max_states, 1_000_000))
    chain.append("bnb")
    stats["bnb"] = dict(out.stats)
    lb, ub, order = max(lb, out.lower), out.upper, out.order
    if out.optimal or lb >= ub - 1e-9:
        stats["auto"] = {"choice": "bnb", "reason": "prefix-set search finished within its slice", "chain": chain, "notes": why}
        return _Part(ub, ub, order, stats, "bnb")
    q = P.integer_scale()
    # on larger graphs the SAT stage rarely proves anything in a 30-60 s limit; when the
    # prefix-set search climbed several thresholds in its slice, it gets the rest of the
    # time instead (the duals of weighted disks: benchmarks/NOTES.md, "prefix sets over SAT")
    climbed = sum(1 for t in out.stats.get("thresholds", ()) if t < out.lower)
    if P.integral:  # levels gained since the heuristics, by the lifted bound and the slice
        climbed = max(climbed, int(round(lb - lb_start)))
    search_pays = n >= _SAT_SLOW_N and climbed >= _CLIMB
    if search_pays:
        why.append(f"sat skipped: the prefix-set search settled {climbed} thresholds in its slice")
    sat_next = q is not None and n <= _SAT_MAX_N and not search_pays
    # the exact searches did not finish: a stronger lower bound and a better
    # ordering (each stops once it meets the other bound), then the exact
    # method for the rest of the time, from the improved bounds
    if _left(deadline) > 0.5:
        flow_s = 0.2 * _left(deadline) if deadline is not None else 1.0 + n / 200.0
        lb = _flow_stage(P, lbs, lb, ub, deadline, flow_s, seed)
        chain.append("flow")
        if lb >= ub - 1e-9:
            stats["auto"] = {"choice": "flow", "reason": "the flow bound met the upper bound", "chain": chain, "notes": why}
            return _Part(ub, ub, order, stats, "flow")
    if _left(deadline) > 1.0 and n <= _LEVEL_MAX_N:
        from .level_bound import level_bound

        level_s = 0.25 * _left(deadline) if deadline is not None else 2.0 + n / 50.0
        vb, vinfo = level_bound(P, order, deadline=_sub_deadline(deadline, level_s), known=lb, target=ub)
        stats["levels"] = vinfo
        chain.append("levels")
        if vinfo["levels"]:
            lbs["levels"] = vb
            lb = max(lb, vb)
        if lb >= ub - 1e-9:
            stats["auto"] = {"choice": "levels", "reason": "an edge-isoperimetric level bound met the upper bound", "chain": chain, "notes": why}
            return _Part(ub, ub, order, stats, "levels")
    if _left(deadline) > 0.5:
        if n > _SAT_MAX_N:
            frac, cap = 0.6, math.inf  # the exact methods are hopeless here: searching pays more
        else:
            frac, cap = (0.25 if sat_next else 0.3), 0.5 + n / 40.0
        search_s = min(frac * _left(deadline), cap) if deadline is not None else 2.0 + n / 100.0
        ub, order = _search_stage(P, lb, ub, order, deadline, search_s, seed, stats)
        chain.append("search")
        if lb >= ub - 1e-9:
            stats["auto"] = {"choice": "search", "reason": "the kick search met the lower bound", "chain": chain, "notes": why}
            return _Part(ub, ub, order, stats, "search")
    if _left(deadline) <= 0.3:
        stats["auto"] = {"choice": chain[-1], "reason": "time limit reached", "chain": chain, "notes": why}
        return _Part(lb, ub, order, stats, chain[-1])
    if search_pays:
        pass
    elif q is not None and deadline is not None and _left(deadline) < 1.5:
        why.append("sat skipped: less than 1.5 s left")
    elif q is not None and n > _SAT_MAX_N:
        why.append(f"sat skipped: {n} vertices make an order encoding of about n^2 = {n * n} variables")
    elif q is not None:
        lo2, up2, o2, st = _m_sat(P, lower=lb, upper=ub, upper_order=order, deadline=deadline, seed=seed, solver=solver, sat_options=sat_options)
        chain.append("sat")
        stats["sat"] = st
        lb, ub, order = max(lb, lo2), up2, o2
        reason = "integral weights" if q == 1 else f"rational weights scaled by {q}"
        stats["auto"] = {"choice": "sat", "reason": reason + "; prefix-set search did not finish in its slice", "chain": chain, "notes": why}
        return _Part(ub if lb >= ub - 1e-9 else lb, ub, order, stats, "sat")
    else:
        why.append("sat skipped: weights are not rationals with a small common denominator")
    lifted_ahead = "lifted" in chain and not stats["lifted"].get("optimal") and lbs.get("lifted", -1.0) >= lb - 1e-9
    if lifted_ahead and deadline is not None:
        # the full search stalled at the lifted graph's bound: the lifted search climbs on,
        # unless it already stopped at its table's cap there (it would repeat the same work)
        capped = "remembered states" in str(stats["lifted"].get("bnb", {}).get("stopped", ""))
        if capped:
            why.append("lifted search not resumed: it stopped at its state cap " + str(stats["lifted"].get("max_states")))
        else:
            lb2, lst = lifted_bound(P, _sub_deadline(deadline, 0.8 * _left(deadline)), lower=lb, upper=ub,
                                    max_states=max_states, max_memory=lift_memory)
            chain.append("lifted")
            stats["lifted_more"] = lst
            lbs["lifted"] = max(lbs["lifted"], lb2)
            lb = max(lb, lb2)
        # the lifted search stopped (time share or state cap) with time left: the rest goes
        # to the upper bound rather than returning early
        ub, order = _search_rest(P, lb, ub, order, deadline, seed, stats, chain)
        choice = "search" if chain[-1] == "search" and lb >= ub - 1e-9 else "lifted"
        reason = ("the kick search met the lower bound" if choice == "search"
                  else "the search on the lifted graph settles more thresholds than the full one here")
        stats["auto"] = {"choice": choice, "reason": reason, "chain": chain, "notes": why}
        return _Part(ub if lb >= ub - 1e-9 else lb, ub, order, stats, choice)
    out = solve_bnb(P, lower=lb, upper=ub, upper_order=order, deadline=deadline, max_states=max_states)
    chain.append("bnb")
    stats["bnb_full"] = dict(out.stats)
    lb, ub, order = max(lb, out.lower), out.upper, out.order
    if not out.optimal:
        # the search stopped at its state cap with time left: the rest goes to the upper bound
        ub, order = _search_rest(P, lb, ub, order, deadline, seed, stats, chain)
        if lb >= ub - 1e-9:
            stats["auto"] = {"choice": "search", "reason": "the kick search met the lower bound", "chain": chain, "notes": why}
            return _Part(ub, ub, order, stats, "search")
    if search_pays:
        reason = "the prefix-set search climbs faster than the SAT stage starts on this graph"
    elif q is None:
        reason = "real weights: the prefix-set search is exact on them"
    elif n > _SAT_MAX_N:
        reason = "graph too large for the SAT encoding"
    else:
        reason = "too little time left to start the SAT stage"
    stats["auto"] = {"choice": "bnb", "reason": reason, "chain": chain, "notes": why}
    return _Part(ub if out.optimal else lb, ub, order, stats, "bnb")


def cutwidth(
    G: Any,
    *,
    method: str | Callable = "auto",
    time_limit: float | None = None,
    first: Any = None,
    last: Any = None,
    weight: str | Callable | None = "weight",
    seed: int | None = None,
    **options: Any,
) -> Result:
    """Cutwidth of a graph, exact or with proven bounds, with a witness ordering.

    The width of an ordering is its heaviest cut between a prefix and the
    rest; the cutwidth is the least width over all orderings (pinned variants:
    see the module docstring).

    Parameters
    ----------
    G : networkx.Graph, MultiGraph, or an object with ``to_networkx()``
        Loops are ignored, parallel edges add up, directions are dropped.
    method : str or callable
        'auto', 'dp', 'bnb', 'sat', 'tree', 'heuristic', 'search', or a callable (see the
        module docstring).
    time_limit : float, optional
        Seconds.  When it runs out the result is 'bounded' with the best
        ordering and proven bounds so far (returned within about a second).
        'dp' runs in a child process killed at the limit, and does not start
        when its time estimate exceeds the limit (bounds and a heuristic
        ordering are returned then).
    first, last : node or collection of nodes, optional
        Pinned start and end sets.
    weight : str, callable or None
        Edge attribute holding the weight (missing means 1), a function
        ``(u, v, data) -> weight``, or None for unit weights.  Weights must be
        finite and non-negative.  'dp' and 'bnb' use real weights exactly;
        'sat' needs integers and scales rationals with a common denominator up
        to 1000 (binary fractions such as 0.5 or 0.25 qualify; 0.1 does not).
    seed : int, optional
        Seed of the heuristics (results are reproducible with it).
    **options
        ``max_memory`` (bytes, DP tables; default 1 GiB), ``solver`` (python-sat
        name for 'sat'), ``sat_options`` (dict passed to the SAT engine),
        ``max_states`` (remembered sets of 'bnb'), ``improve`` (local search
        on/off), ``effort`` (heuristic constructions), ``dp_limit`` ('auto'
        uses the DP up to that many unpinned vertices, default 16).

    Returns
    -------
    Result
        ``parameter='cutwidth'``; ``witness`` is an ordering of the node labels;
        ``stats['options']`` records the pins and weight so ``result.check(G)``
        can replay it; ``stats['auto']`` explains an automatic choice.

    Raises
    ------
    UnsupportedOptionError
        Unknown method, option or SAT solver (the message lists valid ones).
    WeightError
        A negative, NaN, infinite or non-numeric weight.
    ProblemTooLargeError
        ``method='dp'`` on a problem whose tables exceed ``max_memory``.
    SweepwidthError
        Pinned vertices missing from ``G`` or pinned both first and last; a
        bad time limit or seed; 'tree' on a graph with a cycle.

    Notes
    -----
    Cutwidth is NP-hard (Gavril 1977); the exact methods are exponential in
    the worst case.  See the module docstring for what 'auto' does.

    References
    ----------
    .. [1] Bodlaender, Fomin, Koster, Kratsch and Thilikos, "A note on exact
       algorithms for vertex ordering problems on graphs", Theory of Computing
       Systems 50 (2012).

    Examples
    --------
    >>> import networkx as nx
    >>> r = cutwidth(nx.grid_2d_graph(4, 4))
    >>> r.status, r.value
    ('optimal', 5.0)
    >>> r.check(nx.grid_2d_graph(4, 4))
    5.0
    >>> cutwidth(nx.star_graph(6), first=1).value   # leaves 1, 2, 3, then the centre
    3.0
    """
    t0 = time.monotonic()
    dl = Deadline.from_limit(time_limit, start=t0)
    seed = check_seed(seed)
    weight = resolve_weight("cutwidth", weight, callable_ok=True)
    method = _resolve_method(method, options)
    _validate(options)
    from . import kernels as _kernels

    _kernels.warm_up()  # first call in a process: load compiled kernels inside the time limit
    P = OrderingProblem.from_graph(G, weight=weight, first=first, last=last)
    return solve_problem(P, method=method, deadline=dl, seed=seed, options=options, started=t0,
                         weight_label=weight if (weight is None or isinstance(weight, str)) else "<callable>")


def solve_problem(
    P: OrderingProblem,
    *,
    method: Any = "auto",
    deadline: Deadline,
    seed: int | None = None,
    options: dict | None = None,
    weight_label: Any = "weight",
    started: float | None = None,
) -> Result:
    """Cutwidth of an :class:`~sweepwidth.problems.ordering.OrderingProblem` under a :class:`Deadline`.

    The internal entry point behind :func:`cutwidth` (and the homology
    reduction): arguments are already checked, the deadline is passed down
    as it is, and the witness is in the problem's labels.
    """
    t0 = time.monotonic() if started is None else started
    options = dict(options or {})
    method = _resolve_method(method, options)
    _validate(options)
    dl = deadline
    deadline_at = dl.at
    C = P.contract_pins()
    Q = C.problem
    a = next(iter(Q.first)) if Q.first else None
    b = next(iter(Q.last)) if Q.last else None
    comps = Q.components()
    if a is not None and b is not None and len(comps) > 1:
        ca = next(c for c in comps if a in c)
        if b in ca:
            comps = [list(range(Q.n))]
    parts: list[tuple[list[int], _Part]] = []
    # biggest components last, so small ones cannot starve on the time limit
    comps.sort(key=len)
    for comp in comps:
        sub = Q if len(comp) == Q.n else Q.subproblem(comp)
        if method == "auto":
            part = _auto_part(sub, deadline_at, seed, options)
        else:
            part = _solve_part(sub, method, deadline_at, seed, options)
        parts.append((comp, part))
    # concatenate: the part with the first pin, then the free parts, then the one with the last pin
    def rank(item: tuple[list[int], _Part]) -> int:
        comp = item[0]
        if a is not None and a in comp:
            return 0
        if b is not None and b in comp:
            return 2
        return 1

    parts.sort(key=rank)
    order_q: list[int] = []
    for comp, part in parts:
        order_q.extend(comp[i] for i in part.order)
    order_p = C.expand(order_q)
    witness = [P.labels[v] for v in order_p]
    upper = P.width(order_p)
    lower = max([part.lower for _, part in parts] + [0.0])
    lower = min(lower, upper)
    optimal = all(part.lower >= part.upper - 1e-9 for _, part in parts)
    if optimal:
        lower = upper
    names = sorted({part.method for _, part in parts})
    mname = getattr(method, "__name__", "callable") if callable(method) else method
    label = mname if method != "auto" else "auto:" + "+".join(names)
    stats: dict[str, Any] = {
        "options": {
            "first": [P.labels[v] for v in sorted(P.first)] or None,
            "last": [P.labels[v] for v in sorted(P.last)] or None,
            "weight": weight_label,
        },
        "n": P.n,
        "m": P.m,
        "components": len(parts),
        "seed": seed,
    }
    if len(parts) == 1:
        stats.update(parts[0][1].stats)
    else:
        stats["parts"] = [dict(part.stats, n=len(comp), lower=part.lower, upper=part.upper) for comp, part in parts]
        if method == "auto":
            stats["auto"] = {"choice": "per component", "reason": f"{len(parts)} components solved separately", "chosen": names}
    over = dl.overran()
    if over is not None:
        stats["overran_seconds"] = over
    return make_result("cutwidth", lower=lower, upper=upper, witness=witness, method=label,
                       seconds=time.monotonic() - t0, stats=stats, optimal=optimal)

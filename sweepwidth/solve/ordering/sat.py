"""SAT search for cutwidth: "width <= k" asked of one formula tightened incrementally.

The formula (variables, clauses, counters) is built by
:mod:`sweepwidth.solve.ordering.sat_encoding`; this module runs the search.

The width of an ordering is its heaviest counted cut (with pins, only the
prefixes of sizes ``|first| .. n - |last|`` count, see
:mod:`sweepwidth.problems.ordering`); :func:`solve_sat` finds an ordering of
least width, or proven bounds when its deadline comes first.

The formula itself (prefix chain, level counts, crossing indicators,
cardinality counters, symmetry breaking) is described in
:mod:`sweepwidth.solve.ordering.sat_encoding`.

Two cheaper questions come first.  *Level probes*: is there a counted prefix
of size i with cut <= k at all?  A "no" for one i proves width > k (an
edge-isoperimetric bound decided by SAT on a formula of one level); it
settles grids and hypercubes at k = cw - 1 (e.g. no 13 vertices of Q_5 have
a boundary below 21, no 30 vertices of the 8 x 8 grid one below 9).
*Windows*: to find an ordering of width <= k, the best ordering known is
kept outside a window around its too heavy cuts and the solver reorders the
window (assumptions, small conflict budgets); only when both fail does the
full chain question run.

Pins fix position windows, so many ``x`` are constants and many crossings
cannot happen at a level; both are folded away.  Symmetry breaking (option
``symmetry``): automorphisms preserving the pins are found with VF2, the
vertex at the first free position is restricted to orbit representatives,
the next one to representatives of the orbits of the stabiliser of the
first, and without pins the reversal is broken by orbit ranks of the first
and last vertex.  Phases are set from the best ordering known.

What each idea buys is measured by ``benchmarks/cutwidth.py --ablation``;
the last table is in ``benchmarks/NOTES.md``.

References
----------
.. [1] C. Sinz, "Towards an optimal CNF encoding of Boolean cardinality
   constraints", CP 2005, LNCS 3709 (sequential counter).
.. [2] O. Bailleux and Y. Boufkhad, "Efficient CNF encoding of Boolean
   cardinality constraints", CP 2003, LNCS 2833 (totalizer).
.. [3] L. P. Cordella, P. Foggia, C. Sansone and M. Vento, "A (sub)graph
   isomorphism algorithm for matching large graphs", IEEE TPAMI 26(10), 2004
   (VF2, used through networkx for the automorphisms).
.. [4] J. Crawford, M. Ginsberg, E. Luks and A. Roy, "Symmetry-breaking
   predicates for search problems", KR 1996 (why fixing orbit
   representatives is sound).
.. [5] J. Rolim, O. Sykora and I. Vrto, "Optimal cutwidths and bisection
   widths of 2- and 3-dimensional meshes", WG 1995, LNCS 1017 (the grid
   values used in the tests).
"""

from __future__ import annotations

import time
from dataclasses import dataclass, field, replace
from typing import Any, Callable, Sequence, cast

import numpy as np

from ...errors import InputTypeError, InvalidArgumentError, OperationError, UnsupportedOptionError
from ...problems.ordering import OrderingProblem
from .._deadline import BUDGET_SOLVERS, run_limited, sat_call

from .sat_encoding import _Formula, _LevelProbe, _OutOfTime, _int_weights

__all__ = ["SatOutcome", "solve_sat", "greedy_order", "SOLVERS"]

#: Solver names accepted by :func:`solve_sat`.  kissat404 has no assumptions
#: in python-sat and is rebuilt for every bound.
SOLVERS = ("cadical195", "cadical153", "glucose4", "glucose42", "minisat22", "maplechrono", "kissat404")

_OPTIONS = {
    "direction": ("down", "up"),
    "symmetry": (True, False),
    "phases": (True, False),
    "counter": ("itot", "seq"),
    "counts": ("band", "all", "none"),
    "hard_deadline": (False, True),
    "probe": (True, False),
    "windows": (True, False),
}


@dataclass
class SatOutcome:
    """What the SAT engine proved and found.

    Attributes
    ----------
    lower : int
        Proven lower bound (from UNSAT answers, or the given lower).
    upper : int
        Width of ``order`` (or the given upper if no better order was found).
    order : list of int or None
        An ordering of ``0..n-1`` of width ``upper`` respecting the pins.
    optimal : bool
        ``lower == upper`` was proven.
    stats : dict
        ``calls`` (list of ``(k, answer, seconds, conflicts)`` for the chain
        formula), ``probes`` (list of ``(k, level or None, answer,
        seconds)``), ``vars``, ``clauses``, ``build_seconds``,
        ``load_seconds``, ``orbits``, ``solver``, ``options``, ``seconds``,
        and ``stopped`` / ``killed`` when the deadline cut the search short.
    """

    lower: int
    upper: int
    order: list[int] | None
    optimal: bool
    stats: dict = field(default_factory=dict)


# ---------------------------------------------------------------------------
# helpers on the problem


def _check_order(problem: OrderingProblem, order: Sequence[int], what: str) -> list[int]:
    order = [int(v) for v in order]
    n = problem.n
    if sorted(order) != list(range(n)):
        raise InvalidArgumentError(f"{what} is not an ordering of the vertices 0..{n - 1}")
    f, l = len(problem.first), len(problem.last)
    if set(order[:f]) != set(problem.first) or set(order[n - l:] if l else []) != set(problem.last):
        raise InvalidArgumentError(f"{what} does not respect the pinned first/last vertices")
    return order


def greedy_order(problem: OrderingProblem) -> list[int]:
    """A quick ordering respecting the pins: grow the prefix by the cheapest vertex.

    From a vertex of least degree (within the allowed window), repeatedly add
    the vertex whose entry gives the smallest next cut, ties broken towards
    more edges back into the prefix (this closes holes first).

    Parameters
    ----------
    problem : OrderingProblem

    Returns
    -------
    list of int
        An ordering of ``0..n-1`` with ``problem.first`` first and
        ``problem.last`` last.

    Notes
    -----
    O(n^2 + n m) time.  Only a starting upper bound for :func:`solve_sat`;
    the stronger heuristics live with the dispatcher.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.problems.ordering import OrderingProblem
    >>> P = OrderingProblem.from_graph(nx.path_graph(5))
    >>> P.width(greedy_order(P))
    1.0
    """
    n = problem.n
    adj = problem.neighbours()
    deg = [sum(a.values()) for a in adj]
    f, l = len(problem.first), len(problem.last)
    groups = [sorted(problem.first), sorted(set(range(n)) - problem.first - problem.last), sorted(problem.last)]
    placed = [False] * n
    back = [0.0] * n  # weight of edges into the prefix
    order: list[int] = []
    cut = 0.0
    for group in groups:
        todo = set(group)
        while todo:
            if not order or all(back[v] == 0 for v in todo):
                # start (or restart in a new component) at a least-degree vertex
                v = min(todo, key=lambda u: (deg[u] - 2 * back[u], -back[u], u))
                if not order:
                    v = min(todo, key=lambda u: (deg[u], u))
            else:
                v = min(todo, key=lambda u: (deg[u] - 2 * back[u], -back[u], u))
            todo.discard(v)
            placed[v] = True
            order.append(v)
            cut += deg[v] - 2 * back[v]
            for u, w in adj[v].items():
                if not placed[u]:
                    back[u] += w
    return order


# ---------------------------------------------------------------------------
# automorphism orbits (for symmetry breaking)


def _validate(problem: Any, lower: int, upper: int | None, solver: str, options: dict) -> dict:
    if not isinstance(problem, OrderingProblem):
        raise InputTypeError(f"solve_sat expects an OrderingProblem, got {type(problem).__name__}")
    if solver not in SOLVERS:
        raise UnsupportedOptionError("SAT solver", solver, SOLVERS)
    opts = {k: v[0] for k, v in _OPTIONS.items()}
    for k, v in options.items():
        if k == "_extra":  # experimental switches for the benchmarks
            continue
        if k not in _OPTIONS:
            raise UnsupportedOptionError("solve_sat option", k, sorted(_OPTIONS))
        if v not in _OPTIONS[k]:
            raise UnsupportedOptionError(f"value for option {k!r}", v, _OPTIONS[k])
        opts[k] = v
    if isinstance(lower, bool) or not isinstance(lower, (int, np.integer)) or lower < 0:
        raise InvalidArgumentError(f"lower must be a non-negative integer, got {lower!r}")
    if upper is not None and (isinstance(upper, bool) or not isinstance(upper, (int, np.integer))):
        raise InvalidArgumentError(f"upper must be an integer or None, got {upper!r}")
    return opts


def solve_sat(
    problem: OrderingProblem,
    *,
    lower: int = 0,
    upper: int | None = None,
    upper_order: list[int] | None = None,
    deadline: float | None = None,
    solver: str = "cadical195",
    progress: Callable[[SatOutcome], None] | None = None,
    **options: Any,
) -> SatOutcome:
    """Cutwidth by incremental SAT: prove ``lower`` up / improve ``upper`` down.

    The cutwidth of an ordering is the largest weight of edges between a
    prefix and the rest; this finds an ordering (respecting the pins) of least
    width, or bounds when ``deadline`` comes first.

    Parameters
    ----------
    problem : OrderingProblem
        Integral weights (``problem.integral``); pins and several components
        are allowed.
    lower : int
        A known lower bound (trusted).
    upper : int, optional
        A known upper bound; ``upper_order`` attains it when given.  Without
        either, :func:`greedy_order` supplies one.
    upper_order : list of int, optional
        An ordering of width ``upper`` (used as phase hints too).
    deadline : float, optional
        ``time.monotonic()`` value; the best bounds so far are returned then.
    solver : str
        A python-sat solver name from :data:`SOLVERS`.
    progress : callable, optional
        Called with a :class:`SatOutcome` after each improvement.
    **options
        ``direction`` ('down', default: ask upper-1, then below each new
        ordering, so one UNSAT answer ends the search; 'up': ask lower,
        lower+1, ...), ``symmetry`` (bool, default True), ``phases`` (bool,
        default True), ``counter`` ('itot' totalizer, default, or 'seq'
        weighted sequential counter), ``counts`` ('band' default, 'all',
        'none': where the redundant level counts go), ``hard_deadline``
        (default False; True runs the search in a child process killed at
        the deadline, for solvers or encodings where a conflict slice could
        overrun), ``probe`` (default True: before the chain formula, ask
        single levels whether a prefix of cut <= k exists at all; one "no"
        proves width > k), ``windows`` (default True: before each full
        call, reorder growing windows of the best ordering around its too
        heavy cuts under small conflict budgets, the rest fixed by
        assumptions).  ``_extra`` (dict) holds experimental switches for the
        benchmarks (``edge_order``: 'index' or 'hint'; ``exact_c``: also
        ``c -> x[u] xor x[v]``).

    Returns
    -------
    SatOutcome

    Raises
    ------
    WeightError
        Fractional weights.
    UnsupportedOptionError
        An unknown solver or option.
    SweepwidthError
        A bad ``upper_order`` (not an ordering, pins violated) or bounds.

    Notes
    -----
    The chain formula has O(n^2 + n m kmax) clauses for the order and the
    cut counters (n levels, counters of width kmax = upper - 1 over the m
    crossing indicators of each level, a weight w counting w times) plus
    O(n^3) for the level counts of the middle half, and is built once.  The
    single-level probe formula has O(n^2 + m kmax) clauses.  With a deadline
    every SAT call runs in conflict-budgeted slices
    (:func:`~sweepwidth.solve._deadline.sat_call`) and the build checks the
    clock, so the function returns within about a second of the deadline.
    Exponential in the worst case (cutwidth is NP-hard).

    See Also
    --------
    sweepwidth.solve.ordering.sat : the module docstring lists the references.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.problems.ordering import OrderingProblem
    >>> out = solve_sat(OrderingProblem.from_graph(nx.grid_2d_graph(3, 3)))
    >>> out.lower, out.upper, out.optimal
    (4, 4, True)
    """
    t_start = time.monotonic()
    opts = _validate(problem, lower, upper, solver, options)
    if opts["hard_deadline"] and deadline is not None:
        return _solve_isolated(problem, lower, upper, upper_order, deadline, solver, progress, opts)
    _int_weights(problem)
    n = problem.n
    hint = None  # ordering used for phases
    best_order = None  # ordering attaining `upper`
    if upper_order is not None:
        hint = _check_order(problem, upper_order, "upper_order")
    else:
        hint = greedy_order(problem)
    w_hint = int(round(problem.width(hint)))
    if upper is None or w_hint <= int(upper):
        upper, best_order = w_hint, hint
    upper = int(upper)
    lower = int(lower)
    stats: dict = {"solver": solver, "options": dict(opts), "calls": []}
    if lower > upper:
        raise InvalidArgumentError(f"lower bound {lower} exceeds upper bound {upper}")
    best = SatOutcome(lower, upper, best_order, lower >= upper, stats)
    if best.optimal or n <= 1:
        best.optimal = True
        best.lower = best.upper
        stats["seconds"] = time.monotonic() - t_start
        return best

    def report() -> None:
        stats["seconds"] = time.monotonic() - t_start
        if progress is not None:
            progress(replace(best, order=list(best.order) if best.order else None, stats=dict(stats)))

    def out_of_time(where: str) -> SatOutcome:
        stats["stopped"] = f"deadline reached while {where}"
        stats["seconds"] = time.monotonic() - t_start
        return best

    probe: _LevelProbe | None = None
    if opts["probe"] and opts["direction"] == "down" and solver != "kissat404":
        # the cheap single-level questions first: they often settle k = upper - 1
        probe = _LevelProbe(problem, upper - 1, solver if solver in BUDGET_SOLVERS else "cadical195", opts["symmetry"])
        if _run_probes(probe, upper - 1, deadline, stats):
            probe.close()
            best.lower = best.upper
            best.optimal = True
            report()
            stats["seconds"] = time.monotonic() - t_start
            return best

    t0 = time.monotonic()
    try:
        F = _Formula(
            problem,
            upper - 1,
            symmetry=opts["symmetry"],
            counter=opts["counter"],
            counts=opts["counts"],
            extra={"hint": hint, **(options.get("_extra") or {})},
            deadline=deadline,
        )
    except _OutOfTime:
        if probe is not None:
            probe.close()
        return out_of_time("building the formula")
    stats["build_seconds"] = time.monotonic() - t0
    stats["vars"] = F.top
    stats["clauses"] = len(F.clauses)
    stats["orbits"] = F.n_orbits

    if solver == "kissat404":
        return _search_rebuild(F, best, deadline, opts, report)

    from pysat.solvers import Solver

    with Solver(name=solver) as S:
        chunk = 100_000
        for j in range(0, len(F.clauses), chunk):
            if deadline is not None and time.monotonic() > deadline:
                return out_of_time("loading the formula")
            S.append_formula(F.clauses[j : j + chunk])
        F.clauses = []  # free memory; the solver has them
        stats["load_seconds"] = time.monotonic() - t0 - stats["build_seconds"]
        if opts["phases"]:
            S.set_phases(F.phases(F.canonical(hint)))
        while not best.optimal:
            k = best.upper - 1 if opts["direction"] == "down" else best.lower
            lits, possible = F.bound(k)
            if possible and probe is not None and k < upper - 1 and k >= best.lower:
                if _run_probes(probe, k, deadline, stats):
                    possible = False
            if not possible:
                ans: bool | None = False
            else:
                if opts["direction"] == "down":
                    for a in lits:  # permanent: never ask above k again
                        S.add_clause([a])
                    assume: list[int] = []
                else:
                    assume = lits
                ans = None
                current = best.order if best.order is not None else hint
                if opts["windows"] and current is not None:
                    ans = _window_search(S, F, F.canonical(current), k, assume, deadline, stats)
                if ans is None:
                    cs: dict = {}
                    t1 = time.monotonic()
                    ans = sat_call(S, assume, deadline=deadline, name=solver, stats=cs)
                    stats["calls"].append((k, ans, round(time.monotonic() - t1, 4), cs.get("conflicts", 0)))
            if ans is None:
                break
            if ans:
                order = F.decode(S.get_model())
                w = int(round(problem.width(order)))
                if w > k:  # pragma: no cover - would be an encoding bug
                    raise OperationError(f"internal error: SAT ordering has width {w} > {k}")
                best.order, best.upper = order, w
                if opts["phases"]:
                    S.set_phases(F.phases(F.canonical(order)))
            else:
                best.lower = k + 1
            best.optimal = best.lower >= best.upper
            report()
        if probe is not None:
            probe.close()
    if best.optimal:
        best.lower = best.upper
    stats["seconds"] = time.monotonic() - t_start
    return best


def _window_search(
    S: Any, F: _Formula, order: list[int], k: int, assume: list[int], deadline: float | None, stats: dict
) -> bool | None:
    """Look for an ordering of width <= k near ``order``: free a window, fix the rest.

    The vertices placed before the window stay in the prefix before it, those
    after it stay out; the solver reorders the window under a small conflict
    budget.  Windows grow around the levels whose cut exceeds k.  Returns
    True when the solver's model (read by the caller) has width <= k, None
    otherwise: a failed window proves nothing.
    """
    p, n = F.problem, F.n
    prof = p.cut_profile(order)
    bad = [i for i in range(1, n) if prof[i] > k + 1e-9]
    if not bad:
        return None
    lo_bad, hi_bad = min(bad), max(bad)
    t0 = time.monotonic()
    rec = stats.setdefault("windows", [])
    for pad, budget in ((4, 500), (8, 1500), (16, 4000), (32, 10000)):
        a, b = max(1, lo_bad - pad + 1), min(n, hi_bad + pad)  # free positions a..b (1-based)
        if a == 1 and b == n:
            break
        fix: list[int] = []
        feasible = True
        for j, v in enumerate(order, start=1):
            if j < a:
                lit = F.x[v][a - 1]
            elif j > b:
                lit = F.neg(F.x[v][b])
            else:
                continue
            if lit is False:  # the pins forbid this split (not for orderings that respect them)
                feasible = False
                break
            if lit is not True:
                fix.append(lit)
        if not feasible:
            continue
        if deadline is not None and time.monotonic() >= deadline:
            return None
        S.conf_budget(budget)
        res = S.solve_limited(assumptions=assume + fix)
        rec.append((k, a, b, res, round(time.monotonic() - t0, 4)))
        if res:
            return True
    return None


#: Rounds of single-level probes: (conflicts per level, levels asked at most).
_PROBE_ROUNDS = ((1000, None), (8000, 8), (32000, 4), (128000, 2))
_PROBE_CAP = 300_000  # conflicts over all rounds


def _run_probes(probe: "_LevelProbe", k: int, deadline: float | None, stats: dict) -> bool:
    """Ask single levels middle-out whether a prefix of cut <= k exists; True when one cannot.

    Rounds of growing conflict budgets over fewer and fewer levels (the
    middle ones, see :data:`_PROBE_ROUNDS`); a level answered "yes" is not
    asked again.  Work is capped at :data:`_PROBE_CAP` conflicts and 30% of
    the time left before ``deadline``.
    """
    t0 = time.monotonic()
    stop = None if deadline is None else t0 + 0.3 * max(0.0, deadline - t0)
    spent = 0
    rec = stats.setdefault("probes", [])
    open_levels = probe.levels()
    for budget, many in _PROBE_ROUNDS:
        still = []
        for j, i in enumerate(open_levels):
            if many is not None and j >= many:
                still.append(i)
                continue
            if spent >= _PROBE_CAP or (stop is not None and time.monotonic() >= stop):
                rec.append((k, None, None, round(time.monotonic() - t0, 4)))
                return False
            before = probe.S.accum_stats().get("conflicts", 0)
            ans = probe.ask(i, k, stop, min(budget, _PROBE_CAP - spent))
            spent += probe.S.accum_stats().get("conflicts", 0) - before
            if ans is False:
                rec.append((k, i, False, round(time.monotonic() - t0, 4)))
                return True
            if ans is None:
                still.append(i)
        open_levels = still
        if not open_levels:
            break
    rec.append((k, None, None, round(time.monotonic() - t0, 4)))
    return False


def _search_rebuild(F: _Formula, best: SatOutcome, deadline: float | None, opts: dict, report: Callable[[], None]) -> SatOutcome:
    """Search for solvers without assumptions (kissat): a fresh solver per bound."""
    from pysat.solvers import Solver

    base = F.clauses
    stats = best.stats
    while not best.optimal:
        k = best.upper - 1 if opts["direction"] == "down" else best.lower
        lits, possible = F.bound(k)
        ans: bool | None = False
        if possible:
            t1 = time.monotonic()
            cs: dict = {}
            with Solver(name="kissat404", bootstrap_with=base + [[a] for a in lits]) as S:
                ans = sat_call(S, [], deadline=deadline, name="kissat404", stats=cs)
                model = S.get_model() if ans else None
            stats["calls"].append((k, ans, round(time.monotonic() - t1, 4), cs.get("conflicts", 0)))
            if ans is None:
                break
            if ans:
                order = F.decode(cast("Sequence[int]", model))  # ans is True: the model exists
                best.order, best.upper = order, int(round(F.problem.width(order)))
        if not ans:
            best.lower = k + 1
        best.optimal = best.lower >= best.upper
        report()
    if best.optimal:
        best.lower = best.upper
    return best


def _isolated_body(problem: OrderingProblem, kw: dict, *, progress: Callable) -> SatOutcome:
    return solve_sat(problem, progress=progress, **kw)


def _solve_isolated(
    problem: OrderingProblem,
    lower: int,
    upper: int | None,
    upper_order: list[int] | None,
    deadline: float,
    solver: str,
    progress: Callable[[SatOutcome], None] | None,
    opts: dict,
) -> SatOutcome:
    """``solve_sat`` in a child process killed at the deadline; the last report survives."""
    kw = dict(lower=lower, upper=upper, upper_order=upper_order, deadline=deadline, solver=solver)
    kw.update({k: v for k, v in opts.items() if k != "hard_deadline"})
    finished, value, reports = run_limited(_isolated_body, (problem, kw), deadline=deadline + 0.3, on_progress=progress)
    if finished:
        return value
    if reports:
        out = reports[-1]
        out.stats["killed"] = True
        return out
    hint = list(upper_order) if upper_order is not None else greedy_order(problem)
    w = int(round(problem.width(hint)))
    order: list[int] | None = hint
    if upper is not None and int(upper) < w:
        order, w = None, int(upper)
    return SatOutcome(int(lower), w, order, int(lower) >= w, {"solver": solver, "killed": True, "calls": []})

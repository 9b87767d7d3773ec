"""Several parameters of one plane graph at once, each using the others' bounds and witnesses.

Definition
----------
For the same start curve, end condition and holes, reducing every walk of a
homotopy mod 2 gives a homology sweep (:mod:`sweepwidth.solve.homotopy.projection`)
no wider than the homotopy is high (edge weights are non-negative).  So

* the *non-monotone* homology sweep width is at most the homotopy height
  (always), and from the outer boundary to a point with the outer face the
  only hole it equals the monotone width (Brightwell and Winkler), so there
  the face-order width is at most the homotopy height too;
* a homotopy witness projects to a homology sweep, an upper bound for the
  homology width (in the cases above).

:func:`solve_parameters` solves the homology width first (its lower bound
and its best face order, which the cutwidth engine improved, go to the
homotopy solver: the bound as the homotopy lower bound, the order as one of
the construction orders), then the homotopy height, then projects the best
homotopy witness and keeps it as the homology witness when it is narrower.

Time left over
--------------
The homotopy side often ends before the pair's limit (its exact search
stops at its memory cap).  The time left goes, round by round, to the
larger gap: while homotopy's upper bound is above homology's, homotopies
are built from homology's best face order (strictly in order, then in
windows); otherwise homology's cutwidth engine continues from its bounds
(:func:`~sweepwidth.solve.homology.refine_face_order`: the kick search for
a better face order, the shared upper bound, then the prefix-set search
for more thresholds, the shared lower bound), and a homotopy is built from
each order it improves.  ``stats['joint']['leftover']`` lists the rounds.
Each result's ``seconds`` is its own solve plus the leftover rounds that
worked for it (engine rounds for both, since their order and bound feed
the homotopy result too), so the two may add up to more than the wall time.

Non-contradiction
-----------------
When the homology width compared is a lower bound of the homotopy height
(the non-monotone width, or the monotone one from the outer boundary to a
point), the results satisfy ``homology.lower <= homotopy.lower`` and
``homology.upper <= homotopy.upper`` (``stats['joint']['comparable']`` is
True).  Between interior curves the monotone width (face orders) can exceed
the homotopy height, so with ``monotone=True`` there the homotopy solver
computes its own non-monotone homology bound and only a face order read off
the projected homotopy can improve the homology result (``comparable``
False).

Witness of a projected homology upper bound
-------------------------------------------
From the outer boundary to a point the homology witness must be a face
order.  The projection is a toggle sequence; when a face order read off it
(:func:`~sweepwidth.solve.homotopy.projection.best_face_order`) is no wider,
that order is the witness.  Otherwise the result keeps the toggle sequence
as a *non-monotone* witness (``stats['monotone'] = False``, replayed by the
homology checker as such); its width is the same parameter there by
Brightwell and Winkler's theorem.  ``stats['joint']['homology_upper']``
says which.

Benchmark tasks
---------------
A benchmark task is one (instance, parameter) row with its own child process
and hard limit, so a pair is run as two tasks with the solvers
:func:`paired_homology` and :func:`paired_homotopy`
(``sweepwidth bench DIR --param homology --solver sweepwidth.solve.joint:paired_homology``):
each task solves the pair in its limit and records its own parameter, with
the other's bounds in ``stats['paired_with']``.  The guarantees above hold
within a task; two rows of separate tasks come from separate runs.

References
----------
.. [1] G. Brightwell and P. Winkler, "Submodular percolation", SIAM J.
   Discrete Math. 23(3), 2009.
.. [2] E. W. Chambers, G. R. Chambers, A. de Mesmay, T. Ophelders and
   R. Rotman, "Constructing monotone homotopies and sweepouts", J. Geom.
   Anal. 31, 2021 (arXiv 1704.06175).

Examples
--------
>>> import sweepwidth as sw
>>> from sweepwidth import generators
>>> P = generators.grid(3, 4)
>>> res = sw.solve_parameters(P, ["homology", "homotopy"], time_limit=5)
>>> res["homology"].upper <= res["homotopy"].upper, res["homology"].lower <= res["homotopy"].lower
(True, True)
"""

from __future__ import annotations

import dataclasses
import math
import time
from typing import Any, Iterable, Mapping

from ..errors import InvalidArgumentError, UnsupportedOptionError
from ..registry import PARAMETERS
from ..result import Result
from .contract import Deadline, check_seed, make_result

__all__ = ["solve_parameters", "paired_homology", "paired_homotopy", "HOMOLOGY_SHARE", "LARGE_FACES",
           "LARGE_HOMOTOPY_SHARE"]

#: share of the pair's time given to the homology width (the homotopy solver gets the rest and
#: does not compute the homology bound again)
HOMOLOGY_SHARE = 0.45

#: above this many sweepable faces (with a shared homology bound) the homotopy solver gets
#: ``LARGE_HOMOTOPY_SHARE`` of the time left after the homology width; the leftover rounds get the rest
LARGE_FACES = 120
LARGE_HOMOTOPY_SHARE = 0.5

_EPS = 1e-9
_HOMOTOPY_KEYS = ("spikes", "simple", "monotone", "weight", "s", "t", "method", "max_memory")


def _z2(darts: Iterable[int]) -> set[int]:
    out: set[int] = set()
    for d in darts:
        out ^= {d >> 1}
    return out


def _replace(r: Result, **kw: Any) -> Result:
    return dataclasses.replace(r, **kw)


def solve_parameters(
    P: Any,
    parameters: Iterable[str] = ("homology", "homotopy"),
    *,
    time_limit: float | None = None,
    seed: int | None = None,
    start: Any = None,
    end: Any = None,
    holes: Any = None,
    homology_options: Mapping[str, Any] | None = None,
    homotopy_options: Mapping[str, Any] | None = None,
    cutwidth_options: Mapping[str, Any] | None = None,
) -> dict[str, Result]:
    """Solve several parameters of ``P`` together; one :class:`Result` per parameter.

    Parameters
    ----------
    P : PlaneGraph
    parameters : iterable of str
        Names from ``sweepwidth.registry.PARAMETERS`` ('cutwidth', 'homology',
        'homotopy'); duplicates are ignored.
    time_limit : float, optional
        Seconds for all of them together: cutwidth (when asked) gets its
        equal share, homology ``HOMOLOGY_SHARE`` of the rest and homotopy the
        remainder.
    seed : int, optional
        Passed to every solver.
    start, end, holes : optional
        The start curve, end curve and holes, as for
        :func:`sweepwidth.homotopy_height` (walks: dart lists, vertex lists
        or ``{"vertex": v, "darts": [...]}``; default from the outer boundary
        to a point, holes ``{P.outer_face}``).  The homology problem sweeps the
        Z2 cycles of the same walks.
    homology_options : mapping, optional
        ``method``, ``monotone`` and the options of :func:`sweepwidth.homology_width`.
    homotopy_options : mapping, optional
        ``method``, ``spikes``, ``simple``, ``monotone``, ``weight``, ``s``,
        ``t``, ``max_memory`` of :func:`sweepwidth.homotopy_height`.
    cutwidth_options : mapping, optional
        Keywords of :func:`sweepwidth.cutwidth` (``method`` and its options).

    Returns
    -------
    dict
        Parameter name -> Result, in the order asked.  Homology and homotopy
        results carry ``stats['joint']``: what was shared and whether the two
        are comparable (see the module docstring).

    Raises
    ------
    UnsupportedOptionError
        An unknown parameter or option.
    InvalidArgumentError
        No parameter, bad time limit or seed.

    Notes
    -----
    The sum of the parts' costs (see each solver); the projection is linear
    in the homotopy's moves.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> res = solve_parameters(generators.wheel(5), ["cutwidth", "homotopy"], time_limit=5)
    >>> sorted(res)
    ['cutwidth', 'homotopy']
    """
    t0 = time.monotonic()
    names: list[str] = []
    for p in parameters:
        if p not in PARAMETERS:
            raise UnsupportedOptionError("parameter", p, sorted(PARAMETERS))
        if p not in names:
            names.append(p)
    if not names:
        raise InvalidArgumentError("solve_parameters needs at least one parameter")
    dl = Deadline.from_limit(time_limit, start=t0)
    seed = check_seed(seed)
    hom_opts = dict(homology_options or {})
    htp_opts = dict(homotopy_options or {})
    for k in htp_opts:
        if k not in _HOMOTOPY_KEYS:
            raise UnsupportedOptionError("homotopy option", k, sorted(_HOMOTOPY_KEYS))
    out: dict[str, Result] = {}
    pair = "homology" in names and "homotopy" in names
    others = [p for p in names if not (pair and p in ("homology", "homotopy"))]
    n_parts = len(others) + (1 if pair else 0)

    def share(k_left: int) -> float | None:
        left = dl.remaining()
        if left == float("inf"):
            return None
        return max(0.0, left / k_left)

    from . import cutwidth, homology_width, homotopy_height

    k_left = n_parts
    for p in others:
        lim = share(k_left)
        k_left -= 1
        if p == "cutwidth":
            G = P.to_networkx() if hasattr(P, "to_networkx") and hasattr(P, "face_darts") else P
            out[p] = cutwidth(G, time_limit=lim, seed=seed, **dict(cutwidth_options or {}))
        elif p == "homology":
            out[p] = homology_width(P, start=start, end=end, holes=holes, time_limit=lim, seed=seed, **hom_opts)
        elif p == "homotopy":
            out[p] = homotopy_height(P, start=start, end=end, holes=holes, time_limit=lim, seed=seed, **htp_opts)
        else:  # a parameter added to the registry later: its public function with the shared limit
            fn = PARAMETERS[p].solver()
            out[p] = fn(P, time_limit=lim, seed=seed)
    if pair:
        hom, htp = _solve_pair(P, share(k_left), seed, start, end, holes, hom_opts, htp_opts)
        out["homology"], out["homotopy"] = hom, htp
    return {p: out[p] for p in names}


def _solve_pair(P: Any, limit: float | None, seed: int | None, start: Any, end: Any, holes: Any,
                hom_opts: dict, htp_opts: dict) -> tuple[Result, Result]:
    from ..problems.cycles import HomologyProblem
    from ..problems.homotopy import HomotopyProblem
    from . import homology_width, homotopy_height
    from .homology import solve_problem as solve_homology
    from .homotopy import solve_problem as solve_homotopy
    from .homotopy.projection import best_face_order, project_homotopy

    t0 = time.monotonic()
    dl = Deadline.from_limit(limit, start=t0)
    weight = htp_opts.get("weight", "weight")
    H = HomotopyProblem.build(P, start=start, end=end, spikes=htp_opts.get("spikes", True),
                              simple=htp_opts.get("simple", False), monotone=htp_opts.get("monotone", False),
                              length=weight, holes=holes, s=htp_opts.get("s"), t=htp_opts.get("t"))
    if not H.closed or H.length != "weight":
        # nothing to share: open walks (the homology sweep is of cycles) or vertex counts (other units)
        why = "open walks" if not H.closed else "homotopy measured in vertices"
        lim1 = None if limit is None else max(0.0, HOMOLOGY_SHARE * dl.remaining())
        r1 = homology_width(P, start=start, end=end, holes=holes, time_limit=lim1, seed=seed, **hom_opts)
        rest = None if limit is None else max(0.0, dl.remaining())
        r2 = homotopy_height(P, start=start, end=end, holes=holes, time_limit=rest, seed=seed, **htp_opts)
        note = {"comparable": False, "shared": f"nothing ({why})"}
        return (_replace(r1, stats={**r1.stats, "joint": note}), _replace(r2, stats={**r2.stats, "joint": note}))
    method = hom_opts.pop("method", "auto")
    monotone = hom_opts.pop("monotone", True)
    if not isinstance(monotone, bool):
        raise InvalidArgumentError(f"monotone must be True or False, got {monotone!r}")
    z0 = _z2(H.start.darts)
    z1 = _z2(H.end.darts) if H.end is not None else set()
    disk = (not z1) and H.holes == frozenset({P.outer_face}) and z0 == set(P.face_boundary_cycle(P.outer_face))
    comparable = disk or not monotone
    # the homology width of the same Z2 cycles, in this process (its cutwidth engine uses the time as a
    # direct call would)
    from .homology import validate_arguments as validate_homology

    validate_homology(method, monotone, hom_opts)
    # edge-id sets (a list of ints could also read as a walk through vertices)
    problem = HomologyProblem.build(P, set(z0), set(z1), sorted(H.holes))
    h_dl = dl if limit is None else Deadline.from_limit(max(0.0, HOMOLOGY_SHARE * dl.remaining()))
    r1 = solve_homology(problem, method=method, deadline=h_dl, seed=seed, monotone=monotone, options=hom_opts)
    order = list(r1.witness) if isinstance(r1.witness, list) and r1.stats.get("monotone", True) else None
    hint: tuple[float | None, dict, list | None] | None
    if not comparable:
        hint = None  # the homotopy solver computes its own (non-monotone) homology bound
    elif r1.status == "infeasible" or r1.lower is None:
        hint = (None, {"homology": "infeasible or no bound"}, order)
    else:
        hint = (float(r1.lower),
                {"homology": {"status": r1.status, "lower": r1.lower, "upper": r1.upper, "method": r1.method,
                              "seconds": round(r1.seconds, 3), "monotone": monotone, "from": "solve_parameters"}},
                order)
    h_method = htp_opts.get("method", "auto")
    h2_dl = Deadline.at_time(dl.at)
    if limit is not None and comparable and monotone and len(H.sweepable_faces) > LARGE_FACES:
        # the exact homotopy search settles no level above the homology bound on inputs this large
        # (benchmarks/NOTES.md): part of its time goes to the leftover rounds below instead
        h2_dl = Deadline.from_limit(max(0.0, LARGE_HOMOTOPY_SHARE * dl.remaining()))
    r2 = solve_homotopy(H, method=h_method, deadline=h2_dl, seed=seed, max_memory=htp_opts.get("max_memory"),
                        homology=hint)
    joint: dict[str, Any] = {"comparable": comparable, "homology_to_homotopy": "none", "homotopy_to_homology": "none"}
    if r2.witness is None and r2.status != "infeasible" and order:
        # the homotopy side ran out of time before constructing anything: lift the homology face order
        # (one construction, linear in the flips; a short grace past the deadline, like the result assembly)
        lifted = _lift_order(H, order, max(dl.remaining(), 0.5))
        if lifted is not None:
            height, lifted_witness = lifted
            r2 = make_result("homotopy", lower=r2.lower if r2.lower is not None else 0.0, upper=height, witness=lifted_witness,
                             method=r2.method, seconds=time.monotonic() - t0,
                             stats={**r2.stats, "bounds": {**dict(r2.stats.get("bounds") or {}),
                                                           "upper": "homology face order lifted to a homotopy (joint solve)"}})
            joint["homology_to_homotopy_witness"] = "lifted face order"
    joint["seconds"] = {"homology": round(r1.seconds, 3), "homotopy": round(r2.seconds, 3)}
    if limit is not None and monotone and comparable:
        r1, r2 = _use_leftover(P, H, problem, r1, r2, dl, seed, joint)
    # homotopy lower bound >= homology lower bound (when comparable)
    if comparable and r1.lower is not None and r2.status != "infeasible":
        lo2 = r2.lower if r2.lower is not None else 0.0
        if float(r1.lower) > lo2 + _EPS:
            r2 = make_result("homotopy", lower=float(r1.lower), upper=r2.upper, witness=r2.witness, method=r2.method,
                             seconds=r2.seconds, stats={**r2.stats, "bounds": {**dict(r2.stats.get("bounds") or {}),
                                                                                 "lower": "homology sweep width (joint solve)"}})
        joint["homology_to_homotopy"] = f"lower bound {r1.lower:g} and face order ({len(order or [])} faces)"
    else:
        joint["homology_to_homotopy"] = "none: the monotone width is no homotopy bound between interior curves"
    # homology upper bound <= homotopy upper bound, through the projection (when comparable)
    if r2.witness is not None and r1.status != "infeasible":
        proj = project_homotopy(P, r2.witness)
        pw = float(proj["width"])
        joint["projected_width"] = pw
        up1 = float("inf") if r1.upper is None else float(r1.upper)
        new: tuple[float, list[int], bool, str] | None = None
        if monotone:
            fo = best_face_order(P, z0, proj["toggles"])
            if fo is not None and fo[0] < up1 - _EPS and _ends_at(P, z0, fo[1], z1):
                new = (fo[0], fo[1], True, "face order read off the projected homotopy")
            elif comparable and pw < min(up1, fo[0] if fo else float("inf")) - _EPS:
                new = (pw, list(proj["toggles"]), False,
                       "projected homotopy as a non-monotone toggle sequence (equal width class by Brightwell-Winkler)")
        elif pw < up1 - _EPS:
            new = (pw, list(proj["toggles"]), False, "projected homotopy (toggle sequence)")
        if new is not None:
            w, wit, mono, how = new
            old_bounds = r1.stats.get("bounds")
            bounds = dict(old_bounds) if isinstance(old_bounds, dict) else {"lower": old_bounds}
            bounds["upper"] = how
            st = {**r1.stats, "monotone": mono if monotone else False, "bounds": bounds}
            st["swept"] = sorted(_odd(wit))
            lo1 = float(r1.lower) if r1.lower is not None else 0.0
            r1 = make_result("homology", lower=lo1, upper=w, witness=wit, method=r1.method + "+projection",
                             seconds=r1.seconds, stats=st)
            joint["homotopy_to_homology"] = how
            joint["homology_upper"] = "face order" if mono else "toggle sequence (non-monotone witness)"
    r1 = _replace(r1, stats={**r1.stats, "joint": joint})
    r2 = _replace(r2, stats={**r2.stats, "joint": joint})
    return r1, r2


def _lift_order(H: Any, order: list[int], seconds: float) -> tuple[float, dict] | None:
    """A homotopy built by sweeping the faces in the given order (None when it does not end where it should)."""
    from .homotopy import construct_homotopy

    pos = {f: i for i, f in enumerate(order)}
    rank = [float(pos.get(f, len(order))) for f in range(H.n_faces)]
    return construct_homotopy(H, rank, deadline=time.monotonic() + seconds)

def _gap(r: Result) -> float:
    if r.status == "infeasible" or r.upper is None:
        return float("inf")
    return float(r.upper) - (float(r.lower) if r.lower is not None else 0.0)


def _rank_of(order: list[int], n_faces: int) -> list[float]:
    rank = [float(n_faces + f) for f in range(n_faces)]
    for k, f in enumerate(order):
        if 0 <= f < n_faces and rank[f] >= n_faces:
            rank[f] = float(k)
    return rank


def _use_leftover(P: Any, H: Any, problem: Any, r1: Result, r2: Result, dl: Deadline, seed: int | None,
                  joint: dict[str, Any]) -> tuple[Result, Result]:
    """Spend the time the pair has left (the homotopy side often ends early) on the larger gap.

    Homotopy's gap is the larger one only when its upper bound is above
    homology's (its lower bound is at least homology's): then homotopies are
    built from homology's face order (strictly, then in windows).  Otherwise
    homology's cutwidth engine continues from its bounds
    (:func:`~sweepwidth.solve.homology.refine_face_order`: the kick search
    for the shared upper bound, the prefix-set search for the lower one), and
    a homotopy is built from each face order it improves.  Every bound kept
    is proven by the stage that produced it, so they stay sound and the
    non-contradiction rules of the module docstring still hold.
    """
    from .homology import refine_face_order
    from .homotopy import construct_homotopy
    from .homotopy.bounds import WINDOW_FACTOR

    if r1.status == "infeasible" or r2.status == "infeasible" or not isinstance(r1.witness, list):
        return r1, r2
    if not r1.stats.get("monotone", True) or r1.lower is None or r1.upper is None:
        return r1, r2
    F = H.n_faces
    win = max(2, round(WINDOW_FACTOR * math.sqrt(F)))
    log: list[dict[str, Any]] = []
    t_start = time.monotonic()
    lo1, up1, order1 = float(r1.lower), float(r1.upper), list(r1.witness)
    lo2 = float(r2.lower) if r2.lower is not None else 0.0
    up2 = float(r2.upper) if r2.upper is not None else float("inf")
    wit2 = r2.witness
    built_from: set[tuple[float, int]] = set()  # (homology width of the order, window) already built
    changed1 = changed2 = False
    engine_done = False  # the engine gave up before its slice ended without progress (e.g. its state cap)
    search_share = 0.5  # of each engine round for the kick search (the prefix-set search gets the rest)
    how2 = ""
    shared = 0.0  # seconds of engine rounds: they work for both sides (shared order and lower bound)
    own2 = 0.0  # seconds of homotopy constructions
    while dl.remaining() > 1.0:
        g1, g2 = up1 - lo1, up2 - max(lo2, lo1)
        if max(g1, g2) <= _EPS:
            break
        t = time.monotonic()
        pending = [w for w in (0, win) if (up1, w) not in built_from]
        entry: dict[str, Any]
        if pending and (g2 > g1 + _EPS or up2 > up1 + _EPS or engine_done or g1 <= _EPS):
            # homotopy side: build from homology's current best face order
            w = pending[0]
            built_from.add((up1, w))
            got = construct_homotopy(H, _rank_of(order1, F), window=w, deadline=time.monotonic() + dl.remaining() - 0.3)
            entry = {"side": "homotopy", "stage": f"construction from homology's face order, window {w}",
                     "height": None if got is None else got[0]}
            if got is not None and got[0] < up2 - _EPS:
                up2, wit2, changed2 = float(got[0]), got[1], True
                how2 = f"constructed homotopy (homology's face order after the leftover rounds, window {w})"
            own2 += time.monotonic() - t
        elif g1 > _EPS and not engine_done:
            # homology side: the cutwidth engine continues from its bounds, in a slice that leaves
            # time to build a homotopy from an improved order
            left = dl.remaining()
            slice_s = max(0.5, 0.7 * left if g2 > _EPS else left - 0.6)
            out = refine_face_order(problem, order1, lo1, deadline=Deadline.from_limit(slice_s), seed=seed,
                                    search_share=search_share)
            if out is None:
                log.append({"side": "homology", "stage": "not refinable (several swept sets or a crossing sweep)"})
                break
            nlo, nup, norder, st = out
            entry = {"side": "both", "stage": "homology's cutwidth engine (kick search, prefix-set search)",
                     "lower": nlo, "upper": nup}
            progress = nlo > lo1 + _EPS or nup < up1 - _EPS
            if nlo > lo1 + _EPS:
                lo1, changed1 = nlo, True
            if nup < up1 - _EPS:
                up1, order1, changed1 = nup, norder, True
            if not progress and time.monotonic() - t < slice_s - 0.5:
                # the prefix-set search gave up early (its state cap): the kick search alone from now on
                entry["stopped"] = (st.get("bnb") or {}).get("stopped", "no progress")
                if search_share < 1.0:
                    search_share = 1.0
                else:
                    engine_done = True
            shared += time.monotonic() - t
        else:
            break
        entry["seconds"] = round(time.monotonic() - t, 3)
        log.append(entry)
    joint["leftover"] = {"seconds": round(time.monotonic() - t_start, 3), "rounds": log}
    if changed1:
        old_bounds = r1.stats.get("bounds")
        bounds = dict(old_bounds) if isinstance(old_bounds, dict) else {"lower": old_bounds}
        if lo1 > float(r1.lower) + _EPS:
            bounds["lower"] = "cutwidth engine lower bound + constant (continued with the pair's time left)"
        if up1 < float(r1.upper) - _EPS:
            bounds["upper"] = "cutwidth engine ordering (continued with the pair's time left)"
        r1 = make_result("homology", lower=lo1, upper=up1, witness=order1, method=r1.method, seconds=r1.seconds,
                         stats={**r1.stats, "bounds": bounds})
    if changed2:
        b2 = dict(r2.stats.get("bounds") or {})
        b2["upper"] = how2
        r2 = make_result("homotopy", lower=max(lo2, min(lo1, up2)), upper=up2, witness=wit2, method=r2.method,
                         seconds=r2.seconds, stats={**r2.stats, "bounds": b2})
    # each side's seconds include the leftover work done for it (engine rounds for both)
    r1 = _replace(r1, seconds=r1.seconds + shared)
    r2 = _replace(r2, seconds=r2.seconds + shared + own2)
    return r1, r2


def _odd(toggles: Iterable[int]) -> set[int]:
    s: set[int] = set()
    for f in toggles:
        s ^= {f}
    return s


def _ends_at(P: Any, z0: set[int], faces: Iterable[int], z1: set[int]) -> bool:
    cur = set(z0)
    for f in faces:
        odd: set[int] = set()
        for d in P.face_darts(f):
            odd ^= {int(d) >> 1}
        cur ^= odd
    return cur == set(z1)


def _paired(parameter: str, obj: Any, method: str, time_limit: float | None, seed: int | None,
            options: dict) -> Result:
    hom_opts = {k: v for k, v in options.items() if k not in ("start", "end", "holes")} if parameter == "homology" else {}
    htp_opts = {k: v for k, v in options.items() if k not in ("start", "end", "holes")} if parameter == "homotopy" else {}
    if method != "auto":
        (hom_opts if parameter == "homology" else htp_opts)["method"] = method
    res = solve_parameters(obj, ["homology", "homotopy"], time_limit=time_limit, seed=seed,
                           start=options.get("start"), end=options.get("end"), holes=options.get("holes"),
                           homology_options=hom_opts, homotopy_options=htp_opts)
    other = "homotopy" if parameter == "homology" else "homology"
    r = res[parameter]
    o = res[other]
    return _replace(r, stats={**r.stats, "paired_with": {"parameter": other, "lower": o.lower, "upper": o.upper}})


def paired_homology(obj: Any, *, method: str = "auto", time_limit: float | None = None, seed: int | None = None,
                    progress: Any = None, **options: Any) -> Result:
    """A benchmark-task solver: the homology result of :func:`solve_parameters` on the pair.

    For ``sweepwidth bench DIR --param homology --solver
    sweepwidth.solve.joint:paired_homology`` (see :class:`sweepwidth.bench.tasks.Task`):
    the whole time limit goes to the pair (the task's child is killed at
    its limit plus a grace), and the homotopy result it was paired with is
    in ``stats['paired_with']``.  ``method`` and ``options`` apply to the
    homology side; ``progress`` is not used.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> paired_homology(generators.grid(3, 3), time_limit=5).stats["paired_with"]["parameter"]
    'homotopy'
    """
    return _paired("homology", obj, method, time_limit, seed, options)


def paired_homotopy(obj: Any, *, method: str = "auto", time_limit: float | None = None, seed: int | None = None,
                    progress: Any = None, **options: Any) -> Result:
    """A benchmark-task solver: the homotopy result of :func:`solve_parameters` on the pair.

    As :func:`paired_homology`, for ``--param homotopy``; ``method`` and
    ``options`` apply to the homotopy side.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> paired_homotopy(generators.grid(3, 3), time_limit=5).value
    8.0
    """
    return _paired("homotopy", obj, method, time_limit, seed, options)

"""Independent replay of leash sweeps (witnesses of ``parameter='width'``).

The checker rebuilds every leash of a sweep from the witness
``{"start": leash, "moves": [...]}`` with PlaneGraph queries only (tails,
heads, face boundary walks, weights) and the walk code of this package's
checkers; it uses neither the solvers nor the move code of
:mod:`sweepwidth.problems.width`.

Rules checked (the definition in :mod:`sweepwidth.problems.width`):

* the walks A and B are walks of P; the witness starts at the problem's
  start leash with both indices 0 and ends at the end leash with indices
  ``p`` and ``q``;
* every flip, spike and unspike obeys the rules of the homotopy height's
  path form (holes never flipped, the piece and the reversed inserted piece
  make a face boundary, spikes only when allowed, no wrap-around);
* a step ``{"op": "step", "walk": "a"|"b", "to": k}`` changes that index by
  one (back only with ``backward=True``) and changes the leash by the free
  reduction rule: the dart is removed when the leash starts (ends) with it,
  otherwise the reverse dart is added;
* after every move the leash is a walk from ``a_i`` to ``b_j``; with
  ``simple=True`` a simple path (or a point).

The recomputed width is the largest leash length (weights, darts, or
vertices = darts + 1).
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Hashable, Mapping

from ..errors import InvalidArgumentError, SweepwidthError, WitnessError
from . import register_checker
from .homotopy import _is_face_boundary, _parse_walk

__all__ = ["Leash", "LeashSweep", "replay_leashes", "replay_width", "leash_sweep", "check_width"]


def _walk_darts(P: Any, spec: Any, what: str) -> tuple[list[int], int]:
    w = _parse_walk(P, spec, what)
    ds = w.darts
    for i in range(len(ds) - 1):
        if P.head_index(ds[i]) != P.tail_index(ds[i + 1]):
            raise WitnessError(f"{what}: darts {i} and {i + 1} do not meet")
    v = P.tail_index(ds[0]) if ds else w.point
    return list(ds), int(v)  # type: ignore[arg-type]


def _len(P: Any, ds: list[int], weight: Any) -> float:
    if weight == "weight":
        return float(sum(P.weight(d // 2) for d in ds))
    if weight is None:
        return float(len(ds))
    return float(len(ds) + 1)


@dataclass(frozen=True)
class Leash:
    """One leash of a replayed sweep: the state after a move (or the start).

    Attributes
    ----------
    step : int
        0 for the start leash, ``k`` for the leash after move ``k - 1``
        (moves are numbered from 0, as in the checker's messages).
    i, j : int
        Indices of the leash's ends on walks A and B.
    darts : tuple of int
        The leash, from ``a_i`` to ``b_j``; empty for a point.
    a_end, b_end : hashable
        The vertex labels ``a_i`` and ``b_j``.
    length : float
        The leash's length in the problem's convention.
    move : dict or None
        The move that led here (None for the start).
    face : int or None
        The face flipped by that move, if it was a flip.
    """

    step: int
    i: int
    j: int
    darts: tuple
    a_end: Hashable
    b_end: Hashable
    length: float
    move: Mapping[str, Any] | None = None
    face: int | None = None


@dataclass(frozen=True)
class LeashSweep:
    """A leash sweep replayed by the checker: the walks and every leash, start and end included.

    Attributes
    ----------
    a_darts, b_darts : tuple of int
        Walks A and B as darts.
    a_vertices, b_vertices : tuple
        Their vertex labels ``a_0 .. a_p`` and ``b_0 .. b_q``.
    leashes : tuple of Leash
        ``len(moves) + 1`` leashes.
    holes : frozenset of int
        Faces never flipped.
    weight : {'weight', None, 'vertices'}
        The length convention the lengths use.
    """

    a_darts: tuple
    b_darts: tuple
    a_vertices: tuple
    b_vertices: tuple
    leashes: tuple
    holes: frozenset
    weight: Any = "weight"

    @property
    def width(self) -> float:
        """The largest leash length (the width of the sweep)."""
        return max(x.length for x in self.leashes)

    @property
    def lengths(self) -> list[float]:
        """The length of every leash, in order."""
        return [x.length for x in self.leashes]


def replay_leashes(
    P: Any,
    witness: Mapping[str, Any],
    *,
    a: Any,
    b: Any,
    start: Any,
    end: Any,
    holes: Any = None,
    backward: bool = False,
    spikes: bool = True,
    simple: bool = False,
    weight: Any = "weight",
) -> LeashSweep:
    """Replay a leash sweep on ``P`` and return every leash along it, checking each move.

    Parameters
    ----------
    P : PlaneGraph
    witness : dict
        ``{"start": {"vertex": v, "darts": [...]}, "moves": [...]}``.
    a, b, start, end : dict
        The walks and leashes in the JSON walk form ``{"vertex": v, "darts": [...]}``.
    holes : sequence of int, optional
        Default: the outer face.
    backward, spikes, simple : bool
    weight : {'weight', None, 'vertices'}

    Returns
    -------
    LeashSweep
        The walks and the ``len(moves) + 1`` leashes; ``.width`` is the largest length.

    Raises
    ------
    WitnessError
        Naming the move (0-based) and the rule broken.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth import homotopy_width
    >>> P = grid(2, 3)                                 # two squares side by side
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> opts = r.stats["options"]
    >>> kw = {k: opts[k] for k in ("a", "b", "start", "end")}
    >>> sweep = replay_leashes(P, r.witness, **kw)
    >>> sweep.lengths == [x.length for x in sweep.leashes] and sweep.width
    2.0
    >>> len(sweep.leashes) == len(r.witness["moves"]) + 1
    True
    >>> replay_leashes(P, {"start": r.witness["start"], "moves": r.witness["moves"][:-1]}, **kw)
    Traceback (most recent call last):
    ...
    sweepwidth.errors.WitnessError: the sweep ends at leash [...] (indices ...), not at the end leash [8] (indices 2, 2)
    """
    if weight not in ("weight", None, "vertices"):
        raise InvalidArgumentError(f"unknown weight convention {weight!r}; valid: 'weight', None, 'vertices'")
    if not isinstance(witness, Mapping) or "start" not in witness or "moves" not in witness:
        raise WitnessError("a leash sweep witness is {'start': leash, 'moves': [...]}")
    m2 = 2 * P.number_of_edges()
    F = P.number_of_faces()
    hole_set = {P.outer_face} if holes is None else {int(h) for h in holes}
    A, a0 = _walk_darts(P, a, "walk a")
    B, b0 = _walk_darts(P, b, "walk b")
    av = [a0] + [P.head_index(d) for d in A]
    bv = [b0] + [P.head_index(d) for d in B]
    S, _ = _walk_darts(P, start, "problem start leash")
    E, _ = _walk_darts(P, end, "problem end leash")
    L, v0 = _walk_darts(P, witness["start"], "witness start")
    if L != S or (not L and v0 != av[0]):
        raise WitnessError("the witness does not start at the problem's start leash")
    i, j = 0, 0
    point = av[0]

    def check_leash(where: str) -> None:
        x = P.tail_index(L[0]) if L else point
        y = P.head_index(L[-1]) if L else point
        for k in range(len(L) - 1):
            if P.head_index(L[k]) != P.tail_index(L[k + 1]):
                raise WitnessError(f"{where}: the leash breaks between darts {k} and {k + 1}")
        if x != av[i] or y != bv[j]:
            raise WitnessError(
                f"{where}: the leash runs from {P.label(x)!r} to {P.label(y)!r}, not from "
                f"a_{i}={P.label(av[i])!r} to b_{j}={P.label(bv[j])!r}"
            )
        if simple:
            vs = [P.tail_index(d) for d in L] + ([P.head_index(L[-1])] if L else [point])
            if len(set(vs)) != len(vs):
                raise WitnessError(f"{where}: simple leashes asked for, but the leash is not a simple path")

    check_leash("witness start")
    lab = P.label

    def record(step: int, mv: Any = None, face: Any = None) -> Leash:
        return Leash(step, i, j, tuple(L), lab(av[i]), lab(bv[j]), _len(P, L, weight),
                     dict(mv) if mv is not None else None, face)

    out = [record(0)]
    for idx, mv in enumerate(list(witness["moves"])):
        where = f"move {idx}"
        if not isinstance(mv, Mapping) or "op" not in mv:
            raise WitnessError(f"{where}: not a move dict with an 'op': {mv!r}")
        op = mv["op"]
        n = len(L)
        flipped = None
        if op == "step":
            walk, to = mv.get("walk"), mv.get("to")
            if walk not in ("a", "b"):
                raise WitnessError(f"{where} (step): 'walk' must be 'a' or 'b', got {walk!r}")
            cur, top = (i, len(A)) if walk == "a" else (j, len(B))
            if isinstance(to, bool) or not isinstance(to, int) or not 0 <= to <= top:
                raise WitnessError(f"{where} (step): index {to!r} outside 0..{top}")
            if to == cur - 1 and not backward:
                raise WitnessError(f"{where} (step): walk {walk} steps back, but backward steps are not allowed")
            if abs(to - cur) != 1:
                raise WitnessError(f"{where} (step): walk {walk} jumps from {cur} to {to}")
            if walk == "a":
                # the dart from the new a-vertex to the old one
                x = A[to] if to < cur else A[cur] ^ 1
                L = L[1:] if (L and L[0] == x ^ 1) else [x] + L
                i = to
            else:
                y = B[cur] if to > cur else B[to] ^ 1
                L = L[:-1] if (L and L[-1] == y ^ 1) else L + [y]
                j = to
            point = av[i]
        else:
            pos = mv.get("pos")
            if isinstance(pos, bool) or not isinstance(pos, int) or not 0 <= pos <= n:
                raise WitnessError(f"{where} ({op}): position {pos!r} outside 0..{n}")
            here = point if not L else (P.head_index(L[-1]) if pos == n else P.tail_index(L[pos]))
            if op == "flip":
                f = mv.get("face")
                flipped = f
                if isinstance(f, bool) or not isinstance(f, int) or not 0 <= f < F:
                    raise WitnessError(f"{where} (flip): {f!r} is not a face id")
                if f in hole_set:
                    raise WitnessError(f"{where} (flip): face {f} is a hole and may not be flipped")
                k = mv.get("take")
                if isinstance(k, bool) or not isinstance(k, int) or not 0 <= k <= n - pos:
                    raise WitnessError(f"{where} (flip): takes {k!r} darts at position {pos} of a leash of {n}")
                qq = list(mv.get("put", []))
                if any(isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2 for d in qq):
                    raise WitnessError(f"{where} (flip): 'put' holds something that is not a dart id")
                piece = L[pos:pos + k]
                if not _is_face_boundary(P, f, piece + [d ^ 1 for d in reversed(qq)]):
                    raise WitnessError(f"{where} (flip): piece {piece} and the reverse of {qq} are not the boundary of face {f}")
                if k == 0 and qq and P.tail_index(qq[0]) != here:
                    raise WitnessError(f"{where} (flip): the inserted loop does not start at the leash's vertex")
                L = L[:pos] + qq + L[pos + k:]
            elif op == "spike":
                if not spikes:
                    raise WitnessError(f"{where} (spike): spikes are not allowed")
                d = mv.get("dart")
                if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < m2:
                    raise WitnessError(f"{where} (spike): {d!r} is not a dart id")
                if P.tail_index(d) != here:
                    raise WitnessError(f"{where} (spike): dart {d} does not leave the leash's vertex at position {pos}")
                L = L[:pos] + [d, d ^ 1] + L[pos:]
            elif op == "unspike":
                if not spikes:
                    raise WitnessError(f"{where} (unspike): unspikes are not allowed")
                if pos + 2 > n or L[pos + 1] != L[pos] ^ 1:
                    raise WitnessError(f"{where} (unspike): no dart and its reverse at position {pos}")
                L = L[:pos] + L[pos + 2:]
            else:
                raise WitnessError(f"{where}: unknown op {op!r}")
        check_leash(where)
        out.append(record(idx + 1, mv, flipped))
    if i != len(A) or j != len(B) or L != E:
        raise WitnessError(
            f"the sweep ends at leash {L} (indices {i}, {j}), not at the end leash {E} (indices {len(A)}, {len(B)})"
        )
    return LeashSweep(tuple(A), tuple(B), tuple(lab(v) for v in av), tuple(lab(v) for v in bv), tuple(out),
                      frozenset(hole_set), weight)


def replay_width(P: Any, witness: Mapping[str, Any], **problem: Any) -> float:
    """Replay a leash sweep on ``P`` and return its width (the longest leash).

    The keywords are those of :func:`replay_leashes`, which does the replay.

    Raises
    ------
    WitnessError
        Naming the move (0-based) and the rule broken.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth import homotopy_width
    >>> P = grid(2, 3)
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> opts = r.stats["options"]
    >>> replay_width(P, r.witness, **{k: opts[k] for k in ("a", "b", "start", "end")})
    2.0
    """
    return replay_leashes(P, witness, **problem).width


_VALID = ("a", "b", "start", "end", "holes", "backward", "spikes", "simple", "weight")


def _problem_of(result: Any, obj: Any, options: dict) -> tuple[Any, dict]:
    """The plane graph and the replay keywords: ``result.stats['options']`` (or a WidthProblem's), then ``options``."""
    P = obj
    recorded: dict = dict((result.stats or {}).get("options", {}) or {})
    if hasattr(obj, "graph") and hasattr(obj, "options") and callable(obj.options):
        P = obj.graph
        recorded = dict(obj.options())
    unknown = sorted(set(options) - set(_VALID))
    if unknown:
        raise InvalidArgumentError(f"unknown checker option(s) {unknown}; valid: {', '.join(_VALID)}, tol")
    kw = {k: recorded[k] for k in _VALID if k in recorded}
    kw.update(options)
    missing = [k for k in ("a", "b", "start", "end") if kw.get(k) is None]
    if missing:
        names = " and ".join(("walk " if k in "ab" else "leash ") + repr(k) for k in missing)
        raise WitnessError(f"the width problem's {names} {'is' if len(missing) == 1 else 'are'} not recorded in the "
                           f"result's stats['options']; pass {', '.join(k + '=' for k in missing)} "
                           "(walks {'vertex': v, 'darts': [...]})")
    if result.witness is None:
        raise WitnessError(f"result ({result.status}) has no leash sweep witness to replay")
    return P, kw


def leash_sweep(result: Any, obj: Any, **options: Any) -> LeashSweep:
    """Replay the leash sweep of a homotopy width result: every leash, checked move by move.

    Parameters
    ----------
    result : Result
        A result with ``parameter='width'`` and a witness.
    obj : PlaneGraph or WidthProblem
    **options
        Override the problem recorded in ``result.stats['options']``:
        ``a``, ``b``, ``start``, ``end``, ``holes``, ``backward``, ``spikes``,
        ``simple``, ``weight``.

    Returns
    -------
    LeashSweep

    Raises
    ------
    InvalidArgumentError
        A result of another parameter.
    WitnessError
        No witness, walks or leashes neither recorded nor given (each
        named), or an illegal move.

    See Also
    --------
    check_width : the same replay, compared with ``result.upper``.

    Examples
    --------
    >>> from sweepwidth.generators import grid
    >>> from sweepwidth import homotopy_width
    >>> P = grid(2, 3)
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> s = leash_sweep(r, P)
    >>> s.a_vertices, s.width == r.value
    (((0, 0), (0, 1), (0, 2)), True)
    """
    if getattr(result, "parameter", None) != "width":
        raise InvalidArgumentError(f"a leash sweep is the witness of a homotopy width result (parameter 'width'), "
                           f"got a {getattr(result, 'parameter', type(result).__name__)!r} result")
    P, kw = _problem_of(result, obj, dict(options))
    return replay_leashes(P, result.witness, **kw)


@register_checker("width")
def check_width(result: Any, obj: Any, **options: Any) -> float:
    """Check a homotopy width result on a PlaneGraph (or a WidthProblem); return the recomputed width.

    The problem's options default to ``result.stats['options']`` and may be
    overridden by keyword (``a``, ``b``, ``start``, ``end``, ``holes``,
    ``backward``, ``spikes``, ``simple``, ``weight``, ``tol``).

    Raises
    ------
    WitnessError
        No witness, an illegal move, or a width different from ``result.upper``.
    """
    tol = float(options.pop("tol", 1e-9))
    P, kw = _problem_of(result, obj, dict(options))
    w = replay_width(P, result.witness, **kw)
    if result.upper is not None and abs(w - float(result.upper)) > tol:
        raise WitnessError(f"the witness has width {w:g} but the result claims upper = {result.upper:g}")
    return w

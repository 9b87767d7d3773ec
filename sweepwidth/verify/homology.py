"""Independent checker of homology sweeps: replays the face toggles from the start cycle.

Nothing here uses the solver's data structures: the boundary of each face is
recomputed from ``P.face_darts`` (edges met an odd number of times along the
face's walk), the current cycle is kept as a set of edge ids and its weight
is summed from ``P.weight`` at every step.
"""

from __future__ import annotations

import math
from typing import Any, Iterable

from ..errors import InputTypeError, SweepwidthError, WitnessError
from . import register_checker

__all__ = ["sweep_profile", "check_homology"]


def _boundary(P: Any, f: int) -> set[int]:
    odd: set[int] = set()
    for d in P.face_darts(f):
        odd ^= {int(d) >> 1}
    return odd


def _edges(P: Any, spec: Any, default: set[int], what: str, closed: bool = True) -> set[int]:
    """Edge ids from a recorded summary (a list of edge ids) or a walk dict; None gives ``default``."""
    if spec is None:
        return set(default)
    m = P.number_of_edges()
    if isinstance(spec, dict) and "darts" in spec:
        ds = [int(d) for d in spec["darts"]]
        for i, d in enumerate(ds):
            if not 0 <= d < 2 * m:
                raise WitnessError(f"{what}: dart {d} at position {i} does not exist")
        for i, d in enumerate(ds):
            if not closed and i == len(ds) - 1:
                break
            if P.head(d) != P.tail(ds[(i + 1) % len(ds)]):
                raise WitnessError(f"{what}: darts at positions {i} and {(i + 1) % len(ds)} do not meet")
        odd: set[int] = set()
        for d in ds:
            odd ^= {d >> 1}
        return odd
    if isinstance(spec, dict) and "edges" in spec:
        spec = spec["edges"]
    odd = set()
    for e in spec:
        if isinstance(e, bool) or not isinstance(e, int) or not 0 <= e < m:
            raise WitnessError(f"{what}: edge id {e!r} does not exist")
        odd ^= {e}
    return odd


def sweep_profile(P: Any, start: Iterable[int], toggles: Iterable[int], holes: Iterable[int] = ()) -> tuple[list[float], set[int]]:
    """Weights of the cycle before the first toggle and after each one, and the final cycle.

    Raises
    ------
    WitnessError
        A toggle that is not a face id or is a hole (names the step).

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 2)
    >>> inner = 1 - P.outer_face
    >>> sweep_profile(P, range(4), [inner], {P.outer_face})
    ([4.0, 0.0], set())
    """
    H = set(holes)
    F = P.number_of_faces()
    cur = set(start)
    w = float(sum(P.weight(e) for e in cur))
    prof = [w]
    cache: dict[int, set[int]] = {}
    for step, f in enumerate(toggles):
        if isinstance(f, bool) or not isinstance(f, int) or not 0 <= f < F:
            raise WitnessError(f"step {step}: {f!r} is not a face id (0..{F - 1})")
        if f in H:
            raise WitnessError(f"step {step}: face {f} is a hole and may not be swept")
        b = cache.get(f)
        if b is None:
            b = cache[f] = _boundary(P, f)
        cur ^= b
        w = float(sum(P.weight(e) for e in cur))  # recomputed, never updated incrementally
        prof.append(w)
    return prof, cur


@register_checker("homology")
def check_homology(result: Any, P: Any, **options: Any) -> float:
    """Replay a homology result on ``P``; return the recomputed width.

    Options ``start``, ``end`` (edge-id lists or walk dicts ``{"darts": [...]}``)
    and ``holes`` default to ``result.stats`` (the solver records them) and
    else to the outer boundary, the empty cycle and ``{P.outer_face}``;
    ``tol`` is the relative tolerance.  Pass them explicitly to check a result
    against an instance you trust rather than the one the result describes.

    For an 'infeasible' result the checker confirms that no face set avoiding
    the holes is bounded by ``start + end`` and returns ``inf``.

    Raises
    ------
    WitnessError
        A missing witness, an illegal toggle (names the step), a face toggled
        twice in a monotone sweep, a final cycle that differs from the end,
        a width that differs from ``result.upper`` or is below ``result.lower``,
        or an infeasibility claim that is false.

    Examples
    --------
    >>> import sweepwidth as sw
    >>> from sweepwidth import generators
    >>> P = generators.grid(3, 3)
    >>> sw.homology_width(P).check(P)
    8.0
    """
    stats = dict(result.stats or {})
    tol = float(options.pop("tol", 1e-9))
    start_spec = options.pop("start", stats.get("start"))
    end_spec = options.pop("end", stats.get("end"))
    holes_spec = options.pop("holes", stats.get("holes"))
    if options:
        raise InputTypeError(f"unknown checker option(s) {sorted(options)}; valid: start, end, holes, tol")
    if not (hasattr(P, "face_darts") and hasattr(P, "outer_face")):
        raise WitnessError(f"a homology result is checked against a PlaneGraph, got {type(P).__name__}")
    closed = not stats.get("paths", False)
    c0 = _edges(P, start_spec, _boundary(P, P.outer_face), "start", closed)
    c1 = _edges(P, end_spec, set(), "end", closed)
    H = {P.outer_face} if holes_spec is None else {int(h) for h in holes_spec}
    if result.status == "infeasible":
        if _bounds_hole_free(P, c0 ^ c1, H):
            raise WitnessError("the result claims infeasible, but start + end bounds a face set avoiding the holes")
        return math.inf
    if result.witness is None:
        raise WitnessError("the result has no witness face order")
    toggles = list(result.witness)
    if stats.get("monotone", True):
        seen: set = set()
        for step, f in enumerate(toggles):
            if f in seen:
                raise WitnessError(f"step {step}: face {f} is toggled a second time in a monotone sweep")
            seen.add(f)
    prof, final = sweep_profile(P, c0, toggles, H)
    if final != c1:
        extra = sorted(final ^ c1)
        raise WitnessError(f"after the last step the cycle differs from the end on edges {extra[:8]}")
    width = max(prof)
    scale = max(1.0, abs(width))
    if result.upper is None or abs(width - float(result.upper)) > tol * scale:
        raise WitnessError(f"the witness has width {width:g} but the result claims upper bound {result.upper!r}")
    if result.lower is not None and float(result.lower) > width + tol * scale:
        raise WitnessError(f"lower bound {result.lower!r} exceeds the witness width {width:g}")
    return width


def _bounds_hole_free(P: Any, c: set[int], H: set[int]) -> bool:
    """True when some face set disjoint from H has Z2 boundary c (parity labelling of the faces)."""
    F = P.number_of_faces()
    label = [-1] * F
    nbr: list[list[tuple[int, int]]] = [[] for _ in range(F)]
    for e in range(P.number_of_edges()):
        a = P.face_of_dart(2 * e)
        b = P.face_of_dart(2 * e + 1)
        p = 1 if e in c else 0
        nbr[a].append((b, p))
        nbr[b].append((a, p))
    label[0] = 0
    stack = [0]
    while stack:
        f = stack.pop()
        for g, p in nbr[f]:
            if label[g] == -1:
                label[g] = label[f] ^ p
                stack.append(g)
            elif label[g] != label[f] ^ p:
                return False
    return len({label[h] for h in H}) <= 1

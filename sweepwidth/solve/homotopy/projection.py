"""Homotopies reduced mod 2: every homotopy witness gives a homology sweep.

Definition
----------
Reduce every walk of a homotopy mod 2: a walk becomes the Z2 cycle of the
edges it runs along an odd number of times.  A spike or an unspike inserts or
removes a dart followed by its reverse, so the cycle does not change; a flip
of face ``f`` replaces a piece of the walk by the rest of ``f``'s boundary
walk, so the cycle changes by the Z2 boundary of ``f``.  The reduction of a
homotopy from ``c0`` to ``c1`` is therefore the *toggle sequence* of its flipped
faces (in flip order), a homology sweep from ``Z2(c0)`` to ``Z2(c1)`` that may
toggle a face several times (a non-monotone sweep).  With non-negative edge
weights the weight of a Z2 cycle is at most the length of any walk reducing
to it (an edge met an odd number of times is met at least once), so the width
of the projected sweep is at most the height of the homotopy.

Face orders
-----------
From the outer boundary of a disk to nothing, with the outer face the only
hole, the face sets ``X`` of a sweep (``dX`` the current cycle) run from the
empty set to all inner faces and the weight of ``dX`` is submodular, so by
Brightwell and Winkler's theorem some face order (a monotone sweep) is no
wider than the toggle sequence.  Their proof is not constructive in the form
used here; :func:`face_orders_of_toggles` instead proposes two face orders
read off the toggle sequence (each face at its last toggle, and at its first
toggle of the last odd run) and :func:`best_face_order` measures them: a face
order is returned only with its measured width, which may exceed the toggle
sequence's (then the toggle sequence itself, a non-monotone witness, is the
better upper bound).  A homotopy built face by face (the constructions of
:func:`sweepwidth.solve.homotopy.construct_homotopy` flip each inner face of a
disk once) projects to a face order directly.

Complexity
----------
``O(M + sum of boundary lengths of the flipped faces)`` for ``M`` moves, plus
``O(toggles * cycle length)`` to measure the widths.

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
>>> r = sw.homotopy_height(P, method="bounds")
>>> proj = sw.project_homotopy(P, r.witness)
>>> proj["width"] <= r.upper
True
"""

from __future__ import annotations

import math
from typing import Any, Iterable, Mapping, Sequence

from ...errors import WitnessError

__all__ = ["project_homotopy", "toggle_widths", "face_orders_of_toggles", "best_face_order"]


def _face_boundary(P: Any, f: int) -> set[int]:
    odd: set[int] = set()
    for d in P.face_darts(f):
        odd ^= {int(d) >> 1}
    return odd


def toggle_widths(P: Any, start: Iterable[int], toggles: Sequence[int]) -> list[float]:
    """Weights of the Z2 cycle before the first toggle and after each one.

    ``start`` is a set of edge ids (a Z2 cycle); every toggle adds the Z2
    boundary of a face.  ``O(len(toggles) * largest cycle)``.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 2)
    >>> toggle_widths(P, range(4), [1 - P.outer_face])
    [4.0, 0.0]
    """
    cur = set(start)
    out = [math.fsum(P.weight(e) for e in cur)]
    cache: dict[int, set[int]] = {}
    for f in toggles:
        b = cache.get(f)
        if b is None:
            b = cache[f] = _face_boundary(P, f)
        cur ^= b
        out.append(math.fsum(P.weight(e) for e in cur))  # summed afresh: no drift with real weights
    return out


def project_homotopy(P: Any, witness: Mapping[str, Any]) -> dict:
    """The homology sweep of a homotopy witness (every walk reduced mod 2).

    Parameters
    ----------
    P : PlaneGraph
        The graph the homotopy lives on.
    witness : mapping
        A homotopy witness ``{"start": {"vertex": v, "darts": [...]}, "moves": [...]}``
        as :func:`sweepwidth.homotopy_height` returns it.

    Returns
    -------
    dict
        ``start`` (sorted edge ids of the start walk's Z2 cycle), ``toggles``
        (the flipped faces in order: a homology sweep, possibly toggling a face
        more than once), ``width`` (its width under ``P``'s edge weights, at
        most the homotopy's height when the height measures edge weights) and
        ``monotone`` (no face toggled twice: ``toggles`` is a face order).

    Raises
    ------
    WitnessError
        A witness without ``start`` darts or with a move that is not a flip,
        spike or unspike, or a flip of a face id that does not exist.

    Notes
    -----
    Only the face of each flip is read; that the moves form a homotopy is
    the homotopy checker's job (:func:`sweepwidth.verify.homotopy.check_homotopy`).
    The projected sweep is replayed independently by
    :func:`sweepwidth.verify.homology.sweep_profile`.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(2, 2)                   # one square inside
    >>> inner = 1 - P.outer_face
    >>> outer = [int(d) for d in P.face_darts(P.outer_face)]
    >>> moves = [{"op": "flip", "face": inner, "pos": 0, "take": 4, "put": []}]
    >>> proj = project_homotopy(P, {"start": {"darts": [d ^ 1 for d in reversed(outer)]}, "moves": moves})
    >>> proj["toggles"] == [inner], proj["width"], proj["monotone"]
    (True, 4.0, True)
    """
    if not isinstance(witness, Mapping) or not isinstance(witness.get("start"), Mapping):
        raise WitnessError(f"a homotopy witness is {{'start': walk, 'moves': [...]}}, got {type(witness).__name__}")
    darts = witness["start"].get("darts")
    if darts is None:
        raise WitnessError("the witness start walk has no 'darts'")
    m = P.number_of_edges()
    z: set[int] = set()
    for i, d in enumerate(darts):
        if isinstance(d, bool) or not isinstance(d, int) or not 0 <= d < 2 * m:
            raise WitnessError(f"start: entry {i} is {d!r}, not a dart id")
        z ^= {d >> 1}
    F = P.number_of_faces()
    toggles: list[int] = []
    for k, mv in enumerate(witness.get("moves") or ()):
        op = mv.get("op") if isinstance(mv, Mapping) else None
        if op == "flip":
            f = mv.get("face")
            if isinstance(f, bool) or not isinstance(f, int) or not 0 <= f < F:
                raise WitnessError(f"move {k}: flip of {f!r}, not a face id (0..{F - 1})")
            toggles.append(f)
        elif op not in ("spike", "unspike"):
            raise WitnessError(f"move {k}: unknown op {op!r} (flip, spike, unspike)")
    widths = toggle_widths(P, z, toggles)
    return {
        "start": sorted(z),
        "toggles": toggles,
        "width": max(widths),
        "monotone": len(set(toggles)) == len(toggles),
    }


def face_orders_of_toggles(toggles: Sequence[int]) -> list[list[int]]:
    """Candidate face orders read off a toggle sequence (faces toggled an odd number of times).

    1. Each face at its last toggle (the sets "present from now to the end" form a chain).
    2. Each face at its first toggle (the order in which the sweep first reached it).

    Only the faces toggled an odd number of times are kept (the others end
    where they started).  Duplicates are removed.

    Examples
    --------
    >>> face_orders_of_toggles([3, 1, 3, 2, 3])
    [[1, 2, 3], [3, 1, 2]]
    """
    count: dict[int, int] = {}
    last: dict[int, int] = {}
    first: dict[int, int] = {}
    for i, f in enumerate(toggles):
        count[f] = count.get(f, 0) + 1
        last[f] = i
        first.setdefault(f, i)
    odd = [f for f, c in count.items() if c % 2 == 1]
    out: list[list[int]] = []
    for key in (last, first):
        order = sorted(odd, key=lambda f: key[f])
        if order not in out:
            out.append(order)
    return out


def best_face_order(P: Any, start: Iterable[int], toggles: Sequence[int]) -> tuple[float, list[int]] | None:
    """The narrowest of :func:`face_orders_of_toggles`, with its measured width (None without faces).

    Examples
    --------
    >>> from sweepwidth import generators
    >>> P = generators.grid(3, 3)
    >>> inner = [f for f in range(P.number_of_faces()) if f != P.outer_face]
    >>> w, order = best_face_order(P, P.face_boundary_cycle(P.outer_face), inner + inner[:1] + inner[:1])
    >>> sorted(order) == sorted(inner), w >= 8.0
    (True, True)
    """
    s = set(start)
    best: tuple[float, list[int]] | None = None
    for order in face_orders_of_toggles(toggles):
        w = max(toggle_widths(P, s, order))
        if best is None or w < best[0]:
            best = (w, order)
    return best

"""Orderings by beam search over prefix sets: the upper bound on sparse planar duals.

The search
----------
An ordering is a chain of prefix sets ``S_0 = {} (or the first pin), S_1,
..., S_n``; the cut of ``S_i`` is the weight of the edges leaving it.  The
beam search keeps, generation by generation, the ``B`` most promising
prefix sets: each kept set is extended by every vertex next to it (by every
vertex when none is), then by the *free moves* of the prefix-set search
(:mod:`.bnb`: vertices whose addition does not raise the cut, added at
once), the children are ranked by (largest cut so far, cut now) with a
small seeded random tie-breaker, repeated sets are dropped, and the best
``B`` go on.  A complete prefix is an ordering; the best one is returned.
Beam search goes back to Lowerre's speech recogniser [1]_; on the duals of
weighted disks (the homology reduction) it finds orderings 10-25 % narrower
than the constructions and local search of :mod:`.heuristics` and
:mod:`.local_search` in a fraction of their time (``benchmarks/bounds.py``;
the last run is in ``benchmarks/NOTES.md``).

Both directions
---------------
With pins, the reversed problem (last pin first) is a different search:
sweeping a disk from its boundary inwards or growing the swept region's
complement from a point outwards.  Neither wins everywhere, and the result
is not monotone in ``B`` (a wider beam can keep greedier sets), so
:func:`beam_ordering` runs a schedule of widths, directions and seeds in the
time it is given and keeps the best; it stops after two widths in a row that
found nothing narrower, and never goes above ``16 n`` (wider beams keep
near-copies of the same sets).

Cost: a run of width ``B`` takes ``O(n B (n + m / n * f))`` time for
frontier size ``f`` and ``32 n B`` bytes; the width schedule is cut so that
a run fits the time left (estimated from the previous run) and the memory
cap.  Needs numba (compiled kernel); without it :func:`beam_ordering`
returns None and the other constructions are used.

References
----------
.. [1] B. T. Lowerre, "The HARPY speech recognition system", PhD thesis,
   Carnegie Mellon University, 1976 (beam search).
"""

from __future__ import annotations

import time
from typing import Any

import numpy as np

from ...problems.ordering import OrderingProblem
from . import kernels as _kernels

__all__ = ["beam_ordering", "BEAM_BYTES"]

#: memory cap of one beam run (its state arrays), bytes
BEAM_BYTES = 256 << 20

#: beam widths tried in turn (while time is left)
_WIDTHS = (64, 256, 1024, 4096, 16384)


def beam_ordering(
    problem: OrderingProblem,
    *,
    deadline: float | None = None,
    seed: int | None = None,
    max_width: int | None = None,
    min_width: int | None = None,
    target: float | None = None,
) -> tuple[float, list[int], dict[str, Any]] | None:
    """The narrowest ordering found by a schedule of beam searches (see the module docstring).

    Parameters
    ----------
    problem : OrderingProblem
        Pinned sets of at most one vertex each (``contract_pins`` first).
    deadline : float, optional
        ``time.monotonic()`` value; a run is only started when its estimated
        time fits before it.  Without one the widths up to 1024 are run.
    seed : int, optional
        Seeds the tie-breaking noise (results are reproducible for a seed).
    max_width, min_width : int, optional
        Largest and smallest beam widths to try (default: all of the schedule).
    target : float, optional
        A proven lower bound: stop once an ordering of that width is found.

    Returns
    -------
    (width, order, stats) or None
        None when numba is missing or the graph has fewer than 3 vertices.
        ``stats['runs']`` lists ``(beam width, direction, seed, width, seconds)``.

    Examples
    --------
    >>> import networkx as nx
    >>> P = OrderingProblem.from_graph(nx.grid_2d_graph(5, 5))
    >>> out = beam_ordering(P, seed=0, max_width=64)
    >>> out is None or out[0] >= 6.0   # cutwidth of the 5x5 grid is 6 (m + 1)
    True
    """
    if len(problem.first) > 1 or len(problem.last) > 1:
        raise ValueError("beam_ordering needs pinned sets of at most one vertex; call contract_pins() first")
    n = problem.n
    if not _kernels.HAVE_NUMBA or n < 3 or problem.m == 0:
        return None
    indptr, indices, wts = problem.csr()
    indptr = np.ascontiguousarray(indptr, dtype=np.int64)
    indices = np.ascontiguousarray(indices, dtype=np.int64)
    wts = np.ascontiguousarray(wts, dtype=np.float64)
    deg = np.ascontiguousarray(problem.degrees(), dtype=np.float64)
    a = next(iter(problem.first)) if problem.first else -1
    b = next(iter(problem.last)) if problem.last else -1
    directions = [(a, b, False)]
    if a != b and (a >= 0 or b >= 0):
        directions.append((b, a, True))
    scale = float(np.mean(wts)) if wts.size else 1.0
    tol = 1e-9 * max(1.0, float(wts.max()) if wts.size else 1.0)
    cap_b = max(8, BEAM_BYTES // (32 * n + 64))
    widths = [B for B in _WIDTHS if B <= cap_b and (max_width is None or B <= max_width)
              and (min_width is None or B >= min_width)]
    # a beam much wider than the graph keeps near-copies of the same sets (and small graphs are
    # settled by the exact searches anyway)
    widths = [B for B in widths if B <= max(64, 16 * n)] or widths[:1]
    if not widths:
        widths = [min(cap_b, max_width or cap_b)]
    if deadline is None:
        widths = [B for B in widths if B <= 1024] or widths[:1]
    rng = np.random.default_rng(seed)
    best_w, best_o = np.inf, None
    runs: list[tuple] = []
    per_unit = None  # seconds per (beam width) unit, from the last run
    stale = 0  # widths in a row that found nothing narrower
    for B in widths:
        if stale >= 2:
            break
        before = best_w
        for x, y, rev in directions:
            for noise in (0.0, 0.3 * scale):
                if deadline is not None:
                    left = deadline - time.monotonic()
                    guess = (per_unit * B) if per_unit is not None else 1e-8 * B * n * (n + 16)
                    if guess > left:
                        break
                s = int(rng.integers(2**31 - 1))
                t0 = time.perf_counter()
                w, o = _kernels.beam_orderings(n, indptr, indices, wts, deg, x, y, B, tol, noise, s, True)
                dt = time.perf_counter() - t0
                per_unit = max(per_unit or 0.0, dt / B)
                runs.append((B, "reverse" if rev else "forward", s, float(w), round(dt, 4)))
                if not np.isfinite(w):
                    continue
                order = [int(v) for v in o]
                if rev:
                    order.reverse()
                width = problem.width(order)  # the truth, not the kernel's bookkeeping
                if width < best_w:
                    best_w, best_o = width, order
                if target is not None and best_o is not None and best_w <= target + tol:
                    return float(best_w), best_o, {"runs": runs}
        stale = stale + 1 if best_w >= before else 0
    if best_o is None:
        return None
    return float(best_w), best_o, {"runs": runs}

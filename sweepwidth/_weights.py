"""Turning a weight specification into one function, and checking weights.

Supported range
---------------
A weight is a real number (``bool`` excluded), finite, not NaN and
``>= 0``, and the weights of one graph add up to at most
:data:`MAX_TOTAL_WEIGHT` (``1e300``).  The solvers add weights (cuts, face
lengths, walk lengths that may run along an edge many times); the bound keeps
every such sum finite as a float, with a factor of 10**8 to spare below the
largest float (about 1.8e308), so no kernel ever meets ``inf`` or NaN.
Integers too large for a float (``10**400``) are refused, not rounded.
"""

from __future__ import annotations

from .tables import plain

import math
import numbers
from typing import Any, Callable

import numpy as np

from .errors import WeightError

__all__ = ["weight_function", "check_weight", "check_total", "check_weight_array", "MAX_TOTAL_WEIGHT"]

#: the largest supported sum of all the weights of one graph (see the module docstring)
MAX_TOTAL_WEIGHT = 1e300


def check_weight(value: Any, where: str) -> float:
    """Return ``value`` as a float, or raise WeightError naming ``where``.

    Weights must be real numbers (bool excluded), finite and non-negative.
    """
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise WeightError(f"weight of {where} is {plain(value)} ({type(value).__name__}); expected a real number")
    try:
        x = float(value)
    except (OverflowError, ValueError, TypeError):
        raise WeightError(
            f"weight of {where} is {_short(value)}, too large for a float; weights must add up to at most {MAX_TOTAL_WEIGHT:g}"
        ) from None
    if math.isnan(x):
        raise WeightError(f"weight of {where} is NaN; expected a finite non-negative number")
    if math.isinf(x):
        raise WeightError(f"weight of {where} is infinite; expected a finite non-negative number")
    if x < 0:
        raise WeightError(f"weight of {where} is negative ({plain(value)}); weights must be >= 0")
    if x > MAX_TOTAL_WEIGHT:
        raise WeightError(f"weight of {where} is {x:g}; weights must add up to at most {MAX_TOTAL_WEIGHT:g}")
    return x


def _short(value: Any) -> str:
    text = repr(value)
    return text if len(text) <= 40 else f"{text[:12]}...({len(text)} digits)"


def check_total(weights: Any, name: Callable[[int], str]) -> None:
    """Raise WeightError when checked weights add up to more than :data:`MAX_TOTAL_WEIGHT`.

    ``name(e)`` describes edge ``e``; the message names the heaviest edge.
    """
    total = float(np.sum(np.asarray(weights, dtype=np.float64))) if len(weights) else 0.0
    if not total <= MAX_TOTAL_WEIGHT:  # also catches inf
        heaviest = int(np.argmax(np.asarray(weights, dtype=np.float64)))
        raise WeightError(
            f"weights add up to {total:g}, more than the supported {MAX_TOTAL_WEIGHT:g} "
            f"(the heaviest is {name(heaviest)} with {float(weights[heaviest]):g}); scale them down"
        )


def check_weight_array(weights: Any, name: Callable[[int], str]) -> list[float]:
    """Check a whole sequence of weights (vectorised); return them as a list of floats.

    Every weight as in :func:`check_weight`, and the total as in :func:`check_total`.
    """
    if isinstance(weights, np.ndarray) and weights.dtype.kind in "fiu":
        arr = weights.astype(np.float64)
    else:
        seq = list(weights)
        if not all(type(x) is float or type(x) is int for x in seq):
            seq = [check_weight(x, name(e)) for e, x in enumerate(seq)]
        try:
            arr = np.array(seq, dtype=np.float64)
        except OverflowError:  # an int beyond float range
            for e, x in enumerate(seq):
                check_weight(x, name(e))
            raise  # pragma: no cover - check_weight raised
    bad = ~(np.isfinite(arr) & (arr >= 0) & (arr <= MAX_TOTAL_WEIGHT))
    if bad.any():
        e = int(np.flatnonzero(bad)[0])
        check_weight(float(arr[e]), name(e))
    check_total(arr, name)
    return arr.tolist()


def weight_function(weight: str | Callable | None) -> Callable[[Any, Any, dict], Any]:
    """A function ``(u, v, data) -> weight`` for an attribute name or a callable.

    ``None`` means every edge weighs 1; a missing attribute counts as 1.
    """
    if weight is None:
        return lambda u, v, d: 1
    if callable(weight):
        return weight
    if isinstance(weight, str):
        return lambda u, v, d: d.get(weight, 1)
    raise WeightError(f"weight must be an attribute name, a callable or None, got {weight!r}")

"""Turning a weight specification into one function, and checking weights."""

from __future__ import annotations

import math
import numbers
from typing import Any, Callable

from .errors import WeightError

__all__ = ["weight_function", "check_weight"]


def check_weight(value: Any, where: str) -> float:
    """Return ``value`` as a float, or raise WeightError naming ``where``.

    Weights must be real numbers (bool excluded), finite and non-negative.
    """
    if isinstance(value, bool) or not isinstance(value, numbers.Real):
        raise WeightError(f"weight of {where} is {value!r} ({type(value).__name__}); expected a real number")
    x = float(value)
    if math.isnan(x):
        raise WeightError(f"weight of {where} is NaN; expected a finite non-negative number")
    if math.isinf(x):
        raise WeightError(f"weight of {where} is infinite; expected a finite non-negative number")
    if x < 0:
        raise WeightError(f"weight of {where} is negative ({value!r}); weights must be >= 0")
    return x


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

"""The solver contract, written once: parameters, methods, deadlines, seeds, weights, results.

Every public solver (:func:`~sweepwidth.solve.cutwidth`,
:func:`~sweepwidth.solve.homology_width`,
:func:`~sweepwidth.solve.homotopy_height`) goes through this module:

* the parameter and method registries of :mod:`sweepwidth.registry`
  (:data:`PARAMETERS`, :func:`methods`, :func:`register_method`), re-exported
  here for the solver side; they live one layer down so that the checkers
  and the command line read them without importing any solver.
* :class:`Deadline` -- made once from ``time_limit`` by the public function
  (one validation rule, one safety margin :data:`MARGIN`) and passed down;
  internal calls never turn it back into a ``time_limit``.
* :func:`check_seed`, :func:`resolve_weight` -- the shared rules for ``seed``
  and the weight keyword (``weight=``; the old ``length=`` of
  :func:`homotopy_height` still works with a :class:`DeprecationWarning`).
* :func:`make_result` -- the one way a dispatcher turns bounds and a witness
  into a :class:`~sweepwidth.result.Result`.

Problems cross to child processes once, as the problem object itself
(:class:`~sweepwidth.problems.ordering.OrderingProblem`,
:class:`~sweepwidth.problems.cycles.FaceSweep` or
:class:`~sweepwidth.problems.homotopy.HomotopyProblem`) pickled by
:func:`sweepwidth.solve._deadline.run_limited`; the child never rebuilds or
re-validates the input graph.

This module imports no solver, so every room may import it without a cycle.
"""

from __future__ import annotations

from ..tables import plain

import decimal
import math
import numbers
import time
import warnings
from typing import Any, Iterable, Sequence

from ..errors import InvalidArgumentError, UnsupportedOptionError
from ..registry import (
    PARAMETERS,
    Method,
    Parameter,
    builtin_names,
    check_options,
    get_method,
    method_names,
    methods,
    parameter,
    register_method,
    unregister_method,
)
from ..result import Result

__all__ = [
    "MARGIN",
    "method_label",
    "reject_unknown_keywords",
    "die_with_parent",
    "isolated_context",
    "Deadline",
    "check_time_limit",
    "check_seed",
    "resolve_weight",
    "Parameter",
    "PARAMETERS",
    "parameter",
    "Method",
    "methods",
    "method_names",
    "get_method",
    "register_method",
    "unregister_method",
    "builtin_names",
    "check_options",
    "make_result",
    "use_fork_children",
]

#: seconds kept back from every time limit, once, for assembling the result
MARGIN = 0.05


# ------------------------------------------------------------------ time limits
def check_time_limit(time_limit: Any) -> float | None:
    """The time limit in seconds as a float (None: no limit).

    Accepted: None, or a real number >= 0 (int, float, Fraction, Decimal,
    numpy scalars).  ``math.inf`` means no limit.  Refused (with
    :class:`~sweepwidth.errors.InvalidArgumentError`): booleans, NaN,
    negative numbers, anything that is not a real number.

    Examples
    --------
    >>> from fractions import Fraction
    >>> check_time_limit(Fraction(1, 2)), check_time_limit(None), check_time_limit(float("inf"))
    (0.5, None, None)
    """
    if time_limit is None:
        return None
    ok = not isinstance(time_limit, bool) and isinstance(time_limit, (numbers.Real, decimal.Decimal))
    value = math.nan
    if ok:
        try:
            value = float(time_limit)
        except (TypeError, ValueError, OverflowError):  # pragma: no cover - exotic Real subclasses
            ok = False
    if not ok or math.isnan(value) or value < 0:
        raise InvalidArgumentError(f"time_limit must be a real number of seconds >= 0 or None, got {plain(time_limit)}")
    return None if math.isinf(value) else value


class Deadline:
    """The end of a solve on the :func:`time.monotonic` clock, made once from ``time_limit``.

    ``Deadline.from_limit(time_limit)`` validates the limit
    (:func:`check_time_limit`) and keeps :data:`MARGIN` seconds back for
    assembling the result; every stage below gets this object (or a shorter
    one from :meth:`within`) and never a ``time_limit`` again.  Low-level
    algorithms take the plain monotonic value :attr:`at` (None: no limit).

    Examples
    --------
    >>> d = Deadline.from_limit(10)
    >>> 9.0 < d.remaining() <= 10.0, Deadline.from_limit(None).remaining()
    (True, inf)
    >>> d.within(1).remaining() <= 1.0
    True
    """

    __slots__ = ("at", "limit", "start")

    def __init__(self, at: float | None, *, limit: float | None = None, start: float | None = None) -> None:
        self.at = at
        self.limit = limit
        self.start = time.monotonic() if start is None else start

    @classmethod
    def from_limit(cls, time_limit: Any, *, start: float | None = None) -> "Deadline":
        """Validate ``time_limit`` and start counting (at ``start``, default now)."""
        limit = check_time_limit(time_limit)
        t0 = time.monotonic() if start is None else start
        return cls(None if limit is None else t0 + limit - MARGIN, limit=limit, start=t0)

    @classmethod
    def at_time(cls, at: float | None) -> "Deadline":
        """Wrap a monotonic end already computed (None: no limit)."""
        return cls(at)

    def remaining(self) -> float:
        """Seconds left (``inf`` without a limit; may be negative once passed)."""
        return math.inf if self.at is None else self.at - time.monotonic()

    def expired(self) -> bool:
        return self.at is not None and time.monotonic() >= self.at

    def within(self, seconds: float) -> "Deadline":
        """A deadline at most ``seconds`` from now and never after this one."""
        end = time.monotonic() + seconds
        return Deadline(end if self.at is None else min(self.at, end), start=self.start)

    def overran(self) -> float | None:
        """Seconds spent beyond the time limit itself (None when within it or unlimited)."""
        if self.limit is None:
            return None
        over = time.monotonic() - self.start - self.limit
        return over if over > 0 else None

    def __repr__(self) -> str:
        return f"Deadline({'no limit' if self.at is None else f'{self.remaining():.3f} s left'})"


# ------------------------------------------------------------------ seeds and weights
def check_seed(seed: Any) -> int | None:
    """The seed as an int (None: unseeded); a non-negative integer, not a bool.

    Examples
    --------
    >>> import numpy as np
    >>> check_seed(np.int64(3)), check_seed(None)
    (3, None)
    """
    if seed is None:
        return None
    if isinstance(seed, bool) or not isinstance(seed, numbers.Integral) or int(seed) < 0:
        raise InvalidArgumentError(f"seed must be a non-negative integer or None, got {plain(seed)}")
    return int(seed)


_UNSET: Any = object()


def resolve_weight(parameter: str, weight: Any, *, length: Any = _UNSET, allowed: Iterable[Any] | None = None,
                   callable_ok: bool = False) -> Any:
    """Check the weight keyword of a public solver (one convention: ``weight=``).

    ``weight`` is ``"weight"`` (the edge weights of the graph; the default),
    another edge-attribute name, None (unit weights) or, where
    ``callable_ok``, a function ``(u, v, data) -> weight``.  ``allowed``
    restricts the names a parameter understands.  ``length`` is the old
    keyword of :func:`~sweepwidth.solve.homotopy_height`: it still works and
    warns with :class:`DeprecationWarning`.

    Raises
    ------
    InvalidArgumentError
        A weight that is neither a string, None nor (where allowed) a callable,
        or both ``weight`` and ``length`` given.
    UnsupportedOptionError
        A weight name this parameter does not understand (lists the valid ones).
    """
    if length is not _UNSET:
        warnings.warn(f"{parameter}: the keyword 'length' is deprecated; use weight={length!r}",
                      DeprecationWarning, stacklevel=3)
        if weight != "weight" and weight != length:
            raise InvalidArgumentError(f"{parameter}: give weight= or the deprecated length=, not both")
        weight = length
    if not (weight is None or isinstance(weight, str) or (callable_ok and callable(weight))):
        what = "an edge attribute name, a function (u, v, data) -> weight, or None" if callable_ok else "an edge attribute name or None"
        raise InvalidArgumentError(f"weight must be {what}, got {weight!r}")
    if allowed is not None and (isinstance(weight, str) or weight is None):
        valid = list(allowed)
        if weight not in valid:
            raise UnsupportedOptionError(f"{parameter} weight", weight, valid)
    return weight


# ------------------------------------------------------------------ results
def method_label(requested: str, used: str) -> str:
    """``result.method``: what ran, as ``auto:NAME`` when ``method='auto'`` chose it.

    Examples
    --------
    >>> method_label("auto", "subset-dp"), method_label("bounds", "bounds"), method_label("auto", "auto:dp")
    ('auto:subset-dp', 'bounds', 'auto:dp')
    """
    if requested == "auto" and not str(used).startswith("auto"):
        return f"auto:{used}"
    return used


def reject_unknown_keywords(fn: Any) -> Any:
    """Wrap a public solver so that an unknown keyword raises UnsupportedOptionError listing the valid ones.

    Functions with ``**options`` check their options themselves; this guards
    the fixed keyword lists (a bare TypeError otherwise).
    """
    import functools
    import inspect

    sig = inspect.signature(fn)
    if any(p.kind is inspect.Parameter.VAR_KEYWORD for p in sig.parameters.values()):
        return fn
    valid = [n for n, p in sig.parameters.items() if p.kind is inspect.Parameter.KEYWORD_ONLY]

    @functools.wraps(fn)
    def checked(*args: Any, **kwargs: Any) -> Any:
        for k in kwargs:
            if k not in valid:
                from ..errors import UnsupportedOptionError

                raise UnsupportedOptionError(f"keyword of {fn.__name__}()", k, valid)
        return fn(*args, **kwargs)

    return checked


def make_result(
    parameter_name: str,
    *,
    lower: float | None,
    upper: float | None,
    witness: Any,
    method: str | None,
    seconds: float,
    stats: dict | None = None,
    optimal: bool | None = None,
    infeasible: str | None = None,
    eps: float = 1e-9,
) -> Result:
    """The one way to turn bounds and a witness into a :class:`~sweepwidth.result.Result`.

    ``infeasible`` (a reason) gives status 'infeasible' and stores the reason
    in ``stats['reason']``.  Otherwise the status is 'optimal' when
    ``optimal`` says so or, when ``optimal`` is None, when the bounds meet
    within ``eps`` (relative, at least absolute ``eps``); the lower bound is
    never reported above the upper one.

    Examples
    --------
    >>> r = make_result("cutwidth", lower=3.0, upper=3.0, witness=[0, 1], method="dp", seconds=0.0)
    >>> r.status, r.value
    ('optimal', 3.0)
    >>> make_result("cutwidth", lower=2.0, upper=3.0, witness=[0, 1], method="bnb", seconds=0.0).status
    'bounded'
    """
    stats = {} if stats is None else stats
    method = "" if method is None else method
    if infeasible is not None:
        stats["reason"] = infeasible
        return Result(parameter_name, "infeasible", None, None, None, None, method=method, seconds=seconds, stats=stats)
    if upper is None:
        return Result(parameter_name, "bounded", None, lower, None, witness, method=method, seconds=seconds, stats=stats)
    if lower is None:
        lower = 0.0
    if optimal is None:
        optimal = upper - lower <= eps * max(1.0, abs(lower), abs(upper))
    lower = upper if optimal else min(lower, upper)
    return Result(parameter_name, "optimal" if optimal else "bounded", upper if optimal else None, lower, upper,
                  witness, method=method, seconds=seconds, stats=stats)


# ------------------------------------------------------------------ child processes
def use_fork_children() -> bool:
    """Let later time-limited children of this process start by a plain fork.

    For a freshly forked, single-threaded worker process (the benchmark
    runner's task child), where starting a forkserver would cost a new
    interpreter per task.  Returns False where fork is not available.
    """
    from . import _deadline

    return _deadline.use_start_method("fork")


def die_with_parent() -> None:
    """In a child process: end this process when its parent goes away.

    Linux: a parent-death signal; every platform: a watchdog thread on the
    parent's sentinel (see :func:`sweepwidth.solve._deadline.die_with_parent`).
    """
    from . import _deadline

    _deadline.die_with_parent()


def isolated_context(key: str, preload: Sequence[str]) -> Any:
    """A multiprocessing-like context whose children never run the caller's ``__main__``.

    One private forkserver per ``key`` (spawn where the platform has none),
    importing ``preload`` once (see :class:`sweepwidth.solve._deadline.IsolatedContext`).
    """
    from . import _deadline

    return _deadline.IsolatedContext(key, preload)

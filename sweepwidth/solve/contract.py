"""The solver contract, written once: parameters, methods, deadlines, seeds, weights, results.

Every public solver (:func:`~sweepwidth.solve.cutwidth`,
:func:`~sweepwidth.solve.homology_width`,
:func:`~sweepwidth.solve.homotopy_height`) goes through this module:

* :data:`PARAMETERS` -- one :class:`Parameter` per computed parameter: its
  public function, its checker module, the kind of input it takes and the
  options the command line and the benchmark runner may pass.  The
  dispatcher facade (:mod:`sweepwidth.solve`), the command line, the
  benchmark runner and its child processes, the checkers and the drawing
  command all read this table; adding a parameter is one entry here plus
  its room under ``sweepwidth/solve/``.
* :func:`methods` -- one :class:`Method` per solving method of a parameter
  (name, function, accepted options, what it guarantees, a one-line doc).
  The dispatchers validate method names and options against it, the command
  line lists it in ``--help``, the benchmark runner checks task methods
  against it.  Adding a method is one file plus one :func:`register_method`
  call (or one entry in ``_BUILTIN_METHODS``).
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

import decimal
import importlib
import math
import numbers
import time
import warnings
from dataclasses import dataclass, field
from typing import Any, Callable, Iterable, Mapping

from ..errors import InvalidArgumentError, UnsupportedOptionError
from ..result import Result

__all__ = [
    "MARGIN",
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
        raise InvalidArgumentError(f"time_limit must be a real number of seconds >= 0 or None, got {time_limit!r}")
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
        raise InvalidArgumentError(f"seed must be a non-negative integer or None, got {seed!r}")
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


# ------------------------------------------------------------------ parameters
@dataclass(frozen=True)
class Parameter:
    """One computed parameter: where its solver, checker and options are.

    Attributes
    ----------
    name : str
        The value of ``Result.parameter`` (and of ``--param``).
    title : str
        Its name in prose.
    function : str
        ``"module:attribute"`` of the public solver function.
    checker : str
        Module that registers the independent checker (:mod:`sweepwidth.verify`).
    problem : {'graph', 'plane'}
        Any graph (a plane graph is read as its graph), or a plane graph.
    options : tuple of str
        Keyword options the command line and the benchmark runner may pass
        (besides ``method``, ``time_limit`` and ``seed``).
    """

    name: str
    title: str
    function: str
    checker: str
    problem: str
    options: tuple[str, ...] = ()

    @property
    def module(self) -> str:
        return self.function.partition(":")[0]

    @property
    def function_name(self) -> str:
        return self.function.partition(":")[2]

    def solver(self) -> Callable[..., Result]:
        """The public solver function (imported on first use)."""
        return getattr(importlib.import_module(self.module), self.function_name)


#: every parameter the library computes, by ``Result.parameter`` name
PARAMETERS: dict[str, Parameter] = {
    p.name: p
    for p in (
        Parameter("cutwidth", "cutwidth", "sweepwidth.solve.ordering:cutwidth", "sweepwidth.verify.ordering", "graph",
                  ("first", "last", "weight", "solver")),
        Parameter("homology", "homology sweep width", "sweepwidth.solve.homology:homology_width",
                  "sweepwidth.verify.homology", "plane", ("start", "end", "holes", "monotone")),
        Parameter("homotopy", "homotopy height", "sweepwidth.solve.homotopy:homotopy_height",
                  "sweepwidth.verify.homotopy", "plane",
                  ("start", "end", "spikes", "simple", "monotone", "weight", "length", "holes", "s", "t")),
    )
}


def parameter(name: str) -> Parameter:
    """The :class:`Parameter` called ``name``; UnsupportedOptionError lists the valid ones."""
    try:
        return PARAMETERS[name]
    except (KeyError, TypeError):
        raise UnsupportedOptionError("parameter", name, list(PARAMETERS)) from None


# ------------------------------------------------------------------ methods
@dataclass(frozen=True)
class Method:
    """One solving method of a parameter.

    Attributes
    ----------
    parameter : str
        Name in :data:`PARAMETERS`.
    name : str
        The ``method=`` value.
    guarantee : {'exact', 'bounds', 'auto'}
        'exact': proves the optimum when it finishes; 'bounds': proven bounds
        and a witness, optimal only when they meet; 'auto': chooses among the
        others (``result.stats['auto']`` says which and why).
    doc : str
        One line for ``--help`` and the docs.
    options : tuple of str
        Keyword options it accepts besides the parameter's own.
    function : str, callable or None
        None for the methods built into the dispatcher of the parameter (it
        checks at import that it has one for every such entry); otherwise the
        method itself, or ``"module:attribute"`` naming it, called as the
        parameter's dispatcher documents for added methods.
    """

    parameter: str
    name: str
    guarantee: str
    doc: str
    options: tuple[str, ...] = ()
    function: str | Callable[..., Any] | None = field(default=None, compare=False)

    def load(self) -> Callable[..., Any] | None:
        """The method function (None for a built-in one)."""
        if self.function is None or callable(self.function):
            return self.function
        module, _, attr = self.function.partition(":")
        return getattr(importlib.import_module(module), attr)


_CW_AUTO = ("max_memory", "solver", "max_states", "improve", "dp_limit", "sat_options")
_HOM_OPTIONS = ("dp_limit", "max_faces", "cutwidth_method")

_BUILTIN_METHODS: tuple[Method, ...] = (
    Method("cutwidth", "auto", "auto", "DP when tiny, else bounds, heuristics, then bnb and SAT in the time left", _CW_AUTO),
    Method("cutwidth", "dp", "exact", "subset dynamic programming, O(2^n n) time and 16 * 2^n bytes", ("max_memory",)),
    Method("cutwidth", "bnb", "exact", "threshold search over prefix sets, real weights exactly", ("max_states", "improve")),
    Method("cutwidth", "sat", "exact", "incremental SAT on integral (or scaled rational) weights", ("solver", "improve", "sat_options")),
    Method("cutwidth", "tree", "exact", "forests: recursive three-branch bound, then the prefix-set search", ("max_states",)),
    Method("cutwidth", "heuristic", "bounds", "constructions and local search with the lower bounds", ("improve", "effort")),
    Method("homology", "auto", "auto", "subset DP for small sweeps, else the pinned cutwidth of the dual", _HOM_OPTIONS),
    Method("homology", "cutwidth", "exact", "nested sweeps as pinned cutwidth of the dual (a relaxation when crossing)", _HOM_OPTIONS),
    Method("homology", "subset-dp", "exact", "dynamic programming over swept face sets", _HOM_OPTIONS),
    Method("homology", "face-sets", "exact", "bottleneck search over toggle states (non-monotone sweeps)", _HOM_OPTIONS),
    Method("homotopy", "auto", "auto", "bounds, then the exact search in the time left (small instances)"),
    Method("homotopy", "bounds", "bounds", "constructed homotopies over face orders and the homology lower bound"),
    Method("homotopy", "search", "exact", "best-first search over walk states"),
)

_REGISTRY: dict[str, dict[str, Method]] = {p: {} for p in PARAMETERS}
for _m in _BUILTIN_METHODS:
    _REGISTRY[_m.parameter][_m.name] = _m
del _m


def methods(parameter_name: str) -> Mapping[str, Method]:
    """The methods of a parameter in registration order (a read-only view)."""
    parameter(parameter_name)
    return dict(_REGISTRY.setdefault(parameter_name, {}))


def method_names(parameter_name: str) -> list[str]:
    return list(methods(parameter_name))


def get_method(parameter_name: str, name: Any) -> Method:
    """The registered method; UnsupportedOptionError lists the valid names."""
    table = methods(parameter_name)
    if isinstance(name, str) and name in table:
        return table[name]
    raise UnsupportedOptionError(f"{parameter_name} method", name, list(table))


def register_method(method: Method) -> Method:
    """Add (or replace) a method; it appears in the dispatcher, ``--help`` and the benchmark runner."""
    parameter(method.parameter)
    if method.guarantee not in ("exact", "bounds", "auto"):
        raise InvalidArgumentError(f"a method's guarantee is 'exact', 'bounds' or 'auto', got {method.guarantee!r}")
    if method.function is None and method.name not in {m.name for m in _BUILTIN_METHODS if m.parameter == method.parameter}:
        raise InvalidArgumentError(f"method {method.name!r} of {method.parameter} needs a function")
    _REGISTRY.setdefault(method.parameter, {})[method.name] = method
    return method


def unregister_method(parameter_name: str, name: str) -> None:
    """Remove an added method (built-in ones come back as they were)."""
    table = _REGISTRY.setdefault(parameter_name, {})
    table.pop(name, None)
    for m in _BUILTIN_METHODS:
        if m.parameter == parameter_name and m.name == name:
            table[name] = m


def builtin_names(parameter_name: str) -> set[str]:
    """Names of the methods built into the dispatcher of a parameter."""
    return {m.name for m in _BUILTIN_METHODS if m.parameter == parameter_name}


def check_options(method: Method, options: Mapping[str, Any], *, what: str | None = None) -> None:
    """Refuse options the method does not accept (UnsupportedOptionError lists the accepted ones)."""
    for k in options:
        if k not in method.options:
            raise UnsupportedOptionError(what or f"option for method {method.name!r}", k, list(method.options))


# ------------------------------------------------------------------ results
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

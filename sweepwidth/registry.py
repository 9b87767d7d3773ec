"""The registries every layer reads: the parameters the library computes and their methods.

* :data:`PARAMETERS` -- one :class:`Parameter` per computed parameter: its
  public function, its checker module, the kind of input it takes and the
  options the command line and the benchmark runner may pass.  The solver
  facade (:mod:`sweepwidth.solve`), the command line, the benchmark runner
  and its child processes, the checkers (:mod:`sweepwidth.verify`) and the
  drawing command read this table; adding a parameter is one entry here
  plus its room under ``sweepwidth/solve/`` and its checker under
  ``sweepwidth/verify/``.
* :func:`methods` -- one :class:`Method` per solving method of a parameter
  (name, function, accepted options, what it guarantees, a one-line doc).
  The dispatchers validate method names and options against it, the command
  line lists it in ``--help``, the benchmark runner checks task methods
  against it.  Adding a method is one file plus one :func:`register_method`
  call (or one entry in ``_BUILTIN_METHODS`` for a method the dispatcher
  runs itself).

This module imports nothing of the package but its errors, so every layer
may read it without an import cycle.  Solvers are named by
``"module:attribute"`` strings and imported on first use.

See Also
--------
sweepwidth.solve.contract : deadlines, seeds, weights and results.
"""

from __future__ import annotations

import importlib
from dataclasses import dataclass, field
from typing import Any, Callable, Mapping

from .errors import InvalidArgumentError, UnsupportedOptionError

__all__ = [
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
]


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
    measure : str
        What the checker's number of a witness is called ('width' of an
        ordering or sweep, 'height' of a homotopy).
    """

    name: str
    title: str
    function: str
    checker: str
    problem: str
    options: tuple[str, ...] = ()
    measure: str = "width"

    @property
    def module(self) -> str:
        return self.function.partition(":")[0]

    @property
    def function_name(self) -> str:
        return self.function.partition(":")[2]

    def solver(self) -> Callable[..., Any]:
        """The public solver function (imported on first use)."""
        return getattr(importlib.import_module(self.module), self.function_name)


#: every parameter the library computes, by ``Result.parameter`` name
PARAMETERS: dict[str, Parameter] = {
    p.name: p
    for p in (
        Parameter("cutwidth", "cutwidth", "sweepwidth.solve.ordering:cutwidth", "sweepwidth.verify.ordering", "graph",
                  ("first", "last", "weight", "solver", "max_memory")),
        Parameter("homology", "homology sweep width", "sweepwidth.solve.homology:homology_width",
                  "sweepwidth.verify.homology", "plane", ("start", "end", "holes", "monotone")),
        Parameter("homotopy", "homotopy height", "sweepwidth.solve.homotopy:homotopy_height",
                  "sweepwidth.verify.homotopy", "plane",
                  ("start", "end", "spikes", "simple", "monotone", "weight", "length", "holes", "s", "t", "max_memory"),
                  measure="height"),
        Parameter("width", "homotopy width", "sweepwidth.solve.width:homotopy_width", "sweepwidth.verify.width", "plane",
                  ("a", "b", "start", "end", "backward", "spikes", "simple", "holes", "weight", "max_memory")),
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
    Method("cutwidth", "search", "bounds", "bounds with the flow bound, then the kick search", ("improve", "effort")),
    Method("cutwidth", "ratcatcher", "bounds", "carving-width bound of a plane graph (a ratcatcher-type game; agrees with brute force on small graphs, not yet proven)",
           ("max_memory",), function="sweepwidth.solve.ordering.ratcatcher:ratcatcher_method"),
    Method("homology", "auto", "auto", "subset DP for small sweeps, else the pinned cutwidth of the dual", _HOM_OPTIONS),
    Method("homology", "dual-cutwidth", "exact", "nested sweeps as pinned cutwidth of the dual (a relaxation when crossing)", _HOM_OPTIONS),
    Method("homology", "subset-dp", "exact", "dynamic programming over swept face sets", _HOM_OPTIONS),
    Method("homology", "face-sets", "exact", "bottleneck search over toggle states (non-monotone sweeps)", _HOM_OPTIONS),
    Method("homotopy", "auto", "auto", "bounds, then the exact search in the time left (small instances)"),
    Method("homotopy", "bounds", "bounds", "constructed homotopies over face orders and the homology lower bound"),
    Method("homotopy", "search", "exact", "best-first search over walk states"),
    Method("width", "auto", "auto", "bounds, then the exact leash search in the time left (small instances)"),
    Method("width", "bounds", "bounds", "Fréchet and closed-cone homology lower bounds, constructed and improved leash sweeps"),
    Method("width", "search", "exact", "bottleneck search over leash states (i, j, L)"),
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
    """The method names of a parameter, in registry order (built-in first, then added ones)."""
    return list(methods(parameter_name))


#: old method names still accepted (with a DeprecationWarning): (parameter, old name) -> new name
DEPRECATED_NAMES: dict[tuple[str, str], str] = {("homology", "cutwidth"): "dual-cutwidth"}


def get_method(parameter_name: str, name: Any) -> Method:
    """The registered method; UnsupportedOptionError lists the valid names.

    A deprecated name (:data:`DEPRECATED_NAMES`) gives its new method with a DeprecationWarning.
    """
    table = methods(parameter_name)
    new = DEPRECATED_NAMES.get((parameter_name, name)) if isinstance(name, str) else None
    if new is not None and name not in table:
        import warnings

        warnings.warn(f"the {parameter_name} method {name!r} is now called {new!r}", DeprecationWarning, stacklevel=3)
        name = new
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

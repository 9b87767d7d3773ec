"""Independent checkers: they recompute widths from the input, never trusting a solver.

:func:`check_result` dispatches on ``result.parameter`` to the checker
registered for it.
"""

from __future__ import annotations

from typing import Any, Callable

from ..errors import UnsupportedOptionError
from ..registry import PARAMETERS

__all__ = ["check_result", "register_checker"]

_CHECKERS: dict[str, Callable[..., float]] = {}
#: checker module of each parameter, from the registry :data:`sweepwidth.solve.contract.PARAMETERS`
_MODULES = {name: p.checker for name, p in PARAMETERS.items()}


def register_checker(parameter: str) -> Callable[[Callable[..., float]], Callable[..., float]]:
    """Decorator: ``fn(result, obj, **options) -> width`` checks results of ``parameter``."""

    def deco(fn: Callable[..., float]) -> Callable[..., float]:
        _CHECKERS[parameter] = fn
        return fn

    return deco


def check_result(result: Any, obj: Any, **options: Any) -> float:
    """Replay ``result.witness`` on ``obj``; return the recomputed width.

    Raises WitnessError when the witness is invalid or does not attain ``result.upper``.
    """
    p = result.parameter
    if p not in _CHECKERS and p in _MODULES:
        import importlib

        importlib.import_module(_MODULES[p])
    if p not in _CHECKERS:
        raise UnsupportedOptionError("parameter", p, sorted(_MODULES))
    return _CHECKERS[p](result, obj, **options)

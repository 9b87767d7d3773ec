"""Solvers: exact methods, bounds, heuristics, and one dispatcher per parameter.

Public entry points
-------------------
cutwidth(G, ...)          any graph (see :mod:`sweepwidth.solve.ordering`)
homology_width(P, ...)    Z2 sweeps of a plane graph (:mod:`sweepwidth.solve.homology`)
homotopy_height(P, ...)   discrete homotopies of a plane graph (:mod:`sweepwidth.solve.homotopy`)
homotopy_width(P, a, b)   leash sweeps between two walks (:mod:`sweepwidth.solve.width`)
"""

from __future__ import annotations

import importlib
from typing import Any

from ..registry import PARAMETERS

# public function -> the room that defines it (from the parameter registry)
_PUBLIC = {p.function_name: p.module for p in PARAMETERS.values()}

__all__ = sorted(_PUBLIC)


def __getattr__(name: str) -> Any:
    try:
        module = _PUBLIC[name]
    except KeyError:
        raise AttributeError(f"module 'sweepwidth.solve' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value

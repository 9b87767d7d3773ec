"""Solvers: exact methods, bounds, heuristics, and one dispatcher per parameter.

Public entry points
-------------------
cutwidth(G, ...)          any graph (see :mod:`sweepwidth.solve.ordering`)
homology_width(P, ...)    Z2 sweeps of a plane graph (:mod:`sweepwidth.solve.homology`)
homotopy_height(P, ...)   discrete homotopies of a plane graph (:mod:`sweepwidth.solve.homotopy`)
"""

from __future__ import annotations

import importlib
from typing import Any

_PUBLIC = {
    "cutwidth": "sweepwidth.solve.ordering",
    "homology_width": "sweepwidth.solve.homology",
    "homotopy_height": "sweepwidth.solve.homotopy",
}

__all__ = sorted(_PUBLIC)


def __getattr__(name: str) -> Any:
    try:
        module = _PUBLIC[name]
    except KeyError:
        raise AttributeError(f"module 'sweepwidth.solve' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value

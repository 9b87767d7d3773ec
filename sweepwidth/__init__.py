"""sweepwidth: exact and bounded sweep parameters of plane graphs.

Cutwidth of any graph, the Z2-homology sweep width of a plane graph and its
discrete homotopy height, with witnesses that an independent checker replays.

The public names are loaded lazily, so ``import sweepwidth`` stays cheap.
"""

from __future__ import annotations

import importlib
from typing import Any

__version__ = "0.1.0"

# public name -> module that defines it
_PUBLIC = {
    "PlaneGraph": "sweepwidth.plane",
    "read": "sweepwidth.io",
    "write": "sweepwidth.io",
    "cutwidth": "sweepwidth.solve",
    "homology_width": "sweepwidth.solve",
    "homotopy_height": "sweepwidth.solve",
    "homotopy_width": "sweepwidth.solve",
    "project_homotopy": "sweepwidth.solve.homotopy.projection",
    "solve_parameters": "sweepwidth.solve.joint",
    "draw": "sweepwidth.draw",
    "Result": "sweepwidth.result",
    "SweepwidthError": "sweepwidth.errors",
    "InvalidEmbeddingError": "sweepwidth.errors",
    "NonPlanarError": "sweepwidth.errors",
    "CrossingEdgesError": "sweepwidth.errors",
    "WeightError": "sweepwidth.errors",
    "FileFormatError": "sweepwidth.errors",
    "UnsupportedOptionError": "sweepwidth.errors",
    "InvalidArgumentError": "sweepwidth.errors",
    "InvalidCurveError": "sweepwidth.errors",
    "ProblemTooLargeError": "sweepwidth.errors",
    "WitnessError": "sweepwidth.errors",
}

__all__ = sorted(_PUBLIC) + ["__version__"]


# subpackages reachable as attributes (``sw.io.dumps``) without an explicit import
_SUBPACKAGES = ("io", "generators", "plane")


def __getattr__(name: str) -> Any:
    if name in _SUBPACKAGES:
        return importlib.import_module(f"sweepwidth.{name}")
    try:
        module = _PUBLIC[name]
    except KeyError:
        raise AttributeError(f"module 'sweepwidth' has no attribute {name!r}") from None
    if name == "draw":
        # the package itself, callable as its draw function: binding the function here would hide the
        # subpackage from ``import sweepwidth.draw.X as m`` (regression: test_cli_draw_options after test_api)
        return importlib.import_module("sweepwidth.draw")
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return __all__

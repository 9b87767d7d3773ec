"""Pictures: embeddings, duals, sweeps and width profiles (matplotlib, the optional ``plot`` extra).

Public functions
----------------
draw(P, ...)                  the embedding, weights, outer face, optional dual overlay
layout_positions(P)           vertex positions (own drawing or a planar layout of the rotation)
sweep_frames(P, result, ...)  a sheet of frames of a sweep or homotopy
sweep_animation(P, result, path, ...)  an animated GIF, one frame per step
width_profile(result, P, ...) the length of the curve or cut at each step, with the bounds
leash_frames(P, result, ...)  a sheet of frames of a leash sweep (homotopy width)
leash_profile(result, P, ...) the leash length at each step (a Figure)
leash_animation(P, result, path, ...)  an animated GIF of a leash sweep
bench_times(db, ...), bench_solved(db, ...)  plots from a results database
render_cli(path, ...)         what ``sweepwidth draw`` calls

matplotlib is imported only inside these functions; figures are built on an
Agg canvas without pyplot, so nothing global changes.
"""

from __future__ import annotations

import importlib
import sys
import types
from typing import Any

_PUBLIC = {
    "draw": "sweepwidth.draw._draw",
    "Scene": "sweepwidth.draw._draw",
    "layout_positions": "sweepwidth.draw._layout",
    "Geometry": "sweepwidth.draw._layout",
    "sweep_states": "sweepwidth.draw._replay",
    "sweep_frames": "sweepwidth.draw._sweep",
    "sweep_animation": "sweepwidth.draw._sweep",
    "width_profile": "sweepwidth.draw._profile",
    "leash_frames": "sweepwidth.draw._leash",
    "leash_profile": "sweepwidth.draw._leash",
    "leash_animation": "sweepwidth.draw._leash",
    "read_bench_rows": "sweepwidth.draw._bench",
    "bench_times": "sweepwidth.draw._bench",
    "bench_solved": "sweepwidth.draw._bench",
    "render_cli": "sweepwidth.draw._cli",
    "PALETTE": "sweepwidth.draw._style",
    "LINES": "sweepwidth.draw._style",
    "SERIES": "sweepwidth.draw._style",
}

__all__ = sorted(_PUBLIC)


def __getattr__(name: str) -> Any:
    try:
        module = _PUBLIC[name]
    except KeyError:
        raise AttributeError(f"module 'sweepwidth.draw' has no attribute {name!r}") from None
    value = getattr(importlib.import_module(module), name)
    globals()[name] = value
    return value


def __dir__() -> list[str]:
    return __all__


class _DrawingModule(types.ModuleType):
    """This package, callable as :func:`draw`.

    ``import sweepwidth.draw`` binds the *package* to the name ``draw`` in
    ``sweepwidth``, hiding the lazily exported function ``sweepwidth.draw``;
    calling the package forwards to the function, so ``sw.draw(P)`` works
    whichever way it was reached.
    """

    def __call__(self, *args: Any, **kwargs: Any) -> Any:
        return __getattr__("draw")(*args, **kwargs)


sys.modules[__name__].__class__ = _DrawingModule

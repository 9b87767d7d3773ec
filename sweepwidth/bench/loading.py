"""Loading instances and running one solve: the glue shared by the command line and the runner.

The solvers themselves live in :mod:`sweepwidth.solve`; this module only
maps a parameter name and a flat dictionary of options onto the right entry
point, so that a task can be described by plain data (and hashed, stored and
sent to another process).
"""

from __future__ import annotations

import inspect
import os
from typing import Any, Callable, Mapping

from ..errors import SweepwidthError, UnsupportedOptionError

__all__ = [
    "PARAMETERS",
    "OPTIONS",
    "load_instance",
    "is_plane",
    "solve_object",
    "check_object",
    "solver_for",
]

#: The parameters the library computes.
PARAMETERS = ("cutwidth", "homology", "homotopy")

#: Options each parameter's solver accepts besides method, time_limit and seed.
OPTIONS: dict[str, tuple[str, ...]] = {
    "cutwidth": ("first", "last", "weight", "solver"),
    "homology": ("start", "end", "holes", "monotone"),
    "homotopy": ("start", "end", "spikes", "simple", "monotone", "length", "holes", "s", "t"),
}

_ENTRY = {"cutwidth": "cutwidth", "homology": "homology_width", "homotopy": "homotopy_height"}


def load_instance(path: str | os.PathLike) -> Any:
    """Read an instance file with :func:`sweepwidth.read`.

    Raises
    ------
    FileFormatError
        If the file is missing or malformed (raised by the reader).
    SweepwidthError
        If this installation has no file reader.
    """
    p = os.fspath(path)
    if not os.path.exists(p):
        from ..errors import FileFormatError

        raise FileFormatError("no such file", path=p)
    try:
        from ..io import read
    except ImportError as err:
        raise SweepwidthError("reading instance files needs sweepwidth.io, which this installation lacks") from err
    return read(p)


def is_plane(obj: Any) -> bool:
    """True for a :class:`~sweepwidth.plane.PlaneGraph` (anything with faces and a dual)."""
    return hasattr(obj, "outer_face") and hasattr(obj, "dual") and hasattr(obj, "face_darts")


def solver_for(parameter: str) -> Callable[..., Any]:
    """The public solver function of ``parameter`` (imported lazily).

    Raises
    ------
    UnsupportedOptionError
        For an unknown parameter.
    SweepwidthError
        If the solver module is not part of this installation yet.
    """
    if parameter not in _ENTRY:
        raise UnsupportedOptionError("parameter", parameter, PARAMETERS)
    import importlib

    name = _ENTRY[parameter]
    try:
        # through the facade: module names need not match the entry points
        return getattr(importlib.import_module("sweepwidth.solve"), name)
    except ImportError as err:
        raise SweepwidthError(f"the {parameter} solver (sweepwidth.solve.{name}) is not available in this installation") from err


def _graph_for(parameter: str, obj: Any) -> Any:
    if parameter == "cutwidth":
        if is_plane(obj):
            return obj.to_networkx()
        return obj
    if not is_plane(obj):
        raise SweepwidthError(
            f"the {parameter} parameter needs a plane graph (an embedding), got {type(obj).__name__}; "
            "give a file with a rotation system, faces or positions"
        )
    return obj


def _with_file_curves(parameter: str, P: Any, opts: dict) -> dict:
    """Fill start, end and holes from the instance file's metadata when not given.

    A file's curves are ``{"vertex": v, "darts": [...]}`` walks or
    ``{"edges": [...]}`` edge sets.  Homology takes either (an edge set as a
    set of edge ids, a walk in its JSON form); homotopy takes walks only.
    """
    meta = getattr(P, "meta", None) or {}
    curves = meta.get("curves") or {}
    out = dict(opts)
    for name in ("start", "end"):
        if name in out or name not in curves:
            continue
        c = curves[name]
        if parameter == "homology":
            # an edge set as a set of edge ids; a walk in its JSON form (dart ids are not edge ids)
            out[name] = set(c["edges"]) if "edges" in c else {"vertex": c["vertex"], "darts": list(c["darts"])}
        else:
            if "edges" in c:
                continue  # an edge set is no walk; the solver's default applies
            out[name] = {"vertex": c["vertex"], "darts": list(c["darts"])}
    if "holes" not in out and meta.get("holes"):
        out["holes"] = sorted(int(f) for f in meta["holes"])
    return out


def solve_object(
    obj: Any,
    parameter: str,
    *,
    method: str = "auto",
    time_limit: float | None = None,
    seed: int | None = None,
    options: Mapping[str, Any] | None = None,
    progress: Callable[[Any], None] | None = None,
) -> Any:
    """Solve ``parameter`` on a loaded instance; return the solver's :class:`~sweepwidth.result.Result`.

    Parameters
    ----------
    obj : PlaneGraph or networkx.Graph
        A loaded instance; cutwidth of a plane graph is that of its graph.
    parameter : {'cutwidth', 'homology', 'homotopy'}
    method, time_limit, seed
        Passed to the solver.
    options : dict, optional
        Parameter-specific options (see :data:`OPTIONS`).
    progress : callable, optional
        Passed on when the solver accepts a ``progress`` keyword.

    Raises
    ------
    UnsupportedOptionError
        For an unknown parameter or option.
    SweepwidthError
        When the instance does not suit the parameter, or the solver refuses it.
    """
    if parameter not in OPTIONS:
        raise UnsupportedOptionError("parameter", parameter, PARAMETERS)
    opts = dict(options or {})
    for key in opts:
        if key not in OPTIONS[parameter]:
            raise UnsupportedOptionError(f"{parameter} option", key, OPTIONS[parameter])
    fn = solver_for(parameter)
    G = _graph_for(parameter, obj)
    if parameter != "cutwidth":
        opts = _with_file_curves(parameter, G, opts)
    kwargs: dict[str, Any] = dict(opts)
    kwargs.update(method=method, time_limit=time_limit, seed=seed)
    if progress is not None:
        try:
            accepts = "progress" in inspect.signature(fn).parameters
        except (TypeError, ValueError):
            accepts = False
        if accepts:
            kwargs["progress"] = progress
    return fn(G, **kwargs)


def check_object(result: Any, obj: Any) -> float:
    """Replay ``result``'s witness on the loaded instance with the independent checker.

    Raises
    ------
    WitnessError
        When the witness is invalid or does not attain the claimed bound.
    """
    G = _graph_for(result.parameter, obj)
    return float(result.check(G))

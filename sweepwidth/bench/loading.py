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

from ..errors import InputTypeError, InvalidCurveError, SweepwidthError, UnsupportedOptionError
from .. import registry

__all__ = [
    "PARAMETERS",
    "OPTIONS",
    "load_instance",
    "is_plane",
    "solve_object",
    "solve_objects",
    "check_object",
    "solver_for",
]

#: The parameters the library computes (read from :data:`sweepwidth.registry.PARAMETERS`).
PARAMETERS = tuple(registry.PARAMETERS)

#: Options each parameter's solver accepts besides method, time_limit and seed (from the same registry).
OPTIONS: dict[str, tuple[str, ...]] = {name: p.options for name, p in registry.PARAMETERS.items()}


def load_instance(path: str | os.PathLike) -> Any:
    """Read an instance file with :func:`sweepwidth.read`.

    Raises
    ------
    MissingFileError
        If the file is missing (a FileNotFoundError).
    FileFormatError
        If the file is malformed (raised by the reader).
    """
    p = os.fspath(path)
    if not os.path.exists(p):
        from ..errors import MissingFileError

        raise MissingFileError("no such file", path=p)
    from ..io import read

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
    """
    return registry.parameter(parameter).solver()


def _graph_for(parameter: str, obj: Any) -> Any:
    if registry.parameter(parameter).problem == "graph":
        if is_plane(obj):
            return obj.to_networkx()
        return obj
    if not is_plane(obj):
        raise InputTypeError(
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
    if parameter == "width":
        return _width_file_curves(curves, meta, out)
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


def _width_file_curves(curves: Mapping[str, Any], meta: Mapping[str, Any], out: dict) -> dict:
    """Walks ``a``, ``b`` and leashes ``start``, ``end`` of the width: names of the file's curves, or its defaults."""

    def walk(name: str, role: str) -> dict:
        c = curves.get(name)
        if c is None:
            have = ", ".join(sorted(map(str, curves))) or "none"
            raise InvalidCurveError(f"width: the instance has no curve named {name!r} for {role} (its curves: {have})")
        if "edges" in c:
            raise InvalidCurveError(f"width: curve {name!r} is an edge set, not a walk")
        return {"vertex": c["vertex"], "darts": list(c["darts"])}

    for key in ("a", "b", "start", "end"):
        if isinstance(out.get(key), str):
            out[key] = walk(out[key], key)
        elif key not in out and key in curves:
            out[key] = walk(key, key)
    if "a" not in out or "b" not in out:
        raise InvalidCurveError("width needs two walks: store curves 'a' and 'b' in the instance file "
                                "(see docs/formats.md) or name them with --walks")
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
    allowed = registry.parameter(parameter).options
    opts = dict(options or {})
    for key in opts:
        if key not in allowed:
            raise UnsupportedOptionError(f"{parameter} option", key, allowed)
    fn = solver_for(parameter)
    G = _graph_for(parameter, obj)
    if registry.parameter(parameter).problem == "plane":
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


def _walk_or_none(spec: Any) -> bool:
    return spec is None or (isinstance(spec, Mapping) and "darts" in spec)


def solve_objects(
    obj: Any,
    parameters: list[str],
    *,
    method: str = "auto",
    time_limit: float | None = None,
    seed: int | None = None,
    options: Mapping[str, Mapping[str, Any]] | None = None,
) -> dict[str, Any]:
    """Solve several parameters of one loaded instance; parameter name -> Result.

    Homology and homotopy asked together go to :func:`sweepwidth.solve_parameters`
    (each uses the other's bounds and witnesses) with ``2 * time_limit`` for
    the pair, so each gets about the limit a lone call would; that needs the
    two to sweep the same curves (both from the defaults, or the same walks
    ``{"vertex": v, "darts": [...]}``) and the same holes, and otherwise each
    parameter is solved alone by :func:`solve_object`, as is every other
    parameter.  ``options`` maps a parameter to its options.
    """
    opts_by = {p: dict((options or {}).get(p, {})) for p in parameters}
    out: dict[str, Any] = {}
    pair = "homology" in parameters and "homotopy" in parameters and is_plane(obj)
    if pair:
        ho = _with_file_curves("homology", obj, opts_by["homology"])
        to = _with_file_curves("homotopy", obj, opts_by["homotopy"])
        same = all(ho.get(k) == to.get(k) and _walk_or_none(ho.get(k)) for k in ("start", "end"))
        same = same and ho.get("holes") == to.get("holes") and set(ho) <= {"start", "end", "holes", "monotone"}
        if same:
            from ..solve.joint import solve_parameters

            hom_opts = {k: v for k, v in ho.items() if k not in ("start", "end", "holes")}
            htp_opts = {k: v for k, v in to.items() if k not in ("start", "end", "holes")}
            hom_opts["method"] = method
            htp_opts["method"] = method
            res = solve_parameters(obj, ["homology", "homotopy"], time_limit=None if time_limit is None else 2 * time_limit,
                                   seed=seed, start=to.get("start"), end=to.get("end"), holes=to.get("holes"),
                                   homology_options=hom_opts, homotopy_options=htp_opts)
            out.update(res)
    for p in parameters:
        if p not in out:
            out[p] = solve_object(obj, p, method=method, time_limit=time_limit, seed=seed, options=opts_by[p])
    return {p: out[p] for p in parameters}


def check_object(result: Any, obj: Any) -> float:
    """Replay ``result``'s witness on the loaded instance with the independent checker.

    Raises
    ------
    WitnessError
        When the witness is invalid or does not attain the claimed bound.
    """
    G = _graph_for(result.parameter, obj)
    return float(result.check(G))

"""The picture behind ``sweepwidth draw``: one call from a file name to a written picture."""

from __future__ import annotations

import os
from typing import Any, Mapping

import networkx as nx

from ..errors import InvalidArgumentError, SweepwidthError, UnsupportedOptionError
from ..io.saved import load_result
from ..plane import PlaneGraph
from ..registry import PARAMETERS

__all__ = ["render_cli", "load_result", "QUICK_LIMIT"]

#: seconds given to the solver when no saved result is passed
QUICK_LIMIT = 10.0

_PARAMS = tuple(PARAMETERS)
_EXTS = (".png", ".svg", ".gif")


#: parameters whose sweeps have no picture yet, with the refusal's reason (a clear error instead of a failed solve)
NOT_DRAWN: dict[str, str] = {}

#: options of the width's problem that ``render_cli`` passes to the solve (walks and leashes by name or as walks)
WIDTH_OPTIONS = ("a", "b", "start", "end", "holes", "backward", "spikes", "simple", "weight")


def _solve(obj: Any, param: str, dual: bool, time_limit: float | None = QUICK_LIMIT,
           options: Mapping[str, Any] | None = None) -> Any:
    if param in NOT_DRAWN:
        raise InvalidArgumentError(NOT_DRAWN[param])
    entry = PARAMETERS[param]
    if param == "width":
        # the walks and leashes come from the options, else from the file's curves (a, b, start, end)
        from ..bench.loading import solve_object

        if not isinstance(obj, PlaneGraph):
            raise InvalidArgumentError("width needs a plane graph; the file holds a graph without an embedding")
        return solve_object(obj, "width", time_limit=time_limit, options=dict(options or {}))
    solve = entry.solver()
    if entry.problem == "graph":
        target = obj.dual() if (dual and isinstance(obj, PlaneGraph)) else obj
        return solve(target, time_limit=time_limit)
    if not isinstance(obj, PlaneGraph):
        raise InvalidArgumentError(f"{param} needs a plane graph; the file holds a graph without an embedding")
    return solve(obj, time_limit=time_limit)


def render_cli(
    path: str | os.PathLike,
    *,
    param: str | None = None,
    result: str | os.PathLike | None = None,
    out: str | os.PathLike,
    dual: bool = False,
    frames: int | bool | None = False,
    time_limit: float | None = QUICK_LIMIT,
    options: Mapping[str, Any] | None = None,
) -> str:
    """Read an instance, get a sweep (saved or solved quickly) and write its picture.

    Parameters
    ----------
    path : str or path-like
        An instance file readable by :func:`sweepwidth.read`.
    param : {'cutwidth', 'homology', 'homotopy', 'width'}, optional
        The parameter to show; taken from ``result`` when omitted.  Without
        both, the embedding alone is drawn.
    result : str or path-like, optional
        A saved result (JSON of ``Result.to_dict()``, or a document holding it
        under ``"result"``).  Without it the library's 'auto' method runs with
        a time limit of :data:`QUICK_LIMIT` seconds.
    out : str or path-like
        The picture: ``.png`` or ``.svg`` (a still: the embedding at the widest
        step beside the width profile, or a sheet of frames), or ``.gif`` (an
        animation, one frame per step).
    dual : bool
        Overlay the dual; for cutwidth of a plane graph, sweep its dual (the
        ordering is of faces).
    frames : int or bool
        For stills, a sheet of this many frames instead of one picture
        (``True``: up to 12); for a GIF, at most this many frames.
    time_limit : float or None
        Seconds for the solve when no ``result`` is given (default
        :data:`QUICK_LIMIT`; None: no limit).
    options : mapping, optional
        For ``param='width'`` without a saved result: the problem's options
        (:data:`WIDTH_OPTIONS`); walks ``a``, ``b`` and leashes ``start``,
        ``end`` are names of the file's curves or walks.  Missing walks and
        leashes come from the file's curves ``a``, ``b``, ``start``, ``end``.
        A homotopy width is drawn as leash pictures: the longest leash
        beside the leash length profile, a sheet of frames, or a GIF (see
        :func:`sweepwidth.draw.leash_frames`).

    Returns
    -------
    str
        The path written.

    Raises
    ------
    SweepwidthError
        Unknown parameter or extension (the valid ones listed), a result about
        another parameter, a GIF without a sweep, width walks that the file
        does not have (named), options that do not apply, or a file that
        cannot be read.

    Examples
    --------
    >>> import os, tempfile, sweepwidth as sw
    >>> from sweepwidth import generators
    >>> d = tempfile.mkdtemp()
    >>> sw.write(generators.grid(2, 3), os.path.join(d, "g.json"))
    >>> out = render_cli(os.path.join(d, "g.json"), param="homology", out=os.path.join(d, "g.png"))
    >>> os.path.getsize(out) > 0
    True
    """
    from ._replay import peak_step, sweep_states
    from ._style import new_figure, require_matplotlib

    require_matplotlib()
    out = os.fspath(out)
    ext = os.path.splitext(out)[1].lower()
    if ext not in _EXTS:
        raise UnsupportedOptionError("picture extension", ext or out, list(_EXTS))
    if param is not None and param not in _PARAMS:
        raise UnsupportedOptionError("parameter", param, list(_PARAMS))
    from ..io import read

    obj = read(path)
    res = load_result(result) if result is not None else None
    if res is not None:
        if param is not None and res.parameter != param:
            raise InvalidArgumentError(f"the result is about {res.parameter!r}, not {param!r}")
        param = res.parameter
    opts = dict(options or {})
    if opts:
        bad = sorted(set(opts) - set(WIDTH_OPTIONS))
        if bad:
            raise UnsupportedOptionError("width drawing option", bad[0], list(WIDTH_OPTIONS))
        if param != "width":
            raise InvalidArgumentError("walk and leash options apply to the homotopy width only (param 'width')"
                                       + ("" if param is None else f", not to {param!r}"))
        if res is not None:
            raise InvalidArgumentError("walk and leash options do not apply to a saved result: "
                                       "it records the walks and leashes it was solved with")
    n_frames = 12 if frames is True else (int(frames) if frames else 0)
    if param is None and n_frames:
        raise InvalidArgumentError("frames show a sweep: give a parameter (--param) or a saved result (--result)")
    if param is None:
        if ext == ".gif":
            raise InvalidArgumentError("an animation needs a sweep: give --param or --result")
        plain = obj if isinstance(obj, PlaneGraph) else PlaneGraph.from_graph(obj)
        from ._draw import draw

        holes = [f for f in (plain.meta.get("holes") or []) if isinstance(f, int) and 0 <= f < plain.number_of_faces()]
        from ._draw import face_names

        ax = draw(plain, dual=dual, labels=plain.number_of_vertices() <= 40, holes=holes,
                  title=plain.meta.get("name"), face_labels=bool(face_names(plain)))
        ax.figure.savefig(out, dpi=ax.figure.dpi)
        return out
    if res is None:
        res = _solve(obj, param, dual, time_limit, **({"options": opts} if opts else {}))
    if res.witness is None:
        raise InvalidArgumentError(f"the {param} result ({res.status}) has no witness to draw")
    if param == "width":
        return _render_leashes(obj, res, out, ext, n_frames, dual)
    on = "faces" if (dual and param == "cutwidth") else "auto"
    if param == "cutwidth" and isinstance(obj, nx.Graph):
        try:
            embedded: PlaneGraph | None = PlaneGraph.from_graph(obj)
        except SweepwidthError:
            embedded = None
        if embedded is None:
            if ext == ".gif" or n_frames:
                raise InvalidArgumentError("frames of a cutwidth ordering need a planar graph; write a .png profile")
            from ._profile import width_profile

            ax = width_profile(res, obj)
            ax.figure.savefig(out, dpi=ax.figure.dpi)
            return out
        P = embedded
    else:
        P = obj
    labels = P.number_of_vertices() <= 30
    if ext == ".gif":
        from ._sweep import sweep_animation

        return sweep_animation(P, res, out, on=on, labels=labels, max_frames=n_frames or None)
    if n_frames:
        from ._sweep import sweep_frames

        fig = sweep_frames(P, res, max_frames=n_frames, on=on, labels=labels)
        fig.savefig(out, dpi=fig.dpi)
        return out
    # a still: the widest moment beside the width profile
    from ._profile import width_profile
    from ._sweep import _headline, _holes, draw_state

    states = sweep_states(P, res, on=on)
    peak = peak_step([s.length for s in states])
    fig = new_figure((11.0, 5.2), 100)
    ax1 = fig.add_axes((0.01, 0.03, 0.5, 0.84))
    ax2 = fig.add_axes((0.58, 0.18, 0.4, 0.6))
    sc = draw_state(P, states[peak], ax=ax1, holes=_holes(P, res), labels=labels, weights=True, peak=True)
    if dual:
        sc.dual()
    width_profile(res, P, ax=ax2, on=on)
    of_dual = "  (an ordering of the dual: faces of the plane graph)" if on == "faces" else ""
    fig.suptitle(_headline(res) + of_dual + (f"  -  {P.meta['name']}" if P.meta.get("name") else ""), fontsize=11)
    fig.savefig(out, dpi=fig.dpi)
    return out


def _render_leashes(obj: Any, res: Any, out: str, ext: str, n_frames: int, dual: bool) -> str:
    """The pictures of a homotopy width: the longest leash beside the profile, a sheet of frames, or a GIF."""
    from ._leash import draw_leash, leash_animation, leash_frames, leash_sweep_of
    from ._profile import plot_lengths
    from ._replay import _plane, peak_step
    from ._style import new_figure
    from ._sweep import _headline

    P = _plane(obj)
    labels = P.number_of_vertices() <= 30
    if ext == ".gif":
        return leash_animation(P, res, out, frames=n_frames or None, labels=labels)
    if n_frames:
        fig = leash_frames(P, res, frames=n_frames, labels=labels)
        fig.savefig(out, dpi=fig.dpi)
        return out
    sweep = leash_sweep_of(P, res)
    peak = peak_step(sweep.lengths)
    fig = new_figure((11.0, 5.2), 100)
    ax1 = fig.add_axes((0.01, 0.03, 0.5, 0.84))
    ax2 = fig.add_axes((0.58, 0.18, 0.4, 0.6))
    sc = draw_leash(P, sweep, peak, ax=ax1, labels=labels, weights=True, peak=True)
    if dual:
        sc.dual()
    plot_lengths(sweep.lengths, res, ax=ax2)
    fig.suptitle(_headline(res) + (f"  -  {P.meta['name']}" if P.meta.get("name") else ""), fontsize=11)
    fig.savefig(out, dpi=fig.dpi)
    return out

"""Pictures of leash sweeps (homotopy width): frames of the leash between walks A and B, and its length profile.

Every leash drawn here comes from the independent checker's replay,
:func:`sweepwidth.verify.width.leash_sweep`, which rebuilds each leash from
the witness and checks every move; nothing is taken from the solver.
"""

from __future__ import annotations

import os
from typing import Any, Hashable, Sequence

import numpy as np

from ..errors import InvalidArgumentError, WitnessError
from ..plane import PlaneGraph
from ._draw import Scene
from ._layout import Geometry
from ._profile import plot_lengths
from ._replay import SweepState, _plane, as_result, peak_step
from ._style import LINES, PALETTE, require_matplotlib
from ._sweep import _draw_walk, _fmt, _headline, _pick_steps, frame_sheet, write_gif

__all__ = ["leash_sweep_of", "leash_frames", "leash_profile", "leash_animation", "draw_leash", "leash_caption"]


def leash_sweep_of(P: Any, result: Any, **options: Any) -> Any:
    """The checker's replay of a homotopy width result, with a clear error for anything else.

    Parameters
    ----------
    P : PlaneGraph
    result : Result or dict
        A result with ``parameter='width'`` and a witness.
    **options
        Walks and options overriding ``result.stats['options']`` (``a``,
        ``b``, ``start``, ``end``, ``holes``, ``backward``, ``spikes``,
        ``simple``, ``weight``), as for :func:`sweepwidth.verify.width.leash_sweep`.

    Returns
    -------
    sweepwidth.verify.width.LeashSweep

    Raises
    ------
    InvalidArgumentError
        A result of another parameter (naming the picture functions for it).
    WitnessError
        No witness, walks not recorded nor given, or an illegal move.
    """
    from ..verify.width import leash_sweep

    result = as_result(result)
    if result.parameter != "width":
        raise InvalidArgumentError(
            f"leash pictures show homotopy width results (parameter 'width'), got a {result.parameter!r} result; "
            "draw it with sweep_frames or width_profile"
        )
    if result.witness is None:
        raise WitnessError(f"the width result ({result.status}) has no leash sweep witness to draw")
    return leash_sweep(result, _plane(P), **options)


def leash_caption(leash: Any) -> str:
    """What the move into ``leash`` did, in a few words ('start', 'flip face 7', 'a steps to a_2', ...)."""
    mv = leash.move
    if mv is None:
        return "start"
    op = mv.get("op")
    if op == "flip":
        return f"flip face {leash.face}"
    if op == "spike":
        return f"spike along edge {int(mv.get('dart', 0)) >> 1}"
    if op == "unspike":
        return "unspike"
    if op == "step":
        w = mv.get("walk")
        return f"{w} steps to {w}_{mv.get('to')}"
    return str(op)


def _flipped_between(sweep: Any, lo: int, hi: int) -> set[int]:
    """Faces flipped by the moves after leash ``lo`` up to leash ``hi``."""
    return {x.face for x in sweep.leashes[lo + 1 : hi + 1] if x.face is not None}


def _draw_path(sc: Scene, g: Geometry, darts: Sequence[int], role: str) -> None:
    """A walk of the problem (A or B) along its edges, in its own colour and dash."""
    if not darts:
        return
    line = np.vstack([g.dart_points(d) for d in darts])
    ls, lw = LINES[role]
    sc.ax.plot(line[:, 0], line[:, 1], color=PALETTE[role], linestyle=ls, linewidth=lw,
               solid_capstyle="round", zorder=sc.Z_DUAL)


def _mark_end(sc: Scene, g: Geometry, v: Hashable, role: str, marker: str) -> None:
    p = g.xy[v]
    sc.ax.scatter([p[0]], [p[1]], s=sc.vertex_size * 3.2, marker=marker, c=PALETTE[role],
                  edgecolors=PALETTE["ink"], linewidths=1.0, zorder=sc.Z_VERTEX)


def _name_walk(sc: Scene, g: Geometry, v: Hashable, name: str, role: str) -> None:
    """The walk's name beside its first vertex (A up and left, B down and right, so shared starts stay legible)."""
    import matplotlib.patheffects as pe

    p = g.xy[v]
    dx, dy, ha, va = (-8, 7, "right", "bottom") if name == "A" else (8, -7, "left", "top")
    sc.ax.annotate(name, (p[0], p[1]), xytext=(dx, dy), textcoords="offset points", fontsize=8, fontweight="bold",
                   ha=ha, va=va, color=PALETTE[role], zorder=sc.Z_TEXT,
                   path_effects=[pe.withStroke(linewidth=2.2, foreground="white")])


def draw_leash(
    P: PlaneGraph,
    sweep: Any,
    k: int,
    *,
    ax: Any,
    geometry: Geometry | None = None,
    since: int | None = None,
    weights: bool | str = False,
    labels: bool = False,
    title: str | None = None,
    peak: bool = False,
) -> Scene:
    """Draw leash ``k`` of a replayed sweep into ``ax``.

    The plane graph is faint; walk A (dashed green) and walk B (dotted ochre)
    run along their edges, the leash is the heavy blue walk beside its edges
    (a point is a ring), ``a_i`` is a disc and ``b_j`` a square in the walks'
    colours, and the faces flipped after leash ``since`` (default ``k - 1``)
    up to leash ``k`` are shaded.  The title gives the step, the move and the
    leash length.

    Returns
    -------
    Scene
        Its geometry can be reused for the next frame.
    """
    if not 0 <= k < len(sweep.leashes):
        raise InvalidArgumentError(f"step {k} is outside 0..{len(sweep.leashes) - 1}")
    lo = k - 1 if since is None else since
    leash = sweep.leashes[k]
    sc = Scene(P, ax, geometry)
    g = sc.g
    sc.frame(margin=0.08)
    sc.faces(shade=_flipped_between(sweep, lo, k) if lo < k else set(), holes=set(sweep.holes) - {P.outer_face})
    sc.edges(weights=weights, colour=PALETTE["faint"], width=0.9)
    sc.vertices(labels=labels, faint=True)
    _draw_path(sc, g, sweep.a_darts, "walk_a")
    _draw_path(sc, g, sweep.b_darts, "walk_b")
    _name_walk(sc, g, sweep.a_vertices[0], "A", "walk_a")
    _name_walk(sc, g, sweep.b_vertices[0], "B", "walk_b")
    state = SweepState(leash.step, leash_caption(leash), leash.length, walk=list(leash.darts),
                       point=leash.a_end if not leash.darts else None, closed=False)
    _draw_walk(sc, state)
    _mark_end(sc, g, leash.a_end, "walk_a", "o")
    _mark_end(sc, g, leash.b_end, "walk_b", "s")
    if title is None:
        title = (f"step {leash.step}: {state.caption}\nleash length {_fmt(leash.length)}  (a_{leash.i}, b_{leash.j})"
                 + ("  longest" if peak else ""))
    ax.set_title(title, fontsize=8.5, color=PALETTE["upper"] if peak else PALETTE["ink"],
                 fontweight="bold" if peak else "normal")
    return sc


def _chosen(sweep: Any, frames: int, steps: Sequence[int] | None) -> list[int]:
    n = len(sweep.leashes)
    if steps is None:
        return _pick_steps(n, sweep.lengths, max(1, int(frames)))
    chosen = sorted({int(s) for s in steps})
    bad = [s for s in chosen if not 0 <= s < n]
    if bad or not chosen:
        raise InvalidArgumentError(f"step {bad[0] if bad else None} is outside 0..{n - 1}")
    return chosen


def _check_frames(frames: Any) -> int:
    if isinstance(frames, bool) or not isinstance(frames, (int, np.integer)) or frames < 1:
        raise InvalidArgumentError(f"frames must be a positive integer, got {frames!r}")
    return int(frames)


def leash_frames(
    P: Any,
    result: Any,
    *,
    frames: int = 12,
    steps: Sequence[int] | None = None,
    ncols: int | None = None,
    weights: bool | str = False,
    labels: bool = False,
    panel_size: float = 3.0,
    dpi: float = 100.0,
    **options: Any,
) -> Any:
    """A sheet of frames of a leash sweep (homotopy width), step by step.

    Each frame shows the plane graph faintly, walk A and walk B in their own
    colours and dashes, the current leash heavy with its ends ``a_i`` (disc)
    and ``b_j`` (square) marked, and the faces flipped since the previous
    frame shaded.  Titles give the step, the move and the leash length; the
    longest leash's frame is in bold.

    Parameters
    ----------
    P : PlaneGraph
    result : Result or dict
        A homotopy width result (``parameter='width'``) with a witness.
    frames : int
        At most this many frames: with more leashes, the start, the end, the
        longest leash and evenly spread others.
    steps : sequence of int, optional
        Exactly these leashes (0 = start) instead.
    ncols : int, optional
        Frames per row (default: the sheet closest to 4:3 landscape).
    weights, labels : bool
        Edge weights and vertex labels in every frame.
    panel_size, dpi : float
        Inches along the drawing's longer side of each frame, and resolution.
    **options
        Walks and options overriding ``result.stats['options']`` (see
        :func:`sweepwidth.verify.width.leash_sweep`).

    Returns
    -------
    matplotlib.figure.Figure

    Raises
    ------
    SweepwidthError
        Without matplotlib, for a result of another parameter or without a
        witness, walks neither recorded nor given, a bad ``frames`` or
        ``steps``; :class:`~sweepwidth.errors.WitnessError` when the
        checker's replay fails (naming the move).

    See Also
    --------
    leash_profile, leash_animation, sweepwidth.verify.width.leash_sweep

    References
    ----------
    .. [1] E. W. Chambers, É. Colin de Verdière, J. Erickson, S. Lazard,
       F. Lazarus and S. Thite, "Homotopic Fréchet distance between curves
       or, walking your dog in the woods in polynomial time",
       Computational Geometry 43(3), 2010.

    Examples
    --------
    >>> from sweepwidth import generators, homotopy_width
    >>> P = generators.grid(2, 3)                     # two squares side by side
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> fig = leash_frames(P, r, frames=3)
    >>> len([ax for ax in fig.axes if ax.get_visible()])
    3
    """
    require_matplotlib()
    frames = _check_frames(frames)
    result = as_result(result)
    P = _plane(P)
    sweep = leash_sweep_of(P, result, **options)
    chosen = _chosen(sweep, frames, steps)
    geom = Geometry(P)
    fig, axes = frame_sheet(geom, len(chosen), panel_size=panel_size, ncols=ncols, dpi=dpi)
    peak = peak_step(sweep.lengths)
    prev = None
    for ax, s in zip(axes, chosen):
        draw_leash(P, sweep, s, ax=ax, geometry=geom, since=s if prev is None else prev, weights=weights,
                   labels=labels, peak=(s == peak))
        prev = s
    fig.suptitle(_headline(result), fontsize=10, y=0.995, va="top")
    return fig


def leash_profile(
    result: Any,
    P: Any,
    *,
    ax: Any = None,
    title: str | None = None,
    figsize: tuple[float, float] = (6.0, 3.2),
    dpi: float = 100.0,
    **options: Any,
) -> Any:
    """The leash length at every step of a leash sweep, the longest marked, with the result's bounds.

    Parameters
    ----------
    result : Result or dict
        A homotopy width result with a witness.
    P : PlaneGraph
    ax : matplotlib Axes, optional
        Draw into it (its Figure is returned).
    title : str, optional
    figsize, dpi
        For a new figure.
    **options
        Walks and options overriding ``result.stats['options']``.

    Returns
    -------
    matplotlib.figure.Figure
        One Axes: the lengths (step 0 = the start leash) as a line, the
        longest leash starred, the lower bound dashed and the upper bound
        dotted when the result has them.

    Raises
    ------
    SweepwidthError
        As for :func:`leash_frames`.

    Notes
    -----
    The lengths are the checker's replay (:func:`sweepwidth.verify.width.leash_sweep`).

    Examples
    --------
    >>> from sweepwidth import generators, homotopy_width
    >>> P = generators.grid(2, 3)
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> fig = leash_profile(r, P)
    >>> float(max(fig.axes[0].lines[0].get_ydata())) == r.value
    True
    """
    require_matplotlib()
    result = as_result(result)
    sweep = leash_sweep_of(P, result, **options)
    ax = plot_lengths(sweep.lengths, result, ax=ax, title=title, figsize=figsize, dpi=dpi)
    return ax.figure


def leash_animation(
    P: Any,
    result: Any,
    path: str | os.PathLike,
    *,
    fps: float = 2.0,
    frames: int | None = None,
    weights: bool | str = False,
    labels: bool = False,
    figsize: tuple[float, float] = (5.0, 5.4),
    dpi: float = 80.0,
    **options: Any,
) -> str:
    """Write an animated GIF of a leash sweep: one frame per leash (or ``frames`` of them).

    Parameters
    ----------
    P : PlaneGraph
    result : Result or dict
        A homotopy width result with a witness.
    path : str or path-like
        The ``.gif`` file.
    fps : float
    frames : int, optional
        At most this many frames (the start, the end, the longest leash and
        evenly spread others); default every leash.
    weights, labels, figsize, dpi
        As for :func:`leash_frames`; size of each frame.
    **options
        Walks and options overriding ``result.stats['options']``.

    Returns
    -------
    str
        The path written.

    Examples
    --------
    >>> import os, tempfile
    >>> from sweepwidth import generators, homotopy_width
    >>> P = generators.grid(2, 3)
    >>> r = homotopy_width(P, {"vertices": [(0, 0), (0, 1), (0, 2)]}, {"vertices": [(1, 0), (1, 1), (1, 2)]})
    >>> out = leash_animation(P, r, os.path.join(tempfile.mkdtemp(), "leash.gif"), dpi=30)
    >>> os.path.getsize(out) > 0
    True
    """
    require_matplotlib()
    path = os.fspath(path)
    if not path.lower().endswith(".gif"):
        raise InvalidArgumentError(f"an animation is written as .gif, got {path!r}")
    result = as_result(result)
    P = _plane(P)
    sweep = leash_sweep_of(P, result, **options)
    keep = _chosen(sweep, _check_frames(frames), None) if frames is not None else list(range(len(sweep.leashes)))
    peak = peak_step(sweep.lengths)
    geom = Geometry(P)
    last = len(sweep.leashes) - 1
    prev: list[int] = []

    def one(fig: Any, s: int) -> None:
        ax = fig.add_axes((0.02, 0.02, 0.96, 0.84))
        draw_leash(P, sweep, s, ax=ax, geometry=geom, since=prev[-1] if prev else s, weights=weights,
                   labels=labels, peak=(s == peak))
        fig.suptitle(_headline(result) + f"  -  {s}/{last}", fontsize=9, y=0.99, va="top")
        prev.append(s)

    return write_gif(path, keep, one, fps=fps, figsize=figsize, dpi=dpi)

"""Pictures of sweeps: a sheet of frames and an animated GIF, one frame per step."""

from __future__ import annotations

import math
import os
from typing import Any, Callable, Sequence

import numpy as np

from ..errors import InvalidArgumentError, MissingDependencyError, SweepwidthError
from ..plane import PlaneGraph
from ._draw import Scene
from ._layout import Geometry
from ._replay import SweepState, _plane, as_result, peak_step, sweep_states
from ._style import LINES, PALETTE, new_figure, require_matplotlib

__all__ = ["sweep_frames", "sweep_animation", "draw_state", "frame_sheet", "write_gif"]


def _fmt(x: float | None) -> str:
    if x is None:
        return "?"
    return str(int(x)) if float(x).is_integer() else f"{x:.4g}"


def _holes(P: PlaneGraph, result: Any) -> set[int]:
    stats = dict(result.stats or {})
    h = stats.get("holes")
    if h is None:
        h = (stats.get("options") or {}).get("holes")
    try:
        hs = {int(f) for f in h} if h is not None else {P.outer_face}
    except (TypeError, ValueError):
        hs = {P.outer_face}
    return {f for f in hs if 0 <= f < P.number_of_faces()}


# ------------------------------------------------------------------ walks
def _walk_pieces(g: Geometry, walk: Sequence[int], closed: bool) -> list[np.ndarray]:
    """One polyline per dart of the walk, offset to the dart's left.

    Repeated traversals of an edge sit further out; a dart followed by its
    reverse (a spike, or any turn-back) is drawn as a short whisker that goes
    part of the way along the edge and back.
    """
    L = len(walk)
    base = 0.085 * g.scale
    seen: dict[int, int] = {}
    cut_end = [1.0] * L
    cut_start = [0.0] * L
    used = [False] * L
    pairs = range(L if closed else L - 1)
    for j in pairs:
        k = (j + 1) % L
        if L >= 2 and walk[k] == walk[j] ^ 1 and not used[j] and not used[k]:
            cut_end[j] = 0.55
            cut_start[k] = 0.45
            used[j] = used[k] = True
    pieces = []
    for j, d in enumerate(walk):
        # a dart and its reverse sit on opposite sides already; repeats of the same dart step outwards
        occ = seen.get(d, 0)
        seen[d] = occ + 1
        pts = g.dart_points(d)
        if cut_end[j] < 1.0 or cut_start[j] > 0.0:
            ts = np.linspace(cut_start[j], cut_end[j], 12)
            pts = np.array([g.point_on(d, t) for t in ts])
        # offset each point to the left of the local direction
        if len(pts) >= 2:
            tang = np.gradient(pts, axis=0)
            nrm = np.column_stack([-tang[:, 1], tang[:, 0]])
            lens = np.hypot(nrm[:, 0], nrm[:, 1])
            lens[lens == 0] = 1.0
            nrm = nrm / lens[:, None]
            pts = pts + nrm * base * (1.0 + 1.1 * occ)
        pieces.append(pts)
    return pieces


def _draw_walk(sc: Scene, state: SweepState) -> None:
    from matplotlib.collections import LineCollection

    g = sc.g
    ax = sc.ax
    if not state.walk:
        if state.point is not None:
            p = g.xy[state.point]
            ax.scatter([p[0]], [p[1]], s=sc.vertex_size * 6.0, facecolors="none", edgecolors=PALETTE["curve"],
                       linewidths=3.0, zorder=sc.Z_CURVE)
        return
    pieces = _walk_pieces(g, state.walk, state.closed)
    line = np.vstack(pieces + ([pieces[0][:1]] if state.closed else []))
    ls, lw = LINES["curve"]
    ax.plot(line[:, 0], line[:, 1], color=PALETTE["curve"], linewidth=lw * 0.85, linestyle=ls,
            solid_joinstyle="round", solid_capstyle="round", zorder=sc.Z_CURVE)
    if state.changed:
        ls, lw = LINES["move"]
        segs = []
        for j in state.changed:
            if 0 <= j < len(pieces):
                segs.append(pieces[j])
        # join consecutive changed pieces so that the new piece reads as one stroke
        if segs:
            ax.add_collection(LineCollection(segs, colors=PALETTE["move"], linewidths=lw * 0.85, linestyles=ls,
                                             zorder=sc.Z_MOVE, capstyle="round"))
    # the walk's start vertex and direction: a small arrow on the first dart
    first = pieces[0]
    if len(first) >= 2:
        a = first[len(first) // 2 - 1]
        b = first[len(first) // 2]
        ax.annotate("", xy=(b[0], b[1]), xytext=(a[0], a[1]), zorder=sc.Z_MOVE,
                    arrowprops=dict(arrowstyle="-|>", color=PALETTE["curve"], lw=0, mutation_scale=12))


def draw_state(
    P: PlaneGraph,
    state: SweepState,
    *,
    ax: Any,
    geometry: Geometry | None = None,
    holes: set[int] | None = None,
    weights: bool | str = False,
    labels: bool = False,
    title: str | None = None,
    peak: bool = False,
) -> Scene:
    """Draw one state of a sweep into ``ax``: swept faces, the cut, cycle or walk, the last change.

    Returns the :class:`Scene` (its geometry can be reused for the next frame).
    """
    sc = Scene(P, ax, geometry)
    sc.frame(margin=0.08)
    sc.faces(shade=state.swept, holes=(holes or set()) - {P.outer_face}, fresh=state.fresh)
    sc.edges(weights=weights)
    if state.walk is not None:
        _draw_walk(sc, state)
    else:
        sc.heavy_edges(state.edges)
    last = state.placed[-1:] if state.placed else []
    sc.vertices(labels=labels, filled=state.placed, mark=last)
    if title is None:
        title = f"step {state.step}: {state.caption}\nlength {_fmt(state.length)}" + ("  (widest)" if peak else "")
    ax.set_title(title, fontsize=8.5, color=PALETTE["upper"] if peak else PALETTE["ink"],
                 fontweight="bold" if peak else "normal")
    return sc


def _panel_box(geom: Geometry, size: float) -> tuple[float, float]:
    """Width and height (inches) of one frame: ``size`` along the drawing's longer side."""
    lo, hi = geom.bounds()
    w, h = float(hi[0] - lo[0]), float(hi[1] - lo[1])
    a = min(max(h / w, 0.5), 2.0) if w > 0 else 2.0
    return size * min(1.0, 1.0 / a), size * min(1.0, a)


def _pick_steps(n_states: int, lengths: list[float], max_frames: int) -> list[int]:
    """All states, or ``max_frames`` spread evenly that always include the widest one."""
    if n_states <= max_frames:
        return list(range(n_states))
    peak = peak_step(lengths)
    picks = {peak}
    for x in (0, n_states - 1):
        if len(picks) < max_frames:
            picks.add(x)
    for x in np.linspace(0, n_states - 1, max_frames):
        if len(picks) >= max_frames:
            break
        picks.add(int(round(x)))
    return sorted(picks)


def frame_sheet(geom: Geometry, k: int, *, panel_size: float = 3.0, ncols: int | None = None,
                dpi: float = 100.0) -> tuple[Any, list[Any]]:
    """A Figure with a grid of ``k`` panels shaped like the drawing, and the panels' Axes.

    Each panel is ``panel_size`` inches along the drawing's longer side; each
    row adds 0.45 in for titles and the sheet 0.35 in for its headline.
    Unless ``ncols`` is given, the column count is the one whose sheet is
    closest to 4:3 landscape with few empty cells.  Cells beyond ``k`` are
    hidden.
    """
    k = max(1, int(k))
    pw, ph = _panel_box(geom, panel_size)
    title_h, head_h = 0.45, 0.35
    if ncols:
        cols = max(1, int(ncols))
    else:  # the column count whose sheet is closest to 4:3 landscape, with few empty cells

        def badness(c: int) -> float:
            r = math.ceil(k / c)
            aspect = r * (ph + title_h) / (c * pw)
            return abs(math.log(aspect / 0.75)) + (r * c - k) / k

        cols = min(range(1, min(k, 6) + 1), key=lambda c: (badness(c), c))
    rows = int(math.ceil(k / cols))
    width, height = pw * cols, (ph + title_h) * rows + head_h
    fig = new_figure((width, height), dpi)
    axes = list(np.atleast_1d(fig.subplots(rows, cols, squeeze=False)).ravel())
    fig.subplots_adjust(left=0.005, right=0.995, bottom=0.005, top=1.0 - (head_h + title_h) / height,
                        wspace=0.04, hspace=title_h / ph)
    for ax in axes[k:]:
        ax.set_visible(False)
    return fig, axes


def write_gif(path: str, frames: Sequence[Any], draw_frame: Callable[[Any, Any], None], *, fps: float,
              figsize: tuple[float, float], dpi: float) -> str:
    """Write an animated GIF: ``draw_frame(fig, frame)`` draws each of ``frames`` on a cleared Figure."""
    try:
        from matplotlib.animation import PillowWriter
    except ImportError as err:  # pragma: no cover
        raise MissingDependencyError("GIF output needs Pillow (installed with matplotlib)") from err
    if not path.lower().endswith(".gif"):
        raise InvalidArgumentError(f"an animation is written as .gif, got {path!r}")
    fig = new_figure(figsize, dpi)
    writer = PillowWriter(fps=fps)  # type: ignore[arg-type]  # Pillow takes fractional rates
    with writer.saving(fig, path, dpi):
        for fr in frames:
            fig.clear()
            draw_frame(fig, fr)
            writer.grab_frame()
    return path


def _headline(result: Any) -> str:
    if result.status == "optimal":
        core = f"{result.parameter} {_fmt(result.value)} (optimal)"
    elif result.status == "infeasible":
        core = f"{result.parameter}: infeasible"
    else:
        core = f"{result.parameter} between {_fmt(result.lower)} and {_fmt(result.upper)}"
    return core + (f"  -  {result.method}" if result.method else "")


def sweep_frames(
    P: Any,
    result: Any,
    *,
    steps: Sequence[int] | None = None,
    max_frames: int = 12,
    ncols: int | None = None,
    on: str = "auto",
    weights: bool | str = False,
    labels: bool = False,
    panel_size: float = 3.0,
    dpi: float = 100.0,
) -> Any:
    """A sheet of frames showing a sweep step by step.

    Each frame shades the swept faces, outlines the face the step touched,
    and draws the current cut or Z2 cycle heavy (cutwidth, homology) or the
    current closed walk (homotopy), with the piece the last move inserted in
    a second colour and dash; spikes appear as short whiskers beside their
    edge, and a point as a ring.  Titles give the step, what it did and the
    length; the widest step is marked.

    Parameters
    ----------
    P : PlaneGraph
    result : Result or dict
        A result with a witness (see :func:`sweepwidth.draw.sweep_states`).
    steps : sequence of int, optional
        Which states to show (0 = start); default: all of them, or
        ``max_frames`` evenly spread ones that include the start, the end and
        the widest step.
    max_frames : int
    ncols : int, optional
        Frames per row (default up to 4).
    on : {'auto', 'vertices', 'faces'}
        For cutwidth witnesses: the ordering is of vertices or of faces.
    weights, labels : bool
        Edge weight labels and vertex labels in every frame.
    panel_size, dpi : float
        Inches along the longer side of each frame (the other side follows
        the drawing's shape, at least half as long), and resolution.  Each
        row adds 0.45 in for the titles and the sheet 0.35 in for its headline.

    Returns
    -------
    matplotlib.figure.Figure

    Raises
    ------
    SweepwidthError
        Without matplotlib, for a result without a witness, or a ``steps``
        entry out of range; :class:`~sweepwidth.errors.WitnessError` for a
        witness that cannot be replayed.

    Examples
    --------
    >>> from sweepwidth import generators
    >>> from sweepwidth.result import Result
    >>> P = generators.grid(2, 3)
    >>> r = Result("homology", "optimal", 6.0, 6.0, 6.0, witness=[f for f in P.faces if f != P.outer_face])
    >>> fig = sweep_frames(P, r)
    >>> len([ax for ax in fig.axes if ax.get_visible()])     # start and two steps
    3
    """
    require_matplotlib()
    result = as_result(result)
    P = _plane(P)
    states = sweep_states(P, result, on=on)
    lengths = [s.length for s in states]
    if steps is None:
        chosen = _pick_steps(len(states), lengths, max(1, int(max_frames)))
    else:
        chosen = [int(s) for s in steps]
        bad = [s for s in chosen if not 0 <= s < len(states)]
        if bad:
            raise InvalidArgumentError(f"step {bad[0]} is outside 0..{len(states) - 1}")
    geom = Geometry(P)
    fig, axes = frame_sheet(geom, len(chosen), panel_size=panel_size, ncols=ncols, dpi=dpi)
    holes = _holes(P, result)
    peak = peak_step(lengths)
    for ax, s in zip(axes, chosen):
        draw_state(P, states[s], ax=ax, geometry=geom, holes=holes, weights=weights, labels=labels,
                   peak=(s == peak))
    fig.suptitle(_headline(result), fontsize=10, y=0.995, va="top")
    return fig


def sweep_animation(
    P: Any,
    result: Any,
    path: str | os.PathLike,
    *,
    fps: float = 2.0,
    max_frames: int | None = None,
    on: str = "auto",
    weights: bool | str = False,
    labels: bool = False,
    figsize: tuple[float, float] = (5.0, 5.4),
    dpi: float = 80.0,
) -> str:
    """Write an animated GIF of a sweep: one frame per state (start, then one per step).

    Parameters
    ----------
    P : PlaneGraph
    result : Result or dict
        A result with a witness.
    path : str or path-like
        The ``.gif`` file to write.
    fps : float
        Frames per second.
    max_frames : int, optional
        Keep at most this many states (spread evenly, always with the widest);
        default: every state.
    on, weights, labels
        As for :func:`sweep_frames`.
    figsize, dpi
        Size of each frame.

    Returns
    -------
    str
        The path written.

    Raises
    ------
    SweepwidthError
        Without matplotlib or Pillow, or when ``path`` does not end in ``.gif``.

    Notes
    -----
    Uses matplotlib's ``PillowWriter``; one frame costs one Agg render.

    Examples
    --------
    >>> import os, tempfile
    >>> from sweepwidth import generators
    >>> from sweepwidth.result import Result
    >>> P = generators.grid(2, 3)
    >>> r = Result("homology", "optimal", 6.0, 6.0, 6.0, witness=[f for f in P.faces if f != P.outer_face])
    >>> out = sweep_animation(P, r, os.path.join(tempfile.mkdtemp(), "sweep.gif"), dpi=30)
    >>> os.path.getsize(out) > 0
    True
    """
    require_matplotlib()
    path = os.fspath(path)
    if not path.lower().endswith(".gif"):
        raise InvalidArgumentError(f"an animation is written as .gif, got {path!r}")
    result = as_result(result)
    P = _plane(P)
    states = sweep_states(P, result, on=on)
    lengths = [s.length for s in states]
    peak = peak_step(lengths)
    geom = Geometry(P)
    holes = _holes(P, result)
    keep = _pick_steps(len(states), lengths, max_frames) if max_frames else range(len(states))

    def one(fig: Any, s: SweepState) -> None:
        ax = fig.add_axes((0.02, 0.02, 0.96, 0.84))
        draw_state(P, s, ax=ax, geometry=geom, holes=holes, weights=weights, labels=labels, peak=(s.step == peak))
        fig.suptitle(_headline(result) + f"  -  {s.step}/{len(states) - 1}", fontsize=9, y=0.99, va="top")

    return write_gif(path, [states[i] for i in keep], one, fps=fps, figsize=figsize, dpi=dpi)

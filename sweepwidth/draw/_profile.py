"""Width profiles: the length of the cut, cycle or walk at every step of a sweep."""

from __future__ import annotations

from typing import Any, Hashable, Sequence

import networkx as nx
import numpy as np

from ..errors import InvalidArgumentError, SweepwidthError, WitnessError
from ..plane import PlaneGraph
from ._replay import _plane, as_result, peak_step, sweep_states
from ._style import LINES, PALETTE, new_figure, require_matplotlib

__all__ = ["width_profile", "step_lengths", "plot_lengths"]


def _ordering_cuts(G: nx.Graph, order: Sequence[Hashable]) -> list[float]:
    """Cut weight after each prefix (0 .. n) of an ordering of a networkx graph's nodes."""
    order = [tuple(x) if isinstance(x, list) else x for x in order]
    missing = [v for v in order if v not in G]
    if missing:
        raise WitnessError(f"the ordering names {missing[0]!r}, which is not a node of the graph")
    inside: set = set()
    cuts = [0.0]
    edges = list(G.edges(data=True))
    for v in order:
        inside.add(v)
        cuts.append(float(sum(float(d.get("weight", 1)) for a, b, d in edges if (a in inside) != (b in inside))))
    return cuts


def step_lengths(result: Any, obj: Any, *, on: str = "auto") -> list[float]:
    """The length at every state of a sweep (state 0 = start), recomputed from the witness.

    For homotopy width (``parameter='width'``) these are the leash lengths
    replayed by the independent checker (:func:`sweepwidth.verify.width.leash_sweep`).

    Parameters
    ----------
    result : Result or dict
    obj : PlaneGraph or networkx graph
        A networkx graph is enough for a cutwidth ordering of its nodes.
    on : {'auto', 'vertices', 'faces'}
        For cutwidth: what the ordering lists (see :func:`sweepwidth.draw.sweep_states`).

    Returns
    -------
    list of float

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.result import Result
    >>> r = Result("cutwidth", "optimal", 2.0, 2.0, 2.0, witness=[0, 1, 2, 3])
    >>> step_lengths(r, nx.cycle_graph(4))
    [0.0, 2.0, 2.0, 2.0, 0.0]
    """
    result = as_result(result)
    if result.parameter == "width":
        from ..verify.width import leash_sweep

        return leash_sweep(result, _plane(obj)).lengths
    if result.parameter == "cutwidth" and isinstance(obj, nx.Graph) and not isinstance(obj, PlaneGraph):
        if result.witness is None:
            raise WitnessError("the result has no witness ordering")
        return _ordering_cuts(obj, list(result.witness))
    return [s.length for s in sweep_states(obj, result, on=on)]


def width_profile(
    result: Any,
    obj: Any,
    *,
    ax: Any = None,
    on: str = "auto",
    title: str | None = None,
    figsize: tuple[float, float] = (6.0, 3.2),
    dpi: float = 100.0,
) -> Any:
    """Plot the length of the curve (or cut) at each step, with the proven bounds.

    The step line joins the lengths of all states (start = step 0); the
    lower and upper bounds of the result are horizontal lines (dashed and
    dotted); the widest step is marked and annotated.

    Parameters
    ----------
    result : Result or dict
        A result with a witness.
    obj : PlaneGraph or networkx graph
        The graph the result is about (a networkx graph suffices for a
        cutwidth ordering of its own nodes).
    ax : matplotlib Axes, optional
    on : {'auto', 'vertices', 'faces'}
        For cutwidth witnesses (see :func:`sweepwidth.draw.sweep_states`).
    title : str, optional
    figsize, dpi
        For a new figure.

    Returns
    -------
    matplotlib.axes.Axes

    Raises
    ------
    SweepwidthError
        Without matplotlib; :class:`~sweepwidth.errors.WitnessError` when the
        witness cannot be replayed.

    Notes
    -----
    The lengths are recomputed from the witness, not read from the solver.

    Examples
    --------
    >>> import networkx as nx
    >>> from sweepwidth.result import Result
    >>> r = Result("cutwidth", "optimal", 2.0, 2.0, 2.0, witness=[0, 1, 2, 3])
    >>> ax = width_profile(r, nx.cycle_graph(4))
    >>> [float(y) for y in ax.lines[0].get_ydata()]
    [0.0, 2.0, 2.0, 2.0, 0.0]
    """
    require_matplotlib()
    result = as_result(result)
    return plot_lengths(step_lengths(result, obj, on=on), result, ax=ax, title=title, figsize=figsize, dpi=dpi)


def plot_lengths(
    lengths: Sequence[float],
    result: Any,
    *,
    ax: Any = None,
    title: str | None = None,
    figsize: tuple[float, float] = (6.0, 3.2),
    dpi: float = 100.0,
) -> Any:
    """The plot behind :func:`width_profile`: ``lengths`` per step, the result's bounds, the widest step marked.

    Returns the Axes.
    """
    lengths = [float(x) for x in lengths]
    if not lengths:
        raise InvalidArgumentError("the witness has no steps to plot")
    if ax is None:
        fig = new_figure(figsize, dpi)
        ax = fig.add_axes((0.11, 0.16, 0.86, 0.72))
    x = np.arange(len(lengths))
    # one word for legend, axis and title
    quantity = {"cutwidth": "cut weight", "width": "leash length"}.get(result.parameter, "length")
    widest = "longest leash" if result.parameter == "width" else "widest"
    ls, lw = LINES["profile"]
    ax.plot(x, lengths, color=PALETTE["curve"], linestyle=ls, linewidth=lw, marker="o",
            markersize=3.5 if len(lengths) < 60 else 0, label=f"{quantity} at step", zorder=3)
    peak = peak_step(lengths)
    ax.scatter([peak], [lengths[peak]], s=90, marker="*", color=PALETTE["move"], edgecolors=PALETTE["ink"],
               linewidths=0.6, zorder=4, label=f"{widest}: {lengths[peak]:g} at step {peak}")
    for key, name in (("lower", "lower bound"), ("upper", "upper bound")):
        val = getattr(result, key)
        if val is None:
            continue
        ls, lw = LINES[key]
        ax.axhline(float(val), color=PALETTE[key], linestyle=ls, linewidth=lw, label=f"{name} {float(val):g}",
                   zorder=2)
    ax.set_xlabel("step")
    ax.set_ylabel(quantity)
    ax.set_xlim(-0.5, len(lengths) - 0.5)
    from matplotlib.ticker import MaxNLocator

    ax.xaxis.set_major_locator(MaxNLocator(integer=True))
    top = max(lengths + [float(result.upper or 0), float(result.lower or 0)])
    ax.set_ylim(0, top * 1.18 + 0.5)
    ax.grid(True, color=PALETTE["grid"], linewidth=0.6, zorder=0)
    ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.legend(fontsize=7, loc="upper right", frameon=False, ncol=2)
    if title is None:
        along = {"cutwidth": "ordering", "width": "leash sweep"}.get(result.parameter, "sweep")
        title = f"{result.parameter}: {quantity} along the {along}"
    ax.set_title(title, fontsize=9.5)
    return ax

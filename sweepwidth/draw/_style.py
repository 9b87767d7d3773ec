"""One look for every picture: colours, line styles, sizes, and the lazy matplotlib import.

The palette was chosen for readers without full colour vision and for
greyscale prints: every role has its own lightness (dark ink, mid-tone
curve, pale fills), and lines that could be confused also differ in dash
pattern and width, not in hue alone.

Nothing here touches matplotlib's global state: figures are built as
``matplotlib.figure.Figure`` objects on an Agg canvas, never through
``pyplot``, so the caller's backend and open figures are left alone.
"""

from __future__ import annotations

from typing import Any

from ..errors import InvalidArgumentError, SweepwidthError

__all__ = ["PALETTE", "LINES", "SERIES", "require_matplotlib", "new_figure", "lightness"]

#: Colours by role.  Comments give the approximate CIE lightness L* so that
#: greyscale separation can be checked at a glance (see :func:`lightness`).
PALETTE: dict[str, str] = {
    "ink": "#2b2b2b",  # edges of the plane graph, L* ~ 17
    "vertex_face": "#fbfbf7",  # vertex discs, L* ~ 98
    "vertex_edge": "#2b2b2b",
    "label": "#404040",  # vertex and weight labels
    "weight_box": "#ffffff",
    "curve": "#0b5c8a",  # the current cycle / walk / cut, L* ~ 37
    "move": "#d4691c",  # what the last step changed, L* ~ 58
    "swept": "#f0dfb4",  # the swept region, L* ~ 89
    "swept_edge": "#c9b27a",
    "outer": "#dfe6ee",  # the frame around the outer face, L* ~ 91
    "dual": "#7b4a9e",  # dual vertices and edges, L* ~ 40
    "hole": "#bdbdbd",  # faces that may not be swept, L* ~ 77
    "lower": "#2f7d4f",  # lower bound line, L* ~ 47
    "upper": "#8a1c3c",  # upper bound line, L* ~ 30
    "grid": "#e6e6e6",
    "faint": "#b5b5b5",  # the plane graph behind leash sweeps, L* ~ 74
    "walk_a": "#2f7d4f",  # walk A of a homotopy width, L* ~ 47 (dashed)
    "walk_b": "#b38f00",  # walk B, L* ~ 61 (dotted)
    "marker": "#111111",
}

#: Line styles by role: (linestyle, linewidth in points).
LINES: dict[str, tuple[Any, float]] = {
    "edge": ("-", 1.3),
    "curve": ("-", 3.4),
    "move": ((0, (3.0, 1.5)), 3.4),
    "dual": ((0, (4.0, 2.0)), 1.1),
    "profile": ("-", 1.8),
    "lower": ((0, (6.0, 3.0)), 1.4),
    "upper": ((0, (1.5, 1.5)), 1.6),
    "walk_a": ((0, (4.0, 1.6)), 2.2),
    "walk_b": ((0, (1.2, 1.2)), 2.6),
}

#: Series for plots with several methods: colour, marker, line style.  The
#: colours step through distinct lightness so that greyscale keeps them apart.
SERIES: list[tuple[str, str, Any]] = [
    ("#0b5c8a", "o", "-"),
    ("#d4691c", "s", (0, (5.0, 2.0))),
    ("#2f7d4f", "^", (0, (1.5, 1.5))),
    ("#7b4a9e", "D", (0, (6.0, 2.0, 1.5, 2.0))),
    ("#8a1c3c", "v", (0, (3.0, 1.0))),
    ("#6b6b6b", "P", (0, (1.0, 3.0))),
    ("#b38f00", "X", (0, (8.0, 2.0))),
]


def require_matplotlib() -> Any:
    """Import matplotlib lazily; a clear error names the ``plot`` extra when it is missing.

    Returns
    -------
    module
        The ``matplotlib`` module.

    Raises
    ------
    SweepwidthError
        When matplotlib is not installed.

    Examples
    --------
    >>> require_matplotlib().__name__
    'matplotlib'
    """
    try:
        import matplotlib
        from matplotlib.backends.backend_agg import FigureCanvasAgg  # noqa: F401
    except ImportError as err:  # pragma: no cover - depends on the environment
        raise InvalidArgumentError(
            "drawing needs matplotlib, which is not installed; install the 'plot' extra: "
            "pip install 'sweepwidth[plot]'"
        ) from err
    return matplotlib


def new_figure(figsize: tuple[float, float] = (6.0, 6.0), dpi: float = 100.0) -> Any:
    """A matplotlib Figure on an Agg canvas (no pyplot, no global backend switch).

    Examples
    --------
    >>> fig = new_figure((2, 1), dpi=50)
    >>> [int(x) for x in fig.get_size_inches() * fig.dpi]
    [100, 50]
    """
    require_matplotlib()
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=figsize, dpi=dpi)
    FigureCanvasAgg(fig)
    fig.patch.set_facecolor("white")
    return fig


def lightness(colour: str) -> float:
    """CIE L* (0 black .. 100 white) of a ``#rrggbb`` colour, to check greyscale contrast.

    Examples
    --------
    >>> round(lightness("#ffffff")), round(lightness("#000000"))
    (100, 0)
    """
    c = colour.lstrip("#")
    rgb = [int(c[i : i + 2], 16) / 255.0 for i in (0, 2, 4)]
    lin = [x / 12.92 if x <= 0.04045 else ((x + 0.055) / 1.055) ** 2.4 for x in rgb]
    y = 0.2126 * lin[0] + 0.7152 * lin[1] + 0.0722 * lin[2]
    return 116.0 * (y ** (1.0 / 3.0) if y > 216 / 24389 else (24389 / 27 * y + 16) / 116) - 16.0

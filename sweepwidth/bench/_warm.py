"""Warm-up imported by the task forkserver: compile (or load from cache) the solvers' kernels once.

Every task child is forked from the forkserver, so kernels loaded here are
ready in every child instead of being loaded again per task (see
``benchmarks/NOTES.md`` for the cost).  Each solve is tiny, runs
without a time limit (in this process, no children) and may fail silently:
a warm-up never stops the server from starting.
"""

from __future__ import annotations


_MODULES = (
    "numba",
    "scipy.sparse",
    "scipy.sparse.csgraph",
    "sweepwidth.solve.ordering.kernels",
    "sweepwidth.solve.ordering.bnb",
    "sweepwidth.solve.ordering.dp",
    "sweepwidth.solve.ordering.heuristics",
    "sweepwidth.solve.ordering.bounds",
    "sweepwidth.solve.ordering.sat_encoding",
    "sweepwidth.solve.ordering.sat",
    "sweepwidth.solve.homology.face_sets",
    "sweepwidth.solve.homotopy.search",
)


def _warm() -> None:
    import importlib

    for name in _MODULES:  # some are imported only on a time-limited path
        try:
            importlib.import_module(name)
        except Exception:  # noqa: BLE001 - warm-up only
            pass
    try:  # the first call of any compiled function sets up numba's typing and target contexts
        import numba

        @numba.njit(cache=False)
        def _one(x: int) -> int:  # pragma: no cover - compiled
            return x + 1

        _one(1)
    except Exception:  # noqa: BLE001 - warm-up only
        pass
    try:
        import networkx as nx

        from ..solve import cutwidth

        G = nx.cycle_graph(6)
        for method in ("auto", "bnb", "heuristic", "sat"):
            try:
                cutwidth(G, method=method)
            except Exception:  # noqa: BLE001
                pass
    except Exception:  # noqa: BLE001 - warm-up only
        pass
    try:
        from .. import generators
        from ..solve import homology_width, homotopy_height

        P = generators.wheel(4)
        homology_width(P)
        homotopy_height(P)
    except Exception:  # noqa: BLE001 - warm-up only
        pass


_warm()

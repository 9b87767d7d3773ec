"""Cutwidth: our engine against a straightforward CP-SAT model, side by side.

Usage::

    python benchmarks/cutwidth.py --quick        # a few minutes
    python benchmarks/cutwidth.py --full         # the goals' sizes and limits
    python benchmarks/cutwidth.py --ablation     # what each SAT idea buys
    python benchmarks/cutwidth.py --overhead     # child-process start-up cost
    python benchmarks/cutwidth.py --quick --out table.txt

"ours" is ``sweepwidth.cutwidth(G, method=M, time_limit=T)`` with ``M`` from
``--method``: 'auto' (the default: what users get; the dispatcher picks the
prefix-set search, the SAT engine or the tree search and says which in the
method column) or 'sat' (bounds and a heuristic upper bound from the
dispatcher, then the SAT engine of :mod:`sweepwidth.solve.ordering.sat`;
forests still use 'auto', which picks the tree search).  "s" is the wall time of that call, "sat s" the SAT
engine's share.  The baseline is a CP-SAT model built
here: one integer position per vertex, AllDifferent, one crossing indicator
per edge and gap, the width as the largest weighted gap sum, minimised with
one worker and the same time limit.  "ratio" is baseline time / our time when
both prove optimality, or a lower bound on it (prefixed ">") when only we do.

Known values (``known`` column) and their sources:

* grid P_m x P_n, 3 <= m <= n: m + 1 (Rolim, Sykora, Vrto, WG 1995, LNCS
  1017; from memory);
* hypercube Q_d: floor(2^(d+1) / 3) (attributed to Harper and to Nakano;
  from memory);
* complete binary tree of height h >= 2: ceil(h/2) + 1 (Lengauer, SIAM J.
  Algebraic Discrete Methods 1982; from memory).

Random instances (Delaunay triangulations of uniform points, weighted grids)
have no published value: both solvers' answers must agree when both prove.
"""

from __future__ import annotations

import argparse
import math
import statistics
import sys
import time
from pathlib import Path

import networkx as nx
import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

import sweepwidth as sw  # noqa: E402
from sweepwidth.problems.ordering import OrderingProblem  # noqa: E402


# ---------------------------------------------------------------------------
# instances


def grid(m: int, n: int) -> nx.Graph:
    return nx.convert_node_labels_to_integers(nx.grid_2d_graph(m, n), ordering="sorted")


def hypercube(d: int) -> nx.Graph:
    return nx.convert_node_labels_to_integers(nx.hypercube_graph(d), ordering="sorted")


def binary_tree(h: int) -> nx.Graph:
    return nx.balanced_tree(2, h)


def delaunay(n: int, seed: int) -> nx.Graph:
    from scipy.spatial import Delaunay

    pts = np.random.default_rng(seed).random((n, 2))
    G = nx.Graph()
    G.add_nodes_from(range(n))
    for a, b, c in Delaunay(pts).simplices.tolist():
        G.add_edges_from([(a, b), (b, c), (a, c)])
    return G


def weighted_grid(k: int, seed: int) -> nx.Graph:
    G = grid(k, k)
    rng = np.random.default_rng(seed)
    for u, v in G.edges:
        G[u][v]["weight"] = int(rng.integers(1, 11))
    return G


def instances(mode: str) -> list[tuple[str, nx.Graph, int | None, float]]:
    """(name, graph, known value or None, time limit)."""
    out: list[tuple[str, nx.Graph, int | None, float]] = []
    if mode == "quick":
        for k in (5, 6, 7, 8):
            out.append((f"grid {k}x{k}", grid(k, k), k + 1, 20.0))
        out.append(("grid 4x9", grid(4, 9), 5, 20.0))
        out.append(("Q_4", hypercube(4), 10, 20.0))
        out.append(("Q_5", hypercube(5), 21, 20.0))
        out.append(("bintree h=5", binary_tree(5), 4, 20.0))
        for s in range(2):
            out.append((f"delaunay 30 s{s}", delaunay(30, s), None, 20.0))
        out.append(("wgrid 5x5 s0", weighted_grid(5, 0), None, 20.0))
    else:
        for k in (8, 10, 12, 14):
            out.append((f"grid {k}x{k}", grid(k, k), k + 1, {8: 30.0, 10: 60.0, 12: 300.0, 14: 600.0}[k]))
        out.append(("Q_5", hypercube(5), 21, 30.0))
        out.append(("Q_6", hypercube(6), 42, 600.0))
        for s in range(5):
            out.append((f"delaunay 30 s{s}", delaunay(30, s), None, 60.0))
        for s in range(3):
            out.append((f"wgrid 6x6 s{s}", weighted_grid(6, s), None, 60.0))
        # bounds only: within 10% of the optimum in 30 s (no CP-SAT model of this size)
        out.append(("grid 100x100", grid(100, 100), 101, 30.0))
    return out


# ---------------------------------------------------------------------------
# the CP-SAT baseline


def cpsat_baseline(G: nx.Graph, time_limit: float) -> tuple[str, float | None, float | None, float]:
    """Minimise the width with CP-SAT; returns (status, lower, upper, seconds)."""
    from ortools.sat.python import cp_model

    t0 = time.monotonic()
    P = OrderingProblem.from_graph(G)
    n = P.n
    M = cp_model.CpModel()
    pos = [M.NewIntVar(0, n - 1, f"p{v}") for v in range(n)]
    M.AddAllDifferent(pos)
    # b[v][g] <-> pos[v] <= g
    b = [[M.NewBoolVar(f"b{v}_{g}") for g in range(n - 1)] for v in range(n)]
    for v in range(n):
        for g in range(n - 1):
            M.Add(pos[v] <= g).OnlyEnforceIf(b[v][g])
            M.Add(pos[v] > g).OnlyEnforceIf(b[v][g].Not())
    W = M.NewIntVar(0, int(P.weights.sum()), "width")
    for g in range(n - 1):
        terms = []
        for e, (u, v) in enumerate(P.edges.tolist()):
            y = M.NewBoolVar(f"y{e}_{g}")
            M.AddBoolOr([b[u][g].Not(), b[v][g], y])
            M.AddBoolOr([b[v][g].Not(), b[u][g], y])
            terms.append(int(P.weights[e]) * y)
        M.Add(sum(terms) <= W)
    M.Minimize(W)
    S = cp_model.CpSolver()
    S.parameters.max_time_in_seconds = float(time_limit)
    S.parameters.num_workers = 1
    st = S.Solve(M)
    dt = time.monotonic() - t0
    if st == cp_model.OPTIMAL:
        return "optimal", S.ObjectiveValue(), S.ObjectiveValue(), dt
    if st == cp_model.FEASIBLE:
        return "bounded", S.BestObjectiveBound(), S.ObjectiveValue(), dt
    return "unknown", None, None, dt


# ---------------------------------------------------------------------------
# table


def _fmt_status(status: str, lo: float | None, up: float | None) -> str:
    if status == "optimal":
        return f"opt {up:g}"
    if lo is None and up is None:
        return "none"
    lo_s = "?" if lo is None else f"{lo:g}"
    up_s = "?" if up is None else f"{up:g}"
    return f"[{lo_s},{up_s}]"


def _engine_seconds(r: object) -> float:
    st = getattr(r, "stats", {}) or {}
    sat = st.get("sat") if isinstance(st.get("sat"), dict) else None
    return float(sat.get("seconds", float("nan"))) if sat else float("nan")


def run_table(
    mode: str, baseline: bool, out_lines: list[str], only: str | None = None, chosen: str = "auto"
) -> None:
    head = (
        f"{'instance':<18}{'n':>5}{'m':>6}{'known':>7}  {'method':>12}{'ours':>10}{'s':>8}{'sat s':>8}"
        f"  {'cp-sat':>10}{'s':>8}  {'ratio':>8}"
    )
    emit(out_lines, head)
    emit(out_lines, "-" * len(head))
    ratios = []
    # warm-up: imports and compiled kernels of the heuristics are not part of any instance's time
    sw.cutwidth(grid(3, 4), method="sat", time_limit=10, seed=0)
    for name, G, known, T in instances(mode):
        if only and not any(part.strip() and part.strip() in name for part in only.split(",")):
            continue
        method = "auto" if nx.is_forest(G) else chosen  # trees: 'auto' picks the tree search
        t0 = time.monotonic()
        r = sw.cutwidth(G, method=method, time_limit=T, seed=0)
        ours_t = time.monotonic() - t0
        r.check(G)
        if known is not None and r.status == "optimal" and r.value != known:
            raise SystemExit(f"{name}: got {r.value}, the published value is {known}")
        ours = _fmt_status(r.status, r.lower, r.upper)
        shown = r.method if method == "auto" else method
        if baseline and G.number_of_nodes() <= 2000:
            bs, blo, bup, bt = cpsat_baseline(G, T)
            base = _fmt_status(bs, blo, bup)
            if bs == "optimal" and r.status == "optimal" and abs(bup - r.value) > 1e-9:
                raise SystemExit(f"{name}: CP-SAT says {bup}, we say {r.value}")
            if r.status == "optimal" and bs == "optimal":
                ratio = f"{bt / ours_t:.1f}"
                ratios.append(bt / ours_t)
            elif r.status == "optimal":
                ratio = f">{bt / ours_t:.1f}"
                ratios.append(bt / ours_t)
            else:
                ratio = "-"
        else:
            base, bt, ratio = "skipped", float("nan"), "-"
        emit(
            out_lines,
            f"{name:<18}{G.number_of_nodes():>5}{G.number_of_edges():>6}{'' if known is None else known:>7}  "
            f"{shown:>12}{ours:>10}{ours_t:>8.2f}{_engine_seconds(r):>8.2f}  {base:>10}{bt:>8.2f}  {ratio:>8}",
        )
    if ratios:
        emit(out_lines, f"median speed-up over CP-SAT (lower bounds where CP-SAT did not finish): {statistics.median(ratios):.1f}x")


# ---------------------------------------------------------------------------
# ablation: what each idea of the SAT engine buys


ABLATION = [
    ("default", {}),
    ("no probes", {"probe": False}),
    ("no windows", {"windows": False}),
    ("no level counts", {"counts": "none"}),
    ("counts all levels", {"counts": "all"}),
    ("no symmetry", {"symmetry": False}),
    ("no phases", {"phases": False}),
    ("seq counter", {"counter": "seq"}),
    ("upward search", {"direction": "up"}),
    ("glucose4", {"solver": "glucose4"}),
    ("hint edge order", {"_extra": {"edge_order": "hint"}}),
    ("exact crossings", {"_extra": {"exact_c": True}}),
]


def run_ablation(out_lines: list[str], limit: float, variants: str | None = None) -> None:
    from sweepwidth.solve.ordering.sat import solve_sat
    from sweepwidth.solve.ordering.heuristics import heuristic_ordering

    cases = [("grid 8x8", grid(8, 8)), ("Q_5", hypercube(5)), ("delaunay 30 s0", delaunay(30, 0)), ("wgrid 6x6 s0", weighted_grid(6, 0))]
    emit(out_lines, f"{'variant':<18}" + "".join(f"{c:>16}" for c, _ in cases))
    hints = {}
    for cname, G in cases:
        P = OrderingProblem.from_graph(G)
        hints[cname] = (P, _hint(P))
    chosen = ABLATION if not variants else [a for a in ABLATION if a[0] in variants.split(",")]
    for vname, opts in chosen:
        cells = []
        for cname, _ in cases:
            P, order = hints[cname]
            o = dict(opts)
            solver = o.pop("solver", None)
            kw = {"solver": solver} if solver else {}
            t0 = time.monotonic()
            out = solve_sat(P, upper_order=order, deadline=time.monotonic() + limit, **kw, **o)
            dt = time.monotonic() - t0
            conf = sum(c[3] for c in out.stats.get("calls", []))
            cells.append(f"{dt:6.1f}s {conf // 1000:>5}k" if out.optimal else f"  >{limit:.0f}s  [{out.lower},{out.upper}]")
        emit(out_lines, f"{vname:<18}" + "".join(f"{c:>16}" for c in cells))
    emit(out_lines, "cells: seconds to prove optimality and thousands of conflicts (same heuristic upper bound for all)")


def _hint(P: OrderingProblem) -> list[int]:
    try:
        from sweepwidth.solve.ordering.heuristics import heuristic_ordering

        res = heuristic_ordering(P, seed=0)
        order = res[1] if isinstance(res, tuple) else res.order
        return list(order)
    except Exception:  # the heuristics module changed: fall back to ours
        from sweepwidth.solve.ordering.sat import greedy_order

        return greedy_order(P)


def run_overhead(out_lines: list[str]) -> None:
    from sweepwidth.solve._deadline import _measure_overhead

    o = _measure_overhead(7)
    emit(out_lines, f"run_limited: first call {o['first'] * 1000:.0f} ms (starts the forkserver), later calls median {o['median'] * 1000:.1f} ms")


def emit(lines: list[str], s: str) -> None:
    print(s, flush=True)
    lines.append(s)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    g = ap.add_mutually_exclusive_group()
    g.add_argument("--quick", action="store_true", help="small instances, short limits (default)")
    g.add_argument("--full", action="store_true", help="the goal sizes and time limits")
    g.add_argument("--ablation", action="store_true", help="switch off one idea at a time")
    g.add_argument("--overhead", action="store_true", help="measure child-process start-up")
    ap.add_argument("--no-baseline", action="store_true", help="skip the CP-SAT runs")
    ap.add_argument("--method", default="auto", choices=["auto", "sat", "bnb"], help="our method (default auto)")
    ap.add_argument("--limit", type=float, default=60.0, help="time limit per ablation cell (s)")
    ap.add_argument("--only", help="comma-separated substrings: run only the matching instances")
    ap.add_argument("--variants", help="comma-separated ablation rows to run (default: all)")
    ap.add_argument("--out", help="also write the table to this file")
    a = ap.parse_args(argv)
    lines: list[str] = []
    if a.ablation:
        run_ablation(lines, a.limit, a.variants)
    elif a.overhead:
        run_overhead(lines)
    else:
        run_table("full" if a.full else "quick", not a.no_baseline, lines, a.only, a.method)
    if a.out:
        Path(a.out).write_text("\n".join(lines) + "\n")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

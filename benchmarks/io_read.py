"""Reading a large ``.gr`` edge list: seconds and peak memory against networkx's edge-list reader.

Generates a square grid with about ``--edges`` edges as a ``.gr`` file in a
temporary folder, then reads it in fresh interpreters (one per reader, so the
peak resident memory of each is its own) with

* ``networkx.read_edgelist`` (the baseline: a plain networkx Graph, no checks),
* ``sweepwidth.read(path, kind='graph')`` (a networkx graph, all checks, no embedding),
* ``sweepwidth.read(path)`` (auto: a PlaneGraph when planar and connected; ``--auto``).

and prints seconds, peak MiB and the ratios to the baseline.

    python benchmarks/io_read.py                 # 10^6 edges, kind='graph'
    python benchmarks/io_read.py --edges 100000 --auto
"""

from __future__ import annotations

import argparse
import math
import os
import subprocess
import sys
import tempfile
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]

_MEASURE = """
import resource, sys, time
path, how = sys.argv[1], sys.argv[2]
t0 = time.perf_counter()
if how == "networkx":
    import networkx as nx
    G = nx.read_edgelist(path, comments="c", nodetype=int, data=False)  # the 'p' line is skipped below
    n, m = G.number_of_nodes(), G.number_of_edges()
else:
    import sweepwidth as sw
    G = sw.read(path, kind=how)
    n = G.number_of_nodes() if hasattr(G, "number_of_nodes") else G.number_of_vertices()
    m = G.number_of_edges()
dt = time.perf_counter() - t0
peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024  # KiB on Linux
print(f"{dt:.3f} {peak:.1f} {n} {m}")
"""


def write_grid(path: Path, edges: int) -> tuple[int, int]:
    side = max(2, int(math.sqrt(edges / 2)) + 1)
    n = side * side
    lines = []
    for r in range(side):
        for c in range(side):
            v = r * side + c + 1
            if c + 1 < side:
                lines.append(f"{v} {v + 1}")
            if r + 1 < side:
                lines.append(f"{v} {v + side}")
    with open(path, "w") as fh:
        fh.write(f"c grid {side}x{side}\n")
        fh.write(f"p tw {n} {len(lines)}\n")
        fh.write("\n".join(lines))
        fh.write("\n")
    # networkx's reader does not know the header: give it a copy without the 'p' line
    with open(str(path) + ".nx", "w") as fh:
        fh.write("\n".join(lines))
        fh.write("\n")
    return n, len(lines)


def measure(path: Path, how: str) -> tuple[float, float, int, int]:
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + (os.pathsep + env["PYTHONPATH"] if env.get("PYTHONPATH") else "")
    target = str(path) + ".nx" if how == "networkx" else str(path)
    out = subprocess.run([sys.executable, "-c", _MEASURE, target, how], capture_output=True, text=True, env=env, timeout=3600)
    if out.returncode != 0:
        raise SystemExit(f"{how} failed:\n{out.stderr}")
    dt, peak, n, m = out.stdout.split()
    return float(dt), float(peak), int(n), int(m)


def main(argv: list[str] | None = None) -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--edges", type=int, default=1_000_000)
    ap.add_argument("--auto", action="store_true", help="also read with kind='auto' (planarity test and embedding)")
    args = ap.parse_args(argv)
    with tempfile.TemporaryDirectory() as d:
        path = Path(d) / "grid.gr"
        n, m = write_grid(path, args.edges)
        print(f"grid graph: {n} vertices, {m} edges, {path.stat().st_size / 2**20:.1f} MiB of text")
        rows = [("networkx.read_edgelist", "networkx"), ("sweepwidth.read kind='graph'", "graph")]
        if args.auto:
            rows.append(("sweepwidth.read kind='auto'", "auto"))
        base = None
        print(f"{'reader':32} {'seconds':>8} {'peak MiB':>9} {'x time':>7} {'x memory':>9}")
        for label, how in rows:
            dt, peak, rn, rm = measure(path, how)
            assert (rn, rm) == (n, m), (label, rn, rm)
            if base is None:
                base = (dt, peak)
            print(f"{label:32} {dt:8.2f} {peak:9.0f} {dt / base[0]:7.2f} {peak / base[1]:9.2f}")
    return 0


if __name__ == "__main__":
    raise SystemExit(main())

"""Run every benchmark script in its quick form, one after another (``make bench``).

Each script prints its own table with ratios against a baseline measured in
the same run; this driver only runs them and reports which failed.  Pass
``--full`` to run each in its long form instead (hours on two cores).
"""

from __future__ import annotations

import subprocess
import sys
import time
from pathlib import Path

HERE = Path(__file__).resolve().parent

# script -> (quick arguments, full arguments)
SCRIPTS = {
    "plane_build.py": (["--sizes", "1000", "10000", "100000"], []),
    "cutwidth.py": (["--quick"], ["--full"]),
    "cutwidth_core.py": ([], ["--full"]),
    "sweeps.py": (["--quick"], []),
    "homotopy_bounds.py": ([], ["--full"]),
    "runner_overhead.py": ([], []),
    "io_read.py": (["--edges", "100000"], ["--auto"]),
    "bounds.py": (["--quick"], []),
    "trees.py": (["--time", "5"], ["--time", "60"]),
    "carving.py": ([], []),
    "lower_bounds.py": ([], []),
    "upper_bounds.py": ([], ["--full"]),
    "width.py": ([], []),
}


def main(argv: list[str]) -> int:
    full = "--full" in argv
    failed = []
    for script, (quick_args, full_args) in SCRIPTS.items():
        args = full_args if full else quick_args
        print(f"\n=== {script} {' '.join(args)}", flush=True)
        t0 = time.monotonic()
        rc = subprocess.call([sys.executable, str(HERE / script), *args])
        print(f"=== {script}: exit {rc} after {time.monotonic() - t0:.0f} s", flush=True)
        if rc != 0:
            failed.append(script)
    if failed:
        print("failed: " + ", ".join(failed))
        return 1
    return 0


if __name__ == "__main__":
    raise SystemExit(main(sys.argv[1:]))

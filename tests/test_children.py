"""Child processes: user code never runs in them, and they die with their parent.

Regression tests for two faults found by running the library the way users do
(plain scripts, ``python -c``, scripts on standard input) and by killing the
caller from outside.
"""

from __future__ import annotations

import os
import signal
import subprocess
import sys
import textwrap
import time
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]

pytestmark = pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals and /proc")


def _env() -> dict:
    env = dict(os.environ)
    env["PYTHONPATH"] = str(ROOT) + (os.pathsep + env["PYTHONPATH"] if env.get("PYTHONPATH") else "")
    return env


# A research script as users write it: top-level code, no __main__ guard.  It counts the calls
# that go through a time-limited child, so the test knows the child path was taken.
_SCRIPT = """
import networkx as nx
import sweepwidth as sw
import sweepwidth.solve._deadline as dl
import sweepwidth.solve.ordering.sat as cs

calls = []
real = dl.run_limited
def counting(*a, **k):
    calls.append(1)
    return real(*a, **k)
cs.run_limited = counting

print("TOP-LEVEL LINE", flush=True)
with open({marker!r}, "a") as f:
    f.write("written\\n")
G = nx.random_regular_graph(3, 18, seed=1)
r = sw.cutwidth(G, method="sat", time_limit=60, sat_options={{"hard_deadline": True}})
exact = sw.cutwidth(G, method="dp")  # no time limit: runs in this process, an independent method
print("RESULT", r.status, r.lower, r.upper, exact.upper, "child-calls", len(calls), flush=True)
"""


def _guarded(src: str) -> str:
    return "def _main():\n" + textwrap.indent(src, "    ") + "\nif __name__ == '__main__':\n    _main()\n"


@pytest.mark.parametrize("how", ["file", "stdin", "dash-c"])
def test_unguarded_script_runs_once(tmp_path, how):
    # issue 10 item 1: the forkserver re-ran __main__ in every child
    marker = tmp_path / "marker.txt"
    src = _SCRIPT.format(marker=str(marker))
    script = tmp_path / "research.py"
    script.write_text(src)
    if how == "file":
        cmd, stdin = [sys.executable, str(script)], None
    elif how == "stdin":
        cmd, stdin = [sys.executable, "-"], src
    else:
        cmd, stdin = [sys.executable, "-c", src], None
    out = subprocess.run(cmd, input=stdin, capture_output=True, text=True, env=_env(), cwd=tmp_path, timeout=120)
    assert out.returncode == 0, out.stderr
    assert out.stdout.count("TOP-LEVEL LINE") == 1, out.stdout
    assert marker.read_text() == "written\n"
    rows = [ln for ln in out.stdout.splitlines() if ln.startswith("RESULT")]
    assert len(rows) == 1 and "child-calls 0" not in rows[0], out.stdout

    # the same with the guard: same answer
    guarded = tmp_path / "guarded.py"
    guarded.write_text(_guarded(_SCRIPT.format(marker=str(tmp_path / "marker2.txt"))))
    out2 = subprocess.run([sys.executable, str(guarded)], capture_output=True, text=True, env=_env(), cwd=tmp_path, timeout=120)
    assert out2.returncode == 0, out2.stderr
    rows2 = [ln for ln in out2.stdout.splitlines() if ln.startswith("RESULT")]
    assert rows == rows2
    status, lower, upper, exact = rows[0].split()[1:5]
    assert status == "optimal" and lower == upper == exact


# ---------------------------------------------------------------- orphans (issue 10 item 4)
def _marked_pids(marker: str) -> list[int]:
    """Processes whose environment carries ``marker`` (children inherit it, forked or not)."""
    pids = []
    for entry in os.listdir("/proc"):
        if not entry.isdigit():
            continue
        try:
            with open(f"/proc/{entry}/environ", "rb") as fh:
                env = fh.read()
            with open(f"/proc/{entry}/stat", "rb") as fh:
                state = fh.read().rsplit(b")", 1)[1].split()[0]
        except OSError:
            continue
        if marker.encode() in env and state != b"Z":
            pids.append(int(entry))
    return pids


def _wait_for(pred, seconds: float) -> bool:
    end = time.monotonic() + seconds
    while time.monotonic() < end:
        if pred():
            return True
        time.sleep(0.1)
    return pred()


_LONG_SOLVE = """
import networkx as nx
import sweepwidth as sw
G = nx.grid_2d_graph(11, 11)  # cutwidth 12, far beyond the limit for SAT (a long solve in a child)
print("STARTING", flush=True)
sw.cutwidth(G, method="sat", time_limit=400, sat_options={"hard_deadline": True})
print("FINISHED", flush=True)
"""


def _start_marked(cmd: list[str], tmp_path: Path, marker: str) -> subprocess.Popen:
    env = _env()
    env["SWEEPWIDTH_ORPHAN_MARKER"] = marker
    return subprocess.Popen(cmd, cwd=tmp_path, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL, start_new_session=True)


def _assert_no_survivors(proc: subprocess.Popen, sig: int, marker: str, at_least: int) -> None:
    try:
        # the solve is running in a child (the parent, the private forkserver, the child...)
        assert _wait_for(lambda: len(_marked_pids(marker)) >= at_least, 60), _marked_pids(marker)
        time.sleep(1.0)
        os.kill(proc.pid, sig)
        proc.wait(timeout=30)
        assert _wait_for(lambda: not _marked_pids(marker), 5), f"survivors after {signal.Signals(sig).name}: {_marked_pids(marker)}"
    finally:
        for pid in _marked_pids(marker):  # clean up after a failure
            try:
                os.kill(pid, signal.SIGKILL)
            except OSError:
                pass


@pytest.mark.parametrize("sig", [signal.SIGKILL, signal.SIGTERM])
def test_library_children_die_with_their_parent(tmp_path, sig):
    marker = f"lib-{os.getpid()}-{int(sig)}-{time.monotonic_ns()}"
    script = tmp_path / "long_solve.py"
    script.write_text(_LONG_SOLVE)
    proc = _start_marked([sys.executable, str(script)], tmp_path, marker)
    _assert_no_survivors(proc, sig, marker, at_least=3)  # script, forkserver, solver child


@pytest.mark.parametrize("sig", [signal.SIGKILL, signal.SIGTERM])
def test_bench_children_die_with_their_parent(tmp_path, sig):
    import networkx as nx

    import sweepwidth as sw

    marker = f"bench-{os.getpid()}-{int(sig)}-{time.monotonic_ns()}"
    inst = tmp_path / "inst"
    inst.mkdir()
    sw.io.write(nx.grid_2d_graph(11, 11), inst / "grid11.gr")
    cmd = [sys.executable, "-m", "sweepwidth", "bench", str(inst), "--param", "cutwidth", "--method", "sat",
           "--time-limit", "400", "--db", str(tmp_path / "runs.sqlite"), "--quiet"]
    proc = _start_marked(cmd, tmp_path, marker)
    # bench, task forkserver, task child, SAT child (forked from the task child)
    _assert_no_survivors(proc, sig, marker, at_least=4)

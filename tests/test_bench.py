"""The benchmark runner: limited child processes, the results database, resume, executors."""

from __future__ import annotations

import json
import os
import signal
import sqlite3
import subprocess
import sys
import time

import networkx as nx
import pytest
from hypothesis import example, given, settings, strategies as st

import sweepwidth as sw
from sweepwidth import generators as gen
from sweepwidth.bench import (
    ResultsDB,
    Task,
    canonical_json,
    config_hash,
    discover,
    execute_task,
    instance_hash,
    make_tasks,
    run_tasks,
    summarize,
    verdict,
)

PY = sys.executable
PROBE = "bench_probes:"  # tests/bench_probes.py (pytest puts tests/ on sys.path)


@pytest.fixture(scope="module")
def inst(tmp_path_factory):
    """A folder of small instances: grids and cycles with known cutwidths."""
    d = tmp_path_factory.mktemp("inst")
    sw.write(gen.grid(3, 3), str(d / "grid3x3.json"))  # cw(P3 x P3) = 4 (Rolim, Sykora, Vrto, WG 1995)
    sw.write(gen.grid(3, 4), str(d / "grid3x4.json"))  # cw = 4 (same source)
    sw.write(nx.cycle_graph(5), str(d / "c5.json"))  # cw(C_n) = 2 (common practice)
    sw.write(nx.path_graph(6), str(d / "p6.json"))  # cw(P_n) = 1 (common practice)
    return d


def _task(path, **kw):
    base = dict(instance=str(path), instance_hash=instance_hash(path), parameter="cutwidth", time_limit=20.0)
    base.update(kw)
    return Task(**base)


# ------------------------------------------------------------------ hashing
def test_canonical_json_ignores_layout(tmp_path):
    a = tmp_path / "a.json"
    b = tmp_path / "b.json"
    doc = {"format": "x", "vertices": [1, 2], "w": 1.0}
    a.write_text(json.dumps(doc))
    b.write_text(json.dumps({"w": 1, "vertices": [1, 2], "format": "x"}, indent=4))
    assert instance_hash(a) == instance_hash(b)
    assert canonical_json(doc) == '{"format":"x","vertices":[1,2],"w":1}'


def test_config_hash_separates_configurations(inst):
    t1 = _task(inst / "c5.json")
    t2 = _task(inst / "c5.json", method="dp")
    t3 = _task(inst / "c5.json", seed=3)
    keys = {t.config_hash() for t in (t1, t2, t3)}
    assert len(keys) == 3
    # display name and known values are not part of the configuration
    assert _task(inst / "c5.json", name="other", known={"value": 2}).key() == t1.key()
    assert config_hash(t1.config()) == t1.config_hash()
    assert Task.from_dict(t1.to_dict()) == t1


# ----------------------------------------------------------- one child task
def test_execute_task_solves_and_checks(inst):
    out = execute_task(_task(inst / "grid3x4.json"))
    assert out["status"] == "optimal"
    assert out["value"] == 4  # cw(P3 x P4) = m + 1 = 4 (Rolim, Sykora, Vrto, WG 1995; from memory)
    assert out["checked"] == 4  # the independent checker replayed the witness
    assert out["wall"] >= out["seconds"] * 0.5


def test_execute_task_in_a_fresh_interpreter(inst):
    out = execute_task(_task(inst / "c5.json"), isolation="subprocess")
    assert out["status"] == "optimal" and out["value"] == 2  # cw(C_n) = 2 (common practice)
    assert out["checked"] == 2


def test_killed_task_keeps_reported_bounds(inst):
    out = execute_task(
        _task(inst / "c5.json", solver=PROBE + "stubborn", time_limit=0.3, grace=0.5, options={"lower": 2, "upper": 7}, quick_bounds=False)
    )
    assert out["status"] == "bounded"
    assert (out["lower"], out["upper"]) == (2, 7)
    assert "hard limit" in out["message"]
    # killed at limit + grace after the child was up (plus the kill and reaping on a loaded machine)
    assert 0.8 <= out["after_start"] < 0.8 + 1.5


def test_killed_task_without_bounds_is_a_timeout(inst):
    out = execute_task(_task(inst / "c5.json", solver=PROBE + "silent", time_limit=0.2, grace=0.3, quick_bounds=False))
    assert out["status"] == "timeout"
    assert out["lower"] is None and out["upper"] is None


def test_reports_merge_to_the_best_bracket():
    from sweepwidth.bench.child import _merge_bounds

    a = {"lower": 1, "upper": 9, "witness": [0], "how": {"lower": "x", "upper": "y"}}
    b = {"lower": 3, "upper": 12, "witness": [1]}
    c = {"lower": 2, "upper": 5, "witness": [2]}
    m = _merge_bounds(_merge_bounds(a, b), c)
    assert (m["lower"], m["upper"], m["witness"]) == (3, 5, [2])


def test_killed_task_keeps_the_quick_bounds(inst):
    out = execute_task(_task(inst / "grid3x4.json", solver=PROBE + "silent", time_limit=0.2, grace=0.3))
    assert out["status"] == "bounded"
    # cw(P3 x P4) = 4 (Rolim, Sykora, Vrto, WG 1995): the bracket must hold it
    assert out["lower"] <= 4 <= out["upper"]
    assert out["result"]["how"]["lower"] == "degree bound"


@settings(max_examples=25, deadline=None)
@given(st.integers(2, 6), st.floats(0.2, 0.9), st.integers(0, 10**6), st.booleans())
def test_quick_bounds_bracket_the_cutwidth(n, p, seed, weighted):
    import random

    from sweepwidth.bench.child import quick_bounds

    G = nx.gnp_random_graph(n, p, seed=seed)
    rnd = random.Random(seed)
    for u, v in G.edges():
        G[u][v]["weight"] = rnd.randint(1, 4) if weighted else 1
    qb = quick_bounds(G, "cutwidth", {})
    # brute force over all orderings as the reference (n <= 6)
    import itertools

    from sweepwidth.verify.ordering import ordering_width

    best = min(ordering_width(G, list(order)) for order in itertools.permutations(G.nodes()))
    assert qb["lower"] <= best <= qb["upper"]
    assert ordering_width(G, qb["witness"]) == qb["upper"]


def test_memory_limit_is_enforced_in_the_child(inst):
    out = execute_task(_task(inst / "c5.json", solver=PROBE + "greedy", memory_mb=700, time_limit=20, quick_bounds=False))
    assert out["status"] == "memory", out
    assert "700 MiB" in out["message"]
    # with the quick bounds reported first, the same failure keeps them
    out = execute_task(_task(inst / "c5.json", solver=PROBE + "greedy", memory_mb=700, time_limit=20))
    assert out["status"] == "bounded" and out["lower"] <= 2 <= out["upper"]  # cw(C5) = 2 (common practice)
    assert "out of memory" in out["message"]


def test_crash_and_exception_are_errors(inst):
    crashed = execute_task(_task(inst / "c5.json", solver=PROBE + "crash", memory_mb=None))
    assert crashed["status"] == "error" and "SIGSEGV" in crashed["message"]
    broken = execute_task(_task(inst / "c5.json", solver=PROBE + "broken"))
    assert broken["status"] == "error" and "always fails" in broken["message"]
    missing = execute_task(Task(instance=str(inst / "nope.json"), instance_hash="x", parameter="cutwidth", time_limit=5))
    assert missing["status"] == "error" and "no such file" in missing["message"]


def test_unsuitable_parameter_is_an_error_not_a_crash(inst):
    out = execute_task(_task(inst / "c5.json", parameter="homology"))
    # c5.json holds a graph without an embedding
    assert out["status"] == "error" and "plane graph" in out["message"]


# ------------------------------------------------------------------- runner
def test_run_records_every_task_and_resume_skips(inst, tmp_path):
    db = str(tmp_path / "runs.sqlite")
    tasks = make_tasks(discover([inst]), ["cutwidth"], ["auto", "dp"], time_limit=20)
    assert len(tasks) == 8
    rep = run_tasks(tasks + tasks[:2], db, jobs=2)  # duplicates run once
    assert rep.total == 8 and rep.finished == 8
    with ResultsDB(db) as d:
        rows = d.rows()
        assert len(rows) == 8
        values = {(r["name"], r["method"]): r["value"] for r in rows}
        meta = d.runs()[0]["meta"]
        journal = d.conn.execute("PRAGMA journal_mode").fetchone()[0]
    assert journal == "wal"
    # cw(P3xP3) = cw(P3xP4) = 4 (Rolim, Sykora, Vrto), cw(C5) = 2, cw(P6) = 1 (common practice)
    messages = {(r["name"], r["method"]): r["message"] for r in rows if r["status"] != "optimal"}
    assert values == {(n, m): v for n, v in [("grid3x3", 4), ("grid3x4", 4), ("c5", 2), ("p6", 1)] for m in ("auto", "dp")}, messages
    assert all(r["checked"] == r["value"] for r in rows)
    assert meta["versions"]["python-sat"] and meta["cpu_count"] and "platform" in meta
    again = run_tasks(tasks, db, jobs=2, resume=True)
    assert again.skipped == 8 and again.finished == 0
    s = summarize(rows)
    assert sum(x["solved"] for x in s) == 8 and all(x["failed"] == 0 for x in s)


def test_one_bad_instance_does_not_stop_the_run(inst, tmp_path):
    bad = tmp_path / "bad.json"
    bad.write_text('{"format": "sweepwidth-plane", "vertices": [')
    good = inst / "c5.json"
    tasks = [
        Task(instance=str(bad), instance_hash="bad", parameter="cutwidth", time_limit=20),
        _task(good),
    ]
    rep = run_tasks(tasks, str(tmp_path / "r.sqlite"), jobs=1)
    statuses = sorted(r["status"] for r in rep.rows)
    assert statuses == ["error", "optimal"]


def test_verdict_compares_with_known_values():
    # a result whose proven bounds exclude the known value is flagged
    assert verdict({"lower": 5, "upper": 6}, {"value": 4}) == "CONFLICT"
    assert verdict({"lower": 2, "upper": 3}, {"value": 4}) == "CONFLICT"
    assert verdict({"lower": 3, "upper": 6}, {"value": 4}) == "agrees"
    assert verdict({"lower": None, "upper": None}, {"value": 4}) == ""


def test_bad_database_file_is_refused(tmp_path):
    p = tmp_path / "not.sqlite"
    p.write_text("hello, not a database" * 100)
    with pytest.raises(sw.FileFormatError):
        ResultsDB(str(p))


def test_sigkill_then_resume_loses_and_repeats_nothing(tmp_path):
    folder = tmp_path / "many"
    folder.mkdir()
    for n in range(3, 9):
        sw.write(nx.cycle_graph(n), str(folder / f"cycle{n:02d}.json"))  # cw(C_n) = 2 (common practice)
    db = str(tmp_path / "kill.sqlite")
    pids = tmp_path / "pids"
    pids.mkdir()
    # every task sleeps a little, records its process id, then solves for real
    cmd = [PY, "-c", _SLOW_RUN, str(folder), db, str(pids)]
    repo = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
    # the probe solvers are test files (tests/bench_probes.py): put them on the child's path
    env = {**os.environ, "PYTHONPATH": os.pathsep.join([os.path.dirname(os.path.abspath(__file__)), os.environ.get("PYTHONPATH", "")])}
    proc = subprocess.Popen(cmd, stdout=subprocess.DEVNULL, stderr=subprocess.PIPE, cwd=repo, env=env)
    deadline = time.monotonic() + 90
    done = 0
    while time.monotonic() < deadline:
        time.sleep(0.2)
        if os.path.exists(db):
            try:
                with sqlite3.connect(db, timeout=5) as c:
                    done = c.execute("SELECT COUNT(*) FROM results").fetchone()[0]
            except sqlite3.OperationalError:
                continue
            if done >= 2:
                break
        assert proc.poll() is None, proc.stderr.read().decode()
    proc.send_signal(signal.SIGKILL)
    proc.wait(timeout=10)
    # the task children die with the runner (PR_SET_PDEATHSIG): none is left running
    started = [int(p.stem) for p in pids.glob("*.pid")]
    assert started
    give_up = time.monotonic() + 10
    while any(_alive(pid) for pid in started) and time.monotonic() < give_up:
        time.sleep(0.2)
    for pid in started:
        assert not _alive(pid), f"task process {pid} outlived the killed runner: {_describe(pid)}"
    with ResultsDB(db) as d:
        before = {(r["instance_hash"], r["config_hash"]): r["finished_at"] for r in d.rows()}
    assert 2 <= len(before) < 6
    # resume in this process: only the unfinished tasks run
    tasks = _slow_tasks(str(folder), str(pids))
    rep = run_tasks(tasks, db, jobs=2, resume=True)
    assert rep.skipped == len(before)
    assert rep.finished == 6 - len(before)
    with ResultsDB(db) as d:
        rows = d.rows()
    assert len(rows) == 6
    assert len({(r["instance_hash"], r["config_hash"]) for r in rows}) == 6
    for r in rows:  # results finished before the kill are untouched
        k = (r["instance_hash"], r["config_hash"])
        if k in before:
            assert r["finished_at"] == before[k]
        assert r["status"] == "optimal" and r["value"] == 2


def _alive(pid):
    try:
        with open(f"/proc/{pid}/stat") as fh:
            return fh.read().split(")")[-1].split()[0] != "Z"  # a zombie is dead
    except FileNotFoundError:
        return False


def _describe(pid):
    try:
        with open(f"/proc/{pid}/stat") as fh:
            stat = fh.read()
        with open(f"/proc/{pid}/cmdline", "rb") as fh:
            cmd = fh.read().replace(b"\0", b" ").decode()[:200]
        return stat[:120] + " | " + cmd
    except OSError:
        return "gone"


def _slow_tasks(folder, pid_dir=None):
    ts = make_tasks(discover([folder]), ["cutwidth"], time_limit=10)
    opts = {"delay": 0.3, **({"pid_dir": pid_dir} if pid_dir else {})}
    return [Task(**{**t.to_dict(), "solver": PROBE + "honest", "options": opts}) for t in ts]


_SLOW_RUN = """
import sys
from tests.test_bench import _slow_tasks
from sweepwidth.bench import run_tasks
run_tasks(_slow_tasks(sys.argv[1], sys.argv[3]), sys.argv[2], jobs=1)
"""


def test_dask_local_cluster_runs_the_same_tasks(inst, tmp_path):
    pytest.importorskip("distributed")
    from distributed import LocalCluster

    tasks = make_tasks(discover([inst / "c5.json", inst / "p6.json"]), ["cutwidth"], time_limit=20)
    with LocalCluster(n_workers=1, threads_per_worker=2, processes=False, protocol="tcp", dashboard_address=None) as cluster:
        address = cluster.scheduler_address  # tcp://HOST:PORT
        assert address.startswith("tcp://")
        rep = run_tasks(tasks, str(tmp_path / "dask.sqlite"), executor="dask://" + address[len("tcp://"):])
    assert rep.finished == 2
    # cw(C5) = 2, cw(P6) = 1 (common practice); each task still ran in its own limited child
    assert sorted(r["value"] for r in rep.rows) == [1, 2]
    assert all(r["checked"] == r["value"] for r in rep.rows)
    with ResultsDB(str(tmp_path / "dask.sqlite")) as d:
        assert d.runs()[0]["meta"]["executor"].startswith("dask://")


def test_dask_limits_hold_inside_the_worker(inst, tmp_path):
    pytest.importorskip("distributed")
    t = _task(inst / "c5.json", solver=PROBE + "silent", time_limit=0.2, grace=0.3, quick_bounds=False)
    rep = run_tasks([t], str(tmp_path / "dl.sqlite"), executor="dask-local")
    assert rep.rows[0]["status"] == "timeout"


def test_export_csv_and_jsonl(inst, tmp_path):
    db = str(tmp_path / "e.sqlite")
    run_tasks(make_tasks(discover([inst / "c5.json"]), ["cutwidth"], time_limit=20), db)
    with ResultsDB(db) as d:
        text = d.export_text("csv")
        lines = d.export_text("jsonl").splitlines()
    import csv, io

    rows = list(csv.DictReader(io.StringIO(text)))
    assert rows[0]["status"] == "optimal" and float(rows[0]["value"]) == 2
    assert json.loads(lines[0])["result"]["witness"] is not None


# ------------------------------------------------------- properties, regressions

_json_values = st.recursive(
    st.none() | st.booleans() | st.integers(-10**6, 10**6) | st.text(max_size=5),
    lambda inner: st.lists(inner, max_size=4) | st.dictionaries(st.text(max_size=4), inner, max_size=4),
    max_leaves=12,
)


@settings(max_examples=60, deadline=None)
@given(_json_values)
def test_canonical_json_round_trips_and_ignores_key_order(doc):
    text = canonical_json(doc)
    assert json.loads(text) == json.loads(json.dumps(doc))  # the json module as the reference
    if isinstance(doc, dict):
        assert canonical_json(dict(reversed(list(doc.items())))) == text


@settings(max_examples=40, deadline=None)
@given(st.floats(0, 100, allow_nan=False), st.floats(0, 100, allow_nan=False), st.floats(0, 100, allow_nan=False))
@example(3.0, 3.0, 3.0)
def test_verdict_conflicts_exactly_when_the_bracket_excludes_the_value(a, b, v):
    lo, hi = min(a, b), max(a, b)
    expected = "agrees" if lo <= v + 1e-9 and hi >= v - 1e-9 else "CONFLICT"
    assert verdict({"lower": lo, "upper": hi}, {"value": v}) == expected


def test_regression_startup_does_not_count_against_the_time_limit(inst, tmp_path, monkeypatch):
    """Bug: the first task of a run (which starts the forkserver) was killed as a timeout.

    The hard limit now counts from the child's 'started' message; a child
    that is slow to start (simulated by a fresh interpreter, ~1 s) with a
    1 + 2 s limit still solves a tiny instance (a fresh interpreter importing
    the solver stack takes 2-4 s on a loaded 2-core machine).
    """
    out = execute_task(_task(inst / "p6.json", time_limit=1.0, grace=2.0), isolation="subprocess")
    assert out["status"] == "optimal" and out["value"] == 1  # cw(P_n) = 1 (common practice)


def test_regression_demo_survives_a_missing_drawing_module():
    """Bug: the lazy drawing facade raised ModuleNotFoundError for a function not written yet."""
    import types

    from sweepwidth.demo import _optional

    class Lazy(types.ModuleType):
        def __getattr__(self, name):
            raise ModuleNotFoundError(f"No module named 'x.{name}'")

    assert _optional(Lazy("x"), "width_profile") is None


def test_regression_file_curves_reach_homology_as_walks(tmp_path):
    """Bug: a start curve stored in the file as darts was passed to homology as edge ids."""
    from sweepwidth.bench.loading import solve_object

    P = gen.grid(3, 3)
    walk = P.face_darts(P.outer_face)
    P.meta["curves"] = {"start": {"vertex": P.tail(walk[0]), "darts": list(walk)}}
    path = tmp_path / "g.json"
    sw.write(P, str(path))
    Q = sw.read(str(path))
    r = solve_object(Q, "homology")
    # the outer boundary walk is the default start: the same width as without the curve
    assert r.value == sw.homology_width(Q).value == 8  # 3x3 grid disk: the 8-edge boundary (checked in instances)


def test_hash_of_other_formats_is_content_based(tmp_path):
    a, b = tmp_path / "a.gr", tmp_path / "b.gr"
    sw.write(nx.cycle_graph(5), str(a))
    sw.write(nx.cycle_graph(5), str(b))
    c = tmp_path / "c.gr"
    sw.write(nx.path_graph(5), str(c))
    assert instance_hash(a) == instance_hash(b) != instance_hash(c)


def test_discover_reads_manifests_and_filters_sets(tmp_path):
    sw.write(gen.wheel(4), str(tmp_path / "w.json"))
    sw.write(nx.complete_graph(4), str(tmp_path / "k4.json"))
    (tmp_path / "manifest.json").write_text(json.dumps({"instances": [
        {"path": "w.json", "set": "wheels", "kind": "plane", "known": {"homology": {"value": 5, "source": "test"}}},
        {"path": "k4.json", "set": "complete", "kind": "graph"},
    ]}))
    entries = discover([tmp_path])
    assert [e.name for e in entries] == ["w", "k4"]
    assert [e.name for e in discover([tmp_path], sets=["complete"])] == ["k4"]
    tasks = make_tasks(entries, ["cutwidth", "homology"])
    # the graph without an embedding gets no homology task; known values travel with the task
    assert sorted((t.name, t.parameter) for t in tasks) == [("k4", "cutwidth"), ("w", "cutwidth"), ("w", "homology")]
    assert [t.known for t in tasks if t.parameter == "homology"] == [{"value": 5, "source": "test"}]
    # an included manifest (by reference, paths relative to it)
    sub = tmp_path / "more"
    sub.mkdir()
    sw.write(gen.fan(3), str(sub / "f.json"))
    (sub / "manifest.json").write_text(json.dumps({"instances": [{"path": "f.json", "known": {"homotopy_monotone": {"value": 1, "source": "t"}}}]}))
    top = tmp_path / "top"
    top.mkdir()
    (top / "manifest.json").write_text(json.dumps({"instances": [], "include": ["../more/manifest.json"]}))
    got = discover([top])
    assert [(e.name, e.set) for e in got] == [("f", "more")]
    monotone = make_tasks(got, ["homotopy"], options={"monotone": True})
    assert monotone[0].known == {"value": 1, "source": "t"}  # the variant's known value
    assert make_tasks(got, ["homotopy"])[0].known == {}
    with pytest.raises(sw.UnsupportedOptionError):
        make_tasks(entries, ["girth"])
    with pytest.raises(sw.FileFormatError):
        discover([tmp_path / "missing"])


def test_row_is_keyed_by_the_content_that_was_solved(tmp_path):
    # issue 10 item 5: the hash was taken at task creation, the file read again later, so a
    # file replaced in between stored the old hash with the new file's answer
    from sweepwidth.bench.hashing import instance_hash

    folder = tmp_path / "inst"
    folder.mkdir()
    target = folder / "g.json"
    sw.io.write(sw.PlaneGraph.from_graph(nx.path_graph(5)), target)  # cutwidth of a path: 1
    old_hash = instance_hash(target)
    tasks = make_tasks(discover([folder]), ["cutwidth"], time_limit=20)
    assert [t.instance_hash for t in tasks] == [old_hash]
    # replaced between task creation and the solve
    sw.io.write(sw.PlaneGraph.from_graph(nx.cycle_graph(6)), target)  # cutwidth of a cycle: 2
    new_hash = instance_hash(target)
    db = str(tmp_path / "r.sqlite")
    rep = run_tasks(tasks, db, jobs=1)
    (row,) = rep.rows
    assert row["value"] == 2  # the answer of the file that was solved (cycle: 2, path: 1; common practice)
    assert row["instance_hash"] == new_hash != old_hash
    assert "changed" in row["message"]
    # --resume does not take the old task as done
    with ResultsDB(db) as d:
        assert (old_hash, tasks[0].config_hash()) not in d.done_keys()


# ------------------------------------------------------------ bench minors (issue 10)
def test_bench_validates_methods_before_running(tmp_path):
    from sweepwidth.errors import UnsupportedOptionError

    entries = discover([os.path.join(os.path.dirname(__file__), "..", "instances", "grids", "grid-03x03.json")])
    with pytest.raises(UnsupportedOptionError, match="subset-dp"):  # the valid homology methods are listed
        make_tasks(entries, ["homology"], ["auto", "no-such-method"], time_limit=5)
    assert not (tmp_path / "r.sqlite").exists()


def test_bench_says_what_it_skipped_and_knows_set_names(capsys, tmp_path):
    from sweepwidth.cli import main
    from sweepwidth.errors import UnsupportedOptionError

    inst = os.path.join(os.path.dirname(__file__), "..", "instances")
    with pytest.raises(UnsupportedOptionError, match="tori") as info:
        discover([inst], sets=["no-such-set"])
    assert "grids" in str(info.value)
    skipped: list = []
    tasks = make_tasks(discover([inst], sets=["tori"]), ["homology"], time_limit=5, skipped=skipped)
    assert tasks == [] and skipped and all("plane graph" in why for _n, _p, why in skipped)
    rc = main(["bench", inst, "--sets", "tori", "--param", "homology", "--time-limit", "5", "--db", str(tmp_path / "r.sqlite")])
    err = capsys.readouterr().err
    assert rc != 0 and "skipped" in err and "needs a plane graph" in err


def test_bench_refuses_an_empty_database_file(tmp_path):
    from sweepwidth.errors import FileFormatError

    p = tmp_path / "empty.sqlite"
    p.write_bytes(b"")
    with pytest.raises(FileFormatError, match="empty file"):
        ResultsDB(str(p))


def test_two_runs_cannot_share_a_database(tmp_path):
    from sweepwidth.errors import SweepwidthError

    db = str(tmp_path / "r.sqlite")
    # a live process (a sleeping child) holds the lock
    holder = subprocess.Popen([sys.executable, "-c", "import time; time.sleep(60)"])
    try:
        import socket

        with ResultsDB(db) as d:
            d.conn.execute("INSERT OR REPLACE INTO info VALUES ('lock', ?)",
                           (json.dumps({"host": socket.gethostname(), "pid": holder.pid, "since": time.time()}),))
        folder = tmp_path / "inst"
        folder.mkdir()
        sw.io.write(sw.PlaneGraph.from_graph(nx.path_graph(4)), folder / "p.json")
        tasks = make_tasks(discover([folder]), ["cutwidth"], time_limit=5)
        with pytest.raises(SweepwidthError, match="another benchmark run"):
            run_tasks(tasks, db)
    finally:
        holder.kill()
        holder.wait()
    # the holder is gone (as after kill -9): its stale lock is taken over
    rep = run_tasks(tasks, db)
    assert rep.finished == 1
    with ResultsDB(db) as d:
        assert d.conn.execute("SELECT value FROM info WHERE key='lock'").fetchone() is None

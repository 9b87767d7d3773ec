"""End-to-end tests of the command line (``python -m sweepwidth ...``)."""

from __future__ import annotations

import json
import os
import subprocess
import sys

import networkx as nx
import pytest

import sweepwidth as sw
from sweepwidth import generators as gen
from sweepwidth.bench.hashing import digest
from sweepwidth.cli import build_parser, main

VERBS = ["solve", "bench", "check", "dual", "convert", "draw", "export", "demo"]


def run(*args, cwd=None, timeout=240):
    """The command in a fresh interpreter: ``python -m sweepwidth ARGS``."""
    p = subprocess.run([sys.executable, "-m", "sweepwidth", *map(str, args)], capture_output=True, text=True, cwd=cwd, timeout=timeout)
    return p.returncode, p.stdout, p.stderr


def run_here(capsys, *args):
    """The same command through :func:`sweepwidth.cli.main` in this process (no interpreter start)."""
    capsys.readouterr()
    try:
        rc = main([str(a) for a in args])
    except SystemExit as exc:
        rc = exc.code
    cap = capsys.readouterr()
    return rc, cap.out, cap.err


@pytest.fixture(scope="module")
def files(tmp_path_factory):
    d = tmp_path_factory.mktemp("cli")
    sw.write(gen.grid(3, 4), str(d / "grid.json"))  # cw(P3 x P4) = 4 (Rolim, Sykora, Vrto, WG 1995; from memory)
    sw.write(gen.wheel(5), str(d / "wheel.json"))
    sw.write(nx.cycle_graph(6), str(d / "c6.json"))  # cw(C_n) = 2 (common practice); no embedding stored
    (d / "broken.json").write_text('{"format": "sweepwidth-plane", "vertices": [0, 1], "edges": [')
    return d


def _one_line_error(rc, err, code=1):
    assert rc == code, err
    lines = [l for l in err.splitlines() if l.strip()]
    assert len(lines) == 1, err
    assert lines[0].startswith("sweepwidth: error: ")
    return lines[0]


# ------------------------------------------------------------------- help
@pytest.mark.parametrize("verb", VERBS)
def test_every_verb_has_help_with_an_example(verb, capsys):
    with pytest.raises(SystemExit) as exc:
        main([verb, "--help"])
    assert exc.value.code == 0
    out = capsys.readouterr().out
    assert "example:" in out and f"sweepwidth {verb}" in out


def test_parser_knows_every_verb():
    sub = [a for a in build_parser()._actions if a.dest == "verb"][0]
    assert sorted(sub.choices) == sorted(VERBS)


# ------------------------------------------------------------ solve, check
def test_solve_table_json_and_save_then_check(files, tmp_path, capsys):
    rc, out, err = run("solve", files / "grid.json", files / "c6.json")
    assert rc == 0, err
    lines = out.splitlines()
    assert lines[0].split()[:3] == ["instance", "parameter", "status"]
    grid = [l for l in lines if l.startswith("grid.json")][0].split()
    assert grid[1:6] == ["cutwidth", "optimal", "4", "4", "4"]  # Rolim, Sykora, Vrto: m + 1
    assert grid[-1] == "yes"  # witness replayed by the independent checker
    c6 = [l for l in lines if l.startswith("c6.json")][0].split()
    assert c6[3] == "2"  # cw(C_n) = 2 (common practice)

    save = tmp_path / "saved"
    rc, out, err = run_here(capsys, "solve", files / "wheel.json", "--param", "cutwidth,homology", "--json", "--save", save)
    assert rc == 0, err
    objs = [json.loads(l) for l in out.splitlines()]
    assert [o["parameter"] for o in objs] == ["cutwidth", "homology"]
    for o in objs:
        assert o["checked"] == o["upper"]
    # homology width from the disk boundary equals the pinned cutwidth of the dual (the identity in the docstring of sweepwidth.solve.homology)
    dual_cw = sw.cutwidth(sw.read(str(files / "wheel.json")).dual().to_networkx(), first=sw.read(str(files / "wheel.json")).outer_face)
    assert objs[1]["value"] == dual_cw.value
    saved = sorted(os.listdir(save))
    assert saved == ["wheel.cutwidth.json", "wheel.homology.json"]
    rc, out, err = run_here(capsys, "check", *(save / f for f in saved))
    assert rc == 0, err
    assert out.count(": verified: ") == 2


def _tamper(path, change, redigest):
    doc = json.loads(path.read_text())
    change(doc)
    if redigest:
        doc["digest"] = digest({k: doc[k] for k in ("instance", "options", "result")})
    path.write_text(json.dumps(doc))


def test_check_refuses_tampered_results(files, tmp_path, capsys):
    good = tmp_path / "r.json"
    rc, out, err = run_here(capsys, "solve", files / "grid.json", "-o", good)
    assert rc == 0, err
    # 1. a lower upper bound with a recomputed digest: the replay finds the real width
    low = tmp_path / "low.json"
    low.write_text(good.read_text())

    def lie(doc):
        doc["result"]["upper"] = doc["result"]["value"] = doc["result"]["lower"] = 3

    _tamper(low, lie, redigest=True)
    # 2. a swapped witness without touching the digest
    swapped = tmp_path / "swapped.json"
    swapped.write_text(good.read_text())
    _tamper(swapped, lambda d: d["result"]["witness"].reverse(), redigest=False)
    # 3. a witness missing a vertex (digest recomputed)
    short = tmp_path / "short.json"
    short.write_text(good.read_text())
    _tamper(short, lambda d: d["result"]["witness"].pop(), redigest=True)
    # 4. the right result against another instance
    rc, out, err = run("check", good, low, swapped, short)
    assert rc == 1
    verdicts: dict = {}
    for l in out.splitlines():
        verdicts[os.path.basename(l.split(":")[0])] = verdicts.get(os.path.basename(l.split(":")[0]), "") + l
    assert ": verified: " in verdicts["r.json"]
    assert "REFUSED" in verdicts["low.json"] and "width 4" in verdicts["low.json"]
    assert "REFUSED" in verdicts["swapped.json"] and "edited" in verdicts["swapped.json"]
    assert "REFUSED" in verdicts["short.json"]
    rc, out, err = run_here(capsys, "check", good, "--instance", files / "wheel.json")
    assert rc == 1 and "not the one" in out


def test_check_with_recompute(files, tmp_path):
    good = tmp_path / "g.json"
    assert main(["solve", str(files / "grid.json"), "-o", str(good), "--time-limit", "20"]) == 0
    assert main(["check", str(good), "--recompute", "--method", "sat", "--time-limit", "20"]) == 0


# ------------------------------------------------------------ bad input
def test_bad_file_is_one_line(files, capsys):
    rc, out, err = run("solve", files / "broken.json")
    line = _one_line_error(rc, err)
    assert "broken.json" in line
    rc, out, err = run_here(capsys, "solve", files / "missing.json")
    assert "no such file" in _one_line_error(rc, err)


@pytest.mark.parametrize(
    "argv, needle, code",
    [
        (["solve", "{grid}", "--param", "girth"], "unknown parameter 'girth'", 1),
        (["solve", "{grid}", "--param", "width"], "width needs two walks", 1),
        (["solve", "{grid}", "--param", "width", "--walks", "a"], "--walks takes two curve names", 1),
        (["solve", "{grid}", "--method", "magic"], "magic", 1),
        (["solve", "{grid}", "--time-limit", "soon"], "takes seconds", 2),
        (["solve", "{c6}", "--param", "homology"], "plane graph", 1),
        (["solve", "{grid}", "--first", "[9, 9]"], "not a vertex", 1),
        (["bench", "{grid}", "--db", "{tmp}/x.sqlite"], "--time-limit", 1),
        (["bench", "{grid}", "--time-limit", "1", "--jobs", "0", "--db", "{tmp}/x.sqlite"], "--jobs", 1),
        (["bench", "{tmp}/nowhere", "--time-limit", "1", "--db", "{tmp}/x.sqlite"], "no such file", 1),
        (["export", "--db", "{tmp}/none.sqlite"], "no such results database", 1),
        (["bench", "{grid}", "--time-limit", "1", "--first", "0", "--db", "{tmp}/x.sqlite"], "--first", 2),
        (["check", "{grid}"], "not a saved result", 1),
        (["draw", "{grid}"], "-o/--output", 2),
        (["convert", "{grid}", "{tmp}/out.xyz"], "format", 1),
        (["dual", "{c6}"], "plane graph", 1),
        (["frobnicate"], "invalid choice", 2),
    ],
)
def test_bad_options_are_one_line(argv, needle, code, files, tmp_path, capsys):
    argv = [a.format(grid=files / "grid.json", c6=files / "c6.json", tmp=tmp_path) for a in argv]
    try:
        rc = main(argv)
    except SystemExit as exc:
        rc = exc.code
    err = capsys.readouterr().err
    line = _one_line_error(rc, err, code)
    assert needle in line


# ------------------------------------------------------ bench and export
def test_bench_then_resume_then_export(files, tmp_path, capsys):
    db = tmp_path / "runs.sqlite"
    folder = tmp_path / "set"
    folder.mkdir()
    for name in ("grid.json", "wheel.json"):
        (folder / name).write_text((files / name).read_text())
    rc, out, err = run("bench", folder, "--param", "cutwidth,homology", "--time-limit", "20", "--jobs", "2", "--db", db)
    assert rc == 0, err
    assert "4 task(s) run, 0 skipped" in out
    assert "median s" in out
    rc, out, err = run_here(capsys, "bench", folder, "--param", "cutwidth,homology", "--time-limit", "20", "--db", db, "--resume", "--quiet")
    assert rc == 0, err
    assert "0 task(s) run, 4 skipped" in out
    csv_path = tmp_path / "runs.csv"
    rc, out, err = run("export", "--db", db, "-o", csv_path)
    assert rc == 0, err
    import csv

    rows = list(csv.DictReader(csv_path.open()))
    assert len(rows) == 4 and all(r["status"] == "optimal" for r in rows)
    rc, out, err = run_here(capsys, "export", "--db", db, "--format", "jsonl", "--param", "homology")
    assert rc == 0, err
    got = [json.loads(l) for l in out.splitlines()]
    assert len(got) == 2 and all(g["parameter"] == "homology" and g["result"]["witness"] for g in got)


# ------------------------------------------------------ dual, convert, draw
def test_dual_and_convert(files, tmp_path, capsys):
    rc, out, err = run("dual", files / "grid.json", "-o", tmp_path / "d.json")
    assert rc == 0, err
    D = sw.read(str(tmp_path / "d.json"))
    P = sw.read(str(files / "grid.json"))
    # the dual has one vertex per face and one edge per edge (Euler's formula, R. Diestel, "Graph Theory", Springer, Thm. 4.2.9)
    assert D.number_of_vertices() == P.number_of_faces() and D.number_of_edges() == P.number_of_edges()
    rc, out, err = run_here(capsys, "dual", files / "wheel.json")
    assert rc == 0 and "dual:" in out
    rc, out, err = run("convert", files / "grid.json", tmp_path / "g.gr", "--force")  # .gr holds no embedding
    assert rc == 0, err
    G = sw.read(str(tmp_path / "g.gr"), kind="graph")
    assert nx.is_isomorphic(nx.Graph(G), nx.grid_2d_graph(3, 4))  # networkx as the reference


def test_draw_writes_a_picture_or_says_why(files, tmp_path):
    out_png = tmp_path / "w.png"
    rc, out, err = run("draw", files / "wheel.json", "-o", out_png)
    if rc == 0:
        assert out_png.exists() and out_png.stat().st_size > 1000
    else:
        _one_line_error(rc, err)


# ------------------------------------------------------------------ demo
def test_demo_runs_and_finds_the_costly_spot(tmp_path):
    rc, out, err = run("demo", "--out", tmp_path / "demo", "--time-limit", "30", "--no-pictures", timeout=300)
    assert rc == 0, err
    assert "not crowd-safety guidance" in out
    assert "Larkspur Pavilion" in out
    # the pavilion is chosen so that one cordon costs more than separate loops; the solvers say by how much
    assert "keeping the cordon in one piece costs" in out
    assert "-> where: the separate-loops sweep splits its cordon" in out
    assert (tmp_path / "demo" / "pavilion.json").exists()
    saved = json.loads((tmp_path / "demo" / "pavilion.homotopy.json").read_text())
    assert saved["result"]["status"] == "optimal"
    # regression: the demo's result files could not be read by check, and the demo did not mention them
    assert "results saved in" in out and "sweepwidth check" in out
    header = [l for l in out.splitlines() if l.startswith("instance")][0].split()
    assert header == ["instance", "parameter", "status", "value", "lower", "upper", "method", "seconds", "checked", "note"]
    for p in ("homology", "homotopy", "cutwidth"):
        rc, text, err = run("check", tmp_path / "demo" / f"pavilion.{p}.json")
        assert rc == 0 and ": verified: " in text, err


def test_internal_errors_are_one_line_too(files, capsys, monkeypatch):
    import sweepwidth.cli as cli

    def boom(args, out):
        raise TypeError("something below the command line broke")

    monkeypatch.setitem(cli._COMMANDS, "dual", boom)
    monkeypatch.delenv("SWEEPWIDTH_TRACEBACK", raising=False)
    rc = main(["dual", str(files / "grid.json")])
    line = _one_line_error(rc, capsys.readouterr().err)
    assert "internal error TypeError" in line and "SWEEPWIDTH_TRACEBACK" in line


def test_start_curve_and_open_ends(tmp_path, capsys):
    path = tmp_path / "g33.json"
    sw.write(gen.grid(3, 3), str(path))
    # one unit square as the start: sweeping it away never needs more than its 4 sides (and no less)
    assert main(["solve", str(path), "--param", "homology,homotopy", "--start", "[[0,0],[0,1],[1,1],[1,0]]", "--json"]) == 0
    got = [json.loads(l) for l in capsys.readouterr().out.splitlines()]
    assert [g["value"] for g in got] == [4, 4]
    # from the boundary path (0,0)->(2,2) one way to the other: every staircase between has 4 edges
    assert main(["solve", str(path), "--param", "homotopy", "--ends", "[0,0],[2,2]", "--json"]) == 0
    got = json.loads(capsys.readouterr().out)
    assert got["value"] == 4 and got["checked"] == 4
    rc = main(["solve", str(path), "--param", "homotopy", "--start", "[[0,0],[2,2]]"])
    assert rc == 1
    assert capsys.readouterr().err.startswith("sweepwidth: error: ")


def _descendants(pid: int) -> set[int]:
    parent: dict[int, int] = {}
    for d in os.listdir("/proc"):
        if d.isdigit():
            try:
                with open(f"/proc/{d}/stat", encoding="utf-8") as fh:
                    parent[int(d)] = int(fh.read().rsplit(")", 1)[1].split()[1])
            except (OSError, ValueError, IndexError):
                pass
    out, frontier = set(), {pid}
    while frontier:
        frontier = {c for c, p in parent.items() if p in frontier and c not in out}
        out |= frontier
    return out


def _wait_for_descendants(pid: int, tasks: int, db, timeout: float) -> None:
    import time

    if not os.path.isdir("/proc"):  # no process table to read: the old fixed wait
        time.sleep(4.0)
        return
    end = time.monotonic() + timeout
    while time.monotonic() < end:
        # the forkserver, its tasks' children and the db: a task child per job beside the server
        if os.path.exists(db) and len(_descendants(pid)) >= tasks + 1:
            time.sleep(1.0)
            return
        time.sleep(0.2)
    time.sleep(1.0)


def test_ctrl_c_stops_a_bench_run_and_its_children(files, tmp_path):
    import signal
    import time

    db = tmp_path / "int.sqlite"
    proc = subprocess.Popen(
        [sys.executable, "-m", "sweepwidth", "bench", str(files / "grid.json"), str(files / "wheel.json"),
         "--time-limit", "60", "--jobs", "2", "--db", str(db), "--solver", "bench_probes:silent"],
        stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True,
        # the probe solvers are test files (tests/bench_probes.py): put them on the child's path
        env={**os.environ, "PYTHONPATH": os.pathsep.join([os.path.dirname(__file__), os.environ.get("PYTHONPATH", "")])},
    )
    # wait until both tasks are running (they would sleep far beyond the limit); on a loaded machine the
    # interpreter and the forkserver take a while, and an interrupt before any task runs exits 130 instead
    _wait_for_descendants(proc.pid, 2, db, timeout=45.0)
    t0 = time.monotonic()
    proc.send_signal(signal.SIGINT)
    out, err = proc.communicate(timeout=60)
    assert time.monotonic() - t0 < 30
    assert proc.returncode == 1, err
    assert "interrupted" in out
    from sweepwidth.bench import ResultsDB

    with ResultsDB(str(db)) as d:  # cut-off tasks are not recorded: a resumed run does them
        assert d.count() == 0


LEASHES = os.path.join(os.path.dirname(os.path.dirname(os.path.abspath(__file__))), "instances", "leashes")


@pytest.mark.parametrize("extra, known", [([], "width"), (["--backward"], "width_backward")])
def test_solve_width_reads_the_walks_of_the_file(capsys, extra, known):
    # the exact values of instances/leashes/manifest.json (found by the exact search, replayed by the checker)
    path = os.path.join(LEASHES, "backstep-delaunay-1037.json")
    with open(os.path.join(LEASHES, "manifest.json"), encoding="utf-8") as fh:
        want = [e for e in json.load(fh)["instances"] if e["name"] == "backstep-delaunay-1037"][0]["known"][known]["value"]
    assert main(["solve", path, "--param", "width", "--json", "--walks", "a,b", "--leashes", "start,end", *extra]) == 0
    row = json.loads(capsys.readouterr().out.strip().splitlines()[-1])
    assert row["parameter"] == "width" and row["status"] == "optimal" and row["value"] == want
    assert row["checked"] == want


def test_solve_width_with_inline_walks(tmp_path, capsys):
    path = tmp_path / "g.json"
    sw.write(gen.grid(3, 3), str(path))
    # opposite sides of the 3 x 3 grid, leashes the other two sides: width 3 (docstring of homotopy_width,
    # cross-checked by the reference search in tests/test_contract.py)
    rc = main(["solve", str(path), "--param", "width", "--json", "--walks", "[[[0,0],[0,1],[0,2]], [[2,0],[2,1],[2,2]]]"])
    assert rc == 0
    row = json.loads(capsys.readouterr().out.strip().splitlines()[-1])
    assert row["value"] == 3.0 and row["checked"] == 3.0


def test_solve_width_names_a_missing_curve(capsys):
    rc = main(["solve", os.path.join(LEASHES, "backstep-delaunay-1037.json"), "--param", "width", "--walks", "a,zz"])
    assert rc == 1
    assert "no curve named 'zz'" in capsys.readouterr().err

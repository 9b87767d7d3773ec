"""Regression tests of ``sweepwidth solve`` over several files: rows kept, progress, time limit, Ctrl-C."""

from __future__ import annotations

import json
import os
import signal
import subprocess
import sys
import time

import pytest

from sweepwidth.cli import DEFAULT_TIME_LIMIT, build_parser, main
from cli_helpers import run_cli

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))
INST = os.path.join(ROOT, "instances")


_run = run_cli


def test_a_file_that_does_not_suit_the_parameter_becomes_a_row(capsys):
    # regression: the torus error threw away the grid's finished result
    grid = os.path.join(INST, "grids", "grid-04x04.json")
    torus = os.path.join(INST, "tori", "torus-3x3.json")
    rc, out, err = _run(capsys, "solve", grid, torus, os.path.join(INST, "nowhere.json"), "--param", "homology")
    assert rc == 1  # something failed: documented in solve --help
    rows = {l.split()[0]: l.split() for l in out.splitlines()[2:]}
    # the homology sweep width of the 4 x 4 grid of squares from its boundary is 12 (instances/manifest.json)
    assert rows["grid-04x04.json"][2:4] == ["optimal", "12"]
    assert rows["torus-3x3.json"][2] == "error" and "plane graph" in " ".join(rows["torus-3x3.json"])
    assert rows["nowhere.json"][2] == "error" and "no such file" in " ".join(rows["nowhere.json"])
    assert err.count("sweepwidth: error: ") == 2


def test_json_rows_for_failures_too(capsys):
    torus = os.path.join(INST, "tori", "torus-3x3.json")
    cube = os.path.join(INST, "platonic", "cube.json")
    rc, out, _ = _run(capsys, "solve", torus, cube, "--param", "homology", "--json")
    got = [json.loads(l) for l in out.splitlines()]
    assert rc == 1 and [g["status"] for g in got] == ["error", "optimal"]
    assert "plane graph" in got[0]["note"]


def test_exit_codes_are_in_the_help(capsys):
    with pytest.raises(SystemExit):
        main(["solve", "--help"])
    text = " ".join(capsys.readouterr().out.split())
    assert "exit status: 0" in text and "130 interrupted" in text
    assert f"default {DEFAULT_TIME_LIMIT:g}" in text and "'none'" in text


def test_default_time_limit_and_none():
    p = build_parser()
    assert p.parse_args(["solve", "g.json", "--time-limit", "none"]).time_limit is None
    assert p.parse_args(["solve", "g.json", "--time-limit", "2.5"]).time_limit == 2.5
    for bad in ("0", "-1", "nan", "soon"):
        with pytest.raises(SystemExit):
            p.parse_args(["solve", "g.json", "--time-limit", bad])


def test_default_time_limit_reaches_the_solver(capsys, monkeypatch):
    import sweepwidth.bench.loading as loading

    seen = []
    real = loading.solve_object

    def spy(*a, **kw):
        seen.append(kw["time_limit"])
        return real(*a, **kw)

    monkeypatch.setattr(loading, "solve_object", spy)
    cube = os.path.join(INST, "platonic", "cube.json")
    assert _run(capsys, "solve", cube)[0] == 0
    assert _run(capsys, "solve", cube, "--time-limit", "none")[0] == 0
    assert seen == [DEFAULT_TIME_LIMIT, None]


def test_progress_lines_on_request_and_quiet(capsys):
    cube = os.path.join(INST, "platonic", "cube.json")
    tet = os.path.join(INST, "platonic", "tetrahedron.json")
    _, _, err = _run(capsys, "solve", cube, tet, "--progress")
    lines = [l for l in err.splitlines() if l.strip()]
    assert lines[0].startswith("[1/2] cube.json cutwidth optimal") and lines[1].startswith("[2/2] tetrahedron.json")
    assert _run(capsys, "solve", cube, tet, "--progress", "--quiet")[2] == ""
    assert _run(capsys, "solve", cube, tet)[2] == ""  # stderr is not a terminal here


def test_ctrl_c_keeps_the_finished_rows_and_exits_130(tmp_path):
    import sweepwidth as sw
    from sweepwidth import generators

    cube = os.path.join(INST, "platonic", "cube.json")
    grid = str(tmp_path / "disk.json")  # 100 vertices: the prefix-set search does not finish in seconds
    sw.write(generators.weighted_delaunay_disk(100, seed=3), grid)
    cmd = [sys.executable, "-m", "sweepwidth", "solve", cube, grid, "--method", "bnb", "--time-limit", "none"]
    p = subprocess.Popen(cmd, stdout=subprocess.PIPE, stderr=subprocess.PIPE, text=True, cwd=ROOT)
    lines = []
    assert p.stdout is not None
    while True:
        line = p.stdout.readline()
        assert line, "the cube row never came"
        lines.append(line)
        if line.startswith("cube.json"):
            break
    time.sleep(1.5)  # the disk's prefix-set search is under way
    p.send_signal(signal.SIGINT)
    rest, err = p.communicate(timeout=60)
    out = "".join(lines) + rest
    assert p.returncode == 130, err
    assert "Traceback" not in err and "internal error" not in err
    assert "interrupted: 1 of 2 solve(s) finished" in err
    row = [l for l in out.splitlines() if l.startswith("disk.json")][0].split()
    assert row[2] == "interrupted" and "1 s re-solve" in " ".join(row)
    lower, upper = float(row[4]), float(row[5])  # proven bounds of a 1 s re-solve
    assert 0 < lower <= upper


def test_broken_pipe_is_silent():
    # regression: piping to head printed "Broken pipe"
    files = [os.path.join(INST, "platonic", f) for f in sorted(os.listdir(os.path.join(INST, "platonic")))]
    cmd = " ".join([f"'{sys.executable}' -m sweepwidth solve", *files, "| head -1"])
    p = subprocess.run(["bash", "-o", "pipefail", "-c", cmd], capture_output=True, text=True, cwd=ROOT, timeout=120)
    assert p.stdout.startswith("instance") and p.stderr == ""


def test_the_start_example_of_the_help_works_as_written(capsys):
    # regression: the --start help example '[0, 1, 2]' failed as written
    from sweepwidth.cli import START_EXAMPLE

    grid = os.path.join(INST, "grids", "grid-03x03.json")
    rc, out, err = _run(capsys, "solve", grid, "--param", "homology", "--start", START_EXAMPLE.strip("'"), "--json")
    assert rc == 0, err
    assert json.loads(out)["value"] == 4  # sweeping one unit square away: its 4 sides (and no fewer)


def test_first_and_last_take_tuple_vertices_in_json(capsys):
    # regression: --first '[0,0]' was split at the comma
    grid = os.path.join(INST, "grids", "grid-03x03.json")
    rc, out, err = _run(capsys, "solve", grid, "--first", "[0,0]", "--last", "[[2,2],[2,1]]", "--json")
    assert rc == 0, err
    order = json.loads(out)["witness"]
    assert order[0] == [0, 0] and {tuple(order[-1]), tuple(order[-2])} == {(2, 2), (2, 1)}


@pytest.mark.parametrize(
    "argv, flag",
    [
        (["--param", "homology", "--ends", "[0,0],[2,2]"], "--ends"),
        (["--param", "cutwidth", "--holes", "0"], "--holes"),
        (["--param", "cutwidth", "--monotone"], "--monotone"),
        (["--param", "homology", "--first", "[0,0]"], "--first"),
    ],
)
def test_options_that_do_not_apply_are_refused(capsys, argv, flag):
    # regression: such options were silently ignored
    grid = os.path.join(INST, "grids", "grid-03x03.json")
    rc, out, err = _run(capsys, "solve", grid, *argv)
    assert rc == 1 and f"{flag} does not apply to" in err and out == ""


def test_library_spelling_becomes_flags():
    from sweepwidth.cli import _cli_message

    assert _cli_message("time_limit must be >= 0") == "--time-limit must be >= 0"
    assert _cli_message("raise max_memory or use method='bounds'") == "raise --memory or use --method bounds"


def test_bench_table_shows_what_ran_with_the_columns_of_solve(tmp_path, capsys):
    # regression: the bench table showed the requested 'auto', called its column 'conflicts' (a SAT word)
    # and wrote seconds as '0' where solve writes '0.00'
    cube = os.path.join(INST, "platonic", "cube.json")
    rc, out, err = _run(capsys, "bench", cube, "--time-limit", "10", "--db", tmp_path / "r.sqlite")
    assert rc == 0, err
    lines = out.splitlines()
    assert lines[0].split() == ["instance", "parameter", "status", "value", "lower", "upper", "method", "seconds", "known", "note"]
    row = lines[2].split()
    assert row[6].startswith("auto:") and "." in row[7] and len(row[7].split(".")[1]) == 2
    assert "contradict known" in out and "conflicts" not in out


@pytest.mark.parametrize("verb", ["solve", "bench"])
def test_negative_memory_is_refused(verb, tmp_path, capsys):
    cube = os.path.join(INST, "platonic", "cube.json")
    argv = [verb, cube, "--memory", "-5"] + (["--time-limit", "1", "--db", str(tmp_path / "r.sqlite")] if verb == "bench" else [])
    rc, out, err = _run(capsys, *argv)
    assert rc == 2 and "--memory" in err


def test_memory_reaches_the_exponential_methods(capsys, tmp_path):
    import sweepwidth as sw
    from sweepwidth import generators

    path = tmp_path / "d.json"
    sw.write(generators.delaunay(26, seed=2), str(path))
    rc, out, err = _run(capsys, "solve", path, "--method", "dp", "--memory", "1")
    assert rc == 1 and "--memory" in err and "max_memory" not in err  # the message names the flag


def test_an_infeasible_row_says_why(capsys):
    # regression: an infeasible row gave no reason
    grid = os.path.join(INST, "grids", "grid-03x03.json")
    rc, out, err = _run(capsys, "solve", grid, "--param", "homotopy,homology", "--holes", "0,1,2,3,4")
    rows = [l for l in out.splitlines() if l.startswith("grid-03x03.json")]
    assert rc == 0 and len(rows) == 2
    # every face is a hole, so the outer boundary cannot be swept to a point (neither homotopy nor homology)
    assert all(" infeasible " in r and "infeasible: " in r for r in rows)

"""The command line never writes over its own inputs (issue 10, item 6 and the --save minor)."""

from __future__ import annotations

import json
import os
import shutil
from pathlib import Path

import pytest

from sweepwidth.cli import main

ROOT = Path(__file__).resolve().parents[1]
GRID = ROOT / "instances" / "grids" / "grid-03x03.json"


def run_here(capsys, *args):
    capsys.readouterr()
    try:
        rc = main([str(a) for a in args])
    except SystemExit as exc:
        rc = exc.code
    cap = capsys.readouterr()
    return rc, cap.out, cap.err


@pytest.fixture()
def db(tmp_path, capsys):
    inst = tmp_path / "inst"
    inst.mkdir()
    shutil.copy(GRID, inst / GRID.name)
    path = tmp_path / "r.sqlite"
    rc, _, err = run_here(capsys, "bench", inst, "--time-limit", "10", "--db", path, "--quiet")
    assert rc == 0, err
    return path


def test_export_refuses_to_write_over_the_database(db, capsys):
    size = db.stat().st_size
    assert size > 0
    for target in (db, db.parent / "." / db.name):  # the same file under another spelling
        rc, _, err = run_here(capsys, "export", "--db", db, "-o", target)
        assert rc != 0 and "refusing to write over the results database" in err
    assert db.stat().st_size == size
    os.symlink(db, db.parent / "link.csv")
    rc, _, err = run_here(capsys, "export", "--db", db, "-o", db.parent / "link.csv")
    assert rc != 0 and "refusing" in err
    assert db.stat().st_size == size
    rc, _, err = run_here(capsys, "export", "--db", db, "-o", db.parent / "rows.csv")
    assert rc == 0, err


def test_solve_output_refuses_the_instance(tmp_path, capsys):
    inst = tmp_path / GRID.name
    shutil.copy(GRID, inst)
    before = inst.read_bytes()
    rc, _, err = run_here(capsys, "solve", inst, "-o", inst, "--time-limit", "10")
    assert rc != 0 and "refusing to write over an input instance" in err
    assert inst.read_bytes() == before
    # --save into the instance folder cannot hit it either (names end in .PARAM.json), and convert/dual refuse too
    rc, _, err = run_here(capsys, "convert", inst, inst)
    assert rc != 0 and "refusing" in err
    rc, _, err = run_here(capsys, "dual", inst, "-o", inst)
    assert rc != 0 and "refusing" in err
    assert inst.read_bytes() == before


def test_save_keeps_one_result_per_input_of_the_same_name(tmp_path, capsys):
    a, b = tmp_path / "a", tmp_path / "b"
    a.mkdir()
    b.mkdir()
    shutil.copy(GRID, a / "g.json")
    shutil.copy(ROOT / "instances" / "grids" / "grid-03x04.json", b / "g.json")
    out = tmp_path / "results"
    rc, _, err = run_here(capsys, "solve", a / "g.json", b / "g.json", "--save", out, "--time-limit", "10")
    assert rc == 0, err
    saved = sorted(p.name for p in out.iterdir())
    assert len(saved) == 2, saved
    instances = {Path(json.loads((out / n).read_text())["instance"]["path"]).resolve() for n in saved}
    assert instances == {(a / "g.json").resolve(), (b / "g.json").resolve()}

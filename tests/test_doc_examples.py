"""Every command shown in README.md and in the ``--help`` texts is run here, so that none can drift.

Commands run in the order shown, in a scratch folder where ``instances/`` is the repository's; a
command shown with ``$`` and its output must print the same rows (every column but the seconds).
Any that would take long go in ``SLOW`` and run with ``make test-slow``.
"""

from __future__ import annotations

import glob
import os
import re
import shlex

import pytest

from sweepwidth.cli import build_parser, main

ROOT = os.path.dirname(os.path.dirname(os.path.abspath(__file__)))

#: commands that take more than a few seconds, run only by ``make test-slow`` (none at present)
SLOW: tuple[str, ...] = ()


def readme_commands() -> list[tuple[str, list[str] | None]]:
    """``(command, expected output lines or None)`` for every sweepwidth command in README.md's code blocks."""
    text = open(os.path.join(ROOT, "README.md"), encoding="utf-8").read()
    out: list[tuple[str, list[str] | None]] = []
    for block in re.findall(r"```[a-z]*\n(.*?)```", text, flags=re.S):
        lines = block.splitlines()
        if any(l.startswith(("import ", ">>>", "print(")) for l in lines):
            continue  # the Python tour
        i = 0
        while i < len(lines):
            line = lines[i]
            if line.startswith("$ sweepwidth "):
                expected = []
                i += 1
                while i < len(lines) and lines[i].strip() and not lines[i].startswith("$ "):
                    expected.append(lines[i])
                    i += 1
                out.append((line[2:], expected))
                continue
            if line.startswith("sweepwidth "):
                out.append((line.split("  #")[0].strip(), None))
            i += 1
    return out


def help_commands() -> list[str]:
    """Every ``sweepwidth ...`` line of the top-level and per-verb ``--help`` epilogs, in verb order."""
    parser = build_parser()
    texts = [parser.epilog or ""]
    sub = [a for a in parser._actions if a.dest == "verb"][0]
    texts += [p.epilog or "" for p in sub.choices.values()]
    cmds = []
    for t in texts:
        for line in t.splitlines():
            if line.startswith("  sweepwidth "):
                cmds.append(line.strip())
    return cmds


def _run(cmd: str, capsys) -> tuple[int, str, str]:
    argv = []
    for a in shlex.split(cmd)[1:]:
        argv += sorted(glob.glob(a)) if "*" in a else [a]
    capsys.readouterr()
    try:
        rc = main(argv)
    except SystemExit as exc:
        rc = exc.code
    cap = capsys.readouterr()
    return rc, cap.out, cap.err


def _rows(lines: list[str]) -> list[list[str]]:
    """Table rows without the seconds column (times differ from run to run)."""
    rows = []
    for l in lines:
        cells = l.split()
        if cells and "seconds" in cells:
            seconds_at = cells.index("seconds")
        if not cells or set(l.strip()) <= {"-", " "}:
            continue
        rows.append(cells[:seconds_at] + cells[seconds_at + 1:] if len(cells) > seconds_at else cells)
    return rows


@pytest.fixture()
def scratch(tmp_path, monkeypatch):
    os.symlink(os.path.join(ROOT, "instances"), tmp_path / "instances")
    monkeypatch.chdir(tmp_path)
    return tmp_path


def _check(cmds, capsys, slow: bool) -> int:
    ran = 0
    for cmd, expected in cmds:
        if any(s in cmd for s in SLOW) != slow:
            continue
        rc, out, err = _run(cmd, capsys)
        assert rc == 0, f"{cmd}\n{err}"
        if expected:
            assert _rows(out.splitlines()) == _rows(expected), f"{cmd}: the README shows other rows\n{out}"
        ran += 1
    return ran


def test_readme_commands_run_as_shown(scratch, capsys):
    # regression: README named results/pavilion-homotopy.json (the file is pavilion.homotopy.json) and showed
    # stale methods; every command now runs and its rows must match
    cmds = readme_commands()
    assert any(c.startswith("sweepwidth check") for c, _ in cmds)
    assert _check(cmds, capsys, slow=False) >= 4


def test_help_examples_run_as_written(scratch, capsys):
    # regression: help examples named files that are not shipped (wheel.json, mesh.off)
    cmds = [(c, None) for c in help_commands()]
    assert len(cmds) >= 9
    assert _check(cmds, capsys, slow=False) == len(cmds)


@pytest.mark.slow
def test_readme_slow_commands(scratch, capsys):
    _check(readme_commands() + [(c, None) for c in help_commands()], capsys, slow=True)

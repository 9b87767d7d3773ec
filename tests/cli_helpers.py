"""Running the command line in-process for the CLI tests."""

from __future__ import annotations

from typing import Any

from sweepwidth.cli import main


def run_cli(capsys: Any, *argv: Any) -> tuple[Any, str, str]:
    """``(exit status, stdout, stderr)`` of ``sweepwidth ARGV...`` run in this process."""
    capsys.readouterr()
    try:
        rc = main([str(a) for a in argv])
    except SystemExit as exc:
        rc = exc.code
    cap = capsys.readouterr()
    return rc, cap.out, cap.err

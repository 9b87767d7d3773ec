"""What a benchmark run records about the software and the machine it ran on."""

from __future__ import annotations

import os
import platform
import subprocess
import sys
from importlib import metadata
from typing import Any

__all__ = ["run_metadata", "package_versions", "git_commit"]

_PACKAGES = ("sweepwidth", "python-sat", "networkx", "numpy", "scipy", "numba", "ortools", "dask", "distributed")


def package_versions() -> dict[str, str | None]:
    """Installed versions of sweepwidth and the packages its solvers use (None when absent)."""
    out: dict[str, str | None] = {}
    for name in _PACKAGES:
        try:
            out[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            out[name] = None
    return out


def git_commit(path: str | None = None) -> str | None:
    """The git commit of the source tree holding the package (``+dirty`` when modified), else None."""
    where = path or os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    try:
        head = subprocess.run(
            ["git", "-C", where, "rev-parse", "HEAD"], capture_output=True, text=True, timeout=5
        )
        if head.returncode != 0:
            return None
        commit = head.stdout.strip()
        status = subprocess.run(
            ["git", "-C", where, "status", "--porcelain", "--untracked-files=no"],
            capture_output=True, text=True, timeout=5,
        )
        if status.returncode == 0 and status.stdout.strip():
            commit += "+dirty"
        return commit
    except (OSError, subprocess.SubprocessError):
        return None


def run_metadata(**extra: Any) -> dict[str, Any]:
    """Versions, machine and git commit, plus whatever the caller adds (seed, options, executor)."""
    meta: dict[str, Any] = {
        "versions": package_versions(),
        "python": sys.version.split()[0],
        "platform": platform.platform(),
        "machine": platform.machine(),
        "processor": platform.processor() or None,
        "cpu_count": os.cpu_count(),
        "hostname": platform.node(),
        "git_commit": git_commit(),
    }
    meta.update(extra)
    return meta

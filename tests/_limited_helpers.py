"""Functions run in child processes by tests/test_cutwidth_sat.py.

Kept in a module of their own with light imports: a child process imports
the module of the function it runs, and the test module pulls in hypothesis
and pytest, which costs seconds on a busy machine.
"""

from __future__ import annotations

import os
import time


def sleepy(n, *, progress):
    for i in range(n):
        progress(i)
        time.sleep(0.2)
    return "finished"


def raises_value_error(*, progress):
    progress("about to fail")
    raise ValueError("bad thing 42")


class Unpicklable(Exception):
    def __init__(self, handle):
        super().__init__("holds a handle")
        self.handle = handle

    def __reduce__(self):
        raise TypeError("cannot pickle")


def raises_unpicklable(*, progress):
    raise Unpicklable(lambda: None)


def native_forever(*, progress):
    """Pigeonhole 13 -> 12: a SAT call far longer than any test limit, deaf to signals."""
    from pysat.examples.genhard import PHP
    from pysat.solvers import Solver

    progress("solving")
    with Solver(name="cadical195", bootstrap_with=PHP(12).clauses) as s:
        return s.solve()


def pid(*, progress):
    return os.getpid()


def monotone_path_all_nan(k, *, progress):
    """The compiled path recovery of the homology subset DP on a table of NaN (issue 10)."""
    import numpy as np

    from sweepwidth.solve.homology.face_sets import _monotone_path

    best = np.full(1 << k, np.nan)
    return _monotone_path(k, best, (1 << k) - 1).tolist()

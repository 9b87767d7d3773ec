"""Running work under a real time limit.

Two tools, for two kinds of work:

* :func:`run_limited` runs a function in a child process and kills it at the
  deadline.  This is the only reliable way to stop a native call that ignores
  signals (a python-sat ``solve()`` inside CaDiCaL or Kissat, a numba kernel).
  The child reports intermediate results through a ``progress`` callable, so a
  killed child still leaves its best bounds and witness behind.
* :func:`sat_call` runs one SAT call under a deadline *in this process*, as a
  series of conflict-budgeted slices (``conf_budget`` + ``solve_limited``),
  keeping the solver's learned clauses between slices.  It is cheaper than a
  child process and keeps an incremental solver alive, but a single slice
  cannot be cut short, so the deadline is met only to within one slice
  (slices are sized from the measured conflict rate to last at most ~0.25 s).

Process start-up cost
---------------------
Children are started from a reusable *forkserver* that has already imported
numpy, networkx, python-sat and the SAT engine, so a child costs a fork plus
unpickling its arguments rather than a fresh interpreter.  Measured on the
development machine (2 shared cores, Python 3.11): the first call pays
0.3-1 s to start the server and import those modules once, later calls
12-30 ms each, against about 80 ms for an empty ``spawn`` child before any
import.  The child imports the
module of the function it runs, so keep such functions in light modules.
``benchmarks/cutwidth.py --overhead`` re-measures it.

User code is never run in a child
---------------------------------
The standard ``forkserver`` and ``spawn`` start methods re-run the calling
program's ``__main__`` in every child (as ``__mp_main__``), so a research
script without an ``if __name__ == "__main__":`` guard would print its output
again, write its files again and start its own solves inside the child.  The
children started here come from a private forkserver (not the one shared with
the caller's own :mod:`multiprocessing` use) and are told nothing about
``__main__``: only the library's own picklable functions run in them, so
plain scripts, ``python -c``, scripts read from standard input and notebooks
all behave the same.  ``fork`` alone would avoid the re-run too, but forking
a process that already runs threads (numba, BLAS, the caller's own) can
deadlock the child, so it is used only where the parent is known to be a
fresh single-threaded child (the benchmark's task processes).

Children die with their parent
------------------------------
Every child asks the kernel for ``SIGKILL`` when its parent exits (Linux
``PR_SET_PDEATHSIG``) and, on every platform, runs a watchdog thread that
waits on the parent's sentinel (a pipe the parent holds) and ends the child
when it closes.  So killing the caller with SIGKILL or SIGTERM leaves no
solver running.

Solvers and budgets (python-sat 1.9.dev24)
------------------------------------------
``conf_budget`` + ``solve_limited`` work for cadical103/153/195, the glucose,
minisat and maple families and kissat404 (kissat without assumptions);
lingeling and cryptominisat have no limited solve, so :func:`sat_call` falls
back to an unbounded call for them only when there is no deadline.
"""

from __future__ import annotations

import multiprocessing as mp
import os
import pickle
import signal
import sys
import threading
import time
import traceback
import types
from multiprocessing import context as _mp_context
from multiprocessing import spawn as _mp_spawn
from typing import Any, Callable, Sequence

from ..errors import SweepwidthError, UnsupportedOptionError

__all__ = [
    "run_limited",
    "sat_call",
    "remaining",
    "ChildProcessError_",
    "BUDGET_SOLVERS",
    "IsolatedContext",
    "die_with_parent",
]

#: python-sat solver names whose ``solve_limited`` honours ``conf_budget``.
BUDGET_SOLVERS = frozenset(
    {
        "cadical103", "cadical153", "cadical195",
        "glucose3", "glucose4", "glucose42", "gluecard3", "gluecard4",
        "minisat22", "minisatgh", "minicard", "maplesat", "maplecm", "maplechrono",
        "mergesat3", "kissat404",
    }
)

_PRELOAD = ["numpy", "networkx", "pysat.solvers", "pysat.card", "sweepwidth.solve._deadline", "sweepwidth.solve.ordering.sat_encoding", "sweepwidth.solve.ordering.sat"]
_CTX_LOCK = threading.Lock()
_CTX: Any = None


class ChildProcessError_(SweepwidthError, RuntimeError):
    """The child process died without reporting (crash, out of memory, killed from outside).

    Attributes
    ----------
    exitcode : int or None
        The child's exit code (negative: killed by that signal).
    """

    def __init__(self, message: str, exitcode: int | None = None) -> None:
        super().__init__(message)
        self.exitcode = exitcode


def remaining(deadline: float | None) -> float:
    """Seconds left until ``deadline`` (a ``time.monotonic()`` value); inf for None."""
    if deadline is None:
        return float("inf")
    return deadline - time.monotonic()


# ------------------------------------------------ children that never run __main__
_MAIN_KEYS = ("init_main_from_name", "init_main_from_path")


class _SpawnWithoutMain:
    """``multiprocessing.spawn`` as seen by our launchers: no ``__main__`` re-run in the child."""

    def __getattr__(self, name: str) -> Any:
        return getattr(_mp_spawn, name)

    @staticmethod
    def get_preparation_data(name: str) -> dict:
        data = _mp_spawn.get_preparation_data(name)
        for key in _MAIN_KEYS:
            data.pop(key, None)
        return data


_LAUNCHING = threading.local()  # the private forkserver of the launch in progress


class _PrivateServer:
    """``multiprocessing.forkserver`` as seen by our launchers: connects to our own server."""

    def __getattr__(self, name: str) -> Any:
        import multiprocessing.forkserver as fs

        return getattr(fs, name)

    @staticmethod
    def connect_to_new_process(fds: Any) -> Any:
        return _LAUNCHING.server.connect_to_new_process(fds)


def _rebuilt(fn: Any, **overrides: Any) -> Any:
    """A copy of the standard library function ``fn`` seeing other module globals."""
    g = dict(fn.__globals__)
    g.update(overrides)
    return types.FunctionType(fn.__code__, g, fn.__name__, fn.__defaults__, fn.__closure__)


_SERVERS: dict[str, Any] = {}  # key -> multiprocessing.forkserver.ForkServer (private, preloaded)
_POPEN: dict[str, Any] = {}


def _popen_classes() -> dict[str, Any]:
    """Popen classes that launch without the caller's ``__main__`` (built once, lazily)."""
    if _POPEN:
        return _POPEN
    if "forkserver" in mp.get_all_start_methods():
        from multiprocessing import popen_forkserver

        launch = _rebuilt(popen_forkserver.Popen._launch, spawn=_SpawnWithoutMain(), forkserver=_PrivateServer())  # type: ignore[attr-defined]

        class _ForkserverPopen(popen_forkserver.Popen):  # type: ignore[misc]
            def _launch(self, process_obj: Any) -> None:
                _LAUNCHING.server = _SERVERS[process_obj._sw_server]
                try:
                    launch(self, process_obj)
                finally:
                    _LAUNCHING.server = None

        _POPEN["forkserver"] = _ForkserverPopen
    if sys.platform == "win32":  # pragma: no cover - not run on the development machine
        from multiprocessing import popen_spawn_win32

        init = _rebuilt(popen_spawn_win32.Popen.__init__, spawn=_SpawnWithoutMain())
        _POPEN["spawn"] = type("_SpawnPopen", (popen_spawn_win32.Popen,), {"__init__": init})
    else:
        from multiprocessing import popen_spawn_posix

        launch_spawn = _rebuilt(popen_spawn_posix.Popen._launch, spawn=_SpawnWithoutMain())  # type: ignore[attr-defined]
        _POPEN["spawn"] = type("_SpawnPopen", (popen_spawn_posix.Popen,), {"_launch": launch_spawn})
    return _POPEN


class _IsolatedProcess(_mp_context.SpawnProcess):  # type: ignore[misc,name-defined]
    """A child process started by :class:`IsolatedContext` (never runs ``__main__``)."""

    _sw_server: str | None = None
    _sw_method: str = "spawn"

    @staticmethod
    def _Popen(process_obj: Any) -> Any:
        return _popen_classes()[process_obj._sw_method](process_obj)


class IsolatedContext:
    """A :mod:`multiprocessing`-like context whose children never run the caller's ``__main__``.

    Parameters
    ----------
    key : str
        Name of the private forkserver (one per key and process).
    preload : list of str
        Modules the forkserver imports once, before forking children.

    Notes
    -----
    Uses a private forkserver where the platform has one, else ``spawn``; in
    both the child is not told about ``__main__`` (see the module docstring).
    Children must run module-level functions of importable modules.
    """

    def __init__(self, key: str, preload: Sequence[str]) -> None:
        self.key = key
        self.method = "forkserver" if "forkserver" in mp.get_all_start_methods() else "spawn"
        self._base = mp.get_context(self.method)
        if self.method == "forkserver":
            with _CTX_LOCK:
                if key not in _SERVERS:
                    from multiprocessing.forkserver import ForkServer

                    server = ForkServer()
                    server.set_forkserver_preload([m for m in preload if m != "__main__"])
                    _SERVERS[key] = server

    def get_start_method(self) -> str:
        return self.method

    def Pipe(self, duplex: bool = True) -> Any:
        return self._base.Pipe(duplex)

    def Process(self, *args: Any, **kwargs: Any) -> Any:
        proc = _IsolatedProcess(*args, **kwargs)
        proc._sw_method = self.method
        proc._sw_server = self.key if self.method == "forkserver" else None
        return proc


def _context() -> Any:
    """The shared context for time-limited children (private forkserver, no ``__main__``)."""
    global _CTX
    if _CTX is None:
        ctx = IsolatedContext("solve", _PRELOAD)
        with _CTX_LOCK:
            if _CTX is None:
                _CTX = ctx
    return _CTX


def _kill_self() -> None:
    os.kill(os.getpid(), signal.SIGKILL if hasattr(signal, "SIGKILL") else signal.SIGTERM)


def die_with_parent() -> None:
    """In a child process: end this process (and so its work) when its parent goes away.

    Linux: ``prctl(PR_SET_PDEATHSIG, SIGKILL)``, then a check that the parent
    did not die before the request was made.  Every platform: a daemon thread
    waiting on the parent's sentinel (a pipe or handle that closes when the
    parent exits), falling back to polling the parent process id.
    """
    parent = mp.parent_process()
    ppid = os.getppid() if hasattr(os, "getppid") else None
    if sys.platform.startswith("linux"):
        try:
            import ctypes

            libc = ctypes.CDLL(None, use_errno=True)
            PR_SET_PDEATHSIG = 1
            libc.prctl(PR_SET_PDEATHSIG, int(signal.SIGKILL), 0, 0, 0)
        except Exception:  # pragma: no cover - no prctl
            pass
        if ppid is not None and os.getppid() != ppid:  # the parent died before the request
            _kill_self()
    sentinel = getattr(parent, "sentinel", None) if parent is not None else None
    if sentinel is not None:
        from multiprocessing.connection import wait

        try:
            if wait([sentinel], 0):  # already gone
                _kill_self()
        except OSError:  # pragma: no cover
            sentinel = None

    def watch() -> None:
        if sentinel is not None:
            from multiprocessing.connection import wait

            try:
                wait([sentinel])
            except OSError:  # pragma: no cover
                pass
            _kill_self()
        while ppid is not None:  # pragma: no cover - no sentinel (not started by multiprocessing)
            time.sleep(0.5)
            if os.getppid() != ppid:
                _kill_self()

    if sentinel is not None or ppid is not None:
        threading.Thread(target=watch, name="sweepwidth-parent-watch", daemon=True).start()


def use_start_method(method: str) -> bool:
    """Start later children of this process with ``method`` (e.g. 'fork'); False if unavailable.

    Public through :func:`sweepwidth.solve.contract.use_fork_children`.
    """
    global _CTX
    if method not in mp.get_all_start_methods():
        return False
    with _CTX_LOCK:
        _CTX = mp.get_context(method)
    return True


def _child_main(conn: Any, fn: Callable, args: tuple, kwargs: dict) -> None:
    """Body of the child process: run ``fn`` and send everything back on ``conn``."""

    def progress(obj: Any) -> None:
        conn.send(("progress", obj))

    die_with_parent()
    try:
        value = fn(*args, progress=progress, **kwargs)
    except BaseException as exc:  # noqa: BLE001 - everything goes back to the parent
        tb = traceback.format_exc()
        try:
            payload = pickle.dumps(exc)
            pickle.loads(payload)  # some exceptions pickle but do not unpickle
            conn.send(("error", payload, tb))
        except Exception:
            conn.send(("error", None, tb + f"\n(unpicklable {type(exc).__name__}: {exc!r})"))
    else:
        try:
            conn.send(("done", value))
        except Exception as exc:  # value not picklable
            conn.send(("error", None, f"result of {getattr(fn, '__name__', fn)!r} is not picklable: {exc!r}"))
    finally:
        conn.close()


def _raise_child_error(payload: bytes | None, tb: str) -> None:
    if payload is not None:
        exc = pickle.loads(payload)
        if hasattr(exc, "add_note"):
            exc.add_note("raised in the time-limited child process:\n" + tb)
        raise exc
    raise ChildProcessError_("the time-limited child raised an exception that cannot be sent back:\n" + tb)


def run_limited(
    fn: Callable[..., Any],
    args: Sequence[Any] = (),
    kwargs: dict | None = None,
    *,
    deadline: float | None,
    on_progress: Callable[[Any], None] | None = None,
) -> tuple[bool, Any, list]:
    """Run ``fn(*args, progress=callable, **kwargs)`` and stop it at ``deadline``.

    With a deadline the call runs in a child process (from a reusable
    forkserver); at the deadline the child is killed (SIGKILL), which also
    stops native code that ignores signals.  Without a deadline it runs in
    this process.

    Parameters
    ----------
    fn : callable
        A module-level (picklable) function accepting a ``progress`` keyword:
        ``progress(obj)`` reports an intermediate result (e.g. improved bounds)
        that survives a kill.  Objects must be picklable.
    args, kwargs
        Arguments for ``fn`` (picklable).
    deadline : float or None
        A ``time.monotonic()`` value, or None for no limit (in-process run).
    on_progress : callable, optional
        Called in the parent with each progress object as it arrives.

    Returns
    -------
    finished : bool
        True when ``fn`` returned before the deadline.
    value : object or None
        ``fn``'s return value when finished, else None.
    progress : list
        Every progress object reported, in order.

    Raises
    ------
    Exception
        An exception raised by ``fn`` is re-raised here with its own type when
        it pickles (the child traceback is attached as a note).
    ChildProcessError_
        The child died without reporting (crash, out of memory) or raised an
        exception that cannot be sent back.

    Notes
    -----
    Returns within about 0.1 s of the deadline plus the time to kill and reap
    the child (milliseconds).  A deadline already past returns at once
    without starting anything.  Start-up cost: see the module docstring.

    Examples
    --------
    >>> from sweepwidth.solve._deadline import run_limited
    >>> def halves(n, *, progress):
    ...     while n > 1:
    ...         n //= 2
    ...         progress(n)
    ...     return "done"
    >>> run_limited(halves, (20,), deadline=None)
    (True, 'done', [10, 5, 2, 1])
    """
    kwargs = dict(kwargs or {})
    reports: list = []

    def record(obj: Any) -> None:
        reports.append(obj)
        if on_progress is not None:
            on_progress(obj)

    if deadline is None:
        return True, fn(*args, progress=record, **kwargs), reports
    if time.monotonic() >= deadline:
        return False, None, reports

    ctx = _context()
    parent_conn, child_conn = ctx.Pipe(duplex=False)
    proc = ctx.Process(target=_child_main, args=(child_conn, fn, tuple(args), kwargs), daemon=True)
    proc.start()
    child_conn.close()
    outcome: tuple | None = None
    try:
        while outcome is None:
            left = deadline - time.monotonic()
            if left <= 0:
                break
            try:
                ready = parent_conn.poll(min(left, 0.1))
            except (EOFError, OSError):
                break
            if not ready:
                if not proc.is_alive() and not parent_conn.poll(0):
                    break
                continue
            try:
                msg = parent_conn.recv()
            except (EOFError, OSError):
                break
            if msg[0] == "progress":
                record(msg[1])
            else:
                outcome = msg
    finally:
        if proc.is_alive() and outcome is None:
            proc.kill()
        proc.join(timeout=2.0)
        if proc.is_alive():  # pragma: no cover - should not happen after SIGKILL
            proc.kill()
            proc.join(timeout=1.0)
        # messages sent just before the kill
        try:
            while outcome is None and parent_conn.poll(0):
                msg = parent_conn.recv()
                if msg[0] == "progress":
                    record(msg[1])
                else:
                    outcome = msg
        except (EOFError, OSError):
            pass
        parent_conn.close()

    if outcome is None:
        code = proc.exitcode
        if time.monotonic() < deadline - 0.05 and code not in (None, 0) and code != -9:
            raise ChildProcessError_(
                f"the time-limited child process died with exit code {code} before reporting a result",
                exitcode=code,
            )
        return False, None, reports
    if outcome[0] == "done":
        return True, outcome[1], reports
    _raise_child_error(outcome[1], outcome[2])
    raise AssertionError("unreachable")  # pragma: no cover


def sat_call(
    solver: Any,
    assumptions: Sequence[int] = (),
    *,
    deadline: float | None = None,
    name: str = "",
    slice_seconds: float = 0.25,
    stats: dict | None = None,
) -> bool | None:
    """One SAT call that gives up at ``deadline``, run as conflict-budgeted slices.

    Parameters
    ----------
    solver : pysat.solvers.Solver
        An incremental solver; it keeps its learned clauses between slices.
    assumptions : sequence of int
        Literals assumed for this call.
    deadline : float or None
        ``time.monotonic()`` value; None runs one unbounded ``solve``.
    name : str
        The solver's python-sat name (to know whether budgets work).
    slice_seconds : float
        Target duration of one slice; the conflict budget of the next slice
        is set from the conflict rate measured so far.
    stats : dict, optional
        Updated in place: ``'slices'`` (number of limited calls) and
        ``'conflicts'`` (conflicts spent in this call).

    Returns
    -------
    bool or None
        The solver's answer, or None when the deadline came first.

    Raises
    ------
    UnsupportedOptionError
        A deadline with a solver that has no limited solve.

    Notes
    -----
    Overshoot is at most one slice: slices are sized to ``slice_seconds`` and
    to a quarter of the time left.  On CaDiCaL 1.9.5 slices of 20 000
    conflicts cost nothing measurable against one long call; slices of 2 000
    conflicts cost about 1.5x (each call re-runs its preprocessing).

    Examples
    --------
    >>> from pysat.solvers import Solver
    >>> import time
    >>> with Solver(name="cadical195", bootstrap_with=[[1, 2], [-1]]) as s:
    ...     sat_call(s, [2], deadline=time.monotonic() + 5, name="cadical195")
    True
    """
    if stats is None:
        stats = {}
    stats.setdefault("slices", 0)
    stats.setdefault("conflicts", 0)

    def conflicts() -> int:
        try:
            return int(solver.accum_stats().get("conflicts", 0))
        except (NotImplementedError, AttributeError):
            return 0

    if deadline is None:
        c0 = conflicts()
        res = solver.solve(assumptions=list(assumptions))
        stats["slices"] += 1
        stats["conflicts"] += conflicts() - c0
        return bool(res)
    if name and name not in BUDGET_SOLVERS:
        raise UnsupportedOptionError(
            "solver for a time-limited SAT call", name, sorted(BUDGET_SOLVERS)
        )
    budget = 300  # first slice: small, the conflict rate is not known yet
    rate: float | None = None  # conflicts per second
    while True:
        left = deadline - time.monotonic()
        if left <= 0:
            return None
        if rate is not None:
            budget = int(max(200, min(rate * min(slice_seconds, left / 4 + 0.02), 2_000_000)))
        c0 = conflicts()
        t0 = time.monotonic()
        solver.conf_budget(budget)
        res = solver.solve_limited(assumptions=list(assumptions))
        dt = time.monotonic() - t0
        spent = max(1, conflicts() - c0)
        stats["slices"] += 1
        stats["conflicts"] += spent
        if res is not None:
            return bool(res)
        # smooth the rate estimate; a slice that hit its budget measures it well
        r = spent / max(dt, 1e-4)
        rate = r if rate is None else 0.5 * rate + 0.5 * r


def _measure_overhead(calls: int = 5) -> dict:
    """Seconds per child process (first call separately) for the benchmarks."""
    out: dict = {}
    t0 = time.monotonic()
    run_limited(_noop, deadline=time.monotonic() + 30)
    out["first"] = time.monotonic() - t0
    times = []
    for _ in range(calls):
        t0 = time.monotonic()
        run_limited(_noop, deadline=time.monotonic() + 30)
        times.append(time.monotonic() - t0)
    times.sort()
    out["median"] = times[len(times) // 2]
    return out


def _noop(*, progress: Callable[[Any], None]) -> int:
    progress(1)
    return os.getpid()

"""Running one task in its own limited child process.

:func:`execute_task` is what an executor runs (a thread of the local pool,
a dask worker, anything with ``submit``).  It starts a child process that

1. ends itself when its parent dies (Linux ``PR_SET_PDEATHSIG`` and, on every
   platform, a watchdog thread on the parent's sentinel), so that killing a
   benchmark run leaves no stray solvers behind;
2. caps its address space with ``resource.setrlimit(RLIMIT_AS)``;
3. loads the instance, solves it with the task's time limit, replays the
   witness with the independent checker, and reports back.

The solver is asked to stop at the time limit itself; the parent kills the
child at ``time_limit + grace`` after the child reports that it has started
(interpreter start and imports do not count, up to
:data:`STARTUP_ALLOWANCE` seconds) in case it does not (a native SAT call that
ignores signals).  Progress reports (bounds found so far) travel through the
same channel, so a killed task keeps whatever bounds it had reported.

Children are forked from a forkserver where the calling process may have
children (fast: a fork, not a new interpreter); inside a daemonic process
(where :mod:`multiprocessing` refuses to start children, e.g. a dask worker
process) a fresh interpreter is started with :mod:`subprocess` instead and
talks JSON lines over its standard output.

Outcome statuses
----------------
'optimal', 'bounded', 'infeasible'   from the solver's result
'bounded'                            killed or out of memory after reporting bounds
'timeout'                            killed at the hard limit with no bounds reported
'memory'                             MemoryError, or died by a signal under a memory limit
'error'                              any other failure; ``message`` says what
"""

from __future__ import annotations

import json
import multiprocessing as mp
import os
import queue
import signal
import subprocess
import sys
import threading
import time
import traceback
from typing import Any, Callable, Mapping

from ..registry import PARAMETERS

__all__ = ["execute_task", "cancel_all", "reset_cancel", "quick_bounds", "OUTCOME_STATUSES"]

OUTCOME_STATUSES = ("optimal", "bounded", "infeasible", "timeout", "memory", "error")

_ACTIVE: dict[int, Callable[[], None]] = {}
_ACTIVE_LOCK = threading.Lock()
_STOPPING = threading.Event()  # set by cancel_all(): no new child may run until reset_cancel()
_PRELOAD = [
    "numpy",
    "networkx",
    "pysat.solvers",
    "sweepwidth.plane",
    "sweepwidth.io",
    # every parameter's solver room and checker, from the registry (sweepwidth.solve.contract)
    *(p.module for p in PARAMETERS.values()),
    *(p.checker for p in PARAMETERS.values()),
    "sweepwidth.bench.child",
    "sweepwidth.bench._warm",
]

#: seconds a child may take to start (interpreter, imports) before its time limit starts counting
STARTUP_ALLOWANCE = 60.0


# ---------------------------------------------------------------- child side
def _die_with_parent() -> None:
    """End this process when its parent goes away (Linux parent-death signal plus a watchdog thread)."""
    from ..solve.contract import die_with_parent

    die_with_parent()


def _limit_memory(memory_mb: Any) -> None:
    if not memory_mb:
        return
    try:
        import resource

        limit = int(float(memory_mb) * 1024 * 1024)
        _soft, hard = resource.getrlimit(resource.RLIMIT_AS)
        if hard != resource.RLIM_INFINITY:
            limit = min(limit, hard)
        resource.setrlimit(resource.RLIMIT_AS, (limit, hard))
    except (ImportError, ValueError, OSError):  # pragma: no cover - non-POSIX
        pass


def _bounds_of(p: Any) -> dict:
    """Lower bound, upper bound and witness of a progress report of any shape."""
    from ..result import _jsonable

    if hasattr(p, "to_dict") and callable(p.to_dict):
        p = p.to_dict()
    if isinstance(p, Mapping):
        get = p.get
    elif isinstance(p, (tuple, list)) and len(p) >= 2:
        return {"lower": _jsonable(p[0]), "upper": _jsonable(p[1]), "witness": None}
    else:
        get = lambda k, default=None: getattr(p, k, default)  # noqa: E731
    witness = get("witness", None)
    if witness is None:
        witness = get("order", None)
    return {"lower": _jsonable(get("lower", None)), "upper": _jsonable(get("upper", None)), "witness": _jsonable(witness)}


def _fast_nested_children() -> None:
    """Let solvers that run their own time-limited children fork them directly from this child.

    :mod:`sweepwidth.solve._deadline` starts its children from a forkserver,
    which inside this (freshly forked, single-threaded) child would mean
    starting a second server with a new interpreter per task.  A plain fork
    is safe here and costs milliseconds.
    """
    from ..solve.contract import use_fork_children

    use_fork_children()


def quick_bounds(obj: Any, parameter: str, options: Mapping[str, Any]) -> dict | None:
    """Cheap proven bounds, reported before the real solve starts.

    * cutwidth: lower bound ``max ceil(w(delta(v)) / 2)`` over unpinned vertices
      (integral weights; ``w(delta(v)) / 2`` otherwise): the cuts just before
      and just after ``v`` hold its edges to the left and to the right.  Upper
      bound: the width of a breadth-first ordering (pins first and last),
      computed by the independent checker; that ordering is the witness.
    * homology, and homotopy with ``length='weight'``: lower bound the weight
      of the start cycle (the Z2 boundary of the outer face) when start, end
      and holes are the defaults: every sweep begins there.

    Returns None when nothing cheap applies.

    Examples
    --------
    >>> import networkx as nx
    >>> quick_bounds(nx.star_graph(5), "cutwidth", {})["lower"]
    3
    """
    import math as _m

    import networkx as nx

    if parameter == "cutwidth":
        from ..verify.ordering import ordering_width

        G = obj.to_networkx() if is_plane_like(obj) else obj
        weight = options.get("weight", "weight")
        first = options.get("first")
        last = options.get("last")

        def as_set(x: Any) -> set:
            if x is None:
                return set()
            if isinstance(x, (list, set, frozenset)) or (isinstance(x, tuple) and x not in G):
                return set(x)
            return {x}

        A, B = as_set(first), as_set(last)
        if A & B or not all(v in G for v in A | B):
            return None
        wf = (lambda d: 1.0) if weight is None else (lambda d: float(d.get(weight, 1)))
        deg = {v: 0.0 for v in G}
        integral = True
        edges = G.edges(data=True) if not G.is_multigraph() else ((u, v, d) for u, v, _k, d in G.edges(keys=True, data=True))
        for u, v, d in edges:
            if u == v:
                continue
            w = wf(d)
            integral = integral and float(w).is_integer()
            deg[u] += w
            deg[v] += w
        free = [v for v in G if v not in A and v not in B]
        if free:
            lower: float = max((_m.ceil(deg[v] / 2) if integral else deg[v] / 2) for v in free)
        else:
            lower = 0
        middle = [v for v in _bfs_order(G) if v not in A and v not in B]
        order = sorted(A, key=repr) + middle + sorted(B, key=repr)
        upper = ordering_width(G, order, weight, first=sorted(A, key=repr) or None, last=sorted(B, key=repr) or None)
        lower = min(lower, upper)
        return {
            "lower": lower,
            "upper": upper,
            "witness": order,
            "how": {"lower": "degree bound", "upper": "breadth-first ordering, width by the independent checker"},
        }
    if parameter in ("homology", "homotopy") and is_plane_like(obj):
        if any(options.get(k) is not None for k in ("start", "end", "holes", "s", "t")):
            return None
        if parameter == "homotopy" and options.get("weight", options.get("length", "weight")) != "weight":
            return None
        start = sum(obj.weight(e) for e in obj.face_boundary_cycle(obj.outer_face))
        return {"lower": start, "upper": None, "witness": None, "how": {"lower": "weight of the start cycle"}}
    return None


def is_plane_like(obj: Any) -> bool:
    return hasattr(obj, "outer_face") and hasattr(obj, "face_boundary_cycle")


def _bfs_order(G: Any) -> list:
    import networkx as nx

    order: list = []
    seen: set = set()
    for comp in sorted(nx.connected_components(G), key=lambda c: -len(c)):
        root = min(comp, key=lambda v: (G.degree(v), repr(v)))
        for v in [root] + [b for _a, b in nx.bfs_edges(G, root)]:
            if v not in seen:
                seen.add(v)
                order.append(v)
    return order


def _import_preloaded() -> None:
    """Import the solver stack before the clock starts (instant after a forkserver preload)."""
    import importlib

    # when the forkserver was started elsewhere without our preload (it is shared by the
    # whole process), the warm-up runs here, still before the clock starts
    for name in _PRELOAD:
        try:
            importlib.import_module(name)
        except ImportError as err:
            # an optional third-party module may be missing; our own modules must import
            if name.startswith("sweepwidth") or (err.name or "").startswith("sweepwidth"):
                raise


def _import_solver(spec: str) -> Callable[..., Any]:
    """The function named by ``"package.module:function"``."""
    import importlib

    from ..errors import UnsupportedOptionError

    mod_name, _, fn_name = spec.partition(":")
    if not mod_name or not fn_name:
        raise UnsupportedOptionError("solver (expected 'module:function')", spec)
    fn = getattr(importlib.import_module(mod_name), fn_name, None)
    if not callable(fn):
        raise UnsupportedOptionError("solver function", spec)
    return fn


def _load_snapshot(path: str) -> tuple[Any, str]:
    """Load ``path`` and hash exactly the bytes that were loaded.

    The file is read once into memory and both the hash and the instance come
    from that copy, so a file replaced while a benchmark runs can never pair
    one content's hash with another content's answer.
    """
    import shutil
    import tempfile

    from .hashing import instance_hash
    from .loading import load_instance

    if not os.path.exists(path):
        load_instance(path)  # raises the reader's "no such file" error
    with open(path, "rb") as fh:
        data = fh.read()
    folder = tempfile.mkdtemp(prefix="sweepwidth-task-")
    try:
        copy = os.path.join(folder, os.path.basename(path))
        with open(copy, "wb") as fh:
            fh.write(data)
        return load_instance(copy), instance_hash(copy)
    finally:
        shutil.rmtree(folder, ignore_errors=True)


def _body(task: Mapping[str, Any], send: Callable[[list], None]) -> None:
    """Load, solve, check; every outcome goes through ``send`` as a JSON-able list."""
    _die_with_parent()
    _limit_memory(task.get("memory_mb"))
    _fast_nested_children()
    _import_preloaded()
    send(["started"])
    try:
        from ..errors import SweepwidthError
        from .loading import check_object, load_instance, solve_object

        obj, solved_hash = _load_snapshot(task["instance"])
        send(["instance", solved_hash])

        def progress(p: Any) -> None:
            try:
                send(["progress", _bounds_of(p)])
            except Exception:  # a report that cannot be sent is dropped, not fatal
                pass

        if task.get("quick_bounds", True):
            try:
                qb = quick_bounds(obj, task["parameter"], task.get("options") or {})
            except Exception:  # noqa: BLE001 - bounds are a courtesy; the solve goes on
                qb = None
            if qb is not None:
                send(["progress", qb])

        if task.get("solver"):
            fn = _import_solver(str(task["solver"]))
            res = fn(
                obj,
                method=task.get("method", "auto"),
                time_limit=task.get("time_limit"),
                seed=task.get("seed"),
                progress=progress,
                **dict(task.get("options") or {}),
            )
        else:
            res = solve_object(
                obj,
                task["parameter"],
                method=task.get("method", "auto"),
                time_limit=task.get("time_limit"),
                seed=task.get("seed"),
                options=task.get("options") or {},
                progress=progress,
            )
        checked: float | None = None
        check_error: str | None = None
        if res.witness is not None:
            try:
                checked = check_object(res, obj)
            except SweepwidthError as err:
                check_error = f"{type(err).__name__}: {err}"
        send(["done", res.to_dict(), checked, check_error])
    except MemoryError as err:
        send(["memory", f"{type(err).__name__}: {err}"])
    except Exception as err:  # noqa: BLE001 - every failure is reported, none escapes
        from ..errors import SweepwidthError

        if isinstance(err, SweepwidthError):
            send(["error", f"{type(err).__name__}: {err}", ""])
        else:
            send(["error", f"{type(err).__name__}: {err}", traceback.format_exc()])


def _fork_main(conn: Any, task: Mapping[str, Any]) -> None:
    try:
        _body(task, conn.send)
    finally:
        conn.close()


def _subprocess_main() -> None:
    """Entry point of ``python -m sweepwidth.bench.child``: task JSON on stdin, JSON lines out."""
    out = os.fdopen(os.dup(1), "w", buffering=1, encoding="utf-8")
    # anything else printed to stdout must not corrupt the channel
    os.dup2(2, 1)
    task = json.loads(sys.stdin.read())

    def send(msg: list) -> None:
        out.write(json.dumps(msg) + "\n")
        out.flush()

    _body(task, send)
    out.close()


# --------------------------------------------------------------- parent side
def _context() -> Any:
    """A private forkserver with the solver stack preloaded; children never run ``__main__``."""
    from ..solve.contract import isolated_context

    return isolated_context("bench", _PRELOAD)


class _ForkChannel:
    def __init__(self, task: Mapping[str, Any]) -> None:
        ctx = _context()
        self.conn, child_conn = ctx.Pipe(duplex=False)
        self.proc = ctx.Process(target=_fork_main, args=(child_conn, dict(task)))
        self.proc.start()
        child_conn.close()

    def recv(self, timeout: float) -> list | None:
        """A message, None on timeout; raises EOFError when the child is gone."""
        if self.conn.poll(max(0.0, timeout)):
            return self.conn.recv()
        if not self.proc.is_alive() and not self.conn.poll(0):
            raise EOFError
        return None

    def kill(self) -> None:
        if self.proc.is_alive():
            self.proc.kill()

    def close(self) -> int | None:
        self.proc.join(timeout=5)
        if self.proc.is_alive():  # pragma: no cover
            self.proc.kill()
            self.proc.join(timeout=2)
        try:
            self.conn.close()
        except OSError:  # pragma: no cover
            pass
        return self.proc.exitcode


class _SubprocessChannel:
    def __init__(self, task: Mapping[str, Any]) -> None:
        env = dict(os.environ)
        pkg_root = os.path.dirname(os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
        env["PYTHONPATH"] = pkg_root + (os.pathsep + env["PYTHONPATH"] if env.get("PYTHONPATH") else "")
        self.proc = subprocess.Popen(
            [sys.executable, "-m", "sweepwidth.bench.child"],
            stdin=subprocess.PIPE,
            stdout=subprocess.PIPE,
            stderr=subprocess.DEVNULL,
            env=env,
            text=True,
        )
        assert self.proc.stdin is not None and self.proc.stdout is not None
        self.proc.stdin.write(json.dumps(dict(task)))
        self.proc.stdin.close()
        self.lines: queue.Queue = queue.Queue()
        self.reader = threading.Thread(target=self._read, daemon=True)
        self.reader.start()

    def _read(self) -> None:
        assert self.proc.stdout is not None
        for line in self.proc.stdout:
            line = line.strip()
            if line:
                try:
                    self.lines.put(json.loads(line))
                except json.JSONDecodeError:
                    continue
        self.lines.put(None)  # end of stream

    def recv(self, timeout: float) -> list | None:
        try:
            msg = self.lines.get(timeout=max(0.0, timeout))
        except queue.Empty:
            return None
        if msg is None:
            raise EOFError
        return msg

    def kill(self) -> None:
        if self.proc.poll() is None:
            self.proc.kill()

    def close(self) -> int | None:
        try:
            self.proc.wait(timeout=5)
        except subprocess.TimeoutExpired:  # pragma: no cover
            self.proc.kill()
            self.proc.wait(timeout=2)
        self.reader.join(timeout=2)
        return self.proc.returncode


def _daemonic() -> bool:
    try:
        return bool(mp.current_process().daemon)
    except Exception:  # pragma: no cover
        return False


def execute_task(task: Any, *, isolation: str = "auto") -> dict:
    """Run one task in a limited child process and describe what happened.

    Parameters
    ----------
    task : Task or dict
        A :class:`~sweepwidth.bench.tasks.Task` or its :meth:`~Task.to_dict`.
    isolation : {'auto', 'fork', 'subprocess'}
        How to start the child: 'fork' (forkserver), 'subprocess' (a new
        interpreter), or 'auto' (forkserver unless this process is daemonic).

    Returns
    -------
    dict
        ``status`` (one of :data:`OUTCOME_STATUSES`), ``value``, ``lower``,
        ``upper``, ``seconds`` (the solver's own time, else the wall time),
        ``wall`` (seconds including process start), ``startup`` (seconds
        until the child was ready) and ``after_start`` (seconds from then to
        the end; the hard limit bounds this one), ``method`` (what the
        solver says it ran), ``message``, ``checked`` (the width recomputed by
        the independent checker, or None), ``check_error``, ``result`` (the
        result dict, or the last progress report) and ``exitcode``.

    Notes
    -----
    Never raises for a failure of the task itself; only a failure to start a
    process at all propagates.  Returns within about ``time_limit + grace``
    plus a fraction of a second.
    """
    t = task.to_dict() if hasattr(task, "to_dict") else dict(task)
    mode = isolation
    if mode == "auto":
        mode = "subprocess" if _daemonic() else "fork"
    if mode not in ("fork", "subprocess"):
        from ..errors import UnsupportedOptionError

        raise UnsupportedOptionError("isolation", isolation, ["auto", "fork", "subprocess"])
    hard = None
    if t.get("time_limit") is not None:
        hard = float(t["time_limit"]) + float(t.get("grace", 5.0))
    t0 = time.monotonic()
    started: float | None = None  # when the child said it is up; the hard limit counts from then
    if _STOPPING.is_set():
        return _outcome(t, ["error", "cancelled before it started"], None, False, None, 0.0)
    chan = _ForkChannel(t) if mode == "fork" else _SubprocessChannel(t)
    ident = id(chan)
    with _ACTIVE_LOCK:
        _ACTIVE[ident] = chan.kill
    if _STOPPING.is_set():  # cancelled while this child was starting
        chan.kill()
    last: dict | None = None
    final: list | None = None
    solved_hash: str | None = None  # hash of the bytes the child actually loaded
    killed = False
    try:
        while final is None:
            wait = 0.2
            if hard is not None:
                if started is None:
                    left = STARTUP_ALLOWANCE + hard - (time.monotonic() - t0)
                else:
                    left = hard - (time.monotonic() - started)
                if left <= 0:
                    killed = True
                    break
                wait = min(wait, left)
            try:
                msg = chan.recv(wait)
            except (EOFError, OSError):
                break
            if msg is None:
                continue
            if msg[0] == "started":
                started = time.monotonic()
            elif msg[0] == "instance":
                solved_hash = str(msg[1])
            elif msg[0] == "progress":
                last = _merge_bounds(last, msg[1])
            else:
                final = msg
    finally:
        if final is None:
            chan.kill()
        code = chan.close()
        with _ACTIVE_LOCK:
            _ACTIVE.pop(ident, None)
    end = time.monotonic()
    wall = end - t0
    out = _outcome(t, final, last, killed, code, wall)
    out["instance_hash"] = solved_hash
    out["startup"] = (started - t0) if started is not None else None
    out["after_start"] = (end - started) if started is not None else None
    return out


def _merge_bounds(old: dict | None, new: Mapping[str, Any]) -> dict:
    """Keep the best proven bounds over all reports: the largest lower, the smallest upper (with its witness)."""
    if old is None:
        return dict(new)
    out = dict(old)
    lo_new, up_new = new.get("lower"), new.get("upper")
    if lo_new is not None and (out.get("lower") is None or float(lo_new) > float(out["lower"])):
        out["lower"] = lo_new
        out.setdefault("how", {})
    if up_new is not None and (out.get("upper") is None or float(up_new) < float(out["upper"])):
        out["upper"] = up_new
        out["witness"] = new.get("witness")
    how = dict(old.get("how") or {})
    how.update({k: v for k, v in (new.get("how") or {}).items() if (k == "lower" and out.get("lower") == lo_new) or (k == "upper" and out.get("upper") == up_new)})
    if how:
        out["how"] = how
    return out


def _outcome(t: Mapping[str, Any], final: list | None, last: dict | None, killed: bool, code: int | None, wall: float) -> dict:
    out: dict[str, Any] = {
        "status": "error",
        "value": None,
        "lower": None,
        "upper": None,
        "seconds": wall,
        "wall": wall,
        "method": "",
        "message": "",
        "checked": None,
        "check_error": None,
        "result": None,
        "exitcode": code,
    }

    def from_progress(status_without: str, why: str) -> None:
        if last is not None and (last.get("lower") is not None or last.get("upper") is not None):
            out.update(status="bounded", lower=last.get("lower"), upper=last.get("upper"), result=last)
            out["message"] = why + "; bounds from the last progress report"
        else:
            out.update(status=status_without, message=why)

    if final is not None and final[0] == "done":
        r = final[1]
        out.update(
            status=r["status"],
            value=r.get("value"),
            lower=r.get("lower"),
            upper=r.get("upper"),
            seconds=float(r.get("seconds") or wall),
            method=r.get("method", ""),
            checked=final[2],
            check_error=final[3],
            result=r,
        )
        if final[3]:
            out["message"] = "witness refused by the checker: " + final[3]
        return out
    if final is not None and final[0] == "memory":
        from_progress("memory", f"out of memory under the {t.get('memory_mb')} MiB limit ({final[1]})")
        return out
    if final is not None and final[0] == "error":
        out["message"] = final[1]
        if len(final) > 2 and final[2]:
            out["traceback"] = final[2]
        return out
    if killed:
        from_progress("timeout", f"killed at the hard limit of {t.get('time_limit')} + {t.get('grace', 5.0)} s")
        return out
    # died without a word
    sig = -code if code is not None and code < 0 else None
    if sig is not None:
        name = signal.Signals(sig).name if sig in signal.Signals._value2member_map_ else f"signal {sig}"
        if t.get("memory_mb") and sig in (signal.SIGKILL, signal.SIGSEGV, signal.SIGABRT, signal.SIGBUS):
            from_progress("memory", f"child died with {name}, taken as running out of its {t.get('memory_mb')} MiB")
        else:
            out["message"] = f"child died with {name}"
    else:
        out["message"] = f"child exited with code {code} without reporting"
    return out


def reset_cancel() -> None:
    """Allow :func:`execute_task` to start children again after :func:`cancel_all`."""
    _STOPPING.clear()


def cancel_all() -> int:
    """Kill every child process started by :func:`execute_task` in this process; return how many.

    Until :func:`reset_cancel` is called, tasks that have not started their
    child yet end at once as 'error' ("cancelled") and children that are
    starting are killed as soon as they exist.
    """
    _STOPPING.set()
    with _ACTIVE_LOCK:
        kills = list(_ACTIVE.values())
    for k in kills:
        try:
            k()
        except Exception:  # pragma: no cover
            pass
    return len(kills)


if __name__ == "__main__":  # pragma: no cover - exercised through subprocess
    _subprocess_main()

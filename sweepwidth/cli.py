"""The ``sweepwidth`` command line: a thin layer over the library.

Verbs
-----
``solve``    solve one or more files; a table, or one JSON object a line
``bench``    run instance sets into a results database (resumable)
``check``    replay a saved result's witness against its instance
``dual``     write (or describe) the dual of a plane graph
``convert``  convert between the file formats
``draw``     pictures of embeddings, duals and sweeps
``export``   results database to CSV or JSON lines
``demo``     the Larkspur Pavilion walk-through

Every failure prints one line ``sweepwidth: error: ...`` on standard error
and exits with status 1 (2 for a bad command line).  The library never
prints; everything shown here is formatted in this module.

Saved results
-------------
``solve --save DIR`` and ``solve -o FILE`` write one saved result per
solve, in the format of :mod:`sweepwidth.io.saved`.  ``check`` finds the instance (``--instance``, else ``instance_from_here``
relative to the result file, else the absolute path), refuses the result
when the digest does not match (the file was edited), when the instance's
content hash differs, or when the independent checker's replay of the
witness fails or does not attain the claimed upper bound;
``--recompute`` also solves again and compares the bounds.
"""

from __future__ import annotations

import argparse
import importlib
import json
import os
import sys
import time
from typing import Any, Callable, Sequence

from .registry import PARAMETERS, methods
from .tables import StreamTable, format_table as _format_table, number as _num_text

#: the parameters, from the registry (sweepwidth.solve.contract)
PARAMS = tuple(PARAMETERS)

__all__ = ["main", "build_parser"]

EXIT_FAIL = 1
EXIT_USAGE = 2

#: the --start example of the help (tests/test_cli_rows.py runs it on instances/grids/grid-03x03.json)
START_EXAMPLE = "'[[0,0],[0,1],[1,1],[1,0]]'"


class CliError(Exception):
    """A failure to report as one line and exit status 1."""


class _Parser(argparse.ArgumentParser):
    """An argument parser whose errors are one line, naming where to find help."""

    def error(self, message: str) -> None:  # type: ignore[override]
        sys.stderr.write(f"sweepwidth: error: {message} (see '{self.prog} --help')\n")
        raise SystemExit(EXIT_USAGE)


def _formatter(prog: str) -> argparse.HelpFormatter:
    return argparse.RawDescriptionHelpFormatter(prog, max_help_position=30)


# ------------------------------------------------------------------ helpers
#: library keyword -> the command-line flag that sets it (error messages speak in flags)
_FLAGS = {
    "time_limit": "--time-limit",
    "max_memory": "--memory",
    "method": "--method",
    "seed": "--seed",
    "first": "--first",
    "last": "--last",
    "start": "--start",
    "end": "--end",
    "holes": "--holes",
    "spikes": "--no-spikes",
    "simple": "--simple",
    "monotone": "--monotone",
    "solver": "--sat-solver",
}


def _cli_message(text: str) -> str:
    """A library message in command-line spelling: ``time_limit`` -> ``--time-limit``, ``method='sat'`` -> ``--method sat``.

    Examples
    --------
    >>> _cli_message("time_limit must be a number; raise max_memory or use method='bounds'")
    '--time-limit must be a number; raise --memory or use --method bounds'
    """
    import re

    def assign(m: "re.Match[str]") -> str:
        flag = _FLAGS[m.group(1)]
        value = m.group(2).strip("'\"")
        return f"{flag} {value}"

    names = "|".join(sorted(_FLAGS, key=len, reverse=True))
    text = re.sub(rf"\b({names})=('[^']*'|\"[^\"]*\"|[\w.+-]+)", assign, text)
    return re.sub(r"\b(time_limit|max_memory)\b", lambda m: _FLAGS[m.group(1)], text)


class _Default(float):
    """The value of an option not given on the command line (so that 'not given' can be told apart)."""


_DEFAULT = _Default(0.0)

#: options of ``solve``/``bench`` that only some parameters use: flag -> (attribute, the parameters it applies to)
_APPLIES = {
    "--first": ("first", ("cutwidth",)),
    "--last": ("last", ("cutwidth",)),
    "--unit": ("unit", ("cutwidth",)),
    "--sat-solver": ("sat_solver", ("cutwidth",)),
    "--holes": ("holes", ("homology", "homotopy")),
    "--start": ("start", ("homology", "homotopy")),
    "--end": ("end", ("homology", "homotopy")),
    "--ends": ("ends", ("homotopy",)),
    "--no-spikes": ("no_spikes", ("homotopy",)),
    "--simple": ("simple", ("homotopy",)),
    "--monotone": ("monotone", ("homology", "homotopy")),
    "--length": ("length", ("homotopy",)),
}


def _check_applicable(args: argparse.Namespace, params: Sequence[str]) -> None:
    """CliError when an option given on the command line applies to none of the parameters asked for."""
    for flag, (attr, applies) in _APPLIES.items():
        if getattr(args, attr, None) and not any(p in applies for p in params):
            raise CliError(
                f"{flag} does not apply to {', '.join(params)} (it is an option of {' and '.join(applies)})"
            )


def _split(values: Sequence[str] | None, default: Sequence[str]) -> list[str]:
    """Repeatable options that also take comma lists: ``--param a,b --param c``."""
    if not values:
        return list(default)
    out: list[str] = []
    for v in values:
        out += [x.strip() for x in str(v).split(",") if x.strip()]
    return out


def _params(values: Sequence[str] | None, default: Sequence[str] = ("cutwidth",)) -> list[str]:
    ps = _split(values, default)
    for p in ps:
        if p not in PARAMS:
            raise CliError(f"unknown parameter {p!r}; valid: {', '.join(PARAMS)}")
    return ps


def _label(text: str, obj: Any) -> Any:
    """A vertex label typed on the command line, matched against the graph's vertices."""
    nodes = list(obj.vertices) if hasattr(obj, "vertices") and not callable(obj.vertices) else list(obj.nodes())
    cands: list[Any] = []
    try:
        parsed = json.loads(text)
        cands.append(tuple(parsed) if isinstance(parsed, list) else parsed)
    except json.JSONDecodeError:
        pass
    cands.append(text)
    for c in cands:
        try:
            if c in nodes:
                return c
        except TypeError:
            continue
    for v in nodes:
        if str(v) == text:
            return v
    raise CliError(f"{text!r} is not a vertex of the graph")


def _face_ids(text: str | None) -> list[int] | None:
    if text is None:
        return None
    out = []
    for x in text.split(","):
        x = x.strip()
        if not x:
            continue
        try:
            out.append(int(x))
        except ValueError:
            raise CliError(f"--holes takes face ids separated by commas, got {x!r}") from None
    return out


def _num(x: Any) -> str:
    return _num_text(x)


def _table(rows: list[list[str]], headers: list[str]) -> str:
    return _format_table(rows, headers)


def _vertices_arg(values: Sequence[str], obj: Any, flag: str) -> list[Any]:
    """Vertices given to ``--first``/``--last``: a vertex (a name or JSON such as ``[0,0]``), a JSON list of vertices, or a comma list."""
    out: list[Any] = []
    for text in values:
        try:
            out.append(_label(text, obj))
            continue
        except CliError:
            pass
        try:
            parsed = json.loads(text)
        except json.JSONDecodeError:
            parsed = None
        if isinstance(parsed, list):
            out += [_label(json.dumps(x) if not isinstance(x, str) else x, obj) for x in parsed]
            continue
        parts = [x.strip() for x in text.split(",") if x.strip()]
        if len(parts) < 2:
            raise CliError(f"{flag}: {text!r} is not a vertex of the graph")
        out += [_label(x, obj) for x in parts]
    return out


def _load(path: str) -> Any:
    from .bench.loading import load_instance

    return load_instance(path)


def _curve_arg(text: str, obj: Any, what: str) -> Any:
    """A curve typed on the command line (JSON), with vertex labels matched against the graph.

    Accepted: a vertex list ``[a, b, c]``, ``{"vertices": [...]}``,
    ``{"vertex": v, "darts": [...]}`` (a point when ``darts`` is empty),
    ``{"darts": [...]}`` or, for homology, ``{"edges": [...]}``.
    """
    try:
        spec = json.loads(text)
    except json.JSONDecodeError as err:
        raise CliError(f"--{what} takes a curve in JSON (e.g. {START_EXAMPLE} or '{{\"vertex\": 0, \"darts\": []}}'): {err.msg}") from None

    def lab(x: Any) -> Any:
        return _label(json.dumps(x) if not isinstance(x, str) else x, obj)

    if isinstance(spec, list):
        return [lab(v) for v in spec]
    if isinstance(spec, dict):
        out = dict(spec)
        if "vertices" in out:
            out["vertices"] = [lab(v) for v in out["vertices"]]
        if "vertex" in out:
            out["vertex"] = lab(out["vertex"])
        return out
    raise CliError(f"--{what} takes a JSON list of vertices or a JSON object, got {text!r}")


def _solver_options(args: argparse.Namespace, parameter: str, obj: Any) -> dict:
    """Options given on the command line for ``parameter`` (only those that apply)."""
    opts: dict[str, Any] = {}
    if parameter == "cutwidth":
        if getattr(args, "first", None):
            opts["first"] = _vertices_arg(args.first, obj, "--first")
        if getattr(args, "last", None):
            opts["last"] = _vertices_arg(args.last, obj, "--last")
        if getattr(args, "unit", False):
            opts["weight"] = None
        if getattr(args, "sat_solver", None):
            opts["solver"] = args.sat_solver
    else:
        holes = _face_ids(getattr(args, "holes", None))
        if holes is not None:
            opts["holes"] = holes
        for name in ("start", "end"):
            text = getattr(args, name, None)
            if text:
                opts[name] = _curve_arg(text, obj, name)
    if parameter == "homotopy":
        if getattr(args, "no_spikes", False):
            opts["spikes"] = False
        if getattr(args, "simple", False):
            opts["simple"] = True
        if getattr(args, "monotone", False):
            opts["monotone"] = True
        if getattr(args, "length", None):
            opts["weight"] = args.length  # the solvers' one weight keyword
        if getattr(args, "ends", None):
            try:
                pair = json.loads("[" + args.ends + "]")
                parts = [json.dumps(x) if not isinstance(x, str) else x for x in pair]
            except json.JSONDecodeError:
                parts = [x.strip() for x in args.ends.split(",") if x.strip()]
            if len(parts) != 2:
                raise CliError(f"--ends takes two vertices S,T, got {args.ends!r}")
            opts["s"], opts["t"] = (_label(x, obj) for x in parts)
    mem = getattr(args, "memory", None) if getattr(args, "verb", None) == "solve" else None
    if mem and "max_memory" in PARAMETERS[parameter].options:
        from .registry import get_method

        if parameter != "cutwidth" or "max_memory" in get_method(parameter, args.method).options:
            opts["max_memory"] = int(mem) * 2**20
    if parameter == "width":
        opts.update(_width_options(args, obj))
    return opts


def _curve_pair(text: str, obj: Any, what: str, names: tuple[str, str]) -> dict:
    """``--walks``/``--leashes``: two curve names of the instance file, or a JSON list of two walks.

    Names stay names (the loader looks them up in the file's ``curves``, so
    ``bench`` can pass them to every instance); JSON walks get their vertex
    labels matched against the graph.
    """
    text = text.strip()
    if text.startswith("["):
        try:
            pair = json.loads(text)
        except json.JSONDecodeError as err:
            raise CliError(f"--{what} takes two curve names N,M or a JSON list of two walks: {err.msg}") from None
        if not isinstance(pair, list) or len(pair) != 2:
            raise CliError(f"--{what} takes a JSON list of exactly two walks, got {text!r}")
        if obj is None:
            raise CliError(f"--{what} with JSON walks needs one instance at a time (use curve names for a set)")
        return {n: _curve_arg(json.dumps(w), obj, what) for n, w in zip(names, pair)}
    parts = [x.strip() for x in text.split(",")]
    if len(parts) != 2 or not all(parts):
        raise CliError(f"--{what} takes two curve names N,M (stored under 'curves' in the instance file), got {text!r}")
    return dict(zip(names, parts))


def _width_options(args: argparse.Namespace, obj: Any) -> dict:
    """The options of ``--param width``: walks, leashes, backward steps and the shared flags."""
    opts: dict[str, Any] = {}
    if getattr(args, "walks", None):
        opts.update(_curve_pair(args.walks, obj, "walks", ("a", "b")))
    if getattr(args, "leashes", None):
        opts.update(_curve_pair(args.leashes, obj, "leashes", ("start", "end")))
    if getattr(args, "backward", False):
        opts["backward"] = True
    if getattr(args, "no_spikes", False):
        opts["spikes"] = False
    if getattr(args, "simple", False):
        opts["simple"] = True
    if getattr(args, "unit", False):
        opts["weight"] = None
    if getattr(args, "length", None):
        opts["weight"] = args.length
    return opts


def _write_saved(doc: dict, target: str, instance: str) -> None:
    from .io.saved import write_saved

    try:
        write_saved(doc, target, instance)
    except OSError as err:
        raise CliError(f"{target}: cannot be written: {err.strerror}") from err


def _same_file(a: str, b: str) -> bool:
    """True when paths ``a`` and ``b`` name one file (resolved paths, or the same inode)."""
    try:
        if os.path.exists(a) and os.path.exists(b):
            return os.path.samefile(a, b)
    except OSError:
        pass
    return os.path.realpath(a) == os.path.realpath(b)


def _refuse_overwrite(target: str, inputs: Sequence[str], what: str = "an input file") -> None:
    """CliError when writing ``target`` would overwrite one of ``inputs``."""
    for src in inputs:
        if _same_file(target, src):
            raise CliError(f"{target}: refusing to write over {what} ({src}); choose another output file")


def _save_names(files: Sequence[str]) -> dict[str, str]:
    """A distinct file-name stem per input for ``--save`` (files of the same name in other folders get their folder's name)."""
    real = {f: os.path.realpath(f) for f in files}
    by_stem: dict[str, set[str]] = {}
    for f in files:
        by_stem.setdefault(os.path.splitext(os.path.basename(f))[0], set()).add(real[f])
    names: dict[str, str] = {}
    used: dict[str, str] = {}  # stem -> real path that owns it
    for f in files:
        stem = os.path.splitext(os.path.basename(f))[0]
        if len(by_stem[stem]) > 1:
            folder = os.path.basename(os.path.dirname(real[f])) or "root"
            stem = f"{folder}-{stem}"
        base, k = stem, 2
        while used.get(stem, real[f]) != real[f]:
            stem, k = f"{base}-{k}", k + 1
        used[stem] = real[f]
        names[f] = stem
    return names


# -------------------------------------------------------------------- solve
#: seconds per solve when ``--time-limit`` is not given ('none' lifts it)
DEFAULT_TIME_LIMIT = 60.0
EXIT_INTERRUPTED = 130


def _time_limit(text: str) -> float | None:
    """``--time-limit``: seconds (a number > 0), or 'none' for no limit."""
    if text.strip().lower() in ("none", "inf", "infinity", "unlimited"):
        return None
    try:
        x = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"takes seconds (a number > 0) or 'none', got {text!r}") from None
    if not x > 0 or x != x:
        raise argparse.ArgumentTypeError(f"takes seconds (a number > 0) or 'none', got {text!r}")
    return x


def _mib(least: int) -> Callable[[str], int]:
    """``--memory``: a whole number of MiB above ``least``."""

    def parse(text: str) -> int:
        try:
            x = int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"takes a whole number of MiB, got {text!r}") from None
        if x <= least:
            raise argparse.ArgumentTypeError(f"takes a whole number of MiB {'>= 0' if least < 0 else '> 0'}, got {text!r}")
        return x

    return parse


class _Progress:
    """One line per finished solve on stderr: a tqdm bar on a terminal when tqdm is installed, else plain lines.

    Shown when stderr is a terminal or ``--progress`` is given; never with ``--quiet``.
    """

    def __init__(self, total: int, *, quiet: bool, forced: bool) -> None:
        self.total, self.done, self.bar = total, 0, None
        tty = sys.stderr.isatty()
        self.on = not quiet and (forced or tty)
        if self.on and tty:
            try:
                from tqdm import tqdm

                self.bar = tqdm(total=total, unit="solve", file=sys.stderr, leave=False)
            except ImportError:
                self.bar = None

    def wrap(self, out: Callable[[str], None]) -> Callable[[str], None]:
        """``out`` that does not break the bar."""
        bar = self.bar
        if bar is None:
            return out

        def write(line: str) -> None:
            with bar.external_write_mode():
                out(line)

        return write

    def finished(self, name: str, parameter: str, status: str, lower: Any, upper: Any, secs: float) -> None:
        self.done += 1
        if not self.on:
            return
        what = f"{name} {parameter} {status} [{_num(lower)}, {_num(upper)}] in {secs:.2f} s"
        if self.bar is not None:
            self.bar.update(1)
            self.bar.set_postfix_str(what)
        else:
            sys.stderr.write(f"[{self.done}/{self.total}] {what}\n")
            sys.stderr.flush()

    def close(self) -> None:
        if self.bar is not None:
            self.bar.close()


def _reason(err: BaseException) -> str:
    """One line for an error shown in a table row."""
    return _cli_message(" ".join(str(err).split("\n")[0].split()))


def _solve_rows_headers() -> list[str]:
    return ["instance", "parameter", "status", "value", "lower", "upper", "method", "seconds", "checked", "note"]


def cmd_solve(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.hashing import instance_hash
    from .bench.loading import check_object, is_plane, solve_object, solve_objects
    from .errors import SweepwidthError, WitnessError
    from .io.saved import saved_result

    params = _params(args.param)
    if args.output and (len(args.files) > 1 or len(params) > 1):
        raise CliError("-o/--output takes one file and one parameter; use --save DIR for several")
    if args.output:
        _refuse_overwrite(args.output, args.files, "an input instance")
    save_names = _save_names(args.files)
    if args.save:
        os.makedirs(args.save, exist_ok=True)
        for f in args.files:
            for p in params:
                _refuse_overwrite(os.path.join(args.save, f"{save_names[f]}.{p}.json"), args.files, "an input instance")
    _check_applicable(args, params)
    limit = DEFAULT_TIME_LIMIT if args.time_limit is _DEFAULT else args.time_limit
    progress = _Progress(len(args.files) * len(params), quiet=args.quiet, forced=args.progress)
    write = progress.wrap(out)
    headers = _solve_rows_headers()
    table = StreamTable(headers, write, widths={"instance": max(len(os.path.basename(f)) for f in args.files)})
    failures = 0

    def emit(path: str, p: str, status: str, res: Any = None, checked: str = "-", note: str = "", extra: dict | None = None) -> None:
        name = os.path.basename(path)
        if status == "error" or checked == "REFUSED":
            where = "" if note.startswith(path) else f"{path}: "
            sys.stderr.write(f"sweepwidth: error: {where}{p}: {note}\n")
        if args.json:
            line: dict[str, Any] = {"instance": path}
            if extra:
                line.update(extra)
            if res is not None:
                line.update(res.to_dict())
            else:
                line.update({"parameter": p, "status": status})
            if note:
                line["note"] = note
            write(json.dumps(line))
        else:
            if res is None:
                table.row([name, p, status, None, None, None, None, None, checked, note])
            else:
                table.row([name, p, status, res.value, res.lower, res.upper, res.method or "-", res.seconds, checked, note])

    current: tuple[str, str, Any, dict] | None = None
    t_task = time.monotonic()
    try:
        for path in args.files:
            try:
                obj = _load(path)
                h = instance_hash(path, obj=None if path.lower().endswith(".json") else obj)
            except (SweepwidthError, OSError) as err:
                for p in params:
                    failures += 1
                    emit(path, p, "error", note=_reason(err))
                    progress.finished(os.path.basename(path), p, "error", None, None, 0.0)
                continue
            paired = {"homology", "homotopy"} if {"homology", "homotopy"} <= set(params) else set()
            joint: dict[str, Any] = {}
            for p in params:
                t_task = time.monotonic()
                try:
                    if PARAMETERS[p].problem == "plane" and not is_plane(obj):
                        raise CliError(f"{p} needs a plane graph, but the file holds a graph without an embedding")
                    opts = _solver_options(args, p, obj)
                    current = (path, p, obj, opts)
                    if p in paired:
                        # homology and homotopy together share bounds and witnesses (sweepwidth.solve_parameters)
                        if p not in joint:
                            pair = [q for q in params if q in paired]
                            joint.update(solve_objects(obj, pair, method=args.method, time_limit=limit, seed=args.seed,
                                                       options={q: _solver_options(args, q, obj) for q in pair}))
                        res = joint[p]
                    else:
                        res = solve_object(obj, p, method=args.method, time_limit=limit, seed=args.seed, options=opts)
                    current = None
                except (SweepwidthError, CliError) as err:
                    current = None
                    if isinstance(err, SweepwidthError) and _is_usage_error(err):
                        raise
                    failures += 1
                    emit(path, p, "error", note=_reason(err))
                    progress.finished(os.path.basename(path), p, "error", None, None, time.monotonic() - t_task)
                    continue
                checked_value: float | None = None
                checked = "-"
                note = _result_note(res)
                if not args.no_check and res.witness is not None:
                    try:
                        checked_value = check_object(res, obj)
                        checked = "yes"
                    except WitnessError as err:
                        failures += 1
                        checked = "REFUSED"
                        note = f"witness refused: {_reason(err)}"
                saved = saved_result(path, h, res, opts)
                targets = []
                if args.save:
                    targets.append(os.path.join(args.save, f"{save_names[path]}.{p}.json"))
                if args.output:
                    targets.append(args.output)
                for target in targets:
                    _write_saved(saved, target, path)
                emit(path, p, res.status, res, checked, note, {"instance_hash": h, "checked": checked_value} if args.json else None)
                progress.finished(os.path.basename(path), p, res.status, res.lower, res.upper, res.seconds)
    except (KeyboardInterrupt, SystemError) as stop:
        if not _from_interrupt(stop):
            raise
        if current is not None:
            path, p, obj, opts = current
            spent = time.monotonic() - t_task
            quick = None
            try:
                quick = solve_object(obj, p, method="auto", time_limit=1.0, seed=args.seed, options=opts)
            except (SweepwidthError, KeyboardInterrupt):
                quick = None
            if quick is not None:
                note = f"interrupted after {spent:.2f} s; bounds from a 1 s re-solve"
                if args.json:
                    write(json.dumps({"instance": path, **quick.to_dict(), "status": "interrupted", "note": note}))
                else:
                    table.row([os.path.basename(path), p, "interrupted", None, quick.lower, quick.upper, quick.method, spent, "-", note])
            else:
                emit(path, p, "interrupted", note=f"interrupted after {spent:.2f} s; no bounds")
        progress.close()
        sys.stderr.write(f"sweepwidth: interrupted: {progress.done} of {progress.total} solve(s) finished (rows above)\n")
        return EXIT_INTERRUPTED
    progress.close()
    if not args.json:
        table.header()
    return EXIT_FAIL if failures else 0


def _from_interrupt(err: BaseException) -> bool:
    """Whether ``err`` is Ctrl-C, or an error raised because Ctrl-C arrived in compiled code."""
    seen = 0
    e: BaseException | None = err
    while e is not None and seen < 10:
        if isinstance(e, KeyboardInterrupt):
            return True
        e = e.__cause__ or e.__context__
        seen += 1
    return False


def _result_note(res: Any) -> str:
    """Why a row is not optimal, in a few words (from the result's stats)."""
    stats = res.stats or {}
    if res.status == "infeasible":
        why = stats.get("reason") or stats.get("infeasible") or stats.get("why")
        return f"infeasible: {why}" if why else "infeasible: no sweep satisfies the options"
    if res.status == "bounded":
        why = stats.get("stopped") or stats.get("reason")
        return str(why) if isinstance(why, str) else ""
    return ""


def _is_usage_error(err: BaseException) -> bool:
    """Errors about the command line itself (an unknown method, a bad option), not about one file."""
    from .errors import InvalidArgumentError, UnsupportedOptionError

    return isinstance(err, (UnsupportedOptionError, InvalidArgumentError))


# -------------------------------------------------------------------- check
def _find_instance(saved: dict, result_path: str, override: str | None) -> str:
    if override:
        return override
    from .io.saved import instance_candidates

    p = (saved.get("instance") or {}).get("path")
    if not p:
        raise CliError(f"{result_path}: the saved result names no instance; give one with --instance")
    for c in instance_candidates(saved, result_path):
        if os.path.exists(c):
            return c
    raise CliError(f"{result_path}: its instance {p} is not there; give it with --instance")


def cmd_check(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    """Replay each saved result; say what was verified and what remains the solver's claim."""
    from .bench.hashing import instance_hash
    from .bench.loading import check_object, solve_object
    from .errors import FileFormatError, SweepwidthError, WitnessError
    from .io.saved import digest_matches, read_saved, validated_result

    bad = 0
    limit = DEFAULT_TIME_LIMIT if args.time_limit is _DEFAULT else args.time_limit
    for rpath in args.results:

        def refuse(why: str) -> None:
            nonlocal bad
            bad += 1
            out(f"{rpath}: REFUSED: {why}")

        saved = read_saved(rpath)
        if not digest_matches(saved):
            refuse("the file was edited after it was saved (its digest does not match its content)")
            continue
        try:
            res = validated_result(saved)
        except FileFormatError as err:
            refuse(f"malformed result: {err.reason}")
            continue
        ipath = _find_instance(saved, rpath, args.instance)
        obj = _load(ipath)
        h = instance_hash(ipath, obj=None if ipath.lower().endswith(".json") else obj)
        if h != (saved.get("instance") or {}).get("hash"):
            refuse(f"the instance {ipath} is not the one the result was computed on (content hash differs)")
            continue
        param = PARAMETERS[res.parameter]
        measure = param.measure
        width: float | None = None
        if res.status == "infeasible" or res.witness is None:
            out(f"{rpath}: {res.parameter} {res.status}: no witness to replay; the status is the solver's claim")
        else:
            try:
                width = check_object(res, obj)
            except WitnessError as err:
                refuse(_reason(err))
                continue
            except (SweepwidthError, TypeError, ValueError, KeyError, IndexError) as err:
                refuse(f"the witness is not a {param.title} witness of this instance ({_reason(err)})")
                continue
            if res.lower is not None and width < res.lower - 1e-9 * max(1.0, abs(res.lower)):
                refuse(
                    f"the witness replays with {measure} {_num(width)}, below the claimed lower bound {_num(res.lower)}:"
                    " the lower bound is false"
                )
                continue
            out(
                f"{rpath}: verified: the {res.parameter} witness replays on {os.path.basename(ipath)} with {measure}"
                f" {_num(width)}, so the upper bound {_num(res.upper)} holds"
            )
            if not args.recompute:
                claim = f"the lower bound {_num(res.lower)}"
                if res.status == "optimal":
                    claim += " and 'optimal'"
                out(f"{rpath}: not verified: {claim} are the solver's claim (--recompute re-derives them)"
                    if res.status == "optimal" else f"{rpath}: not verified: {claim} is the solver's claim (--recompute re-derives it)")
        if args.recompute:
            opts = dict(saved.get("options") or {})
            try:
                again = solve_object(obj, res.parameter, method=args.method, time_limit=limit, options=opts)
            except SweepwidthError as err:
                out(f"{rpath}: could not recompute: {_reason(err)}")
                continue
            proven_up = again.upper
            if again.witness is not None:
                try:
                    proven_up = check_object(again, obj)
                except WitnessError:
                    proven_up = None  # not trusted: only the recomputed lower bound is used
            took = f"method {again.method}, {again.seconds:.2f} s"
            lo, up = res.lower, res.upper
            if lo is not None and proven_up is not None and proven_up < lo - 1e-9 * max(1.0, abs(lo)):
                refuse(
                    f"recomputing ({took}) finds a witness of {measure} {_num(proven_up)}, below the claimed"
                    f" {'optimal value' if res.status == 'optimal' else 'lower bound'} {_num(lo)}"
                )
                continue
            if up is not None and again.lower is not None and again.lower > up + 1e-9 * max(1.0, abs(up)):
                refuse(f"recomputing ({took}) proves {res.parameter} >= {_num(again.lower)}, above the saved upper bound {_num(up)}")
                continue
            if again.status == "infeasible" or res.status == "infeasible":
                if again.status == res.status:
                    out(f"{rpath}: re-derived: infeasible again ({took})")
                else:
                    refuse(f"recomputing ({took}) gives {again.status}, the saved result says {res.status}")
                continue
            if lo is not None and again.lower is not None and again.lower >= lo - 1e-9 * max(1.0, abs(lo)):
                what = "optimal value" if res.status == "optimal" else "lower bound"
                out(f"{rpath}: re-derived: the {what} {_num(lo)} is confirmed (recomputed [{_num(again.lower)}, {_num(again.upper)}], {took})")
            else:
                out(
                    f"{rpath}: could not re-derive the lower bound {_num(lo)}: the recomputation ({took}) proves only"
                    f" [{_num(again.lower)}, {_num(again.upper)}]; it remains the solver's claim (raise --time-limit)"
                )
    return EXIT_FAIL if bad else 0


# -------------------------------------------------------------------- bench
def cmd_bench(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench import discover, format_table, make_tasks, run_tasks, summarize

    params = _params(args.param)
    methods = _split(args.method, ["auto"])
    seeds: list[int | None] = [None]
    if args.seed:
        try:
            seeds = [int(s) for s in _split(args.seed, [])]
        except ValueError:
            raise CliError("--seed takes integers (a comma list for several seeds)") from None
    if args.jobs < 1:
        raise CliError(f"--jobs must be at least 1, got {args.jobs}")
    if args.time_limit is None:
        raise CliError("bench needs --time-limit (seconds per task)")
    opts: dict[str, Any] = {}
    if args.sat_solver:
        opts["solver"] = args.sat_solver
    if args.unit:
        opts["weight"] = None
    if args.holes:
        opts["holes"] = _face_ids(args.holes)
    if args.no_spikes:
        opts["spikes"] = False
    if args.simple:
        opts["simple"] = True
    if args.monotone:
        opts["monotone"] = True
    if args.length:
        opts["length"] = args.length
    if "width" in params:
        opts.update({k: v for k, v in _width_options(args, None).items() if k != "weight"})
    entries = discover(args.paths, sets=_split(args.sets, []) or None)
    if not entries:
        raise CliError("no instances found under " + ", ".join(args.paths))
    skipped: list = []
    tasks = make_tasks(
        entries,
        params,
        methods,
        options=opts,
        seeds=seeds,
        time_limit=args.time_limit,
        memory_mb=args.memory or None,
        grace=args.grace,
        solver=args.solver,
        skipped=skipped,
    )
    for name, p, why in skipped:
        sys.stderr.write(f"skipped {name} for {p}: {why}\n")
    if not tasks and skipped:
        raise CliError(f"no task left to run: {len(skipped)} instance/parameter pair(s) skipped (reasons above)")
    bar = None
    if sys.stderr.isatty() and not args.quiet:
        try:
            from tqdm import tqdm

            bar = tqdm(total=len(tasks), unit="task", file=sys.stderr, leave=False)
        except ImportError:
            bar = None

    def on_row(row: dict) -> None:
        if bar is not None:
            bar.update(1)
            bar.set_postfix_str(f"{row.get('name')} {row.get('parameter')} {row.get('status')}")

    try:
        report = run_tasks(tasks, args.db, jobs=args.jobs, executor=args.executor, resume=args.resume, on_row=on_row)
    finally:
        if bar is not None:
            bar.close()
    if args.resume and report.skipped:
        out(f"resumed: {report.skipped} of {report.total} task(s) already in {args.db}")
    if report.interrupted:
        out(f"interrupted: {report.finished} task(s) recorded in {args.db}; run again with --resume to continue")
    if not args.quiet and report.rows:
        lines = []
        for r in sorted(report.rows, key=lambda r: (r["name"] or "", r["parameter"], r["method"])):
            lines.append(
                [
                    str(r["name"]),
                    r["parameter"],
                    r["status"],
                    r.get("value"),
                    r["lower"],
                    r["upper"],
                    r.get("result_method") or r["method"],  # what ran (auto:NAME), not only what was asked
                    r.get("seconds"),
                    r.get("verdict") or "",
                    (r.get("message") or "")[:60],
                ]
            )
        out(_table(lines, ["instance", "parameter", "status", "value", "lower", "upper", "method", "seconds", "known", "note"]))
        out("")
    summary = summarize(report.rows)
    if summary:
        out(
            format_table(
                summary,
                ["parameter", "method", "tasks", "solved", "bounded", "failed", "contradicted", "median_s"],
                ["parameter", "method", "tasks", "solved", "bounded", "failed", "contradict known", "median seconds"],
            )
        )
    out(f"{report.finished} task(s) run, {report.skipped} skipped, in {report.seconds:.1f} s; results in {args.db}")
    conflicts = sum(s["contradicted"] for s in summary)
    if conflicts:
        out(f"warning: {conflicts} result(s) contradict a known value in the manifest")
    return EXIT_FAIL if (conflicts or report.interrupted) else 0


# ------------------------------------------------------------------- export
def cmd_export(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.db import ResultsDB

    if not os.path.exists(args.db):
        raise CliError(f"{args.db}: no such results database")
    where = {}
    if args.param:
        where["parameter"] = args.param
    fmt = args.format
    if fmt is None:
        fmt = "jsonl" if args.output and args.output.endswith((".jsonl", ".ndjson")) else "csv"
    if args.output:
        _refuse_overwrite(args.output, [args.db], "the results database")
    with ResultsDB(args.db) as db:
        if args.output:
            try:
                with open(args.output, "w", encoding="utf-8", newline="") as fh:
                    n = db.export(fh, fmt, **where)
            except OSError as err:
                raise CliError(f"{args.output}: cannot be written: {err.strerror}") from err
            sys.stderr.write(f"{n} row(s) written to {args.output}\n")
        else:
            sys.stdout.write(db.export_text(fmt, **where))
    return 0


# --------------------------------------------------------------- dual, convert
def cmd_dual(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .bench.loading import is_plane

    obj = _load(args.file)
    if not is_plane(obj):
        raise CliError(f"{args.file}: the file holds a graph without an embedding; the dual needs a plane graph")
    D = obj.dual()
    if args.output:
        from .io import write

        _refuse_overwrite(args.output, [args.file])
        write(D, args.output)
        out(f"dual written to {args.output}: {D.number_of_vertices()} vertices, {D.number_of_edges()} edges, {D.number_of_faces()} faces")
    else:
        out(
            f"{args.file}: {obj.number_of_vertices()} vertices, {obj.number_of_edges()} edges, {obj.number_of_faces()} faces"
            f" (outer face {obj.outer_face})"
        )
        out(
            f"dual: {D.number_of_vertices()} vertices, {D.number_of_edges()} edges, {D.number_of_faces()} faces;"
            f" dual vertex of the outer face: {obj.outer_face}"
        )
        nbrs: dict[int, set] = {f: set() for f in range(D.number_of_vertices())}
        for e in range(D.number_of_edges()):
            a, b = D.edge_ends(e)
            nbrs[a].add(b)
            nbrs[b].add(a)
        shown = min(len(nbrs), 40)
        for f in range(shown):
            out(f"  face {f}: boundary length {_num(obj.face_length(f))}, next to faces {sorted(nbrs[f])}")
        if shown < len(nbrs):
            out(f"  ... {len(nbrs) - shown} more faces (write the dual with -o to see all)")
    return 0


def _target_format(path: str, given: str | None) -> str | None:
    from .io import FORMATS

    if given:
        return given
    name = path.lower()
    for fmt, exts in FORMATS.items():
        if any(name.endswith(x) for x in exts):
            return fmt
    return None


def cmd_convert(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .io import DOCUMENTARY, lost_in, read, write

    _refuse_overwrite(args.output, [args.input])
    obj = read(args.input, format=args.from_format) if args.from_format else read(args.input)
    fmt = _target_format(args.output, args.to_format)
    if fmt is not None:
        lost = lost_in(obj, fmt)
        if lost:
            what = f"the {fmt} format cannot hold these parts of {args.input}: {', '.join(lost)}"
            if not args.force and not all(x in DOCUMENTARY for x in lost):
                raise CliError(f"{args.output}: {what}; give --force to write it without them")
            sys.stderr.write(f"sweepwidth: warning: {args.output}: {what}; written without them\n")
    if args.to_format:
        write(obj, args.output, format=args.to_format)
    else:
        write(obj, args.output)
    kind = "plane graph" if hasattr(obj, "outer_face") else "graph"
    out(f"{args.input} -> {args.output} ({kind})")
    return 0


# --------------------------------------------------------------------- draw
def cmd_draw(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    # the module itself: after ``sweepwidth.draw`` (the function of the top-level facade) has been looked up,
    # ``import sweepwidth.draw as m`` gives that function, not the package (regression: test_api then draw)
    drawing = importlib.import_module("sweepwidth.draw")
    try:
        render = drawing.render_cli
    except ImportError as err:  # say what failed to import (e.g. matplotlib: the 'plot' extra), never hide it
        raise CliError(f"drawing needs the 'plot' extra: {err}") from err
    if args.result and not os.path.exists(args.result):
        raise CliError(f"{args.result}: no such result file")
    if not os.path.exists(args.file):
        raise CliError(f"{args.file}: no such file")
    if args.frames is not None and not (args.param or args.result):
        raise CliError("--frames does not apply without a sweep: give --param or --result")
    if args.time_limit is not _DEFAULT and not args.param:
        raise CliError("--time-limit does not apply without --param (it limits the solve behind the picture)")
    if args.time_limit is not _DEFAULT and args.result:
        raise CliError("--time-limit does not apply with --result (the saved witness is drawn, nothing is solved)")
    limit = 10.0 if args.time_limit is _DEFAULT else args.time_limit
    given = [flag for flag, attr in (("--walks", "walks"), ("--leashes", "leashes"), ("--backward", "backward"))
             if getattr(args, attr, None)]
    options: dict = {}
    if given:
        if args.result:
            raise CliError(f"{given[0]} does not apply with --result (the saved result records its walks and leashes)")
        if args.param != "width":
            raise CliError(f"{given[0]} applies to --param width only")
        json_walks = any((getattr(args, a, None) or "").strip().startswith("[") for a in ("walks", "leashes"))
        options = _width_options(args, _load(args.file) if json_walks else None)
    written = render(args.file, param=args.param, result=args.result, out=args.output, dual=args.dual, frames=args.frames,
                     time_limit=limit, **({"options": options} if options else {}))
    out(f"picture written to {written or args.output}")
    return 0


# --------------------------------------------------------------------- demo
def cmd_demo(args: argparse.Namespace, out: Callable[[str], None]) -> int:
    from .demo import DISCLAIMER, run_demo

    out("sweepwidth demo: the Larkspur Pavilion (a fictional venue) and a few small plane graphs")
    out(DISCLAIMER)
    out("")
    t0 = time.monotonic()
    current = None
    rows: list[list[str]] = []
    headers = _solve_rows_headers()
    for ev in run_demo(args.out, time_limit=args.time_limit, pictures=not args.no_pictures):
        kind = ev["kind"]
        if kind == "instance":
            if rows:
                out(_table(rows, headers))
                out("")
                rows = []
            current = ev["name"]
            out(f"== {ev['name']}: {ev['description']}")
        elif kind == "result":
            res = ev["result"]
            rows.append(
                [
                    current or "",
                    res.parameter,
                    res.status,
                    res.value,
                    res.lower,
                    res.upper,
                    res.method or "-",
                    res.seconds,
                    ev["checked"],
                    ev["label"].partition("(")[2].rstrip(")") if "(" in ev["label"] else "",  # e.g. 'plan graph' 
                ]
            )
        elif kind == "note":
            if rows:
                out(_table(rows, headers))
                rows = []
            out(ev["text"])
    if rows:
        out(_table(rows, headers))
    out("")
    out(f"demo finished in {time.monotonic() - t0:.1f} s")
    return 0


# ------------------------------------------------------------------- parser
def _add_solver_options(p: argparse.ArgumentParser, *, per_instance: bool = True) -> None:
    """Parameter options; those naming vertices or curves only where there is one instance at a time."""
    g = p.add_argument_group("parameter options")
    if per_instance:
        g.add_argument("--first", action="append", metavar="V", help="cutwidth: vertex (or comma list) placed first")
        g.add_argument("--last", action="append", metavar="V", help="cutwidth: vertex (or comma list) placed last")
    g.add_argument("--unit", action="store_true", help="cutwidth: ignore edge weights (every edge counts 1)")
    g.add_argument("--sat-solver", metavar="NAME", help="cutwidth: python-sat solver for the SAT method (e.g. cadical195, glucose4)")
    g.add_argument("--holes", metavar="F,F", help="homology/homotopy: face ids that may not be swept (default: the outer face)")
    if per_instance:
        g.add_argument("--start", metavar="CURVE", help="homology/homotopy: start curve in JSON: a closed vertex walk, e.g. " + START_EXAMPLE
                       + " (a square of a grid), or {\"vertex\": V, \"darts\": [...]} (default: the outer boundary)")
        g.add_argument("--end", metavar="CURVE", help="homology/homotopy: end curve in JSON (default: empty / a point)")
        g.add_argument("--ends", metavar="S,T", help="homotopy: sweep walks from S to T (the outer boundary one way to the other)")
    g.add_argument("--no-spikes", action="store_true", help="homotopy: forbid spikes and unspikes")
    g.add_argument("--simple", action="store_true", help="homotopy: every intermediate curve must be simple")
    g.add_argument("--monotone", action="store_true", help="homotopy: flip each face at most once")
    g.add_argument("--length", choices=["weight", "vertices"], help="homotopy/width: how curves are measured (default weight)")
    g.add_argument("--walks", metavar="A,B", help="width: the two walks, as names of curves stored in the instance file "
                   "(default a,b) or a JSON list of two vertex lists")
    g.add_argument("--leashes", metavar="START,END", help="width: the start and end leashes, as curve names or a JSON list "
                   "of two walks (default: the file's start,end, else the boundary arcs between the walks)")
    g.add_argument("--backward", action="store_true", help="width: let the leash ends step back along the walks too")


def _param_list() -> str:
    names = list(PARAMETERS)
    return ", ".join(names[:-1]) + " or " + names[-1] if len(names) > 1 else names[0]


def _method_list() -> str:
    """The registered methods per parameter, for ``--help`` (read when the parser is built)."""
    return "; ".join(f"{p}: {', '.join(methods(p))}" for p in PARAMETERS)


def build_parser() -> argparse.ArgumentParser:
    """The argument parser of the ``sweepwidth`` command, one subparser per verb.

    Returns
    -------
    argparse.ArgumentParser
        Its errors print one line ``sweepwidth: error: ...`` and exit with status 2.

    Examples
    --------
    >>> args = build_parser().parse_args(["solve", "g.json", "--param", "homology", "--time-limit", "5"])
    >>> args.verb, args.param, args.time_limit
    ('solve', ['homology'], 5.0)
    """
    from . import __version__

    top = _Parser(
        prog="sweepwidth",
        formatter_class=_formatter,
        description="Exact and bounded sweep parameters of plane graphs: cutwidth, homology sweep width, homotopy height.",
        epilog="examples:\n  sweepwidth solve instances/grids/grid-03x04.json --param cutwidth --time-limit 30\n"
        "  sweepwidth demo\n\nrun 'sweepwidth VERB --help' for each verb's options.",
    )
    top.add_argument("--version", action="version", version=f"sweepwidth {__version__}")
    sub = top.add_subparsers(dest="verb", metavar="VERB", parser_class=_Parser)

    def verb(name: str, help: str, example: str) -> argparse.ArgumentParser:
        return sub.add_parser(name, help=help, description=help, formatter_class=_formatter, epilog="example:\n  " + example)

    common_limit: dict[str, Any] = {"type": float, "metavar": "SECONDS"}

    s = sub.add_parser(
        "solve",
        help="solve one or more instance files",
        description="Solve one or more instance files; rows are printed as the solves finish.",
        formatter_class=_formatter,
        epilog="example:\n  sweepwidth solve instances/platonic/cube.json instances/demo/pavilion.json --param homology,homotopy"
        " --time-limit 20 --save results/\n\n"
        f"time limit: {DEFAULT_TIME_LIMIT:g} s per solve unless --time-limit says otherwise ('--time-limit none': no limit).\n"
        "progress: one line per finished solve on stderr when it is a terminal (a tqdm bar if tqdm is installed);\n"
        "  --progress prints plain lines even when stderr is not a terminal, --quiet prints none.\n"
        "exit status: 0 every solve finished and its witness replayed; 1 a file could not be read or solved\n"
        "  (its row says why) or a witness was refused; 2 a bad command line; 130 interrupted (Ctrl-C: the\n"
        "  finished rows are kept and the solve in progress gets the bounds of a 1 s re-solve).",
    )
    s.add_argument("files", nargs="+", metavar="FILE")
    s.add_argument("--param", action="append", metavar="P", help=f"{_param_list()} (repeat or comma list; default cutwidth)")
    s.add_argument("--method", default="auto", help="solver method (default auto): " + _method_list())
    s.add_argument(
        "--time-limit", type=_time_limit, default=_DEFAULT, metavar="SECONDS",
        help=f"seconds per solve, or 'none' (default {DEFAULT_TIME_LIMIT:g}; a bounded answer when it runs out)",
    )
    s.add_argument("--memory", type=_mib(0), metavar="MIB", help="memory for the tables of exponential methods (default: each method's own, 1024)")
    s.add_argument("--seed", type=int, help="seed for randomised heuristics")
    s.add_argument("--json", action="store_true", help="one JSON object a line instead of a table")
    s.add_argument("--save", metavar="DIR", help="save each result (with the instance's hash and path) into DIR")
    s.add_argument("-o", "--output", metavar="RESULT.json", help="save the single result to this file")
    s.add_argument("--no-check", action="store_true", help="do not replay the witness with the independent checker")
    s.add_argument("--quiet", action="store_true", help="no progress lines")
    s.add_argument("--progress", action="store_true", help="progress lines on stderr even when it is not a terminal")
    _add_solver_options(s)

    b = verb(
        "bench",
        "run instance sets into a results database (pins and curves come per instance from a manifest's 'options' or the files)",
        "sweepwidth bench instances/ --sets platonic --param homology --jobs 2 --time-limit 30 --db runs.sqlite --resume",
    )
    b.add_argument("paths", nargs="+", metavar="PATH", help="instance files, folders, or manifest.json files")
    b.add_argument("--param", action="append", metavar="P", help="parameters (repeat or comma list; default cutwidth)")
    b.add_argument("--method", action="append", metavar="M", help="methods to compare (repeat or comma list; default auto): " + _method_list())
    b.add_argument("--time-limit", **common_limit, help="seconds per task (required)")
    b.add_argument("--memory", type=_mib(-1), default=3072, metavar="MIB", help="address-space limit per task (default 3072; 0 for none)")
    b.add_argument("--grace", type=float, default=5.0, metavar="SECONDS", help="extra seconds before a task's process is killed (default 5)")
    b.add_argument("--jobs", type=int, default=1, metavar="N", help="tasks at once on this machine (default 1)")
    b.add_argument("--executor", metavar="SPEC", help="'local' (default), 'dask://HOST:PORT' or 'dask-local'")
    b.add_argument("--db", default="sweepwidth-runs.sqlite", metavar="FILE", help="results database (default sweepwidth-runs.sqlite)")
    b.add_argument("--resume", action="store_true", help="skip tasks already in the database")
    b.add_argument("--seed", action="append", metavar="S", help="seeds (repeat or comma list); each seed is its own task")
    b.add_argument("--sets", action="append", metavar="NAME", help="only these manifest sets (repeat or comma list)")
    b.add_argument("--solver", metavar="MODULE:FUNCTION", help="benchmark your own solver function instead of the library's (see sweepwidth.bench.Task)")
    b.add_argument("--quiet", action="store_true", help="print only the summary")
    _add_solver_options(b, per_instance=False)

    c = sub.add_parser(
        "check",
        help="re-verify saved results against their instances",
        description="Re-verify saved results: the witness is replayed by the independent checker, which verifies the"
        " upper bound; the lower bound and 'optimal' are the solver's claim unless --recompute re-derives them.",
        formatter_class=_formatter,
        epilog="example:\n  sweepwidth solve instances/platonic/cube.json --param homology --save results/\n"
        "  sweepwidth check results/cube.homology.json --recompute --time-limit 10\n\n"
        "exit status: 0 nothing contradicts the saved result; 1 refused (edited, wrong instance, a witness that does\n"
        "  not replay, or bounds the recomputation contradicts). A lower bound that --recompute cannot re-derive in\n"
        "  its time limit is reported as such, not refused.",
    )
    c.add_argument("results", nargs="+", metavar="RESULT.json")
    c.add_argument("--instance", metavar="FILE", help="the instance file (default: the path saved in the result)")
    c.add_argument("--recompute", action="store_true", help="also solve again and re-derive the bounds")
    c.add_argument("--method", default="auto", help="method for --recompute (default auto): " + _method_list())
    c.add_argument("--time-limit", type=_time_limit, default=_DEFAULT, metavar="SECONDS",
                   help=f"seconds for --recompute, or 'none' (default {DEFAULT_TIME_LIMIT:g})")

    d = verb("dual", "write or describe the dual of a plane graph", "sweepwidth dual instances/platonic/cube.json -o octahedron.json")
    d.add_argument("file", metavar="FILE")
    d.add_argument("-o", "--output", metavar="OUT", help="write the dual here (format from the extension); else describe it")

    v = verb("convert", "convert between file formats (refuses to drop data unless --force)",
             "sweepwidth convert instances/platonic/cube.json cube.graphml")
    v.add_argument("input", metavar="IN")
    v.add_argument("output", metavar="OUT")
    v.add_argument("--from", dest="from_format", metavar="FORMAT", help="input format (default: from the extension or content)")
    v.add_argument("--to", dest="to_format", metavar="FORMAT", help="output format (default: from the extension)")
    v.add_argument("--force", action="store_true", help="write even when the output format cannot hold the embedding, weights, names,"
                   " positions, outer face, face names or edge data (a warning names what is lost; a graph's name,"
                   " provenance and known values only ever get the warning)")

    w = verb("draw", "draw a plane graph, its dual, or a sweep", "sweepwidth draw instances/demo/pavilion.json --param homotopy -o sweep.png")
    w.add_argument("file", metavar="FILE")
    w.add_argument("--param", choices=PARAMS, help="draw an optimal (or best found) sweep of this parameter")
    w.add_argument("--result", metavar="RESULT.json", help="draw the witness of a saved result")
    w.add_argument("-o", "--output", required=True, metavar="OUT", help="picture file: .png, .svg or .gif")
    w.add_argument("--dual", action="store_true", help="draw the dual graph too")
    w.add_argument("--frames", type=int, metavar="N", help="number of frames for an animated sweep (with --param or --result)")
    w.add_argument("--walks", metavar="A,B", help="width: the two walks, as names of curves stored in the instance file "
                   "(default a,b) or a JSON list of two vertex lists")
    w.add_argument("--leashes", metavar="START,END", help="width: the start and end leashes, as curve names or a JSON list "
                   "of two walks (default: the file's start,end, else the boundary arcs between the walks)")
    w.add_argument("--backward", action="store_true", help="width: let the leash ends step back along the walks too")
    w.add_argument("--time-limit", type=_time_limit, default=_DEFAULT, metavar="SECONDS",
                   help="seconds for the solve behind --param, or 'none' (default 10)")

    e = verb("export", "write a results database as CSV or JSON lines", "sweepwidth export --db runs.sqlite -o runs.csv")
    e.add_argument("--db", default="sweepwidth-runs.sqlite", metavar="FILE", help="results database")
    e.add_argument("--format", choices=["csv", "jsonl"], help="default csv (jsonl when OUT ends in .jsonl)")
    e.add_argument("-o", "--output", metavar="OUT", help="output file (default: standard output)")
    e.add_argument("--param", choices=PARAMS, help="only this parameter")

    m = verb("demo", "walk through the Larkspur Pavilion example", "sweepwidth demo --out demo-output")
    m.add_argument("--out", default="demo-output", metavar="DIR", help="folder for pictures and saved results (default demo-output)")
    m.add_argument("--time-limit", type=float, default=30.0, metavar="SECONDS", help="seconds per solve (default 30)")
    m.add_argument("--no-pictures", action="store_true", help="skip the pictures")
    return top


_COMMANDS = {
    "solve": cmd_solve,
    "bench": cmd_bench,
    "check": cmd_check,
    "dual": cmd_dual,
    "convert": cmd_convert,
    "draw": cmd_draw,
    "export": cmd_export,
    "demo": cmd_demo,
}


class _Terminated(KeyboardInterrupt):
    """SIGTERM, turned into an exception so that running children are stopped on the way out."""


def _on_sigterm(signum: int, frame: Any) -> None:
    raise _Terminated()


def main(argv: Sequence[str] | None = None) -> int:
    """Run the command line; return the exit status.

    Parameters
    ----------
    argv : sequence of str, optional
        The arguments after the program name (default: ``sys.argv[1:]``).

    Returns
    -------
    int
        0 on success; 1 when a check refuses a result, a result contradicts
        a known value, or an error was reported; 2 for a bad command line
        (raised as ``SystemExit`` by the parser); 130 when interrupted.

    Examples
    --------
    >>> main(["solve", "no-such-file.json", "--param", "girth"])
    1
    """
    parser = build_parser()
    args = parser.parse_args(argv)
    if not args.verb:
        parser.print_help()
        return EXIT_USAGE

    def out(line: str) -> None:
        print(line, flush=True)

    from .errors import SweepwidthError

    import signal
    import threading

    previous = None
    if threading.current_thread() is threading.main_thread() and hasattr(signal, "SIGTERM"):
        previous = signal.signal(signal.SIGTERM, _on_sigterm)
    try:
        return _COMMANDS[args.verb](args, out)
    except _Terminated:
        sys.stderr.write("sweepwidth: terminated\n")
        return 143
    except CliError as err:
        sys.stderr.write(f"sweepwidth: error: {err}\n")
    except SweepwidthError as err:
        msg = _cli_message(" ".join(str(err).split("\n")[0].split()))
        sys.stderr.write(f"sweepwidth: error: {msg}\n")
    except BrokenPipeError:
        # the reader went away (e.g. piped to head): stop quietly, and keep Python's exit flush quiet too
        try:
            devnull = os.open(os.devnull, os.O_WRONLY)
            os.dup2(devnull, sys.stdout.fileno())
        except (OSError, ValueError):
            pass
        return 0
    except OSError as err:
        where = f"{err.filename}: " if getattr(err, "filename", None) else ""
        sys.stderr.write(f"sweepwidth: error: {where}{err.strerror or err}\n")
    except KeyboardInterrupt:
        sys.stderr.write("sweepwidth: interrupted\n")
        return 130
    except Exception as err:  # noqa: BLE001 - a bug somewhere below: still one line, traceback on request
        if _from_interrupt(err):
            sys.stderr.write("sweepwidth: interrupted\n")
            return 130
        if os.environ.get("SWEEPWIDTH_TRACEBACK"):
            raise
        msg = " ".join(str(err).split())
        sys.stderr.write(
            f"sweepwidth: error: internal error {type(err).__name__}: {msg} (set SWEEPWIDTH_TRACEBACK=1 for the traceback)\n"
        )
    finally:
        if previous is not None:
            signal.signal(signal.SIGTERM, previous)
    return EXIT_FAIL


if __name__ == "__main__":  # pragma: no cover
    raise SystemExit(main())

"""Docstrings of the public API: a summary line, and numbered references (networkx style).

The convention (numpy docstring standard, as networkx uses it; common practice): a
``References`` section lists its sources as ``.. [1] Author, "Title", venue, year.``,
so that the text can cite them as ``[1]_``.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
import re

import pytest

import sweepwidth

ROOMS = ["sweepwidth.solve.ordering", "sweepwidth.solve.homology", "sweepwidth.solve.homotopy", "sweepwidth.solve.width",
         "sweepwidth.solve.contract", "sweepwidth.solve.joint"]


def _public_objects():
    seen = {}
    for name in sweepwidth.__all__:
        obj = getattr(sweepwidth, name)
        if callable(obj) or inspect.ismodule(obj):
            seen[f"sweepwidth.{name}"] = obj
    for room in ROOMS:
        mod = importlib.import_module(room)
        seen[room] = mod
        for name in getattr(mod, "__all__", []):
            obj = getattr(mod, name)
            if inspect.isfunction(obj) or inspect.isclass(obj):
                seen[f"{room}.{name}"] = obj
    return sorted(seen.items())


def _all_modules():
    out = []
    for info in pkgutil.walk_packages(sweepwidth.__path__, "sweepwidth."):
        out.append(importlib.import_module(info.name))
    return out


def _references_section(doc: str) -> str | None:
    m = re.search(r"^\s*References\n\s*-{10}\n(.*?)(?=^\s*\S[^\n]*\n\s*-{3,}\n|\Z)", doc, re.S | re.M)
    return None if m is None else m.group(1)


@pytest.mark.parametrize("name,obj", _public_objects(), ids=lambda x: x if isinstance(x, str) else "")
def test_public_objects_have_a_summary_line(name, obj):
    doc = inspect.getdoc(obj)
    assert doc, f"{name} has no docstring"
    assert doc.strip().split("\n")[0].strip(), f"{name}: the docstring has no summary line"


@pytest.mark.parametrize("mod", _all_modules(), ids=lambda m: m.__name__)
def test_references_are_numbered(mod):
    texts = [(mod.__name__, inspect.getdoc(mod) or "")]
    for name, obj in vars(mod).items():
        if (inspect.isfunction(obj) or inspect.isclass(obj)) and getattr(obj, "__module__", None) == mod.__name__:
            texts.append((f"{mod.__name__}.{name}", inspect.getdoc(obj) or ""))
    for where, doc in texts:
        sec = _references_section(doc)
        if sec is None or not sec.strip():
            continue
        entries = [ln for ln in sec.split("\n") if ln.strip() and not ln.startswith((" ", "\t"))]
        assert entries, f"{where}: empty References section"
        for ln in entries:
            assert re.match(r"^\.\. \[\d+\] ", ln), f"{where}: reference not numbered as '.. [n] ...': {ln[:70]!r}"


def test_the_reference_reader_sees_sections():
    doc = "Summary.\n\nReferences\n----------\n.. [1] A. Author, \"Title\", 2001.\nplain line\n\nExamples\n--------\n>>> 1\n"
    sec = _references_section(doc)
    assert sec is not None and ".. [1]" in sec and "plain line" in sec and ">>>" not in sec

"""Fuzzing the readers: random bytes and mutated valid files give a graph or a SweepwidthError.

Any other exception (IndexError, KeyError, RecursionError, a networkx or
numpy error, ...) is a bug in a reader's validation.
"""

from __future__ import annotations

import json

import networkx as nx
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

import sweepwidth as sw
from sweepwidth import generators
from sweepwidth.errors import SweepwidthError
from sweepwidth.io import detect_format, from_document, loads
from sweepwidth.io._gr import read_gr, write_gr
from sweepwidth.io._graphml import read_graphml, write_graphml
from sweepwidth.io._mesh import read_mesh, write_mesh
from sweepwidth.io._planar_code import HEADER, read_planar_code, write_planar_code

READERS = {
    "json": lambda d: loads(d),
    "gr": lambda d: read_gr(d),
    "planar_code": lambda d: read_planar_code(d),
    "off": lambda d: read_mesh(d, "off"),
    "obj": lambda d: read_mesh(d, "obj"),
    "graphml": lambda d: read_graphml(d),
}


def _samples() -> dict[str, list[bytes]]:
    graphs = [
        generators.wheel(5),
        generators.grid(2, 3, weights=(1, 3), seed=1),
        generators.random_tree(5, seed=2),
        sw.PlaneGraph.from_graph(nx.octahedral_graph()),
    ]
    out: dict[str, list[bytes]] = {k: [] for k in READERS}
    for P in graphs:
        out["json"].append(sw.io.dumps(P).encode())
        out["gr"].append(write_gr(P))
        out["planar_code"].append(write_planar_code(P))
        out["off"].append(write_mesh(P, "off"))
        out["obj"].append(write_mesh(P, "obj"))
        out["graphml"].append(write_graphml(P))
    out["planar_code"].append(write_planar_code(graphs[:2], wide=True))
    return out


SAMPLES = _samples()


def _call(fmt: str, data: bytes) -> None:
    try:
        got = READERS[fmt](data)
    except SweepwidthError:
        return
    # a success must be a graph (or a list of them for planar_code)
    items = got if isinstance(got, list) else [got]
    assert all(isinstance(g, (sw.PlaneGraph, nx.Graph)) for g in items)


@st.composite
def mutated(draw, fmt: str) -> bytes:
    data = bytearray(draw(st.sampled_from(SAMPLES[fmt])))
    for _ in range(draw(st.integers(1, 4))):
        op = draw(st.sampled_from(["flip", "cut", "insert", "dup", "digit"]))
        if not data:
            break
        i = draw(st.integers(0, len(data) - 1))
        if op == "flip":
            data[i] = draw(st.integers(0, 255))
        elif op == "cut":
            j = draw(st.integers(i, min(len(data), i + 40)))
            del data[i:j]
        elif op == "insert":
            data[i:i] = draw(st.binary(min_size=1, max_size=8))
        elif op == "dup":
            j = draw(st.integers(i, min(len(data), i + 40)))
            data[i:i] = data[i:j]
        else:  # replace a byte by a digit or a separator: keeps text formats plausible
            data[i] = draw(st.sampled_from(b"0123456789 -\n."))
    return bytes(data)


@pytest.mark.parametrize("fmt", list(READERS))
@settings(max_examples=60, deadline=None)
@given(data=st.data())
def test_mutated_files(fmt, data):
    _call(fmt, data.draw(mutated(fmt)))


@pytest.mark.parametrize("fmt", list(READERS))
@settings(max_examples=30, deadline=None)
@given(raw=st.binary(max_size=200))
@example(raw=b"")
@example(raw=HEADER + b"\xff" * 3)
@example(raw=HEADER + b"\x00\xff\xff")  # declares 65535 vertices with no entries: refused before allocating
@example(raw=b"OFF\n99999999 99999999 0\n")
@example(raw=b"p tw 9999999 29999999\n")
def test_random_bytes(fmt, raw):
    _call(fmt, raw)
    detect_format(raw)  # never raises


@st.composite
def _json_values(draw):
    return draw(
        st.recursive(
            st.none() | st.booleans() | st.integers(-3, 10) | st.floats(allow_nan=True) | st.text(max_size=4),
            lambda kids: st.lists(kids, max_size=3) | st.dictionaries(st.text(max_size=3), kids, max_size=3),
            max_leaves=6,
        )
    )


def _paths(doc, prefix=()):
    yield prefix
    if isinstance(doc, dict):
        for k, v in doc.items():
            yield from _paths(v, prefix + (k,))
    elif isinstance(doc, list):
        for i, v in enumerate(doc):
            yield from _paths(v, prefix + (i,))


@settings(max_examples=80, deadline=None)
@given(data=st.data())
def test_mutated_json_documents(data):
    doc = json.loads(data.draw(st.sampled_from(SAMPLES["json"])))
    paths = [p for p in _paths(doc) if p]
    for _ in range(data.draw(st.integers(1, 3))):
        p = data.draw(st.sampled_from(paths))
        node = doc
        try:
            for k in p[:-1]:
                node = node[k]
            if data.draw(st.booleans()):
                node[p[-1]] = data.draw(_json_values())
            elif isinstance(node, dict):
                node.pop(p[-1], None)
            elif isinstance(node, list) and p[-1] < len(node):
                node.pop(p[-1])
        except (KeyError, IndexError, TypeError):
            continue  # the path went away under an earlier mutation
    try:
        got = from_document(doc)
    except SweepwidthError:
        return
    assert isinstance(got, (sw.PlaneGraph, nx.Graph))


def test_deeply_nested_json_is_a_format_error():
    with pytest.raises(SweepwidthError):
        loads("[" * 100000 + "]" * 100000)


def test_regression_deeply_nested_label():
    # a label nested 900 arrays deep once overflowed the recursion of the label decoder
    label = "[" * 900 + "]" * 900
    text = '{"format": "sweepwidth-plane", "version": 1, "vertices": [%s], "edges": []}' % label
    with pytest.raises(SweepwidthError, match="nests arrays"):
        loads(text)

# SPDX-License-Identifier: MIT
"""Tests of functions.study: parameter studies as tables.

The reference of every number here is functions.design.design_damper called point by point in
a plain Python loop: these are consistency checks of the table against the engine it
repeats (our own rule, common practice, no source); the numbers of design_damper itself are
tested against independent references in tests/test_design.py. Broadcasting follows numpy's
rules (numpy.broadcast_shapes is the reference for the shapes). Scenarios are invented.
"""
from __future__ import annotations

import math
from concurrent.futures import ProcessPoolExecutor, ThreadPoolExecutor

import numpy as np
import pytest

from functions.design import CHECK_NAMES, DesignInputs, design_damper
from functions.quantities import design_inputs, design_results
from functions.study import CHUNKS_PER_EXECUTOR, ERROR_COLUMN, DesignTable, design_table

BASE = dict(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015, acceleration=0.25,
            acceleration_limit=0.15, clearance=1.2)

# a study with impossible points: 0.12 needs no damper, 0.9 needs a mass ratio above 2
ACCELERATIONS = np.array([0.12, 0.25, 0.3, 0.9])[:, None]
METHODS = np.array(["h2", "den_hartog", "hinf"])


def loop(**arrays):
    """The reference: design_damper on every point of the broadcast arrays, in C order."""
    names = list(arrays)
    grids = np.broadcast_arrays(*(np.asarray(arrays[n]) for n in names))
    rows = []
    for values in zip(*(g.ravel().tolist() for g in grids)):
        point = {**BASE, **dict(zip(names, values))}
        try:
            rows.append((design_damper(**point).to_dict(), ""))
        except ValueError as exc:
            rows.append((None, str(exc)))
    return rows


def same(a: np.ndarray, b: np.ndarray) -> bool:
    """Equal element by element, NaN equal to NaN (bit-identical floats)."""
    return a.dtype == b.dtype and np.array_equal(a, b, equal_nan=a.dtype.kind == "f")


class Spy:
    """An executor that records whether it was asked to run anything."""

    def __init__(self):
        self.calls = 0

    def map(self, fn, *iterables):
        self.calls += 1
        return map(fn, *iterables)


# ---------------------------------------------------------------------------------------------
# the table equals a loop over design_damper (consistency check, our own rule)
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("arrays", [
    dict(acceleration=ACCELERATIONS, tuning_method=METHODS),
    dict(mass_ratio=[0.004, 0.01, 0.03], clearance=[[0.5], [2.0]]),
    dict(damper_mass=[1e5, 4e5], structural_damping=[0.01, 0.02], tuning_method="hinf"),
])
def test_table_equals_a_loop_over_design_damper(arrays):
    t = design_table(**BASE | arrays)
    rows = loop(**arrays)
    assert len(t) == len(rows)
    results = [q.name for q in design_results()]
    verdicts = [f"{n}_ok" for n in CHECK_NAMES] + ["all_ok"]
    for i, (row, error) in enumerate(rows):
        assert t[ERROR_COLUMN][i] == error
        if row is None:
            assert all(math.isnan(t[n][i]) for n in results)
            assert not any(t[n][i] for n in verdicts)
            continue
        for name, value in row.items():
            if value is None:                 # an optional input not given: NaN in a table
                assert math.isnan(t[name][i]), (i, name)
            else:
                assert t[name][i] == value, (i, name)


def test_impossible_points_carry_the_engine_message():
    t = design_table(**BASE | dict(acceleration=ACCELERATIONS, tuning_method=METHODS))
    errors = t.grid(ERROR_COLUMN)
    assert all("no damper is required" in e for e in errors[0])
    assert all("needs a mass_ratio above 2" in e for e in errors[3])
    assert (errors[1:3] == "").all() and t.grid("all_ok")[1:3].all()
    # the inputs of an impossible point are still in the table
    assert t.grid("acceleration")[0].tolist() == [0.12] * 3
    assert t.grid("tuning_method")[0].tolist() == METHODS.tolist()


def test_inputs_and_keywords_combine_as_in_design_damper():
    base = DesignInputs(**BASE, tuning_method="hinf")
    t = design_table(base, acceleration=[0.2, 0.3])
    assert t["tuning_method"].tolist() == ["hinf", "hinf"]
    assert t["mass_ratio"][1] == design_damper(base, acceleration=0.3).mass_ratio


# ---------------------------------------------------------------------------------------------
# shapes, columns, units
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("acceleration, frequency", [
    (np.array([0.2, 0.25, 0.3])[:, None], np.array([0.1, 0.15, 0.2, 0.25])),
    (0.25, np.array([0.1, 0.2])),
    (np.full((2, 1, 3), 0.25), np.array([[0.1], [0.2]])),
    (0.25, 0.15),
    (np.array([]), 0.15),
])
def test_broadcast_shapes(acceleration, frequency):
    t = design_table(**BASE | dict(acceleration=acceleration, frequency=frequency))
    shape = np.broadcast_shapes(np.shape(acceleration), np.shape(frequency))
    assert t.shape == shape and len(t) == math.prod(shape)
    for name in t.names:
        assert t[name].shape == (len(t),)               # flat: loads into a table
        assert t.grid(name).shape == shape
    a, f = np.broadcast_arrays(acceleration, frequency)
    assert np.array_equal(t.grid("acceleration"), a)
    assert np.array_equal(t.grid("frequency"), f)


def test_columns_names_units_and_types():
    t = design_table(**BASE | dict(acceleration=[0.2, 0.3]))
    assert list(t.names) == list(design_damper(**BASE).to_dict()) + [ERROR_COLUMN]
    declared = {q.name: q.unit for q in design_inputs()} | {q.name: q.unit
                                                             for q in design_results()}
    for name in t.names:
        assert t.units[name] == declared.get(name, ""), name
    verdicts = [f"{n}_ok" for n in CHECK_NAMES] + ["all_ok"]
    texts = {ERROR_COLUMN} | {q.name for q in design_inputs() if q.kind == "choice"}
    counts = {q.name for q in design_inputs() if q.kind == "count"}
    for name in t.names:
        kind = t[name].dtype.kind
        if name in counts:          # whole numbers; NaN (a float column) when not given
            assert kind in "if", name
            continue
        assert kind == ("b" if name in verdicts else "U" if name in texts else "f"), name
    assert t.units["damper_mass"] == "kg" and t.units["stroke"] == "m"
    assert t.units["acceleration_ok"] == "" and isinstance(t, DesignTable)


def test_checks_are_boolean_columns():
    # a small clearance: the stroke check fails at the larger accelerations only
    t = design_table(**BASE | dict(acceleration=[0.17, 0.25, 0.35], clearance=0.5))
    rows = loop(acceleration=[0.17, 0.25, 0.35], clearance=0.5)
    assert t["stroke_ok"].tolist() == [row["stroke_ok"] for row, _ in rows]
    assert t["stroke_ok"].any() and not t["stroke_ok"].all()
    every = np.logical_and.reduce([t[f"{n}_ok"] for n in CHECK_NAMES])
    assert np.array_equal(t.ok, every) and np.array_equal(t["all_ok"], every)


def test_rows_are_plain_python_values():
    t = design_table(**BASE | dict(acceleration=[0.12, 0.25]))
    rows = t.to_rows()
    assert len(rows) == 2 and list(rows[1]) == list(t.names)
    assert type(rows[1]["stroke"]) is float and type(rows[1]["all_ok"]) is bool
    assert type(rows[0][ERROR_COLUMN]) is str and math.isnan(rows[0]["stroke"])
    assert rows[1]["stroke"] == design_damper(**BASE).stroke
    assert repr(t) == (f"DesignTable(shape=(2,), 2 rows, {len(t.names)} columns, "
                       f"{int(rows[1]['all_ok'])} pass every check, 1 impossible)")


# ---------------------------------------------------------------------------------------------
# executors: the same numbers as serial
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("pool", [ProcessPoolExecutor, ThreadPoolExecutor])
@pytest.mark.parametrize("chunk_size", [None, 1, 5])
def test_executor_results_identical_to_serial(pool, chunk_size):
    arrays = dict(acceleration=ACCELERATIONS, tuning_method=METHODS)
    serial = design_table(**BASE | arrays)
    with pool(max_workers=2) as executor:
        parallel = design_table(**BASE | arrays, executor=executor, chunk_size=chunk_size)
    assert parallel.names == serial.names and parallel.shape == serial.shape
    for name in serial.names:
        assert same(parallel[name], serial[name]), name


def test_points_are_cut_into_chunks():
    seen = []

    class Counting(Spy):
        def map(self, fn, chunks):
            chunks = list(chunks)
            seen.extend(len(c) for c in chunks)
            return super().map(fn, chunks)

    design_table(**BASE | dict(acceleration=np.linspace(0.2, 0.3, 7)), executor=Counting(),
                 chunk_size=3)
    assert seen == [3, 3, 1]
    seen.clear()
    design_table(**BASE | dict(acceleration=np.linspace(0.2, 0.3, 130), mass_ratio=0.02),
                 executor=Counting())
    assert sum(seen) == 130 and len(seen) <= CHUNKS_PER_EXECUTOR


# ---------------------------------------------------------------------------------------------
# bad input: refused before any design runs
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("change, match", [
    (dict(frequency=[0.1, -0.2]), r"^frequency=-0\.2 must be in \[0\.01, 20\] \[Hz\]$"),
    (dict(structural_damping=np.array([[0.01], [0.3]])),
     r"^structural_damping=0\.3 must be in \(0, 0\.2\] \[-\]$"),
    (dict(acceleration=[0.2, float("nan")]), r"^acceleration=nan must be a finite number$"),
    (dict(tuning_method=["h2", "fast"]), r"^tuning_method='fast' must be one of den_hartog"),
    (dict(mass_ratio=[0.01, 0.02], damper_mass=[1e5, 2e5]),
     r"^damper_mass=100000\.0 and mass_ratio=0\.01: give at most one of them "
     r"\(point 0 of the table\)$"),
    (dict(mass_ratio_max=[0.05, 0.004]),
     r"^mass_ratio_max=0\.004 must be above mass_ratio_min=0\.005 \[-\] \(point 1 of"),
    (dict(acceleration=[0.2, 0.3], frequency=[0.1, 0.2, 0.3]),
     r"^arrays do not broadcast together: frequency\(3,\), acceleration\(2,\)$"),
    (dict(chunk_size=0), r"^chunk_size=0 must be a whole number in \[1, inf\) or None"),
    (dict(chunk_size=2.5), r"^chunk_size=2\.5 must be a whole number"),
])
def test_invalid_inputs_are_refused_before_any_work(change, match):
    spy = Spy()
    with pytest.raises(ValueError, match=match):
        design_table(**BASE | change, executor=spy)
    assert spy.calls == 0


def test_invalid_arguments():
    with pytest.raises(ValueError, match=r"^executor=.* must be a concurrent\.futures\.Executor"):
        design_table(**BASE, executor=object())
    with pytest.raises(ValueError, match=r"^inputs='tower' must be a DesignInputs or None"):
        design_table("tower", **BASE)
    with pytest.raises(TypeError, match=r"unexpected field\(s\) \['swing'\]"):
        design_table(**BASE, swing=[1.0, 2.0])
    with pytest.raises(TypeError, match=r"missing the required field 'clearance'"):
        design_table(**{k: v for k, v in BASE.items() if k != "clearance"})


def test_design_damper_points_arrays_to_the_study_function():
    with pytest.raises(ValueError, match=r"^mass_ratio=array\(\[0\.01, 0\.02\]\) must be a "
                                         r"single number: design_damper sizes one damper; "
                                         r"for arrays of inputs use functions\.design_table"):
        design_damper(**BASE, mass_ratio=np.array([0.01, 0.02]))
    with pytest.raises(ValueError, match=r"^tuning_method=\['h2', 'hinf'\] must be a single "
                                         r"text: .*functions\.design_table"):
        design_damper(**BASE, tuning_method=["h2", "hinf"])
    # a 0-d array is a single number
    assert design_damper(**BASE | dict(frequency=np.array(0.15))).ok

# SPDX-License-Identifier: MIT
"""Spreadsheet wrappers against the engine: cells, ranges, empties, messages, random input.

The xlwings decorators are no-ops on Linux, so the wrappers are plain functions here; how the
add-ins hand cells over (a cell as a float or ``[[x]]``, a range as a list of rows, an empty cell
as ``None``, an error cell as its text) is reproduced by the inputs. Reference values come from
the engine itself (functions/*.py), whose own tests cite the published sources.
"""
from __future__ import annotations

import importlib.util
import inspect
import math
import sys
import types
from dataclasses import replace

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from functions import catalogue, udf
from functions.catalogue import ELEMENTWISE, FUNCTIONS, MESSAGES, NUMBER, TEXT

FN_IDS = [fn.name for fn in FUNCTIONS]
ELEMENTWISE_FNS = [fn for fn in FUNCTIONS if fn.kind == ELEMENTWISE]
# The numerical optima (h2, hinf) are Newton iterations on a batch: a value may differ in the last
# bits with the batch it was solved in. Closed forms agree to the last bit.
RTOL = 1e-10


def wrapper(fn):
    return getattr(udf, fn.python_name)


def engine_value(fn, values):
    """Engine result for cell values given per argument (None = the argument's default)."""
    kwargs = {}
    for a, v in zip(fn.arguments, values):
        if v is None:
            v = a.default
        kwargs[a.engine_param] = np.asarray(v, dtype=float) if a.kind == NUMBER else v
    result = fn.engine(**kwargs)
    if fn.output is not None:
        result = result[fn.output]
    return np.asarray(result, dtype=float)


def full_example(fn):
    """Example arguments, completed with the defaults of the omitted optional arguments."""
    ex = list(fn.example)
    return ex + [a.default for a in fn.arguments[len(ex):]]


def variants(x):
    return [x * 1.0, x * 1.05, x * 0.95, x * 1.1]


def assert_cells_close(got, expected):
    got_arr = np.asarray(got, dtype=float)
    assert got_arr.shape == np.shape(expected)
    np.testing.assert_allclose(got_arr, expected, rtol=RTOL, atol=0.0)


# --- the generated wrappers -------------------------------------------------------------------

@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_wrapper_is_generated_with_the_declared_signature(fn):
    f = vars(udf)[fn.python_name]                  # a module global, listed for import *
    assert fn.python_name in udf.__all__
    assert f.__name__ == f.__qualname__ == fn.python_name
    assert f.__module__ == "functions.udf"
    assert f.__doc__ == fn.description
    params = list(inspect.signature(f).parameters.values())
    assert [p.name for p in params] == [a.name for a in fn.arguments]
    for p, a in zip(params, fn.arguments):
        assert p.kind is inspect.Parameter.POSITIONAL_OR_KEYWORD
        assert (p.default is None) if a.optional else (p.default is inspect.Parameter.empty)
    # what the add-ins read: a real code object with the names, defaults for the optional ones
    code = f.__code__
    assert code.co_varnames[:code.co_argcount] == tuple(a.name for a in fn.arguments)
    assert (f.__defaults__ or ()) == (None,) * sum(a.optional for a in fn.arguments)


def test_every_wrapper_is_declared():
    declared = {fn.python_name for fn in FUNCTIONS}
    found = {n for n, obj in vars(udf).items() if n.startswith("sway_") and callable(obj)}
    assert found == declared
    assert sorted(udf.__all__) == sorted(["evaluate", "MAX_TEXT", *declared])
    namespace: dict = {}
    exec("from functions.udf import *", namespace)            # noqa: S102 - test only
    assert set(namespace) - {"__builtins__"} == set(udf.__all__)
    assert all(namespace[n] is getattr(udf, n) for n in udf.__all__)


def test_decorators_receive_the_catalogue_texts(monkeypatch):
    """functions/udf.py imported afresh with a recording stand-in for xlwings' func/arg: each
    generated wrapper is registered as declared, and the registered object is the global."""
    calls = {}

    def func(**kwargs):
        def inner(f):
            calls.setdefault(f.__name__, {})["func"] = (kwargs, f)
            return f
        return inner

    def arg(name, **kwargs):
        def inner(f):
            calls.setdefault(f.__name__, {}).setdefault("args", []).append((name, kwargs))
            return f
        return inner

    stand_in = types.ModuleType("xlwings")
    stand_in.func, stand_in.arg = func, arg
    monkeypatch.setitem(sys.modules, "xlwings", stand_in)
    spec = importlib.util.spec_from_file_location("udf_probe", udf.__file__)
    probe = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(probe)
    assert set(calls) == {fn.python_name for fn in FUNCTIONS}
    for fn in FUNCTIONS:
        rec = calls[fn.python_name]
        options, registered = rec["func"]
        expected = {"category": catalogue.CATEGORY}
        if fn.slow:
            expected["call_in_wizard"] = False
        assert options == expected
        assert getattr(probe, fn.python_name) is registered
        assert registered.__doc__ == fn.description
        assert list(inspect.signature(registered).parameters) == [a.name for a in fn.arguments]
        # applied innermost first, as stacked decorators written in the arguments' order
        assert [name for name, _ in rec.get("args", [])] == [a.name for a in fn.arguments][::-1]
        for a in fn.arguments:
            options = dict(rec["args"])[a.name]
            assert options["doc"] == a.help
            if a.kind in (NUMBER, catalogue.ROWS) or fn.kind == catalogue.LOOKUP:
                assert options["ndim"] == 2 and options["err_to_str"] is True
            else:                               # one cell: text or TRUE/FALSE
                assert "ndim" not in options


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_wrapper_hands_its_arguments_to_evaluate_in_order(fn, monkeypatch):
    seen = []
    monkeypatch.setattr(udf, "evaluate", lambda *args: seen.append(args) or len(seen))
    f = wrapper(fn)
    cells = [object() for _ in fn.arguments]
    assert f(*cells) == 1
    assert f(**{a.name: c for a, c in zip(fn.arguments, cells)}) == 2
    required = [c for a, c in zip(fn.arguments, cells) if not a.optional]
    assert f(*required) == 3                    # omitted optional arguments arrive as None
    assert seen == [(fn.name, *cells)] * 2 + [
        (fn.name, *required, *[None] * (len(cells) - len(required)))]


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_wrapper_equals_evaluate_on_the_example(fn):
    expected = udf.evaluate(fn.name, *fn.example)
    assert expected is not None and not isinstance(expected, str), expected
    assert wrapper(fn)(*fn.example) == expected
    assert wrapper(fn)(**{a.name: v for a, v in zip(fn.arguments, fn.example)}) == expected


@pytest.mark.parametrize("bad", ["lambda", "two words", "x=1): pass\ndef y(", ""])
def test_generator_refuses_names_that_are_not_python_names(bad):
    fn = catalogue.BY_NAME["SWAY_SWING_ANGLE"]
    arguments = (replace(fn.arguments[0], name=bad),) + fn.arguments[1:]
    with pytest.raises(ValueError, match="cannot name a Python function or argument"):
        udf._sheet_function(replace(fn, arguments=arguments))
    with pytest.raises(ValueError, match="cannot name a Python function or argument"):
        udf._sheet_function(replace(fn, name=bad))          # python_name: lower case


# --- values against the engine ----------------------------------------------------------------

@pytest.mark.parametrize("fn", ELEMENTWISE_FNS, ids=[f.name for f in ELEMENTWISE_FNS])
def test_scalar_and_single_cell(fn):
    ex = full_example(fn)
    expected = float(engine_value(fn, ex))
    assert math.isclose(wrapper(fn)(*fn.example), expected, rel_tol=RTOL)
    assert math.isclose(wrapper(fn)(*ex), expected, rel_tol=RTOL)
    # a single cell read with ndim=2 arrives as [[x]]; the result is a plain value
    cells = [[[v]] if a.kind == NUMBER else v for a, v in zip(fn.arguments, ex)]
    got = wrapper(fn)(*cells)
    assert isinstance(got, float) and math.isclose(got, expected, rel_tol=RTOL)


def _ranges(fn):
    """(argument index, name) of every NUMBER argument that takes any real number (a whole
    number, such as a count of hangers, is not varied by fractions)."""
    return [(i, a.name) for i, a in enumerate(fn.arguments)
            if a.kind == NUMBER and not a.integer]


ELEMENTWISE_ARGS = [pytest.param(fn, i, id=f"{fn.name}-{name}")
                    for fn in ELEMENTWISE_FNS for i, name in _ranges(fn)]


def _with(ex, i, value):
    out = list(ex)
    out[i] = value
    return out


@pytest.mark.parametrize("fn, i", ELEMENTWISE_ARGS)
def test_row_column_block_and_empty_cells(fn, i):
    ex = full_example(fn)
    v = variants(float(ex[i]))
    f = wrapper(fn)
    row = [v[:3]]
    column = [[x] for x in v[:3]]
    block = [v[:2], v[2:4]]
    for cells in (row, column, block):
        expected = engine_value(fn, _with(ex, i, np.array(cells)))
        assert_cells_close(f(*_with(ex, i, cells)), expected)
    # a 1-D list (a row as Python writes it) gives a row
    assert_cells_close(f(*_with(ex, i, v[:3])), engine_value(fn, _with(ex, i, np.array(row))))
    # empty cells: a required argument gives an empty result cell, an optional one its default
    mixed = [[v[0]], [None], [""], [v[2]]]
    got = f(*_with(ex, i, mixed))
    a = fn.arguments[i]
    for r, cell in zip(got, mixed):
        assert len(r) == 1
        if cell[0] in (None, "") and not a.optional:
            assert r[0] is None
        else:
            x = a.default if cell[0] in (None, "") else cell[0]
            expected = float(engine_value(fn, _with(ex, i, x)))
            if math.isfinite(expected):
                assert math.isclose(r[0], expected, rel_tol=RTOL)
            else:       # e.g. a bare undamped structure at resonance
                assert r[0] == f"{fn.name}: no finite result for these inputs"


@pytest.mark.parametrize("fn", [f for f in ELEMENTWISE_FNS if len(_ranges(f)) >= 2],
                         ids=[f.name for f in ELEMENTWISE_FNS if len(_ranges(f)) >= 2])
def test_column_and_row_make_a_table(fn):
    ex = full_example(fn)
    (i, _), (j, _) = _ranges(fn)[:2]
    col = [[x] for x in variants(float(ex[i]))[:3]]
    row = [variants(float(ex[j]))[:2]]
    args = _with(_with(ex, i, col), j, row)
    expected = engine_value(fn, _with(_with(ex, i, np.array(col)), j, np.array(row)))
    assert expected.shape == (3, 2)
    assert_cells_close(wrapper(fn)(*args), expected)


# (the time-domain simulation takes seconds per call: its defaults are checked once, below)
WITH_OPTIONAL = [f for f in FUNCTIONS if any(a.optional for a in f.arguments)
                 and f.name != "SWAY_SIMULATION_SUMMARY"]


@pytest.mark.parametrize("fn", WITH_OPTIONAL, ids=[f.name for f in WITH_OPTIONAL])
def test_optional_arguments_omitted_or_empty(fn):
    required = [v for a, v in zip(fn.arguments, full_example(fn)) if not a.optional]
    n_opt = len(fn.arguments) - len(required)
    f = wrapper(fn)
    expected = f(*required)
    assert isinstance(expected, float) or fn.kind == catalogue.SUMMARY
    assert f(*required, *([None] * n_opt)) == expected
    assert f(*required, *([""] * n_opt)) == expected
    cells = [[[None]] if a.kind != TEXT else None for a in fn.arguments if a.optional]
    assert f(*required, *cells) == expected


def test_method_text_is_forgiving():
    base = udf.sway_optimal_tuning_ratio(0.02, "white_noise_force")
    assert udf.sway_optimal_tuning_ratio(0.02, " White-Noise Force ") == base
    assert udf.sway_optimal_tuning_ratio(0.02, [["WHITE_NOISE_FORCE"]]) == base


def test_optimal_tuning_outputs_are_the_engine_pair():
    from functions.damper import optimal_tuning
    f, z = optimal_tuning(0.03, "nishihara_asami")
    assert udf.sway_optimal_tuning_ratio(0.03, "nishihara_asami") == f
    assert udf.sway_optimal_damper_damping(0.03, "nishihara_asami") == z


def test_folded_pendulum_rows_columns_and_blocks():
    from functions.pendulum import folded_pendulum_length as engine
    f = udf.sway_folded_pendulum_length
    assert f([[4.0, 4.0, 4.0]]) == engine([4.0, 4.0, 4.0]) == 12.0
    assert f([[4.0], [4.0], [4.0]]) == 12.0          # a single column is one list
    assert f([4.0, 5.0]) == 9.0
    assert f(7.5) == 7.5 and f([[7.5]]) == 7.5
    assert f([[4.0, None, 3.0]]) == 7.0               # empty cells are skipped
    assert f([[4.0, 4.0], [3.0, None], [None, None], [2.0, -1.0]]) == [
        [8.0], [3.0], [None], ["stage_lengths=-1.0 must be in (0, inf) [m]"]]


def test_bad_cell_in_a_range_reports_only_that_cell():
    got = udf.sway_exact_period([[10.0], [-1.0], [True], [None], [12.0]], 15.0)
    from functions.pendulum import exact_period
    assert got[0][0] == exact_period(10.0, 15.0) and got[4][0] == exact_period(12.0, 15.0)
    assert got[1][0] == "length=-1.0 must be in (0, inf) [m]"
    assert got[2][0] == "length=True must be a finite number"
    assert got[3][0] is None


@pytest.mark.parametrize("name, args, message, meaning", MESSAGES,
                         ids=[f"{m[0]}-{k}" for k, m in enumerate(MESSAGES)])
def test_documented_messages(name, args, message, meaning):
    assert udf.evaluate(name, *args) == message
    f = getattr(udf, catalogue.BY_NAME[name].python_name)
    assert f(*args) == message


@pytest.mark.parametrize("fn, i", ELEMENTWISE_ARGS)
def test_engine_verdict_on_extreme_values(fn, i):
    """Probe values the engine refuses come back as its own message (argument renamed as in the
    sheet); values it accepts come back as its value."""
    ex = full_example(fn)
    a = fn.arguments[i]
    kwargs = {b.engine_param: v for b, v in zip(fn.arguments, ex)}
    for probe in (-1e300, 1e300, -1.0, 0.0):
        kwargs[a.engine_param] = probe
        got = wrapper(fn)(*_with(ex, i, probe))
        if a.fraction and probe >= 1.0:
            assert "percent is not accepted" in got
            continue
        try:
            with np.errstate(all="ignore"):
                value = engine_value(fn, [kwargs[b.engine_param] for b in fn.arguments])
        except ValueError as exc:
            text = str(exc)
            if a.param and text.startswith(a.param + "="):
                text = a.name + text[len(a.param):]
            assert got == text
            continue
        if math.isfinite(float(value)):
            assert math.isclose(got, float(value), rel_tol=RTOL)
        else:
            assert got == f"{fn.name}: no finite result for these inputs"


@pytest.mark.parametrize("fn", [f for f in FUNCTIONS if any(a.fraction for a in f.arguments)],
                         ids=[f.name for f in FUNCTIONS if any(a.fraction for a in f.arguments)])
def test_percent_instead_of_fraction_is_refused_with_a_hint(fn):
    ex = full_example(fn)
    for i, a in enumerate(fn.arguments):
        if a.fraction:
            got = wrapper(fn)(*_with(ex, i, 5.0))
            if fn.kind == catalogue.SUMMARY:      # the message heads the case's column
                got = got[0][0]
            assert got == (f"{a.name}=5.0 must be in [0, 1) [-]: give a fraction, e.g. 0.05 "
                           f"for 5 % (percent is not accepted)")


def test_shape_problems_give_one_message():
    assert udf.sway_exact_period([[1.0, 2.0], [3.0]]) == (
        "length: rows of different lengths; give a rectangular range")
    assert udf.sway_exact_period([[1.0, [2.0]]]) == (
        "length: nested lists are not cells; give a rectangular range")
    assert udf.sway_exact_period([]) == "length: the range is empty"
    assert udf.sway_exact_period([1.0, [2.0]]) == (
        "length: mixes single values and rows; give a rectangular range")
    assert udf.evaluate("SWAY_SWING_ANGLE", 1.0, 2.0, 3.0) == (
        "SWAY_SWING_ANGLE takes at most 2 arguments")


def test_required_empty_cell_gives_empty_result():
    assert udf.sway_exact_period(None) is None
    assert udf.sway_exact_period([[None]]) is None
    assert udf.sway_swing_angle(1.0, None) is None


# --- random cell-like input never breaks a wrapper -------------------------------------------

_numbers = st.one_of(
    st.floats(allow_nan=True, allow_infinity=True),
    st.floats(min_value=-2.0, max_value=2.0),
    st.floats(min_value=0.0, max_value=200.0),
    st.integers(min_value=-10**400, max_value=10**400),
    st.sampled_from([0.0, -0.0, 1e-300, 1e300, -1e300, 5.0, 100.0, float("nan"),
                     float("inf"), -float("inf"), 2 ** 63]),
)
_scalars = st.one_of(
    st.none(), st.booleans(), _numbers, st.text(max_size=12),
    st.sampled_from(["", " ", "#DIV/0!", "#N/A", "h2", "HINF", "den_hartog", "1.5", "nan"]),
)
_cells = st.recursive(
    _scalars,
    lambda inner: st.one_of(st.lists(inner, max_size=3),
                            st.lists(st.lists(inner, min_size=1, max_size=3), min_size=1,
                                     max_size=3)),
    max_leaves=8,
)


def _check_output(value, top=True):
    if isinstance(value, list):
        assert top, "only one level of rows"
        assert value and all(isinstance(r, list) and r for r in value)
        assert len({len(r) for r in value}) == 1, "rectangular"
        for r in value:
            for c in r:
                _check_output(c, top=False)
        return
    if value is None:
        return
    if isinstance(value, str):
        assert 0 < len(value) <= udf.MAX_TEXT
        return
    assert type(value) is float, type(value)
    assert math.isfinite(value)


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(data=st.data())
def test_random_cells_never_raise_nor_give_nan(fn, data):
    n_required = sum(not a.optional for a in fn.arguments)   # Excel insists on those
    n = data.draw(st.integers(min_value=n_required, max_value=len(fn.arguments)), label="n")
    args = [data.draw(_cells, label=a.name) for a in fn.arguments[:n]]
    _check_output(wrapper(fn)(*args))


# --- summary functions: one case -> a column of named numbers ---------------------------------

SUMMARY_FNS = [fn for fn in FUNCTIONS if fn.kind == catalogue.SUMMARY]


def _summary_engine(fn, values):
    kwargs = {a.engine_param: (a.default if v is None else v)
              for a, v in zip(fn.arguments, full_example_values(fn, values))}
    result = fn.engine(**kwargs)
    if hasattr(result, "to_dict"):
        result = result.to_dict()
    return [float(result[n] if isinstance(result, dict) else getattr(result, n))
            for n, _u, _t in fn.fields]


def full_example_values(fn, values):
    return list(values) + [a.default for a in fn.arguments[len(values):]]


@pytest.mark.parametrize("fn", SUMMARY_FNS, ids=[f.name for f in SUMMARY_FNS])
def test_summary_single_case_is_a_column_of_engine_numbers(fn):
    got = wrapper(fn)(*fn.example)
    expected = _summary_engine(fn, fn.example)
    assert [len(r) for r in got] == [1] * len(fn.fields)
    np.testing.assert_allclose([r[0] for r in got], expected, rtol=RTOL)
    (partner,) = [g for g in FUNCTIONS if g.kind == catalogue.FIELDS and g.engine is fn.engine]
    labels = wrapper(partner)()
    assert [r[0] for r in labels] == [f"{n} [{u}]" for n, u, _t in fn.fields]


def test_summary_cases_in_a_row_or_a_column():
    fn = catalogue.BY_NAME["SWAY_RANDOM_RESPONSE_THEORY"]
    ex = list(fn.example)
    zetas = [0.01, 0.02, 0.03]
    per_case = [_summary_engine(fn, _with(ex, 2, z)) for z in zetas]
    row = udf.sway_random_response_theory(*_with(ex, 2, [zetas]))      # cases across
    assert len(row) == len(fn.fields) and all(len(r) == 3 for r in row)
    np.testing.assert_allclose(np.array(row, dtype=float).T, per_case, rtol=RTOL)
    col = udf.sway_random_response_theory(*_with(ex, 2, [[z] for z in zetas]))   # cases down
    assert len(col) == 3 and all(len(r) == len(fn.fields) for r in col)
    np.testing.assert_allclose(np.array(col, dtype=float), per_case, rtol=RTOL)
    # a second argument with as many cases pairs case by case
    both = udf.sway_random_response_theory(*_with(_with(ex, 2, [[z] for z in zetas]), 4,
                                                  [[6.0], [6.5], [7.0]]))
    expected = [_summary_engine(fn, _with(_with(ex, 2, z), 4, L))
                for z, L in zip(zetas, [6.0, 6.5, 7.0])]
    np.testing.assert_allclose(np.array(both, dtype=float), expected, rtol=RTOL)


def test_summary_empty_and_bad_cases():
    fn = catalogue.BY_NAME["SWAY_RANDOM_RESPONSE_THEORY"]
    ex = list(fn.example)
    got = udf.sway_random_response_theory(*_with(ex, 2, [[0.01], [None], [-0.5], [3.0]]))
    width = len(fn.fields)
    np.testing.assert_allclose(got[0], _summary_engine(fn, ex), rtol=RTOL)
    assert got[1] == [None] * width
    assert got[2][1:] == [None] * (width - 1) and got[2][0].startswith("structural_damping=-0.5")
    assert got[3][0] == ("structural_damping=3.0 must be in [0, 1) [-]: give a fraction, e.g. "
                         "0.05 for 5 % (percent is not accepted)")
    assert udf.sway_random_response_theory(*_with(ex, 2, [[0.01, 0.02], [0.01, 0.02]])) == (
        "structural_damping: give one cell, or a row or a column of cases as long as those of "
        "the other arguments")
    assert udf.sway_random_response_theory(*_with(_with(ex, 2, [[0.01, 0.02]]), 4,
                                                  [[6.0], [7.0]])).startswith("length: give")


def test_design_chain_matches_the_engine_and_pairs_cases():
    from functions.design import design_damper
    fn = catalogue.BY_NAME["SWAY_DESIGN"]
    ex = list(fn.example)
    r = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
                      acceleration=0.25, acceleration_limit=0.15, clearance=1.2).to_dict()
    got = udf.sway_design(*ex)
    names = [n for n, _u, _t in fn.fields]
    assert [g[0] for g in got] == [float(r[n]) for n in names]
    assert got[names.index("all_ok")] == [1.0]
    # two cases across: given mass ratios 1 % and 2 %, hinf tuning
    two = udf.sway_design(*ex, None, [[0.01, 0.02]], "hinf")
    for k, mu in enumerate((0.01, 0.02)):
        rk = design_damper(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
                           acceleration=0.25, acceleration_limit=0.15, clearance=1.2,
                           mass_ratio=mu, tuning_method="hinf").to_dict()
        assert [row[k] for row in two] == [float(rk[n]) for n in names]
    # the engine's whole-design messages come back in the case's first cell
    assert udf.sway_design(*ex, 3e5, 0.02)[0] == [
        "damper_mass=300000.0 and mass_ratio=0.02: give at most one of them"]
    assert udf.sway_design(*_with(ex, 3, 0.1))[0][0].startswith(
        "acceleration=0.1 is already within acceleration_limit=0.15 [m/s^2]: no damper")


def test_simulation_summary_texts_and_whole_numbers():
    fn = catalogue.BY_NAME["SWAY_SIMULATION_SUMMARY"]
    ex = list(fn.example)
    assert udf.sway_simulation_summary(*_with(ex, 6, "wind")) == (
        "load_type='wind' must be one of: harmonic, random")
    assert udf.sway_simulation_summary(*_with(ex, 6, "")) == (
        "load_type is required: one of harmonic, random")
    got = udf.sway_simulation_summary(*ex, 1.5)          # seed follows duration
    assert got[0] == ["seed=1.5 must be a whole number >= 0 [-]"]
    # omitted and empty optional arguments take the engine's defaults
    short = ex[:9]
    expected = _summary_engine(fn, short)
    for extra in ([], [None, None, None, None], ["", [[None]], None, ""]):
        np.testing.assert_allclose([r[0] for r in udf.sway_simulation_summary(*short, *extra)],
                                   expected, rtol=RTOL)


# --- paired lists (modal mass) and TRUE/FALSE arguments ---------------------------------------

def test_modal_mass_lists_against_the_engine():
    from functions.structure import modal_mass
    m, phi = [2e6, 1.5e6, 1e6], [0.3, 0.7, 1.0]
    expected = modal_mass(m, phi)
    f = udf.sway_modal_mass
    assert f([m], [phi]) == expected                              # two rows
    assert f([[x] for x in m], [[x] for x in phi]) == expected    # two columns
    assert f(m, [[x] for x in phi]) == expected                   # a row and a column
    assert f([m], [phi], 2) == modal_mass(m, phi, 1)              # position 2 = index 1
    assert f([m], [phi], [[None]]) == expected                    # empty: the last level
    # a level left empty in both lists is skipped; positions count the cells as given
    assert f([[2e6, None, 1.5e6, 1e6]], [[0.3, None, 0.7, 1.0]], 3) == modal_mass(m, phi, 1)
    assert f([[None, None]], [[None, None]]) is None


@pytest.mark.parametrize("args, message", [
    (([[1e6, 1e6]], [[0.5, 0.7, 1.0]]),
     "the lists must have one cell per level each: floor_masses (2 cells), mode_shape (3 cells)"),
    (([[1e6, 1e6], [1e6, 1e6]], [[0.5, 0.7, 1.0, 1.0]]),
     "floor_masses: give one row or one column, one cell per level"),
    (([[1e6, None, 1e6]], [[0.5, 0.7, 1.0]]),
     "floor_masses is empty at position 2 but not the other list: fill both or neither"),
    (([[1e6, "x", 1e6]], [[0.5, 0.7, 1.0]]), "floor_masses='x' must be a finite number"),
    (([[1e6, -1.0, 1e6]], [[0.5, 0.7, 1.0]]), "floor_masses=-1.0 must be in [0, inf) [kg]"),
    (([[1e6, 1e6, 1e6]], [[0.5, 0.7, 1.0]], 4),
     "damper_level=4 must be a whole number in [1, 3] (a position in the lists)"),
    (([[1e6, 1e6, 1e6]], [[0.5, 0.7, 1.0]], 1.5),
     "damper_level=1.5 must be a whole number in [1, 3] (a position in the lists)"),
    (([[1e6, None, 1e6]], [[0.5, None, 1.0]], 2), "damper_level=2 points at an empty level"),
    (([[1e6, 1e6, 1e6]], [[0.5, 0.0, 1.0]], 2),
     "mode_shape at damper_level=2 is 0: the damper would not move"),
    (([[1e6, 1e6, 1e6]], [[0.5, 0.7, 0.0]]),
     "mode_shape at damper_level=3 is 0: the damper would not move"),
    (([[1e6, 1e6, 1e6]], [[0.5, 0.7, 1.0]], [[1, 2]]), "damper_level: give a single cell"),
])
def test_modal_mass_messages(args, message):
    assert udf.sway_modal_mass(*args) == message


def test_true_false_arguments():
    from functions.structure import damping_from_log_decrement as engine
    f = udf.sway_damping_from_log_decrement
    exact, approx = engine(0.3, exact=True), engine(0.3)
    assert exact != approx
    for flag in (True, 1, 1.0, "TRUE", " true ", [[True]]):
        assert f(0.3, flag) == exact
    for flag in (False, 0, "FALSE", None, "", [[None]]):
        assert f(0.3, flag) == approx
    assert f(0.3, "yes") == "exact='yes' must be TRUE or FALSE"
    assert f(0.3, 2.0) == "exact=2.0 must be TRUE or FALSE"


def test_guide_design_example_numbers():
    """The worked example of docs/spreadsheet_functions.md ("a damper design in two formulas")."""
    fn = catalogue.BY_NAME["SWAY_DESIGN"]
    names = [n for n, _u, _t in fn.fields]
    got = {n: row[0] for n, row in zip(names, udf.sway_design(0.15, 2e7, 0.015, 0.25, 0.15, 1.2))}
    assert round(got["mass_ratio"], 5) == 0.01435
    assert round(got["damper_mass"] / 1e3) == 287
    assert round(got["tuning_ratio"], 5) == 0.98851
    assert round(got["stroke"], 3) == 0.949
    assert round(got["pendulum_length"], 3) == 11.288
    assert got["all_ok"] == 1.0
    two = udf.sway_design(0.15, 2e7, 0.015, 0.25, 0.15, 1.2, None, [[0.01, 0.02]])
    assert two[names.index("mass_ratio")] == [0.01, 0.02]


def test_lookup_tables_cell_and_range():
    from functions.structure import MODE_SHAPE_EXPONENTS, STRUCTURAL_LOG_DECREMENTS
    for name, value in MODE_SHAPE_EXPONENTS.items():
        assert udf.sway_mode_shape_exponent(name) == value
        assert udf.sway_mode_shape_exponent([[name.upper().replace("_", " ")]]) == value
    for name, value in STRUCTURAL_LOG_DECREMENTS.items():
        assert udf.sway_structural_log_decrement(name) == value
    names = list(STRUCTURAL_LOG_DECREMENTS)
    got = udf.sway_structural_log_decrement([[names[0], None], ["brick", names[2]]])
    assert got[0] == [STRUCTURAL_LOG_DECREMENTS[names[0]], None]
    assert got[1][1] == STRUCTURAL_LOG_DECREMENTS[names[2]]
    assert got[1][0] == "building_type='brick' must be one of: " + ", ".join(names)


def test_a_huge_whole_number_is_named_in_digits_not_as_inf():
    """A cell holding 10^400 (Python hands it over as an int) is too large, said in the cell's terms.

    Before: "length=inf must be a finite number", although the user typed no inf.
    """
    for value in (10**400, -10**400):
        got = udf.sway_exact_period(value, 10.0)
        assert got == ("length: a number of 401 digits is too large "
                       "(the largest is about 1.8e308)")
    assert udf.sway_exact_period(10**300, 10.0) == udf.sway_exact_period(1e300, 10.0)

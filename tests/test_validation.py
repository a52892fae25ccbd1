# SPDX-License-Identifier: MIT
"""Argument checks of the engine (functions._validation).

Every refusal is a ValueError naming the argument, the offending value and the valid range with
its unit, in the form the module documents (``length=-2.0 must be in (0, inf) [m]``): an open
end in parentheses, a closed end in brackets, an infinite end always open (interval notation,
common practice, no source). Each message is matched by its own ``pytest.raises``.
"""
from __future__ import annotations

import math
import warnings

import numpy as np
import pytest

from functions._validation import (as_array, broadcast, check_range, interval_text,
                                   scalar_or_array)

INF = math.inf


# ----------------------------------------------------------------------------- interval text
@pytest.mark.parametrize("low, high, low_open, high_open, text", [
    (0.0, 1.0, False, False, "[0, 1]"),
    (0.0, 1.0, True, False, "(0, 1]"),
    (0.0, 180.0, False, True, "[0, 180)"),
    (0.0, 0.2, True, True, "(0, 0.2)"),
    (0.0, INF, False, False, "[0, inf)"),            # an infinite end is never attained
    (-INF, 1.0, False, False, "(-inf, 1]"),
    (-INF, INF, False, False, "(-inf, inf)"),
    (9.7, 9.9, False, False, "[9.7, 9.9]"),
    (0.0, 1e11, True, False, "(0, 1e+11]"),
])
def test_interval_text(low, high, low_open, high_open, text):
    assert interval_text(low, high, low_open, high_open) == text


# ----------------------------------------------------------------------------- check_range: ends
def test_closed_ends_accept_the_end_values():
    assert check_range("x", 0.0, 0.0, 1.0) == 0.0
    assert check_range("x", 1.0, 0.0, 1.0) == 1.0
    np.testing.assert_array_equal(check_range("x", [0.0, 0.5, 1.0], 0.0, 1.0), [0.0, 0.5, 1.0])


def test_open_low_end_refuses_its_value():
    with pytest.raises(ValueError, match=r"^length=0\.0 must be in \(0, inf\) \[m\]$"):
        check_range("length", 0.0, 0.0, low_open=True, unit="m")


def test_open_high_end_refuses_its_value():
    with pytest.raises(ValueError, match=r"^amplitude_deg=180\.0 must be in \[0, 180\) \[deg\]$"):
        check_range("amplitude_deg", 180, 0.0, 180.0, high_open=True, unit="deg")


def test_closed_low_end_refuses_just_below():
    with pytest.raises(ValueError, match=r"^x=-1e-07 must be in \[0, 1\]$"):
        check_range("x", -1e-7, 0.0, 1.0)


def test_closed_high_end_refuses_just_above():
    with pytest.raises(ValueError, match=r"^mass_ratio=0\.2000001 must be in \(0, 0\.2\] \[-\]$"):
        check_range("mass_ratio", 0.2000001, 0.0, 0.2, low_open=True, unit="-")


def test_infinite_high_end_is_shown_open():
    with pytest.raises(ValueError, match=r"^x=-1\.0 must be in \[0, inf\)$"):
        check_range("x", -1, 0.0)


def test_infinite_low_end_is_shown_open():
    with pytest.raises(ValueError, match=r"^x=2\.0 must be in \(-inf, 1\]$"):
        check_range("x", 2, high=1.0)


def test_first_value_out_of_range_is_named():
    with pytest.raises(ValueError, match=r"^x=-2\.0 must be in \[0, inf\)$"):
        check_range("x", [[1, -2], [-3, 4]], 0.0)


def test_values_and_types_returned():
    out = check_range("x", 3)
    assert isinstance(out, np.ndarray) and out.dtype == np.float64 and out.shape == ()
    assert check_range("x", [1, 2], 0.0).dtype == np.float64
    a = np.array([1.0, 2.0])
    assert check_range("x", a, 0.0) is a                  # float64 arrays are not copied
    np.testing.assert_array_equal(check_range("x", np.float32(0.5), 0.0, 1.0), 0.5)


# ----------------------------------------------------------------------------- refusals
@pytest.mark.parametrize("value, shown", [
    (math.nan, "nan"), (math.inf, "inf"), (-math.inf, "-inf"), (np.float64("nan"), "nan")])
def test_non_finite_scalar_refused(value, shown):
    with pytest.raises(ValueError, match=rf"^x={shown} must be a finite number$"):
        check_range("x", value)


def test_non_finite_element_refused_before_the_range():
    # a NaN or inf is named even when another element is out of range
    with pytest.raises(ValueError, match=r"^x=inf must be a finite number$"):
        check_range("x", [1.0, math.inf, -5.0], 0.0)


def test_nan_refused_in_a_range_it_would_not_fail():
    with pytest.raises(ValueError, match=r"^x=nan must be a finite number$"):
        check_range("x", [-5.0, math.nan], 0.0)


@pytest.mark.parametrize("value, shown", [
    ("abc", "'abc'"), ("1.5", "'1.5'"), (b"1", "b'1'"), (None, "None"),
    ([1, "a"], r"\[1, 'a'\]"), ({"a": 1}, r"\{'a': 1\}")])
def test_text_and_other_objects_refused(value, shown):
    with pytest.raises(ValueError, match=rf"^x={shown} must be a finite number$"):
        check_range("x", value)


@pytest.mark.parametrize("value, shown", [
    (True, "True"), (False, "False"), (np.bool_(True), r"(np\.)?True_?"),
    ([True, False], r"\[True, False\]")])
def test_booleans_refused(value, shown):
    # a spreadsheet TRUE is 1 in arithmetic; the engine refuses it rather than guess
    with pytest.raises(ValueError, match=rf"^flag={shown} must be a finite number$"):
        check_range("flag", value)


def test_text_array_refused():
    with pytest.raises(ValueError, match=r"^x=array\(\['1'\], dtype='<U1'\) must be a finite"):
        check_range("x", np.array(["1"]))


def test_dates_refused():
    with pytest.raises(ValueError, match=r"^x=.*datetime64.* must be a finite number$"):
        check_range("x", np.datetime64("2026-01-01"))


def test_complex_numbers_refused():
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", np.exceptions.ComplexWarning)
        with pytest.raises(ValueError, match=r"^x=\(1\+2j\) must be a finite number$"):
            check_range("x", 1 + 2j)


# ----------------------------------------------------------------------------- as_array
def test_as_array_converts_numbers():
    out = as_array("x", 3)
    assert out.dtype == np.float64 and out.shape == () and out == 3.0
    np.testing.assert_array_equal(as_array("x", [[1, 2], [3, 4]]), [[1.0, 2.0], [3.0, 4.0]])
    np.testing.assert_array_equal(as_array("x", [-1e300, 0.0]), [-1e300, 0.0])  # no range


def test_as_array_refuses_nan():
    with pytest.raises(ValueError, match=r"^x=nan must be a finite number$"):
        as_array("x", [1.0, math.nan])


def test_as_array_refuses_text():
    with pytest.raises(ValueError, match=r"^x='2' must be a finite number$"):
        as_array("x", "2")


def test_as_array_refuses_a_boolean():
    with pytest.raises(ValueError, match=r"^x=False must be a finite number$"):
        as_array("x", False)


# ----------------------------------------------------------------------------- broadcast
def test_broadcast_gives_common_shapes():
    a, b, c = broadcast(length=np.ones(3), g=9.8, mass=np.ones((2, 1)))
    assert a.shape == b.shape == c.shape == (2, 3)
    assert float(b[1, 2]) == 9.8


def test_broadcast_error_names_every_argument_and_shape():
    with pytest.raises(ValueError, match=r"^arrays do not broadcast together: length\(3,\), "
                                         r"g\(\), mass\(2, 2\)$"):
        broadcast(length=np.ones(3), g=9.8, mass=np.ones((2, 2)))


# ----------------------------------------------------------------------------- scalar_or_array
def test_scalar_or_array():
    for x in (np.array(2.5), np.float64(2.5), 2.5, 2):
        out = scalar_or_array(x)
        assert type(out) is float and out == float(x)
    arr = scalar_or_array([1, 2])
    assert isinstance(arr, np.ndarray) and arr.dtype == np.float64
    np.testing.assert_array_equal(arr, [1.0, 2.0])
    one = scalar_or_array(np.array([2.5]))                 # one element is still an array
    assert isinstance(one, np.ndarray) and one.shape == (1,)

# SPDX-License-Identifier: MIT
"""Tests of functions.structure against EN 1991-1-4 Annex F values and textbook relations."""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad

from functions.structure import (
    MODE_SHAPE_EXPONENTS,
    STRUCTURAL_LOG_DECREMENTS,
    annex_f_frequency,
    damping_from_log_decrement,
    log_decrement_from_damping,
    modal_mass,
    power_law_modal_mass,
    power_law_mode_shape,
)


# ---------------------------------------------------------------------------------------------
# EN 1991-1-4:2005 Annex F
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("height, freq", [(60.0, 46 / 60), (100.0, 0.46), (200.0, 0.23),
                                          (460.0, 0.1)])
def test_annex_f_frequency(height, freq):
    # EN 1991-1-4 (F.2): n1 = 46/h for h > 50 m (from memory, high confidence)
    assert annex_f_frequency(height) == pytest.approx(freq, rel=1e-15)


def test_mode_shape_exponents():
    # EN 1991-1-4 (F.3) list (from memory, medium-high confidence)
    assert sorted(MODE_SHAPE_EXPONENTS.values()) == [0.6, 1.0, 1.5, 2.0, 2.5]
    assert MODE_SHAPE_EXPONENTS["slender_frame_non_load_sharing_walls"] == 0.6
    assert MODE_SHAPE_EXPONENTS["core_and_peripheral_columns_or_braced"] == 1.0
    assert MODE_SHAPE_EXPONENTS["slender_cantilever_or_central_concrete_core"] == 1.5
    assert MODE_SHAPE_EXPONENTS["tower_or_chimney"] == 2.0
    assert MODE_SHAPE_EXPONENTS["lattice_steel_tower"] == 2.5


def test_structural_log_decrements():
    # EN 1991-1-4 Table F.2: steel 0.05 (confirmed in a worked example); RC 0.10, mixed 0.08
    # (from memory)
    assert STRUCTURAL_LOG_DECREMENTS == {"steel_building": 0.05, "mixed_building": 0.08,
                                         "reinforced_concrete_building": 0.10}


@pytest.mark.parametrize("exponent", sorted(MODE_SHAPE_EXPONENTS.values()))
def test_power_law_mode_shape(exponent):
    z = np.array([0.0, 50.0, 100.0, 200.0])
    got = power_law_mode_shape(z, 200.0, exponent)
    assert got == pytest.approx((z / 200.0) ** exponent, rel=1e-15)
    assert got[-1] == 1.0 and got[0] == 0.0


@pytest.mark.parametrize("exponent", sorted(MODE_SHAPE_EXPONENTS.values()))
def test_power_law_modal_mass_against_quadrature(exponent):
    # computed: scipy.integrate.quad of m (z/h)^(2 zeta) over the height
    m, h = 8.0e4, 250.0
    ref, _ = quad(lambda z: m * (z / h) ** (2 * exponent), 0.0, h, epsabs=0, epsrel=1e-13)
    assert power_law_modal_mass(m, h, exponent) == pytest.approx(ref, rel=1e-12)


@pytest.mark.parametrize("exponent", [0.6, 1.0, 1.5, 2.0])
def test_modal_mass_of_many_floors_tends_to_the_integral(exponent):
    # lumped floors at mid-storey heights: midpoint rule of the integral, error O(1/n^2)
    n, h, m_floor = 2000, 300.0, 1.5e6
    z = (np.arange(n) + 0.5) * h / n
    phi = (z / h) ** exponent
    got = modal_mass(np.full(n, m_floor), phi) * phi[-1] ** 2   # renormalise to the top
    assert got == pytest.approx(power_law_modal_mass(m_floor * n / h, h, exponent), rel=1e-5)


def test_modal_mass_normalisation_at_damper():
    m = [2e6, 2e6, 1e6]
    phi = np.array([0.3, 0.7, 1.0])
    top = modal_mass(m, phi)
    # invariant to the scaling of the mode shape
    assert modal_mass(m, 3.7 * phi) == pytest.approx(top, rel=1e-15)
    # a damper at level 1 (phi = 0.7) sees M* / 0.7^2
    assert modal_mass(m, phi, damper_level=1) == pytest.approx(top / 0.49, rel=1e-15)
    hand = (2e6 * 0.09 + 2e6 * 0.49 + 1e6 * 1.0)
    assert top == pytest.approx(hand, rel=1e-15)


def test_modal_mass_batched():
    m = np.array([[1e6, 1e6], [2e6, 1e6]])
    got = modal_mass(m, [0.5, 1.0])
    assert got == pytest.approx([1.25e6, 1.5e6], rel=1e-15)


# ---------------------------------------------------------------------------------------------
# logarithmic decrement: delta = 2 pi zeta (EN 1991-1-4 Annex F, confirmed form) and exact
# delta = 2 pi zeta / sqrt(1 - zeta^2) (Clough & Penzien, Dynamics of Structures, 1993, §2-7)
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("delta", [0.0, 0.05, 0.08, 0.1, 1.0])
def test_log_decrement_round_trip(delta):
    z = damping_from_log_decrement(delta)
    assert z == pytest.approx(delta / (2 * math.pi), rel=1e-15)
    assert log_decrement_from_damping(z) == pytest.approx(delta, rel=1e-15, abs=0)
    ze = damping_from_log_decrement(delta, exact=True)
    assert log_decrement_from_damping(ze, exact=True) == pytest.approx(delta, rel=1e-14, abs=0)


def test_exact_log_decrement_from_free_decay():
    # computed: ratio of successive peaks of x = exp(-zeta w t) cos(w_d t)
    zeta = 0.05
    wd = math.sqrt(1 - zeta ** 2)
    delta = math.log(1.0 / math.exp(-zeta * 2 * math.pi / wd))
    assert log_decrement_from_damping(zeta, exact=True) == pytest.approx(delta, rel=1e-14)
    assert damping_from_log_decrement(delta, exact=True) == pytest.approx(zeta, rel=1e-14)


@settings(max_examples=50, deadline=None)
@given(st.floats(0.0, 0.5))
def test_forms_differ_by_known_factor(zeta):
    exact = log_decrement_from_damping(zeta, exact=True)
    approx = log_decrement_from_damping(zeta)
    assert exact == pytest.approx(approx / math.sqrt(1 - zeta ** 2), rel=1e-14, abs=1e-300)


# ---------------------------------------------------------------------------------------------
# bad inputs
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("call, match", [
    (lambda: annex_f_frequency(50.0), r"building_height=50\.0 must be in \(50, inf\) \[m\]"),
    (lambda: annex_f_frequency(-10.0), r"building_height=-10\.0"),
    (lambda: power_law_mode_shape(210.0, 200.0, 1.0), r"height=210\.0 must be in \[0, "
                                                        r"building_height\] = \[0, 200\]"),
    (lambda: power_law_mode_shape(-1.0, 200.0, 1.0), r"height=-1\.0 must be in \[0, inf\)"),
    (lambda: power_law_mode_shape(10.0, 0.0, 1.0), r"building_height=0\.0"),
    (lambda: power_law_mode_shape(10.0, 200.0, 0.0), r"exponent=0\.0 must be in \(0, inf\)"),
    (lambda: power_law_mode_shape([1.0, 2.0], 200.0, [1.0, 2.0, 3.0]), r"do not broadcast"),
    (lambda: power_law_modal_mass(0.0, 200.0, 1.0), r"mass_per_height=0\.0"),
    (lambda: modal_mass([1.0, -1.0], [0.5, 1.0]), r"floor_masses=-1\.0 must be in \[0, inf\)"),
    (lambda: modal_mass([0.0, 0.0], [0.5, 1.0]), r"floor_masses must not all be 0"),
    (lambda: modal_mass([1.0, 1.0], [0.5, 0.0]), r"mode_shape at damper_level=-1 is 0"),
    (lambda: modal_mass([1.0, 1.0], [0.5, 1.0], damper_level=2), r"damper_level=2 must be in"),
    (lambda: modal_mass([1.0, 1.0], [0.5, 1.0], damper_level=1.5), r"damper_level=1\.5 must be"),
    (lambda: modal_mass([1.0, 1.0], [0.5, 1.0, 1.0]), r"do not broadcast"),
    (lambda: modal_mass(1.0, 1.0), r"last axis"),
    (lambda: modal_mass([1.0, 1.0], [0.5, float("nan")]), r"mode_shape=nan must be a finite"),
    (lambda: damping_from_log_decrement(-0.1), r"log_decrement=-0\.1 must be in \[0, inf\)"),
    (lambda: log_decrement_from_damping(1.0), r"damping_ratio=1\.0 must be in \[0, 1\)"),
])
def test_bad_inputs(call, match):
    with pytest.raises(ValueError, match=match):
        call()

# SPDX-License-Identifier: MIT
"""Hangers, mass block, stages, space and buffers (functions.suspension).

References, named beside each check:
* the hanger tension against a time-domain integration written here (scipy's solve_ivp) of
  the free pendulum theta'' = -(g/L) sin theta, its tension m (g cos theta + L theta'^2) from
  the radial equation of motion (J. L. Meriam, L. G. Kraige, Engineering Mechanics: Dynamics,
  any edition, normal-tangential coordinates);
* volumes, heights, stages, spaces, stretch and buffers by hand formulas (statics, geometry,
  Hooke's law, energy), and the folded length against functions.pendulum.
folded_pendulum_length (stages in series act as one pendulum of the summed length).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from functions.pendulum import folded_pendulum_length
from functions.suspension import (SUSPENSION_FORMS, buffer_contact, hanger_stretch,
                                  hanger_tension, mass_block, minimum_breaking_load,
                                  pendulum_stages, stretch_frequency_error, swing_space)
from functions.worksheet import form_of

G = 9.80665


def _simulated_peak_tension(m, length, theta0_deg):
    """Largest tension over one swing of the free pendulum released at theta0 (time domain)."""
    w0 = math.sqrt(G / length)

    def rhs(_t, y):
        return [y[1], -w0 ** 2 * math.sin(y[0])]

    sol = solve_ivp(rhs, (0.0, 2.5 * 2 * math.pi / w0), [math.radians(theta0_deg), 0.0],
                    rtol=1e-11, atol=1e-12, dense_output=True, max_step=0.01)
    t = np.linspace(0.0, sol.t[-1], 200001)
    theta, rate = sol.sol(t)
    return float(np.max(m * (G * np.cos(theta) + length * rate ** 2)))


@pytest.mark.parametrize("theta0", [2.0, 10.0, 25.0, 60.0])
def test_peak_tension_against_a_time_domain_integration(theta0):
    m, length = 2.0e5, 8.0
    peak = _simulated_peak_tension(m, length, theta0)
    assert hanger_tension(m, theta0, 1, G) == pytest.approx(peak, rel=1e-7)
    assert hanger_tension(m, theta0, 4, G) == pytest.approx(peak / 4, rel=1e-7)


def test_static_tension_breaking_load_and_stretch():
    assert hanger_tension(287e3, 0.0, 4) == pytest.approx(287e3 * G / 4, rel=1e-15)
    assert minimum_breaking_load(183103.0, 4.0) == pytest.approx(732412.0)
    # Hooke's law: delta = T L / (E A)
    assert hanger_stretch(703627.0, 11.29, 1.2e9) == pytest.approx(703627 * 11.29 / 1.2e9)
    # cut to L, stretched to L + delta: f ~ 1/sqrt(length), so sqrt(L / (L + delta)) - 1
    err = stretch_frequency_error(11.29, 0.00662)
    assert err == pytest.approx(math.sqrt(11.29 / 11.29662) - 1, rel=1e-12)
    assert err == pytest.approx(-0.00662 / (2 * 11.29), rel=1e-3)    # first order


def test_mass_block_and_space_by_hand():
    b = mass_block(287e3, 7850.0, 4.0, 4.0)
    assert b.volume == pytest.approx(287e3 / 7850, rel=1e-15)
    assert b.height == pytest.approx(287e3 / 7850 / 16, rel=1e-15)
    concrete = mass_block(287e3, 2500.0, 6.0, 5.0)            # EN 1991-1-1 Table A.1
    assert concrete.height == pytest.approx(287e3 / 2500 / 30, rel=1e-15)
    assert swing_space(4.0, 1.2) == pytest.approx(6.4)


@pytest.mark.parametrize("length, height, block, count", [
    (11.29, 6.0, 2.285, 4), (5.0, 9.0, 2.0, 1), (7.0, 9.0, 2.0, 1), (14.0, 9.0, 2.0, 2)])
def test_stages_fit_the_height(length, height, block, count):
    s = pendulum_stages(length, height, block)
    assert int(s.count) == count == max(1, math.ceil(length / (height - block)))
    assert s.stage_length == pytest.approx(length / count)
    assert s.vertical_space == pytest.approx(length / count + block)
    assert s.vertical_space <= height + 1e-12
    assert folded_pendulum_length([s.stage_length] * count) == pytest.approx(length)


def test_buffer_takes_the_contact_energy():
    r = buffer_contact(1.84927, 287e3, 2.0e6)
    energy = 0.5 * 287e3 * 1.84927 ** 2
    assert 0.5 * 2.0e6 * r.deflection ** 2 == pytest.approx(energy, rel=1e-13)
    assert r.force == pytest.approx(2.0e6 * r.deflection, rel=1e-13)
    assert buffer_contact(0.0, 287e3, 2.0e6).force == 0.0


def test_the_twins_formulas_read_the_chains_names():
    for name, form in SUSPENSION_FORMS.items():
        assert form_of(form) is not None, name
    with pytest.raises(ValueError, match="available_height"):
        SUSPENSION_FORMS["stage_count"](pendulum_length=7.0, available_height=1.0,
                                        block_height=1.2)


@pytest.mark.parametrize("call, message", [
    (lambda: hanger_tension(287e3, 10.0, 0), "hanger_count=0"),
    (lambda: hanger_tension(-1.0, 10.0, 4), "damper_mass=-1.0"),
    (lambda: minimum_breaking_load(1e5, 0.5), "safety_factor=0.5"),
    (lambda: mass_block(287e3, -7850.0, 4.0, 4.0), "density=-7850.0"),
    (lambda: pendulum_stages(7.0, 2.0, 2.5), "available_height=2.0"),
    (lambda: hanger_stretch(1e5, 10.0, 0.0), "axial_stiffness=0.0"),
    (lambda: buffer_contact(1.0, 287e3, -5.0), "buffer_stiffness=-5.0"),
])
def test_bad_inputs_name_the_argument(call, message):
    with pytest.raises(ValueError, match=message):
        call()

# SPDX-License-Identifier: MIT
"""retune_for_swing: the hanger retuned for a design swing, with the same dashpot.

References used here: functions.pendulum.equivalent_length (exact period, A&S §17.2) and the
white-noise optimum of Warburton (1982). Demo data are invented.
"""
from __future__ import annotations

import math

import pytest
from simulation_reference import DEMO, FS, G, M, MD, ZS

from functions.pendulum import equivalent_length
from functions.simulation import HarmonicForce, retune_for_swing

LOAD = HarmonicForce(1e4, 0.2)


def test_retune_for_swing():
    # Den Hartog-type optimum for white-noise force, mu = 0.02 (Warburton 1982, from memory):
    # f = sqrt(1 + mu/2)/(1 + mu) = 0.9853, zeta_d = 0.0704; hanger cut to the small-angle length.
    f_t = 0.9853 * FS
    L0 = equivalent_length(f_t, 0.0)
    c = retune_for_swing(M, FS, ZS, MD, L0, 0.0704, HarmonicForce(1e5, 0.2), 25.0, 100.0,
                         warmup=300.0)
    assert c.retuned_length == pytest.approx(equivalent_length(f_t, 25.0), rel=1e-9)
    assert c.retuned_length < c.length
    assert c.target_frequency == pytest.approx(f_t, rel=1e-12)
    # same dashpot: c_d = 2 zeta m omega_d(L) unchanged
    cd0 = 2 * c.damper_damping * MD * math.sqrt(G / c.length)
    cd1 = 2 * c.retuned_damper_damping * MD * math.sqrt(G / c.retuned_length)
    assert cd1 == pytest.approx(cd0, rel=1e-12)
    assert abs(c.retuned_mistuning) < abs(c.mistuning)
    assert c.acceleration_ratio < 1.0
    assert c.after.damper_frequency > c.before.damper_frequency
    # None -> the swing of the first simulation
    d = retune_for_swing(M, FS, ZS, MD, L0, 0.0704, HarmonicForce(1e5, 0.2), None, 20.0,
                         warmup=0.0)
    assert d.design_swing_deg == pytest.approx(d.before.nonlinear.swing_deg)


def test_retune_rejects_bad_input():
    with pytest.raises(ValueError, match=r"design_swing_deg=95\.0 must be in \[0, 90\] \[deg\]"):
        retune_for_swing(*DEMO, LOAD, 95.0, 10.0)

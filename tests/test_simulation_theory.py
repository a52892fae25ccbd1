# SPDX-License-Identifier: MIT
"""Frequency-domain random response against outside references.

References used here: scipy.integrate.quad of |H|^2 S_F with the textbook 2-DOF transfer
functions (tests/simulation_reference.py), the closed-form white-noise variance of
functions.damper (Newland, Random Vibrations, 3rd ed. 1993, App. 1) and the narrow-band scatter
formula of Bendat & Piersol. Demo data are invented.
"""
from __future__ import annotations

import math

import pytest
from simulation_reference import DEMO, FS, G, L, M, MD, ZD, ZS, quad_variance

from functions.simulation import random_response_theory


def test_theory_equals_frequency_domain_quadrature():
    rms, fc = 2e4, 0.15
    th = random_response_theory(*DEMO, rms, fc, 600.0)
    assert th.displacement_rms**2 == pytest.approx(quad_variance("x", rms, fc, *DEMO), rel=1e-7)
    assert th.stroke_rms**2 == pytest.approx(quad_variance("u", rms, fc, *DEMO), rel=1e-7)
    assert th.acceleration_rms**2 == pytest.approx(quad_variance("a", rms, fc, *DEMO), rel=1e-7)


def test_theory_white_limit_matches_damper_engine():
    damper = pytest.importorskip("functions.damper")
    mu, f = MD / M, math.sqrt(G / L) / (2 * math.pi) / FS
    # corner frequency 2000 x f_s: the force is white across the building's band to ~1e-6
    th = random_response_theory(*DEMO, 1e4, 2000 * FS, 600.0)
    assert th.effective_damping == pytest.approx(damper.effective_damping(mu, f, ZD, ZS),
                                                 rel=1e-5)
    assert th.stroke_rms / th.displacement_rms == pytest.approx(
        damper.stroke_ratio(mu, f, ZD, ZS), rel=1e-5)


def test_scatter_matches_narrow_band_formula():
    # Bare lightly damped oscillator under white force: relative std of the mean square is
    # 1/sqrt(zeta omega T) (Bendat & Piersol 2010, ch. 8, narrow-band approximation, from
    # memory), so the RMS scatter is half that. A negligible damper (1e-9 of M) leaves the mode
    # bare; the approximation is good to O(zeta).
    zs, T = 0.01, 3600.0
    th = random_response_theory(M, FS, zs, 1e-3, L, 0.5, 1.0, 100 * FS, T)
    expected = 0.5 / math.sqrt(zs * 2 * math.pi * FS * T)
    assert th.displacement_rms_scatter == pytest.approx(expected, rel=0.02)


def test_theory_rejects_bad_input():
    with pytest.raises(ValueError, match=r"duration=0\.0 must be in \(0, inf\) \[s\]"):
        random_response_theory(*DEMO, 1.0, 0.2, duration=0.0)

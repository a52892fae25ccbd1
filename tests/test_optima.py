# SPDX-License-Identifier: MIT
"""Tests of the numerical optima (functions.optima, through functions.damper.optimal_tuning).

Confidence labels as defined in tests/test_damper.py: "confirmed" (seen in a public document),
"from memory" (recalled, not checked against the printed page), "computed" (reproduced here
with scipy). The damped optima are checked against the undamped closed forms and by routes
independent of the engine (Nelder-Mead on a Lyapunov variance, brute-force peak search;
tests/damper_references.py).
"""
from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import minimize

from functions import optima
from functions.damper import effective_damping, optimal_tuning

from damper_references import amplification_cramer, lyapunov_variances, true_peak


# ---------------------------------------------------------------------------------------------
# numerical optima
# ---------------------------------------------------------------------------------------------
@pytest.mark.parametrize("mu", [1e-4, 0.005, 0.02, 0.1, 0.5, 2.0])
def test_h2_undamped_equals_warburton(mu):
    # Warburton (1982) white-noise force, see tests/test_damper.py; tolerance: rounding only
    f, zd = optimal_tuning(mu, "h2")
    fw, zw = optimal_tuning(mu, "white_noise_force")
    assert f == pytest.approx(fw, rel=1e-12)
    assert zd == pytest.approx(zw, rel=1e-10)


@pytest.mark.parametrize("mu", [1e-4, 0.005, 0.02, 0.1, 0.5, 2.0])
def test_hinf_undamped_equals_nishihara_asami(mu):
    # Nishihara & Asami, J. Vib. Acoust. 124:576-582 (2002): paper confirmed, damping formula
    # from memory and verified numerically, f and H derived by computation
    f, zd = optimal_tuning(mu, "hinf")
    fn, zn = optimal_tuning(mu, "nishihara_asami")
    assert f == pytest.approx(fn, rel=1e-10)
    assert zd == pytest.approx(zn, rel=1e-8)


@pytest.mark.parametrize("mu, zs", [(0.005, 0.01), (0.02, 0.02), (0.05, 0.05), (0.2, 0.1),
                                    (0.01, 0.2)])
def test_h2_damped_against_scipy(mu, zs):
    # computed: Nelder-Mead on the Lyapunov variance (independent of the module's formula)
    def obj(p):
        return math.log(lyapunov_variances(mu, p[0], p[1], zs)[0])
    f, zd = optimal_tuning(mu, "h2", zs)
    res = minimize(obj, [1.0, 0.1], method="Nelder-Mead",
                   options={"xatol": 1e-10, "fatol": 1e-15, "maxiter": 4000})
    assert res.x == pytest.approx([f, zd], rel=1e-5)
    assert obj([f, zd]) <= res.fun + 1e-12


@pytest.mark.parametrize("mu, zs", [(0.02, 0.02), (0.05, 0.05), (0.01, 0.1), (0.2, 0.3)])
def test_hinf_damped_is_local_minimax(mu, zs):
    # computed: every small change of (f, zeta_d) raises the brute-force peak
    f, zd = optimal_tuning(mu, "hinf", zs)
    peak = true_peak(mu, f, zd, zs, amplification_cramer)
    for ang in np.linspace(0.0, 2 * np.pi, 12, endpoint=False):
        df, dz = 1e-4 * np.cos(ang), 1e-4 * np.sin(ang)
        assert true_peak(mu, f * (1 + df), zd * (1 + dz), zs, amplification_cramer) > peak


def test_hinf_damped_against_nelder_mead():
    # computed: Nelder-Mead on the brute-force peak, from a start 1 % / 10 % away
    mu, zs = 0.02, 0.02
    f, zd = optimal_tuning(mu, "hinf", zs)
    res = minimize(lambda p: true_peak(mu, p[0], p[1], zs, amplification_cramer),
                   [f * 1.01, zd * 0.9], method="Nelder-Mead",
                   options={"xatol": 1e-8, "fatol": 1e-12, "maxiter": 400})
    assert true_peak(mu, f, zd, zs, amplification_cramer) <= res.fun * (1 + 1e-9)
    assert res.x == pytest.approx([f, zd], rel=1e-4)


@settings(max_examples=40, deadline=None)
@given(mu=st.floats(1e-3, 0.5), zs=st.floats(0.0, 0.2), df=st.floats(-0.02, 0.02),
       dz=st.floats(-0.2, 0.2))
def test_h2_is_a_maximum_of_effective_damping(mu, zs, df, dz):
    f, zd = optimal_tuning(mu, "h2", zs)
    best = effective_damping(mu, f, zd, zs)
    assert effective_damping(mu, f * (1 + df), zd * (1 + dz), zs) <= best * (1 + 1e-13)


def test_numerical_optima_vectorised():
    mu = np.array([[0.01, 0.02, 0.05]])
    zs = np.array([[0.0], [0.02]])
    for method in ("h2", "hinf"):
        f, zd = optimal_tuning(mu, method, zs)
        assert f.shape == zd.shape == (2, 3)
        for i in range(2):
            for j in range(3):
                fs, zds = optimal_tuning(float(mu[0, j]), method, float(zs[i, 0]))
                assert isinstance(fs, float)
                assert f[i, j] == pytest.approx(fs, rel=1e-12)
                assert zd[i, j] == pytest.approx(zds, rel=1e-10)


def test_numerical_optima_sweep_converges():
    # the whole validated domain, edges included (computed)
    mu = np.concatenate([np.geomspace(1e-4, 2.0, 25)] * 4)
    zs = np.repeat([0.0, 0.05, 0.15, 0.3], 25)
    for method in ("h2", "hinf"):
        f, zd = optimal_tuning(mu, method, zs)
        assert np.all((f > 0.2) & (f < 1.0) & (zd > 0.0) & (zd < 0.6))


@pytest.mark.parametrize("mu", [0.005, 0.02, 0.1, 0.5])
def test_newton_solvers_find_the_optima_from_den_hartog(mu):
    # white-box: the solvers also reach the closed forms (Warburton 1982; Nishihara & Asami
    # 2002) from Den Hartog's design, not only from the answer they are started at in use
    m, z = np.array([mu]), np.array([0.0])
    f0, z0 = optimal_tuning(mu, "den_hartog")
    u, ok = optima._batched_newton(optima._h2_residual,
                                   np.array([[math.log(f0 * f0), math.log(z0 * f0)]]), (m, z))
    assert ok[0]
    fw, zw = optimal_tuning(mu, "white_noise_force")
    assert (math.exp(u[0, 0] / 2), math.exp(u[0, 1]) / math.exp(u[0, 0] / 2)) == pytest.approx(
        (fw, zw), rel=1e-10)
    r = math.sqrt(mu / (2 + mu))
    u0 = np.log([[f0 * f0, z0 * f0, (1 - r) / (1 + mu), (1 + r) / (1 + mu)]])
    u, ok = optima._batched_newton(optima._hinf_residual, u0, (m, z))
    assert ok[0] and optima._hinf_check(u, m, z)[0]
    fn, zn = optimal_tuning(mu, "nishihara_asami")
    f = math.exp(u[0, 0] / 2)
    assert (f, math.exp(u[0, 1]) / f) == pytest.approx((fn, zn), rel=1e-9)

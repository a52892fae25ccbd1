# SPDX-License-Identifier: MIT
"""Independent references for the damper tests (tests/test_damper.py, tests/test_optima.py).

Written here without using the engine: stationary white-noise variances from the state
equations (scipy Lyapunov solver), the amplification from a direct complex solve of the 2x2
dynamic stiffness, and the true peak of the amplification by a dense grid and a bounded
refinement (computed).
"""
from __future__ import annotations

import numpy as np
from scipy.linalg import solve_continuous_lyapunov
from scipy.optimize import minimize_scalar


def lyapunov_variances(mu, f, zd, zs, base=False, modal_mass=1.0, omega_s=1.0, s0=1.0):
    """Stationary variances of (x_s, x_d - x_s) under white noise, from the state equations.

    Dimensional 2-DOF model in coordinates x (structure, relative to ground) and z (damper
    relative to the structure). Force excitation: two-sided spectral density s0 of the force on
    the structure. Base excitation: two-sided density s0 of the ground acceleration. The state
    covariance P solves A P + P A^T + 2 pi B S0 B^T = 0.
    """
    m, md = modal_mass, mu * modal_mass
    k, kd = m * omega_s ** 2, md * (f * omega_s) ** 2
    c, cd = 2 * zs * m * omega_s, 2 * zd * md * f * omega_s
    mass = np.array([[m, 0.0], [md, md]])
    stiff = np.array([[k, -kd], [0.0, kd]])
    damp = np.array([[c, -cd], [0.0, cd]])
    load = np.array([-m, -md]) if base else np.array([1.0, 0.0])
    minv = np.linalg.inv(mass)
    a = np.block([[np.zeros((2, 2)), np.eye(2)], [-minv @ stiff, -minv @ damp]])
    b = np.concatenate([np.zeros(2), minv @ load])[:, None]
    p = solve_continuous_lyapunov(a, -2.0 * np.pi * s0 * (b @ b.T))
    return p[0, 0], p[1, 1]


def amplification(r, mu, f, zd, zs):
    """|x_s| / (F/k) from a direct complex solve of the 2x2 dynamic stiffness (omega_s = 1)."""
    kd, cd = mu * f * f, 2 * zd * mu * f
    dyn = np.array([[1 + 2j * zs * r - r * r, -(kd + 1j * r * cd)],
                    [-mu * r * r, -mu * r * r + kd + 1j * r * cd]])
    x = np.linalg.solve(dyn, np.array([1.0, 0.0]))
    return abs(x[0])


def base_amplification(r, mu, f, zd, zs=0.0):
    """|x_s| / (a_g / omega_s^2) under harmonic base acceleration (direct complex solve)."""
    kd, cd = mu * f * f, 2 * zd * mu * f
    dyn = np.array([[1 + 2j * zs * r - r * r, -(kd + 1j * r * cd)],
                    [-mu * r * r, -mu * r * r + kd + 1j * r * cd]])
    x = np.linalg.solve(dyn, np.array([-1.0, -mu]))
    return abs(x[0])


def amplification_cramer(r, mu, f, zd, zs):
    """Vectorised form of :func:`amplification` (Cramer's rule on the same 2x2 system)."""
    kd, cd = mu * f * f, 2 * zd * mu * f
    d11 = 1 + 2j * zs * r - r * r
    d12 = -(kd + 1j * r * cd)
    d21 = -mu * r * r
    d22 = -mu * r * r + kd + 1j * r * cd
    return np.abs(d22 / (d11 * d22 - d12 * d21))


def true_peak(mu, f, zd, zs, func=amplification):
    """Global maximum of the amplification: dense grid, then a bounded refinement."""
    r = np.linspace(0.2, 1.8, 8001)
    if func is amplification or func is amplification_cramer:
        v = amplification_cramer(r, mu, f, zd, zs)
    else:
        v = np.array([func(x, mu, f, zd, zs) for x in r])
    best = 0.0
    for i in np.flatnonzero((v[1:-1] >= v[:-2]) & (v[1:-1] >= v[2:])) + 1:
        res = minimize_scalar(lambda x: -func(x, mu, f, zd, zs), bounds=(r[i - 1], r[i + 1]),
                              method="bounded", options={"xatol": 1e-10})
        best = max(best, -res.fun)
    return best

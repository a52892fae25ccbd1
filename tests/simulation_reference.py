# SPDX-License-Identifier: MIT
"""Demo system and frequency-domain reference shared by the tests of functions.simulation.

The 2-DOF transfer functions are written here from the textbook equations of a tuned mass
damper, independently of the engine's matrices. Demo data are invented.
"""
from __future__ import annotations

import math

import numpy as np
from scipy.integrate import quad

from functions.pendulum import STANDARD_GRAVITY
from functions.simulation import force_spectrum

G = STANDARD_GRAVITY
# Invented demo building: 0.2 Hz mode, 1e6 kg modal mass, 1 % damping; 2 % damper, 6 m hanger.
M, FS, ZS, MD, L, ZD = 1e6, 0.2, 0.01, 2e4, 6.0, 0.07
DEMO = (M, FS, ZS, MD, L, ZD)


def transfer(f, M, fs, zs, m, L, zd):
    """x/F, u/F of (M+m)x'' + m u'' + C x' + K x = F, m(x'' + u'') + c u' + k u = 0."""
    w = 2 * np.pi * f
    ws, wd = 2 * np.pi * fs, math.sqrt(G / L)
    K, C = M * ws**2, 2 * zs * M * ws
    k, c = m * wd**2, 2 * zd * m * wd
    a11 = K - (M + m) * w**2 + 1j * w * C
    a12 = -m * w**2
    a21 = -m * w**2
    a22 = k - m * w**2 + 1j * w * c
    det = a11 * a22 - a12 * a21
    return a22 / det, -a21 / det


def quad_variance(which, rms, fc, *system):
    def integrand(f):
        hx, hu = transfer(f, *system)
        h = {"x": hx, "u": hu, "a": -(2 * np.pi * f) ** 2 * hx}[which]
        return abs(h) ** 2 * force_spectrum(f, rms, fc)
    fs = system[1]
    pts = [0.5 * fs, 0.9 * fs, fs, 1.1 * fs, 2 * fs]
    total = 0.0
    edges = [0.0, *pts, 50 * fs]
    for a, b in zip(edges[:-1], edges[1:]):
        total += quad(integrand, a, b, limit=400, epsabs=0, epsrel=1e-11)[0]
    total += quad(integrand, 50 * fs, np.inf, limit=400, epsabs=0, epsrel=1e-11)[0]
    return total

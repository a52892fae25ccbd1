# SPDX-License-Identifier: MIT
"""Time integration of the linearised and the exact equations of motion.

Integration
-----------
* Linear systems (with and without the damper) are integrated EXACTLY for the load as
  represented: the state transition over one output step comes from a matrix exponential with a
  first-order hold on the force (as in control texts and ``scipy.signal.lsim``), the harmonic
  case adds the exact steady-state (particular) solution. The recursion is evaluated in blocks
  (matrix products) so an hour of response takes milliseconds.
* The nonlinear system is integrated with the classical fixed-step 4th-order Runge-Kutta method,
  two steps per output interval, and checked by step doubling: a second run with one step per
  interval gives the Richardson estimate |y_h - y_2h| / 15 of the global error of the reported
  run, relative to the peak of x and of theta. If it exceeds ``rtol`` the step is halved and the
  check repeated. ``integrator="solve_ivp"`` runs ``scipy.integrate.solve_ivp`` (DOP853, local
  error control with ``rtol``) instead: slower, kept as the reference.

The equations are those of :mod:`functions.simulation.model`; the loads are represented as in
:mod:`functions.simulation.loads`.
"""
from __future__ import annotations

import math

import numpy as np
from scipy.linalg import expm

from functions.simulation.loads import HarmonicForce, _force_at
from functions.simulation.model import _System, _dashpot_term

__all__ = ["INTEGRATORS"]

#: Integrators accepted by ``simulate`` (see the module notes).
INTEGRATORS = ("rk4", "solve_ivp")

_MAX_SUBSTEPS = 64
_BLOCK = 32


def _foh(A, B, dt):
    """Transition Phi and first-order-hold input vectors: z1 = Phi z0 + G0 F0 + G1 F1."""
    n = A.shape[0]
    E = np.zeros((n + 2, n + 2))
    E[:n, :n] = A * dt
    E[:n, n] = B * dt
    E[n, n + 1] = 1.0
    X = expm(E)
    phi = X[:n, :n]
    g1 = X[:n, n]
    g2 = X[:n, n + 1]
    return phi, g1 - g2, g2


def _recursion(phi, w, z0, block=_BLOCK):
    """z_{k+1} = phi z_k + w_k for k = 0..N-1, in blocks of matrix products; returns (N+1, n)."""
    n = z0.size
    N = w.shape[0]
    if N == 0:
        return z0[None, :].copy()
    J = -(-N // block)
    W = np.zeros((J * block, n))
    W[:N] = w
    P = np.empty((block + 1, n, n))
    P[0] = np.eye(n)
    for i in range(1, block + 1):
        P[i] = phi @ P[i - 1]
    # T[i, :, l, :] = P[i - l] for l <= i (output z_{jB+i+1} from w_{jB+l})
    T = np.zeros((block, n, block, n))
    for i in range(block):
        for l_ in range(i + 1):
            T[i, :, l_, :] = P[i - l_]
    Z = (W.reshape(J, block * n) @ T.reshape(block * n, block * n).T).reshape(J, block, n)
    S = np.empty((J, n))
    s = z0.astype(float).copy()
    PB = P[block]
    for j in range(J):
        S[j] = s
        s = PB @ s + Z[j, -1]
    Z += np.einsum("iab,jb->jia", P[1:], S)
    return np.vstack([z0[None, :], Z.reshape(J * block, n)[:N]])


def _linear_run(A, B, load, tau, forces, z0):
    """Exact linear response on the grid ``tau`` (uniform), returns states (N+1, n)."""
    dt = float(tau[1] - tau[0])
    phi, g0, g1 = _foh(A, B, dt)
    if isinstance(load, HarmonicForce):
        omega = 2.0 * math.pi * load.frequency
        n = A.shape[0]
        if np.min(np.abs(np.linalg.eigvals(A) - 1j * omega)) <= 1e-9 * omega:
            raise np.linalg.LinAlgError("undamped resonance")
        Zc = np.linalg.solve(1j * omega * np.eye(n) - A, B * load.amplitude)
        zp = np.imag(np.exp(1j * omega * tau)[:, None] * Zc[None, :])
        w = np.zeros((tau.size - 1, n))
        return zp + _recursion(phi, w, z0 - zp[0])
    w = forces[:-1, None] * g0[None, :] + forces[1:, None] * g1[None, :]
    return _recursion(phi, w, z0)


def _rk4(p: _System, y0, force, tau, n_sub, first_record, chunk=2048):
    """Fixed-step RK4 with ``n_sub`` steps per interval of the uniform grid ``tau``; ``force(t)``
    gives the force at an array of times. Returns the states at tau[first_record:] as (n, 4)
    [x, v, theta, w].

    The right-hand side (see :func:`_accelerations`) is written out at each of the four stages:
    plain float arithmetic without function calls is about twice as fast in CPython. The force
    at the half steps is evaluated ``chunk`` grid intervals at a time (bounded memory).
    """
    n_out = tau.size - 1
    dt = float(tau[1] - tau[0])
    h = dt / n_sub
    M, m, K, C, g = p.M, p.m, p.K, p.C, p.g
    Mm = M + m
    mL = m * p.L
    iL = 1.0 / p.L
    cdL = p.cd_over_m * p.L
    # the dashpot: linear (c_d v_h), or C |v_h|^alpha sign(v_h), v_h = L cos(theta) theta'
    linear, kC, al, L = not p.exponent_law, p.Cn / m, p.alpha, p.L
    sin, cos, copysign = math.sin, math.cos, math.copysign
    x, v, th, w = (float(y) for y in y0)
    h2 = 0.5 * h
    h6 = h / 6.0
    rows = []
    if first_record == 0:
        rows.append((x, v, th, w))
    for k in range(n_out):
        if k % chunk == 0:
            n_nodes = min(chunk, n_out - k) * 2 * n_sub
            F = force(tau[k] + np.arange(n_nodes + 1) * (0.5 * h)).tolist()
            j = 0
        for _ in range(n_sub):
            # stage 1 at (x, v, th, w)
            s = sin(th)
            c = cos(th)
            r1 = F[j] - C * v - K * x + mL * s * w * w
            r2 = -g * s - (cdL * c * c * w if linear else
                           kC * c * copysign(abs(L * c * w) ** al, c * w))
            q = 1.0 / (M + m * s * s)
            a1 = (r1 - m * c * r2) * q
            b1 = (Mm * r2 - c * r1) * q * iL
            # stage 2 at half step with stage-1 slopes
            fm = F[j + 1]
            v2 = v + h2 * a1
            w2 = w + h2 * b1
            t2 = th + h2 * w
            s = sin(t2)
            c = cos(t2)
            r1 = fm - C * v2 - K * (x + h2 * v) + mL * s * w2 * w2
            r2 = -g * s - (cdL * c * c * w2 if linear else
                           kC * c * copysign(abs(L * c * w2) ** al, c * w2))
            q = 1.0 / (M + m * s * s)
            a2 = (r1 - m * c * r2) * q
            b2 = (Mm * r2 - c * r1) * q * iL
            # stage 3 at half step with stage-2 slopes
            v3 = v + h2 * a2
            w3 = w + h2 * b2
            t3 = th + h2 * w2
            s = sin(t3)
            c = cos(t3)
            r1 = fm - C * v3 - K * (x + h2 * v2) + mL * s * w3 * w3
            r2 = -g * s - (cdL * c * c * w3 if linear else
                           kC * c * copysign(abs(L * c * w3) ** al, c * w3))
            q = 1.0 / (M + m * s * s)
            a3 = (r1 - m * c * r2) * q
            b3 = (Mm * r2 - c * r1) * q * iL
            # stage 4 at full step with stage-3 slopes
            v4 = v + h * a3
            w4 = w + h * b3
            t4 = th + h * w3
            s = sin(t4)
            c = cos(t4)
            r1 = F[j + 2] - C * v4 - K * (x + h * v3) + mL * s * w4 * w4
            r2 = -g * s - (cdL * c * c * w4 if linear else
                           kC * c * copysign(abs(L * c * w4) ** al, c * w4))
            q = 1.0 / (M + m * s * s)
            a4 = (r1 - m * c * r2) * q
            b4 = (Mm * r2 - c * r1) * q * iL
            x += h6 * (v + 2.0 * (v2 + v3) + v4)
            th += h6 * (w + 2.0 * (w2 + w3) + w4)
            v += h6 * (a1 + 2.0 * (a2 + a3) + a4)
            w += h6 * (b1 + 2.0 * (b2 + b3) + b4)
            j += 2
        if k + 1 >= first_record:
            rows.append((x, v, th, w))
    return np.array(rows, dtype=float).reshape(-1, 4)


def _nonlinear_rk4(p, y0, load, tau, forces, first_record, rtol):
    def force(t):
        return _force_at(load, tau, forces, t)

    # Richardson's divisor 2^p - 1 for the method's order p: 4, but a dashpot law |v|^alpha
    # with alpha < 1 is not smooth where v = 0 and the order falls to about 1 + alpha there
    # (conservative: a larger estimate, more steps)
    order = 4.0 if not p.exponent_law else min(4.0, 1.0 + p.alpha)
    richardson = 2.0 ** order - 1.0
    n_sub = 2
    while True:
        try:
            fine = _rk4(p, y0, force, tau, n_sub, first_record)
            coarse = _rk4(p, y0, force, tau, n_sub // 2, first_record)
            finite = np.isfinite(fine).all() and np.isfinite(coarse).all()
        except (ValueError, OverflowError, ZeroDivisionError):
            finite = False
        if not finite:
            raise ValueError("the nonlinear integration diverged (the pendulum is driven far "
                             "beyond any physical swing): reduce the load or raise "
                             "samples_per_period")
        err = 0.0
        for col in (0, 2):
            scale = np.max(np.abs(fine[:, col]))
            if scale > 0:
                err = max(err, float(np.max(np.abs(fine[:, col] - coarse[:, col]))) / richardson
                          / scale)
        if err <= rtol or n_sub >= _MAX_SUBSTEPS:
            return fine, err, n_sub
        n_sub *= 2


def _nonlinear_ivp(p, y0, load, tau, forces, first_record, rtol):
    dt = float(tau[1] - tau[0])
    M, m, L, K, C, g = p.M, p.m, p.L, p.K, p.C, p.g
    fl = forces.tolist() if forces is not None else None
    n_last = tau.size - 1
    if isinstance(load, HarmonicForce):
        F0, Om = load.amplitude, 2.0 * math.pi * load.frequency

        def force(t):
            return F0 * math.sin(Om * t)
    elif load is None:
        def force(t):
            return 0.0
    else:
        def force(t):
            k = min(max(int(t / dt), 0), n_last - 1)
            r = t / dt - k
            return fl[k] + r * (fl[k + 1] - fl[k])

    def rhs(t, y):
        x, v, th, w = y
        s = math.sin(th)
        c = math.cos(th)
        r1 = force(t) - C * v - K * x + m * L * s * w * w
        r2 = -g * s - float(_dashpot_term(p, c, w))
        den = M + m * s * s
        return (v, (r1 - m * c * r2) / den, w, ((M + m) * r2 - c * r1) / (L * den))

    f_scale = (load.amplitude if isinstance(load, HarmonicForce)
               else (load.rms if load is not None else 0.0))
    xs = max(abs(y0[0]), f_scale / K, m * L * abs(y0[2]) / M, 1e-15 * L)
    ths = max(abs(y0[2]), xs / L, 1e-15)
    atol = rtol * np.array([xs, xs * p.ws, ths, ths * p.wd]) * 1e-2
    from scipy.integrate import solve_ivp   # lazy import: only this integrator needs it
    sol = solve_ivp(rhs, (tau[0], tau[-1]), np.asarray(y0, float), method="DOP853",
                    t_eval=tau[first_record:], rtol=rtol, atol=atol)
    if not sol.success:  # pragma: no cover - defensive
        raise ValueError(f"solve_ivp failed: {sol.message}")
    return sol.y.T.copy(), rtol

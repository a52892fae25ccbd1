# SPDX-License-Identifier: MIT
"""Speed of the time-domain damper simulation, against plain solve_ivp in the same run.

Prints simulated seconds per wall-clock second for
  * the linearised coupled system (exact first-order-hold recursion in blocks),
  * the nonlinear system (fixed-step RK4 plus the step-doubling check),
  * a whole ``simulate`` call (linear, nonlinear, bare building, theory, statistics),
and the same for a plain ``scipy.integrate.solve_ivp`` (RK45, rtol=1e-6, force by np.interp)
on identical equations and load, with the ratio ours / reference. Ratios, not absolute times,
are what to compare between machines.

Run: /tmp/venv/bin/python benchmarks/bench_simulation.py [duration_s]
"""
from __future__ import annotations

import math
import sys
import time

import numpy as np
from scipy.integrate import solve_ivp

from functions.simulation import RandomForce, simulate
from functions.simulation.integrators import _linear_run, _nonlinear_rk4
from functions.simulation.model import _system

# Invented demo system: 0.2 Hz mode, M = 1e6 kg, 1 % damping; 2 % damper on a 6 m hanger.
ARGS = (1e6, 0.2, 0.01, 2e4, 6.0, 0.07)
G = 9.80665


def best_of(fn, repeat=3):
    best = math.inf
    out = None
    for _ in range(repeat):
        t0 = time.perf_counter()
        out = fn()
        best = min(best, time.perf_counter() - t0)
    return best, out


def main(duration=3600.0, reference_duration=300.0):
    p = _system(*ARGS, G)
    load = RandomForce(3e4, 0.1, seed=1)
    dt = 1.0 / (32 * max(p.fs, p.wd / (2 * math.pi)))
    n = int(math.ceil(duration / dt))
    dt = duration / n
    tau = np.arange(n + 1) * dt
    forces = load.samples(tau.size, dt)
    A, B = p.coupled()

    t_lin, _ = best_of(lambda: _linear_run(A, B, load, tau, forces, np.zeros(4)))
    t_nl, (_, err, nsub) = best_of(
        lambda: _nonlinear_rk4(p, (0.0, 0.0, 0.0, 0.0), load, tau, forces, 0, 1e-4), repeat=1)
    t_all, res = best_of(lambda: simulate(*ARGS, load, duration, warmup=0.0), repeat=1)

    # plain solve_ivp reference on a shorter record, same equations and force
    m_ref = int(math.ceil(reference_duration / dt))
    tr = tau[: m_ref + 1]
    fr = forces[: m_ref + 1]
    M, m, L, K, C = p.M, p.m, p.L, p.K, p.C
    cdL = p.cd_over_m * L

    def rhs_nl(t, y):
        x, v, th, w = y
        s, c = math.sin(th), math.cos(th)
        r1 = np.interp(t, tr, fr) - C * v - K * x + m * L * s * w * w
        r2 = -G * s - cdL * c * c * w
        den = M + m * s * s
        return [v, (r1 - m * c * r2) / den, w, ((M + m) * r2 - c * r1) / (L * den)]

    def rhs_lin(t, z):
        return A @ z + B * np.interp(t, tr, fr)

    t_ref_nl, _ = best_of(lambda: solve_ivp(rhs_nl, (0, tr[-1]), np.zeros(4), t_eval=tr,
                                            rtol=1e-6, atol=1e-12), repeat=1)
    t_ref_lin, _ = best_of(lambda: solve_ivp(rhs_lin, (0, tr[-1]), np.zeros(4), t_eval=tr,
                                             rtol=1e-6, atol=1e-12), repeat=1)

    rate = lambda T, wall: T / wall  # noqa: E731
    rows = [
        ("linear, exact recursion", rate(duration, t_lin), rate(tr[-1], t_ref_lin)),
        ("nonlinear, RK4 + step doubling", rate(duration, t_nl), rate(tr[-1], t_ref_nl)),
        ("simulate() complete", rate(duration, t_all), rate(tr[-1], t_ref_nl + t_ref_lin)),
    ]
    print(f"system: f_s = {p.fs} Hz, f_d = {p.wd / (2 * math.pi):.4f} Hz, output step "
          f"{dt:.4f} s, record {duration:.0f} s ({n} samples)")
    print(f"nonlinear check: {nsub} RK4 steps per sample, error estimate {err:.1e}; "
          f"swing {res.nonlinear.swing_deg:.2f} deg")
    print(f"reference: plain solve_ivp RK45 rtol=1e-6 over {tr[-1]:.0f} s")
    print(f"{'':34s}{'ours [sim s/s]':>16s}{'solve_ivp [sim s/s]':>21s}{'ratio':>9s}")
    for name, ours, ref in rows:
        print(f"{name:34s}{ours:16.0f}{ref:21.0f}{ours / ref:9.1f}")
    print(f"one hour of response, complete simulate(): {3600.0 / rows[2][1]:.2f} s wall-clock")


if __name__ == "__main__":
    main(float(sys.argv[1]) if len(sys.argv) > 1 else 3600.0)

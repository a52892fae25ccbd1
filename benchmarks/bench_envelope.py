# SPDX-License-Identifier: MIT
"""Speed of the robust tuning over a frequency band against a plain scipy.optimize reference.

Run: ``python benchmarks/bench_envelope.py [--cases 2000] [--reference-cases 20]``.

Prints the time per robust optimum (one scalar call) and per sweep of ``--cases`` random
(mass ratio, structural damping, band) cases, beside the h2 and hinf optima of the same sweep,
with the ratio against a plain reference solved in the same run: ``scipy.optimize.minimize``
(Nelder-Mead, one case at a time) on the least effective damping over 401 points of the band.
The reference is timed on ``--reference-cases`` cases and scaled to the sweep size; the
largest relative difference of the least effective damping between the two answers is printed
too (positive: the engine's is better).
"""
from __future__ import annotations

import argparse
import math
import sys
import time
from pathlib import Path

import numpy as np
from scipy.optimize import minimize

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from functions.damper import effective_damping, optimal_tuning  # noqa: E402
from functions.envelope import robust_tuning  # noqa: E402


def least_damping(mu: float, f: float, zd: float, zs: float, lo: float, hi: float) -> float:
    """Least effective damping over 401 points of the band."""
    r = np.linspace(lo, hi, 401)
    return float(np.min(effective_damping(mu, f / r, zd, zs)))


def reference(mu: float, zs: float, lo: float, hi: float) -> tuple[float, float]:
    """Plain scipy: Nelder-Mead on -ln(least zeta_eff) from the h2 optimum."""
    f0, z0 = optimal_tuning(mu, "h2", zs)
    res = minimize(lambda p: -math.log(least_damping(mu, p[0], abs(p[1]), zs, lo, hi)),
                   [f0, z0], method="Nelder-Mead",
                   options={"xatol": 1e-9, "fatol": 1e-13, "maxiter": 4000})
    return float(res.x[0]), abs(float(res.x[1]))


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--cases", type=int, default=2000)
    parser.add_argument("--reference-cases", type=int, default=20)
    args = parser.parse_args()
    rng = np.random.default_rng(1)
    mu = 10 ** rng.uniform(-2.5, -1.0, args.cases)
    zs = rng.uniform(0.0, 0.03, args.cases)
    lo = rng.uniform(0.8, 0.97, args.cases)
    hi = rng.uniform(1.03, 1.2, args.cases)

    t = time.perf_counter()
    robust_tuning(0.02, 0.9, 1.1, 0.01)
    single = time.perf_counter() - t
    t = time.perf_counter()
    f, zd = robust_tuning(mu, lo, hi, zs)
    sweep = time.perf_counter() - t
    timings = {}
    for method in ("h2", "hinf"):
        t = time.perf_counter()
        optimal_tuning(mu, method, zs)
        timings[method] = time.perf_counter() - t

    n = args.reference_cases
    t = time.perf_counter()
    ref = [reference(mu[i], zs[i], lo[i], hi[i]) for i in range(n)]
    ref_time = (time.perf_counter() - t) / n * args.cases
    gain = max(least_damping(mu[i], f[i], zd[i], zs[i], lo[i], hi[i])
               / least_damping(mu[i], *ref[i], zs[i], lo[i], hi[i]) - 1.0 for i in range(n))
    worst = min(least_damping(mu[i], f[i], zd[i], zs[i], lo[i], hi[i])
                / least_damping(mu[i], *ref[i], zs[i], lo[i], hi[i]) - 1.0 for i in range(n))
    print(f"robust tuning, one call:        {single * 1e3:8.2f} ms")
    print(f"robust tuning, {args.cases} cases:     {sweep * 1e3:8.1f} ms "
          f"({sweep / args.cases * 1e6:.0f} us per case)")
    for method, tm in timings.items():
        print(f"{method:>4} optimum, same cases:     {tm * 1e3:8.1f} ms")
    print(f"Nelder-Mead reference (scaled): {ref_time * 1e3:8.0f} ms  "
          f"ratio {ref_time / sweep:.0f}x")
    print(f"least zeta_eff, engine against reference: {worst:+.2e} to {gain:+.2e} (relative)")


if __name__ == "__main__":
    main()

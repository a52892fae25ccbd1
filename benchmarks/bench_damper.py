# SPDX-License-Identifier: MIT
"""Speed of the numerical damper optima against a plain scipy.optimize reference.

Run: ``python benchmarks/bench_damper.py [--cases 10000] [--reference-cases 100]``.

Prints the time per numerical optimum (one scalar call) and per sweep of ``--cases`` random
(mass ratio, structural damping) cases, for ``h2`` and ``hinf``, with the ratio against a plain
reference solved in the same run: ``scipy.optimize.minimize`` (Nelder-Mead, one case at a time)
on the same objective (closed-form variance for h2; the peak of the frequency response over all
its stationary points for hinf). The reference sweep is timed on ``--reference-cases`` cases and
scaled to the sweep size. The largest difference between the two answers is printed too.
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

from functions.damper import optimal_tuning  # noqa: E402


def variance(mu: float, f: float, zd: float, zs: float) -> float:
    """Normalised displacement variance (same I4 closed form as the engine, written again)."""
    w, g = f * f, zd * f
    a3 = 2 * g * (1 + mu) + 2 * zs
    a2 = w * (1 + mu) + 1 + 4 * zs * g
    a1 = 2 * zs * w + 2 * g
    p = a2 * a3 - a1
    return (w * p + a3 * (4 * g * g - 2 * w) + a1) / (a1 * p - w * a3 * a3)


def peak(mu: float, f: float, zd: float, zs: float) -> float:
    """Largest |x_s/x_st|^2 over the stationary points (np.roots of d|H|^2/dx, x = r^2)."""
    w, g = f * f, zd * f
    a3 = 2 * g * (1 + mu) + 2 * zs
    a2 = w * (1 + mu) + 1 + 4 * zs * g
    a1 = 2 * zs * w + 2 * g
    n = np.poly1d([1.0, 4 * g * g - 2 * w, w * w])
    m = np.poly1d([1.0, -a2, w]) ** 2 + np.poly1d([1.0, 0.0]) * np.poly1d([-a3, a1]) ** 2
    roots = (n.deriv() * m - n * m.deriv()).r
    x = roots[(np.abs(roots.imag) < 1e-9) & (roots.real > 0)].real
    return float(np.max(n(x) / m(x)))


def reference(method: str, mu: float, zs: float) -> tuple[float, float]:
    """Plain scipy: Nelder-Mead from Den Hartog's values, tight tolerances."""
    obj = variance if method == "h2" else peak
    f0, z0 = 1 / (1 + mu), math.sqrt(3 * mu / (8 * (1 + mu)))
    res = minimize(lambda p: math.log(obj(mu, p[0], p[1], zs)), [f0, z0], method="Nelder-Mead",
                   options={"xatol": 1e-10, "fatol": 1e-14, "maxiter": 4000})
    return float(res.x[0]), float(res.x[1])


def timed(fn, repeat: int) -> float:
    best = math.inf
    for _ in range(3):
        t = time.perf_counter()
        for _ in range(repeat):
            fn()
        best = min(best, (time.perf_counter() - t) / repeat)
    return best


def main(argv: list[str] | None = None) -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--cases", type=int, default=10_000)
    ap.add_argument("--reference-cases", type=int, default=20)
    args = ap.parse_args(argv)
    rng = np.random.default_rng(2026)
    mu = 10 ** rng.uniform(math.log10(0.002), math.log10(0.1), args.cases)
    zs = rng.uniform(0.0, 0.05, args.cases)
    k = min(args.reference_cases, args.cases)

    print(f"numerical optima: {args.cases} cases, mu in [0.002, 0.1], zeta_s in [0, 0.05]")
    print(f"{'method':6} {'one optimum':>14} {'scipy ref':>12} {'speed-up':>9}   "
          f"{'sweep':>10} {'scipy ref (scaled)':>19} {'speed-up':>9}   {'max |diff|':>10}")
    for method in ("h2", "hinf"):
        one = timed(lambda: optimal_tuning(0.02, method, 0.01), 50)
        one_ref = timed(lambda: reference(method, 0.02, 0.01), 5)
        t = time.perf_counter()
        f, zd = optimal_tuning(mu, method, zs)
        sweep = time.perf_counter() - t
        t = time.perf_counter()
        ref = np.array([reference(method, mu[i], zs[i]) for i in range(k)])
        sweep_ref = (time.perf_counter() - t) * args.cases / k
        diff = max(np.max(np.abs(ref[:, 0] - f[:k])), np.max(np.abs(ref[:, 1] - zd[:k])))
        print(f"{method:6} {one * 1e3:11.3f} ms {one_ref * 1e3:9.3f} ms {one_ref / one:8.1f}x   "
              f"{sweep:8.3f} s {sweep_ref:16.2f} s {sweep_ref / sweep:8.1f}x   {diff:10.2e}")
    print(f"(scipy reference sweep timed on {k} cases and scaled; diff over those cases)")


if __name__ == "__main__":
    main()

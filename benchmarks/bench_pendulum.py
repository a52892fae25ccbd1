# SPDX-License-Identifier: MIT
"""Cost of exact_period against the bare scipy.special expression, measured in the same run.

Targets (issue 2): our function costs no more than 1.3x the bare expression, and no more than
2 ms per 1e5 values on the project's machine (2 cores). Run: python benchmarks/bench_pendulum.py
"""
from __future__ import annotations

import sys
import timeit

import numpy as np
from scipy.special import ellipk

from functions.pendulum import STANDARD_GRAVITY, exact_period


def bare(length, amplitude_deg, g=STANDARD_GRAVITY):
    return 4.0 * np.sqrt(length / g) * ellipk(np.sin(np.radians(amplitude_deg) / 2.0) ** 2)


def main(n: int = 1_000_000, repeat: int = 7) -> int:
    rng = np.random.default_rng(20261202)
    amplitude = rng.uniform(0.0, 179.0, n)
    length = rng.uniform(1.0, 30.0, n)
    np.testing.assert_allclose(exact_period(length, amplitude), bare(length, amplitude), rtol=1e-12)
    t_ours = min(timeit.repeat(lambda: exact_period(length, amplitude), number=1, repeat=repeat))
    t_bare = min(timeit.repeat(lambda: bare(length, amplitude), number=1, repeat=repeat))
    ratio = t_ours / t_bare
    per_1e5 = t_ours / n * 1e5 * 1e3
    print(f"exact_period on {n:,} values: {t_ours * 1e3:.1f} ms; bare scipy expression "
          f"{t_bare * 1e3:.1f} ms; ratio {ratio:.2f} (target <= 1.3)")
    print(f"per 1e5 values: {per_1e5:.2f} ms (target <= 2 ms)")
    return 0 if (ratio <= 1.3 and per_1e5 <= 2.0) else 1


if __name__ == "__main__":
    sys.exit(main(int(sys.argv[1]) if len(sys.argv) > 1 else 1_000_000))

# SPDX-License-Identifier: MIT
"""Numerical optima of a tuned mass damper on a damped structure (h2, hinf).

The closed-form optima of :mod:`functions.damper` hold for an undamped structure only. This
module finds the optimum for a damped one (structural damping ratio zeta_s > 0):

* ``h2`` — the damper that minimises the variance of the structure's displacement under
  white-noise force, i.e. maximises the variance-equivalent damping
  (:func:`functions.damper.effective_damping`): Newton's method on the gradient of
  ln(zeta_eff), checked to be a maximum (negative-definite Hessian);
* ``hinf`` — the damper that minimises the peak of the structure's displacement amplification
  under harmonic force: Newton's method on the equal-peak minimax conditions, checked against
  every stationary point of the response (roots of a quintic, via companion matrices).

Both are batched Newton solutions vectorised over cases, with a central-difference Jacobian
and continuation in structural damping where a direct start fails; about 0.5-1 ms per case
alone, well under 0.1 ms per case in a sweep (benchmarks/bench_damper.py).

Conventions are those of :mod:`functions.damper`: mass ratio mu = m_d / M*, tuning ratio
f = omega_d / omega_s, and the damper damping ratio on the damper's OWN frequency,
zeta_d = c_d / (2 m_d omega_d) (Warburton's convention). The solvers work in the logarithms of
w = f^2 and g = zeta_d f, in which the coefficients a_3, a_2, a_1, a_0 of the characteristic
polynomial (module docstring of :mod:`functions.damper`) are linear; they return f = sqrt(w)
and zeta_d = g / f.

Dependencies run one way, ``functions.damper -> functions.optima``:
:func:`functions.damper.optimal_tuning` (the public dispatcher over every method) and
:func:`functions.damper.required_mass_ratio` (which inverts the effective damping of the
chosen method's damper) call
:func:`_h2_optimum` and :func:`_hinf_optimum` here, while this module imports nothing from
:mod:`functions.damper`: the caller passes the undamped closed-form optimum as the start
(``white_noise_force`` for h2, ``nishihara_asami`` for hinf) and validates the arguments
against the limits of the numerical optima (``functions.damper.MIN_NUMERICAL_MASS_RATIO``,
``MAX_NUMERICAL_MASS_RATIO``, ``MAX_NUMERICAL_STRUCTURAL_DAMPING``). The module has no public
names (``__all__`` is empty): the optima are reached through ``optimal_tuning(mass_ratio,
"h2" | "hinf", structural_damping)``.
"""
from __future__ import annotations

import numpy as np

__all__: list[str] = []

_FD_STEP = 1e-6


def _batched_newton(residual, u: np.ndarray, args: tuple, maxiter: int = 60,
                    tol: float = 1e-10) -> tuple[np.ndarray, np.ndarray]:
    """Solve ``residual(u, *args) = 0`` for every row of ``u`` (n, k) by Newton's method.

    The Jacobian is a central difference (step 1e-6 in u); the residual itself is exact, so the
    iteration still converges to machine precision, only a little slower than quadratically.
    Steps are clipped to 0.25 in every component (u are logarithms). A row has converged when
    its last (applied) step is below ``tol``; the error left after it is far below rounding.
    Returns ``(u, converged)``.
    """
    n, k = u.shape
    eye = np.eye(k) * _FD_STEP
    args = tuple(a[:, None] for a in args)
    converged = np.zeros(n, dtype=bool)
    active = np.arange(n)
    for _ in range(maxiter):
        ua = u[active]
        pts = np.concatenate([ua[:, None, :], ua[:, None, :] + eye, ua[:, None, :] - eye], axis=1)
        with np.errstate(all="ignore"):
            res = residual(pts, *(a[active] for a in args))
            r0 = res[:, 0, :]
            jac = np.swapaxes((res[:, 1:k + 1, :] - res[:, k + 1:, :]) / (2.0 * _FD_STEP), 1, 2)
            det = np.linalg.det(jac)
        ok = np.isfinite(det) & (det != 0.0) & np.isfinite(r0).all(axis=1)
        step = np.zeros_like(ua)
        if ok.any():
            step[ok] = -np.linalg.solve(jac[ok], r0[ok][..., None])[..., 0]
        big = np.max(np.abs(step), axis=1)
        step *= np.minimum(1.0, 0.25 / np.maximum(big, 1e-300))[:, None]
        u[active] = ua + step
        done = ok & ((big <= tol * np.maximum(1.0, np.max(np.abs(ua), axis=1)))
                     | ((np.max(np.abs(r0), axis=1) <= 1e-13) & (big <= 1e-8)))
        failed = ~ok
        converged[active[done]] = True
        active = active[~(done | failed)]
        if active.size == 0:
            break
    return u, converged


def _h2_residual(u, mu, zs):
    """Gradient of ln(zeta_eff) with respect to (ln f^2, ln zeta_d f): zero at the H2 optimum."""
    w = np.exp(u[..., 0])
    g = np.exp(u[..., 1])
    a3 = 2.0 * g * (1.0 + mu) + 2.0 * zs
    a2 = w * (1.0 + mu) + 1.0 + 4.0 * zs * g
    a1 = 2.0 * zs * w + 2.0 * g
    p = a2 * a3 - a1
    q = 4.0 * g * g - 2.0 * w
    num = w * p + a3 * q + a1
    den = a1 * p - w * a3 * a3
    # derivatives with respect to w and g (the a's are linear in w and g)
    a3w, a3g = 0.0, 2.0 * (1.0 + mu)
    a2w, a2g = 1.0 + mu, 4.0 * zs
    a1w, a1g = 2.0 * zs, 2.0
    pw = a2w * a3 + a2 * a3w - a1w
    pg = a2g * a3 + a2 * a3g - a1g
    num_w = p + w * pw + a3w * q - 2.0 * a3 + a1w
    num_g = w * pg + a3g * q + 8.0 * g * a3 + a1g
    den_w = a1w * p + a1 * pw - a3 * a3 - 2.0 * w * a3 * a3w
    den_g = a1g * p + a1 * pg - 2.0 * w * a3 * a3g
    rw = w * (den_w / den - num_w / num)
    rg = g * (den_g / den - num_g / num)
    return np.stack([rw, rg], axis=-1)


def _hinf_terms(mu, zs, w, g, x):
    """ln|H|^2 at x = (omega/omega_s)^2 and its derivatives in x, w = f^2 and g = zeta_d f."""
    a3 = 2.0 * g * (1.0 + mu) + 2.0 * zs
    a2 = w * (1.0 + mu) + 1.0 + 4.0 * zs * g
    a1 = 2.0 * zs * w + 2.0 * g
    n = (w - x) ** 2 + 4.0 * g * g * x
    r = x * x - a2 * x + w
    i = a1 - a3 * x
    m = r * r + x * i * i
    n_x = -2.0 * (w - x) + 4.0 * g * g
    m_x = 2.0 * r * (2.0 * x - a2) + i * i - 2.0 * x * i * a3
    n_w, n_g = 2.0 * (w - x), 8.0 * g * x
    r_w, r_g = 1.0 - (1.0 + mu) * x, -4.0 * zs * x
    i_w, i_g = 2.0 * zs, 2.0 - 2.0 * (1.0 + mu) * x
    m_w = 2.0 * r * r_w + 2.0 * x * i * i_w
    m_g = 2.0 * r * r_g + 2.0 * x * i * i_g
    return (np.log(n) - np.log(m), n_x / n - m_x / m, n_w / n - m_w / m, n_g / n - m_g / m)


def _hinf_residual(u, mu, zs):
    """Equal-peak minimax conditions in u = ln(f^2, zeta_d f, x1, x2).

    Both x1 and x2 are stationary points of |H|^2, the two peaks are equal and the gradients
    of the two peak heights with respect to the damper parameters are parallel (the minimum of
    the larger of two smooth functions lies where they are equal and their gradients oppose).
    """
    e = np.exp(u)
    w, g, x = e[..., 0], e[..., 1], e[..., 2:]
    # both peaks in one evaluation (last axis: x1, x2)
    l, lx, lw, lg = _hinf_terms(mu[..., None], zs[..., None], w[..., None], g[..., None], x)
    return np.stack([x[..., 0] * lx[..., 0], x[..., 1] * lx[..., 1], l[..., 0] - l[..., 1],
                     w * g * (lw[..., 0] * lg[..., 1] - lg[..., 0] * lw[..., 1])], axis=-1)


def _pmul(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """Product of batched polynomials, coefficients in increasing powers on the last axis."""
    out = np.zeros(a.shape[:-1] + (a.shape[-1] + b.shape[-1] - 1,))
    for i in range(a.shape[-1]):
        out[..., i:i + b.shape[-1]] += a[..., i:i + 1] * b
    return out


def _stationary_peaks(mu, zs, w, g):
    """Largest |H|^2 over all stationary points in x > 0 (batched; via companion matrices)."""
    z = np.zeros_like(w)
    o = np.ones_like(w)
    a3 = 2.0 * g * (1.0 + mu) + 2.0 * zs
    a2 = w * (1.0 + mu) + 1.0 + 4.0 * zs * g
    a1 = 2.0 * zs * w + 2.0 * g
    n = np.stack([w * w, 4.0 * g * g - 2.0 * w, o], axis=-1)
    r = np.stack([w, -a2, o], axis=-1)
    i = np.stack([a1, -a3], axis=-1)
    m = _pmul(r, r) + np.concatenate([z[..., None], _pmul(i, i), z[..., None]], axis=-1)
    nd = n[..., 1:] * np.arange(1, 3)
    md = m[..., 1:] * np.arange(1, 5)
    e = _pmul(nd, m) - _pmul(n, md)
    e = e / e[..., 5:6]  # monic, degree 5
    comp = np.zeros(w.shape + (5, 5))
    comp[..., 1:, :-1] = np.eye(4)
    comp[..., :, -1] = -e[..., :5]
    roots = np.linalg.eigvals(comp)
    real = (np.abs(roots.imag) <= 1e-7 * np.abs(roots)) & (roots.real > 0)
    x = np.where(real, roots.real, 1.0)
    h = _evalpoly(n, x) / _evalpoly(m, x)
    return np.max(np.where(real, h, 0.0), axis=-1)


def _evalpoly(c: np.ndarray, x: np.ndarray) -> np.ndarray:
    out = np.zeros_like(x)
    for j in range(c.shape[-1] - 1, -1, -1):
        out = out * x + c[..., j:j + 1]
    return out


def _continued(residual, check, u0: np.ndarray, mu: np.ndarray, zs: np.ndarray,
               what: str) -> np.ndarray:
    """Newton from ``u0``; where that fails, continuation in structural damping from 0.

    ``u0`` must be a good start for the undamped structure. Failed cases are re-solved along
    zeta_s * k / n, k = 1..n, each step started from the previous solution (n = 8, then 64).
    """
    u, ok = _batched_newton(residual, u0.copy(), (mu, zs))
    ok &= check(u, mu, zs)
    for n in (8, 64):
        bad = np.flatnonzero(~ok)
        if bad.size == 0:
            break
        ub, mub, zsb = u0[bad].copy(), mu[bad], zs[bad]
        okb = np.ones(bad.size, dtype=bool)
        for k in range(1, n + 1):
            ub, okk = _batched_newton(residual, ub, (mub, zsb * (k / n)))
            okb &= okk
        okb &= check(ub, mub, zsb)
        u[bad[okb]] = ub[okb]
        ok[bad[okb]] = True
    if not ok.all():
        j = int(np.flatnonzero(~ok)[0])
        raise RuntimeError(f"{what} optimum not found for mass_ratio={mu[j]!r}, "
                           f"structural_damping={zs[j]!r}")
    return u


def _h2_check(u, mu, zs) -> np.ndarray:
    """True where the stationary point is a maximum of ln(zeta_eff) (Hessian negative)."""
    eye = np.eye(2) * _FD_STEP
    with np.errstate(all="ignore"):
        hp = _h2_residual(u[:, None, :] + eye, mu[:, None], zs[:, None])
        hm = _h2_residual(u[:, None, :] - eye, mu[:, None], zs[:, None])
    hess = (hp - hm) / (2.0 * _FD_STEP)
    det = hess[:, 0, 0] * hess[:, 1, 1] - hess[:, 0, 1] * hess[:, 1, 0]
    return np.isfinite(det) & (det > 0.0) & (hess[:, 0, 0] < 0.0)


def _h2_optimum(mu: np.ndarray, zs: np.ndarray, f0: np.ndarray,
                zd0: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """H2 optimum (f, zeta_d) for each case of the 1-D arrays ``mu``, ``zs``.

    ``f0``, ``zd0``: the undamped optimum (Warburton's white-noise-force form), the start.
    """
    u0 = np.stack([np.log(f0 * f0), np.log(zd0 * f0)], axis=-1)
    u = _continued(_h2_residual, _h2_check, u0, mu, zs, "h2")
    f = np.exp(0.5 * u[:, 0])
    return f, np.exp(u[:, 1]) / f


def _hinf_check(u, mu, zs) -> np.ndarray:
    """True where the equal-peak solution is the minimax: distinct peaks, opposed gradients,
    and no other stationary point of the response higher than the two peaks."""
    w, g, x1, x2 = (np.exp(u[:, j]) for j in range(4))
    with np.errstate(all="ignore"):
        l1, _, l1w, l1g = _hinf_terms(mu, zs, w, g, x1)
        _, _, l2w, l2g = _hinf_terms(mu, zs, w, g, x2)
        top = np.log(_stationary_peaks(mu, zs, w, g))
        return ((np.abs(np.log(x1 / x2)) > 1e-6) & (l1w * l2w + l1g * l2g < 0.0)
                & (top <= l1 + 1e-6))


def _hinf_optimum(mu: np.ndarray, zs: np.ndarray, f0: np.ndarray,
                  zd0: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """H-infinity optimum (f, zeta_d) for each case of the 1-D arrays ``mu``, ``zs``.

    ``f0``, ``zd0``: the undamped optimum (Nishihara & Asami's form), the start.
    """
    root = np.sqrt(mu / (2.0 + mu))
    x1 = (1.0 - root) / (1.0 + mu)            # Den Hartog's fixed points, near the two peaks
    x2 = (1.0 + root) / (1.0 + mu)
    u0 = np.log(np.stack([f0 * f0, zd0 * f0, x1, x2], axis=-1))
    u = _continued(_hinf_residual, _hinf_check, u0, mu, zs, "hinf")
    f = np.exp(0.5 * u[:, 0])
    return f, np.exp(u[:, 1]) / f

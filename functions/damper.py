# SPDX-License-Identifier: MIT
"""Tuned mass damper on one structural mode: optimum, effective damping, stroke.

The structure's mode is a single-degree-of-freedom oscillator (generalised mass M*, natural
frequency omega_s, damping ratio zeta_s) carrying a damper of mass m_d, natural frequency
omega_d and damping ratio zeta_d. Conventions, used everywhere in this module:

* mass ratio ``mu = m_d / M*`` with M* the generalised mass of the mode normalised to a unit
  mode ordinate at the damper;
* tuning ratio ``f = omega_d / omega_s``;
* damper damping ratio on the damper's OWN frequency, ``zeta_d = c_d / (2 m_d omega_d)``
  (Warburton's convention). Den Hartog prints ``c_d / (2 m_d omega_s) = f zeta_d``; his formula is
  converted here.

With time in units of 1/omega_s the structure's displacement per unit static displacement F/k_s
and the damper's displacement relative to the structure are (s = Laplace variable)

.. math::

    \\frac{x_s}{F/k_s} = \\frac{s^2 + 2\\zeta_d f s + f^2}{\\Delta(s)}, \\qquad
    \\frac{x_d - x_s}{F/k_s} = \\frac{-s^2}{\\Delta(s)},

    \\Delta(s) = s^4 + a_3 s^3 + a_2 s^2 + a_1 s + a_0,\\quad
    a_3 = 2\\zeta_d f (1+\\mu) + 2\\zeta_s,\\ a_2 = f^2(1+\\mu) + 1 + 4\\zeta_s\\zeta_d f,\\
    a_1 = 2\\zeta_s f^2 + 2\\zeta_d f,\\ a_0 = f^2.

Under white-noise force the variances follow in closed form from the table of integrals of
squared 4th-order rational spectra (the "I4" entry of Newland, An Introduction to Random
Vibrations, Spectral & Wavelet Analysis, 3rd ed., 1993, Appendix 1; also Crandall & Mark,
Random Vibration in Mechanical Systems, 1963) — printed form quoted from memory and checked in
the tests against an independent state-space (Lyapunov) solution (agreement ~1e-13, tested at
1e-10) and, in 50-digit arithmetic, against mpmath. The engine evaluates the integrals in a
regrouped form free of cancellation (see :func:`effective_damping`), which keeps full double
precision at small mass ratios, where the raw I4 denominator loses about -log10(mu) digits.

The numerical optima (``h2``, ``hinf`` of :func:`optimal_tuning`) are batched Newton solutions,
vectorised over cases, with the undamped closed-form optimum as the start and continuation in
structural damping where a direct start fails; about 0.5-1 ms per case alone, well under 0.1 ms
per case in a sweep (benchmarks/bench_damper.py).
"""
from __future__ import annotations

import math

import numpy as np
from scipy.optimize import brentq

from functions._validation import broadcast, check_range, scalar_or_array
from functions.worksheet import twin

__all__ = [
    "OPTIMAL_TUNING_METHODS",
    "CLOSED_FORM_METHODS",
    "CLOSED_FORMS",
    "damper_mass_ratio",
    "optimal_tuning",
    "displacement_variance_ratio",
    "effective_damping",
    "stroke_ratio",
    "required_damping",
    "required_mass_ratio",
    "peak_factor",
    "frequency_response",
    "MIN_NUMERICAL_MASS_RATIO",
    "MAX_NUMERICAL_MASS_RATIO",
    "MAX_NUMERICAL_STRUCTURAL_DAMPING",
]

#: Closed-form optima, derived for an UNDAMPED structure (structural_damping must be 0).
CLOSED_FORM_METHODS = ("den_hartog", "harmonic_base", "white_noise_force", "white_noise_base",
                       "nishihara_asami")

#: Every method accepted by :func:`optimal_tuning`; ``h2`` and ``hinf`` are numerical and hold for
#: a damped structure.
OPTIMAL_TUNING_METHODS = CLOSED_FORM_METHODS + ("h2", "hinf")

#: Range of mass ratio accepted by the numerical optima (h2, hinf) [-]; practice is 0.005-0.05.
MIN_NUMERICAL_MASS_RATIO = 1e-4
MAX_NUMERICAL_MASS_RATIO = 2.0

#: Largest structural damping accepted by the numerical optima [-].
MAX_NUMERICAL_STRUCTURAL_DAMPING = 0.3

_EULER_GAMMA = 0.5772156649015329


# --------------------------------------------------------------------------------------------
# argument handling
# --------------------------------------------------------------------------------------------


def _mass_ratio(mass_ratio, high: float = math.inf) -> np.ndarray:
    return check_range("mass_ratio", mass_ratio, 0.0, high, low_open=True, unit="-")


def _structural_damping(structural_damping, high: float = 1.0) -> np.ndarray:
    return check_range("structural_damping", structural_damping, 0.0, high,
                       high_open=high >= 1.0, unit="-")


def _system(mass_ratio, tuning_ratio, damper_damping, structural_damping):
    """Validate and broadcast the four parameters of the structure-damper system."""
    mu = _mass_ratio(mass_ratio)
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    zd = check_range("damper_damping", damper_damping, 0.0, unit="-")
    zs = _structural_damping(structural_damping)
    return broadcast(mass_ratio=mu, tuning_ratio=f, damper_damping=zd,
                      structural_damping=zs)


def _variance_terms(mu, f, zd, zs):
    """Reduced numerator N, denominator D and X of the white-noise variances.

    Normalised structure variance N / (2 D), relative damper displacement variance
    X / (2 D): the I4 integrals (see :func:`displacement_variance_ratio`) with num = 2 N,
    den = 4 D and a1 = 2 X, regrouped so that no large terms cancel (the raw I4 denominator
    loses about -log10(mu) digits to cancellation; this form does not, except in the small
    term zeta_s g (w - 1)(m w - 1)).
    """
    w = f * f
    g = zd * f
    m = 1.0 + mu
    x = zs * w + g
    y = g * m + zs
    t = m * w - 1.0
    n = g * (t * t + mu * w) + 4.0 * g * x * y + zs * mu * w * w
    d = mu * g * x + zs * mu * w * w * y + zs * g * (w - 1.0) * t + 4.0 * zs * g * x * y
    return n, d, x


def _no_damping(zd, zs) -> np.ndarray:
    return (zd == 0.0) & (zs == 0.0)


# --------------------------------------------------------------------------------------------
# mass ratio and optima
# --------------------------------------------------------------------------------------------
def damper_mass_ratio(damper_mass, modal_mass):
    """Mass ratio of a damper on a structural mode.

    .. math::

        \\mu = \\frac{m_d}{M^*}

    Parameters
    ----------
    damper_mass : float or array_like
        Moving mass of the damper, > 0 [kg].
    modal_mass : float or array_like
        Generalised mass M* of the mode, normalised to a unit mode ordinate at the damper, > 0
        [kg].

    Returns
    -------
    mass_ratio : float or numpy.ndarray
        Mass ratio mu [-].

    Raises
    ------
    ValueError
        If a mass is not positive and finite, or the arrays do not broadcast.

    Notes
    -----
    M* must be the generalised mass for the mode shape scaled to 1 AT THE DAMPER'S LEVEL (see
    :func:`functions.structure.modal_mass`); with another scaling mu is wrong by the square of
    the mode ordinate there.

    Examples
    --------
    >>> damper_mass_ratio(300e3, 15e6)
    0.02

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    md = check_range("damper_mass", damper_mass, 0.0, low_open=True, unit="kg")
    mm = check_range("modal_mass", modal_mass, 0.0, low_open=True, unit="kg")
    md, mm = broadcast(damper_mass=md, modal_mass=mm)
    return scalar_or_array(md / mm)


def _form(formula: str, expression: str, source: str, compute):
    return twin(formula, compute, expression, source)


_DEN_HARTOG = "Den Hartog (1956) §3.3, damping referred to the damper's own frequency"
_WARBURTON_HB = "Warburton (1982), harmonic base acceleration"
_WARBURTON_WF = "Warburton (1982), white-noise force"
_WARBURTON_WB = "Warburton (1982), white-noise base acceleration"
_NISHIHARA_ASAMI = "Nishihara & Asami (2002), exact H-infinity optimum"

#: Closed-form optima as (tuning ratio, damper damping) twins: numpy functions of the mass
#: ratio carrying their native worksheet formula (:func:`functions.worksheet.twin`). Den
#: Hartog prints the damping on the structure's frequency, sqrt(3 mu / (8 (1+mu)^3)); divided
#: by f = 1/(1+mu) it is referred to the damper's own frequency.
CLOSED_FORMS: dict[str, tuple] = {
    "den_hartog": (
        _form("=1/(1+mass_ratio)", "1 / (1 + mu)", _DEN_HARTOG,
              lambda mass_ratio: 1.0 / (1.0 + mass_ratio)),
        _form("=SQRT(3*mass_ratio/(8*(1+mass_ratio)))", "sqrt(3 mu / (8 (1 + mu)))",
              _DEN_HARTOG,
              lambda mass_ratio: np.sqrt(3.0 * mass_ratio / (8.0 * (1.0 + mass_ratio))))),
    "harmonic_base": (
        _form("=SQRT(1-mass_ratio/2)/(1+mass_ratio)", "sqrt(1 - mu/2) / (1 + mu)",
              _WARBURTON_HB,
              lambda mass_ratio: np.sqrt(1.0 - mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(3*mass_ratio/(8*(1+mass_ratio)*(1-mass_ratio/2)))",
              "sqrt(3 mu / (8 (1 + mu)(1 - mu/2)))", _WARBURTON_HB,
              lambda mass_ratio: np.sqrt(3.0 * mass_ratio / (
                  8.0 * (1.0 + mass_ratio) * (1.0 - mass_ratio / 2.0))))),
    "white_noise_force": (
        _form("=SQRT(1+mass_ratio/2)/(1+mass_ratio)", "sqrt(1 + mu/2) / (1 + mu)",
              _WARBURTON_WF,
              lambda mass_ratio: np.sqrt(1.0 + mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(mass_ratio*(1+3*mass_ratio/4)/(4*(1+mass_ratio)*(1+mass_ratio/2)))",
              "sqrt(mu (1 + 3 mu/4) / (4 (1 + mu)(1 + mu/2)))", _WARBURTON_WF,
              lambda mass_ratio: np.sqrt(mass_ratio * (1.0 + 3.0 * mass_ratio / 4.0) / (
                  4.0 * (1.0 + mass_ratio) * (1.0 + mass_ratio / 2.0))))),
    "white_noise_base": (
        _form("=SQRT(1-mass_ratio/2)/(1+mass_ratio)", "sqrt(1 - mu/2) / (1 + mu)",
              _WARBURTON_WB,
              lambda mass_ratio: np.sqrt(1.0 - mass_ratio / 2.0) / (1.0 + mass_ratio)),
        _form("=SQRT(mass_ratio*(1-mass_ratio/4)/(4*(1+mass_ratio)*(1-mass_ratio/2)))",
              "sqrt(mu (1 - mu/4) / (4 (1 + mu)(1 - mu/2)))", _WARBURTON_WB,
              lambda mass_ratio: np.sqrt(mass_ratio * (1.0 - mass_ratio / 4.0) / (
                  4.0 * (1.0 + mass_ratio) * (1.0 - mass_ratio / 2.0))))),
    "nishihara_asami": (
        _form("=SQRT(8*(5+3*mass_ratio+2*SQRT(4+3*mass_ratio))/(3*(16+9*mass_ratio+"
              "4*SQRT(4+3*mass_ratio))*(1+mass_ratio)^2))",
              "sqrt(8 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s)(1 + mu)^2)), s = sqrt(4 + 3 mu)",
              _NISHIHARA_ASAMI,
              lambda mass_ratio: np.sqrt(8.0 * (5.0 + 3.0 * mass_ratio + 2.0 * np.sqrt(
                  4.0 + 3.0 * mass_ratio)) / (3.0 * (16.0 + 9.0 * mass_ratio + 4.0 * np.sqrt(
                      4.0 + 3.0 * mass_ratio)) * (1.0 + mass_ratio) ** 2))),
        _form("=SQRT((8+9*mass_ratio-4*SQRT(4+3*mass_ratio))/(1+mass_ratio))/4",
              "sqrt((8 + 9 mu - 4 s) / (1 + mu)) / 4", _NISHIHARA_ASAMI,
              lambda mass_ratio: 0.25 * np.sqrt((8.0 + 9.0 * mass_ratio - 4.0 * np.sqrt(
                  4.0 + 3.0 * mass_ratio)) / (1.0 + mass_ratio)))),
}


def _closed_form(mu: np.ndarray, method: str) -> tuple[np.ndarray, np.ndarray]:
    tuning, damping = CLOSED_FORMS[method]
    return tuning(mu), damping(mu)


# --- numerical optima ------------------------------------------------------------------------
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


def _h2_optimum(mu: np.ndarray, zs: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    f0, z0 = _closed_form(mu, "white_noise_force")   # the undamped optimum as the start
    u0 = np.stack([np.log(f0 * f0), np.log(z0 * f0)], axis=-1)
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


def _hinf_optimum(mu: np.ndarray, zs: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    f0, z0 = _closed_form(mu, "nishihara_asami")   # the undamped optimum as the start
    root = np.sqrt(mu / (2.0 + mu))
    x1 = (1.0 - root) / (1.0 + mu)            # Den Hartog's fixed points, near the two peaks
    x2 = (1.0 + root) / (1.0 + mu)
    u0 = np.log(np.stack([f0 * f0, z0 * f0, x1, x2], axis=-1))
    u = _continued(_hinf_residual, _hinf_check, u0, mu, zs, "hinf")
    f = np.exp(0.5 * u[:, 0])
    return f, np.exp(u[:, 1]) / f


def optimal_tuning(mass_ratio, method="den_hartog", structural_damping=0.0):
    """Optimal tuning and damping ratios of a tuned mass damper.

    .. math::

        \\text{den\\_hartog:}\\quad f = \\frac{1}{1+\\mu},\\quad
        \\zeta_d = \\sqrt{\\frac{3\\mu}{8(1+\\mu)}}

        \\text{white\\_noise\\_force:}\\quad f = \\frac{\\sqrt{1+\\mu/2}}{1+\\mu},\\quad
        \\zeta_d = \\sqrt{\\frac{\\mu(1+3\\mu/4)}{4(1+\\mu)(1+\\mu/2)}}

        \\text{h2:}\\ \\min_{f,\\zeta_d} \\sigma_x^2, \\qquad
        \\text{hinf:}\\ \\min_{f,\\zeta_d} \\max_\\omega |x_s/x_{st}|

    Parameters
    ----------
    mass_ratio : float or array_like
        Damper mass over generalised modal mass, mu > 0; mu < 2 for the base-excitation forms
        and 1e-4 <= mu <= 2 for the numerical optima [-].
    method : str, optional
        One of :data:`OPTIMAL_TUNING_METHODS` (see Notes) [-].
    structural_damping : float or array_like, optional
        Damping ratio of the structure's mode without the damper, in [0, 0.3] for ``h2`` and
        ``hinf``; must be 0 for the closed forms [-].

    Returns
    -------
    tuning_ratio : float or numpy.ndarray
        Optimal f = omega_d / omega_s [-].
    damping_ratio : float or numpy.ndarray
        Optimal damper damping ratio on the damper's own frequency, c_d / (2 m_d omega_d) [-].

    Raises
    ------
    ValueError
        For an unknown method, mass_ratio <= 0 (or >= 2 where the form needs it), damping outside
        its range, arrays that do not broadcast, or structural_damping > 0 with a closed form.
    RuntimeError
        If a numerical optimum fails to converge (not seen in the validated range).

    Notes
    -----
    Closed forms, all for an UNDAMPED structure (structural_damping > 0 raises; use ``h2`` or
    ``hinf``, which hold for any structural damping in the validated range):

    * ``den_hartog`` — harmonic force on the structure, equal fixed-point heights (Den Hartog,
      1956). Den Hartog prints the damping on the structure's frequency, sqrt(3 mu/(8 (1+mu)^3));
      here it is divided by f to refer it to the damper's own frequency.
    * ``harmonic_base`` — harmonic base acceleration, fixed-point approximation (Warburton 1982).
    * ``white_noise_force`` — white-noise force, minimum displacement variance (Warburton 1982).
    * ``white_noise_base`` — white-noise base acceleration, minimum variance of the displacement
      relative to the ground (Warburton 1982).
    * ``nishihara_asami`` — exact minimum of the peak displacement amplification under harmonic
      force (Nishihara & Asami 2002); with s = sqrt(4 + 3 mu):
      zeta_d = sqrt((8 + 9 mu - 4 s)/(1 + mu))/4,
      f^2 = 8 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s) (1 + mu)^2).

    Numerical optima (damped structure allowed; validated on 1e-4 <= mu <= 2 with
    0 <= structural_damping <= 0.3, outside which they are refused):

    * ``h2`` — minimum variance of the structure's displacement under white-noise force, by
      Newton's method on the gradient of the closed-form variance (:func:`effective_damping`),
      started from the undamped optimum (``white_noise_force``), with continuation in
      zeta_s where needed, and checked to be a maximum of zeta_eff. For zeta_s = 0 the
      gradient vanishes at Warburton's values, so it reproduces ``white_noise_force``
      (independently confirmed in the tests by Nelder-Mead on a Lyapunov variance).
    * ``hinf`` — minimum peak of |x_s / x_static| under harmonic force: Newton's method on the
      equal-peak minimax conditions (two stationary points of equal height whose gradients with
      respect to the damper parameters oppose), started from the undamped optimum
      (``nishihara_asami``) with Den Hartog's fixed points as the peak frequencies, and checked
      against all stationary points of the response (roots of a quintic). For zeta_s = 0 it
      reproduces ``nishihara_asami``; for zeta_s > 0 the tests confirm it by brute force.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "den_hartog")
    >>> round(f, 6), round(z, 6)
    (0.980392, 0.085749)
    >>> f, z = optimal_tuning(0.02, "h2")      # = Warburton's white-noise-force optimum
    >>> round(f, 6), round(z, 6)
    (0.985282, 0.070187)
    >>> f, z = optimal_tuning(0.02, "h2", structural_damping=0.02)
    >>> round(f, 6), round(z, 6)
    (0.983922, 0.070187)

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    2. G. B. Warburton, "Optimum absorber parameters for various combinations of response and
       excitation parameters", Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    3. O. Nishihara, T. Asami, "Closed-form solutions to the exact optimizations of dynamic
       vibration absorbers", J. Vib. Acoust. 124(4):576-582, 2002.
    """
    if not isinstance(method, str) or method not in OPTIMAL_TUNING_METHODS:
        raise ValueError(f"method={method!r} must be one of {', '.join(OPTIMAL_TUNING_METHODS)}")
    base = method in ("harmonic_base", "white_noise_base")
    numerical = method in ("h2", "hinf")
    if numerical:
        mu = check_range("mass_ratio", mass_ratio, MIN_NUMERICAL_MASS_RATIO,
                         MAX_NUMERICAL_MASS_RATIO, unit="-")
    else:
        mu = check_range("mass_ratio", mass_ratio, 0.0, 2.0 if base else math.inf,
                         low_open=True, high_open=base, unit="-")
    zs = _structural_damping(structural_damping,
                             MAX_NUMERICAL_STRUCTURAL_DAMPING if numerical else 1.0)
    mu, zs = broadcast(mass_ratio=mu, structural_damping=zs)
    if not numerical:
        if np.any(zs > 0.0):
            raise ValueError(
                f"structural_damping={float(zs[zs > 0.0].flat[0])!r} must be 0 for "
                f"method={method!r} (a closed form for an undamped structure); use "
                f"method='h2' or 'hinf' for a damped structure")
        f, zd = _closed_form(mu, method)
        return scalar_or_array(f), scalar_or_array(zd)
    shape = mu.shape
    solver = _h2_optimum if method == "h2" else _hinf_optimum
    f, zd = solver(mu.ravel().copy(), zs.ravel().copy())
    return scalar_or_array(f.reshape(shape)), scalar_or_array(zd.reshape(shape))


# --------------------------------------------------------------------------------------------
# white-noise response in closed form
# --------------------------------------------------------------------------------------------
def displacement_variance_ratio(mass_ratio, tuning_ratio, damper_damping,
                                structural_damping=0.0):
    """Normalised displacement variance of a structure with a damper.

    .. math::

        v = \\frac{\\sigma_x^2\\,k_s^2}{\\pi S_0\\,\\omega_s}
          = \\frac{1}{\\pi}\\int_{-\\infty}^{\\infty}
            \\left|\\frac{x_s}{F/k_s}(i\\omega)\\right|^2 d\\omega
          = \\frac{\\mathrm{num}}{\\mathrm{den}} = \\frac{N}{2D}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode, in [0, 1) [-].

    Returns
    -------
    variance_ratio : float or numpy.ndarray
        Variance of the structure's displacement under a white-noise force of two-sided spectral
        density S_0, divided by pi S_0 omega_s / k_s^2; 1 / (2 zeta) for a bare structure;
        inf when neither the damper nor the structure is damped [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, structural_damping
        >= 1, or the arrays do not broadcast.

    Notes
    -----
    The integral is the I4 entry of the table of integrals of rational spectra (Newland 1993,
    Appendix 1, quoted from memory; verified against a Lyapunov solution in the tests)::

        I4 = pi [B0^2/A0 (A2 A3 - A1 A4) + A3 (B1^2 - 2 B0 B2) + A1 (B2^2 - 2 B1 B3)
                 + B3^2/A4 (A1 A2 - A0 A3)] / [A1 (A2 A3 - A1 A4) - A0 A3^2]

    with B0 = f^2, B1 = 2 zeta_d f, B2 = 1, B3 = 0 and A4 = 1, A3..A0 = a3..a0 of the module
    docstring. Written out with w = f^2 and g = zeta_d f (only + - * / needed)::

        a3  = 2 g (1 + mu) + 2 zeta_s
        a2  = w (1 + mu) + 1 + 4 zeta_s g
        a1  = 2 zeta_s w + 2 g
        P   = a2 a3 - a1
        num = w P + a3 (4 g^2 - 2 w) + a1
        den = a1 P - w a3^2

    The raw denominator loses about -log10(mu) digits to cancellation (at mu = 0.01, two of
    sixteen). Regrouped exactly (num = 2 N, den = 4 D, a1 = 2 X; every term of N is >= 0), as
    computed here::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        v   = N / (2 D)

    Examples
    --------
    >>> round(displacement_variance_ratio(0.02, 0.985282, 0.070187), 4)
    14.1074

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    2. S. H. Crandall, W. D. Mark, Random Vibration in Mechanical Systems, Academic Press, 1963.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    n, d, _ = _variance_terms(mu, f, zd, zs)
    none = _no_damping(zd, zs)
    v = np.where(none, np.inf, n / (2.0 * np.where(none, 1.0, d)))
    return scalar_or_array(v)


def effective_damping(mass_ratio, tuning_ratio, damper_damping, structural_damping=0.0):
    """Equivalent damping ratio of a structure with its damper.

    .. math::

        \\zeta_{eff} = \\frac{1}{2v} = \\frac{\\mathrm{den}}{2\\,\\mathrm{num}} = \\frac{D}{N}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 1) [-].

    Returns
    -------
    effective_damping : float or numpy.ndarray
        Damping ratio of a single-degree-of-freedom structure (same mass, same frequency) whose
        displacement variance under white-noise force equals that of the structure with its
        damper; 0 when neither is damped [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, structural_damping
        >= 1, or the arrays do not broadcast.

    Notes
    -----
    This is the VARIANCE-equivalent damping (total, structure included). It is not the
    structure's damping plus a damper contribution, and it is not the harmonic-peak
    equivalent 1/(2 H_max), which is tens of percent higher for the same damper. For an
    H2-optimal damper on an undamped structure it is close to sqrt(mu)/4 (McNamara 1977,
    Luft 1979, from memory); the exact value is sqrt(mu (1+mu)/(1+3 mu/4))/4 (computed).

    Closed form for a spreadsheet, from the I4 integral (see
    :func:`displacement_variance_ratio`, regrouped so that no large terms cancel), with
    w = f^2 and g = zeta_d f (only + - * /)::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        zeta_eff = D / N

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2")
    >>> round(effective_damping(0.02, f, z), 5)   # sqrt(0.02)/4 = 0.03536
    0.03544
    >>> round(effective_damping(0.02, 0.98, 0.07, 0.01), 5)
    0.04305

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    2. R. J. McNamara, "Tuned mass dampers for buildings", J. Struct. Div. ASCE 103(9), 1977.
    3. R. W. Luft, "Optimal tuned mass dampers for buildings", J. Struct. Div. ASCE 105(12), 1979.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    n, d, _ = _variance_terms(mu, f, zd, zs)
    none = _no_damping(zd, zs)
    zeta = np.where(none, 0.0, d / np.where(none, 1.0, n))
    return scalar_or_array(zeta)


def stroke_ratio(mass_ratio, tuning_ratio, damper_damping, structural_damping=0.0):
    """RMS damper stroke over RMS structure displacement.

    .. math::

        \\frac{\\sigma_{x_d - x_s}}{\\sigma_{x_s}} = \\sqrt{\\frac{a_1}{\\mathrm{num}}}
        = \\sqrt{\\frac{X}{N}}

    Parameters
    ----------
    mass_ratio : float or array_like
        mu = m_d / M*, > 0 [-].
    tuning_ratio : float or array_like
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s of the structure's mode without the damper, in [0, 1) [-].

    Returns
    -------
    stroke_ratio : float or numpy.ndarray
        RMS displacement of the damper RELATIVE to the structure over the RMS displacement of the
        structure, under white-noise force [-].

    Raises
    ------
    ValueError
        If mass_ratio <= 0, tuning_ratio <= 0, a damping ratio is negative, both damping ratios
        are 0 (the response is unbounded), structural_damping >= 1, or the arrays do not
        broadcast.

    Notes
    -----
    Both variances are I4 integrals with the same denominator; the relative displacement has
    B2 = -1 and B0 = B1 = B3 = 0, so its integral is pi a1 / den and the ratio is
    sqrt(a1 / num) = sqrt(X / N). Closed form with w = f^2 and g = zeta_d f (only + - * / and
    SQRT)::

        m   = 1 + mu
        X   = zeta_s w + g
        Y   = g m + zeta_s
        N   = g ((m w - 1)^2 + mu w) + 4 g X Y + zeta_s mu w^2
        D   = mu g X + zeta_s mu w^2 Y + zeta_s g (w - 1)(m w - 1) + 4 zeta_s g X Y
        ratio = SQRT(X / N)

    With equal peak factors the ratio of expected peaks is the same.

    Examples
    --------
    >>> f, z = optimal_tuning(0.02, "h2")
    >>> round(stroke_ratio(0.02, f, z), 3)
    5.062

    References
    ----------
    1. D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.,
       Longman, 1993, Appendix 1.
    """
    mu, f, zd, zs = _system(mass_ratio, tuning_ratio, damper_damping, structural_damping)
    none = _no_damping(zd, zs)
    if none.any():
        raise ValueError("damper_damping=0.0 and structural_damping=0.0: at least one must be "
                         "> 0 [-] (the response is unbounded)")
    n, _, x = _variance_terms(mu, f, zd, zs)
    return scalar_or_array(np.sqrt(x / n))



# --------------------------------------------------------------------------------------------
# requirement
# --------------------------------------------------------------------------------------------
def required_damping(acceleration, acceleration_limit, structural_damping):
    """Total damping that brings a resonant response to a limit.

    .. math::

        \\zeta_{req} = \\zeta_s \\left(\\frac{a}{a_{lim}}\\right)^2

    Parameters
    ----------
    acceleration : float or array_like
        Peak (or RMS) acceleration without the damper, > 0 [m/s^2].
    acceleration_limit : float or array_like
        Acceptable peak (or RMS, consistently) acceleration, > 0 [m/s^2].
    structural_damping : float or array_like
        Damping ratio of the structure without the damper, in (0, 1) [-].

    Returns
    -------
    required_damping : float or numpy.ndarray
        Total effective damping ratio needed [-].

    Raises
    ------
    ValueError
        If an acceleration is not positive, structural_damping is outside (0, 1), or the arrays
        do not broadcast.

    Notes
    -----
    Resonant response: RMS response is proportional to 1/sqrt(zeta) (EN 1991-1-4:2005 Annex B,
    B.2(6), R^2 = pi^2 S_L R_h R_b / (2 delta)). The rule applies to the resonant part only;
    where the background (quasi-static) part matters it is unconservative. A result at or below
    ``structural_damping`` means no damper is needed.

    Examples
    --------
    >>> round(required_damping(0.25, 0.15, 0.015), 5)
    0.04167

    References
    ----------
    1. EN 1991-1-4:2005, Eurocode 1: Actions on structures - Wind actions, Annex B, B.2(6).
    """
    a = check_range("acceleration", acceleration, 0.0, low_open=True, unit="m/s^2")
    lim = check_range("acceleration_limit", acceleration_limit, 0.0, low_open=True,
                      unit="m/s^2")
    zs = check_range("structural_damping", structural_damping, 0.0, 1.0, low_open=True,
                     high_open=True, unit="-")
    a, lim, zs = broadcast(acceleration=a, acceleration_limit=lim, structural_damping=zs)
    return scalar_or_array(zs * (a / lim) ** 2)


def _h2_effective(mu: float, zs: float) -> float:
    f, zd = _h2_optimum(np.array([mu]), np.array([zs]))
    n, d, _ = _variance_terms(mu, f[0], zd[0], zs)
    return float(d / n)


def required_mass_ratio(total_damping, structural_damping=0.0):
    """Mass ratio whose H2-optimal damper gives a total damping.

    .. math::

        \\zeta_{eff}\\big(\\mu, f_{opt}(\\mu, \\zeta_s), \\zeta_{d,opt}(\\mu, \\zeta_s),
        \\zeta_s\\big) = \\zeta_{target}

    Parameters
    ----------
    total_damping : float or array_like
        Target effective (variance-equivalent) damping ratio, in (0, 1) [-].
    structural_damping : float or array_like, optional
        Damping ratio of the structure without the damper, in [0, 0.3] [-].

    Returns
    -------
    mass_ratio : float or numpy.ndarray
        mu whose ``h2`` optimum reaches ``total_damping``; 0 when the structure alone already
        has it (total_damping <= structural_damping) [-].

    Raises
    ------
    ValueError
        If an argument is outside its range, the arrays do not broadcast, or the target needs a
        mass ratio above 2 (no practical damper reaches it) or below 1e-4 (negligible).

    Notes
    -----
    Solved with brentq on mu in [1e-4, 2] for each element (zeta_eff of the optimum rises
    with mu). For an undamped structure the result
    equals the root of mu^2 + mu (1 - 12 zeta^2) - 16 zeta^2 = 0, from the exact optimum
    zeta_eff = sqrt(mu (1+mu)/(1+3 mu/4))/4 (computed; used as a check in the tests).

    Examples
    --------
    >>> round(required_mass_ratio(0.04, 0.01), 5)
    0.01665

    References
    ----------
    1. G. B. Warburton, Earthquake Eng. Struct. Dyn. 10:381-401, 1982.
    """
    tot = check_range("total_damping", total_damping, 0.0, 1.0, low_open=True, high_open=True,
                      unit="-")
    zs = _structural_damping(structural_damping, MAX_NUMERICAL_STRUCTURAL_DAMPING)
    tot, zs = broadcast(total_damping=tot, structural_damping=zs)
    out = np.zeros(tot.shape)
    lo, hi = MIN_NUMERICAL_MASS_RATIO, MAX_NUMERICAL_MASS_RATIO
    for idx in np.ndindex(tot.shape):
        t, z = float(tot[idx]), float(zs[idx])
        if t <= z:
            continue
        if _h2_effective(hi, z) < t:
            raise ValueError(f"total_damping={t!r} needs a mass_ratio above {hi:g} with "
                             f"structural_damping={z!r}; no practical damper reaches it")
        if _h2_effective(lo, z) > t:
            raise ValueError(f"total_damping={t!r} needs a mass_ratio below {lo:g} with "
                             f"structural_damping={z!r}; in practice no damper is needed")
        out[idx] = brentq(lambda m: _h2_effective(m, z) - t, lo, hi, xtol=1e-16, rtol=1e-15)
    return scalar_or_array(out)


# --------------------------------------------------------------------------------------------
# peaks and charts
# --------------------------------------------------------------------------------------------
def peak_factor(frequency, duration=600.0):
    """Expected peak over RMS of a Gaussian narrow-band response.

    .. math::

        g = \\sqrt{2 \\ln(\\nu T)} + \\frac{0.5772}{\\sqrt{2 \\ln(\\nu T)}}

    Parameters
    ----------
    frequency : float or array_like
        Mean up-crossing rate nu, for a resonant response the natural frequency, > 0 [Hz].
    duration : float or array_like, optional
        Averaging time T, > 0 with nu T > e [s].

    Returns
    -------
    peak_factor : float or numpy.ndarray
        Expected largest value over the RMS in the duration [-].

    Raises
    ------
    ValueError
        If frequency or duration is not positive, nu T <= e (the asymptotic form does not hold),
        or the arrays do not broadcast.

    Notes
    -----
    Davenport's asymptotic form with Euler's constant 0.5772156649. EN 1991-1-4:2005 B.2(3)
    writes 0.6 for the constant and floors the result at 3 with T = 600 s; that floor is not
    applied here.

    Examples
    --------
    >>> round(peak_factor(0.2), 3)
    3.281

    References
    ----------
    1. A. G. Davenport, "Note on the distribution of the largest value of a random function with
       application to gust loading", Proc. ICE 28(2):187-196, 1964.
    """
    nu = check_range("frequency", frequency, 0.0, low_open=True, unit="Hz")
    t = check_range("duration", duration, 0.0, low_open=True, unit="s")
    nu, t = broadcast(frequency=nu, duration=t)
    n = nu * t
    if np.any(n <= math.e):
        bad = float(n[n <= math.e].flat[0])
        raise ValueError(f"frequency*duration={bad!r} must be in (e, inf) [-] for the "
                         "Davenport peak factor")
    r = np.sqrt(2.0 * np.log(n))
    return scalar_or_array(r + _EULER_GAMMA / r)


def frequency_response(frequency_ratio, mass_ratio=0.0, tuning_ratio=1.0, damper_damping=0.0,
                       structural_damping=0.02):
    """Dynamic amplification of a structure with or without a damper.

    .. math::

        \\left|\\frac{x_s}{x_{st}}\\right| =
        \\left|\\frac{f^2 - r^2 + 2i\\zeta_d f r}
        {(1 - r^2 + 2i\\zeta_s r)(f^2 - r^2 + 2i\\zeta_d f r) - \\mu r^2 (f^2 + 2i\\zeta_d f r)}
        \\right|

    Parameters
    ----------
    frequency_ratio : float or array_like
        Forcing frequency over the structure's frequency, r = omega / omega_s, >= 0 [-].
    mass_ratio : float or array_like, optional
        mu = m_d / M*, >= 0; 0 gives the bare structure [-].
    tuning_ratio : float or array_like, optional
        f = omega_d / omega_s, > 0 [-].
    damper_damping : float or array_like, optional
        zeta_d = c_d / (2 m_d omega_d), >= 0 [-].
    structural_damping : float or array_like, optional
        zeta_s, in [0, 1) [-].

    Returns
    -------
    amplification : float or numpy.ndarray
        Amplitude of the structure's displacement over the static displacement F/k_s under a
        harmonic force; inf exactly at an undamped resonance [-].

    Raises
    ------
    ValueError
        If an argument is outside its range or the arrays do not broadcast.

    Examples
    --------
    >>> round(frequency_response(1.0), 3)               # bare structure, 1/(2 zeta_s)
    25.0
    >>> f, z = optimal_tuning(0.02, "nishihara_asami")
    >>> r = np.linspace(0.8, 1.2, 40001)
    >>> round(float(frequency_response(r, 0.02, f, z, 0.0).max()), 3)  # N&A peak 10.053
    10.053

    References
    ----------
    1. J. P. Den Hartog, Mechanical Vibrations, 4th ed., McGraw-Hill, 1956, §3.3.
    """
    r = check_range("frequency_ratio", frequency_ratio, 0.0, unit="-")
    mu = check_range("mass_ratio", mass_ratio, 0.0, unit="-")
    f = check_range("tuning_ratio", tuning_ratio, 0.0, low_open=True, unit="-")
    zd = check_range("damper_damping", damper_damping, 0.0, unit="-")
    zs = _structural_damping(structural_damping)
    r, mu, f, zd, zs = broadcast(frequency_ratio=r, mass_ratio=mu, tuning_ratio=f,
                                  damper_damping=zd, structural_damping=zs)
    s = 1j * r
    d = s * s + 2.0 * zd * f * s + f * f
    with np.errstate(divide="ignore", invalid="ignore"):
        bare = 1.0 / np.abs(s * s + 2.0 * zs * s + 1.0)
        full = np.abs(d / ((s * s + 2.0 * zs * s + 1.0) * d
                           + mu * s * s * (2.0 * zd * f * s + f * f)))
    return scalar_or_array(np.where(mu == 0.0, bare, full))

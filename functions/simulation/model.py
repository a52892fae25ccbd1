# SPDX-License-Identifier: MIT
r"""The coupled building mode and pendulum damper: equations of motion and matrices.

The model
---------
One vibration mode of the building is a single-degree-of-freedom oscillator: modal mass M
(normalised to 1 at the damper level), frequency f_s, damping ratio zeta_s; its coordinate x is
the horizontal displacement of the floor that carries the damper. The damper is a point mass m_d
on a rigid, massless hanger of length L pinned to that floor; theta is the hanger's angle from the
vertical. A dashpot c_d links the mass to the floor HORIZONTALLY: it resists the relative
horizontal velocity d/dt(L sin theta) = L cos(theta) theta' of the mass against the floor (it
does no work on the vertical motion of the mass).

Lagrangian (mass at x + L sin theta, -L cos theta):

.. math::

    T &= \tfrac12 M \dot x^2 + \tfrac12 m_d\left[(\dot x + L\dot\theta\cos\theta)^2
         + (L\dot\theta\sin\theta)^2\right]
       = \tfrac12 (M+m_d)\dot x^2 + m_d L\cos\theta\,\dot x\dot\theta
         + \tfrac12 m_d L^2\dot\theta^2 \\
    V &= \tfrac12 K x^2 + m_d g L (1 - \cos\theta) \\
    D &= \tfrac12 C\dot x^2 + \tfrac12 c_d (L\cos\theta\,\dot\theta)^2
         \quad\text{(Rayleigh dissipation)}

and Lagrange's equations d/dt(dT/dq') - dT/dq + dV/dq + dD/dq' = Q with Q_x = F(t) give

.. math::

    (M+m_d)\ddot x + m_d L(\ddot\theta\cos\theta - \dot\theta^2\sin\theta) + C\dot x + K x = F(t) \\
    m_d L\cos\theta\,\ddot x + m_d L^2\ddot\theta + c_d L^2\cos^2\theta\,\dot\theta
        + m_d g L\sin\theta = 0

with K = M (2 pi f_s)^2, C = 2 zeta_s M (2 pi f_s), omega_d = sqrt(g/L) (the damper's small-angle
frequency) and c_d = 2 zeta_d m_d omega_d: zeta_d is the damper's damping on its OWN frequency,
the project convention (Den Hartog's c_d/(2 m_d omega_s) equals f zeta_d with f = omega_d/omega_s).
Divided by m_d L, the second equation gives the mass matrix [[M+m_d, m_d L cos theta],
[cos theta, L]] with determinant L (M + m_d sin^2 theta) > 0, so

.. math::

    \ddot x = \frac{r_1 - m_d\cos\theta\, r_2}{M + m_d\sin^2\theta},\quad
    \ddot\theta = \frac{(M+m_d) r_2 - \cos\theta\, r_1}{L (M + m_d\sin^2\theta)},\\
    r_1 = F - C\dot x - K x + m_d L\dot\theta^2\sin\theta,\quad
    r_2 = -g\sin\theta - 2\zeta_d\omega_d L\cos^2\theta\,\dot\theta .

A velocity-exponent dashpot (``velocity_exponent`` alpha, ``dashpot_coefficient`` C) replaces
the linear one in the exact model only: its force against the horizontal relative velocity
v_h = L cos(theta) theta' is F(v_h) = C |v_h|^alpha sign(v_h), whose generalised force on theta
is -F(v_h) L cos(theta), so r_2 = -g sin(theta) - F(v_h) cos(theta) / m_d (alpha = 1, C = c_d:
the linear term above). The linearised model keeps the linear c_d.

Hanger tension: the radial equation of the mass (unit vector e_r = (sin theta, -cos theta)
from the pivot; acceleration along it x'' sin(theta) - L theta'^2) gives the total tension

.. math::

    T = m_d g\cos\theta + m_d L\dot\theta^2 - m_d\ddot x\sin\theta - F(v_h)\sin\theta

(at rest m_d g; on a fixed pivot the textbook m_d (g cos theta + L theta'^2)).

Linearised (sin theta = theta, cos theta = 1, theta'^2 = 0) with the stroke u = L theta this is the
textbook tuned-mass-damper pair (M+m_d) x'' + m_d u'' + C x' + K x = F,
m_d (x'' + u'') + c_d u' + m_d omega_d^2 u = 0; mass ratio mu = m_d/M, tuning f = omega_d/omega_s.
"""
from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from functions.simulation._inputs import _scalar

__all__: list[str] = []


@dataclass(frozen=True)
class _System:
    """Validated parameters of the model (SI, see the module notes) and its matrices."""

    M: float
    fs: float
    zs: float
    m: float
    L: float
    zd: float
    g: float
    #: Velocity exponent alpha of the nonlinear model's dashpot and its coefficient C
    #: [N (s/m)^alpha]; C = 0: the linear dashpot c_d = 2 zeta_d m_d omega_d.
    alpha: float = 1.0
    Cn: float = 0.0

    @property
    def exponent_law(self) -> bool:
        """True when the nonlinear model's dashpot is F = C |v|^alpha (not c_d v)."""
        return self.Cn > 0.0

    @property
    def ws(self):
        return 2.0 * math.pi * self.fs

    @property
    def wd(self):
        return math.sqrt(self.g / self.L)

    @property
    def K(self):
        return self.M * self.ws**2

    @property
    def C(self):
        return 2.0 * self.zs * self.M * self.ws

    @property
    def cd_over_m(self):
        return 2.0 * self.zd * self.wd

    def coupled(self):
        """A, B of the linearised pair, state [x, u, x', u'] (u = L theta)."""
        mass = np.array([[self.M + self.m, self.m], [self.m, self.m]])
        stiff = np.diag([self.K, self.m * self.wd**2])
        damp = np.diag([self.C, self.m * self.cd_over_m])
        inv = np.linalg.inv(mass)
        A = np.zeros((4, 4))
        A[:2, 2:] = np.eye(2)
        A[2:, :2] = -inv @ stiff
        A[2:, 2:] = -inv @ damp
        B = np.zeros(4)
        B[2:] = inv @ np.array([1.0, 0.0])
        return A, B

    def bare(self):
        """A, B of the building mode alone, state [x, x']."""
        return _bare(self.M, self.fs, self.zs)


def _bare(M: float, fs: float, zs: float) -> tuple[np.ndarray, np.ndarray]:
    """A, B of a building mode alone (modal mass, frequency [Hz], damping), state [x, x']."""
    ws = 2.0 * math.pi * fs
    A = np.array([[0.0, 1.0], [-ws**2, -2.0 * zs * ws]])
    B = np.array([0.0, 1.0 / M])
    return A, B


def _system(modal_mass, frequency, structural_damping, damper_mass, length, damper_damping, g,
            velocity_exponent=1.0, dashpot_coefficient=None):
    """The :class:`_System` of the arguments of ``simulate``; ValueError names a bad one."""
    alpha = _scalar("velocity_exponent", velocity_exponent, 0.0, 2.0, low_open=True, unit="-")
    Cn = 0.0 if dashpot_coefficient is None else _scalar(
        "dashpot_coefficient", dashpot_coefficient, 0.0, low_open=True, unit="N (s/m)^alpha")
    if alpha != 1.0 and dashpot_coefficient is None:
        raise ValueError(f"velocity_exponent={velocity_exponent!r} needs dashpot_coefficient "
                         "(C of F = C |v|^alpha, > 0 [N (s/m)^alpha])")
    return _System(
        M=_scalar("modal_mass", modal_mass, 0.0, low_open=True, unit="kg"),
        fs=_scalar("frequency", frequency, 0.0, low_open=True, unit="Hz"),
        zs=_scalar("structural_damping", structural_damping, 0.0, 1.0, high_open=True, unit="-"),
        m=_scalar("damper_mass", damper_mass, 0.0, low_open=True, unit="kg"),
        L=_scalar("length", length, 0.0, low_open=True, unit="m"),
        zd=_scalar("damper_damping", damper_damping, 0.0, 1.0, unit="-"),
        g=_scalar("g", g, 0.0, low_open=True, unit="m/s^2"),
        alpha=alpha, Cn=Cn,
    )


def _dashpot_force(p: _System, c, w):
    """Force of the dashpot against the horizontal relative velocity v_h = L cos(theta)
    theta' (numpy, vectorised): c_d v_h, or C |v_h|^alpha sign(v_h) [N]; on the mass it acts
    as -this."""
    v = p.L * c * w
    if not p.exponent_law:
        return p.m * p.cd_over_m * v
    return p.Cn * np.abs(v) ** p.alpha * np.sign(v)


def _dashpot_term(p: _System, c, w):
    """The dashpot's part of r_2 (its generalised force over m_d L): F(v_h) cos(theta) / m_d."""
    if not p.exponent_law:
        return p.cd_over_m * p.L * c * c * w
    return _dashpot_force(p, c, w) * c / p.m


def _tension(p: _System, x_acc, th, w):
    """Total tension of the hangers (nonlinear model), from the radial equation of the mass:
    T = m g cos(theta) + m L theta'^2 - m x'' sin(theta) + F_h sin(theta), F_h = -F(v_h) the
    dashpot's horizontal force on the mass [N]."""
    s = np.sin(th)
    c = np.cos(th)
    return p.m * (p.g * c + p.L * w * w - x_acc * s) - _dashpot_force(p, c, w) * s


def _accelerations(p: _System, x, v, th, w, F):
    """x'' and theta'' of the exact equations (numpy, vectorised)."""
    s = np.sin(th)
    c = np.cos(th)
    r1 = F - p.C * v - p.K * x + p.m * p.L * s * w * w
    r2 = -p.g * s - _dashpot_term(p, c, w)
    den = p.M + p.m * s * s
    return (r1 - p.m * c * r2) / den, ((p.M + p.m) * r2 - c * r1) / (p.L * den)

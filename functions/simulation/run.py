# SPDX-License-Identifier: MIT
"""Simulation of the building mode with its pendulum damper: :func:`simulate`.

One call integrates the exact (nonlinear) model, the linearised model and the bare building
under the same load (:mod:`functions.simulation.integrators`), identifies the effective damping
and the detuning, and compares nonlinear with linear for the verdict.
"""
from __future__ import annotations

import math

import numpy as np

from functions.pendulum import (
    STANDARD_GRAVITY,
    amplitude_detuning,
    amplitude_for_error,
    pendulum_frequency,
)
from functions.simulation._inputs import _scalar
from functions.simulation.integrators import (
    INTEGRATORS,
    _linear_run,
    _nonlinear_ivp,
    _nonlinear_rk4,
)
from functions.simulation.loads import HarmonicForce, RandomForce, _force_at
from functions.simulation.model import _accelerations, _System, _system, _tension
from functions.simulation.results import SimulationResult, _response
from functions.simulation.theory import _theory, _zeta_from_variance

__all__ = ["MAX_SAMPLES", "MAX_AUTO_WARMUP", "simulate"]

#: Largest number of output samples of one simulation (memory guard) [-].
MAX_SAMPLES = 4_000_000

#: Longest automatic warm-up [s]; lightly damped systems may need more (set ``warmup``).
MAX_AUTO_WARMUP = 3600.0


def _harmonic_zeta(p: _System, load: HarmonicForce, t, x):
    """Bare-building damping with the same steady amplitude of the fundamental."""
    om = 2.0 * math.pi * load.frequency
    basis = np.column_stack([np.sin(om * t), np.cos(om * t)])
    coef, *_ = np.linalg.lstsq(basis, x, rcond=None)
    amp = float(np.hypot(*coef))
    if amp <= 0.0 or load.amplitude == 0.0:
        return math.nan
    r = load.frequency / p.fs
    val = (load.amplitude / (p.K * amp)) ** 2 - (1.0 - r * r) ** 2
    return math.sqrt(val) / (2.0 * r) if val > 0.0 else math.nan


def _auto_warmup(p: _System, load):
    if load is None:
        return 0.0
    rates = []
    for A, _ in (p.coupled(), p.bare()):
        rates.append(float(np.min(-np.linalg.eigvals(A).real)))
    slowest = min(rates)
    if slowest <= 0.0:
        return MAX_AUTO_WARMUP
    return min(6.0 / slowest, MAX_AUTO_WARMUP)


def simulate(modal_mass, frequency, structural_damping, damper_mass, length, damper_damping,
             load=None, duration=600.0, *, warmup=None, initial_angle_deg=0.0,
             initial_displacement=0.0, samples_per_period=32, rtol=1e-4, tolerance=0.05,
             integrator="rk4", g=STANDARD_GRAVITY, velocity_exponent=1.0,
             dashpot_coefficient=None):
    """Simulate the building mode with its pendulum damper in time.

    .. math::

        (M+m_d)\\ddot x + m_d L(\\ddot\\theta\\cos\\theta - \\dot\\theta^2\\sin\\theta)
            + C\\dot x + K x = F(t) \\\\
        \\cos\\theta\\,\\ddot x + L\\ddot\\theta + 2\\zeta_d\\omega_d L\\cos^2\\theta\\,\\dot\\theta
            + g\\sin\\theta = 0

    Parameters
    ----------
    modal_mass : float
        Modal mass M of the building mode, normalised to 1 at the damper [kg].
    frequency : float
        Building frequency f_s (without damper) [Hz].
    structural_damping : float
        Building damping ratio zeta_s, in [0, 1) [-].
    damper_mass : float
        Pendulum mass m_d [kg].
    length : float
        Hanger length L; the small-angle damper frequency is sqrt(g/L)/(2 pi) [m].
    damper_damping : float
        Damper damping ratio on its OWN small-angle frequency, zeta_d = c_d/(2 m_d omega_d), in
        [0, 1]; the dashpot acts on the horizontal motion of the mass relative to the floor [-].
    load : HarmonicForce, RandomForce or None
        Force on the building mode; None for free vibration from the initial state [N].
    duration : float
        Length of the record kept after the warm-up, in (0, 1e6] [s].
    warmup : float or None
        Time simulated before the record (discarded) so the start-up transient dies out; None
        chooses 6 / (slowest decay rate) of the linear systems, at most 3600 s, and 0 for free
        vibration [s].
    initial_angle_deg : float
        Hanger angle at the start of the simulation, in (-180, 180) [deg].
    initial_displacement : float
        Building displacement at the start of the simulation [m].
    samples_per_period : int
        Output samples per period of the fastest of building, damper, harmonic load and corner
        frequency of a random load, in [8, 4096] [-].
    rtol : float
        Accepted relative global error of the nonlinear run, in [1e-12, 0.1] [-].
    tolerance : float
        Accepted relative departure of the nonlinear RMS response from the linear one, in (0, 1]
        [-].
    integrator : str
        "rk4" (fixed-step Runge-Kutta with step-doubling check, fast) or "solve_ivp" (scipy DOP853
        with local error control, slow reference) [-].
    g : float
        Acceleration of gravity [m/s^2].
    velocity_exponent : float
        Exponent alpha of the nonlinear model's dashpot F = C |v_h|^alpha sign(v_h), in
        (0, 2]; with alpha != 1 give ``dashpot_coefficient`` [-].
    dashpot_coefficient : float or None
        Coefficient C of that law, > 0 [N (s/m)^alpha]; None: the linear dashpot of
        ``damper_damping``. The linearised model keeps the linear dashpot of
        ``damper_damping``, so the departure shows the law's effect too [N (s/m)^alpha].

    Returns
    -------
    result : SimulationResult
        Time histories and statistics of the nonlinear, linearised and bare models, detuning,
        departure and verdict (see :class:`SimulationResult`) [-].

    Raises
    ------
    ValueError
        If an argument is outside its range, ``load`` is not a load object, ``integrator`` is
        unknown, the record would exceed MAX_SAMPLES samples, or the harmonic load hits an
        undamped resonance.

    Notes
    -----
    Equations and derivation: :mod:`functions.simulation.model`; integration methods:
    :mod:`functions.simulation.integrators`; loads: :mod:`functions.simulation.loads`. The linear
    systems start from the same state as the nonlinear one (u = L theta_0). Cost grows with
    the number of samples: one hour of a 0.2 Hz mode takes well under a second here
    (benchmarks/bench_simulation.py); a random load with a corner frequency above the building
    frequency refines the grid (keep f_c near or below f_s, as for wind).

    Effective damping: for a random load, the damping ratio of the bare building whose
    displacement variance under the SAME force (frequency-domain) equals the simulated
    mean-square displacement; for a white force this is the definition of
    ``damper.effective_damping``. For a harmonic load, the damping ratio of the bare building
    with the same steady amplitude of the fundamental (least-squares fit over the record):
    zeta = sqrt((F0/(K X))^2 - (1 - r^2)^2) / (2 r), r = f/f_s; near resonance this is the
    larger "harmonic-peak" equivalent damping, not the random one.

    Detuning: ``detuning`` is the exact-period prediction at the peak swing
    (``pendulum.amplitude_detuning``); ``simulated_detuning`` comes from the simulated swing by
    equivalent linearisation of the restoring moment m g L sin(theta). For a steady harmonic
    swing the two agree to O(theta^4) (harmonic balance, 2 J1(a)/a); for a random swing the
    simulated one reflects the typical, not the peak, amplitude (``equivalent_swing_deg``).

    Examples
    --------
    A 0.2 Hz mode (M = 1e6 kg, 1 % damping) with a 2 % damper on a 6 m hanger, forced at
    resonance (invented demo data):

    >>> r = simulate(1e6, 0.2, 0.01, 2e4, 6.0, 0.07, HarmonicForce(4e4, 0.2), 300.0)
    >>> print(f"{r.nonlinear.swing_deg:.1f} deg, detuning {r.detuning:.4f}, "
    ...       f"departure {r.departure:.3f}, ok {r.within_tolerance}")
    10.3 deg, detuning -0.0020, departure 0.003, ok True

    References
    ----------
    1. L. Meirovitch, Methods of Analytical Dynamics, McGraw-Hill (1970), ch. 2 (Lagrange's
       equations with Rayleigh dissipation); from memory.
    2. J. C. Butcher, Numerical Methods for Ordinary Differential Equations, Wiley, 3rd ed.
       (2016), §23 (classical Runge-Kutta), §33 (Richardson error estimate); from memory.
    3. G. F. Franklin, J. D. Powell, M. Workman, Digital Control of Dynamic Systems, 3rd ed.
       (1998), ch. 6 (exact discretisation with triangle/first-order hold); from memory.
    4. J. R. Dormand, P. J. Prince, "A family of embedded Runge-Kutta formulae", J. Comput.
       Appl. Math. 6(1):19-26 (1980) (the DOP853 family in scipy).
    """
    p = _system(modal_mass, frequency, structural_damping, damper_mass, length, damper_damping,
                g, velocity_exponent, dashpot_coefficient)
    if load is not None and not isinstance(load, (HarmonicForce, RandomForce)):
        raise ValueError(f"load={load!r} must be a HarmonicForce, a RandomForce or None")
    T = _scalar("duration", duration, 0.0, 1e6, low_open=True, unit="s")
    th0 = math.radians(_scalar("initial_angle_deg", initial_angle_deg, -180.0, 180.0,
                               low_open=True, high_open=True, unit="deg"))
    x0 = _scalar("initial_displacement", initial_displacement, unit="m")
    spp = _scalar("samples_per_period", samples_per_period, 8, 4096, unit="-")
    if spp != int(spp):
        raise ValueError(f"samples_per_period={samples_per_period!r} must be an integer in "
                         f"[8, 4096] [-]")
    tol_err = _scalar("rtol", rtol, 1e-12, 0.1, unit="-")
    tol = _scalar("tolerance", tolerance, 0.0, 1.0, low_open=True, unit="-")
    if integrator not in INTEGRATORS:
        raise ValueError(f"integrator={integrator!r} must be one of {', '.join(INTEGRATORS)}")
    notes = []
    if warmup is None:
        Tw = _auto_warmup(p, load)
        if Tw >= MAX_AUTO_WARMUP:
            notes.append(f"automatic warm-up capped at {MAX_AUTO_WARMUP:g} s: a lightly damped "
                         "building may not have settled; set warmup")
    else:
        Tw = _scalar("warmup", warmup, 0.0, 1e6, unit="s")

    f_max = max(p.fs, p.wd / (2.0 * math.pi),
                load.frequency if isinstance(load, HarmonicForce) else 0.0,
                load.corner_frequency if isinstance(load, RandomForce) else 0.0)
    dt0 = 1.0 / (f_max * spp)
    n_rec = max(int(math.ceil(T / dt0)), 2)
    if n_rec + int(math.ceil(Tw / dt0)) > MAX_SAMPLES:
        raise ValueError(f"duration={T!r} s with warmup={Tw!r} s needs more than "
                         f"{MAX_SAMPLES} samples at {int(spp)} per period; shorten the record")
    dt = T / n_rec
    n_w = int(math.ceil(Tw / dt))
    Tw = n_w * dt
    tau = np.arange(n_w + n_rec + 1) * dt       # simulation time from the start of the warm-up
    rec = slice(n_w, None)
    t = tau[rec] - Tw

    forces = None
    if isinstance(load, RandomForce):
        forces = load.samples(tau.size, dt)
    F_grid = _force_at(load, tau, forces, tau)

    # --- linear, exact
    A, B = p.coupled()
    z0 = np.array([x0, p.L * th0, 0.0, 0.0])
    try:
        z = _linear_run(A, B, load, tau, F_grid, z0)[rec]
        Ab, Bb = p.bare()
        zb = _linear_run(Ab, Bb, load, tau, F_grid, np.array([x0, 0.0]))[rec]
    except np.linalg.LinAlgError:
        raise ValueError(f"load frequency={load.frequency!r} Hz hits an undamped resonance; "
                         "give the building or the damper some damping") from None
    Fr = F_grid[rec]
    acc_lin = z @ A[2] + B[2] * Fr
    acc_bare = zb @ Ab[1] + Bb[1] * Fr

    # --- nonlinear
    y0 = (x0, 0.0, th0, 0.0)
    if integrator == "rk4":
        y, err, n_sub = _nonlinear_rk4(p, y0, load, tau, forces, n_w, tol_err)
        if err > tol_err:
            notes.append(f"integration error estimate {err:.2e} exceeds rtol={tol_err:g} at "
                         f"{n_sub} steps per sample: raise samples_per_period")
    else:
        y, err = _nonlinear_ivp(p, y0, load, tau, forces, n_w, tol_err)
        n_sub = 0
    xn, vn, thn, wn = y.T
    acc_nl, _ = _accelerations(p, xn, vn, thn, wn, Fr)
    if np.max(np.abs(thn)) > math.pi / 2:
        notes.append("the hanger swings beyond 90 deg: outside the range of a hanging damper "
                     "(stops, cable slack); results are not physical")

    # --- effective damping
    if isinstance(load, RandomForce):
        theory = _theory(p, load, T)

        def zeff(xh):
            return _zeta_from_variance(p, float(np.mean(xh**2)), load)
    else:
        theory = None
        if isinstance(load, HarmonicForce):
            def zeff(xh):
                return _harmonic_zeta(p, load, t, xh)
        else:
            def zeff(xh):
                return math.nan
            notes.append("free vibration: no effective damping is identified")
    nonlinear = _response(xn, vn, acc_nl, thn, wn, p.L * np.sin(thn), zeff(xn),
                          _tension(p, acc_nl, thn, wn))
    linear = _response(z[:, 0], z[:, 2], acc_lin, z[:, 1] / p.L, z[:, 3] / p.L, z[:, 1],
                       zeff(z[:, 0]))
    bare = _response(zb[:, 0], zb[:, 1], acc_bare, zeta_eff=zeff(zb[:, 0]))
    zero_load = load is not None and (load.amplitude if isinstance(load, HarmonicForce)
                                      else load.rms) == 0.0
    if zero_load:
        notes.append("zero load: no effective damping is identified")
    elif load is not None and math.isnan(nonlinear.effective_damping):
        notes.append("effective damping not identifiable from this response (amplitude outside "
                     "the range a bare building can produce)")

    # --- detuning
    fd = p.wd / (2.0 * math.pi)
    swing = nonlinear.swing_deg
    if swing < 180.0:
        det = float(amplitude_detuning(swing)) + 0.0   # + 0.0 turns -0.0 into 0.0
        f_at = float(pendulum_frequency(p.L, swing, p.g))
    else:
        det, f_at = math.nan, math.nan
        notes.append("the pendulum went over the top: no exact-period prediction")
    den = float(np.mean(thn * thn))
    if den > 0.0:
        ratio = float(np.mean(thn * np.sin(thn))) / den
    else:
        ratio = 1.0
    if ratio > 0.0:
        f_sim = fd * math.sqrt(ratio)
        e = min(max(1.0 / math.sqrt(ratio) - 1.0, 0.0), 10.0)
        eq_swing = float(amplitude_for_error(e))
    else:  # only when the swing goes beyond 180 deg
        f_sim, eq_swing = math.nan, math.nan
        notes.append("no equivalent linear frequency: the swing exceeds 180 deg")

    # --- verdict
    pairs = (("building displacement RMS", nonlinear.displacement_rms, linear.displacement_rms),
             ("building acceleration RMS", nonlinear.acceleration_rms, linear.acceleration_rms),
             ("stroke RMS", nonlinear.stroke_rms, linear.stroke_rms))
    departure, which = 0.0, pairs[0][0]
    for name, a, b in pairs:
        d = abs(a / b - 1.0) if b > 0 else (0.0 if a == 0 else math.inf)
        if d > departure:
            departure, which = d, name
    ok = departure <= tol and swing <= 90.0
    if swing > 90.0:
        verdict = (f"not a valid damper response: the hanger swings {swing:.0f} deg (> 90 deg); "
                   f"the load is far beyond what this damper can take")
    elif ok:
        verdict = (f"nonlinear response within {tol:.0%} of the linear design "
                   f"(largest difference {departure:.1%}, {which})")
    else:
        verdict = (f"nonlinear response departs from the linear design by {departure:.1%} "
                   f"({which}) > {tol:.0%}: swing {swing:.1f} deg detunes the damper by "
                   f"{det:.2%}; retune the hanger for the design swing or check the stroke")

    return SimulationResult(
        time=t, force=Fr, nonlinear=nonlinear, linear=linear, without_damper=bare,
        theory=theory, mass_ratio=p.m / p.M, tuning_ratio=fd / p.fs, damper_frequency=fd,
        damper_frequency_at_swing=f_at, detuning=det, simulated_damper_frequency=f_sim,
        simulated_detuning=f_sim / fd - 1.0, equivalent_swing_deg=eq_swing,
        departure=departure, departure_quantity=which, tolerance=tol, within_tolerance=ok,
        verdict=verdict, time_step=dt, integration_error=err, warmup=Tw, substeps=n_sub,
        notes=tuple(notes),
    )

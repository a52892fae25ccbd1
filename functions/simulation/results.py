# SPDX-License-Identifier: MIT
"""Results of the time-domain simulation: one model's response and the whole outcome."""
from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np

from functions.simulation.theory import RandomTheory

__all__ = ["Response", "SimulationResult", "SUMMARY_FIELDS"]

#: (name, unit, description) of the numbers returned by :func:`simulation_summary`, in order.
SUMMARY_FIELDS = (
    ("acceleration_rms", "m/s^2", "RMS building acceleration, nonlinear model"),
    ("acceleration_rms_linear", "m/s^2", "RMS building acceleration, linearised model"),
    ("acceleration_rms_without_damper", "m/s^2", "RMS building acceleration without the damper"),
    ("acceleration_peak", "m/s^2", "peak building acceleration, nonlinear model"),
    ("swing_deg", "deg", "peak swing angle of the hanger, nonlinear model"),
    ("stroke_peak", "m", "peak stroke (mass relative to the floor), nonlinear model"),
    ("effective_damping", "-", "effective damping identified from the nonlinear response"),
    ("detuning", "-", "exact-period detuning of the damper at the peak swing"),
    ("simulated_detuning", "-", "detuning of the damper identified from the simulated swing"),
    ("departure", "-", "largest relative RMS difference nonlinear vs linear"),
    ("within_tolerance", "-", "1 if departure <= tolerance and swing <= 90 deg, else 0"),
    ("tension_peak", "N", "peak total hanger tension, nonlinear model"),
)


@dataclass(frozen=True)
class Response:
    """Time histories and statistics of one model over the record.

    Attributes
    ----------
    displacement, velocity, acceleration : numpy.ndarray
        Building modal displacement [m], velocity [m/s], acceleration [m/s^2] at the damper level.
    angle_deg, angular_velocity_deg : numpy.ndarray or None
        Hanger angle from the vertical [deg] and its rate [deg/s] (None without damper).
    stroke : numpy.ndarray or None
        Horizontal displacement of the mass relative to the floor, L sin(theta) [m].
    displacement_rms, displacement_peak, acceleration_rms, acceleration_peak : float
        Root mean square and largest absolute value over the record [m], [m/s^2].
    angle_rms_deg, swing_deg : float
        RMS and peak absolute hanger angle [deg] (0 without damper).
    stroke_rms, stroke_peak : float
        RMS and peak absolute stroke [m] (0 without damper).
    effective_damping : float
        Damping ratio of the bare building that gives the same response to the same load [-]
        (see :func:`simulate`, Notes); NaN when it cannot be identified (reason in the notes).
    tension_peak : float
        Largest total tension of the hangers over the record, from the radial equation of
        the mass (nonlinear model; 0 for the linearised model and without damper) [N].
    """

    displacement: np.ndarray
    velocity: np.ndarray
    acceleration: np.ndarray
    angle_deg: np.ndarray | None
    angular_velocity_deg: np.ndarray | None
    stroke: np.ndarray | None
    displacement_rms: float
    displacement_peak: float
    acceleration_rms: float
    acceleration_peak: float
    angle_rms_deg: float
    swing_deg: float
    stroke_rms: float
    stroke_peak: float
    effective_damping: float
    tension_peak: float = 0.0


@dataclass(frozen=True)
class SimulationResult:
    """Outcome of :func:`simulate` (see there for the definitions).

    Attributes
    ----------
    time : numpy.ndarray
        Record times, from 0 after the warm-up [s].
    force : numpy.ndarray
        Force at the record times [N].
    nonlinear, linear, without_damper : Response
        Exact pendulum model, linearised model, building alone (same load).
    theory : RandomTheory or None
        Frequency-domain stationary response of the linearised model (random load only).
    mass_ratio, tuning_ratio : float
        m_d / M and small-angle damper frequency / building frequency [-].
    damper_frequency : float
        Small-angle damper frequency sqrt(g/L) / (2 pi) [Hz].
    damper_frequency_at_swing : float
        Exact-period frequency of the hanger at the peak simulated swing [Hz].
    detuning : float
        damper_frequency_at_swing / damper_frequency - 1 (pendulum.amplitude_detuning) [-].
    simulated_damper_frequency : float
        Damper frequency identified from the simulated swing (equivalent linearisation of the
        restoring moment: f_d sqrt(<theta sin theta> / <theta^2>)) [Hz].
    simulated_detuning : float
        simulated_damper_frequency / damper_frequency - 1 [-].
    equivalent_swing_deg : float
        Swing whose exact-period frequency equals simulated_damper_frequency [deg].
    departure : float
        Largest relative difference nonlinear vs linear among the RMS building displacement,
        acceleration and stroke [-].
    departure_quantity : str
        Which of the three gives ``departure`` [-].
    tolerance : float
        Accepted departure [-].
    within_tolerance : bool
        departure <= tolerance and the swing stays within 90 deg [-].
    verdict : str
        One sentence for the report [-].
    time_step, integration_error, warmup : float
        Output step [s], estimated relative global error of the nonlinear run [-], warm-up
        simulated before the record [s].
    substeps : int
        Runge-Kutta steps per output step (0 for solve_ivp) [-].
    notes : tuple of str
        Warnings and explanations (e.g. why a quantity is NaN) [-].
    """

    time: np.ndarray
    force: np.ndarray
    nonlinear: Response
    linear: Response
    without_damper: Response
    theory: RandomTheory | None
    mass_ratio: float
    tuning_ratio: float
    damper_frequency: float
    damper_frequency_at_swing: float
    detuning: float
    simulated_damper_frequency: float
    simulated_detuning: float
    equivalent_swing_deg: float
    departure: float
    departure_quantity: str
    tolerance: float
    within_tolerance: bool
    verdict: str
    time_step: float
    integration_error: float
    warmup: float
    substeps: int
    notes: tuple = field(default=())

    def summary(self) -> dict:
        """The numbers of :data:`SUMMARY_FIELDS`, as floats, in that order."""
        values = {
            "acceleration_rms": self.nonlinear.acceleration_rms,
            "acceleration_rms_linear": self.linear.acceleration_rms,
            "acceleration_rms_without_damper": self.without_damper.acceleration_rms,
            "acceleration_peak": self.nonlinear.acceleration_peak,
            "swing_deg": self.nonlinear.swing_deg,
            "stroke_peak": self.nonlinear.stroke_peak,
            "effective_damping": self.nonlinear.effective_damping,
            "detuning": self.detuning,
            "simulated_detuning": self.simulated_detuning,
            "departure": self.departure,
            "within_tolerance": 1.0 if self.within_tolerance else 0.0,
            "tension_peak": self.nonlinear.tension_peak,
        }
        return {name: float(values[name]) for name, _, _ in SUMMARY_FIELDS}


def _rms(a):
    return float(np.sqrt(np.mean(np.square(a)))) if a.size else 0.0


def _peak(a):
    return float(np.max(np.abs(a))) if a.size else 0.0


def _response(x, v, acc, theta=None, omega=None, stroke=None, zeta_eff=math.nan,
              tension=None):
    angle = None if theta is None else np.degrees(theta)
    rate = None if omega is None else np.degrees(omega)
    return Response(
        displacement=x, velocity=v, acceleration=acc, angle_deg=angle,
        angular_velocity_deg=rate, stroke=stroke,
        displacement_rms=_rms(x), displacement_peak=_peak(x),
        acceleration_rms=_rms(acc), acceleration_peak=_peak(acc),
        angle_rms_deg=_rms(angle) if angle is not None else 0.0,
        swing_deg=_peak(angle) if angle is not None else 0.0,
        stroke_rms=_rms(stroke) if stroke is not None else 0.0,
        stroke_peak=_peak(stroke) if stroke is not None else 0.0,
        effective_damping=zeta_eff,
        tension_peak=_peak(tension) if tension is not None else 0.0,
    )

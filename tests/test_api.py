# SPDX-License-Identifier: MIT
"""The public API promised by the issues exists under its exact names and argument order."""
from __future__ import annotations

import inspect

import pytest

import functions

# name -> parameters in order, as the issues specify them
PROMISED = {
    "exact_period": ["length", "amplitude_deg", "g"],
    "small_angle_period": ["length", "g"],
    "small_angle_error": ["amplitude_deg"],
    "amplitude_for_error": ["error"],
    "pendulum_frequency": ["length", "amplitude_deg", "g"],
    "equivalent_length": ["frequency", "amplitude_deg", "g"],
    "compound_pendulum_length": ["inertia_about_pivot", "mass", "pivot_to_centre"],
    "pendulum_motion": ["time", "length", "amplitude_deg", "g"],
    "modal_mass": ["floor_masses", "mode_shape", "damper_level"],
    "damper_mass_ratio": ["damper_mass", "modal_mass"],
    "optimal_tuning": ["mass_ratio", "method", "structural_damping"],
    "effective_damping": ["mass_ratio", "tuning_ratio", "damper_damping", "structural_damping"],
    "required_damping": ["acceleration", "acceleration_limit", "structural_damping"],
    "required_mass_ratio": ["total_damping", "structural_damping", "method"],  # issue 11
    "stroke_ratio": ["mass_ratio", "tuning_ratio", "damper_damping", "structural_damping"],
}


@pytest.mark.parametrize("name, params", PROMISED.items())
def test_promised_function_exists_with_its_arguments(name, params):
    func = getattr(functions, name)
    assert list(inspect.signature(func).parameters) == params


def test_defaults():
    sig = inspect.signature(functions.exact_period)
    assert sig.parameters["amplitude_deg"].default == 0.0
    assert sig.parameters["g"].default == functions.STANDARD_GRAVITY == 9.80665
    assert inspect.signature(functions.optimal_tuning).parameters["method"].default == "den_hartog"
    assert inspect.signature(functions.modal_mass).parameters["damper_level"].default == -1
    assert inspect.signature(functions.required_mass_ratio).parameters["method"].default == "h2"


def test_engine_does_not_import_xlwings():
    import sys
    import subprocess
    code = ("import sys, functions, functions.simulation; "
            "sys.exit(1 if 'xlwings' in sys.modules else 0)")
    assert subprocess.run([sys.executable, "-c", code]).returncode == 0

# SPDX-License-Identifier: MIT
"""Projects that several test modules build workbooks from (invented buildings, no real data).

The ``built`` fixture of ``tests/conftest.py`` builds them; tests that need the projects
themselves import them from here.
"""
from __future__ import annotations

import dataclasses
from pathlib import Path

from workbook_builder.project import load_project

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
NAMES = ["residential_tower", "observation_mast", "office_tower_us", "slender_tower_us"]

#: A small project (invented); its title and notes look like formulas and must stay text.
MINIMAL = """\
[project]
number = "T-1"
title = "=1+1"
notes = "=SUM(A1:A3) stays text"

[mode]
frequency = 0.2
modal_mass = { value = 10000, unit = "t" }
structural_damping = 0.01

[wind]
acceleration = 0.25
acceleration_limit = 0.15

[damper]
mass_ratio = 0.02
clearance = 1.5
"""

#: MINIMAL with a harmonic storm: the load four times the wind input, a short record.
HARMONIC = MINIMAL + """
[simulation]
load = "harmonic"
duration = 120
load_factor = 4
tolerance = 0.01
"""

DEN_HARTOG = {
    "project": {"number": "T-6", "title": "Recalc test (invented)"},
    "mode": {"frequency": 0.2, "modal_mass": {"value": 9000, "unit": "t"},
             "structural_damping": {"value": 1.0, "unit": "%"}},
    "wind": {"acceleration": 0.25, "acceleration_limit": 0.15},
    "damper": {"mass_ratio": 0.02, "clearance": 1.5, "tuning_method": "den_hartog"},
}


def example_project(name: str, **typed):
    """An example project without its time-domain simulation, inputs changed as typed."""
    project = load_project(EXAMPLES / f"{name}.toml")
    if getattr(project, "simulation", None) is not None:
        project = dataclasses.replace(project, simulation=None)
    inputs = dict(project.inputs)
    for key, value in typed.items():
        iv = inputs[key]
        inputs[key] = dataclasses.replace(iv, value=value, si=value * iv.unit.factor)
    return dataclasses.replace(project, inputs=inputs)

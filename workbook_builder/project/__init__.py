# SPDX-License-Identifier: MIT
"""Project files and units: what the user writes, validated against the engine's declarations.

    units    input units and their exact factors to SI; the US display units
    schema   the project-file keys, derived from functions.quantities
    model    Project, InputValue, Floors, SimulationSettings
    reader   TOML project files: parse, validate, name file, line and key in every refusal
    cases    CSV case tables: one project per row
"""
from .cases import load_cases, output_names
from .model import Floors, InputValue, Project, ProjectError, SimulationSettings
from .reader import load_project, parse_project

__all__ = ["load_cases", "output_names", "load_project", "parse_project", "Project", "ProjectError",
           "InputValue", "Floors", "SimulationSettings"]

# SPDX-License-Identifier: MIT
"""The design chain's part ``supply``: what the damper's manufacturer and the structure need.

Sections of :func:`functions.chain.sections` when the project gives the table ``[supply]``
(inputs :data:`functions.quantities_supply.SUPPLY_INPUTS`): the dashpots (velocity, law,
equivalent damping at both wind levels, force per unit, heat), the hangers (tensions, breaking
load, stretch), the mass block and the space it takes (folded into stages when the height is
short), and the forces on the structure (horizontal at both levels, vertical, buffers). With a
second direction its dashpots and forces follow, as copies of the main direction's steps
renamed (:func:`functions.worksheet.renamed`), and the hangers take the combined swing.

Every step is a closed form declared in :mod:`functions.dashpots` or
:mod:`functions.suspension` beside its worksheet formula (no engine value). Imports run one
way: chain -> chain_supply -> dashpots, suspension, steps, worksheet.
"""
from __future__ import annotations

from functions.dashpots import DASHPOT_FORMS
from functions.quantities_supply import SECOND_DIRECTION_SUPPLY
from functions.steps import Section, Step, closed_form, from_form, second_of
from functions.suspension import SUSPENSION_FORMS
from functions.worksheet import renamed

__all__ = ["supply_sections"]

_DASHPOT_STEPS = ("peak_factor", "damper_velocity", "extreme_damper_velocity")
_LAW_STEPS = ("dashpot_reference_force", "dashpot_coefficient", "dashpot_damping_random",
              "dashpot_damping_harmonic", "extreme_dashpot_damping_random",
              "extreme_dashpot_damping_harmonic", "dashpot_unit_force",
              "extreme_dashpot_unit_force", "dashpot_power", "extreme_dashpot_power",
              "extreme_dashpot_heat")
_HANGER_STEPS = ("hanger_static_tension", "hanger_peak_tension", "extreme_hanger_tension",
                 "hanger_breaking_load", "hanger_stretch", "unstretched_length",
                 "stretch_frequency_error")
_SPACE_STEPS = ("block_volume", "block_height", "stage_count", "stage_length",
                "vertical_space", "plan_space_1", "plan_space_2")
_FORCE_STEPS = ("horizontal_force", "extreme_horizontal_force")
_LOAD_STEPS = ("static_vertical_load", "extreme_vertical_load", "buffer_deflection",
               "buffer_force")

#: The swing each hanger step reads, and the combined swing it reads with two directions.
_COMBINED_SWING = {"swing_angle_deg": "combined_swing_deg",
                   "extreme_swing_deg": "extreme_combined_swing_deg"}


def _reference_velocity(at_extreme: bool) -> Step:
    """The velocity at which the dashpots give the design damping (the chosen level's)."""
    source = "The wind level chosen for the dashpots ([supply] dashpot_level)"
    if at_extreme:
        return closed_form("dashpot_reference_velocity", "=extreme_damper_velocity",
                           lambda extreme_damper_velocity: extreme_damper_velocity,
                           "v_d,x (extreme level)", source)
    return closed_form("dashpot_reference_velocity", "=damper_velocity",
                       lambda damper_velocity: damper_velocity, "v_d (service level)", source)


def _forms(names: tuple[str, ...], forms: dict, swing: dict | None = None) -> list[Step]:
    """Steps from declared twins (reading the combined swing where ``swing`` maps it)."""
    out = []
    for name in names:
        form = forms[name]
        if swing and set(form.worksheet.names) & set(swing):
            form = renamed(form, swing, form.worksheet.expression + " (combined swing)")
        out.append(from_form(name, form))
    return out


def supply_sections(parts: tuple[str, ...], second_names: dict[str, str]) -> list[Section]:
    """The sections of the part ``supply`` for the calculation's optional ``parts``.

    ``second_names`` maps the main direction's defined names to direction 2's (the chain's
    map); the supply's own results are added to it here.
    """
    at_extreme = "dashpots_at_extreme" in parts
    two = "direction_2" in parts
    dashpots = [*_forms(_DASHPOT_STEPS, DASHPOT_FORMS), _reference_velocity(at_extreme),
                *_forms(_LAW_STEPS, DASHPOT_FORMS)]
    forces = _forms(_FORCE_STEPS, DASHPOT_FORMS)
    level = "extreme" if at_extreme else "service"
    out = [
        Section("Dashpots", tuple(dashpots),
                "Law F = C |v|^alpha sign(v) (alpha = 1: linear, C = c). C is set so that the "
                f"dashpots give the design damping at the {level} level by statistical "
                "linearisation of a Gaussian velocity (Elliott, Ghandchi Tehrani & Langley, "
                "Phil. Trans. R. Soc. A 373 (2015) 20140402); the damping they give at each "
                "level is shown by that rule (random response) and by equal energy per cycle "
                "(harmonic response). Velocities are harmonic at f_s from the peak strokes; "
                "the standard deviation is the peak over the peak factor. The response above "
                "(sections 4-5 and the extreme level) takes the design damping: with alpha "
                "!= 1 compare the equivalent damping with zeta_d, and run the time-domain "
                "check with the law."),
        Section("Hangers, mass block and space", tuple(
            _forms(_HANGER_STEPS, SUSPENSION_FORMS, _COMBINED_SWING if two else None)
            + _forms(_SPACE_STEPS, SUSPENSION_FORMS)),
                "n_h parallel hangers of equal length: the block translates, so the pendulum "
                "length L is the hanger length pin to pin. Tension at the bottom of a free "
                "swing of amplitude theta: m_d g (3 - 2 cos theta), shared equally (textbook "
                "dynamics; the time-domain check gives the value under the wind)"
                + (", at the combined swing of both directions" if two else "") + ". The "
                "factor of safety is the designer's choice. A pendulum longer than the height "
                "allows is folded into n_s equal stages, which act as one pendulum of the "
                "summed length."),
        Section("Forces on the structure", tuple(forces + _forms(_LOAD_STEPS,
                                                                 SUSPENSION_FORMS)),
                "At the damper's level, per direction: the restoring force (hangers and "
                "springs, k x_d) and the dashpots' force (C v^alpha) in harmonic motion, "
                "combined by a Hoelder bound (exact for a linear dashpot, conservative "
                "otherwise); vertical: the block's weight, and at the extreme swing the "
                "hangers' tension at the bottom of the swing. Buffers: a linear buffer of "
                "stiffness k_b absorbs the contact energy m_d v_b^2 / 2."),
    ]
    if two:
        names = {**second_names, **{n: n + "_2" for n in SECOND_DIRECTION_SUPPLY}}
        first = {s.name: s for sec in out for s in sec.steps}
        combined = {"contact_velocity": "combined_contact_velocity",
                    "buffer_deflection": "combined_buffer_deflection",
                    "buffer_force": "combined_buffer_force"}
        out.append(Section("Dashpots and forces, second direction", (
            *(second_of(first[n], names) for n in SECOND_DIRECTION_SUPPLY),
            *(from_form(combined[n], renamed(
                SUSPENSION_FORMS[n], combined,
                SUSPENSION_FORMS[n].worksheet.expression + " (both directions)"))
              for n in ("buffer_deflection", "buffer_force")),
        ), "Direction 2's dashpots follow the same law, number of units and wind level, "
           "sized for its own dashpot constant c_2 and velocity; its restoring stiffness "
           "includes the springs. The buffers take the combined (SRSS) stroke's contact "
           "velocity."))
    return out

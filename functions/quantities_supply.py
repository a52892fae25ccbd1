# SPDX-License-Identifier: MIT
"""Quantities of the damper's supply specification, declared once.

The part ``supply`` of the calculation (:mod:`functions.chain`) turns the tuned damper into
what a manufacturer and the structural engineer need: the dashpots' law, velocity, force and
heat, the hangers' tensions, breaking load and stretch, the mass block and the space it takes,
the forces on the floor that carries the damper. Its inputs are the project-file table
``[supply]`` (:data:`SUPPLY_INPUTS`); its results :data:`SUPPLY_RESULTS` (the main direction,
the hangers, the block and the space) and :data:`SUPPLY_RESULTS_2` (the second direction's
dashpots and forces, and the buffers of both directions). :mod:`functions.quantities` adds them
to its groups; the physics is in :mod:`functions.dashpots` and :mod:`functions.suspension`.
"""
from __future__ import annotations

from functions.quantity import LENGTH_FMT, OPTIONAL, Quantity, declare, second_direction

__all__ = ["SUPPLY_INPUTS", "SUPPLY_RESULTS", "SUPPLY_RESULTS_2", "SUPPLY_TABLE",
           "DASHPOT_LEVELS", "SECOND_DIRECTION_SUPPLY"]

_q = declare
_LENGTH_FMT = LENGTH_FMT
_FORCE_FMT = "#,##0"
_RATIO_FMT = "0.000000"

#: Wind levels at which the dashpots may be set to give the design damping.
DASHPOT_LEVELS = ("service", "extreme")

#: Inputs the table ``[supply]`` must hold (the others have defaults).
SUPPLY_TABLE = ("hanger_count", "hanger_safety_factor", "hanger_axial_stiffness",
                "block_length_1", "block_length_2", "available_height", "buffer_stiffness")

#: Inputs of the supply specification (project-file table ``[supply]``), in the order of the
#: workbook's Inputs sheet.
SUPPLY_INPUTS: tuple[Quantity, ...] = (
    _q("velocity_exponent", "alpha", "Dashpot velocity exponent (1: linear)", "-", "fraction",
       0.0, 2.0, low_open=True, default=1.0, fmt="0.000", section="supply",
       description="Exponent alpha of the dashpot law F = C |v|^alpha sign(v)",
       note="1 for a linear (viscous) dashpot; below 1 the force grows less than the "
            "velocity. From the dashpot manufacturer."),
    _q("dashpot_units", "n_c", "Dashpots per direction", "-", "count", 1, 100, default=1,
       section="supply", description="Number of equal dashpots that share one direction's "
                                     "damping",
       note="Forces per unit are the direction's total over this number."),
    _q("dashpot_level", "", "Wind level at which the dashpots give the design damping", "",
       "choice", default="service", choices=DASHPOT_LEVELS, section="supply",
       description="service or extreme: the level at which a velocity-exponent dashpot's "
                   "equivalent damping equals the design damping",
       note="A dashpot with alpha != 1 damps differently at each level; the Calculation "
            "sheet is laid out for the level (rebuild to change it)."),
    _q("hanger_count", "n_h", "Number of hangers", "-", "count", 1, 100, default=OPTIONAL,
       section="supply", description="Parallel hangers of equal length that carry the mass",
       note="Three or more parallel hangers let the block translate without rotating, so the "
            "pendulum length is the hanger length pin to pin."),
    _q("hanger_safety_factor", "gamma_h", "Factor of safety on the hangers' breaking load "
       "(designer's choice)", "-", "fraction", 1.0, 20.0, default=OPTIONAL, fmt="0.00",
       section="supply", description="Minimum breaking load over peak tension, chosen by the "
                                     "designer",
       note="The designer's choice for the project and the hanger type (rod, strand, rope); "
            "no value is implied by swaytune."),
    _q("hanger_axial_stiffness", "EA", "Axial stiffness of one hanger (E A)", "N", "force",
       0.0, 1e13, low_open=True, default=OPTIONAL, fmt="0.000E+00", section="supply",
       description="Elastic modulus times metallic area of one hanger",
       note="Manufacturer's data: for strand and rope the effective modulus is well below "
            "that of solid steel."),
    _q("block_density", "rho", "Density of the mass block", "kg/m^3", "density", 500.0,
       25000.0, default=7850.0, fmt="#,##0", section="supply",
       description="Density of the mass block's material",
       note="Steel 7850, reinforced concrete 2500 kg/m^3 (EN 1991-1-1:2002 Tables A.4 and "
            "A.1); lead or steel-filled concrete for a compact block."),
    _q("block_length_1", "b_1", "Mass block: plan dimension along direction 1", "m",
       "length", 0.0, 100.0, low_open=True, default=OPTIONAL, fmt=_LENGTH_FMT,
       section="supply", description="Plan dimension of the block along the main direction",
       note="The footprint the crown allows; the height follows from the mass and density."),
    _q("block_length_2", "b_2", "Mass block: plan dimension along direction 2", "m",
       "length", 0.0, 100.0, low_open=True, default=OPTIONAL, fmt=_LENGTH_FMT,
       section="supply", description="Plan dimension of the block across the main direction",
       note="Direction 2 is the second sway direction when given."),
    _q("available_height", "H", "Vertical space available, pivot to the lowest point", "m",
       "length", 0.0, 1000.0, low_open=True, default=OPTIONAL, fmt=_LENGTH_FMT,
       section="supply", description="Clear height from the hangers' pivots to the lowest "
                                     "point the mass may reach",
       note="When the pendulum and block do not fit, the pendulum is folded into stages."),
    _q("buffer_stiffness", "k_b", "Buffer stiffness (linear, one buffer)", "N/m", "stiffness",
       0.0, 1e13, low_open=True, default=OPTIONAL, fmt=_FORCE_FMT, section="supply",
       description="Stiffness of the buffer that stops the mass beyond the clearance",
       note="Elastomer or spring buffer; manufacturer's data."),
)

_X = "Extreme level: "
_DP = "Dashpots: "


def _r(name: str, symbol: str, label: str, unit: str, kind: str, fmt: str, description: str,
       summary: bool = False) -> Quantity:
    return _q(name, symbol, label, unit, kind, fmt=fmt, description=description,
              summary=summary)


#: Results of the supply specification for the main direction, the hangers, the mass block,
#: the space and the buffers, in checking order.
SUPPLY_RESULTS: tuple[Quantity, ...] = (
    _r("peak_factor", "g_p", "Peak factor of the random response (Davenport, 10 min)", "-",
       "fraction", "0.000", "Peak over standard deviation of a Gaussian response at f_s over "
       "600 s (Davenport 1964)"),
    _r("damper_velocity", "v_d", "Service level: peak velocity of the damper (relative)",
       "m/s", "velocity", "0.0000", "Peak velocity of the mass relative to the structure, "
       "2 pi f_s x_d"),
    _r("extreme_damper_velocity", "v_d,x", _X + "peak velocity of the damper (relative)",
       "m/s", "velocity", "0.0000", _X + "peak relative velocity, 2 pi f_s x_d,x"),
    _r("dashpot_reference_velocity", "v_ref", _DP + "velocity at which they give the "
       "design damping", "m/s", "velocity", "0.0000", "Peak relative velocity at the level "
       "chosen for the dashpots"),
    _r("dashpot_reference_force", "F_ref", _DP + "force at that velocity (all units)", "N",
       "force", _FORCE_FMT, "Force of the direction's dashpots at the reference velocity: "
       "the law is F = F_ref (v / v_ref)^alpha"),
    _r("dashpot_coefficient", "C_alpha", _DP + "coefficient C of F = C |v|^alpha (all units, "
       "SI)", "N (s/m)^a", "dashpot_law", "0.000E+00", "Coefficient of the dashpot law for "
       "the direction's units together, in N (s/m)^alpha"),
    _r("dashpot_damping_random", "zeta_r", _DP + "equivalent damper damping, service level, "
       "random response", "-", "fraction", _RATIO_FMT, "Damper damping of the linear dashpot "
       "equivalent by statistical linearisation (Gaussian velocity)"),
    _r("dashpot_damping_harmonic", "zeta_h", _DP + "equivalent damper damping, service "
       "level, harmonic response", "-", "fraction", _RATIO_FMT, "Damper damping of the linear "
       "dashpot equivalent by equal energy per cycle (harmonic velocity)"),
    _r("extreme_dashpot_damping_random", "zeta_r,x", _DP + "equivalent damper damping, "
       "extreme level, random response", "-", "fraction", _RATIO_FMT, _X + "damper damping "
       "equivalent by statistical linearisation"),
    _r("extreme_dashpot_damping_harmonic", "zeta_h,x", _DP + "equivalent damper damping, "
       "extreme level, harmonic response", "-", "fraction", _RATIO_FMT, _X + "damper "
       "damping equivalent by equal energy per cycle"),
    _r("dashpot_unit_force", "F_c", _DP + "peak force of one unit, service level", "N",
       "force", _FORCE_FMT, "C v_d^alpha / n_c"),
    _r("extreme_dashpot_unit_force", "F_c,x", _DP + "peak force of one unit, extreme level",
       "N", "force", _FORCE_FMT, _X + "C v_d,x^alpha / n_c", summary=True),
    _r("dashpot_power", "P", _DP + "mean power dissipated, service level (all units)", "W",
       "power", _FORCE_FMT, "Mean power of a Gaussian response, C E|v|^(1+alpha)"),
    _r("extreme_dashpot_power", "P_x", _DP + "mean power dissipated, extreme level (all "
       "units)", "W", "power", _FORCE_FMT, _X + "mean power of a Gaussian response"),
    _r("extreme_dashpot_heat", "Q_x", _DP + "heat in one hour at the extreme level (all "
       "units)", "J", "energy", _FORCE_FMT, _X + "mean power times 3600 s: the heat the "
       "dashpots must shed in an hour of storm"),
    _r("horizontal_force", "F_h", "Service level: peak horizontal force on the structure",
       "N", "force", _FORCE_FMT, "Peak of restoring (hangers, springs) and dashpot forces in "
       "harmonic motion (Hoelder bound, exact for a linear dashpot)"),
    _r("extreme_horizontal_force", "F_h,x", _X + "peak horizontal force on the structure",
       "N", "force", _FORCE_FMT, _X + "peak horizontal force of hangers, springs and "
       "dashpots", summary=True),
    _r("hanger_static_tension", "T_0", "Hangers: static tension of one hanger", "N", "force",
       _FORCE_FMT, "m_d g / n_h"),
    _r("hanger_peak_tension", "T_d", "Hangers: peak tension of one hanger at the design "
       "swing", "N", "force", _FORCE_FMT, "m_d g (3 - 2 cos theta) / n_h, free-swing bound "
       "(combined swing with two directions)"),
    _r("extreme_hanger_tension", "T_x", "Hangers: peak tension of one hanger at the extreme "
       "swing", "N", "force", _FORCE_FMT, "m_d g (3 - 2 cos theta_x) / n_h, free-swing bound "
       "(combined swing with two directions)"),
    _r("hanger_breaking_load", "MBL", "Hangers: minimum breaking load of one hanger", "N",
       "force", _FORCE_FMT, "Designer's factor of safety times the extreme peak tension",
       summary=True),
    _r("hanger_stretch", "delta_h", "Hangers: static stretch", "m", "length", "0.00000",
       "T_0 L / (E A): the hangers lengthen under the block's weight"),
    _r("unstretched_length", "L_cut", "Hangers: length before loading (all stages)", "m",
       "length", _LENGTH_FMT, "L - delta_h: cut the hangers to this so that, loaded, the "
       "pendulum has its tuned length"),
    _r("stretch_frequency_error", "e_delta", "Hangers: frequency error if the stretch were "
       "ignored", "-", "fraction", _RATIO_FMT, "sqrt(L / (L + delta_h)) - 1: hangers cut to "
       "L would stretch and run slow"),
    _r("block_volume", "V_b", "Mass block: volume", "m^3", "volume", "0.000",
       "m_d / rho"),
    _r("block_height", "h_b", "Mass block: height", "m", "length", _LENGTH_FMT,
       "V_b / (b_1 b_2)"),
    _r("stage_count", "n_s", "Pendulum stages (folded when more than 1)", "-", "count",
       "0", "Least number of stages whose length and the block fit the height available",
       summary=True),
    _r("stage_length", "L_s", "Length of one stage", "m", "length", _LENGTH_FMT,
       "L / n_s: stages in series act as one pendulum of the summed length"),
    _r("vertical_space", "H_req", "Vertical space needed, pivot to the bottom of the mass",
       "m", "length", _LENGTH_FMT, "L_s + h_b", summary=True),
    _r("plan_space_1", "B_1", "Plan space for the swing along direction 1", "m", "length",
       _LENGTH_FMT, "b_1 + 2 x_max: the block and its travel to the buffers both ways"),
    _r("plan_space_2", "B_2", "Plan space for the swing along direction 2", "m", "length",
       _LENGTH_FMT, "b_2 + 2 x_max: the block and its travel to the buffers both ways"),
    _r("static_vertical_load", "W", "Vertical load on the structure, static", "N", "force",
       _FORCE_FMT, "m_d g"),
    _r("extreme_vertical_load", "W_x", _X + "peak vertical load on the structure", "N",
       "force", _FORCE_FMT, _X + "m_d g (3 - 2 cos theta_x), all hangers at the bottom of "
       "the swing"),
    _r("buffer_deflection", "d_b", _X + "buffer deflection at contact", "m", "length",
       "0.00000", _X + "v_b sqrt(m_d / k_b): a linear buffer takes the contact energy"),
    _r("buffer_force", "F_b", _X + "buffer contact force", "N", "force", _FORCE_FMT,
       _X + "v_b sqrt(m_d k_b) (0: no contact)", summary=True),
)

_BY_NAME = {q.name: q for q in SUPPLY_RESULTS}

#: Names of the main direction's dashpot and force results that direction 2 repeats.
SECOND_DIRECTION_SUPPLY = (
    "peak_factor", "damper_velocity", "extreme_damper_velocity", "dashpot_reference_velocity",
    "dashpot_reference_force", "dashpot_coefficient", "dashpot_damping_random",
    "dashpot_damping_harmonic", "extreme_dashpot_damping_random",
    "extreme_dashpot_damping_harmonic", "dashpot_unit_force", "extreme_dashpot_unit_force",
    "dashpot_power", "extreme_dashpot_power", "extreme_dashpot_heat", "horizontal_force",
    "extreme_horizontal_force")

#: Results of the supply specification for the second direction (with ``[direction_2]``).
SUPPLY_RESULTS_2: tuple[Quantity, ...] = (
    *(second_direction(_BY_NAME[n], summary=_BY_NAME[n].summary)
      for n in SECOND_DIRECTION_SUPPLY),
    _r("combined_buffer_deflection", "d_b,r", "Extreme level, both directions: buffer "
       "deflection at contact", "m", "length", "0.00000", "v_b,r sqrt(m_d / k_b)"),
    _r("combined_buffer_force", "F_b,r", "Extreme level, both directions: buffer contact "
       "force", "N", "force", _FORCE_FMT, "v_b,r sqrt(m_d k_b) (0: no contact)",
       summary=True),
)

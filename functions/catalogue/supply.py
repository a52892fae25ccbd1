# SPDX-License-Identifier: MIT
"""Worksheet functions of the damper's supply specification.

The entries of :mod:`functions.dashpots` (velocity-exponent dashpots: the constants of the two
linearisations, the equivalent linear dashpot and its inverse, the mean power, the peak force
of spring and dashpot together) and of :mod:`functions.suspension` (hanger tension, breaking
load and stretch, mass block, folded stages, swing space, buffer contact). An engine result of
two or three numbers has one worksheet function per number.
"""
from __future__ import annotations

from functions import dashpots, suspension
from functions.catalogue.declaration import TEXT, Argument, SheetFunction
from functions.catalogue.mechanics import GRAVITY

__all__ = ["SUPPLY"]

_EGTL = ("Elliott, Ghandchi Tehrani & Langley, Phil. Trans. R. Soc. A 373 (2015) 20140402; "
         "the Gamma-function forms are derived in functions/dashpots.py.")

EXPONENT = Argument("velocity_exponent", "Velocity exponent alpha of the dashpot law F = C "
                    "|v|^alpha, in (0, 2]; 1 linear [-].", "-")
COEFFICIENT = Argument("coefficient", "Coefficient C of the law F = C |v|^a (a = alpha), > 0 "
                       "[N (s/m)^a].", "N (s/m)^a")
VELOCITY = Argument("velocity", "Velocity of the damper relative to the structure: its "
                    "standard deviation for a random response, its amplitude for a harmonic "
                    "one, > 0 [m/s].", "m/s")
RESPONSE = Argument("response", "random (Gaussian velocity: statistical linearisation) or "
                    "harmonic (equal energy per cycle) [-]. Empty: random.", "-", default="random",
                    kind=TEXT, choices=dashpots.RESPONSES)
DAMPER_MASS = Argument("damper_mass", "Moving mass of the damper, > 0 [kg].", "kg")
HANGERS = Argument("hanger_count", "Number of parallel hangers sharing the load, >= 1. Empty: "
                   "1 [-].", "-", default=1, integer=True)
LENGTH = Argument("length", "Pendulum (hanger) length, loaded, > 0 [m].", "m")
_BLOCK_ARGS = (DAMPER_MASS,
               Argument("density", "Density of the block's material, > 0 [kg/m^3].",
                        "kg/m^3"),
               Argument("plan_length_1", "Plan dimension of the block, > 0 [m].", "m"),
               Argument("plan_length_2", "Other plan dimension of the block, > 0 [m].", "m"))
_BLOCK_EXAMPLE = (287e3, 7850.0, 4.0, 4.0)
_STAGE_ARGS = (LENGTH,
               Argument("available_height", "Height available from the pivots to the lowest "
                        "point of the mass, > block_height [m].", "m"),
               Argument("block_height", "Height of the mass block, > 0 [m].", "m"))
_STAGE_EXAMPLE = (11.29, 6.0, 2.285)
_BUFFER_ARGS = (Argument("contact_velocity", "Velocity of the mass reaching the buffer, >= 0 "
                         "[m/s].", "m/s"),
                DAMPER_MASS,
                Argument("buffer_stiffness", "Stiffness of the (linear) buffer, > 0 [N/m].",
                         "N/m"))
_BUFFER_EXAMPLE = (1.84927, 287e3, 2.0e6)

SUPPLY: tuple[SheetFunction, ...] = (
    SheetFunction(
        "SWAY_DASHPOT_ENERGY_CONSTANT", dashpots.energy_constant,
        "Constant lambda of the equal-energy linearisation: c_eq = lambda C V^(alpha-1) / pi, "
        "lambda = 2^(2+alpha) Gamma(1+alpha/2)^2 / Gamma(2+alpha) [-].",
        "Energy constant lambda", "-", (EXPONENT,), "supply", example=(0.5,), notes=_EGTL),
    SheetFunction(
        "SWAY_DASHPOT_RANDOM_CONSTANT", dashpots.random_constant,
        "Constant kappa of the statistical linearisation: c_eq = kappa C sigma^(alpha-1), "
        "kappa = 2^((1+alpha)/2) Gamma(1+alpha/2) / sqrt(pi) [-].",
        "Random constant kappa", "-", (EXPONENT,), "supply", example=(0.5,), notes=_EGTL),
    SheetFunction(
        "SWAY_EQUIVALENT_DASHPOT", dashpots.equivalent_dashpot,
        "Linear dashpot equivalent to C |v|^alpha at a velocity (random: its standard "
        "deviation; harmonic: its amplitude) [N s/m].",
        "Equivalent linear dashpot", "N s/m", (COEFFICIENT, EXPONENT, VELOCITY, RESPONSE),
        "supply", example=(11126.3, 0.5, 0.25), notes=_EGTL),
    SheetFunction(
        "SWAY_DASHPOT_COEFFICIENT", dashpots.dashpot_coefficient,
        "Coefficient C of F = C |v|^alpha whose equivalent linear dashpot is c at a velocity "
        "[N (s/m)^a].",
        "Dashpot coefficient C", "N (s/m)^a",
        (Argument("dashpot", "Linear dashpot constant to equal, > 0 [N s/m].", "N s/m"),
         EXPONENT, VELOCITY, RESPONSE),
        "supply", example=(19199.3, 0.5, 0.25), notes=_EGTL),
    SheetFunction(
        "SWAY_DASHPOT_POWER", dashpots.mean_dashpot_power,
        "Mean power dissipated by C |v|^alpha: random kappa C sigma^(1+alpha), harmonic "
        "lambda C V^(1+alpha) / (2 pi) [W].",
        "Mean dissipated power", "W", (COEFFICIENT, EXPONENT, VELOCITY, RESPONSE), "supply",
        example=(11126.3, 0.5, 0.25), notes=_EGTL + " Times 3600 s: the heat in an hour."),
    SheetFunction(
        "SWAY_PEAK_FORCE_BOUND", dashpots.peak_force_bound,
        "Upper bound of the peak of spring and dashpot forces in harmonic motion, (F_k^p + "
        "F_d^p)^(1/p), p = 2 / (2 - min(alpha, 1)) [N].",
        "Peak force of spring and dashpot", "N",
        (Argument("spring_force", "Peak spring (restoring) force k x, >= 0 [N].", "N"),
         Argument("dashpot_force", "Peak dashpot force C v^alpha, >= 0 [N].", "N"),
         EXPONENT),
        "supply", example=(300e3, 400e3, 0.5),
        notes="Hoelder's inequality: exact for a linear dashpot (root sum of squares), "
              "conservative otherwise (tests/test_dashpots.py measures by how much)."),
    SheetFunction(
        "SWAY_HANGER_TENSION", suspension.hanger_tension,
        "Peak tension of one hanger at the bottom of a free swing, m g (3 - 2 cos theta) / n; "
        "0 deg: the static tension [N].",
        "Hanger tension", "N",
        (DAMPER_MASS, Argument("amplitude_deg", "Swing amplitude, 0 to 90 [deg].", "deg"),
         HANGERS, GRAVITY),
        "supply", example=(287e3, 11.6355, 4),
        notes="Parallel hangers of equal length share the load; energy conservation and the "
              "radial equation of motion (textbook dynamics)."),
    SheetFunction(
        "SWAY_HANGER_BREAKING_LOAD", suspension.minimum_breaking_load,
        "Minimum breaking load of a hanger: the designer's factor of safety times its peak "
        "tension [N].",
        "Minimum breaking load", "N",
        (Argument("tension", "Peak tension of the hanger, >= 0 [N].", "N"),
         Argument("safety_factor", "Factor of safety, the designer's choice, >= 1 [-].", "-")),
        "supply", example=(183103.0, 4.0)),
    SheetFunction(
        "SWAY_HANGER_STRETCH", suspension.hanger_stretch,
        "Elastic stretch of a hanger, T L / (E A) [m].",
        "Hanger stretch", "m",
        (Argument("tension", "Tension of the hanger, >= 0 [N].", "N"), LENGTH,
         Argument("axial_stiffness", "Axial stiffness E A of the hanger, > 0 [N].", "N")),
        "supply", example=(703627.0, 11.29, 1.2e9)),
    SheetFunction(
        "SWAY_STRETCH_FREQUENCY_ERROR", suspension.stretch_frequency_error,
        "Frequency error of hangers cut to L that stretch by delta, sqrt(L / (L + delta)) - 1 "
        "[-].",
        "Frequency error of the stretch", "-",
        (LENGTH, Argument("stretch", "Stretch of the hangers, >= 0 [m].", "m")),
        "supply", example=(11.29, 0.00662)),
    SheetFunction(
        "SWAY_BLOCK_VOLUME", suspension.mass_block,
        "Volume of the mass block, m_d / rho [m^3].", "Block volume", "m^3", _BLOCK_ARGS,
        "supply", output=0, example=_BLOCK_EXAMPLE),
    SheetFunction(
        "SWAY_BLOCK_HEIGHT", suspension.mass_block,
        "Height of the mass block on its footprint, m_d / (rho b_1 b_2) [m].", "Block height",
        "m", _BLOCK_ARGS, "supply", output=1, example=_BLOCK_EXAMPLE),
    SheetFunction(
        "SWAY_STAGE_COUNT", suspension.pendulum_stages,
        "Least number of equal stages of a folded pendulum that, with the block, fit the "
        "height available, max(1, ceil(L / (H - h))) [-].",
        "Number of stages", "-", _STAGE_ARGS, "supply", output=0, example=_STAGE_EXAMPLE,
        notes="Stages in series act as one pendulum of the summed length "
              "(SWAY_FOLDED_PENDULUM_LENGTH)."),
    SheetFunction(
        "SWAY_STAGE_LENGTH", suspension.pendulum_stages,
        "Length of one stage of the folded pendulum, L / n_s [m].", "Stage length", "m",
        _STAGE_ARGS, "supply", output=1, example=_STAGE_EXAMPLE),
    SheetFunction(
        "SWAY_VERTICAL_SPACE", suspension.pendulum_stages,
        "Vertical space from the pivots to the bottom of the mass, L / n_s + h [m].",
        "Vertical space", "m", _STAGE_ARGS, "supply", output=2, example=_STAGE_EXAMPLE),
    SheetFunction(
        "SWAY_SWING_SPACE", suspension.swing_space,
        "Plan space of the block and its travel to the buffers both ways, b + 2 c [m].",
        "Swing space", "m",
        (Argument("block_length", "Plan dimension of the block, > 0 [m].", "m"),
         Argument("clearance", "Free travel to the buffers, one side, >= 0 [m].", "m")),
        "supply", example=(4.0, 1.2)),
    SheetFunction(
        "SWAY_BUFFER_DEFLECTION", suspension.buffer_contact,
        "Deflection of a linear buffer absorbing m v^2 / 2, v sqrt(m / k_b) [m].",
        "Buffer deflection", "m", _BUFFER_ARGS, "supply", output=0, example=_BUFFER_EXAMPLE),
    SheetFunction(
        "SWAY_BUFFER_FORCE", suspension.buffer_contact,
        "Peak force of a linear buffer absorbing m v^2 / 2, v sqrt(m k_b) [N].",
        "Buffer force", "N", _BUFFER_ARGS, "supply", output=1, example=_BUFFER_EXAMPLE),
)

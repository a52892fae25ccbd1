# SPDX-License-Identifier: MIT
"""The Pendulum sheet: the hanger length in tune at its own swing, through the AGM.

A pendulum of length L has the exact period T_0 / AGM(1, cos(theta/2)) at the swing theta
(A&S 17.6); the length in tune at the swing its stroke causes is the fixed point
L(k+1) = L_0 AGM(1, cos(theta_k/2))^2, theta_k = asin(s / L_k), started at the small-angle
length L_0. Each row is one iteration with the AGM's steps in columns; the last row's length
(``fixed_point_length``) is the Calculation sheet's pendulum length, and the AGM at the design
swing (``agm_at_swing``) gives the small-angle error. The engine computes the same fixed point
exactly (:func:`functions.pendulum.pendulum_length`); the Checks sheet compares them.
"""
from __future__ import annotations

from openpyxl.utils import get_column_letter

from .sheet import Looks, SheetLayout

__all__ = ["pendulum_sheet", "AGM_STEPS", "FIXED_POINT_ITERATIONS", "CONVERGENCE"]

#: AGM iterations per row (quadratic convergence: 5 are exact in double precision for swings
#: up to 90 deg; computed).
AGM_STEPS = 5
#: Fixed-point iterations of the pendulum length; contraction about theta^2/4 per iteration,
#: so 40 reach 1e-16 for a 60 deg swing and 1e-18 near the 67 deg beyond which no pendulum of
#: that frequency reaches the stroke (functions.pendulum.pendulum_length; computed).
FIXED_POINT_ITERATIONS = 40
#: Largest relative change of the last iteration for the fixed point to count as converged.
CONVERGENCE = 1e-12


def _agm_row(sh: SheetLayout, r: int, theta: str, name: str = "") -> None:
    sh.formula(r, 4, f"=COS(RADIANS({theta})/2)", fmt="0.000000000")
    a_prev, b_prev = "1", f"D{r}"
    col = 5
    for _ in range(AGM_STEPS):
        a_col, b_col = get_column_letter(col), get_column_letter(col + 1)
        sh.formula(r, col, f"=({a_prev}+{b_prev})/2", fmt="0.000000000")
        sh.formula(r, col + 1, f"=SQRT({a_prev}*{b_prev})", fmt="0.000000000")
        a_prev, b_prev = f"{a_col}{r}", f"{b_col}{r}"
        col += 2
    sh.formula(r, col, f"=({a_prev}+{b_prev})/2", fmt="0.000000000000", name=name,
               label="AGM(1, cos(theta/2)) at the design swing" if name else "")


def pendulum_sheet() -> SheetLayout:
    """The Pendulum sheet (the same for every design)."""
    sh = SheetLayout("Pendulum")
    sh.label(1, 1, "Pendulum length in tune at its own design swing", Looks.TITLE)
    sh.label(2, 1, "Fixed point L(k+1) = L_0 AGM(1, cos(theta_k/2))^2 with theta_k = "
                   "asin(s / L_k): a pendulum of length L has the exact period "
                   "T_0 / AGM(1, cos(theta/2)) at swing theta (A&S 17.6; Villarino 2012). "
                   "AGM: a(n+1) = (a(n) + b(n))/2, b(n+1) = sqrt(a(n) b(n)), a(0) = 1.",
             Looks.WRAP)
    sh.merge(2, 1, 2, 17)
    cols = ["k", "L_k [m]", "theta_k [deg]", "b0 = cos(theta/2)"]
    for n in range(1, AGM_STEPS + 1):
        cols += [f"a{n}", f"b{n}"]
    cols += ["AGM", "L_(k+1) [m]", "|L_(k+1) - L_k| / L_k"]
    sh.header(4, cols)
    first = 5
    agm_col = 5 + 2 * AGM_STEPS
    next_col = get_column_letter(agm_col + 1)
    for k in range(FIXED_POINT_ITERATIONS):
        r = first + k
        last = k == FIXED_POINT_ITERATIONS - 1
        sh.value(r, 1, k)
        prev = "small_angle_length" if k == 0 else f"{next_col}{r - 1}"
        sh.formula(r, 2, f"={prev}", fmt="0.000000000000")
        sh.formula(r, 3, f"=DEGREES(ASIN(stroke/B{r}))", fmt="0.000000")
        _agm_row(sh, r, f"C{r}")
        sh.formula(r, agm_col + 1, f"=small_angle_length*{get_column_letter(agm_col)}{r}^2",
                   fmt="0.000000000000", name="fixed_point_length" if last else "", unit="m",
                   label="Pendulum length after the last fixed-point iteration")
        # rounded to 1e-15 so that last-bit noise of a platform's maths library does not show
        # (one unit in the last place is about 1.1e-16 relative)
        sh.formula(r, agm_col + 2, f"=ROUND(ABS({next_col}{r}-B{r})/B{r},15)",
                   fmt="0.000E+00", name="fixed_point_change" if last else "", unit="-",
                   label="Relative change of the length in the last iteration")
    r = first + FIXED_POINT_ITERATIONS + 1
    sh.label(r, 1, "At the design swing theta = swing_angle_deg:", Looks.BOLD)
    r += 1
    sh.label(r, 1, "final")
    sh.formula(r, 2, "=pendulum_length", fmt="0.000000000000")
    sh.formula(r, 3, "=swing_angle_deg", fmt="0.000000")
    _agm_row(sh, r, f"C{r}", name="agm_at_swing")
    sh.label(r + 2, 1, "Small-angle error e = 1/AGM - 1 and detuning -e/(1 + e) are on the "
                       "Calculation sheet (section 5).")
    sh.widths([6, 16, 13, 13] + [12] * (2 * AGM_STEPS) + [16, 16, 12])
    sh.page(landscape=True, title_rows="1:4", freeze="B5")
    return sh

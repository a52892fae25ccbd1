# SPDX-License-Identifier: MIT
"""The Pendulum sheet: the hanger length in tune at its own swing, through the AGM.

A pendulum of length L has the exact period T_0 / AGM(1, cos(theta/2)) at the swing theta
(A&S 17.6); the length in tune at the swing its stroke causes is the root of
h(L) = G(L) - L with G(L) = L_0 AGM(1, cos(theta/2))^2, theta = asin(s / L), started at the
small-angle length L_0. Each row is one iteration with the AGM's steps in columns: the first
is the plain fixed-point step L_1 = G(L_0), every later one a secant step
L(k+1) = L_k + h_k / (1 - S_k) with S_k the slope of G between the last two iterates, which
reaches double precision in a handful of rows (the plain fixed point contracts only by about
theta^2/4 per row). The last row's length (``fixed_point_length``) is the Calculation sheet's
pendulum length, and the AGM at the design swing (``agm_at_swing``) gives the small-angle
error. The engine computes the same root exactly (:func:`functions.pendulum.pendulum_length`);
the Checks sheet compares them.
"""
from __future__ import annotations

from openpyxl.utils import get_column_letter

from .sheet import Looks, SheetLayout

__all__ = ["pendulum_sheet", "AGM_STEPS", "FIXED_POINT_ITERATIONS", "CONVERGENCE",
           "SLOPE_STEP", "SLOPE_MAX", "SLOPE_DECIMALS"]

#: Arithmetic-geometric steps per row before the final mean (quadratic convergence: a - b
#: falls 0.29 -> 1.1e-2 -> 1.5e-5 -> 2.8e-11 at a 90 deg swing, so the mean of a3 and b3 is
#: exact in double precision for any swing up to 90 deg; computed).
AGM_STEPS = 3
#: Iterations of the pendulum length: the secant steps reach a relative change below 1e-15
#: within 8 rows for swings up to 60 deg and within 4 below 10 deg (computed over the valid
#: range, tests/test_plan_pendulum.py); 10 rows leave a margin.
FIXED_POINT_ITERATIONS = 10
#: Largest relative change of the last iteration for the fixed point to count as converged.
CONVERGENCE = 1e-12
#: The slope S_k is updated only while the last step moved L by more than this (relative):
#: below it the difference quotient carries the rounding noise of the applications' maths
#: (1e-16 / 1e-5 = 1e-11 relative, so every application shows the same slope to 1e-9) and the
#: previous slope is kept; the rows to convergence stay the same (computed).
SLOPE_STEP = 1e-5
#: Decimals the slope is rounded to: the difference quotient of G carries the rounding noise of
#: an application's COS and ASIN amplified by 1 / (G(L_k) - G(L_(k-1))) (measured up to 7e-10
#: relative between Gnumeric and the builder); rounded, every application shows the same
#: slope, and a slope 1e-6 off still gains about six digits per row.
SLOPE_DECIMALS = 6
#: Upper clamp of the slope (G' stays below about 0.8 wherever a fixed point exists; 1 would
#: divide by zero).
SLOPE_MAX = 0.95

_AGM_FMT = "0.000000"
_LENGTH_FMT = "0.000000"


def _agm_row(sh: SheetLayout, r: int, theta: str, name: str = "") -> str:
    """b0, the AGM steps and their mean in columns D onwards; return the mean's column."""
    sh.formula(r, 4, f"=COS(RADIANS({theta})/2)", fmt=_AGM_FMT, style="box")
    a_prev, b_prev = "1", f"D{r}"
    col = 5
    for _ in range(AGM_STEPS):
        a_col, b_col = get_column_letter(col), get_column_letter(col + 1)
        sh.formula(r, col, f"=({a_prev}+{b_prev})/2", fmt=_AGM_FMT, style="box")
        sh.formula(r, col + 1, f"=SQRT({a_prev}*{b_prev})", fmt=_AGM_FMT, style="box")
        a_prev, b_prev = f"{a_col}{r}", f"{b_col}{r}"
        col += 2
    sh.formula(r, col, f"=({a_prev}+{b_prev})/2", fmt="0.00000000", style="box", name=name,
               label=("AGM(1, cos(theta/2)) at the " + ("extreme level's swing" if "extreme"
                                                         in name else "design swing"))
               if name else "")
    return get_column_letter(col)


def pendulum_sheet(extreme: bool = False) -> SheetLayout:
    """The Pendulum sheet (the same for every design; with ``extreme``, the AGM at the extreme
    level's swing too)."""
    sh = SheetLayout("Pendulum")
    sh.label(1, 1, "Pendulum length in tune at its own design swing", Looks.TITLE)
    sh.label(2, 1, "Root of h(L) = G(L) - L, G(L) = L_0 AGM(1, cos(theta/2))^2, theta = "
                   "asin(s / L): a pendulum of length L has the exact period "
                   "T_0 / AGM(1, cos(theta/2)) at swing theta (A&S 17.6; Villarino 2012). "
                   "AGM: a(n+1) = (a(n) + b(n))/2, b(n+1) = sqrt(a(n) b(n)), a(0) = 1. "
                   "Row 0: L_1 = G(L_0); then secant steps L(k+1) = L_k + h_k / (1 - S_k), "
                   "S_k the slope of G between the last two rows.", Looks.WRAP)
    agm_col = 5 + 2 * AGM_STEPS
    g_col, s_col, next_col_n, change_col = agm_col + 1, agm_col + 2, agm_col + 3, agm_col + 4
    sh.merge(2, 1, 2, change_col)
    sh.height(2, 30)
    cols = ["k", "L_k [m]", "theta_k [deg]", "b0 = cos(theta/2)"]
    for n in range(1, AGM_STEPS + 1):
        cols += [f"a{n}", f"b{n}"]
    cols += ["AGM", "G(L_k) [m]", "Slope S_k", "L_(k+1) [m]", "Change |L_(k+1) - L_k| / L_k"]
    sh.header(4, cols)
    first = 5
    agm, g, s = (get_column_letter(c) for c in (agm_col, g_col, s_col))
    nxt = get_column_letter(next_col_n)
    for k in range(FIXED_POINT_ITERATIONS):
        r = first + k
        last = k == FIXED_POINT_ITERATIONS - 1
        sh.value(r, 1, k, style="box")
        prev = "small_angle_length" if k == 0 else f"{nxt}{r - 1}"
        sh.formula(r, 2, f"={prev}", fmt=_LENGTH_FMT, style="box")
        sh.formula(r, 3, f"=DEGREES(ASIN(stroke/B{r}))", fmt="0.0000", style="box")
        _agm_row(sh, r, f"C{r}")
        sh.formula(r, g_col, f"=small_angle_length*{agm}{r}^2", fmt=_LENGTH_FMT, style="box")
        if k == 0:
            sh.value(r, s_col, 0, fmt="0.0000", style="box")
        else:
            p = r - 1
            sh.formula(r, s_col, f"=IF(ABS(B{r}-B{p})>{SLOPE_STEP:.0E}*B{r},"
                                 f"ROUND(MIN(MAX(({g}{r}-{g}{p})/(B{r}-B{p}),0),{SLOPE_MAX}),"
                                 f"{SLOPE_DECIMALS}),{s}{p})", fmt="0.000000", style="box")
        sh.formula(r, next_col_n, f"=B{r}+({g}{r}-B{r})/(1-{s}{r})", fmt=_LENGTH_FMT,
                   style="box", name="fixed_point_length" if last else "", unit="m",
                   label="Pendulum length after the last iteration")
        # rounded to 1e-15 so that last-bit noise of a platform's maths library does not show
        # (one unit in the last place is about 1.1e-16 relative)
        sh.formula(r, change_col, f"=ROUND(ABS({nxt}{r}-B{r})/B{r},15)", fmt="0.0E+00",
                   style="box", name="fixed_point_change" if last else "", unit="-",
                   label="Relative change of the length in the last iteration")
    r = first + FIXED_POINT_ITERATIONS + 1
    sh.label(r, 1, "At the design swing theta = swing_angle_deg (Calculation 5.3)" + (
        " and at the extreme level's swing theta_x = extreme_swing_deg:" if extreme else ":"),
        Looks.BOLD)
    r += 1
    sh.label(r, 1, "final", "box")
    sh.formula(r, 2, "=pendulum_length", fmt=_LENGTH_FMT, style="box")
    sh.formula(r, 3, "=swing_angle_deg", fmt="0.0000", style="box")
    _agm_row(sh, r, f"C{r}", name="agm_at_swing")
    if extreme:
        r += 1
        sh.label(r, 1, "extreme", "box")
        sh.formula(r, 2, "=pendulum_length", fmt=_LENGTH_FMT, style="box")
        sh.formula(r, 3, "=extreme_swing_deg", fmt="0.0000", style="box")
        _agm_row(sh, r, f"C{r}", name="agm_at_extreme_swing")
    sh.label(r + 2, 1, "Small-angle error e = 1/AGM - 1 and detuning -e/(1 + e) are on the "
                       "Calculation sheet (section 5" + (", and at the extreme swing in the "
                                                         "extreme level's section)" if extreme
                                                         else ")."))
    sh.widths([5, 10, 9, 10] + [10] * (2 * AGM_STEPS) + [11, 10, 8, 10, 12])
    sh.page(landscape=True, title_rows="1:4", freeze="B5")
    return sh

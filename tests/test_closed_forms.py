# SPDX-License-Identifier: MIT
"""Closed-form optima of a tuned mass damper (functions.closed_forms).

Each method is a pair of twins of the mass ratio (tuning ratio f = f_d/f_s, damper damping on
the damper's OWN frequency). Here each twin is compared with the same published expression
written again, independently, in this file beside its source; the defining properties of the
optima (fixed points, minimum variance, minimum peak) are checked by computation in
test_damper.py and test_optima.py, and every worksheet formula against its numpy twin in
test_worksheet.py.
"""
from __future__ import annotations

import inspect
import math

import numpy as np
import pytest

from functions.closed_forms import CLOSED_FORM_METHODS, CLOSED_FORMS
from functions.damper import OPTIMAL_TUNING_METHODS, optimal_tuning
from functions.worksheet import form_of

MASS_RATIOS = [0.001, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2]


# ----------------------------------------------------------------------------- declarations
def test_methods():
    assert CLOSED_FORM_METHODS == tuple(CLOSED_FORMS) == (
        "den_hartog", "harmonic_base", "white_noise_force", "white_noise_base",
        "nishihara_asami")
    assert set(CLOSED_FORM_METHODS) <= set(OPTIMAL_TUNING_METHODS)


@pytest.mark.parametrize("method", CLOSED_FORM_METHODS)
def test_a_tuning_and_a_damping_twin_reading_only_the_mass_ratio(method):
    author = {"den_hartog": "Den Hartog", "harmonic_base": "Warburton",
              "white_noise_force": "Warburton", "white_noise_base": "Warburton",
              "nishihara_asami": "Nishihara & Asami"}[method]
    pair = CLOSED_FORMS[method]
    assert len(pair) == 2
    for twin in pair:
        form = form_of(twin)
        assert form is not None, method
        assert tuple(inspect.signature(twin).parameters) == ("mass_ratio",)
        assert form.names == ("mass_ratio",)
        assert form.formula.startswith("=") and "mass_ratio" in form.formula
        assert form.expression and "mu" in form.expression
        assert form.source.startswith(author), form.source


@pytest.mark.parametrize("method", CLOSED_FORM_METHODS)
def test_twins_broadcast_over_mass_ratios(method):
    mu = np.array(MASS_RATIOS)
    for twin in CLOSED_FORMS[method]:
        out = twin(mu)
        assert out.shape == mu.shape
        np.testing.assert_array_equal(out, [twin(m) for m in MASS_RATIOS])


@pytest.mark.parametrize("method", CLOSED_FORM_METHODS)
@pytest.mark.parametrize("mu", [0.005, 0.02, 0.1])
def test_twins_are_what_the_engine_returns(method, mu):
    tuning, damping = CLOSED_FORMS[method]
    f, zeta = optimal_tuning(mu, method)
    assert f == pytest.approx(tuning(mu), rel=1e-15, abs=0.0)
    assert zeta == pytest.approx(damping(mu), rel=1e-15, abs=0.0)


# ----------------------------------------------------------------------------- Den Hartog
@pytest.mark.parametrize("mu", MASS_RATIOS)
def test_den_hartog_printed_damping_referred_to_the_damper_frequency(mu):
    # Den Hartog, Mechanical Vibrations, 4th ed., 1956, §3.3 (from memory): f = 1/(1+mu) and
    # the damping ratio printed on the STRUCTURE's frequency, c/(2 m_d omega_s) =
    # sqrt(3 mu / (8 (1+mu)^3)). On the damper's own frequency omega_d = f omega_s it is the
    # printed value divided by f.
    f = 1.0 / (1.0 + mu)
    printed = math.sqrt(3.0 * mu / (8.0 * (1.0 + mu) ** 3))
    tuning, damping = CLOSED_FORMS["den_hartog"]
    assert tuning(mu) == pytest.approx(f, rel=1e-15)
    assert damping(mu) == pytest.approx(printed / f, rel=1e-14)
    assert damping(mu) > printed                      # the damper is tuned below the structure


# ----------------------------------------------------------------------------- Warburton
# G. B. Warburton, "Optimum absorber parameters for various combinations of response and
# excitation parameters", Earthquake Eng. Struct. Dyn. 10:381-401, 1982 (paper confirmed, title
# and formulas from memory), undamped main system; written here over common denominators, not
# as the module writes them.
WARBURTON = {
    "harmonic_base": (lambda m: math.sqrt((2.0 - m) / 2.0) / (1.0 + m),
                      lambda m: math.sqrt(3.0 * m / (4.0 * (1.0 + m) * (2.0 - m)))),
    "white_noise_force": (lambda m: math.sqrt((2.0 + m) / 2.0) / (1.0 + m),
                          lambda m: math.sqrt(m * (4.0 + 3.0 * m) / (8.0 * (1.0 + m) *
                                                                     (2.0 + m)))),
    "white_noise_base": (lambda m: math.sqrt((2.0 - m) / 2.0) / (1.0 + m),
                         lambda m: math.sqrt(m * (4.0 - m) / (8.0 * (1.0 + m) * (2.0 - m)))),
}


@pytest.mark.parametrize("method", sorted(WARBURTON))
@pytest.mark.parametrize("mu", MASS_RATIOS)
def test_warburton_forms(method, mu):
    tuning, damping = CLOSED_FORMS[method]
    f_ref, zeta_ref = WARBURTON[method]
    assert tuning(mu) == pytest.approx(f_ref(mu), rel=1e-14)
    assert damping(mu) == pytest.approx(zeta_ref(mu), rel=1e-14)


def test_warburton_forms_differ_from_each_other():
    # the excitation matters: force tunes above, base acceleration below Den Hartog's 1/(1+mu)
    # (computed from the expressions above)
    mu = 0.02
    dh = CLOSED_FORMS["den_hartog"][0](mu)
    assert CLOSED_FORMS["white_noise_force"][0](mu) > dh > CLOSED_FORMS["harmonic_base"][0](mu)
    assert CLOSED_FORMS["white_noise_force"][1](mu) < CLOSED_FORMS["white_noise_base"][1](mu)


# ----------------------------------------------------------------------------- Nishihara & Asami
def _nishihara_asami(mu: float) -> tuple[float, float]:
    # O. Nishihara, T. Asami, "Closed-form solutions to the exact optimizations of dynamic
    # vibration absorbers (minimizations of the maximum amplitude magnification factors)",
    # J. Vib. Acoust. 124(4):576-582, 2002 (paper confirmed, title and damping from memory,
    # tuning derived by computation in this project); with s = sqrt(4 + 3 mu), written as
    # f = 2/(1+mu) sqrt(2 (5 + 3 mu + 2 s) / (3 (16 + 9 mu + 4 s))),
    # zeta_d = sqrt((8 + 9 mu - 4 s) / (16 (1 + mu))).
    s = math.sqrt(4.0 + 3.0 * mu)
    f = 2.0 / (1.0 + mu) * math.sqrt(2.0 * (5.0 + 3.0 * mu + 2.0 * s) /
                                     (3.0 * (16.0 + 9.0 * mu + 4.0 * s)))
    zeta = math.sqrt((8.0 + 9.0 * mu - 4.0 * s) / (16.0 * (1.0 + mu)))
    return f, zeta


@pytest.mark.parametrize("mu", MASS_RATIOS + [0.5, 1.0])
def test_nishihara_asami_forms(mu):
    tuning, damping = CLOSED_FORMS["nishihara_asami"]
    f, zeta = _nishihara_asami(mu)
    assert tuning(mu) == pytest.approx(f, rel=1e-14)
    assert damping(mu) == pytest.approx(zeta, rel=1e-14)


@pytest.mark.parametrize("mu", [1e-4, 1e-3])
def test_nishihara_asami_approaches_den_hartog_for_small_mass_ratios(mu):
    # the exact optimum and the fixed-point one agree to first order in mu (computed: both
    # forms expanded about mu = 0 give f = 1 - mu + O(mu^2), zeta_d^2 = 3 mu / 8 + O(mu^2))
    na = [form(mu) for form in CLOSED_FORMS["nishihara_asami"]]
    dh = [form(mu) for form in CLOSED_FORMS["den_hartog"]]
    assert na[0] == pytest.approx(dh[0], rel=mu)
    assert na[1] == pytest.approx(dh[1], rel=mu)

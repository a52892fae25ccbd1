# SPDX-License-Identifier: MIT
"""The engine runs of a workbook: the design, the time-domain simulation and its load.

References are named beside each value: Davenport's peak factor, the resonant response of a
single-degree-of-freedom system, the small-angle pendulum, the power-spectral integral of the
bare building's response (scipy.integrate.quad).
"""
from __future__ import annotations

import math
import tomllib
import types
from pathlib import Path

import numpy as np
import pytest

from workbook_builder.compute import run_design, run_simulation
from workbook_builder.plan import options_for
from workbook_builder.plan.charts import MAX_TIME_POINTS, WINDOW_ROWS
from workbook_builder.project import load_project, parse_project

from workbook_cases import HARMONIC, MINIMAL

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
#: MINIMAL without a chosen mass: the structure already meets the limit, no damper is needed.
CALM = MINIMAL.replace("mass_ratio = 0.02\n", "").replace("acceleration = 0.25",
                                                          "acceleration = 0.1")


@pytest.fixture(scope="module")
def residential():
    """The residential example (random load, 600 s): its design and simulation."""
    project = load_project(EXAMPLES / "residential_tower.toml")
    result = run_design(project)
    return project, result, run_simulation(project, result)


@pytest.fixture(scope="module")
def harmonic():
    project = parse_project(tomllib.loads(HARMONIC), source="h.toml")
    result = run_design(project)
    return project, result, run_simulation(project, result)


# ----------------------------------------------------------------------------- design
@pytest.mark.parametrize("case, prefix", [("", r"calm\.toml: "),
                                          ("tower B", r"calm\.toml: tower B: ")])
def test_engine_refusal_names_the_source_and_case(case, prefix):
    project = parse_project(tomllib.loads(CALM), source="calm.toml", case=case)
    with pytest.raises(ValueError, match=prefix + r"the design cannot be computed: "
                                                  r"acceleration=0\.1 is already within") as err:
        run_design(project)
    assert isinstance(err.value.__cause__, ValueError)        # the engine's own refusal


def test_design_runs_on_the_projects_si_inputs():
    project = parse_project(tomllib.loads(MINIMAL), source="m.toml")
    result = run_design(project)
    assert result.inputs.modal_mass == 10000 * 1000.0          # 10 000 t (1 t = 1000 kg)
    assert result.mass_ratio == 0.02 and result.mode == "chosen_mass_ratio"
    assert result.damper_mass == pytest.approx(0.02 * 1e7, rel=1e-15)


# ----------------------------------------------------------------------------- simulation
def test_random_load_is_calibrated_to_the_wind_input(residential):
    """Bare building under the random force: RMS acceleration x Davenport peak factor equals
    the input peak acceleration. Reference variance by numerical integration of |H_a|^2 S_F
    (scipy.integrate.quad), peak factor from Davenport (Proc. ICE 28(2), 1964):
    g = sqrt(2 ln(nu T)) + 0.5772 / sqrt(2 ln(nu T)), nu = f_s, T = 600 s."""
    from scipy.integrate import quad
    from functions.simulation import force_spectrum
    _, result, run = residential
    i = result.inputs
    ws, M, zs = 2 * math.pi * i.frequency, i.modal_mass, i.structural_damping

    def integrand(f):
        w = 2 * math.pi * f
        h = w * w / abs(M * (ws * ws - w * w) + 2j * zs * M * ws * w)
        return h * h * force_spectrum(f, run.force, i.frequency)

    var = sum(quad(integrand, lo, hi, limit=400)[0] for lo, hi in
              ((0, 0.9 * i.frequency), (0.9 * i.frequency, 1.1 * i.frequency),
               (1.1 * i.frequency, 20 * i.frequency)))
    var += quad(integrand, 20 * i.frequency, math.inf, limit=400)[0]
    lnvt = 2 * math.log(i.frequency * 600.0)
    g_peak = math.sqrt(lnvt) + 0.5772 / math.sqrt(lnvt)
    assert run.peak_factor == pytest.approx(g_peak, rel=1e-4)       # Euler's constant to 4 digits
    # the example gives the extreme level: the simulation reproduces it (floor ordinate 1)
    assert run.level == "extreme" and run.level_acceleration == i.extreme_acceleration
    assert math.sqrt(var) * g_peak == pytest.approx(i.extreme_acceleration, rel=1e-4)


def test_harmonic_load_is_calibrated_to_the_wind_input(harmonic):
    """Bare building forced at resonance: steady peak acceleration F0 / (2 zeta_s M) (textbook
    single-degree-of-freedom result, Den Hartog 1956, s2.4) = load factor x input peak; the
    record is sampled 32 times a period, so the sampled peak is low by up to
    1 - cos(pi/32) = 0.5 %."""
    _, result, run = harmonic
    i = result.inputs
    assert run.force == pytest.approx(4 * i.acceleration * 2 * i.structural_damping
                                      * i.modal_mass, rel=1e-12)
    peak = run.result.without_damper.acceleration_peak
    assert 4 * i.acceleration * (1 - 0.005) <= peak <= 4 * i.acceleration * (1 + 1e-6)


def test_simulation_refused_without_table(tmp_path):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    project = load_project(src)
    with pytest.raises(ValueError, match=r"p\.toml: the project does not ask for a simulation"):
        run_simulation(project, run_design(project))


def test_simulation_switched_off_is_refused():
    raw = tomllib.loads(HARMONIC)
    raw["simulation"]["enabled"] = False
    project = parse_project(raw, source="off.toml")
    assert project.simulation is not None and not project.simulate
    with pytest.raises(ValueError, match=r"off\.toml: the project does not ask for a simulation"):
        run_simulation(project, run_design(project))


def test_engine_refusal_of_the_simulation_names_the_source_and_case(harmonic):
    """A stand-in design result with an impossible hanger length (the engine refuses it)."""
    _, result, _ = harmonic
    project = parse_project(tomllib.loads(HARMONIC), source="h.toml", case="storm")
    bad = types.SimpleNamespace(inputs=result.inputs, damper_mass=result.damper_mass,
                                pendulum_length=-2.0, damper_damping=result.damper_damping,
                                damper_frequency=result.damper_frequency)
    with pytest.raises(ValueError, match=r"h\.toml: storm: the simulation cannot be run: "
                                         r"length=-2\.0 must be in"):
        run_simulation(project, bad)


@pytest.mark.parametrize("which", ["residential", "harmonic"])
def test_simulation_runs_the_designed_damper(which, request):
    """The design's hanger and dashpot: small-angle frequency sqrt(g/L) / (2 pi) (simple
    pendulum, textbook), damping on it zeta_d f_d / f_L (the same c_d = 2 m_d omega zeta)."""
    _, result, run = request.getfixturevalue(which)
    i = result.inputs
    assert run.length == result.pendulum_length and run.damper_mass == result.damper_mass
    assert run.load_frequency == i.frequency
    f_l = math.sqrt(i.g / result.pendulum_length) / (2 * math.pi)
    assert run.hanger_frequency == pytest.approx(f_l, rel=1e-14)
    assert run.damper_damping * f_l == pytest.approx(result.damper_damping
                                                     * result.damper_frequency, rel=1e-13)
    assert (run.peak_factor is None) == (which == "harmonic")
    assert run.settings.load == ("harmonic" if which == "harmonic" else "random")


@pytest.mark.parametrize("which", ["residential", "harmonic"])
def test_simulation_tables_have_the_sizes_the_layout_takes(which, request):
    """The whole record thinned to exactly MAX_TIME_POINTS evenly spread rows (first and last
    samples included); the window holds WINDOW_ROWS consecutive samples around the peak swing,
    so recalculation with other inputs keeps the layout (our own rule, no source)."""
    project, _, run = request.getfixturevalue(which)
    sim = run.result
    n = sim.time.size
    rows = run.time_table.rows
    assert len(rows) == min(n, MAX_TIME_POINTS)
    assert rows[0][0] == pytest.approx(sim.time[0], abs=1e-9)
    assert rows[-1][0] == pytest.approx(sim.time[-1], rel=1e-5)
    steps = np.diff([r[0] for r in rows]) / sim.time_step
    # (times are rounded to 6 significant digits: about 1e-3 s on a 600 s record)
    assert steps.min() >= 0.99 and steps.max() <= math.ceil(n / MAX_TIME_POINTS) + 0.01
    window = run.window_table.rows
    assert len(window) == min(n, WINDOW_ROWS)
    span = window[-1][0] - window[0][0]
    assert span == pytest.approx((len(window) - 1) * sim.time_step, rel=1e-4)
    peak = max(abs(a) for a in sim.nonlinear.angle_deg)
    assert max(abs(r[1]) for r in window) == pytest.approx(peak, rel=1e-5)
    for table in (run.time_table, run.window_table):
        assert table.spec.rows == len(table.rows)
    assert options_for(project, run).simulation == (run.settings.load, len(rows), len(window))


# ----------------------------------------------------------------------------- wind level
EXTREME = HARMONIC.replace("[wind]\n", "[wind]\nextreme_acceleration = 0.4\n").replace(
    "[mode]\n", "[mode]\nfloor_ordinate = 0.9\n").replace("load_factor = 4\n", "")


def test_the_time_domain_check_runs_at_the_extreme_level_by_default():
    """Harmonic force at resonance calibrated to the extreme level at the damper (the input at
    the top occupied floor over the floor ordinate): F0 = 2 zeta_s M a (textbook single mode,
    Den Hartog 1956, s2.4). With the damper, a small swing: the simulated steady peak equals
    the frequency-domain prediction |H(omega_s)| F0 from a direct complex solve of the 2-DOF
    dynamic stiffness (tests/damper_references.py), within the 0.5 % of 32 samples a period."""
    from damper_references import amplification
    project = parse_project(tomllib.loads(EXTREME), source="x.toml")
    result = run_design(project)
    run = run_simulation(project, result)
    i = result.inputs
    assert run.level == "extreme" and run.level_acceleration == pytest.approx(0.4 / 0.9,
                                                                               rel=1e-15)
    assert run.force == pytest.approx(0.4 / 0.9 * 2 * i.structural_damping * i.modal_mass,
                                      rel=1e-12)
    sim = run.result
    assert sim.nonlinear.swing_deg < 3.0                      # a small swing: nearly linear
    tuning = run.hanger_frequency / i.frequency
    static = run.force / (i.modal_mass * (2 * math.pi * i.frequency) ** 2)
    predicted = amplification(1.0, result.mass_ratio, tuning, run.damper_damping,
                              i.structural_damping) * static * (2 * math.pi * i.frequency) ** 2
    steady = sim.time >= sim.time[-1] - 60.0                  # the last 60 s: transients gone
    peak = float(np.max(np.abs(sim.nonlinear.acceleration[steady])))
    assert predicted * (1 - 0.01) <= peak <= predicted * (1 + 0.005)


def test_the_service_level_is_simulated_when_asked_or_without_an_extreme_level():
    project = parse_project(tomllib.loads(EXTREME.replace(
        "[simulation]\n", '[simulation]\nlevel = "service"\n')), source="s.toml")
    run = run_simulation(project, run_design(project))
    assert run.level == "service" and run.level_acceleration == pytest.approx(0.25 / 0.9)
    project = parse_project(tomllib.loads(HARMONIC), source="h.toml")
    assert run_simulation(project, run_design(project)).level == "service"

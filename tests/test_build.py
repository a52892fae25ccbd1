# SPDX-License-Identifier: MIT
"""Workbook builder: formulas, cached values, names, protection, CLI.

Reference values come from the engine (functions/), which has its own tests against published
sources; here the builder's native formulas and cached values must agree with it.
The drawer's own behaviour is tested in test_xlsx_draw.py, the engine runs (load calibration,
refusals) in test_compute.py, each sheet's plan in test_plan_<sheet>.py.
"""
from __future__ import annotations

import math
import shutil
import zipfile
from pathlib import Path

import openpyxl
import pytest
from openpyxl.utils import get_column_letter

from functions.chain import steps as all_steps
from functions.quantities import PART_RESULTS, DESIGN_INPUTS, DESIGN_RESULTS
from functions.worksheet import TWIN_TOLERANCE as CROSS_CHECK_TOLERANCE
from workbook_builder import cli
from workbook_builder.build import build_workbook, write_workbook
from workbook_builder.plan import FORMAT_NAME, PLAN_PROPERTY, PLAN_VERSION, PlanOptions
from workbook_builder.plan.layout import SHEETS
from workbook_builder.plan.reference import CAUTIONS
from workbook_builder.plan.summary import SummaryColumns
from workbook_builder.project import load_project
from workbook_builder.xlsx.formulas import (ALLOWED_FUNCTIONS, Evaluator, check_formula,
                                            functions_used)

from workbook_cases import HARMONIC, MINIMAL

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
EXAMPLE_NAMES = ["residential_tower", "observation_mast", "office_tower_us", "slender_tower_us"]
RESULTS = [q.name for q in DESIGN_RESULTS]
PART_NAMES = {q.cell_name for q in PART_RESULTS}


# ----------------------------------------------------------------------------- formulas
@pytest.mark.parametrize("method", ["h2", "hinf", "den_hartog", "white_noise_force",
                                    "nishihara_asami", "harmonic_base", "white_noise_base"])
@pytest.mark.parametrize("mode", ["chosen_mass_ratio", "chosen_damper_mass", "required"])
def test_every_declared_formula_is_allowed(method, mode):
    for step in all_steps(method, mode):
        formula = getattr(step, "formula", None)
        if formula:
            check_formula(formula)
            assert functions_used(formula) <= ALLOWED_FUNCTIONS


def test_closed_form_tuning_formulas_match_the_engine():
    """The closed-form optima written for the sheet equal functions.damper.optimal_tuning."""
    from functions.damper import CLOSED_FORM_METHODS, optimal_tuning
    for method in CLOSED_FORM_METHODS:
        steps = {s.name: s for s in all_steps(method, "chosen_mass_ratio")}
        for mu in (0.005, 0.02, 0.08):
            wb = openpyxl.Workbook()
            ws = wb.active
            ws["A1"] = mu
            from openpyxl.workbook.defined_name import DefinedName
            wb.defined_names.add(DefinedName("mass_ratio", attr_text="Sheet!$A$1"))
            ws["B1"] = steps["tuning_ratio"].formula
            ws["B2"] = steps["damper_damping"].formula
            ev = Evaluator(wb)
            f, zd = optimal_tuning(mu, method)
            assert ev.cell("Sheet", 1, 2) == pytest.approx(f, rel=1e-13), method
            assert ev.cell("Sheet", 2, 2) == pytest.approx(zd, rel=1e-13), method


# ----------------------------------------------------------------------------- built workbooks
@pytest.fixture(scope="module")
def built(tmp_path_factory):
    out = {}
    folder = tmp_path_factory.mktemp("built")
    for name in EXAMPLE_NAMES:
        project = load_project(EXAMPLES / f"{name}.toml")
        path = folder / f"{name}.xlsx"
        out[name] = (write_workbook(project, path), path)
    return out


def _named_cell(wb, name):
    sheet, coord = list(wb.defined_names[name].destinations)[0]
    return wb[sheet][coord.replace("$", "")]


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_cached_values_equal_the_engine(built, name):
    b, path = built[name]
    wb = openpyxl.load_workbook(path, data_only=True)
    for field in RESULTS:
        cached = _named_cell(wb, field).value
        engine = getattr(b.result, field)
        assert isinstance(cached, (int, float)), field
        assert cached == pytest.approx(engine, rel=CROSS_CHECK_TOLERANCE, abs=1e-15), field


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_every_formula_cell_has_a_cached_value_and_is_allowed(built, name):
    _, path = built[name]
    wf = openpyxl.load_workbook(path)
    wv = openpyxl.load_workbook(path, data_only=True)
    count = 0
    for ws in wf.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                if cell.data_type == "f":
                    count += 1
                    check_formula(cell.value)
                    cached = wv[ws.title][cell.coordinate].value
                    assert cached is not None, f"{ws.title}!{cell.coordinate}"
                    assert not (isinstance(cached, str) and cached.startswith("#"))
    assert count > 300


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_checks_sheet_verdicts(built, name):
    b, _ = built[name]
    assert all(rel <= CROSS_CHECK_TOLERANCE for *_, rel in b.cross_checks)
    # every result, and every formula result of the optional parts (frequency band, retune)
    parts = {s.name for s in all_steps(b.result.method, b.result.mode, b.result.parts)
             if s.name in PART_NAMES and not s.is_engine_value}
    assert {n for n, *_ in b.cross_checks} == set(RESULTS) | parts
    assert bool(parts) == bool(b.result.parts)
    assert b.value("all_cross_checks") == "OK"
    assert b.value("fixed_point_converged") == "OK"
    # the workbook's verdicts agree with the engine's checks, in the same order
    assert [v == "OK" for _, v in b.design_verdicts] == [c.ok for c in b.result.checks]


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_names_protection_and_validation(built, name):
    b, path = built[name]
    wb = openpyxl.load_workbook(path)
    names = set(wb.defined_names.keys())
    for q in DESIGN_INPUTS:
        if q.name in b.project.inputs:
            assert q.cell_name in names
    assert set(RESULTS) <= names
    for n in names:
        assert not n[:3].isalpha() or not n[3:].isdigit()       # not a cell address
    listed = {c.value for c in wb["Names"]["A"][4:] if c.value}
    assert listed == {n for n in names if n not in ("SWAYTUNE_GENERATOR", "SWAYTUNE_FORMAT")}
    assert wb.defined_names["SWAYTUNE_FORMAT"].hidden
    for ws in wb.worksheets:
        assert ws.protection.sheet and not ws.protection.password, ws.title
    inputs = wb["Inputs"]
    validated = set()
    for dv in inputs.data_validations.dataValidation:
        for rng in dv.sqref.ranges:
            validated |= {f"{get_column_letter(c)}{r}" for r, c in rng.cells}
        check_formula("=" + dv.formula1)
    n_inputs = 0
    for row in inputs.iter_rows(min_row=5):
        for c in row:
            if c.fill.fgColor.rgb.endswith("FFF2CC") and c.value is not None:
                n_inputs += 1
                assert isinstance(c.value, (int, float))
                assert c.protection.locked is False, c.coordinate
                assert c.coordinate in validated, c.coordinate
            elif c.value is not None:
                assert c.protection.locked is not False, c.coordinate
    assert n_inputs >= 10
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                if cell.data_type == "f":
                    assert cell.protection.locked, f"{ws.title}!{cell.coordinate}"


def test_paper_and_layout(built):
    wb = openpyxl.load_workbook(built["office_tower_us"][1])
    for title in ("Inputs", "Calculation", "Checks"):
        ws = wb[title]
        assert str(ws.page_setup.paperSize) == ws.PAPERSIZE_LETTER
        assert ws.sheet_properties.pageSetUpPr.fitToPage and ws.page_setup.fitToWidth == 1
        assert ws.print_title_rows
    wb = openpyxl.load_workbook(built["residential_tower"][1])
    assert str(wb["Calculation"].page_setup.paperSize) == wb["Calculation"].PAPERSIZE_A4


def test_cautions_and_record(built):
    b, path = built["residential_tower"]
    wb = openpyxl.load_workbook(path)
    text = " ".join(str(c.value) for row in wb["Cautions"].iter_rows() for c in row if c.value)
    for word in ("preliminary design aid", "licensed", "local codes", "wind-tunnel",
                 "manufacturer"):
        assert word in text
    record = {r[0].value: r[1].value for r in wb["Record"].iter_rows(min_row=3) if r[0].value}
    assert record["Source file"] == "residential_tower.toml"
    assert record["Program"].startswith("swaytune ")
    assert len(record["Source SHA-256"]) == 64
    assert len(CAUTIONS) >= 5


def test_text_starting_with_equals_stays_text(tmp_path):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    path = tmp_path / "p.xlsx"
    write_workbook(load_project(src), path)
    wb = openpyxl.load_workbook(path)
    texts = [c for ws in wb.worksheets for row in ws.iter_rows() for c in row
             if isinstance(c.value, str) and c.value in ("=1+1", "=SUM(A1:A3) stays text")]
    assert len(texts) == 2
    assert all(c.data_type == "s" for c in texts)


def test_formulas_follow_changed_inputs_and_flag_engine_values(built, tmp_path):
    """Change inputs in the file and re-evaluate its formulas: the closed-form chain follows
    the engine, and the engine-value flag reports the change."""
    from functions.design import design_damper
    b, path = built["residential_tower"]
    wb = openpyxl.load_workbook(path)
    entered = _named_cell(wb, "acceleration_entered")
    entered.value = entered.value * 1.1
    ev = Evaluator(wb)
    kw = b.project.design_kwargs()
    kw["acceleration"] *= 1.1
    new = design_damper(**kw)
    assert ev.evaluate("=required_damping", "Calculation") == pytest.approx(
        new.required_damping, rel=1e-12)
    flag = ev.evaluate("=engine_flag_mass_ratio", "Calculation")
    assert flag == "INPUTS CHANGED: rebuild"
    wb2 = openpyxl.load_workbook(path)
    assert Evaluator(wb2).evaluate("=engine_flag_mass_ratio", "Calculation") == "current"


def test_chosen_mass_ratio_chain_recomputes_exactly(tmp_path):
    """With a chosen mass ratio and unchanged optimum inputs, every downstream formula equals
    the engine after an input that the engine values do not depend on changes."""
    from functions.design import design_damper
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    b = build_workbook(load_project(src))
    wb = b.workbook
    _named_cell(wb, "clearance_entered").value = 0.1
    _named_cell(wb, "acceleration_entered").value = 0.3
    ev = Evaluator(wb)
    kw = b.project.design_kwargs()
    kw["clearance"] = 0.1
    kw["acceleration"] = 0.3
    new = design_damper(**kw)
    for field in RESULTS:
        assert ev.evaluate(f"={field}", "Calculation") == pytest.approx(
            getattr(new, field), rel=1e-9), field
    assert ev.evaluate("=check_stroke", "Checks") == ("OK" if new.stroke <= 0.1 else "NOT OK")


# ----------------------------------------------------------------------------- written file
# (the overwrite and hand-edit guards of write_workbook: tests/test_xlsx_files.py)
def test_written_file_is_a_valid_package(built):
    _, path = built["observation_mast"]
    with zipfile.ZipFile(path) as zf:
        assert zf.testzip() is None
        assert "docProps/custom.xml" in zf.namelist()


# ----------------------------------------------------------------------------- command line
def test_cli_build(tmp_path, capsys):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    out = tmp_path / "out.xlsx"
    assert cli.main(["build", str(src), "-o", str(out)]) == 0
    text = capsys.readouterr().out
    assert out.is_file()
    assert "pendulum" not in text.lower() or "L [m]" in text
    assert "CAUTION" in text and "licensed" in text
    assert "OK (" in text       # cross-check verdict column


def test_cli_error_names_key_and_line(tmp_path, capsys):
    src = tmp_path / "bad.toml"
    src.write_text(MINIMAL.replace("frequency = 0.2", "frequency = -1"), encoding="utf-8")
    assert cli.main(["build", str(src), "-o", str(tmp_path / "x.xlsx")]) == 1
    err = capsys.readouterr().err
    assert "bad.toml:7: mode.frequency: -1 Hz must be in [0.01, 20] [Hz]" in err
    assert "CAUTION" not in err          # no design shown: no cautions (issue rule)
    assert not (tmp_path / "x.xlsx").exists()


def test_cli_refuses_foreign_output(tmp_path, capsys):
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    out = tmp_path / "notes.xlsx"
    out.write_bytes(b"not a workbook")
    assert cli.main(["build", str(src), "-o", str(out)]) == 1
    assert "refusing to overwrite" in capsys.readouterr().err
    assert out.read_bytes() == b"not a workbook"
    assert cli.main(["build", str(src), "-o", str(out), "--force"]) == 0


def test_cli_csv_builds_one_workbook_per_row(tmp_path, capsys):
    csv_text = ("case,mode.frequency,mode.modal_mass [t],mode.structural_damping [%],"
                "wind.acceleration [milli-g],wind.acceleration_limit [milli-g],"
                "damper.mass_ratio,damper.clearance\n"
                "tower A,0.2,10000,1.0,25,15,0.02,1.5\n"
                "tower B,0.25,12000,1.2,22,15,0.015,1.2\n")
    src = tmp_path / "cases.csv"
    src.write_text(csv_text, encoding="utf-8")
    assert cli.main(["build", str(src), "-o", str(tmp_path / "out")]) == 0
    assert sorted(p.name for p in (tmp_path / "out").iterdir()) == ["tower_A.xlsx",
                                                                     "tower_B.xlsx"]
    assert "tower_B.xlsx" in capsys.readouterr().out


def test_cli_examples_into_a_copy(tmp_path, capsys):
    for name in EXAMPLE_NAMES[:1]:
        shutil.copy(EXAMPLES / f"{name}.toml", tmp_path)
    assert cli.main(["examples", "--dir", str(tmp_path)]) == 0
    out = capsys.readouterr().out
    assert (tmp_path / "residential_tower.xlsx").is_file()
    assert "residential_tower.xlsx" in out and "cross-check" in out and "CAUTION" in out
    assert "nonlinear" in out and "deg)" in out        # the example asks for the simulation


def test_cli_examples_empty_dir(tmp_path, capsys):
    assert cli.main(["examples", "--dir", str(tmp_path)]) == 1
    assert "no example projects" in capsys.readouterr().err


def test_template(tmp_path):
    """A firm's template keeps its sheet and gets its title block filled."""
    from workbook_builder.xlsx.template import add_default_title_block
    firm = openpyxl.Workbook()
    ws = firm.active
    ws.title = "Firm cover"
    add_default_title_block(ws, {}, define_names=True)
    ws["A10"] = "Firm's own text"
    template = tmp_path / "firm.xlsx"
    firm.save(template)
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    out = tmp_path / "t.xlsx"
    assert cli.main(["build", str(src), "-o", str(out), "--template", str(template)]) == 0
    wb = openpyxl.load_workbook(out)
    assert wb.sheetnames[0] == "Firm cover"
    assert wb["Firm cover"]["A10"].value == "Firm's own text"
    assert _named_cell(wb, "TB_PROJECT_NUMBER").value == "T-1"
    assert _named_cell(wb, "TB_TITLE").value == "=1+1"
    assert {"Summary", "Inputs", "Calculation", "Checks", "Cautions"} <= set(wb.sheetnames)


def test_labels_symbols_and_units_come_from_the_declarations(built):
    """One declaration: the Inputs and Calculation rows show the quantities' own texts."""
    b, path = built["residential_tower"]
    wb = openpyxl.load_workbook(path)
    for q in list(DESIGN_INPUTS) + list(DESIGN_RESULTS):
        if q.cell_name not in b.names or q.kind == "choice":
            continue
        sheet, coord = b.names[q.cell_name]
        row = wb[sheet][coord].row
        texts = [c.value for c in wb[sheet][row]]
        assert q.label in texts and q.unit in texts, q.name
        assert q.symbol in texts, q.name
        assert wb[sheet][coord].number_format == q.fmt, q.name


def test_closed_form_method_builds_with_formulas(tmp_path):
    """A closed-form method puts the optimum in formulas (no engine value, no flag)."""
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL.replace("mass_ratio = 0.02",
                                   'mass_ratio = 0.02\ntuning_method = "white_noise_force"'),
                   encoding="utf-8")
    b = build_workbook(load_project(src))
    sheet, coord = b.names["tuning_ratio"]
    assert b.workbook[sheet][coord].data_type == "f"
    assert not [n for n in b.names if n.startswith("engine_flag")]
    assert all(rel <= CROSS_CHECK_TOLERANCE for *_, rel in b.cross_checks)
    assert b.value("all_cross_checks") == "OK"


def test_required_mass_ratio_meets_the_limit_exactly(built):
    """The required mass ratio brings the acceleration to the limit; the check allows 1e-9
    for rounding, as functions.design does."""
    b, _ = built["residential_tower"]
    assert b.value("acceleration_with_damper") == pytest.approx(b.value("acceleration_limit"),
                                                                rel=1e-12)
    assert b.design_verdicts[0][1] == "OK"


# ----------------------------------------------------------------------------- property
from hypothesis import HealthCheck, given, settings  # noqa: E402
from hypothesis import strategies as st  # noqa: E402

from functions.damper import OPTIMAL_TUNING_METHODS  # noqa: E402
from workbook_builder.project import parse_project  # noqa: E402


@settings(max_examples=12, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(frequency=st.floats(0.08, 1.5), zeta=st.floats(0.005, 0.03),
       ratio=st.floats(1.2, 2.5), mode=st.sampled_from(["mu", "md", "required"]),
       mu=st.floats(0.005, 0.05), method=st.sampled_from(OPTIMAL_TUNING_METHODS))
def test_formulas_agree_with_the_engine_across_inputs(frequency, zeta, ratio, mode, mu, method):
    """Random projects in the practical range: every formula result equals the engine."""
    damper = {"clearance": 2.0, "tuning_method": method}
    if mode == "mu":
        damper["mass_ratio"] = mu
    elif mode == "md":
        damper["damper_mass"] = mu * 2e7
    data = {"mode": {"frequency": frequency, "modal_mass": 2e7, "structural_damping": zeta},
            "wind": {"acceleration": 0.1 * ratio, "acceleration_limit": 0.1},
            "damper": damper}
    b = build_workbook(parse_project(data, source="random"))
    worst = max(rel for *_, rel in b.cross_checks)
    assert worst <= CROSS_CHECK_TOLERANCE
    assert b.value("all_cross_checks") == "OK"
    assert [v == "OK" for _, v in b.design_verdicts] == [c.ok for c in b.result.checks]


def test_python_m_workbook_builder(tmp_path):
    import subprocess
    import sys
    src = tmp_path / "p.toml"
    src.write_text(MINIMAL, encoding="utf-8")
    run = subprocess.run([sys.executable, "-m", "workbook_builder", "build", str(src), "-o",
                          str(tmp_path / "p.xlsx")], capture_output=True, text=True,
                         timeout=300)
    assert run.returncode == 0, run.stderr
    assert (tmp_path / "p.xlsx").is_file() and "CAUTION" in run.stdout


def test_engine_refusal_is_reported_with_the_source(tmp_path, capsys):
    """Neither mass given and the structure already meets the limit: the engine refuses."""
    src = tmp_path / "calm.toml"
    src.write_text(MINIMAL.replace("mass_ratio = 0.02\n", "").replace(
        "acceleration = 0.25", "acceleration = 0.1"), encoding="utf-8")
    with pytest.raises(ValueError, match=r"calm\.toml: the design cannot be computed: "
                                         r"acceleration=0\.1 is already within"):
        build_workbook(load_project(src))
    assert cli.main(["build", str(src)]) == 1
    assert "no damper is required" in capsys.readouterr().err
    assert not (tmp_path / "calm.xlsx").exists()


# ----------------------------------------------------------------------------- precision
def _variance_steps_workbook(mu, f, zd, zs):
    """A workbook holding the four parameters and the Calculation sheet's variance steps."""
    from openpyxl.workbook.defined_name import DefinedName
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "S"
    row = 1
    for name, value in (("mass_ratio", mu), ("tuning_ratio", f), ("damper_damping", zd),
                        ("structural_damping", zs)):
        ws.cell(row, 1, value)
        wb.defined_names.add(DefinedName(name, attr_text=f"S!$A${row}"))
        row += 1
    for step in all_steps("h2", "chosen_mass_ratio"):
        if step.name.startswith("var_") or step.name in ("effective_damping", "stroke_ratio"):
            ws.cell(row, 1, step.formula)
            wb.defined_names.add(DefinedName(step.name, attr_text=f"S!$A${row}"))
            row += 1
    return Evaluator(wb)


def _raw_i4(mu, f, zd, zs):
    """Effective damping and stroke ratio from the raw I4 integral in 50-digit arithmetic.

    D. E. Newland, An Introduction to Random Vibrations, Spectral & Wavelet Analysis, 3rd ed.
    (1993), Appendix 1 (I4): with w = f^2, g = zeta_d f, a3 = 2 g (1 + mu) + 2 zeta_s,
    a2 = w (1 + mu) + 1 + 4 zeta_s g, a1 = 2 zeta_s w + 2 g, num = w (a2 a3 - a1)
    + a3 (4 g^2 - 2 w) + a1 and den = a1 (a2 a3 - a1) - w a3^2: zeta_eff = den / (2 num),
    stroke ratio = sqrt(a1 / num). In double precision den loses about -log10(mu) digits to
    cancellation; at 50 digits it does not matter.
    """
    import mpmath
    with mpmath.workdps(50):
        mu, f, zd, zs = (mpmath.mpf(x) for x in (mu, f, zd, zs))
        w, g = f * f, zd * f
        a3 = 2 * g * (1 + mu) + 2 * zs
        a2 = w * (1 + mu) + 1 + 4 * zs * g
        a1 = 2 * zs * w + 2 * g
        p = a2 * a3 - a1
        num = w * p + a3 * (4 * g * g - 2 * w) + a1
        den = a1 * p - w * a3 * a3
        return float(den / (2 * num)), float(mpmath.sqrt(a1 / num))


def test_raw_i4_reference_agrees_with_a_lyapunov_solution():
    """The 50-digit reference formula is the right variance: check it against the stationary
    covariance of the 2-DOF state equations (scipy.linalg.solve_continuous_lyapunov)."""
    import numpy as np
    from scipy.linalg import solve_continuous_lyapunov
    mu, f, zd, zs = 0.02, 0.98, 0.07, 0.01
    # unit structure mass and frequency; damper mass mu (Den Hartog 1956, s3.3 set-up)
    m = np.diag([1.0, mu])
    k = np.array([[1 + mu * f * f, -mu * f * f], [-mu * f * f, mu * f * f]])
    cd = 2 * mu * zd * f
    c = np.array([[2 * zs + cd, -cd], [-cd, cd]])
    a = np.block([[np.zeros((2, 2)), np.eye(2)],
                  [-np.linalg.solve(m, k), -np.linalg.solve(m, c)]])
    b = np.concatenate([np.zeros(2), np.linalg.solve(m, [1.0, 0.0])])[:, None]
    cov = solve_continuous_lyapunov(a, -b @ b.T)
    var_x = cov[0, 0]
    var_rel = cov[1, 1] - 2 * cov[0, 1] + cov[0, 0]
    # bare structure, same white force: variance 1 / (4 zeta) -> zeta_eff = 1 / (4 var_x)
    zeta_ref, stroke_ref = _raw_i4(mu, f, zd, zs)
    assert 1 / (4 * var_x) == pytest.approx(zeta_ref, rel=1e-9)
    assert math.sqrt(var_rel / var_x) == pytest.approx(stroke_ref, rel=1e-9)


@pytest.mark.parametrize("mu", [1e-4, 1e-3, 0.005, 0.02, 0.1, 0.2])
@pytest.mark.parametrize("zs", [0.0, 0.005, 0.02])
def test_native_variance_formulas_keep_full_precision(mu, zs):
    """The worksheet's regrouped form (functions.damper, N, D, X) loses no digits: it agrees
    with the 50-digit raw I4 integral to 1e-13 even at mu = 1e-4, where the raw form in double
    precision keeps only about 12 digits."""
    from functions.damper import effective_damping, optimal_tuning, stroke_ratio
    f, zd = optimal_tuning(mu, "h2", zs)
    ev = _variance_steps_workbook(mu, f, zd, zs)
    zeta_ref, stroke_ref = _raw_i4(mu, f, zd, zs)
    zeta = ev.evaluate("=effective_damping", "S")
    stroke = ev.evaluate("=stroke_ratio", "S")
    assert zeta == pytest.approx(zeta_ref, rel=1e-13)
    assert stroke == pytest.approx(stroke_ref, rel=1e-13)
    # and the cross-check against the engine holds far inside its 1e-9
    assert zeta == pytest.approx(effective_damping(mu, f, zd, zs), rel=1e-14)
    assert stroke == pytest.approx(stroke_ratio(mu, f, zd, zs), rel=1e-14)


# ----------------------------------------------------------------------------- Nonlinear sheet
def _nonlinear_flag(b):
    return [n for n, (sheet, _) in b.names.items()
            if n.startswith("engine_flag_") and sheet == "Nonlinear" and n.count("_") == 2]


def test_nonlinear_sheet_only_when_asked(built):
    for name in EXAMPLE_NAMES:
        b, path = built[name]
        wb = openpyxl.load_workbook(path)
        assert wb.sheetnames == [s for s in SHEETS if s in wb.sheetnames]
        simulated = name in ("residential_tower", "slender_tower_us")    # [simulation] given
        assert ("Nonlinear" in wb.sheetnames) == simulated, name
        assert (b.simulation is not None) == simulated
    b, _ = built["observation_mast"]
    assert not b.nonlinear_verdicts and not _nonlinear_flag(b)


def test_nonlinear_values_are_the_engines(built):
    """Every engine value on the sheet is the engine's, for the design's own damper: the
    design's pendulum length and the designed dashpot (zeta_d on f_d -> on f_L)."""
    from functions.simulation import RandomForce, simulate
    b, path = built["residential_tower"]
    r, run = b.result, b.simulation
    sim = run.result
    f_l = math.sqrt(r.inputs.g / r.pendulum_length) / (2 * math.pi)
    assert run.length == r.pendulum_length and run.hanger_frequency == pytest.approx(f_l,
                                                                                      rel=1e-15)
    # c_d = 2 m_d omega zeta is the same dashpot on either frequency
    assert 2 * r.damper_mass * 2 * math.pi * f_l * run.damper_damping == pytest.approx(
        r.dashpot, rel=1e-13)
    again = simulate(r.inputs.modal_mass, r.inputs.frequency, r.inputs.structural_damping,
                     r.damper_mass, r.pendulum_length, run.damper_damping,
                     RandomForce(run.force, r.inputs.frequency, seed=1), 600.0)
    assert again.nonlinear.swing_deg == sim.nonlinear.swing_deg
    wb = openpyxl.load_workbook(path, data_only=True)
    expected = {"sim_swing_deg": sim.nonlinear.swing_deg, "sim_detuning": sim.detuning,
                "sim_measured_detuning": sim.simulated_detuning,
                "sim_departure": sim.departure, "sim_length": r.pendulum_length,
                "sim_acceleration_rms": sim.nonlinear.acceleration_rms,
                "sim_stroke_peak": sim.nonlinear.stroke_peak,
                "sim_effective_damping": sim.nonlinear.effective_damping,
                "sim_frequency_at_swing": sim.damper_frequency_at_swing,
                "sim_tolerance": 0.05}
    for name, value in expected.items():
        assert _named_cell(wb, name).value == pytest.approx(value, rel=1e-15), name
    assert _named_cell(wb, "sim_verdict").value == ("OK" if sim.within_tolerance else "NOT OK")
    [flag] = _nonlinear_flag(b)
    assert _named_cell(wb, flag).value == "current"
    ws = wb["Nonlinear"]
    text = " ".join(str(c.value) for row in ws.iter_rows(max_col=6) for c in row if c.value)
    assert "ENGINE VALUES" in text and "computed" in text and "rebuild" in text
    assert sim.verdict in text


@pytest.fixture(scope="module")
def harmonic(tmp_path_factory):
    src = tmp_path_factory.mktemp("harmonic") / "h.toml"
    src.write_text(HARMONIC, encoding="utf-8")
    path = src.with_suffix(".xlsx")
    return write_workbook(load_project(src), path), path


def test_harmonic_storm_verdicts_follow_the_engine(harmonic):
    b, path = harmonic
    sim = b.simulation.result
    max_detuning = b.value("max_detuning")
    verdicts = dict(b.nonlinear_verdicts)
    labels = list(verdicts)
    assert verdicts[labels[0]] == ("OK" if sim.within_tolerance else "NOT OK")
    assert verdicts[labels[1]] == ("OK" if abs(sim.detuning) <= max_detuning else "NOT OK")
    assert verdicts[labels[2]] == ("OK" if sim.nonlinear.swing_deg <= b.value("max_swing_deg")
                                   else "NOT OK")
    assert sim.nonlinear.swing_deg > b.result.swing_angle_deg        # a storm beyond the design
    wb = openpyxl.load_workbook(path)
    ws = wb["Nonlinear"]
    assert ws.print_area is not None and "$F$" in ws.print_area      # data columns not printed
    summary = " ".join(str(c.value) for row in wb["Summary"].iter_rows() for c in row if c.value)
    assert "Nonlinear simulation: response within the tolerance" in summary
    record = {r[0].value: r[1].value for r in wb["Record"].iter_rows(min_row=3) if r[0].value}
    assert record["Nonlinear simulation"].startswith("harmonic load, duration 120 s")


def test_nonlinear_flag_follows_inputs(built):
    b, path = built["residential_tower"]
    wb = openpyxl.load_workbook(path)
    [flag] = _nonlinear_flag(b)
    assert Evaluator(wb).evaluate(f"={flag}", "Nonlinear") == "current"
    _named_cell(wb, "acceleration_entered").value *= 1.01
    ev = Evaluator(wb)
    assert ev.evaluate(f"={flag}", "Nonlinear") == "INPUTS CHANGED: rebuild"
    [row] = [c.row for c in wb["Summary"]["A"]
             if c.value == "Engine value of the nonlinear simulation current (inputs unchanged)"]
    assert ev.cell("Summary", row, SummaryColumns(us=False).verdict) == "NOT OK"


def test_undefined_engine_values_are_shown_not_written_as_nan(harmonic):
    """NaN/inf from the engine (a swing over the top has no detuning; a departure against a
    zero linear response is infinite) become 'not defined' and NOT OK, never a NaN cell or an
    error value."""
    import dataclasses
    b, _ = harmonic
    run = b.simulation
    broken = dataclasses.replace(run.result, detuning=math.nan, simulated_detuning=math.nan,
                                 damper_frequency_at_swing=math.nan, departure=math.inf,
                                 equivalent_swing_deg=math.nan)
    again = build_workbook(b.project, result=b.result,
                           simulation=dataclasses.replace(run, result=broken))
    assert [v for _, v in again.nonlinear_verdicts[:2]] == ["NOT OK", "NOT OK"]
    assert again.value("sim_detuning") == "not defined"
    assert again.value("sim_verdict") == "NOT OK"


# ----------------------------------------------------------------------------- recalc support
def test_format_mark_plan_and_simulation_properties(tmp_path):
    """SWAYTUNE_FORMAT holds the plan's version; its options and the [simulation] table
    travel as data (custom document properties, never formulas)."""
    import tomllib
    from workbook_builder.build import SIMULATION_PROPERTY
    from workbook_builder.project import parse_project
    from workbook_builder.project.model import settings_from_text
    from workbook_builder.xlsx.files import new_file_mode
    raw = tomllib.loads(MINIMAL)
    raw["simulation"] = {"load": "harmonic", "duration": 120.0, "seed": 7, "tolerance": 0.1}
    project = parse_project(raw, source="sim.toml")
    out = tmp_path / "w.xlsx"
    built = write_workbook(project, out)
    wb = openpyxl.load_workbook(out)
    assert wb.defined_names[FORMAT_NAME].attr_text == str(PLAN_VERSION)
    assert wb.defined_names[FORMAT_NAME].hidden
    props = {p.name: str(p.value) for p in wb.custom_doc_props.props}
    assert PlanOptions.from_json(props[PLAN_PROPERTY]) == built.plan.options
    assert settings_from_text(props[SIMULATION_PROPERTY]) == project.simulation
    assert not any(v.startswith("=") for v in props.values())
    # Normal file permissions (0o644 under umask 022), not a temporary file's private 0o600.
    assert out.stat().st_mode & 0o777 == new_file_mode(tmp_path / "new.xlsx")


def test_every_engine_value_is_named_or_in_a_named_range():
    """Recalculation finds each engine value it refreshes through the plan's names only."""
    import tomllib
    from workbook_builder.project import parse_project
    project = parse_project(tomllib.loads(MINIMAL), source="m.toml")
    built = build_workbook(project)
    cells = built.engine_cells()
    ranges = built.plan.range_names()
    assert {s for s, _, _ in cells} == {"Checks", "Charts"} or \
        {s for s, _, _ in cells} >= {"Checks", "Charts"}
    for sheet, ref, source in cells:
        cell = built.workbook[sheet][ref]
        assert cell.data_type == "n"
        _, planned = next((s, c) for s, c in built.plan.cells()
                          if s == sheet and c.ref == ref)
        assert planned.name or any(rs == sheet for rs, _ in ranges.values())
    # every green (engine) cell of the Calculation and Checks sheets is refreshed
    listed = {(s, r) for s, r, _ in cells}
    for title in ("Calculation", "Checks"):
        for row in built.workbook[title].iter_rows():
            for cell in row:
                if cell.fill is not None and cell.fill.fgColor.rgb in ("00E2EFDA", "FFE2EFDA"):
                    assert (title, cell.coordinate) in listed, cell.coordinate

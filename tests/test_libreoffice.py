# SPDX-License-Identifier: MIT
"""Built workbooks recalculated by a real spreadsheet application (LibreOffice headless).

Each example workbook is recalculated with a forced full recalculation (private profile,
OOXMLRecalcMode=0, see workbook_builder.xlsx.libreoffice). Then: no cell holds an error; every
result cell equals the engine's value (relative difference <= 1e-9; the builder converts units
with exact factors, not CONVERT, so the tighter tolerance holds everywhere); the cached values
the builder wrote equal LibreOffice's; and with recalculation off LibreOffice shows the cached
values.
Skipped, with the reason, when soffice is not installed (CI installs libreoffice-calc-nogui).

Reference: LibreOffice, an independent spreadsheet application, recalculating the formulas
itself.
"""
from __future__ import annotations

import math
from pathlib import Path

import pytest

from functions.chain import PARTS

from workbook_builder.xlsx import libreoffice
from workbook_builder.build import write_workbook
from functions.design import check_rules
from functions.quantities import BAND_RESULTS, DESIGN_RESULTS
from functions.worksheet import TWIN_TOLERANCE as CROSS_CHECK_TOLERANCE
from workbook_builder.plan.checks import check_name
from workbook_builder.project import load_project

pytestmark = pytest.mark.skipif(libreoffice.find_soffice() is None,
                                reason="LibreOffice (soffice) is not installed")

EXAMPLES = Path(__file__).resolve().parent.parent / "example_workbooks"
NAMES = ["residential_tower", "observation_mast", "office_tower_us", "slender_tower_us"]
RESULTS = [q.name for q in DESIGN_RESULTS]


@pytest.fixture(scope="module")
def recalculated(tmp_path_factory):
    out = {}
    for name in NAMES:
        folder = tmp_path_factory.mktemp(name)
        path = folder / f"{name}.xlsx"
        built = write_workbook(load_project(EXAMPLES / f"{name}.toml"), path)
        lo = libreoffice.recalculate(path, folder / "lo")
        out[name] = (built, path, lo)
    return out


def _same(a, b) -> bool:
    if isinstance(a, bool) or isinstance(b, bool):
        return a == b
    if isinstance(a, (int, float)) and isinstance(b, (int, float)):
        # last-bit differences between the applications' maths libraries (and LibreOffice's
        # snapping of near-zero differences to 0)
        return math.isclose(a, b, rel_tol=1e-12, abs_tol=1e-14)
    return a == b


@pytest.mark.parametrize("name", NAMES)
def test_no_error_cells(recalculated, name):
    _, _, lo = recalculated[name]
    assert libreoffice.find_error_cells(lo) == []


@pytest.mark.parametrize("name", NAMES)
def test_results_equal_the_engine(recalculated, name):
    built, _, lo = recalculated[name]
    values = libreoffice.read_values(lo)
    for field in RESULTS:
        sheet, coord = built.names[field]
        got = values[(sheet, coord)]
        want = getattr(built.result, field)
        assert isinstance(got, (int, float)), field
        assert got == pytest.approx(want, rel=CROSS_CHECK_TOLERANCE, abs=1e-15), field
    # the optional parts' results (frequency band, as-built retune), where the project has them
    for q in BAND_RESULTS:
        if q.cell_name in built.result.cells:
            got = values[built.names[q.cell_name]]
            assert got == pytest.approx(built.result.cells[q.cell_name],
                                        rel=CROSS_CHECK_TOLERANCE, abs=1e-15), q.name


def test_an_example_has_every_optional_part_of_the_calculation(recalculated):
    built, _, _ = recalculated["slender_tower_us"]
    assert built.plan.options.parts == PARTS


@pytest.mark.parametrize("name", NAMES)
def test_verdicts_after_recalculation(recalculated, name):
    built, _, lo = recalculated[name]
    values = libreoffice.read_values(lo)

    def named(n):
        return values[built.names[n]]
    assert named("all_cross_checks") == "OK"
    assert named("fixed_point_converged") == "OK"
    verdicts = [named(check_name(rule.name)) for rule in check_rules(built.plan.options.parts)]
    assert [v == "OK" for v in verdicts] == [c.ok for c in built.result.checks]


@pytest.mark.parametrize("name", NAMES)
def test_engine_flags_and_nonlinear_verdict_after_recalculation(recalculated, name):
    """Every engine-value flag (Calculation and Nonlinear sheets) reads "current" after a full
    recalculation, and the Nonlinear sheet's verdict is the engine's."""
    built, _, lo = recalculated[name]
    values = libreoffice.read_values(lo)
    flags = [n for n in ("engine_flag_mass_ratio", "engine_flag_tuning", "engine_flag_band",
                         "engine_flag_band_mass", "engine_flag_robust",
                         "engine_flag_robust_worst", "engine_flag_as_built",
                         "engine_flag_simulation") if n in built.names]
    assert flags and all(values[built.names[n]] == "current" for n in flags)
    assert all(values[built.names[f"{n}_ok"]] == "OK" for n in flags)
    if built.simulation is None:
        assert "sim_verdict" not in built.names
        return
    sim = built.simulation.result
    assert values[built.names["sim_verdict"]] == ("OK" if sim.within_tolerance else "NOT OK")
    # LibreOffice writes numbers with 15 significant digits
    assert values[built.names["sim_swing_deg"]] == pytest.approx(sim.nonlinear.swing_deg,
                                                                 rel=1e-14)


@pytest.mark.parametrize("name", NAMES)
def test_cached_values_equal_libreoffice(recalculated, name):
    built, path, lo = recalculated[name]
    mine = libreoffice.read_values(path)
    theirs = libreoffice.read_values(lo)
    formulas = set(built.values)
    assert len(formulas) > 300
    bad = [(k, mine.get(k), theirs.get(k)) for k in sorted(formulas)
           if not _same(mine.get(k), theirs.get(k))]
    assert not bad, f"{len(bad)} cached value(s) differ from LibreOffice, first: {bad[:5]}"


def test_viewer_without_recalculation_sees_the_cached_values(recalculated, tmp_path):
    built, path, _ = recalculated["office_tower_us"]
    kept = libreoffice.recalculate(path, tmp_path / "never", recalc="never")
    values = libreoffice.read_values(kept)
    for field in RESULTS:
        assert values[built.names[field]] == pytest.approx(getattr(built.result, field),
                                                           rel=1e-12, abs=1e-15)


@pytest.mark.parametrize("name", NAMES)
def test_pdf_export_is_legible(recalculated, tmp_path, name):
    """The filed PDF: every sheet printed, no '###' (column too narrow), no error codes."""
    import shutil
    import subprocess
    _, path, _ = recalculated[name]
    pdf = libreoffice.export_pdf(path, tmp_path / "pdf")
    assert pdf.read_bytes().startswith(b"%PDF")
    if shutil.which("pdftotext") is None:
        pytest.skip("pdftotext (poppler-utils) is not installed")
    text = subprocess.run(["pdftotext", "-layout", str(pdf), "-"], capture_output=True,
                          text=True, timeout=120, check=True).stdout
    assert "###" not in text
    for code in ("Err:", "#NAME?", "#VALUE!", "#DIV/0!", "#NUM!", "#REF!", "#N/A"):
        assert code not in text, code
    for sheet in ("Summary", "Inputs", "Calculation", "Pendulum", "Checks", "Names",
                  "Cautions", "Record"):
        assert sheet in text
    assert "licensed" in text and "preliminary design aid" in text
    assert ("Nonlinear check" in text) == (name in ("residential_tower", "slender_tower_us"))

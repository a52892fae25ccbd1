# SPDX-License-Identifier: MIT
"""The xlwings Lite export: one main.py that imports on its own and computes as the engine."""
from __future__ import annotations

import json
import subprocess
import sys
import sysconfig
import textwrap
from pathlib import Path

import numpy as np
import pytest

from functions import catalogue, udf
from functions.catalogue import FUNCTIONS
from workbook_builder import lite_export

ROOT = Path(__file__).resolve().parent.parent


def _site_packages() -> list[str]:
    """Folders holding numpy, scipy (and xlwings): nothing else of this environment."""
    import numpy
    import scipy
    return sorted({str(Path(m.__file__).resolve().parent.parent) for m in (numpy, scipy)})


def _stdlib() -> list[str]:
    paths = sysconfig.get_paths()
    return [paths["stdlib"], paths["platstdlib"], str(Path(paths["stdlib"]) / "lib-dynload")]


# Inputs for the subprocess: each function's example, and a column whose first cell is the
# example value, the second empty and the third bad (for functions with a NUMBER argument).
def _cases():
    cases = []
    for fn in FUNCTIONS:
        if fn.name == "SWAY_SIMULATION_SUMMARY":      # seconds per call; covered in-process
            continue
        cases.append((fn.python_name, list(fn.example)))
        numeric = [i for i, a in enumerate(fn.arguments[:len(fn.example)])
                   if a.kind == catalogue.NUMBER]
        if numeric and fn.kind == catalogue.ELEMENTWISE:
            i = numeric[0]
            args = list(fn.example)
            args[i] = [[fn.example[i]], [None], ["bad"]]
            cases.append((fn.python_name, args))
    return cases


RUNNER = textwrap.dedent("""
    import json, sys
    sys.path[:] = json.loads(sys.argv[1])
    block_xlwings = sys.argv[3] == "block"
    if block_xlwings:
        sys.modules["xlwings"] = None          # as if xlwings were not installed
    import main
    cases = json.loads(sys.argv[2])
    out = {"results": [getattr(main, name)(*args) for name, args in cases]}
    out["all"] = sorted(main.__all__)
    out["origins"] = sorted({getattr(m, "__file__", None) or "" for m in list(sys.modules.values())
                             if getattr(m, "__name__", "").startswith(("functions", "swaytune"))})
    out["engine_module"] = main.sway_exact_period.__module__
    print(json.dumps(out))
""")


@pytest.fixture(scope="module")
def exported(tmp_path_factory):
    out = tmp_path_factory.mktemp("lite")
    paths = lite_export.export_lite(out)
    return out, paths


def _run(export_dir: Path, mode: str) -> dict:
    path = [str(export_dir)] + _stdlib() + _site_packages()
    assert not any(str(ROOT) == p for p in path)
    proc = subprocess.run(
        [sys.executable, "-I", "-S", "-c", RUNNER, json.dumps(path), json.dumps(_cases()), mode],
        capture_output=True, text=True, timeout=300, cwd=str(export_dir.parent))
    assert proc.returncode == 0, proc.stderr[-3000:]
    return json.loads(proc.stdout)


def test_files_written(exported):
    out, paths = exported
    assert [p.name for p in paths] == ["main.py", "requirements.txt"]
    assert (out / "requirements.txt").read_text().split() == ["numpy", "scipy"]
    text = (out / "main.py").read_text()
    assert "from xlwings import" not in text.split("_SOURCES")[0]   # only inside udf's source
    assert " ".join(lite_export.CAUTION.split()) in " ".join(text.split())
    compile(text, "main.py", "exec")


def test_embedded_sources_are_exact(exported):
    """Every module of functions/ (subpackages included) is embedded verbatim, except the
    renamed package imports."""
    out, _ = exported
    namespace: dict = {}
    text = (out / "main.py").read_text()
    head = text.split("\nclass _EmbeddedModules")[0]
    exec(compile(head, "main.py", "exec"), namespace)
    sources = namespace["_SOURCES"]
    paths = sorted((ROOT / "functions").rglob("*.py"))
    assert ROOT / "functions" / "simulation" / "run.py" in paths
    for path in paths:
        parts = path.relative_to(ROOT / "functions").with_suffix("").parts
        name = ".".join(("swaytune_engine", *(parts[:-1] if parts[-1] == "__init__" else parts)))
        original = path.read_text(encoding="utf-8")
        assert sources[name].replace("swaytune_engine", "functions") == original, name
    assert len(sources) == len(paths)
    assert namespace["_PACKAGES"] == ("swaytune_engine", "swaytune_engine.catalogue",
                                      "swaytune_engine.simulation")


def test_subpackage_modules_are_named_by_their_place(tmp_path):
    """A subpackage keeps its place under the export package; a folder without __init__.py is
    not a package and is left out."""
    (tmp_path / "sub").mkdir()
    (tmp_path / "notes").mkdir()
    (tmp_path / "__init__.py").write_text("from functions.sub import x\n")
    (tmp_path / "sub" / "__init__.py").write_text("from functions.sub.core import x\n")
    (tmp_path / "sub" / "core.py").write_text("x = 1\n")
    (tmp_path / "notes" / "draft.py").write_text("y = 2\n")
    sources = lite_export.engine_sources(tmp_path)
    assert sources == {"swaytune_engine": "from swaytune_engine.sub import x\n",
                       "swaytune_engine.sub": "from swaytune_engine.sub.core import x\n",
                       "swaytune_engine.sub.core": "x = 1\n"}
    assert lite_export.engine_packages(tmp_path) == ("swaytune_engine", "swaytune_engine.sub")


@pytest.mark.parametrize("mode", ["xlwings", "block"])
def test_exported_main_imports_alone_and_matches_the_engine(exported, mode):
    out, _ = exported
    got = _run(out, mode)
    assert got["all"] == sorted(fn.python_name for fn in FUNCTIONS)
    assert got["engine_module"] == "swaytune_engine.udf"
    assert all(not o.startswith(str(ROOT)) for o in got["origins"]), got["origins"]
    for (name, args), result in zip(_cases(), got["results"]):
        expected = getattr(udf, name)(*args)
        _assert_same(result, expected, name)


def _assert_same(result, expected, name):
    if isinstance(expected, list):
        assert isinstance(result, list) and len(result) == len(expected), name
        for r, e in zip(result, expected):
            _assert_same(r, e, name)
    elif isinstance(expected, float):
        # the numerical optima may differ in the last bits with the batch (see test_udf.RTOL)
        assert np.isclose(result, expected, rtol=1e-10, atol=0.0), (name, result, expected)
    else:
        assert result == expected, name


def test_examples_match_the_engine_directly(exported):
    """The exported code's values equal the engine's own (not only the in-process wrapper's)."""
    out, _ = exported
    got = _run(out, "xlwings")
    from functions.pendulum import exact_period
    from functions.damper import optimal_tuning
    by_case = {(n, json.dumps(a)): r for (n, a), r in zip(_cases(), got["results"])}
    assert by_case[("sway_exact_period", json.dumps([10.0, 15.0]))] == exact_period(10.0, 15.0)
    f, z = optimal_tuning(0.02, "h2", 0.01)
    assert np.isclose(by_case[("sway_optimal_tuning_ratio", json.dumps([0.02, "h2", 0.01]))],
                      f, rtol=1e-10)
    assert np.isclose(by_case[("sway_optimal_damper_damping", json.dumps([0.02, "h2", 0.01]))],
                      z, rtol=1e-10)


def test_reimport_replaces_the_embedded_modules(exported):
    """xlwings Lite runs main.py again after each edit: the second run must start afresh."""
    out, _ = exported
    code = textwrap.dedent("""
        import json, runpy, sys
        sys.path[:] = json.loads(sys.argv[1])
        first = runpy.run_path("main.py")
        second = runpy.run_path("main.py")
        hooks = [f for f in sys.meta_path if getattr(f, "swaytune_embedded", False)]
        print(len(hooks), first["sway_exact_period"](2.0) == second["sway_exact_period"](2.0))
    """)
    path = [str(out)] + _stdlib() + _site_packages()
    proc = subprocess.run([sys.executable, "-I", "-S", "-c", code, json.dumps(path)],
                          capture_output=True, text=True, timeout=300, cwd=str(out))
    assert proc.returncode == 0, proc.stderr[-3000:]
    assert proc.stdout.split() == ["1", "True"]


def test_literal_round_trip_of_awkward_sources():
    for source in ["a = '''x'''\n", "b = 1  \\\n", "c = r'\\d'\n", "", "x = '\\r'\r\n"]:
        literal = lite_export._literal(source)
        assert eval(literal) == source, source                     # noqa: S307 - test only


def test_cli_writes_the_files(tmp_path, capsys):
    from workbook_builder import cli
    assert cli.main(["lite-export", "--out", str(tmp_path / "x")]) == 0
    printed = capsys.readouterr().out
    # the export shows no design: the cautions travel inside main.py, not in the output
    assert "main.py" in printed and lite_export.NEXT_STEPS in printed
    assert "CAUTION" in (tmp_path / "x" / "main.py").read_text()
    assert (tmp_path / "x" / "main.py").exists() and (tmp_path / "x" / "requirements.txt").exists()


def test_guide_gives_both_set_ups_and_the_export_command():
    guide = (ROOT / "docs" / "spreadsheet_functions.md").read_text(encoding="utf-8")
    assert "swaytune lite-export --out swaytune_lite" in guide
    assert "*UDF Modules*: `functions.udf`" in guide          # the classic add-in's module
    assert "xlwings addin install" in guide and "Import Functions" in guide
    assert "requirements.txt" in guide and "numpy\nscipy" in guide
    assert "CAUTION" in guide


def test_a_different_main_py_is_never_replaced_without_force(tmp_path, capsys):
    """The user's own main.py (or one edited since the export) is kept; --force replaces it.

    Before: ``lite-export --out DIR`` replaced an existing main.py and requirements.txt silently.
    """
    from workbook_builder import cli
    from workbook_builder.xlsx.files import OverwriteRefused
    out = tmp_path / "lite"
    lite_export.export_lite(out)
    lite_export.export_lite(out)                   # the same export again: nothing to keep
    for name in ("main.py", "requirements.txt"):
        mine = "# my own macros\n"
        (out / name).write_text(mine, encoding="utf-8")
        with pytest.raises(OverwriteRefused, match=rf"{name} exists and differs from the "
                                                   r"export.*--force"):
            lite_export.export_lite(out)
        assert (out / name).read_text(encoding="utf-8") == mine
        assert cli.main(["lite-export", "--out", str(out)]) == 1
        err = capsys.readouterr().err
        assert "error:" in err and name in err and "Traceback" not in err
        assert (out / name).read_text(encoding="utf-8") == mine
        assert cli.main(["lite-export", "--out", str(out), "--force"]) == 0
        assert (out / name).read_text(encoding="utf-8") != mine
    assert sorted(p.name for p in out.iterdir()) == ["main.py", "requirements.txt"]


def test_out_that_is_a_file_is_refused(tmp_path, capsys):
    from workbook_builder import cli
    a_file = tmp_path / "notes.txt"
    a_file.write_text("mine")
    assert cli.main(["lite-export", "--out", str(a_file)]) == 1
    err = capsys.readouterr().err
    assert "notes.txt is a file; --out must be a folder" in err and "Traceback" not in err
    assert a_file.read_text() == "mine"


def test_an_earlier_export_is_replaced_but_an_edited_one_is_kept(tmp_path):
    """An unedited export of another version is replaced; the same file edited by hand (the
    digest on its last line no longer matches) is kept unless forced. Our own rule: common
    practice, no source."""
    from workbook_builder.xlsx.files import OverwriteRefused
    out = tmp_path / "lite"
    lite_export.export_lite(out)
    main_py = out / "main.py"
    text = main_py.read_text(encoding="utf-8")
    assert text.splitlines()[-1].startswith("# swaytune export digest: ")
    body = text[:text.rindex("# swaytune export digest: ")]
    older = body.replace("_SOURCES = {}", "_SOURCES = {}  # an older version")
    main_py.write_text(older + lite_export._digest_line(older), encoding="utf-8")
    lite_export.export_lite(out)                          # an unedited earlier export
    assert main_py.read_text(encoding="utf-8") == text
    edited = text.replace("_SOURCES = {}", "_SOURCES = {}  # my change")
    main_py.write_text(edited, encoding="utf-8")
    with pytest.raises(OverwriteRefused, match=r"main\.py exists and differs from the export"):
        lite_export.export_lite(out)
    assert main_py.read_text(encoding="utf-8") == edited
    lite_export.export_lite(out, force=True)
    assert main_py.read_text(encoding="utf-8") == text

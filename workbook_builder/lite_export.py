# SPDX-License-Identifier: MIT
"""Export the spreadsheet functions for xlwings Lite.

xlwings Lite runs Python inside Excel (Windows, macOS, the web) from the code in its editor's
``main.py`` tab and installs the packages listed in its ``requirements.txt`` tab; numpy and scipy
are built for its in-browser Python (Pyodide), so nothing has to be installed locally.

:func:`export_lite` writes

* ``main.py`` — every module of the engine package (``functions/**/*.py``: the engine with its
  subpackages, the catalogue and the wrappers of :mod:`functions.udf`) embedded as text, loaded
  at run time as the package ``swaytune_engine`` by a small import hook, followed by the import
  of every worksheet function (``sway_*``) into ``main``'s namespace, where xlwings Lite
  registers them;
* ``requirements.txt`` — ``numpy`` and ``scipy``, unpinned (Pyodide ties their versions).

The embedded package is renamed from ``functions`` to ``swaytune_engine`` so that it cannot
clash with another module of the workbook; a subpackage keeps its place in it
(``functions/simulation/run.py`` is ``swaytune_engine.simulation.run``).

Command line: ``swaytune lite-export --out swaytune_lite``.
"""
from __future__ import annotations

import ast
import hashlib
import re
import textwrap
from pathlib import Path

from functions.catalogue import FUNCTIONS

from .xlsx.files import FORCE_HINT, OverwriteRefused, atomic_path

__all__ = [
    "EXPORT_PACKAGE", "CAUTION", "NEXT_STEPS", "module_name", "engine_sources",
    "engine_packages", "build_main_py", "build_requirements", "export_lite",
]

#: What to do with the exported files (printed by ``swaytune lite-export``).
NEXT_STEPS = ("Next: in Excel open the xlwings Lite task pane; replace the content of its main.py "
              "tab with the exported main.py; add the lines of requirements.txt to its "
              "requirements.txt tab (keep the xlwings line there). See "
              "docs/spreadsheet_functions.md.")

#: Package name of the engine inside the exported main.py.
EXPORT_PACKAGE = "swaytune_engine"

CAUTION = ("CAUTION: swaytune is a preliminary design aid. Results must be checked by a "
           "licensed engineer against local codes, wind-tunnel data and the manufacturer's "
           "design.")

_ENGINE_DIR = Path(__file__).resolve().parent.parent / "functions"
_IMPORT = re.compile(r"^(\s*)(from|import)(\s+)functions(?=[\s.])", re.MULTILINE)



def module_name(relative: Path) -> str:
    """Name under :data:`EXPORT_PACKAGE` of a module file given relative to the engine folder.

    >>> module_name(Path("simulation/run.py")), module_name(Path("simulation/__init__.py"))
    ('swaytune_engine.simulation.run', 'swaytune_engine.simulation')
    """
    parts = relative.with_suffix("").parts
    if parts[-1] == "__init__":
        parts = parts[:-1]
    return ".".join((EXPORT_PACKAGE, *parts))


def _engine_files(engine_dir: Path) -> list[Path]:
    """Module files of the engine package, relative to its folder: ``*.py`` at the top and in
    every subpackage (a folder with an ``__init__.py`` inside a package)."""
    files = []
    for path in sorted(engine_dir.rglob("*.py")):
        relative = path.relative_to(engine_dir)
        folders = [path.parents[k] for k in range(len(relative.parts) - 1)]
        if all((folder / "__init__.py").is_file() for folder in folders):
            files.append(relative)
    return files


def engine_sources(engine_dir: Path | None = None) -> dict[str, str]:
    """Module name (under :data:`EXPORT_PACKAGE`) -> source, imports of ``functions`` renamed.

    Subpackages are included with all their modules (:func:`module_name`).
    """
    engine_dir = Path(engine_dir or _ENGINE_DIR)
    out: dict[str, str] = {}
    for relative in _engine_files(engine_dir):
        source = (engine_dir / relative).read_text(encoding="utf-8")
        source = _IMPORT.sub(lambda m: f"{m[1]}{m[2]}{m[3]}{EXPORT_PACKAGE}", source)
        out[module_name(relative)] = source
    if EXPORT_PACKAGE not in out:
        out[EXPORT_PACKAGE] = ""
    return out


def engine_packages(engine_dir: Path | None = None) -> tuple[str, ...]:
    """Names (under :data:`EXPORT_PACKAGE`) of the package and of its subpackages."""
    engine_dir = Path(engine_dir or _ENGINE_DIR)
    subpackages = [module_name(r) for r in _engine_files(engine_dir)
                   if r.name == "__init__.py" and len(r.parts) > 1]
    return (EXPORT_PACKAGE, *subpackages)


def _literal(source: str) -> str:
    """A readable Python literal that evaluates to ``source`` exactly."""
    if "'''" not in source and not source.endswith("\\") and "\r" not in source:
        literal = "r'''" + source + "'''"
        try:
            if ast.literal_eval(literal) == source:
                return literal
        except (SyntaxError, ValueError):
            pass
    lines = source.splitlines(keepends=True) or [""]
    return "(\n" + "".join(f"    {line!r}\n" for line in lines) + ")"


_LOADER = '''

class _EmbeddedModules(importlib.abc.MetaPathFinder, importlib.abc.Loader):
    """Import hook that serves the modules embedded above."""

    swaytune_embedded = True

    def find_spec(self, name, path=None, target=None):
        if name not in _SOURCES:
            return None
        return importlib.util.spec_from_loader(name, self, is_package=name in _PACKAGES)

    def create_module(self, spec):
        return None

    def exec_module(self, module):
        name = module.__name__
        filename = "<" + name + ">"
        source = _SOURCES[name]
        linecache.cache[filename] = (len(source), None, source.splitlines(True), filename)
        exec(compile(source, filename, "exec"), module.__dict__)


def _install():
    """(Re)install the hook; xlwings Lite runs this file again after every edit."""
    for name in list(sys.modules):
        if name == _PACKAGE or name.startswith(_PACKAGE + "."):
            del sys.modules[name]
    sys.meta_path[:] = [f for f in sys.meta_path if not getattr(f, "swaytune_embedded", False)]
    sys.meta_path.insert(0, _EmbeddedModules())


_install()
'''


def build_main_py(engine_dir: Path | None = None) -> str:
    """Text of the exported ``main.py``."""
    sources = engine_sources(engine_dir)
    packages = engine_packages(engine_dir)
    names = [fn.python_name for fn in FUNCTIONS]
    parts = [
        "# SPDX-License-Identifier: MIT\n",
        '"""swaytune spreadsheet functions for xlwings Lite.\n\n',
        textwrap.fill(CAUTION, 96) + "\n\n",
        "Generated by ``swaytune lite-export``: do not edit, export again (an edited file is\n",
        "never replaced without --force: its last line is a digest of the rest).\n",
        f"The engine is embedded below as text and imported as the package ``{EXPORT_PACKAGE}``;\n",
        "the worksheet functions are the ``sway_*`` names imported at the end of this file.\n",
        "Reference: docs/spreadsheet_functions.md in the swaytune repository.\n",
        '"""\n',
        "import importlib.abc\nimport importlib.util\nimport linecache\nimport sys\n\n",
        f"_PACKAGE = {EXPORT_PACKAGE!r}\n_PACKAGES = {packages!r}\n_SOURCES = {{}}\n",
    ]
    for name, source in sources.items():
        parts.append(f"\n_SOURCES[{name!r}] = {_literal(source)}\n")
    parts.append(_LOADER)
    parts.append(f"\nfrom {EXPORT_PACKAGE}.udf import (  # noqa: E402  the worksheet functions\n")
    parts += [f"    {n},\n" for n in names]
    parts.append(")\n\n__all__ = [\n" + "".join(f"    {n!r},\n" for n in names) + "]\n")
    text = "".join(parts)
    return text + _digest_line(text)


def _digest_line(text: str) -> str:
    return f"{_DIGEST_MARK}{hashlib.sha256(text.encode('utf-8')).hexdigest()}\n"


#: The last line of an exported main.py: the SHA-256 of everything above it.
_DIGEST_MARK = "# swaytune export digest: "


def _is_unedited_export(text: str) -> bool:
    """True for a main.py exactly as some version of swaytune exported it."""
    body, _, last = text.rstrip("\n").rpartition("\n")
    return last.startswith(_DIGEST_MARK) and _digest_line(body + "\n") == last + "\n"


def build_requirements() -> str:
    """Text of the exported ``requirements.txt`` (versions are Pyodide's: never pinned)."""
    return "numpy\nscipy\n"


def export_lite(out_dir: str | Path, engine_dir: Path | None = None, *,
                force: bool = False) -> list[Path]:
    """Write ``main.py`` and ``requirements.txt`` for xlwings Lite into ``out_dir``.

    A file already there is replaced only when it holds what would be written anyway, when it
    is a ``main.py`` exported earlier and not edited since (its last line is a digest of the
    rest), or with ``force``; the files are written atomically.

    Raises
    ------
    OverwriteRefused
        When ``out_dir`` holds a different ``main.py`` or ``requirements.txt`` (a user's own
        code, or an export edited by hand) and ``force`` is False, or ``out_dir`` is a file.
    """
    out = Path(out_dir)
    if out.exists() and not out.is_dir():
        raise OverwriteRefused(f"{out} is a file; --out must be a folder")
    files = {out / "main.py": build_main_py(engine_dir),
             out / "requirements.txt": build_requirements()}
    compile(files[out / "main.py"], str(out / "main.py"), "exec")   # never write broken code
    for path, text in files.items():
        if force or not path.exists():
            continue
        old = path.read_text(encoding="utf-8", errors="replace")
        if old != text and not (path.name == "main.py" and _is_unedited_export(old)):
            raise OverwriteRefused(f"{path} exists and differs from the export; refusing "
                                   f"to replace it ({FORCE_HINT})")
    for path, text in files.items():
        with atomic_path(path) as tmp:
            tmp.write_text(text, encoding="utf-8")
    return list(files)

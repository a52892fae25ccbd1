# SPDX-License-Identifier: MIT
"""Workbook builder: project file -> self-checking workbook that recalculates anywhere.

``python -m workbook_builder build PROJECT.toml -o OUT.xlsx`` (or the ``swaytune`` command)
reads a project file (:mod:`workbook_builder.project`), runs the engine (``functions/``) and
writes a workbook whose every result is a native worksheet formula carrying its cached value,
cross-checked against the engine on its Checks sheet.
"""
from __future__ import annotations

try:
    from importlib.metadata import version as _version
    __version__ = _version("swaytune")
except Exception:  # pragma: no cover - running from a source tree without metadata
    __version__ = "0.5.0"

__all__ = ["__version__"]

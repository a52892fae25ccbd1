# SPDX-License-Identifier: MIT
"""The reference tables in ``docs/``, generated from the declarations.

Each generated part sits between a BEGIN and an END marker of its file and is rewritten by
``swaytune docs`` (``--check``: report, write nothing; a test fails when a part is stale):

* ``docs/spreadsheet_functions.md`` — every worksheet function (:mod:`functions.catalogue`),
  its arguments, an evaluated example, the messages;
* ``docs/project_files.md`` — every key of a project file (:mod:`workbook_builder.project.schema`);
* ``docs/design_quantities.md`` — every input, result and check of the design with its symbol,
  unit, range, worksheet formula and source (:mod:`functions.quantities`, :mod:`functions.chain`,
  :data:`functions.design.CHECK_RULES`).
"""
from __future__ import annotations

from pathlib import Path
from typing import Callable

from functions import udf
from functions.catalogue import reference_markdown
from functions.chain import PARTS, sections
from functions.design import check_rules
from functions.quantities import design_inputs, quantity

from .project.schema import schema_table

__all__ = ["DOCS", "section_text", "update_docs", "reference_section", "quantities_markdown"]


def reference_section() -> str:
    """The worksheet-function reference, each example evaluated by its wrapper."""
    return reference_markdown(lambda fn, args: udf.evaluate(fn.name, *args))


def _cell(text: str) -> str:
    return str(text).replace("|", "\\|")


def quantities_markdown() -> str:
    """Inputs, results (in checking order, with formulas) and checks of the design chain."""
    out = ["### Inputs", "", "| Name | Defined name | Symbol | Unit | Valid range | Default | "
           "Where it usually comes from |", "| --- | --- | --- | --- | --- | --- | --- |"]
    for q in design_inputs():
        rng = ", ".join(q.choices) if q.kind == "choice" else q.interval()
        default = "required" if q.required else ("optional" if q.optional else q.default)
        out.append(f"| `{q.name}` | `{q.cell_name}` | {q.symbol} | {q.unit} | {rng} | "
                   f"{default} | {_cell(q.note)} |")
    out += ["", "### Calculation steps (h2 tuning, required mass ratio)", "",
            "| Step | Defined name | Symbol | Unit | Worksheet formula | Equation | Source |",
            "| --- | --- | --- | --- | --- | --- | --- |"]
    for sec in sections("h2", "required", PARTS):
        for k, step in enumerate(sec.steps, start=1):
            q = quantity(step.name)
            formula = f"`{_cell(step.formula)}`" if step.formula else "engine value"
            out.append(f"| {sec.title.split()[0]}.{k} | `{step.name}` | {q.symbol} | {q.unit} | "
                       f"{formula} | {_cell(step.expression)} | {_cell(step.source)} |")
    out += ["", "### Design checks", "", "| Check | Rule | Worksheet verdict |",
            "| --- | --- | --- |"]
    out += [f"| {r.label} | {_cell(r.rule)} | `{_cell(r.verdict_formula)}` |"
            for r in check_rules(PARTS)]
    return "\n".join(out) + "\n"


#: File -> (marker name, generator) of every generated part.
DOCS: dict[str, tuple[str, Callable[[], str]]] = {
    "spreadsheet_functions.md": ("FUNCTION REFERENCE", reference_section),
    "project_files.md": ("PROJECT FILE KEYS", schema_table),
    "design_quantities.md": ("DESIGN QUANTITIES", quantities_markdown),
}


def _marks(what: str) -> tuple[str, str]:
    return f"<!-- BEGIN {what} (generated: swaytune docs) -->", f"<!-- END {what} -->"


def section_text(path: Path, what: str, body: str) -> str:
    """``path``'s text with the part between the markers of ``what`` replaced by ``body``.

    Raises
    ------
    ValueError
        When the markers are missing.
    """
    text = path.read_text(encoding="utf-8")
    begin, end = _marks(what)
    start, stop = text.find(begin), text.find(end)
    if start < 0 or stop < start:
        raise ValueError(f"{path}: markers not found ({begin!r} ... {end!r})")
    return text[: start + len(begin)] + "\n\n" + body + "\n" + text[stop:]


def update_docs(folder: str | Path, check: bool = False) -> list[Path]:
    """Regenerate every generated part under ``folder``; return the files that changed.

    With ``check=True`` nothing is written.
    """
    changed = []
    for name, (what, make) in DOCS.items():
        path = Path(folder) / name
        new = section_text(path, what, make())
        if new != path.read_text(encoding="utf-8"):
            changed.append(path)
            if not check:
                path.write_text(new, encoding="utf-8")
    return changed

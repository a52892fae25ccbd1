# SPDX-License-Identifier: MIT
"""Spreadsheet files: reading, writing, evaluating and recalculating .xlsx workbooks.

Nothing here knows about tuned mass dampers; the builder and batch recalculation use it.

* :mod:`~workbook_builder.xlsx.formulas` - allow-list of worksheet functions, parser, checker, evaluator
* :mod:`~workbook_builder.xlsx.package` - reading a package safely: Book, Sheet, Cell, limits, refusals
* :mod:`~workbook_builder.xlsx.cached` - cached values in the formula cells of a saved workbook
* :mod:`~workbook_builder.xlsx.files` - atomic writes, the swaytune marker, the overwrite guard
* :mod:`~workbook_builder.xlsx.compare` - golden-workbook comparison, cell by cell
* :mod:`~workbook_builder.xlsx.libreoffice` - LibreOffice headless: convert, recalculate, PDF, errors
* :mod:`~workbook_builder.xlsx.template` - firm calc-sheet templates and the default title block
"""

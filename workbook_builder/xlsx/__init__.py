# SPDX-License-Identifier: MIT
"""Spreadsheet files: reading, writing, evaluating and recalculating .xlsx workbooks.

One module per topic; nothing here knows about tuned mass dampers (import the modules
themselves, this package re-exports nothing):

``formulas``     allow-list of worksheet functions, formula parser, checker and evaluator
``package``      reading a package safely: Book, Sheet, Cell, PartCache, limits and refusals
``rewrite``      writing an updated copy: constants, cached values, chart number caches
``cached``       cached values in the formula cells of a workbook saved by openpyxl
``files``        atomic writes, the swaytune marker, the overwrite and hand-edit guards
``compare``      golden-workbook comparison, cell by cell
``libreoffice``  LibreOffice headless: convert, recalculate, export PDF, read values, errors
``gnumeric``     Gnumeric's ssconvert: recalculation by a second spreadsheet application
``page_setup``   print layout of a worksheet for filing (openpyxl page set-up)
``template``     firm calc-sheet templates and the default title block
"""

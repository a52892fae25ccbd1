# SPDX-License-Identifier: MIT
"""The declaration of the worksheet functions: names, texts, defaults, coverage, docs current.

Behaviour tests of our own rules: common practice, no source.
"""
from __future__ import annotations

import importlib
import inspect
import pkgutil
import re
from pathlib import Path

import pytest
from openpyxl.utils.formulas import FORMULAE

import functions
from functions import catalogue
from functions.catalogue import FUNCTIONS, NUMBER, PREFIX, ROWS, TEXT, engine_default

ROOT = Path(__file__).resolve().parent.parent

# Excel's limits: the largest column is XFD (16384) and the largest row 1048576 (Microsoft,
# "Excel specifications and limits", Excel 2007 and later).
MAX_COLUMN, MAX_ROW = 16384, 1048576

# Worksheet functions added after the list in openpyxl.utils.formulas (Excel 2010-365); from
# memory, kept only to make the collision check wider.
NEWER_BUILTINS = {
    "AGGREGATE", "ARRAYTOTEXT", "BYCOL", "BYROW", "CHOOSECOLS", "CHOOSEROWS", "CONCAT",
    "DROP", "EXPAND", "FILTER", "HSTACK", "IFS", "IFNA", "LAMBDA", "LET", "MAKEARRAY", "MAP",
    "MAXIFS", "MINIFS", "RANDARRAY", "REDUCE", "SCAN", "SEQUENCE", "SORT", "SORTBY", "SWITCH",
    "TAKE", "TEXTAFTER", "TEXTBEFORE", "TEXTJOIN", "TEXTSPLIT", "TOCOL", "TOROW", "UNIQUE",
    "VSTACK", "WRAPCOLS", "WRAPROWS", "XLOOKUP", "XMATCH", "XOR", "STOCKHISTORY", "IMAGE",
    "GROUPBY", "PIVOTBY", "PERCENTOF", "TRIMRANGE", "REGEXTEST", "REGEXEXTRACT", "REGEXREPLACE",
}

# VBA keywords and statement names that cannot (or should not) name a parameter of the VBA
# function the classic add-in generates (from memory of the VBA language reference, "Keywords").
VBA_RESERVED = {
    "and", "as", "attribute", "binary", "boolean", "byref", "byte", "byval", "call", "case",
    "cbool", "cbyte", "ccur", "cdate", "cdbl", "cdec", "cint", "clng", "close", "const",
    "csng", "cstr", "currency", "cvar", "date", "decimal", "declare", "defbool", "dim", "do",
    "double", "each", "else", "elseif", "empty", "end", "enum", "eqv", "erase", "error",
    "event", "exit", "false", "for", "friend", "function", "get", "global", "gosub", "goto",
    "if", "imp", "implements", "in", "input", "integer", "is", "len", "let", "lib", "like",
    "line", "load", "lock", "long", "loop", "lset", "me", "mid", "mod", "name", "new", "next",
    "not", "nothing", "null", "object", "on", "open", "option", "optional", "or", "paramarray",
    "preserve", "print", "private", "property", "public", "put", "raiseevent", "randomize",
    "redim", "rem", "resume", "return", "rset", "seek", "select", "set", "single", "static",
    "step", "stop", "string", "sub", "then", "time", "to", "true", "type", "typeof", "unload",
    "until", "variant", "wend", "while", "with", "withevents", "write", "xor",
    # names used inside the VBA wrapper xlwings generates
    "failed", "argsarray", "k", "xlpy",
}


def column_number(letters: str) -> int:
    n = 0
    for ch in letters.upper():
        n = n * 26 + ord(ch) - 64
    return n


def is_a1_reference(name: str) -> bool:
    """True if ``name`` is an A1 cell address within Excel's grid (with or without $)."""
    m = re.fullmatch(r"\$?([A-Za-z]{1,3})\$?([0-9]{1,7})", name)
    if not m:
        return False
    col, row = column_number(m[1]), int(m[2])
    return 1 <= col <= MAX_COLUMN and 1 <= row <= MAX_ROW


def is_r1c1_reference(name: str) -> bool:
    """True if ``name`` is an R1C1-style reference: R, C, RC, R2, C3, R2C3, R[1]C[-1], ..."""
    part = r"(?:[0-9]+|\[-?[0-9]+\])?"
    return re.fullmatch(rf"(?:[Rr]{part})?(?:[Cc]{part})?", name) is not None and name != ""


def is_cell_reference(name: str) -> bool:
    return is_a1_reference(name) or is_r1c1_reference(name)


@pytest.mark.parametrize("name", ["A1", "a1", "$B$7", "XFD1048576", "SWA1", "R1C1", "RC", "R",
                                  "C", "r5", "C12", "R[1]C[-2]", "RC[3]", "R2C"])
def test_cell_reference_detector_finds_references(name):
    assert is_cell_reference(name)


@pytest.mark.parametrize("name", ["XFE1", "A1048577", "A0", "SWAY1", "SWAY_EXACT_PERIOD",
                                  "SUM", "RCX", "R1C1X", "A1B"])
def test_cell_reference_detector_passes_names(name):
    assert not is_cell_reference(name)


FN_IDS = [fn.name for fn in FUNCTIONS]


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_name_is_a_valid_excel_function_name(fn):
    assert re.fullmatch(r"[A-Z][A-Z0-9_]*", fn.name), fn.name
    assert fn.name.startswith(PREFIX) and fn.name.count(PREFIX) == 1
    assert len(fn.name) <= 64                      # well within Excel's 255 and Office.js' 128
    assert not is_cell_reference(fn.name)
    assert fn.name not in FORMULAE and fn.name not in NEWER_BUILTINS
    assert fn.python_name == fn.name.lower()


def test_prefix_is_used_by_no_builtin_function():
    assert not any(b.startswith(PREFIX[:-1]) for b in set(FORMULAE) | NEWER_BUILTINS)


def test_names_are_unique():
    assert len({fn.name for fn in FUNCTIONS}) == len(FUNCTIONS)


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_texts_fit_the_function_wizard(fn):
    assert 20 <= len(fn.description) <= 255
    assert f"[{fn.unit}]" in fn.description, "the description gives the result's unit"
    for a in fn.arguments:
        assert 10 <= len(a.help) <= 255, a.name
        assert re.search(r"\[[^\[\]]+\]", a.help), f"{a.name}: help has a unit in brackets"
        assert f"[{a.unit}]" in a.help, f"{a.name}: help names the declared unit {a.unit}"


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_argument_names_are_valid_vba_parameters(fn):
    names = [a.name for a in fn.arguments]
    for name in names:
        assert re.fullmatch(r"[a-z][a-z0-9_]{0,39}", name), name
        assert name not in VBA_RESERVED, f"{name} is a VBA keyword"
        assert not is_cell_reference(name)
    assert len({n.lower() for n in names}) == len(names)
    assert fn.python_name not in names


@pytest.mark.parametrize("fn", FUNCTIONS, ids=FN_IDS)
def test_arguments_match_the_engine_signature(fn):
    if fn.kind == catalogue.FIELDS:      # lists the names of a summary: no argument
        assert fn.arguments == () and fn.fields
        return
    if fn.kind == catalogue.LOOKUP:      # reads an engine table by its keys
        module, _, name = fn.table.rpartition(".")
        assert getattr(importlib.import_module(module), name) is fn.engine
        (a,) = fn.arguments
        assert a.kind == TEXT and a.choices == tuple(fn.engine) and not a.optional
        return
    params = fn.parameters
    declared = [a.engine_param for a in fn.arguments]
    assert set(declared) <= set(params), "every argument is an engine parameter"
    for name, p in params.items():
        if name not in declared:                 # an engine parameter left at its default
            assert p.default is not inspect.Parameter.empty, name
    for a in fn.arguments:
        if a.optional:
            assert a.default == engine_default(fn, a.engine_param), a.name
        else:
            assert engine_default(fn, a.engine_param) is catalogue._REQUIRED, (
                f"{a.name}: optional in the engine, required in the sheet function")
        if a.kind == TEXT:
            assert a.choices
        else:
            assert a.kind in (NUMBER, ROWS, catalogue.FLAG)
    # optional arguments come last (Excel and VBA both need it)
    flags = [a.optional for a in fn.arguments]
    assert flags == sorted(flags)


def test_text_choices_are_the_engine_choices():
    from functions import damper, dashpots, envelope, simulation
    from functions import structure
    from functions.quantities_supply import DASHPOT_LEVELS
    engine_choices = {"method": damper.OPTIMAL_TUNING_METHODS,
                      "structure_type": tuple(structure.MODE_SHAPE_EXPONENTS),
                      "building_type": tuple(structure.STRUCTURAL_LOG_DECREMENTS),
                      "tuning_method": damper.OPTIMAL_TUNING_METHODS,
                      "load_type": simulation.LOAD_TYPES,
                      "dashpot_level": DASHPOT_LEVELS, "response": dashpots.RESPONSES}
    # the band's mass ratio also offers the robust tuning
    per_function = {("SWAY_BAND_MASS_RATIO", "method"): envelope.BAND_METHODS,
                    ("SWAY_DESIGN", "tuning_method"): envelope.BAND_METHODS}
    for fn in FUNCTIONS:
        for a in fn.arguments:
            if a.kind == TEXT:
                expected = per_function.get((fn.name, a.name), engine_choices.get(a.name))
                assert a.choices == expected, (fn.name, a.name)


def test_summary_and_fields_functions_come_in_pairs():
    # the fields of each summary against its engine: test_catalogue_<module>.py
    for fn in FUNCTIONS:
        if fn.kind in (catalogue.SUMMARY, catalogue.FIELDS):
            assert fn.fields and all(len(f) == 3 for f in fn.fields)
            partner = [g for g in FUNCTIONS if g.engine is fn.engine and g is not fn]
            assert len(partner) == 1 and partner[0].fields == fn.fields


def _engine_modules():
    # validation helpers, declarations (quantities, worksheet twins, the chain's steps) and the
    # spreadsheet layer itself are not engine functions
    skip = {"functions._validation", "functions.udf", "functions.catalogue",
            "functions.quantities", "functions.worksheet", "functions.chain",
            "functions.closed_forms", "functions.quantity", "functions.quantities_supply",
            "functions.steps", "functions.chain_supply"}
    for info in pkgutil.iter_modules(functions.__path__, "functions."):
        if info.name not in skip:
            yield importlib.import_module(info.name)


def test_every_public_engine_function_has_a_worksheet_function():
    wrapped = [fn.engine for fn in FUNCTIONS if callable(fn.engine)]
    missing = []
    for module in _engine_modules():
        for name in getattr(module, "__all__", []):
            obj = getattr(module, name)
            if not inspect.isfunction(obj):
                continue
            qualified = f"{module.__name__}.{name}"
            if obj in wrapped or qualified in catalogue.COVERED_ELSEWHERE:
                continue
            missing.append(qualified)
    assert not missing, f"engine functions without a worksheet function: {missing}"


def test_covered_elsewhere_entries_are_explained():
    for qualified, reason in catalogue.COVERED_ELSEWHERE.items():
        module, _, name = qualified.rpartition(".")
        assert hasattr(importlib.import_module(module), name), qualified
        assert len(reason) > 20


def test_reference_lists_every_function():
    text = catalogue.reference_markdown()
    for fn in FUNCTIONS:
        assert f"#### {fn.name}" in text
        for a in fn.arguments:
            assert f"`{a.name}`" in text



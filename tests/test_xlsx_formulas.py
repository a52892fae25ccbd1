# SPDX-License-Identifier: MIT
"""Worksheet formulas: the evaluator, the allow-list checker, the parse cache.

Reference values: Excel's operator precedence (Microsoft, "Calculation operators and precedence
in Excel") and Python's math module for the functions, cited beside each case.
"""
from __future__ import annotations

import math

import openpyxl
import pytest

from workbook_builder.xlsx.formulas import (Evaluator, FormulaError, check_formula,
                                            functions_used, is_error)


def _eval(formula: str, cells: dict | None = None):
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "S"
    for coord, value in (cells or {}).items():
        ws[coord] = value
    ws["Z99"] = formula
    return Evaluator(wb).cell("S", 99, 26)


@pytest.mark.parametrize("formula, expected", [
    # Excel operator precedence: negation before ^ (-2^2 = 4), ^ before * and / (Microsoft,
    # "Calculation operators and precedence in Excel"); functions checked against Python's math.
    ("=-2^2", 4.0),
    ("=2^-1", 0.5),
    ("=1+2*3^2", 19.0),
    ("=(1+2)*3", 9.0),
    ("=50%", 0.5),
    ("=SQRT(2)", math.sqrt(2)),
    ("=PI()", math.pi),
    ("=DEGREES(ASIN(0.5))", 30.0),
    ("=COS(RADIANS(60))", math.cos(math.radians(60))),
    ("=ATAN2(1,2)", math.atan2(2, 1)),          # Excel's ATAN2 takes x first
    ("=LN(EXP(2))", 2.0),
    ("=POWER(2,10)", 1024.0),
    ("=ABS(-3)", 3.0),
    ("=MAX(1,5,3)", 5.0),
    ("=MIN(A1:A3)", 1.0),
    ("=SUMPRODUCT(A1:A3,POWER(A1:A3,2))", 1 + 8 + 27),
    ("=INDEX(A1:A3,MATCH(2,A1:A3,0))", 2.0),
    ('=IF(AND(A1<2,OR(A2>5,TRUE)),"OK","NOT OK")', "OK"),
    ("=IFERROR(1/0,-1)", -1.0),
    ("=ROUND(2.5,0)", 3.0),
    ("=ROUND(-2.345,2)", -2.35),
    # ROUNDUP rounds away from zero (Microsoft, "ROUNDUP function": ROUNDUP(3.2,0) = 4,
    # ROUNDUP(76.9,0) = 77, ROUNDUP(3.14159,3) = 3.142, ROUNDUP(-3.14159,1) = -3.2,
    # ROUNDUP(31415.92654,-2) = 31500)
    ("=ROUNDUP(3.2,0)", 4.0),
    ("=ROUNDUP(76.9,0)", 77.0),
    ("=ROUNDUP(3.14159,3)", 3.142),
    ("=ROUNDUP(-3.14159,1)", -3.2),
    ("=ROUNDUP(31415.92654,-2)", 31500.0),
    ("=ROUNDUP(3,0)", 3.0),                     # an integer stays
    ("=ROUNDUP(0.1*3,1)", 0.3),                 # 0.30000000000000004: 15 digits, as a sheet
    ("=ROUNDUP(2.7,0.9)", 3.0),                 # the digits are truncated to an integer
    # GAMMALN = ln Gamma(x) (Microsoft, "GAMMALN function": GAMMALN(4) = ln 3! = 1.791759)
    ("=GAMMALN(4)", math.log(6.0)),
    ("=EXP(GAMMALN(0.5))", math.sqrt(math.pi)),  # Gamma(1/2) = sqrt(pi) (A&S 6.1.8)
    ("=GAMMALN(1)", 0.0),
    ("=GAMMALN(2.5)", math.lgamma(2.5)),
    ('="a"&"b"', "ab"),
    ('=IF("ok"="OK",1,0)', 1.0),               # text comparison ignores case
])
def test_evaluator(formula, expected):
    value = _eval(formula, {"A1": 1, "A2": 2, "A3": 3})
    assert value == pytest.approx(expected, rel=1e-15) if isinstance(expected, float) \
        else value == expected


@pytest.mark.parametrize("formula", ["=1/0", "=SQRT(-1)", "=ASIN(2)", "=LN(0)", "=NOSUCH(1)",
                                     "=missing_name+1", "=ATAN2(0,0)",
                                     "=GAMMALN(0)", "=GAMMALN(-1.5)", "=ROUNDUP(1/0,0)"])
def test_evaluator_errors(formula):
    assert is_error(_eval(formula))


@pytest.mark.parametrize("formula, message", [
    ("=LET(x,1,x)", r"uses LET, not in the allowed set"),
    ("=XLOOKUP(1,A1:A3,B1:B3)", r"uses XLOOKUP"),
    ("=IFS(A1>1,1)", r"uses IFS"),
    ("=A1:A3*2", r"uses a range outside SUMPRODUCT"),
    ("=MAX(A1:A3*2)", r"uses a range outside SUMPRODUCT"),
    ("=SUMPRODUCT(IF(A1:A3>1,1,0))", r"uses a range outside SUMPRODUCT"),
    ("=1+", r"ends too early"),
    ("=SQRT(2", r"ends too early"),
])
def test_check_formula_refuses(formula, message):
    with pytest.raises(FormulaError, match=message):
        check_formula(formula)


def test_gammaln_and_roundup_are_allowed():
    # both exist with these names in Excel, LibreOffice Calc and Gnumeric
    check_formula("=MAX(1,ROUNDUP(a/(b-c),0))+EXP(GAMMALN(1+x/2))")
    assert functions_used("=ROUNDUP(GAMMALN(x),2)") == {"ROUNDUP", "GAMMALN"}


def test_functions_used():
    assert functions_used("=SQRT(ABS(x))+IF(a>1,PI(),0)") == {"SQRT", "ABS", "IF", "PI"}


def test_evaluator_shares_a_parse_cache():
    """Evaluator(parse_cache=...) fills and reuses the given cache; values do not change."""
    cache: dict = {}
    wb = openpyxl.Workbook()
    ws = wb.active
    ws.title = "S"
    ws["A1"], ws["A2"] = 3.0, "=A1*2"
    assert Evaluator(wb, parse_cache=cache).cell("S", 2, 1) == 6.0
    assert "=A1*2" in cache
    ws["A1"] = 4.0
    assert Evaluator(wb, parse_cache=cache).cell("S", 2, 1) == 8.0     # text -> tree only
    assert len(cache) == 1

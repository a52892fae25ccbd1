# SPDX-License-Identifier: MIT
"""Worksheet formulas: the allow-list, a checker and a small evaluator.

The builder writes only formulas made of the worksheet functions in :data:`ALLOWED_FUNCTIONS`
(functions that Excel 2010+ and LibreOffice 7.x both evaluate without prefixes), and it
evaluates every formula it writes with :class:`Evaluator` to store the formula's cached value
in the file, so a viewer that does not recalculate still shows the right number.

The evaluator reads the same formula text that goes into the cell; it is not a second
implementation of the physics. Tests compare its results with the engine (and LibreOffice's
recalculation with both), so a formula that drifts from the engine is caught.

Grammar (Excel's operator precedence, highest first): reference and range ``:``, unary
``-``/``+``, ``%``, ``^``, ``*`` ``/``, ``+`` ``-``, ``&``, comparisons ``= <> < > <= >=``.
"""
from __future__ import annotations

import math
import re
import sys
from dataclasses import dataclass
from typing import Any, Callable

__all__ = [
    "ALLOWED_FUNCTIONS", "FormulaError", "ExcelError", "check_formula", "functions_used",
    "parse", "Evaluator", "is_error",
]

#: Worksheet functions the builder may write (DEVELOPERS.md, Workbooks section).
ALLOWED_FUNCTIONS = frozenset({
    "SQRT", "PI", "SIN", "COS", "ASIN", "ATAN2", "RADIANS", "DEGREES", "LN", "EXP", "POWER",
    "SUMPRODUCT", "CONVERT", "IF", "AND", "OR", "ABS", "MAX", "MIN", "INDEX", "MATCH",
    "IFERROR", "ROUND", "ROUNDUP", "GAMMALN",
})

#: Functions whose arguments may be ranges or range arithmetic (array context).
_RANGE_FUNCTIONS = frozenset({"SUMPRODUCT", "INDEX", "MATCH", "MAX", "MIN"})

#: Longest formula Excel accepts (characters, without the leading '=').
MAX_FORMULA_LENGTH = 8192


class FormulaError(ValueError):
    """A formula that is malformed or uses something outside the allow-list."""


@dataclass(frozen=True)
class ExcelError:
    """A worksheet error value such as ``#DIV/0!``."""

    code: str

    def __str__(self) -> str:
        return self.code


DIV0 = ExcelError("#DIV/0!")
NUM = ExcelError("#NUM!")
VALUE = ExcelError("#VALUE!")
NA = ExcelError("#N/A")
REF = ExcelError("#REF!")
NAME = ExcelError("#NAME?")


def is_error(value: Any) -> bool:
    """True for a worksheet error value (an :class:`ExcelError`)."""
    return isinstance(value, ExcelError)


# --------------------------------------------------------------------------- tokenizer
_TOKEN_RE = re.compile(r"""
    (?P<ws>\s+)
  | (?P<string>"(?:[^"]|"")*")
  | (?P<ref>(?:(?:'(?:[^']|'')+'|[A-Za-z_][A-Za-z0-9_.]*)!)?\$?[A-Za-z]{1,3}\$?[0-9]+
            (?::\$?[A-Za-z]{1,3}\$?[0-9]+)?(?![A-Za-z0-9_.(]))
  | (?P<number>(?:[0-9]+\.?[0-9]*|\.[0-9]+)(?:[eE][+-]?[0-9]+)?)
  | (?P<func>[A-Za-z][A-Za-z0-9_.]*(?=\())
  | (?P<name>[A-Za-z_\\][A-Za-z0-9_.]*)
  | (?P<op><>|<=|>=|[-+*/^&=<>%(),:])
""", re.VERBOSE)


def _tokenize(text: str) -> list[tuple[str, str]]:
    tokens = []
    pos = 0
    while pos < len(text):
        m = _TOKEN_RE.match(text, pos)
        if m is None:
            raise FormulaError(f"cannot read formula {text!r} at character {pos + 1}: "
                               f"{text[pos:pos + 10]!r}")
        kind = m.lastgroup
        if kind != "ws":
            tokens.append((kind, m.group()))
        pos = m.end()
    return tokens


# --------------------------------------------------------------------------- parser
# Nodes are tuples: ("num", x) ("str", s) ("bool", b) ("ref", sheet, c1, r1, c2, r2)
# ("name", n) ("un", op, node) ("pct", node) ("bin", op, a, b) ("call", FNAME, [args])

def _col_index(letters: str) -> int:
    n = 0
    for ch in letters.upper():
        n = n * 26 + ord(ch) - 64
    return n


def _parse_ref(text: str) -> tuple:
    sheet = None
    if "!" in text:
        sheet, text = text.rsplit("!", 1)
        if sheet.startswith("'"):
            sheet = sheet[1:-1].replace("''", "'")
    parts = text.replace("$", "").split(":")
    cells = []
    for p in parts:
        m = re.fullmatch(r"([A-Za-z]{1,3})([0-9]+)", p)
        cells.append((_col_index(m.group(1)), int(m.group(2))))
    (c1, r1) = cells[0]
    (c2, r2) = cells[-1]
    return ("ref", sheet, min(c1, c2), min(r1, r2), max(c1, c2), max(r1, r2))


class _Parser:
    _COMPARE = ("=", "<>", "<", ">", "<=", ">=")

    def __init__(self, text: str):
        self.text = text
        self.tokens = _tokenize(text)
        self.i = 0

    def peek(self) -> tuple[str, str] | None:
        return self.tokens[self.i] if self.i < len(self.tokens) else None

    def take(self) -> tuple[str, str]:
        tok = self.peek()
        if tok is None:
            raise FormulaError(f"formula {self.text!r} ends too early")
        self.i += 1
        return tok

    def expect(self, value: str) -> None:
        tok = self.take()
        if tok[1] != value:
            raise FormulaError(f"formula {self.text!r}: expected {value!r}, found {tok[1]!r}")

    def parse(self):
        node = self.compare()
        if self.peek() is not None:
            raise FormulaError(f"formula {self.text!r}: unexpected {self.peek()[1]!r}")
        return node

    def compare(self):
        node = self.concat()
        while self.peek() is not None and self.peek()[1] in self._COMPARE:
            op = self.take()[1]
            node = ("bin", op, node, self.concat())
        return node

    def concat(self):
        node = self.additive()
        while self.peek() is not None and self.peek()[1] == "&":
            self.take()
            node = ("bin", "&", node, self.additive())
        return node

    def additive(self):
        node = self.term()
        while self.peek() is not None and self.peek()[1] in ("+", "-") and self.peek()[0] == "op":
            op = self.take()[1]
            node = ("bin", op, node, self.term())
        return node

    def term(self):
        node = self.power()
        while self.peek() is not None and self.peek()[1] in ("*", "/"):
            op = self.take()[1]
            node = ("bin", op, node, self.power())
        return node

    def power(self):
        node = self.percent()
        while self.peek() is not None and self.peek()[1] == "^":
            self.take()
            node = ("bin", "^", node, self.percent())
        return node

    def percent(self):
        node = self.unary()
        while self.peek() is not None and self.peek()[1] == "%":
            self.take()
            node = ("pct", node)
        return node

    def unary(self):
        tok = self.peek()
        if tok is not None and tok[0] == "op" and tok[1] in ("-", "+"):
            self.take()
            return ("un", tok[1], self.unary())
        return self.primary()

    def primary(self):
        kind, value = self.take()
        if kind == "number":
            return ("num", float(value))
        if kind == "string":
            return ("str", value[1:-1].replace('""', '"'))
        if kind == "ref":
            return _parse_ref(value)
        if kind == "name":
            upper = value.upper()
            if upper in ("TRUE", "FALSE"):
                return ("bool", upper == "TRUE")
            return ("name", value)
        if kind == "func":
            fname = value.upper()
            self.expect("(")
            args = []
            if self.peek() is not None and self.peek()[1] == ")":
                self.take()
                return ("call", fname, args)
            while True:
                args.append(self.compare())
                tok = self.take()
                if tok[1] == ")":
                    break
                if tok[1] != ",":
                    raise FormulaError(f"formula {self.text!r}: expected ',' or ')', "
                                       f"found {tok[1]!r}")
            return ("call", fname, args)
        if value == "(":
            node = self.compare()
            self.expect(")")
            return node
        raise FormulaError(f"formula {self.text!r}: unexpected {value!r}")


def parse(formula: str):
    """Parse a formula (with or without the leading ``=``) into a syntax tree.

    Raises
    ------
    FormulaError
        When the text is not a formula of the supported grammar.
    """
    text = formula[1:] if formula.startswith("=") else formula
    if not text.strip():
        raise FormulaError("empty formula")
    return _Parser(text).parse()


_ELEMENTWISE = frozenset({"POWER", "SQRT", "SIN", "COS", "ASIN", "RADIANS", "DEGREES", "LN",
                          "EXP", "ABS", "ATAN2", "ROUND", "ROUNDUP", "GAMMALN"})


def _walk(node, array: bool, direct: bool, found: list, misuse: list) -> None:
    """Collect function names; flag ranges outside an array-safe position.

    ``array``: inside a SUMPRODUCT argument (elementwise arithmetic is evaluated alike by
    every application). ``direct``: the node is itself an argument of a range function.
    """
    kind = node[0]
    if kind == "call":
        fname = node[1]
        found.append(fname)
        for arg in node[2]:
            if fname == "SUMPRODUCT":
                _walk(arg, True, True, found, misuse)
            elif array and fname in _ELEMENTWISE:
                _walk(arg, True, False, found, misuse)
            else:
                _walk(arg, False, fname in _RANGE_FUNCTIONS, found, misuse)
    elif kind == "ref":
        if (node[2], node[3]) != (node[4], node[5]) and not (array or direct):
            misuse.append(node)
    elif kind == "name":
        pass
    elif kind == "bin":
        _walk(node[2], array, False, found, misuse)
        _walk(node[3], array, False, found, misuse)
    elif kind == "un":
        _walk(node[2], array, False, found, misuse)
    elif kind == "pct":
        _walk(node[1], array, False, found, misuse)


def functions_used(formula: str) -> set[str]:
    """Names of the worksheet functions a formula calls (upper case)."""
    found: list[str] = []
    _walk(parse(formula), False, False, found, [])
    return set(found)


def check_formula(formula: str) -> None:
    """Refuse a formula that Excel 2010+ or LibreOffice 7.x might not evaluate alike.

    Checks: it parses; every function is in :data:`ALLOWED_FUNCTIONS`; multi-cell ranges
    appear only as arguments of SUMPRODUCT, INDEX, MATCH, MAX or MIN (no dynamic arrays);
    the text is at most :data:`MAX_FORMULA_LENGTH` characters.

    Raises
    ------
    FormulaError
        Naming the formula and what is wrong with it.

    Examples
    --------
    >>> check_formula("=SQRT(modal_mass)*2")
    >>> check_formula("=LET(x,1,x)")
    Traceback (most recent call last):
    ...
    workbook_builder.xlsx.formulas.FormulaError: formula '=LET(x,1,x)' uses LET, not in the allowed set
    """
    text = formula[1:] if formula.startswith("=") else formula
    if len(text) > MAX_FORMULA_LENGTH:
        raise FormulaError(f"formula is {len(text)} characters long, more than "
                           f"{MAX_FORMULA_LENGTH}")
    found: list[str] = []
    misuse: list = []
    _walk(parse(formula), False, False, found, misuse)
    for fname in found:
        if fname not in ALLOWED_FUNCTIONS:
            raise FormulaError(f"formula {formula!r} uses {fname}, not in the allowed set")
    if misuse:
        raise FormulaError(f"formula {formula!r} uses a range outside SUMPRODUCT, INDEX, "
                           "MATCH, MAX or MIN")


# --------------------------------------------------------------------------- evaluator
class _Array:
    """A 2-D block of values (rows of columns) from a range or range arithmetic."""

    def __init__(self, rows: list[list[Any]]):
        self.rows = rows

    @property
    def shape(self) -> tuple[int, int]:
        return len(self.rows), len(self.rows[0]) if self.rows else 0

    def flat(self) -> list[Any]:
        return [v for row in self.rows for v in row]


def _map(fn: Callable, *args):
    """Apply ``fn`` elementwise when any argument is an array (broadcasting scalars)."""
    for a in args:
        if isinstance(a, _Array):
            break
    else:
        return fn(*args)
    arrays = [a for a in args if isinstance(a, _Array)]
    shape = arrays[0].shape
    for a in arrays:
        if a.shape != shape:
            return _Array([[VALUE] * shape[1] for _ in range(shape[0])])
    rows = []
    for r in range(shape[0]):
        row = []
        for c in range(shape[1]):
            row.append(fn(*[a.rows[r][c] if isinstance(a, _Array) else a for a in args]))
        rows.append(row)
    return _Array(rows)


def _num(v: Any):
    """Coerce a scalar to a number the way a worksheet does (or return an error)."""
    if isinstance(v, ExcelError):
        return v
    if v is None:
        return 0.0
    if isinstance(v, bool):
        return 1.0 if v else 0.0
    if isinstance(v, (int, float)):
        return float(v)
    if isinstance(v, str):
        try:
            return float(v)
        except ValueError:
            return VALUE
    return VALUE


def _text(v: Any) -> Any:
    if isinstance(v, ExcelError):
        return v
    if v is None:
        return ""
    if isinstance(v, bool):
        return "TRUE" if v else "FALSE"
    if isinstance(v, float):
        if v == int(v) and abs(v) < 1e15:
            return str(int(v))
        return f"{v:.15g}"
    return str(v)


def _truth(v: Any):
    if isinstance(v, ExcelError):
        return v
    if isinstance(v, str):
        if v.upper() in ("TRUE", "FALSE"):
            return v.upper() == "TRUE"
        return VALUE
    n = _num(v)
    return n if isinstance(n, ExcelError) else n != 0.0


def _finite(x: float):
    if isinstance(x, complex) or math.isnan(x) or math.isinf(x):
        return NUM
    return x


def _arith(op: str, a: Any, b: Any):
    a, b = _num(a), _num(b)
    if isinstance(a, ExcelError):
        return a
    if isinstance(b, ExcelError):
        return b
    if op == "+":
        return a + b
    if op == "-":
        return a - b
    if op == "*":
        return _finite(a * b)
    if op == "/":
        return DIV0 if b == 0 else _finite(a / b)
    if op == "^":
        if a == 0 and b < 0:
            return DIV0
        if a < 0 and b != int(b):
            return NUM
        try:
            return _finite(math.pow(a, b))
        except (OverflowError, ValueError):
            return NUM
    raise FormulaError(f"operator {op!r}")


def _compare(op: str, a: Any, b: Any):
    if isinstance(a, ExcelError):
        return a
    if isinstance(b, ExcelError):
        return b
    a = 0.0 if a is None and not isinstance(b, str) else ("" if a is None else a)
    b = 0.0 if b is None and not isinstance(a, str) else ("" if b is None else b)

    def rank(v):  # worksheet order: numbers < text < booleans
        if isinstance(v, bool):
            return (2, v)
        if isinstance(v, str):
            return (1, v.lower())
        return (0, float(v))
    ra, rb = rank(a), rank(b)
    return {"=": ra == rb, "<>": ra != rb, "<": ra < rb, ">": ra > rb,
            "<=": ra <= rb, ">=": ra >= rb}[op]


def _math1(fn: Callable[[float], float]) -> Callable:
    def wrapped(x):
        x = _num(x)
        if isinstance(x, ExcelError):
            return x
        try:
            return _finite(fn(x))
        except (ValueError, OverflowError):
            return NUM
    return wrapped


def _sqrt(x: float) -> float:
    if x < 0:
        raise ValueError
    return math.sqrt(x)


def _ln(x: float) -> float:
    if x <= 0:
        raise ValueError
    return math.log(x)


def _round(x: float, digits: float) -> float:
    digits = int(digits)
    factor = 10.0 ** digits
    y = abs(x) * factor
    r = math.floor(y + 0.5)
    return math.copysign(r / factor, x) if r else 0.0


def _roundup(x: float, digits: float) -> float:
    """ROUNDUP: away from zero to ``digits`` decimals (negative: left of the point), the
    digits truncated to an integer; the scaled value is first cut to 15 significant digits,
    as a spreadsheet holds numbers, so ROUNDUP(0.1*3,1) is 0.3, not 0.4."""
    digits = int(digits)
    factor = 10.0 ** digits
    y = float(f"{abs(x) * factor:.15g}")
    r = math.ceil(y)
    return math.copysign(r / factor, x) if r else 0.0


def _gammaln(x: float) -> float:
    if x <= 0:
        raise ValueError
    return math.lgamma(x)


#: One-argument worksheet functions (built once, not at every call).
_UNARY = {
    "SQRT": _math1(_sqrt), "SIN": _math1(math.sin), "COS": _math1(math.cos),
    "ASIN": _math1(math.asin), "RADIANS": _math1(math.radians),
    "DEGREES": _math1(math.degrees), "LN": _math1(_ln), "EXP": _math1(math.exp),
    "ABS": _math1(abs), "GAMMALN": _math1(_gammaln),
}


class Evaluator:
    """Evaluate worksheet formulas of an openpyxl workbook (cached values).

    Parameters
    ----------
    workbook : openpyxl.Workbook
        The workbook; formula cells hold strings starting with ``=``. Workbook-scoped
        defined names are resolved.
    sheets : collection of str, optional
        Only formulas on these sheets are evaluated by :meth:`values`; references to other
        sheets still read their cells.
    parse_cache : dict, optional
        Formula text -> syntax tree, shared between evaluators (e.g. over a batch of
        workbooks that hold the same formulas); filled as formulas are parsed. Parsing depends
        on the text only, so sharing never changes a value. Default: a cache of this
        evaluator's own.
    """

    def __init__(self, workbook, sheets=None, *, parse_cache: dict[str, Any] | None = None):
        self.wb = workbook
        self.sheets = list(sheets) if sheets is not None else list(workbook.sheetnames)
        self._cache: dict[tuple[str, int, int], Any] = {}
        self._busy: set[tuple[str, int, int]] = set()
        self._parsed: dict[str, Any] = {} if parse_cache is None else parse_cache
        self._names: dict[str, tuple] = {}
        for name, dn in workbook.defined_names.items():
            dests = list(dn.destinations)
            if len(dests) == 1:
                sheet, coord = dests[0]
                node = _parse_ref(coord)
                self._names[name.upper()] = ("ref", sheet) + node[2:]

    # public -----------------------------------------------------------------
    def values(self) -> dict[str, dict[str, Any]]:
        """Every formula cell's value: ``{sheet: {coordinate: value}}``."""
        out: dict[str, dict[str, Any]] = {}
        limit = sys.getrecursionlimit()
        sys.setrecursionlimit(max(limit, 20000))   # long chains (fixed-point iterations)
        try:
            return self._values(out)
        finally:
            sys.setrecursionlimit(limit)

    def _values(self, out: dict[str, dict[str, Any]]) -> dict[str, dict[str, Any]]:
        for title in self.sheets:
            ws = self.wb[title]
            sheet_values = {}
            cells = getattr(ws, "cells", None)
            if isinstance(cells, dict):           # package.Sheet: (row, column) -> cell
                ordered = [cells[k] for k in sorted(cells)]
            else:
                ordered = [cell for row in ws.iter_rows() for cell in row]
            for cell in ordered:
                if isinstance(cell.value, str) and cell.data_type == "f":
                    sheet_values[cell.coordinate] = self.cell(title, cell.row, cell.column)
            out[title] = sheet_values
        return out

    def evaluate(self, formula: str, sheet: str) -> Any:
        """Value of a formula as if it were in a cell of ``sheet``."""
        limit = sys.getrecursionlimit()
        sys.setrecursionlimit(max(limit, 20000))
        try:
            return self._scalar(self._eval(parse(formula), sheet))
        finally:
            sys.setrecursionlimit(limit)

    def cell(self, sheet: str, row: int, col: int) -> Any:
        """Value of one cell (formulas evaluated, results cached)."""
        key = (sheet, row, col)
        if key in self._cache:
            return self._cache[key]
        if sheet not in self.wb.sheetnames:
            return REF
        cell = self.wb[sheet].cell(row=row, column=col)
        value = cell.value
        if isinstance(value, str) and cell.data_type == "f":
            if key in self._busy:
                raise FormulaError(f"circular reference at {sheet}!{cell.coordinate}")
            self._busy.add(key)
            try:
                tree = self._parsed.get(value)
                if tree is None:
                    tree = self._parsed[value] = parse(value)
                result = self._scalar(self._eval(tree, sheet))
            finally:
                self._busy.discard(key)
        elif isinstance(value, (int, float)) and not isinstance(value, bool):
            result = float(value)
        else:
            result = value
        self._cache[key] = result
        return result

    # internals -------------------------------------------------------------
    def _scalar(self, v: Any) -> Any:
        if isinstance(v, _Array):
            return v.rows[0][0] if v.shape == (1, 1) else VALUE
        return v

    def _range(self, node, sheet: str) -> Any:
        _, ref_sheet, c1, r1, c2, r2 = node
        ref_sheet = ref_sheet or sheet
        if (c1, r1) == (c2, r2):
            return self.cell(ref_sheet, r1, c1)
        return _Array([[self.cell(ref_sheet, r, c) for c in range(c1, c2 + 1)]
                       for r in range(r1, r2 + 1)])

    def _eval(self, node, sheet: str) -> Any:
        kind = node[0]
        if kind in ("num", "str", "bool"):
            return node[1]
        if kind == "ref":
            return self._range(node, sheet)
        if kind == "name":
            ref = self._names.get(node[1].upper())
            return NAME if ref is None else self._range(ref, sheet)
        if kind == "un":
            v = self._eval(node[2], sheet)
            return _map(lambda x: _arith("-", 0.0, x) if node[1] == "-" else _num(x), v)
        if kind == "pct":
            return _map(lambda x: _arith("/", x, 100.0), self._eval(node[1], sheet))
        if kind == "bin":
            op = node[1]
            a = self._eval(node[2], sheet)
            b = self._eval(node[3], sheet)
            if op == "&":
                return _map(lambda x, y: (x if is_error(_text(x)) else
                                          (_text(y) if is_error(_text(y)) else
                                           _text(x) + _text(y))), a, b)
            if op in _Parser._COMPARE:
                return _map(lambda x, y: _compare(op, x, y), a, b)
            return _map(lambda x, y: _arith(op, x, y), a, b)
        if kind == "call":
            return self._call(node[1], node[2], sheet)
        raise FormulaError(f"cannot evaluate node {node!r}")

    def _call(self, fname: str, args: list, sheet: str) -> Any:
        ev = lambda a: self._eval(a, sheet)  # noqa: E731
        n = len(args)
        unary = _UNARY
        if fname in unary and n == 1:
            return _map(unary[fname], ev(args[0]))
        if fname == "PI" and n == 0:
            return math.pi
        if fname == "POWER" and n == 2:
            return _map(lambda x, y: _arith("^", x, y), ev(args[0]), ev(args[1]))
        if fname == "ATAN2" and n == 2:
            def atan2(x, y):
                x, y = _num(x), _num(y)
                for v in (x, y):
                    if is_error(v):
                        return v
                return DIV0 if x == 0 and y == 0 else math.atan2(y, x)
            return _map(atan2, ev(args[0]), ev(args[1]))
        if fname in ("ROUND", "ROUNDUP") and n == 2:
            how = _round if fname == "ROUND" else _roundup

            def rnd(x, d):
                x, d = _num(x), _num(d)
                for v in (x, d):
                    if is_error(v):
                        return v
                return how(x, d)
            return _map(rnd, ev(args[0]), ev(args[1]))
        if fname == "IF" and n in (2, 3):
            cond = _truth(self._scalar(ev(args[0])))
            if is_error(cond):
                return cond
            if cond:
                return ev(args[1])
            return ev(args[2]) if n == 3 else False
        if fname == "IFERROR" and n == 2:
            v = self._scalar(ev(args[0]))
            return ev(args[1]) if is_error(v) else v
        if fname in ("AND", "OR") and n >= 1:
            flags = []
            for a in args:
                v = ev(a)
                for item in (v.flat() if isinstance(v, _Array) else [v]):
                    t = _truth(item)
                    if is_error(t):
                        return t
                    flags.append(t)
            return all(flags) if fname == "AND" else any(flags)
        if fname in ("MAX", "MIN") and n >= 1:
            nums = []
            for a in args:
                v = ev(a)
                items = v.flat() if isinstance(v, _Array) else [v]
                for item in items:
                    if is_error(item):
                        return item
                    if isinstance(v, _Array):
                        if isinstance(item, (int, float)) and not isinstance(item, bool):
                            nums.append(float(item))
                    else:
                        x = _num(item)
                        if is_error(x):
                            return x
                        nums.append(x)
            if not nums:
                return 0.0
            return max(nums) if fname == "MAX" else min(nums)
        if fname == "SUMPRODUCT" and n >= 1:
            arrays = [ev(a) for a in args]
            arrays = [a if isinstance(a, _Array) else _Array([[a]]) for a in arrays]
            shape = arrays[0].shape
            if any(a.shape != shape for a in arrays):
                return VALUE
            total = 0.0
            for items in zip(*[a.flat() for a in arrays]):
                prod = 1.0
                for item in items:
                    if is_error(item):
                        return item
                    prod *= float(item) if (isinstance(item, (int, float))
                                            and not isinstance(item, bool)) else 0.0
                total += prod
            return total
        if fname == "INDEX" and n in (2, 3):
            arr = ev(args[0])
            arr = arr if isinstance(arr, _Array) else _Array([[arr]])
            r = _num(self._scalar(ev(args[1])))
            c = _num(self._scalar(ev(args[2]))) if n == 3 else 1.0
            for v in (r, c):
                if is_error(v):
                    return v
            rows, cols = arr.shape
            if n == 2 and rows == 1:
                r, c = 1.0, r
            r, c = int(r), int(c)
            if not (1 <= r <= rows and 1 <= c <= cols):
                return REF
            return arr.rows[r - 1][c - 1]
        if fname == "MATCH" and n in (2, 3):
            key = self._scalar(ev(args[0]))
            arr = ev(args[1])
            arr = arr if isinstance(arr, _Array) else _Array([[arr]])
            mode = _num(self._scalar(ev(args[2]))) if n == 3 else 1.0
            if mode != 0:
                raise FormulaError("MATCH is evaluated with match type 0 (exact) only")
            for i, item in enumerate(arr.flat()):
                if not is_error(item) and _compare("=", key, item) is True:
                    return float(i + 1)
            return NA
        if fname in ALLOWED_FUNCTIONS:
            raise FormulaError(f"{fname} with {n} arguments is not evaluated by the builder")
        return NAME

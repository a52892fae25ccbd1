# SPDX-License-Identifier: MIT
"""Spreadsheet functions: thin xlwings wrappers over the engine (the only xlwings import).

The same module serves the classic Windows add-in (``Import Functions`` with ``UDF Modules``
set to ``functions.udf``) and xlwings Lite (exported into one ``main.py`` by
``workbook_builder.lite_export``). The wrappers (``sway_exact_period`` ...) are generated at
import from their declarations in :mod:`functions.catalogue` (Excel name, description,
per-argument help, defaults), decorators included; each one calls :func:`evaluate`.

How cells arrive and leave (both add-ins):

* every numeric argument is read with ``ndim=2``: a single cell arrives as ``[[x]]`` (or a plain
  scalar when called from Python), a range as a list of rows; empty cells as ``None``; cell
  errors such as ``#DIV/0!`` as their text (``err_to_str``), so they are reported, not ignored;
* the result has the broadcast shape of the numeric arguments (a column in, a column out); a
  single result is returned as a plain value;
* an empty cell in a required argument gives an empty result cell; an empty or omitted optional
  argument takes its default;
* a bad value gives, in its own result cell, one short text naming the argument, the value and
  the valid range (the engine's own message). Whole-call problems (ranges of different sizes, an
  unknown method) give one text. Nothing is raised and no NaN or inf is returned.
"""
from __future__ import annotations

import keyword
import math
import numbers
from typing import Any, Callable

import numpy as np

from functions._validation import as_array
from functions.catalogue import (
    BY_NAME, CATEGORY, FIELDS, FLAG, FUNCTIONS, LISTS, LOOKUP, NUMBER, ROW_REDUCE, ROWS, SUMMARY,
    TEXT, Argument, SheetFunction,
)

try:  # the decorators are no-ops outside a supported runtime (e.g. on Linux)
    from xlwings import arg, func
except ImportError:  # pragma: no cover - xlwings is a dependency; keep the wrappers usable
    def func(f=None, **kwargs):
        return f if f is not None else (lambda g: g)

    def arg(*args, **kwargs):
        return lambda g: g

__all__ = ["evaluate", "MAX_TEXT"]

#: Longest text a wrapper returns (the function wizard's limit, and short enough to read).
MAX_TEXT = 255

_EMPTY, _OK, _BAD = 0, 1, 2


class _CallError(Exception):
    """A problem with the whole call (returned as one text)."""


def _short(text: str) -> str:
    text = " ".join(str(text).split())
    return text if len(text) <= MAX_TEXT else text[: MAX_TEXT - 3] + "..."


def _shown(value: Any) -> Any:
    """The value as it goes into a message: long texts cut, huge integers as floats."""
    if isinstance(value, str) and len(value) > 40:
        return value[:37] + "..."
    if isinstance(value, int) and not isinstance(value, bool):
        try:
            return float(value)
        except OverflowError:
            return math.inf if value > 0 else -math.inf
    return value


def _is_empty(value: Any) -> bool:
    return value is None or (isinstance(value, str) and not value.strip())


def _classify(name: str, value: Any) -> tuple[int, float, str]:
    """(status, number, message) of one cell value."""
    if _is_empty(value):
        return _EMPTY, 0.0, ""
    if isinstance(value, numbers.Real) and not isinstance(value, (bool, np.bool_)):
        try:
            x = float(value)
        except OverflowError:
            digits = len(str(abs(int(value))))
            return _BAD, 0.0, (f"{name}: a number of {digits} digits is too large (the "
                               "largest is about 1.8e308)")
        except (ValueError, TypeError):
            x = math.nan
        if math.isfinite(x):
            return _OK, x, ""
    shown = _shown(value)
    try:
        as_array(name, shown)
    except ValueError as exc:  # reuse the engine's wording
        return _BAD, 0.0, str(exc)
    return _BAD, 0.0, f"{name}={shown!r} must be a finite number"


def _grid(name: str, value: Any) -> np.ndarray:
    """Cell value(s) as an object array of shape () (one cell) or (rows, columns)."""
    if isinstance(value, np.ndarray):
        value = value.tolist()
    if isinstance(value, tuple):
        value = list(value)
    if not isinstance(value, list):
        if isinstance(value, (dict, set)):
            raise _CallError(f"{name}: give a cell or a range, not a {type(value).__name__}")
        cell = np.empty((), dtype=object)
        cell[()] = value
        return cell
    if not value:
        raise _CallError(f"{name}: the range is empty")
    rows = [list(r) if isinstance(r, (list, tuple, np.ndarray)) else None for r in value]
    if all(r is None for r in rows):
        rows = [list(value)]          # a 1-D list is one row (as Excel writes it)
    elif any(r is None for r in rows):
        raise _CallError(f"{name}: mixes single values and rows; give a rectangular range")
    width = len(rows[0])
    if width == 0 or any(len(r) != width for r in rows):
        raise _CallError(f"{name}: rows of different lengths; give a rectangular range")
    out = np.empty((len(rows), width), dtype=object)
    for i, r in enumerate(rows):
        for j, v in enumerate(r):
            if isinstance(v, (list, tuple, dict, set, np.ndarray)):
                raise _CallError(f"{name}: nested lists are not cells; give a rectangular range")
            out[i, j] = v
    return out


def _unwrap_single(value: Any) -> Any:
    """The value of a single cell given as [[x]] or [x]; other values unchanged."""
    while isinstance(value, (list, tuple)) and len(value) == 1:
        value = value[0]
    if isinstance(value, np.ndarray) and value.size == 1:
        value = value.reshape(()).item()
    return value


def _text_choice(a: Argument, value: Any) -> str:
    value = _unwrap_single(value)
    if _is_empty(value):
        if a.optional:
            return a.default
        raise _CallError(f"{a.name} is required: one of {', '.join(a.choices)}")
    if isinstance(value, str):
        key = value.strip().lower().replace("-", "_").replace(" ", "_")
        if key in a.choices:
            return key
    choices = ", ".join(a.choices)
    raise _CallError(f"{a.name}={_shown(value)!r} must be one of: {choices}")


def _flag(a: Argument, value: Any) -> bool:
    value = _unwrap_single(value)
    if _is_empty(value):
        return a.default
    if isinstance(value, (bool, np.bool_)):
        return bool(value)
    if isinstance(value, numbers.Real) and value in (0, 1):
        return bool(value)
    if isinstance(value, str) and value.strip().upper() in ("TRUE", "FALSE"):
        return value.strip().upper() == "TRUE"
    raise _CallError(f"{a.name}={_shown(value)!r} must be TRUE or FALSE")


def _fraction_message(a: Argument, x: float) -> str:
    return (f"{a.name}={x!r} must be in [0, 1) [-]: give a fraction, "
            f"e.g. 0.05 for 5 % (percent is not accepted)")


def _finite_result(fn: SheetFunction, value: Any) -> Any:
    try:
        x = float(value)
    except (TypeError, ValueError, OverflowError):
        return _short(f"{fn.name}: no numeric result for these inputs")
    if not math.isfinite(x):
        return _short(f"{fn.name}: no finite result for these inputs")
    return x


def _engine_call(fn: SheetFunction, kwargs: dict[str, Any]) -> Any:
    result = fn.engine(**kwargs)
    if fn.output is not None:
        result = result[fn.output]
    return result


def _engine_message(fn: SheetFunction, exc: Exception) -> str:
    if isinstance(exc, ValueError):
        text = str(exc)
        for a in fn.arguments:          # name the argument as the cell formula does
            if a.param and text.startswith(a.param + "="):
                text = a.name + text[len(a.param):]
        return _short(text)
    return _short(f"{fn.name}: cannot compute ({type(exc).__name__}: {exc})")


def _evaluate_elementwise(fn: SheetFunction, values: tuple) -> Any:
    numeric: list[tuple[Argument, np.ndarray]] = []
    fixed: dict[str, Any] = {}
    for a, value in zip(fn.arguments, values):
        if a.kind == TEXT:
            fixed[a.engine_param] = _text_choice(a, value)
        elif a.kind == FLAG:
            fixed[a.engine_param] = _flag(a, value)
        elif a.optional and _is_empty(_unwrap_single(value)) and not isinstance(value, list):
            fixed[a.engine_param] = a.default
        else:
            numeric.append((a, _grid(a.name, value)))
    try:
        shape = np.broadcast_shapes(*(g.shape for _, g in numeric)) if numeric else ()
    except ValueError:
        sizes = ", ".join(f"{a.name} ({g.shape[0]}x{g.shape[1]})" if g.ndim else
                          f"{a.name} (1 cell)" for a, g in numeric)
        raise _CallError("ranges do not match: " + sizes + "; give ranges of the same size, "
                         "or one cell, one row or one column") from None
    size = int(np.prod(shape)) if shape else 1
    out = np.empty(size, dtype=object)
    status = np.full(size, _OK)
    columns: dict[str, np.ndarray] = {}
    for a, g in numeric:
        cells = np.broadcast_to(g, shape).ravel()
        col = np.zeros(size)
        for k, v in enumerate(cells):
            if status[k] == _BAD:
                continue
            st, x, msg = _classify(a.name, v)
            if st == _EMPTY:
                if a.optional:
                    x = float(a.default)
                else:
                    status[k] = _EMPTY
                    continue
            elif st == _BAD:
                status[k], out[k] = _BAD, _short(msg)
                continue
            if a.fraction and x >= 1.0:
                status[k], out[k] = _BAD, _short(_fraction_message(a, x))
                continue
            col[k] = x
        columns[a.engine_param] = col
    ok = np.flatnonzero(status == _OK)
    out[status == _EMPTY] = None
    if ok.size:
        kwargs = dict(fixed)
        kwargs.update({p: c[ok] for p, c in columns.items()})
        try:
            with np.errstate(all="ignore"):
                result = np.asarray(_engine_call(fn, kwargs), dtype=float)
            result = np.broadcast_to(result, ok.shape)
            for k, r in zip(ok, result):
                out[k] = _finite_result(fn, r)
        except Exception:  # find the message of each bad cell, one at a time
            for k in ok:
                one = dict(fixed)
                one.update({p: float(c[k]) for p, c in columns.items()})
                try:
                    with np.errstate(all="ignore"):
                        out[k] = _finite_result(fn, _engine_call(fn, one))
                except Exception as exc:
                    out[k] = _engine_message(fn, exc)
    if not shape or shape == (1, 1):
        return out[0]
    return out.reshape(shape).tolist()


def _evaluate_row_reduce(fn: SheetFunction, values: tuple) -> Any:
    (a,) = fn.arguments
    g = _grid(a.name, values[0])
    if g.ndim == 0:
        g = g.reshape(1, 1)
    if g.shape[1] == 1 and g.shape[0] > 1:
        g = g.T                       # a single column is one list, like a row
    out: list[Any] = []
    for row in g:
        numbers_ = []
        message = None
        for v in row:
            st, x, msg = _classify(a.name, v)
            if st == _BAD:
                message = msg
                break
            if st == _OK:
                numbers_.append(x)
        if message is not None:
            out.append(_short(message))
        elif not numbers_:
            out.append(None)
        else:
            try:
                with np.errstate(all="ignore"):
                    out.append(_finite_result(fn, _engine_call(
                        fn, {a.engine_param: np.array(numbers_)})))
            except Exception as exc:
                out.append(_engine_message(fn, exc))
    return out[0] if len(out) == 1 else [[v] for v in out]


def _case_value(a: Argument, v: Any) -> tuple[int, Any, str]:
    """(status, value, message) of one cell of a SUMMARY argument."""
    st, x, msg = _classify(a.name, v)
    if st == _EMPTY:
        return (_OK, a.default, "") if a.optional else (_EMPTY, None, "")
    if st == _BAD:
        return _BAD, None, msg
    if a.fraction and x >= 1.0:
        return _BAD, None, _fraction_message(a, x)
    if a.integer:
        if x != int(x) or x < 0:
            return _BAD, None, f"{a.name}={x!r} must be a whole number >= 0 [-]"
        return _OK, int(x), ""
    return _OK, x, ""


def _summary_numbers(fn: SheetFunction, result: Any) -> list[Any]:
    if hasattr(result, "to_dict"):
        result = result.to_dict()
    out = []
    for name, _unit, _text in fn.fields:
        value = result[name] if isinstance(result, dict) else getattr(result, name)
        out.append(_finite_result(fn, value))
    return out


def _evaluate_summary(fn: SheetFunction, values: tuple) -> Any:
    fixed: dict[str, Any] = {}
    grids: list[tuple[Argument, np.ndarray]] = []
    for a, value in zip(fn.arguments, values):
        if a.kind == TEXT:
            fixed[a.engine_param] = _text_choice(a, value)
        elif a.kind == FLAG:
            fixed[a.engine_param] = _flag(a, value)
        elif a.optional and _is_empty(value):
            fixed[a.engine_param] = a.default
        else:
            grids.append((a, _grid(a.name, value)))
    n, orientation = 1, None
    for a, g in grids:
        if g.ndim == 0 or g.shape == (1, 1):
            continue
        this = "column" if g.shape[1] == 1 else "row" if g.shape[0] == 1 else "block"
        if this == "block" or (orientation and (this != orientation or g.size != n)):
            raise _CallError(f"{a.name}: give one cell, or a row or a column of cases as long "
                             "as those of the other arguments")
        orientation, n = this, g.size
    columns: list[list[Any]] = []
    width = len(fn.fields)
    for k in range(n):
        kwargs = dict(fixed)
        message, empty = None, False
        for a, g in grids:
            cell = g.reshape(-1)[0 if g.size == 1 else k] if g.ndim else g.item()
            st, x, msg = _case_value(a, cell)
            if st == _BAD:
                message = msg
                break
            empty |= st == _EMPTY
            kwargs[a.engine_param] = x
        if message is None and empty:
            columns.append([None] * width)
            continue
        if message is None:
            try:
                with np.errstate(all="ignore"):
                    columns.append(_summary_numbers(fn, fn.engine(**kwargs)))
                continue
            except Exception as exc:
                message = _engine_message(fn, exc)
        columns.append([_short(message)] + [None] * (width - 1))
    if orientation == "column":
        return columns
    return [[columns[k][j] for k in range(n)] for j in range(width)]


def _evaluate_lists(fn: SheetFunction, values: tuple) -> Any:
    """Paired lists (one cell per level) and single-cell options -> one value."""
    lists: list[tuple[Argument, list]] = []
    for a, value in zip(fn.arguments, values):
        if a.kind != ROWS:
            continue
        g = _grid(a.name, value)
        if g.ndim and 1 not in g.shape:
            raise _CallError(f"{a.name}: give one row or one column, one cell per level")
        lists.append((a, list(g.reshape(-1))))
    n = len(lists[0][1])
    if any(len(cells) != n for _, cells in lists):
        sizes = ", ".join(f"{a.name} ({len(cells)} cells)" for a, cells in lists)
        raise _CallError(f"the lists must have one cell per level each: {sizes}")
    kept: list[int] = []
    columns: dict[str, list[float]] = {a.engine_param: [] for a, _ in lists}
    for k in range(n):
        states = [(a, _classify(a.name, cells[k])) for a, cells in lists]
        if all(st == _EMPTY for _, (st, _x, _m) in states):
            continue
        for a, (st, _x, msg) in states:
            if st == _BAD:
                raise _CallError(msg)
            if st == _EMPTY:
                raise _CallError(f"{a.name} is empty at position {k + 1} but not the other "
                                 "list: fill both or neither")
        kept.append(k)
        for a, (_st, x, _m) in states:
            columns[a.engine_param].append(x)
    if not kept:
        return None
    kwargs: dict[str, Any] = {p: np.array(c) for p, c in columns.items()}
    shown_as: dict[str, str] = {}          # engine index -> the position the sheet shows
    for a, value in zip(fn.arguments, values):
        if a.kind == ROWS:
            continue
        value = _unwrap_single(value)
        if isinstance(value, (list, tuple, np.ndarray)):
            raise _CallError(f"{a.name}: give a single cell")
        st, x, msg = _classify(a.name, value)
        if st == _BAD:
            raise _CallError(msg)
        if st == _EMPTY:
            kwargs[a.engine_param] = a.default
            if a.position:
                shown_as[f"{a.engine_param}={a.default}"] = f"{a.name}={kept[a.default] + 1}"
            continue
        if a.position:
            shown = int(x) if x == int(x) else x
            if x != int(x) or not 1 <= x <= n:
                raise _CallError(f"{a.name}={shown!r} must be a whole number in [1, {n}] "
                                 "(a position in the lists)")
            if int(x) - 1 not in kept:
                raise _CallError(f"{a.name}={shown!r} points at an empty level")
            x = kept.index(int(x) - 1)
            shown_as[f"{a.engine_param}={x}"] = f"{a.name}={shown}"
        kwargs[a.engine_param] = x
    try:
        with np.errstate(all="ignore"):
            return _finite_result(fn, _engine_call(fn, kwargs))
    except Exception as exc:
        text = _engine_message(fn, exc)
        for engine_text, sheet_text in shown_as.items():
            text = text.replace(engine_text, sheet_text)
        return text


def _evaluate_lookup(fn: SheetFunction, values: tuple) -> Any:
    """Names (a cell or a range) -> the values of the engine table, same shape."""
    (a,) = fn.arguments
    g = _grid(a.name, values[0])
    out = []
    for cell in g.reshape(-1):
        if _is_empty(cell):
            out.append(None)
            continue
        try:
            out.append(float(fn.engine[_text_choice(a, cell)]))
        except _CallError as exc:
            out.append(_short(str(exc)))
    if g.ndim == 0 or g.shape == (1, 1):
        return out[0]
    return np.array(out, dtype=object).reshape(g.shape).tolist()


def evaluate(name: str, *values: Any) -> Any:
    """Evaluate worksheet function ``name`` on cell values; never raises.

    Returns a float, ``None`` (empty), a message text, or a list of rows of those.

    Examples
    --------
    >>> round(evaluate("SWAY_EXACT_PERIOD", 10.0, 15.0), 6)
    6.37211
    >>> evaluate("SWAY_EXACT_PERIOD", [[-2.0], [None]])
    [['length=-2.0 must be in (0, inf) [m]'], [None]]
    """
    try:
        fn = BY_NAME[name]
        if len(values) > len(fn.arguments):
            return _short(f"{name} takes at most {len(fn.arguments)} arguments")
        values = values + (None,) * (len(fn.arguments) - len(values))
        for a, v in zip(fn.arguments, values):
            if not a.optional and v is None:
                return None if a.kind != TEXT else _short(f"{a.name} is required")
        if fn.kind == FIELDS:
            return [[f"{field} [{unit}]"] for field, unit, _text in fn.fields]
        if fn.kind == SUMMARY:
            return _evaluate_summary(fn, values)
        if fn.kind == ROW_REDUCE:
            return _evaluate_row_reduce(fn, values)
        if fn.kind == LISTS:
            return _evaluate_lists(fn, values)
        if fn.kind == LOOKUP:
            return _evaluate_lookup(fn, values)
        return _evaluate_elementwise(fn, values)
    except _CallError as exc:
        return _short(str(exc))
    except Exception as exc:  # never let a traceback reach a cell
        return _short(f"{name}: cannot compute ({type(exc).__name__}: {exc})")


# --- the worksheet functions, generated from the catalogue ------------------------------------
# xlwings (classic add-in and xlwings Lite) registers a worksheet function from the decorated
# function object: the argument names and which are optional from inspect.signature, the wizard's
# description from __doc__; the add-in then calls it by name in this module. So each wrapper is a
# real ``def`` compiled from text built from its catalogue entry (names checked first), which
# gives a genuine signature and code object, where a ``*args`` closure would show no arguments.

def _wrapper_source(fn: SheetFunction) -> str:
    """``def name(required, optional=None): return evaluate("NAME", required, optional)``."""
    for n in [fn.python_name] + [a.name for a in fn.arguments]:
        if not n.isidentifier() or keyword.iskeyword(n):
            raise ValueError(f"{fn.name}: {n!r} cannot name a Python function or argument")
    params = ", ".join(a.name + ("=None" if a.optional else "") for a in fn.arguments)
    values = "".join(f", {a.name}" for a in fn.arguments)
    return f"def {fn.python_name}({params}):\n    return evaluate({fn.name!r}{values})\n"


def _sheet_function(fn: SheetFunction) -> Callable[..., Any]:
    """The wrapper of ``fn``, with xlwings' decorators applied from its catalogue entry."""
    local: dict[str, Any] = {}
    # In this module's globals: the wrapper finds ``evaluate`` here, and its __module__ is this
    # module's name (``functions.udf``, or the renamed package's in the xlwings Lite export).
    exec(compile(_wrapper_source(fn), f"<{fn.name}>", "exec"), globals(), local)
    f = local[fn.python_name]
    f.__doc__ = fn.description              # xlwings shows the docstring in the wizard
    for a in reversed(fn.arguments):
        if a.kind in (NUMBER, ROWS) or fn.kind == LOOKUP:
            f = arg(a.name, ndim=2, err_to_str=True, doc=a.help)(f)
        else:
            f = arg(a.name, doc=a.help)(f)
    options: dict[str, Any] = {"category": CATEGORY}
    if fn.slow:                             # classic add-in: not while typing in the wizard
        options["call_in_wizard"] = False
    return func(**options)(f)


# Module globals, found by name by the add-ins and by ``from functions.udf import *``.
_WRAPPERS = {fn.python_name: _sheet_function(fn) for fn in FUNCTIONS}
globals().update(_WRAPPERS)
__all__ += list(_WRAPPERS)

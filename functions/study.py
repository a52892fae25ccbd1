# SPDX-License-Identifier: MIT
"""Parameter studies: the design chain over arrays of inputs, returned as a table.

:func:`design_table` takes any design input of :class:`functions.design.DesignInputs` as an
array (or a scalar), broadcasts them with numpy's rules, sizes one damper per point with
:func:`functions.design.design_damper` and returns a :class:`DesignTable`: one flat column per
input, result and design check, in the order of :meth:`functions.design.DesignResult.to_dict`,
each with its unit from the declarations of :mod:`functions.quantities`. The columns load
straight into a table (``pandas.DataFrame(table.columns)``, a CSV writer, a worksheet range)
without this package depending on any of them.

A point whose design is impossible (no damper required, the required mass ratio or the stroke
out of reach: a ValueError of the engine) gets NaN results, False verdicts and the message in
the ``error`` column; the other points are unaffected. An input outside its declared range is
refused before any design runs, as :class:`functions.design.DesignInputs` refuses it.

The points run in chunks, one after the other or on any :class:`concurrent.futures.Executor`
(a process pool, a thread pool, a cluster's executor): the chunk function is a plain
module-level function of picklable data, and the results are the same either way.

This is a preliminary design aid: results must be checked by a licensed engineer against local
codes, wind-tunnel data and the manufacturer's design.
"""
from __future__ import annotations

import math
from concurrent.futures import Executor
from dataclasses import dataclass
from typing import Any, Mapping, Sequence

import numpy as np

from functions._validation import broadcast, check_range
from functions.design import CHECK_NAMES, DesignInputs, design_damper
from functions.quantities import Quantity, design_inputs, design_results

__all__ = ["DesignTable", "design_table", "ERROR_COLUMN", "CHUNKS_PER_EXECUTOR"]

#: Name of the column holding, for each point, why its design is impossible ('' if it ran).
ERROR_COLUMN = "error"

#: Number of chunks a study is cut into for an executor when no ``chunk_size`` is given [-].
CHUNKS_PER_EXECUTOR = 64

_NOT_NUMBERS = ("choice", "flag", "count")     # kinds checked one value at a time


@dataclass(frozen=True, eq=False)
class DesignTable:
    """Columns of a parameter study: one row per point of the broadcast inputs.

    ``columns`` maps each column name to a flat numpy array of ``len(table)`` rows (the points
    in C order of ``shape``): the inputs (floats in SI; ``tuning_method`` as text), the
    results (floats, NaN where the design is impossible), the verdicts ``<check>_ok`` and
    ``all_ok`` (booleans) and :data:`ERROR_COLUMN` (text, '' where the design ran). ``units``
    maps each column to its declared unit ('' for verdicts, text and error). ``shape`` is the
    broadcast shape of the inputs; :meth:`grid` gives a column in that shape.
    """

    columns: Mapping[str, np.ndarray]
    units: Mapping[str, str]
    shape: tuple[int, ...]

    @property
    def names(self) -> tuple[str, ...]:
        """Column names, in order."""
        return tuple(self.columns)

    def __len__(self) -> int:
        return math.prod(self.shape)

    def __getitem__(self, name: str) -> np.ndarray:
        return self.columns[name]

    @property
    def ok(self) -> np.ndarray:
        """True where the design ran and every check passes (the ``all_ok`` column)."""
        return self.columns["all_ok"]

    def grid(self, name: str) -> np.ndarray:
        """The column ``name`` in the broadcast shape of the inputs."""
        return self.columns[name].reshape(self.shape)

    def __repr__(self) -> str:
        failed = int(np.count_nonzero(self.columns[ERROR_COLUMN]))
        return (f"DesignTable(shape={self.shape}, {len(self)} rows, {len(self.columns)} "
                f"columns, {int(np.count_nonzero(self.ok))} pass every check, {failed} "
                "impossible)")

    def to_rows(self) -> list[dict[str, Any]]:
        """One dict per point, column name -> Python float, bool or str."""
        lists = {name: column.tolist() for name, column in self.columns.items()}
        return [{name: values[i] for name, values in lists.items()} for i in range(len(self))]


# --------------------------------------------------------------------------------------------
# inputs
# --------------------------------------------------------------------------------------------
def _input_array(q: Quantity, value: Any) -> np.ndarray:
    """Every element of an input checked against its declaration (before any design)."""
    if q.kind not in _NOT_NUMBERS:
        return check_range(q.name, value, q.low, q.high, low_open=q.low_open,
                           high_open=q.high_open, unit=q.unit)
    arr = np.asarray(value, dtype=object)
    for element in arr.flat:
        q.validate(element)                       # ValueError naming the input and its range
    return arr


def _study_inputs(inputs: DesignInputs | None,
                  kwargs: Mapping[str, Any]) -> tuple[dict[str, np.ndarray], tuple[int, ...]]:
    if inputs is not None and not isinstance(inputs, DesignInputs):
        raise ValueError(f"inputs={inputs!r} must be a DesignInputs or None")
    values = {**(inputs.as_dict() if inputs is not None else {}), **kwargs}
    declared = design_inputs()
    unknown = sorted(set(values) - {q.name for q in declared})
    if unknown:
        raise TypeError(f"design_table got unexpected field(s) {unknown}; the fields are "
                        f"{', '.join(q.name for q in declared)}")
    given: dict[str, np.ndarray] = {}
    for q in declared:
        value = values.get(q.name)
        if value is not None:
            given[q.name] = _input_array(q, value)
        elif q.required:
            raise TypeError(f"design_table is missing the required field {q.name!r}")
    # the shape from the arrays alone (a failure names only them), then every input to it
    arrays = broadcast(**{name: arr for name, arr in given.items() if arr.ndim})
    shape = arrays[0].shape if arrays else ()
    return {name: np.broadcast_to(arr, shape).ravel() for name, arr in given.items()}, shape


def _points(flat: Mapping[str, np.ndarray], n: int) -> list[dict[str, Any]]:
    """One dict of Python values per point, each accepted by DesignInputs (about 25 us a
    point: the rules between inputs, e.g. mass_ratio_max above mass_ratio_min, are checked
    before any design runs)."""
    lists = {name: arr.tolist() for name, arr in flat.items()}
    points = [{name: values[i] for name, values in lists.items()} for i in range(n)]
    for i, point in enumerate(points):
        try:
            DesignInputs(**point)
        except ValueError as exc:
            raise ValueError(f"{exc} (point {i} of the table)") from None
    return points


# --------------------------------------------------------------------------------------------
# running
# --------------------------------------------------------------------------------------------
def _result_names() -> tuple[str, ...]:
    return tuple(q.name for q in design_results())


def _verdict_names() -> tuple[str, ...]:
    return tuple(f"{name}_ok" for name in CHECK_NAMES) + ("all_ok",)


def _design_chunk(points: Sequence[Mapping[str, Any]]
                  ) -> tuple[np.ndarray, np.ndarray, list[str]]:
    """Results, verdicts and error texts of a chunk of points (runs in a worker).

    Returns a float array (points x results), a boolean array (points x verdicts) and one
    error text per point. Inputs are built outside the ``try``: an invalid point is an error
    of the study (checked before), not an impossible design.
    """
    results, verdicts = _result_names(), _verdict_names()
    values = np.full((len(points), len(results)), np.nan)
    passed = np.zeros((len(points), len(verdicts)), dtype=bool)
    errors = [""] * len(points)
    for i, point in enumerate(points):
        p = DesignInputs(**point)
        try:
            row = design_damper(p).to_dict()
        except ValueError as exc:
            errors[i] = str(exc)
            continue
        values[i] = [row[name] for name in results]
        passed[i] = [row[name] for name in verdicts]
    return values, passed, errors


def _chunks(points: list[dict[str, Any]], size: int) -> list[list[dict[str, Any]]]:
    return [points[i:i + size] for i in range(0, len(points), size)]


def _run(points: list[dict[str, Any]], executor: Executor | None, chunk_size: int | None
         ) -> list[tuple[np.ndarray, np.ndarray, list[str]]]:
    if chunk_size is None:
        chunk_size = len(points) if executor is None else \
            math.ceil(len(points) / CHUNKS_PER_EXECUTOR)
    chunks = _chunks(points, max(1, chunk_size))
    if executor is None:
        return [_design_chunk(chunk) for chunk in chunks]
    return list(executor.map(_design_chunk, chunks))


def design_table(inputs: DesignInputs | None = None, *, executor: Executor | None = None,
                 chunk_size: int | None = None, **kwargs: Any) -> DesignTable:
    """Size a damper for every point of broadcast input arrays.

    .. math::

        y_k = \\mathrm{design}\\big(x^{(1)}_k, x^{(2)}_k, \\ldots\\big), \\qquad
        k \\in \\mathrm{broadcast}\\big(\\mathrm{shape}(x^{(1)}), \\mathrm{shape}(x^{(2)}),
        \\ldots\\big)

    Parameters
    ----------
    inputs : DesignInputs or None, optional
        Design inputs for the fields not given in ``kwargs`` [-].
    executor : concurrent.futures.Executor or None, optional
        Runs the chunks of points (e.g. ``ProcessPoolExecutor()``); None: one after the other
        in this process [-].
    chunk_size : int or None, optional
        Points per chunk, >= 1; None: all points without an executor, else about
        :data:`CHUNKS_PER_EXECUTOR` chunks [-].
    **kwargs : Any
        Fields of :class:`functions.design.DesignInputs`, each a scalar or an array (any
        numeric field; ``tuning_method`` also as an array of texts), broadcast together
        with numpy's rules; they replace the fields of ``inputs`` [-].

    Returns
    -------
    table : DesignTable
        One row per point: inputs, results and verdicts as in
        :meth:`functions.design.DesignResult.to_dict`, then :data:`ERROR_COLUMN`; units in
        ``table.units`` [-].

    Raises
    ------
    ValueError
        If an element of an input is outside its declared range (naming the input, the value
        and the range), the inputs do not broadcast, a rule between inputs is broken at a
        point (e.g. both mass_ratio and damper_mass given), ``chunk_size`` is not a whole
        number >= 1, or ``executor`` has no ``map``. An impossible design at a point is not
        an error: see ``ERROR_COLUMN``.
    TypeError
        If a field is unknown or a required one is missing.

    Notes
    -----
    Each point is :func:`functions.design.design_damper` of that point's inputs, so the
    table holds exactly the numbers a loop over the points would give, whatever the
    executor. The required mass ratio (no ``mass_ratio`` or ``damper_mass`` given) costs a
    root search per point, some milliseconds; a given mass ratio well under one millisecond.
    With an executor the points travel in chunks as plain dicts and come back as arrays; the
    executor's ``map`` keeps their order.

    Preliminary design aid: results must be checked by a licensed engineer against local
    codes, wind-tunnel data and the manufacturer's design.

    Examples
    --------
    Invented scenario: a 0.15 Hz tower mode, M* = 20,000 t, 1.5 % damping, a 0.15 m/s^2
    limit and three peak accelerations without the damper (the first needs no damper):

    >>> t = design_table(frequency=0.15, modal_mass=2.0e7, structural_damping=0.015,
    ...                  acceleration=[0.12, 0.25, 0.30], acceleration_limit=0.15,
    ...                  clearance=1.2)
    >>> t.shape, t.units["damper_mass"]
    ((3,), 'kg')
    >>> [round(x / 1e3, 1) for x in t["damper_mass"].tolist()]
    [nan, 287.0, 745.4]
    >>> t["all_ok"].tolist(), t["error"][0][:40]
    ([False, True, True], 'acceleration=0.12 is already within acce')

    References
    ----------
    1. NumPy broadcasting rules: https://numpy.org/doc/stable/user/basics.broadcasting.html
    2. Python standard library, concurrent.futures.Executor.map.
    """
    if chunk_size is not None and (isinstance(chunk_size, bool) or
                                   not isinstance(chunk_size, int) or chunk_size < 1):
        raise ValueError(f"chunk_size={chunk_size!r} must be a whole number in [1, inf) or "
                         "None [-]")
    if executor is not None and not callable(getattr(executor, "map", None)):
        raise ValueError(f"executor={executor!r} must be a concurrent.futures.Executor (an "
                         "object with map) or None")
    flat, shape = _study_inputs(inputs, kwargs)
    n = math.prod(shape)
    points = _points(flat, n)
    parts = _run(points, executor, chunk_size)
    results, verdicts = _result_names(), _verdict_names()
    values = np.concatenate([part[0] for part in parts]) if parts else \
        np.empty((0, len(results)))
    passed = np.concatenate([part[1] for part in parts]) if parts else \
        np.empty((0, len(verdicts)), dtype=bool)
    errors = [text for part in parts for text in part[2]]

    declared = {q.name: q for q in design_inputs()}
    columns: dict[str, np.ndarray] = {}
    units: dict[str, str] = {}
    for name, q in declared.items():
        if name in results:
            continue
        column = flat.get(name)
        if column is None:                        # not given: its default
            column = np.full(n, np.nan if q.optional else q.default)
        columns[name] = column.astype(str) if q.kind == "choice" else \
            column.astype(float) if q.kind not in _NOT_NUMBERS else column
        units[name] = q.unit
    for j, q in enumerate(design_results()):
        columns[q.name], units[q.name] = values[:, j].copy(), q.unit
    for j, name in enumerate(verdicts):
        columns[name], units[name] = passed[:, j].copy(), ""
    columns[ERROR_COLUMN], units[ERROR_COLUMN] = np.array(errors, dtype=str).reshape(n), ""
    return DesignTable(columns, units, tuple(shape))

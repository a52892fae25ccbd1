# SPDX-License-Identifier: MIT
"""The declaration of one quantity: :class:`Quantity`, its kinds of unit and its defaults.

:mod:`functions.quantities` declares the design's quantities with it (and
:mod:`functions.quantities_supply` those of the damper's supply specification); every medium
(engine validation, project files, workbooks, worksheet functions, docs) reads them there.
Nothing here imports another module of the engine except the argument checks.
"""
from __future__ import annotations

import dataclasses
import math
from dataclasses import dataclass
from typing import Any

from functions._validation import check_range, interval_text

__all__ = ["Quantity", "REQUIRED", "OPTIONAL", "UNIT_KINDS", "INF", "declare", "LENGTH_FMT",
           "second_direction"]

INF = math.inf


#: Display format of lengths: 4 decimals below 10 m, 3 below 100 m, then 2 (5 significant
#: digits from 1 m to 1000 m, 3 or 4 below).
LENGTH_FMT = "[<10]0.0000;[<100]0.000;0.00"


class _Marker:
    def __init__(self, text: str) -> None:
        self.text = text

    def __repr__(self) -> str:
        return self.text


#: Default of a quantity that must be given.
REQUIRED = _Marker("REQUIRED")
#: Default of a quantity that may be left out (no value: the engine decides, see its note).
OPTIONAL = _Marker("OPTIONAL")

#: Kinds of unit, with the SI unit of each: a project file or a workbook may give a quantity in
#: any unit of its kind (``workbook_builder.project.units``).
UNIT_KINDS: dict[str, str] = {
    "frequency": "Hz", "mass": "kg", "fraction": "-", "acceleration": "m/s^2", "length": "m",
    "angle": "deg", "stiffness": "N/m", "dashpot": "N s/m", "time": "s", "force": "N",
    "count": "-", "choice": "", "flag": "", "return_period": "years", "velocity": "m/s",
    "energy": "J", "density": "kg/m^3", "power": "W", "dashpot_law": "N (s/m)^a",
    "volume": "m^3",
}


@dataclass(frozen=True)
class Quantity:
    """Declaration of one quantity.

    ``name`` is the glossary name (engine argument or result field); ``defined_name`` the name
    of its cell in a workbook when that differs (names must not read as worksheet functions or
    cell addresses, e.g. ``FREQUENCY``); ``section`` and ``key`` place an input in the project
    file (``[section] key = ...``). ``low``/``high`` with ``low_open``/``high_open`` give the
    valid range in SI units. ``default`` is :data:`REQUIRED`, :data:`OPTIONAL` or the SI value
    used when the quantity is not given. ``fmt`` is the number format a workbook shows the SI
    value with; ``note`` says where an input usually comes from, ``description`` what a result
    means. ``choices`` lists the accepted texts of a ``choice``; ``summary`` marks the
    quantities of the batch-recalculation summary.
    """

    name: str
    symbol: str
    label: str
    unit: str
    kind: str
    low: float = -INF
    high: float = INF
    low_open: bool = False
    high_open: bool = False
    default: Any = REQUIRED
    fmt: str = "General"
    note: str = ""
    description: str = ""
    defined_name: str = ""
    section: str = ""
    key: str = ""
    choices: tuple[str, ...] = ()
    summary: bool = False

    def __post_init__(self) -> None:
        if self.kind not in UNIT_KINDS:
            raise ValueError(f"kind={self.kind!r} of {self.name} must be one of "
                             f"{', '.join(UNIT_KINDS)}")

    # names ---------------------------------------------------------------------------------
    @property
    def cell_name(self) -> str:
        """Defined name of the quantity's (SI) cell in a workbook."""
        return self.defined_name or self.name

    @property
    def file_key(self) -> str:
        """Dotted key in a project file, e.g. ``mode.frequency`` ('' when not an input)."""
        return f"{self.section}.{self.key or self.name}" if self.section else ""

    @property
    def required(self) -> bool:
        return self.default is REQUIRED

    @property
    def optional(self) -> bool:
        return self.default is OPTIONAL

    @property
    def has_default(self) -> bool:
        return not (self.required or self.optional)

    # range ---------------------------------------------------------------------------------
    def interval(self, factor: float = 1.0) -> str:
        """Valid range in a unit with ``factor`` to SI, e.g. ``(0, 20]``.

        Examples
        --------
        >>> from functions.quantities import quantity
        >>> quantity("structural_damping").interval(0.01)
        '(0, 20]'
        """
        if self.kind == "count":        # whole numbers, shown in full (2^63 included)
            return (f"{'(' if self.low_open else '['}{int(self.low)}, {int(self.high)}"
                    f"{')' if self.high_open else ']'}")

        def scaled(x: float) -> float:
            return x if math.isinf(x) else float(f"{x / factor:.12g}")
        return interval_text(scaled(self.low), scaled(self.high), self.low_open,
                             self.high_open)

    def contains(self, si: float) -> bool:
        """True when the SI value ``si`` lies in the valid range (NaN never does)."""
        lo = si > self.low if self.low_open or math.isinf(self.low) else si >= self.low
        hi = si < self.high if self.high_open or math.isinf(self.high) else si <= self.high
        return bool(lo and hi)

    def validate(self, value: Any) -> Any:
        """The value as the engine takes it, or ValueError naming quantity, value and range.

        A number becomes a Python float (a ``count`` an int), a ``choice`` must be one of
        ``choices``, a ``flag`` a bool.

        Examples
        --------
        >>> from functions.quantities import quantity
        >>> quantity("frequency").validate(0.2)
        0.2
        >>> quantity("frequency").validate(0.0)
        Traceback (most recent call last):
        ...
        ValueError: frequency=0.0 must be in [0.01, 20] [Hz]
        """
        if self.kind == "choice":
            if value not in self.choices:
                raise ValueError(f"{self.name}={value!r} must be one of "
                                 f"{', '.join(self.choices)}")
            return value
        if self.kind == "flag":
            if not isinstance(value, bool):
                raise ValueError(f"{self.name}={value!r} must be true or false")
            return value
        if self.kind == "count":        # compared as integers: no rounding near 2^63
            if isinstance(value, bool) or not isinstance(value, int) or not self.contains(value):
                raise ValueError(f"{self.name}={value!r} must be a whole number in "
                                 f"{self.interval()}")
            return value
        arr = check_range(self.name, value, self.low, self.high, low_open=self.low_open,
                          high_open=self.high_open, unit=self.unit)
        if arr.ndim:
            raise ValueError(f"{self.name}={value!r} must be a single number")
        return float(arr)

    def help_text(self) -> str:
        """One line for a spreadsheet function's argument help (<= 255 characters)."""
        what = (self.description or self.label).rstrip(".")
        if self.kind == "choice":
            text = f"{what}: {', '.join(self.choices)} [-]."
        else:
            text = f"{what}, {self.interval()} [{self.unit}]."
        if self.optional:
            text += " Empty: not given."
        elif self.has_default:
            text += f" Empty: {self.default:g}." if isinstance(self.default, float) else \
                f" Empty: {self.default}."
        return text[:255]


def declare(*args: Any, **kwargs: Any) -> Quantity:
    """A :class:`Quantity` (short form for the declaration tables)."""
    return Quantity(*args, **kwargs)


def second_direction(q: Quantity, summary: bool = False) -> Quantity:
    """The direction-2 declaration of a direction-1 result or helper (name ``<name>_2``)."""
    return dataclasses.replace(
        q, name=q.name + "_2", symbol=q.symbol + ",2", label="Direction 2: " + q.label[0].lower()
        + q.label[1:], description="Direction 2: " + (q.description or q.label),
        defined_name="", summary=summary)

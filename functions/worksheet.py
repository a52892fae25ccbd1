# SPDX-License-Identifier: MIT
"""Closed forms written twice: as numpy and as a native worksheet formula, side by side.

A workbook shows every closed form of the design as a native formula over defined names, so a
checking engineer can read and follow it; the engine computes the same closed form with numpy.
:func:`twin` attaches the worksheet formula to the numpy function that the engine calls, in the
place where that function is declared, so the two are read, changed and tested together::

    required_damping = twin("=structural_damping*(acceleration/acceleration_limit)^2",
                            lambda structural_damping, acceleration, acceleration_limit:
                            structural_damping * (acceleration / acceleration_limit) ** 2)

The function's parameters are the defined names its formula reads (checked when the twin is
made). ``tests/test_worksheet.py`` evaluates every formula with the workbook builder's
formula evaluator over the valid range of its inputs and compares it with the numpy result.
Nothing here imports a spreadsheet library.
"""
from __future__ import annotations

import inspect
import re
from dataclasses import dataclass
from typing import Any, Callable

__all__ = ["WorksheetForm", "twin", "formula_names", "form_of", "renamed", "TWIN_TOLERANCE"]

#: Largest relative difference accepted between a worksheet formula, as any spreadsheet
#: application evaluates it, and its numpy twin [-]. The twins agree to about 1e-15 (the
#: regrouped variance forms keep full precision); a spreadsheet's own functions and the
#: reference formulas through helper cells (the AGM fixed point) stay within 1e-12.
TWIN_TOLERANCE = 1e-9

# Strings, numbers (with exponents) and names; a name followed by "(" is a function.
_TOKEN = re.compile(r'"(?:[^"]|"")*"|\'(?:[^\']|\'\')*\'!|[A-Za-z_][A-Za-z0-9_.]*!'
                    r"|\$?[A-Za-z]{1,3}\$?\d+(?![A-Za-z0-9_.(])"
                    r"|\d+(?:\.\d*)?(?:[Ee][+-]?\d+)?|\.\d+(?:[Ee][+-]?\d+)?"
                    r"|[A-Za-z_][A-Za-z0-9_.]*(?:\s*\()?")
_CELL = re.compile(r"^\$?[A-Za-z]{1,3}\$?\d+$")


@dataclass(frozen=True)
class WorksheetForm:
    """The worksheet side of a twin: formula text, the names it reads, how it reads, source."""

    formula: str
    names: tuple[str, ...]
    expression: str = ""
    source: str = ""


def _is_name(token: str) -> bool:
    """True for a token of :data:`_TOKEN` that is a defined name."""
    return not (token.startswith(('"', "$", "'")) or token[0].isdigit() or token[0] == "."
                or token.endswith("!") or token.rstrip().endswith("(")
                or token.upper() in ("TRUE", "FALSE") or _CELL.match(token))


def formula_names(formula: str) -> tuple[str, ...]:
    """Defined names a worksheet formula reads, in order of first use.

    Examples
    --------
    >>> formula_names("=SQRT(structural_damping/effective_damping)*acceleration")
    ('structural_damping', 'effective_damping', 'acceleration')
    >>> formula_names('=IF(stroke<=clearance*(1+1E-9),"OK","NOT OK")')
    ('stroke', 'clearance')
    """
    names: list[str] = []
    for token in _TOKEN.findall(formula):
        # texts, numbers, sheets, cells, worksheet functions and TRUE/FALSE are not names
        if _is_name(token) and token not in names:
            names.append(token)
    return tuple(names)


def twin(formula: str, compute: Callable[..., Any], expression: str = "",
         source: str = "") -> Callable[..., Any]:
    """Attach a worksheet formula to the numpy function that computes the same closed form.

    Parameters
    ----------
    formula : str
        Native worksheet formula, starting with ``=``, over defined names [-].
    compute : callable
        Numpy function whose parameters are exactly the names ``formula`` reads [-].
    expression : str, optional
        The formula as an engineer writes it, e.g. ``zeta_s (a / a_lim)^2`` [-].
    source : str, optional
        Where the closed form comes from [-].

    Returns
    -------
    compute : callable
        The same function, with the attribute ``worksheet`` (:class:`WorksheetForm`) [-].

    Raises
    ------
    TypeError
        When the formula does not start with ``=`` or its names differ from the parameters.

    Examples
    --------
    >>> f = twin("=1/(1+mass_ratio)", lambda mass_ratio: 1.0 / (1.0 + mass_ratio))
    >>> f(0.02), f.worksheet.names
    (0.9803921568627451, ('mass_ratio',))
    """
    if not formula.startswith("="):
        raise TypeError(f"formula={formula!r} must start with '='")
    params = tuple(inspect.signature(compute).parameters)
    names = formula_names(formula)
    if set(params) != set(names):
        raise TypeError(f"formula={formula!r} reads {sorted(names)} but its numpy twin takes "
                        f"{sorted(params)}")
    compute.worksheet = WorksheetForm(formula, params, expression, source)  # type: ignore
    return compute


def renamed(compute: Callable[..., Any], names: dict[str, str], expression: str = "",
            source: str = "") -> Callable[..., Any]:
    """The same closed form over other defined names (e.g. a second sway direction's cells).

    Parameters
    ----------
    compute : callable
        A function; a twin (:func:`twin`) keeps its worksheet formula, renamed too [-].
    names : dict of str to str
        Old defined name -> new one; names not in it stay [-].
    expression : str, optional
        The renamed form as an engineer writes it ('' keeps the twin's) [-].
    source : str, optional
        Where it comes from ('' keeps the twin's) [-].

    Returns
    -------
    compute : callable
        A function of the new names calling ``compute``; a twin when ``compute`` is one [-].

    Raises
    ------
    TypeError
        When a new name clashes with a name the formula keeps.

    Examples
    --------
    >>> f = twin("=1/(1+mass_ratio)", lambda mass_ratio: 1.0 / (1.0 + mass_ratio))
    >>> g = renamed(f, {"mass_ratio": "mass_ratio_2"})
    >>> g.worksheet.formula, g(mass_ratio_2=0.25)
    ('=1/(1+mass_ratio_2)', 0.8)
    """
    old = tuple(inspect.signature(compute).parameters)
    new = tuple(names.get(p, p) for p in old)
    if len(set(new)) != len(new):
        raise TypeError(f"renaming {old} by {names} makes {new}: names clash")
    back = dict(zip(new, old))

    def call(**kwargs: Any) -> Any:
        return compute(**{back[k]: v for k, v in kwargs.items()})
    call.__signature__ = inspect.Signature(  # type: ignore[attr-defined]
        [inspect.Parameter(p, inspect.Parameter.POSITIONAL_OR_KEYWORD) for p in new])
    form = form_of(compute)
    if form is None:
        return call
    formula = _TOKEN.sub(lambda m: names.get(m.group(0), m.group(0))
                         if _is_name(m.group(0)) else m.group(0), form.formula)
    return twin(formula, call, expression or form.expression, source or form.source)


def form_of(compute: Callable[..., Any]) -> WorksheetForm | None:
    """The :class:`WorksheetForm` of a twin, or None for a function without one."""
    return getattr(compute, "worksheet", None)

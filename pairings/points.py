"""Points as exact fractions: read once, added exactly, written by one function per output kind.

Every number of points (the scoring's win, draw and loss, bye and late-entry
points, a round's points, a score, a points-based tiebreak) is a
:class:`fractions.Fraction`. An event may score 1-½-0, 3-1-0, 2-1-0 or any
decimal points the organiser sets (``0.25``, ``2.5``), and a tiebreak may
divide them (a bye's share of a win in Sonneborn-Berger, the mean of AOB): a
fraction keeps all of these exact, where whole half points would not cover
3-1-0 with a quarter-point bye, nor 1/3 of a win. So sums of many rounds never
drift, equal scores stay equal, and no rounding is needed to compare them.

Stored files and the interchange document keep JSON numbers: configured points
are decimals of at most :data:`PLACES` places (``parse_points``), so the float a
JSON reader makes of them prints back as the same decimal, and :func:`exact`
reads it as that decimal exactly.

How points are written, by output kind (the one rule of each):

* printed sheets (terminal text, HTML, PDF): ``points_text(x, "sheet")``, halves
  and quarters as glyphs (``2½``, ``¼``, ``3¾``), anything else with at most two
  decimals (``1.33``);
* the desk, the command line, the log and the settings: ``points_text(x)``, a
  decimal as an organiser types it (``2.5``, ``3``), at most :data:`PLACES` decimals;
* the FIDE report file: ``points_text(x, "report")``, at least one decimal
  (``3.0``, ``2.5``, ``0.25``), as TRF16 writes points;
* data (CSV cells, JSON numbers): :func:`points_number`, a number (``3``,
  ``2.5``), at most :data:`PLACES` decimals.

Result marks in crosstable and grid cells (``1``, ``½``, ``0``, ``+``, ``−``)
are symbols of an outcome, not numbers of points (a 3-1-0 win is marked ``1``):
they read the same in every format.
"""

from __future__ import annotations

from decimal import Decimal, InvalidOperation
from fractions import Fraction
from math import lcm
from typing import Iterable, Literal

Points = Fraction
"""A number of points, exact."""

ZERO = Fraction(0)
PLACES = 6
"""Most decimals a configured number of points may have (and data outputs write)."""

Style = Literal["plain", "sheet", "report"]
_GLYPHS = {Fraction(1, 4): "¼", Fraction(1, 2): "½", Fraction(3, 4): "¾"}


class PointsError(ValueError):
    """A text that is not a number of points."""


def exact(value: Fraction | Decimal | int | float | str) -> Fraction:
    """``value`` as exact points; a float counts as the shortest decimal that prints it
    (``0.1`` is one tenth), which is how a JSON number was written; ``½`` reads as a half.

    Raises :class:`PointsError` for text that is no number, infinities, NaN and anything not a number.
    """
    if isinstance(value, Fraction):
        return value
    if isinstance(value, bool) or not isinstance(value, (Decimal, int, float, str)):
        raise PointsError(f"{value!r} is not a number of points")
    try:
        if isinstance(value, float):
            return Fraction(repr(value))
        if isinstance(value, str):
            return Fraction(Decimal(value.strip().replace("½", ".5")))
        return Fraction(value)
    except (ValueError, OverflowError, InvalidOperation, ArithmeticError):
        raise PointsError(f"{value!r} is not a number of points") from None


def parse_points(text: str) -> Fraction:
    """A number of points typed as a decimal (``2.5``, ``½``, ``3``), at most :data:`PLACES` decimals.

    Raises :class:`PointsError` naming the problem.
    """
    value = exact(text)
    if (value * 10**PLACES).denominator != 1:
        raise PointsError(f"{text.strip()!r} has more than {PLACES} decimals")
    return value


def total(values: Iterable[Fraction]) -> Fraction:
    """The exact sum (0 for none).

    Adds the numerators over the common denominator and reduces once at the end: the same value
    as ``sum(values, ZERO)``, without a new fraction (and its gcd) per term, which standings of a
    large field would otherwise spend most of their time on.
    """
    numerator, denominator = 0, 1
    for value in values:
        n, d = value.numerator, value.denominator
        if denominator % d:
            common = lcm(denominator, d)
            numerator *= common // denominator
            denominator = common
        numerator += n * (denominator // d)
    return Fraction(numerator, denominator)


def points_number(value: Fraction) -> int | float:
    """A number for CSV and JSON: whole values as integers (``3``), others as a decimal of at most
    :data:`PLACES` places (a fraction such as ⅓ of a tiebreak is rounded there, half to even)."""
    if value.denominator == 1:
        return value.numerator
    return float(round(value, PLACES))


def points_text(value: Fraction, style: Style = "plain") -> str:
    """``value`` as text for ``style``: ``plain`` (``2.5``), ``sheet`` (``2½``) or ``report`` (``3.0``);
    see the module notes."""
    places = 2 if style == "sheet" else PLACES
    rounded = round(value, places)
    sign = "−" if style == "sheet" and rounded < 0 else "-" if rounded < 0 else ""
    whole, part = divmod(abs(rounded), 1)
    if style == "sheet" and part in _GLYPHS:
        return f"{sign}{whole or ''}{_GLYPHS[part]}"
    if not part:
        return f"{sign}{whole}.0" if style == "report" else f"{sign}{whole}"
    digits = f"{part.numerator * 10**places // part.denominator:0{places}d}".rstrip("0")
    return f"{sign}{whole}.{digits}"

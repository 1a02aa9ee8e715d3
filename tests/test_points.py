"""Exact points (pairings.points): reading, the one text per output kind, data numbers, storage."""

from __future__ import annotations

import json
import sqlite3
from fractions import Fraction
from pathlib import Path

import pytest

from pairings import events as ev
from pairings.points import PointsError, exact, parse_points, points_number, points_text
from pairings.regulations import change_settings
from pairings.store import EventStore


@pytest.mark.parametrize("value, plain, sheet, report, number", [
    (Fraction(5, 2), "2.5", "2½", "2.5", 2.5),
    (Fraction(3), "3", "3", "3.0", 3),
    (Fraction(0), "0", "0", "0.0", 0),
    (Fraction(1, 2), "0.5", "½", "0.5", 0.5),
    (Fraction(21, 4), "5.25", "5¼", "5.25", 5.25),
    (Fraction(3, 4), "0.75", "¾", "0.75", 0.75),
    (Fraction(-63, 10), "-6.3", "−6.3", "-6.3", -6.3),   # a rating change in a points column
    (Fraction(5, 3), "1.666667", "1.67", "1.666667", 1.666667),   # SB with a third of a win
    (Fraction(7, 8), "0.875", "0.88", "0.875", 0.875),
    # 2.999 printed with two decimals is 3, not "3." (the float formatter's old artefact)
    (Fraction(2999, 1000), "2.999", "3", "2.999", 2.999),
    (Fraction(1675), "1675", "1675", "1675.0", 1675),
])
def test_one_text_per_output_kind(value: Fraction, plain: str, sheet: str, report: str, number: float) -> None:
    assert points_text(value) == plain
    assert points_text(value, "sheet") == sheet
    assert points_text(value, "report") == report
    assert points_number(value) == number
    assert isinstance(points_number(value), int) is (value.denominator == 1)


def test_reading_is_exact() -> None:
    # A JSON number is a float; it reads as the decimal it prints (0.1 is one tenth, not 0.1000000000000000055...).
    assert exact(0.1) == Fraction(1, 10) and exact(1.0) == 1 and exact(3) == 3
    assert exact(Fraction(1, 3)) == Fraction(1, 3)
    assert parse_points(" ½ ") == Fraction(1, 2) and parse_points("2½") == Fraction(5, 2)
    assert parse_points("0.000001") == Fraction(1, 10**6)
    for bad in ("x", "", "1/3", "nan", "inf", "0.0000001"):
        with pytest.raises(PointsError):
            parse_points(bad)
    for bad_value in (float("inf"), None, True, [1]):   # what a hostile JSON document may hold
        with pytest.raises(PointsError):
            exact(bad_value)  # type: ignore[arg-type]


def test_sums_of_tenths_are_exact() -> None:
    # Common practice, no source: ten float tenths add up to 0.9999999999999999; ten exact ones to 1.
    assert sum([0.1] * 10) != 1
    assert sum([exact(0.1)] * 10, Fraction(0)) == 1


def test_the_file_keeps_json_numbers_and_reads_them_back_exactly(tmp_path: Path) -> None:
    path = tmp_path / "e.pairings"
    store = EventStore.create(path, ev.EventCreated(name="Tenths Open", rounds=3))
    store.append(change_settings(store.state, {"scoring": "0.1,0.05,0", "bye_points": "0.1",
                                               "requested_bye_points": "0.05"}))
    store.close()
    payload = sqlite3.connect(path).execute("SELECT payload FROM events WHERE seq = 2").fetchone()[0]
    stored = json.loads(payload)
    assert stored["scoring"] == {"win": 0.1, "draw": 0.05, "loss": 0.0} and stored["bye_points"] == 0.1
    settings = EventStore.open(path).state.settings
    assert (settings.scoring.win, settings.scoring.draw, settings.bye_points) == (
        Fraction(1, 10), Fraction(1, 20), Fraction(1, 10))

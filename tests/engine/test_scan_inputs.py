"""The compiled pair scan checks what its caller hands it and raises ValueError instead of reading astray."""

from __future__ import annotations

from typing import Any

import numpy as np
import pytest

from pairings.engine import scan
from pairings.engine.vector import WIDTH
from pairings.engine.scan import _scan_c  # type: ignore[attr-defined]

pytestmark = pytest.mark.skipif(not scan.available(), reason="the scan kernel is not built")

LEVELS = 2


def _args(**change: Any) -> tuple[Any, ...]:
    """``_scan_c.prepare`` arguments for four players in two score groups, with ``change`` applied.

    Columns of a player row: units, grank, gsize, abs_sd, want, strength, breaks_first,
    breaks_second, down1, up1, down2, up2, miss_first, miss_second (see ``scan.PairScan``); then the
    cost row's width and each criterion's column (``scan.layout``).
    """
    rows = np.zeros((4, 14), dtype=np.int64)
    rows[:, 0] = [2, 2, 0, 0]
    rows[:, 1] = [0, 1, 0, 1]
    rows[:, 2] = 2
    for (i, k), value in change.get("rows", {}).items():
        rows[i, k] = value
    ends = np.array(change.get("ends", [4, 4, 4, 4]), dtype=np.int64)
    rematch = np.array(change.get("rematch", [1, 11]), dtype=np.int64)
    bound = np.array(change.get("bound", [2**40] * (LEVELS + WIDTH - 1)), dtype=np.int64)
    history = bytes(4 * 8)
    layout = scan.layout() if "layout" not in change else np.array(change["layout"], dtype=np.int64).tobytes()
    return (4, rows.tobytes(), ends.tobytes(), 1, history, history, rematch.tobytes(), b"", True, LEVELS,
            bound.tobytes(), change.get("width", WIDTH), layout)


def test_valid_inputs_scan() -> None:
    handle = _scan_c.prepare(*_args())
    count, _, _, free = _scan_c.stats(handle, 1)
    assert count == 6 and free == 4  # every pair of four, two of them rematches


@pytest.mark.parametrize(("change", "says"), [
    ({"ends": [5, 4, 4, 4]}, "partner range"),
    ({"ends": [-1, 4, 4, 4]}, "partner range"),
    ({"rows": {(0, 0): 0}}, "rank order"),                 # scores rise from the first player to the second
    ({"rows": {(1, 1): 0}}, "rank order"),                 # two players share a place in their group
    ({"rows": {(3, 1): 2}}, "outside the group"),
    ({"rows": {(0, 2): 0}}, "outside the group"),
    ({"rows": {(2, 0): 2**40, (3, 0): 2**40, (0, 0): 2**41, (1, 0): 2**41}}, "beyond the scan's range"),
    ({"rows": {(0, 4): 2}}, "side wish"),
    ({"rows": {(0, 5): 9}}, "side wish"),
    ({"rows": {(2, 8): 3}}, "neither 0 nor 1"),
    ({"rows": {(1, 12): 200}}, "missed-preference"),
    ({"rows": {(1, 13): 4}}, "missed-preference"),
    ({"rematch": [11, 1]}, "sorted"),
    ({"rematch": [1, 1]}, "sorted"),
    ({"rematch": [1, 16]}, "outside the field"),
    ({"bound": [2**40] * (LEVELS + WIDTH - 2) + [-1]}, "negative"),
    ({"bound": [2**40] * (LEVELS + WIDTH - 2)}, "bound"),  # one entry short
    ({"width": 17}, "width"),
    ({"width": 3}, "width"),                               # fewer columns than criteria the scan costs
    ({"layout": list(range(8))}, "every criterion"),
    ({"layout": [0, 1, 2, 3, 4, 5, 6, 7, WIDTH]}, "outside the cost row"),
    ({"layout": [0, 1, 2, 3, 4, 5, 6, 7, -1]}, "outside the cost row"),
    ({"layout": [0, 1, 2, 3, 4, 5, 6, 7, 7]}, "share a column"),
])
def test_caller_errors_raise_value_error(change: dict[str, Any], says: str) -> None:
    with pytest.raises(ValueError, match=says):
        _scan_c.prepare(*_args(**change))


def test_too_many_players_or_history_words_are_refused() -> None:
    args = list(_args())
    args[0] = 1 << 20
    with pytest.raises(ValueError):
        _scan_c.prepare(*args)
    args = list(_args())
    args[3] = 1 << 16
    with pytest.raises(ValueError):
        _scan_c.prepare(*args)

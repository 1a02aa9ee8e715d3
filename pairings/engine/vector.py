"""The costs of many pairs at once: :meth:`Field.pair` over numpy arrays.

:class:`Arrays` turns the players of a :class:`~pairings.engine.criteria.Field`
(in rank order) into arrays: score units, rank in score group, side
preference (side, strength, |SD|, the sides H3 forbids), sides played per
round and floats of the two previous rounds. :meth:`Arrays.costs` then costs
index pairs ``i < j`` exactly as :meth:`Field.pair` does (same side
allocation, same tuple), with rematches looked up as sparse exceptions. The
tests compare it with :meth:`Field.pair` pair by pair.
"""

from __future__ import annotations

from typing import Any, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.costs import LAYOUT
from pairings.engine.criteria import (
    ABSOLUTE, FLOAT_REPEAT, FLOAT_REPEAT_2, GAP, MILD, PREF_ABSOLUTE, PREF_MILD, PREF_STRONG, RANK_ORDER, REMATCH,
    SIDE_RULE, STRONG, Field,
)
from pairings.state import Float, PlayerId, Side

IntArray = NDArray[np.int64]
AnyArray = NDArray[Any]
"""Exact integers: int64, or Python integers (dtype object) when they do not fit."""
FIRST, SECOND = 1, -1
WIDTH = LAYOUT.width
"""Length of a cost tuple."""


def _side(s: Side | None) -> int:
    return 0 if s is None else FIRST if s is Side.FIRST else SECOND


class Arrays:
    """Per-player arrays for ``players`` (a rank-ordered subset of the field)."""

    def __init__(self, fld: Field, players: Sequence[PlayerId]) -> None:
        self.fld = fld
        self.players = list(players)
        n = len(players)
        self.n = n
        self.units = np.array([fld.units[p] for p in players], dtype=np.int64)
        self.grank = np.array([fld.group_rank[p] for p in players], dtype=np.int64)
        self.gsize = np.array([fld.group_size[fld.units[p]] for p in players], dtype=np.int64)
        prefs = [fld.pref[p] for p in players]
        self.want = np.array([_side(x.side) for x in prefs], dtype=np.int64)
        self.strength = np.array([x.strength for x in prefs], dtype=np.int64)
        self.abs_sd = np.array([abs(x.sd) for x in prefs], dtype=np.int64)
        exempt = np.array([p in fld.exempt for p in players], dtype=bool)
        self.breaks_first = np.array([Side.FIRST in x.breaks for x in prefs], dtype=bool) & ~exempt
        self.breaks_second = np.array([Side.SECOND in x.breaks for x in prefs], dtype=bool) & ~exempt
        self.forced = np.array([fld.forced(p) for p in players], dtype=np.int64)
        """1 where H3 breaks whatever side the player gets (:meth:`Field.forced`)."""
        self.down1 = np.array([fld.prev_float[p] is Float.DOWN for p in players], dtype=np.int64)
        self.up1 = np.array([fld.prev_float[p] is Float.UP for p in players], dtype=np.int64)
        self.down2 = np.array([fld.prev_float_2[p] is Float.DOWN for p in players], dtype=np.int64)
        self.up2 = np.array([fld.prev_float_2[p] is Float.UP for p in players], dtype=np.int64)
        rounds = max((r for p in players for r in fld.sides_by_round[p]), default=0)
        self.history = np.zeros((rounds + 1, n), dtype=np.int64)  # side played per round, 0: none
        for i, p in enumerate(players):
            for r, s in fld.sides_by_round[p].items():
                self.history[r, i] = _side(s)
        where = {p: i for i, p in enumerate(players)}
        keys = [min(where[p], where[q]) * n + max(where[p], where[q])
                for p in players for q, count in fld.meetings[p].items()
                if q in where and count >= fld.max_meetings and where[p] < where[q]]
        self.rematch_keys = np.unique(np.array(keys, dtype=np.int64))
        bad = [sorted(where[x] for x in pair) for pair in fld._forbidden if all(x in where for x in pair)]
        self.forbidden_keys = np.unique(np.array([a * n + b for a, b in bad if a != b], dtype=np.int64))

    def allowed(self, i: IntArray, j: IntArray) -> NDArray[np.bool_]:
        """Not on the do-not-pair list (H5)."""
        return ~np.isin(i * self.n + j, self.forbidden_keys)

    def first_of(self, i: IntArray, j: IntArray) -> NDArray[np.bool_]:
        """True where ``i`` gets the first side, per :meth:`Field.allocate` (``i`` ranks above ``j``).

        Only pairs where someone has a preference read it (:meth:`costs`).
        """
        a, b = self.want[i], self.want[j]
        first = np.ones(len(i), dtype=bool)  # no preferences: the higher-ranked (lot settled later)
        first = np.where(a != 0, a == FIRST, first)
        first = np.where((a == 0) & (b != 0), b == SECOND, first)
        same = (a != 0) & (a == b)
        # Both want the same side: stronger, then larger |SD|, then alternation, then rank.
        si, sj = self.strength[i], self.strength[j]
        di, dj = self.abs_sd[i], self.abs_sd[j]
        i_wins = np.where(si != sj, si > sj, di > dj)
        open_ = same & (si == sj) & (di == dj)
        undecided = open_.copy()
        for r in range(self.history.shape[0] - 1, 0, -1):
            hi, hj = self.history[r, i], self.history[r, j]
            differ = undecided & (hi * hj == -1)
            i_wins = np.where(differ, hi != a, i_wins)  # whoever had the wanted side gives it up
            undecided &= ~differ
        i_wins = np.where(undecided, True, i_wins)
        first = np.where(same, i_wins == (a == FIRST), first)
        # Before all that: the sides that break H3 for fewer of the two.
        i_first = self.breaks_first[i].astype(np.int64) + self.breaks_second[j]
        j_first = self.breaks_first[j].astype(np.int64) + self.breaks_second[i]
        return np.where(i_first != j_first, i_first < j_first, first)

    def costs(self, i: IntArray, j: IntArray) -> IntArray:
        """Cost tuples (rows, :data:`pairings.costs.LAYOUT` order) of pairs ``i < j``, as :meth:`Field.pair`."""
        fld = self.fld
        out = np.zeros((len(i), WIDTH), dtype=np.int64)
        out[:, REMATCH] = np.isin(i * self.n + j, self.rematch_keys)
        if fld.sides:
            first = self.first_of(i, j)
            open_ = (self.want[i] == 0) & (self.want[j] == 0)
            f, s = np.where(first, i, j), np.where(first, j, i)
            rule = self.breaks_first[f].astype(np.int64) + self.breaks_second[s]
            out[:, SIDE_RULE] = np.where(open_, 0, rule)
            for col, level in ((PREF_ABSOLUTE, ABSOLUTE), (PREF_STRONG, STRONG), (PREF_MILD, MILD)):
                missed = ((self.want[f] == SECOND) & (self.strength[f] == level)).astype(np.int64) \
                    + ((self.want[s] == FIRST) & (self.strength[s] == level))
                out[:, col] = np.where(open_, 0, missed)
        gap = self.units[i] - self.units[j]
        out[:, GAP] = gap
        floating = gap > 0
        out[:, FLOAT_REPEAT] = np.where(floating, self.down1[i] + self.up1[j], 0)
        out[:, FLOAT_REPEAT_2] = np.where(floating, self.down2[i] + self.up2[j], 0)
        across = self.grank[j] + (self.gsize[i] - 1 - self.grank[i])
        inside = np.abs(self.grank[j] - self.grank[i] - self.gsize[i] // 2)
        out[:, RANK_ORDER] = np.where(floating, across, inside)
        return out

"""Points, ranks and tiebreaks after a round: :func:`standings`.

Ranking: points, then the event's tiebreaks in their order; players equal on
all of them share a rank, written ``"3-5"``, and are listed in initial-rank
order. Each tiebreak only separates players still tied at its place in the
list; direct encounter is worked out among exactly those players (FIDE Handbook
C.07, 2023 as remembered).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from types import MappingProxyType
from typing import Mapping, Sequence

from pairings.errors import InputError
from pairings.points import Points, points_number
from pairings.standings.context import build_context
from pairings.standings.tiebreaks import check_tiebreaks, tiebreak
from pairings.state import EventState, PlayerId, RoundState, Status, Unplayed

@dataclass(frozen=True, slots=True)
class StandingsRow:
    rank: int | str
    """A whole number, or ``"3-5"`` for a shared rank."""
    player: PlayerId
    name: str
    points: Points
    tiebreaks: Mapping[str, Points]
    """The event's tiebreaks in order, keyed by their canonical acronyms (``BH-C1``); exact, so equal
    values tie without any rounding."""
    withdrawn: bool = False


@dataclass(frozen=True, slots=True)
class Standings:
    rows: tuple[StandingsRow, ...]
    tiebreaks: tuple[str, ...]
    """Canonical acronyms, in the order applied."""
    unplayed: Unplayed
    after_round: int
    provisional: bool
    """True when a counted round still has games without a result."""

    def to_json(self) -> list[dict[str, object]]:
        """The interchange shape of ``design.md``: one object per row, best first; the tiebreaks
        under their snake_case keys, in the order applied; numbers as :func:`~pairings.points.points_number`
        writes them."""
        keys = [(a, tiebreak(a).key) for a in self.tiebreaks]
        return [
            {
                "rank": row.rank,
                "player": row.player,
                "name": row.name,
                "points": points_number(row.points),
                "tiebreaks": {key: points_number(row.tiebreaks[a]) for a, key in keys},
            }
            for row in self.rows
        ]

    def row_of(self, player: PlayerId) -> StandingsRow:
        for row in self.rows:
            if row.player == player:
                return row
        raise KeyError(player)


def counted_rounds(state: EventState) -> int:
    """The last round that is published or complete (0 when there is none)."""
    return max((r.number for r in state.rounds if r.state is not RoundState.DRAFT), default=0)


def _after_round(state: EventState, after_round: int | None) -> int:
    last = counted_rounds(state)
    if last == 0:
        raise InputError("no standings yet: no round has been published")
    if after_round is None:
        return last
    if not 1 <= after_round <= last:
        raise InputError(f"no standings after round {after_round}: rounds 1 to {last} have been published")
    return after_round


def _shared_ranks(keys: list[tuple[Points, ...]] | list[tuple[int]]) -> list[int | str]:
    """Rank numbers for sorted keys: equal keys share a rank written ``"first-last"``."""
    ranks: list[int | str] = []
    start = 0
    while start < len(keys):
        end = start
        while end + 1 < len(keys) and keys[end + 1] == keys[start]:
            end += 1
        label: int | str = start + 1 if end == start else f"{start + 1}-{end + 1}"
        ranks.extend([label] * (end - start + 1))
        start = end + 1
    return ranks


def standings(
    state: EventState,
    tiebreaks: Sequence[str] | None = None,
    unplayed: Unplayed | None = None,
    after_round: int | None = None,
) -> Standings:
    """Rank the players after ``after_round`` (default: the last published round).

    Parameters
    ----------
    state : the event's state.
    tiebreaks : ordered tiebreak acronyms (or stored snake_case names, see
        :func:`check_tiebreaks`); default the event's own list.
    unplayed : treatment of unplayed rounds; default the event's setting.
    after_round : count rounds ``1 .. after_round``.

    Raises
    ------
    InputError : no round published yet, ``after_round`` out of range, or an
        unknown or repeated tiebreak name.
    """
    names = check_tiebreaks(list(tiebreaks if tiebreaks is not None else state.settings.tiebreaks))
    treatment = unplayed if unplayed is not None else state.settings.unplayed
    last = _after_round(state, after_round)
    ctx = build_context(state, last, treatment)
    order = state.initial_rank()

    keys: dict[PlayerId, list[Points]] = {pid: [ctx.points[pid]] for pid in order}
    shown: dict[PlayerId, list[Points]] = {pid: [] for pid in order}
    for name in names:
        groups: dict[tuple[Points, ...], set[PlayerId]] = {}
        for pid in order:
            groups.setdefault(tuple(keys[pid]), set()).add(pid)
        values, sort_keys = tiebreak(name).evaluate(ctx, [frozenset(g) for g in groups.values()])
        for pid in order:
            keys[pid].append(sort_keys[pid])
            shown[pid].append(values[pid])

    ranked = sorted(order, key=lambda pid: keys[pid], reverse=True)   # stable: equal keys stay in initial rank
    ranks = _shared_ranks([tuple(keys[pid]) for pid in ranked])
    rows = tuple(
        StandingsRow(
            rank=rank,
            player=pid,
            name=state.players[pid].name,
            points=keys[pid][0],
            tiebreaks=MappingProxyType(dict(zip(names, shown[pid]))),
            withdrawn=state.players[pid].status is Status.WITHDRAWN,
        )
        for pid, rank in zip(ranked, ranks)
    )
    provisional = any(
        r.state is RoundState.PUBLISHED for r in state.rounds if r.number <= last
    )
    return Standings(rows=rows, tiebreaks=names, unplayed=treatment, after_round=last, provisional=provisional)


def category_rows(table: Standings, inside: frozenset[PlayerId] | set[PlayerId]) -> tuple[StandingsRow, ...]:
    """The rows of the players ``inside`` a category, ranked among themselves in the same order;
    players who share a rank overall share one here too."""
    picked = [r for r in table.rows if r.player in inside]
    first: dict[str, int] = {}
    for n, row in enumerate(table.rows):
        first.setdefault(str(row.rank), n)
    ranks = _shared_ranks([(first[str(r.rank)],) for r in picked])
    return tuple(replace(r, rank=rank) for r, rank in zip(picked, ranks))

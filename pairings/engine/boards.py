"""The boards of a drafted round: numbers, the lot's sides, costs, flags and the round's byes.

Shared by both Swiss systems' drafts (:mod:`pairings.engine.draft`,
:mod:`pairings.engine.dutch.rounds`) and by :func:`pairings.engine.draft.rebuild`.
"""

from __future__ import annotations

from typing import Iterable, Sequence

from pairings.engine.criteria import GAP, Field
from pairings.engine.types import CRITERIA, ENGINE_VERSION, Draft, DraftBoard, cost_map, total_cost
from pairings.state import Bye, ByeKind, EventState, PlayerId, Side
from pairings.points import ZERO

Pair = tuple[PlayerId, PlayerId]


def _other_byes(state: EventState, round_number: int, players: Iterable[PlayerId],
                absent: Iterable[PlayerId]) -> list[Bye]:
    """Requested byes and absences of the round, then unpaired available players as absences."""
    s = state.settings
    out: list[Bye] = []
    asked = state.requests.get(round_number, {})
    for pid in state.initial_rank():
        kind = asked.get(pid)
        if kind is not None:
            out.append(Bye(pid, kind, s.requested_bye_points if kind is ByeKind.REQUESTED else ZERO))
    for pid in absent:
        if pid not in asked:
            out.append(Bye(pid, ByeKind.ABSENCE, ZERO))
    return out


def assemble(state: EventState, fld: Field, pairs: Sequence[tuple[Pair | None, Pair]],
             bye: PlayerId | None, *, pinned: Iterable[Pair] = (), changed: Iterable[Pair] = (),
             absent: Iterable[PlayerId] = ()) -> Draft:
    """Number the boards, settle open sides by the lot and compute costs and flags.

    ``pairs`` holds ``(sides or None, pair)``: sides None means neither player
    has a preference and the round's lot decides (docs/engine.md: the lot gives board
    1's higher-ranked player a side; boards alternate).
    """
    pinned_set = {frozenset(p) for p in pinned}
    changed_set = {frozenset(p) for p in changed}
    ordered = sorted(pairs, key=lambda x: (-max(fld.units[p] for p in x[1]), min(fld.index[p] for p in x[1])))
    boards: list[DraftBoard] = []
    costs = []
    gaps: list[int] = []
    for number, (sides, (p, q)) in enumerate(ordered, 1):
        if sides is None:
            hi, lo = (p, q) if fld.index[p] < fld.index[q] else (q, p)
            side = fld.lot if number % 2 else fld.lot.other
            sides = (hi, lo) if side is Side.FIRST else (lo, hi)
        _, cost = fld.pair(sides[0], sides[1], sides)
        flags = fld.flags(p, q, cost)
        key = frozenset((p, q))
        if key in pinned_set:
            flags += ("pinned",)
        if key in changed_set:
            flags += ("changed",)
        boards.append(DraftBoard(number, sides[0], sides[1], cost_map(cost), flags))
        costs.append(cost_map(cost))
        gaps.append(cost[GAP])
    byes: list[Bye] = []
    bye_cost = cost_map((0,) * len(CRITERIA))
    if bye is not None:
        bye_cost = cost_map(fld.bye(bye))
        gaps.append(bye_cost["score_gap"])
        byes.append(Bye(bye, ByeKind.PAIRING, state.settings.bye_points))
    byes += _other_byes(state, fld.round, fld.order, absent)
    return Draft(
        round=fld.round, boards=tuple(boards), byes=tuple(byes), cost=total_cost(costs + [bye_cost]),
        engine_version=ENGINE_VERSION, gaps=tuple(sorted(gaps, reverse=True)), bye_cost=bye_cost,
        unit=float(fld.unit),
    )

"""Draft a round: candidate graph, matching, sides and board numbers.

:func:`draft_round` pairs the next round of a Swiss event by one
maximum-weight maximum-cardinality matching (weights from
:mod:`pairings.engine.weights`), or reads a round robin's pairs from the Berger
tables. :func:`rebuild` evaluates an organiser-made pairing with the same
costs and flags; :func:`swap` exchanges two players and rebuilds.

Decisions where the rules are silent (also in docs/engine.md):

- H5 (do-not-pair) is never relaxed; H1, H2 and H3 are relaxed only at a cost
  that outweighs every soft criterion, and flagged. A round made only of
  rematches (everyone has met everyone) is refused.
- :func:`rebuild` allocates sides per the rules for every pair, except pairs
  pinned in ``base``, which keep their given sides.
"""

from __future__ import annotations

from typing import Iterable, Sequence

from pairings.engine import berger, route
from pairings.engine.boards import Pair, assemble
from pairings.engine.criteria import Field
from pairings.engine.types import Draft, DraftBoard, Overrides
from pairings.errors import NoPairingError
from pairings.state import Bye, ByeKind, EventState, PlayerId, System


def _field_players(state: EventState, round_number: int, absent: Iterable[PlayerId]) -> list[PlayerId]:
    gone = set(absent)
    return [p for p in state.available(round_number) if p not in gone]


def _check_overrides(state: EventState, round_number: int, players: list[PlayerId], ov: Overrides) -> None:
    here = set(players)
    seen: set[PlayerId] = set()
    for a, b in ov.pinned:
        for pid in (a, b):
            if pid not in state.players:
                raise NoPairingError(f"pinned pair {a}-{b}: no player {pid!r} in this event")
            if pid not in here:
                raise NoPairingError(
                    f"pinned pair {a}-{b}: {state.players[pid].name} is not available in round "
                    f"{round_number} (withdrawn, absent or on a requested bye)"
                )
            if pid in seen or pid == ov.bye:
                raise NoPairingError(f"pinned pair {a}-{b}: {state.players[pid].name} is pinned twice")
            seen.add(pid)
        if a == b:
            raise NoPairingError(f"pinned pair {a}-{b}: a player cannot meet themself")
    if ov.bye is not None and ov.bye not in here:
        raise NoPairingError(f"the forced bye player {ov.bye!r} is not available in round {round_number}")


def draft_round(state: EventState, overrides: Overrides = Overrides(), *, reference: bool = False) -> Draft:
    """Draft round ``state.next_round_number`` (a DRAFT last round is re-drafted).

    ``reference`` solves the full candidate graph with networkx instead of the
    engine's pruned graph and fastest solver (same optimum; for checks).

    Raises
    ------
    NoPairingError
        Too few players, a pin or forced bye naming an unavailable player, or a
        field that cannot be paired within the hard rules that are never relaxed.
    """
    rnd = state.next_round_number
    players = _field_players(state, rnd, overrides.absent)
    if len(players) < 2:
        raise NoPairingError(
            f"round {rnd}: {len(players)} player(s) to pair; at least two are needed "
            "(all others are withdrawn, absent or on a requested bye)"
        )
    _check_overrides(state, rnd, players, overrides)
    if state.settings.system is System.DUTCH:
        from pairings.engine.dutch import draft_dutch  # the FIDE (Dutch) System, C.04.3

        return draft_dutch(state, overrides)
    fld = Field(state, rnd, players, overrides.forbidden)
    if state.settings.system is System.ROUND_ROBIN:
        return _round_robin(state, fld, overrides)
    pinned = [(fld.pair(a, b, (a, b))[0], (a, b)) for a, b in overrides.pinned]
    placed = {p for _, pair in pinned for p in pair}
    free = [p for p in fld.order if p not in placed and p != overrides.bye]
    if overrides.bye is not None and len(free) % 2:
        raise NoPairingError(
            f"round {rnd}: forcing {state.players[overrides.bye].name} onto the bye leaves "
            f"an odd number of players ({len(free)}) for the boards"
        )
    pairs, bye = route.optimal_pairs(fld, free, overrides.no_bye, reference)
    bye = overrides.bye if overrides.bye is not None else bye
    return assemble(state, fld, pinned + pairs, bye, pinned=overrides.pinned, absent=overrides.absent)


def _round_robin(state: EventState, fld: Field, ov: Overrides) -> Draft:
    """Round r of the Berger tables (FIDE C.05 Annex 1); seats in initial-rank order.

    A player whose table opponent is the dummy seat or is not available this
    round gets the pairing bye.
    """
    s = state.settings
    seats = state.initial_rank()
    here = set(fld.order)
    pairs: list[tuple[Pair | None, Pair]] = []
    byes: list[PlayerId] = []
    for a, b in berger.berger_pairs(len(seats), fld.round, s.double_round):
        first = seats[a - 1]
        second = seats[b - 1] if b is not None else None
        if first in here and second in here and second is not None:
            pairs.append(((first, second), (first, second)))
        else:
            byes += [p for p in (first, second) if p is not None and p in here]
    draft = assemble(state, fld, pairs, byes[0] if byes else None, absent=ov.absent)
    extra = tuple(Bye(p, ByeKind.PAIRING, s.bye_points) for p in byes[1:])
    return Draft(draft.round, draft.boards, draft.byes[:1] + extra + draft.byes[1:], draft.cost,
                 draft.engine_version, draft.gaps, draft.bye_cost, draft.unit)


def rebuild(state: EventState, round: int, pairs: Sequence[Pair], bye: PlayerId | None,
            *, base: Draft | None = None) -> Draft:
    """Evaluate an organiser-made pairing of ``round`` with the engine's costs and flags.

    Sides are allocated per the rules (pairs pinned in ``base`` keep their
    sides); boards not in ``base`` are flagged ``changed``. Available players
    left out of ``pairs`` are listed as absences.
    """
    paired = [p for pair in pairs for p in pair] + ([bye] if bye is not None else [])
    if len(set(paired)) != len(paired):
        raise NoPairingError(f"round {round}: a player appears on two boards (or on a board and the bye)")
    available = set(state.available(round))
    for pid in paired:
        if pid not in available:
            name = state.players[pid].name if pid in state.players else repr(pid)
            raise NoPairingError(f"round {round}: {name} is not available to pair")
    fld = Field(state, round, paired)
    kept = {frozenset((b.first, b.second)): (b.first, b.second) for b in base.boards if "pinned" in b.flags} \
        if base is not None else {}
    base_pairs = {frozenset((b.first, b.second)) for b in base.boards} if base is not None else None
    sided = [(kept.get(frozenset(p)) or fld.allocate(*p), p) for p in pairs]
    changed = [p for p in pairs if base_pairs is not None and frozenset(p) not in base_pairs]
    taken = set(paired)
    absent = [p for p in state.available(round) if p not in taken]
    if state.settings.system is System.DUTCH:
        from pairings.engine.dutch.rounds import rebuild_dutch  # Dutch colours and board order

        return rebuild_dutch(state, round, pairs, bye, kept, changed, absent)
    return assemble(state, fld, sided, bye, pinned=list(kept.values()), changed=changed, absent=absent)


def _named(state: EventState, pid: PlayerId) -> str:
    """A player's name for a message (the id when the player is unknown)."""
    player = state.players.get(pid)
    return player.name if player is not None else repr(pid)


def swap(state: EventState, draft: Draft, a: PlayerId, b: PlayerId) -> Draft:
    """Exchange ``a`` and ``b`` between their boards (or with the pairing bye) and rebuild."""
    bye = draft.pairing_bye
    where = {}
    for pid in (a, b):
        board = draft.board_of(pid)
        if board is None and pid != bye:
            raise NoPairingError(f"{_named(state, pid)} is neither on a board nor on the pairing bye of "
                                 f"round {draft.round}")
        where[pid] = board
    if where[a] is not None and where[a] is where[b]:
        raise NoPairingError(f"{_named(state, a)} and {_named(state, b)} already play each other: nothing to swap")

    def moved(pid: PlayerId) -> PlayerId:
        return b if pid == a else a if pid == b else pid

    pairs = [(moved(x.first), moved(x.second)) for x in draft.boards]
    new_bye = moved(bye) if bye is not None else None
    drawn = {frozenset((x.first, x.second)) for x in draft.boards if "changed" not in x.flags}
    base = Draft(draft.round, tuple(x for x in draft.boards if frozenset((x.first, x.second)) in drawn),
                 draft.byes, draft.cost, draft.engine_version)
    return rebuild(state, draft.round, pairs, new_bye, base=base)

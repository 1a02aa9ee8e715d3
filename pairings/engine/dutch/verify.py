"""`pairings verify` for a Dutch round: absolute criteria, completion, and the first best candidate.

Checked against the history before the round (the state cut back by
:func:`pairings.engine.verify.state_before`):

- C.1 no rematch (a forfeited pairing counts when the event says so) and the
  do-not-pair list; C.3 no two non-topscorers with the same absolute colour
  preference on one board; C.2 the PAB only to an eligible player (C.04.1
  2025 rule 4); colours: each board's sides as the allocation rules give them
  (C.04.3 colour rules, from memory);
- completion: the round pairs as many players as the absolute criteria allow
  (Berge: a maximum matching of the allowed graph, the PAB as an edge to a bye
  vertex, has as many edges as the round's boards plus its PAB);
- for a round the engine drafted: the Dutch system, run again under the pins
  and absences the round shows, makes the same pairs and the same PAB, i.e.
  the stored round is the first best candidate of every bracket, along the
  same route (a PPB paired again so that the rest can be paired, the rest as
  the CLB; see :mod:`.rounds`).
"""

from __future__ import annotations

from types import MappingProxyType

from pairings.engine.dutch.colours import allocate
from pairings.engine.dutch.entrants import Entrants
from pairings.engine.dutch.rounds import draft_dutch
from pairings.engine.explain import _overrides_of
from pairings.engine.solver import maximum_cardinality
from pairings.engine.types import Draft
from pairings.engine.roundcheck import RoundCheck, stored_boards
from pairings.errors import NoPairingError
from pairings.state import ByeKind, EventState, PlayerId



def check_round(state: EventState, before: EventState, rnd: int) -> RoundCheck:
    """The Dutch system's verdict on stored round ``rnd`` (``before``: the state when it was drafted)."""
    stored = state.round(rnd)
    assert stored is not None
    bye = next((y.player for y in stored.byes if y.kind is ByeKind.PAIRING), None)
    players = [p for g in stored.games for p in (g.first, g.second)] + ([bye] if bye else [])
    ent = Entrants(before, rnd, players)
    breaches: list[str] = []
    pinned = {frozenset((g.first, g.second)) for g in stored.games if "pinned" in g.flags}
    for g in stored.games:
        if g.second in ent.met[g.first]:
            breaches.append(f"C.1: board {g.board}: {g.first} and {g.second} have met before")
        elif frozenset((g.first, g.second)) in ent.forbidden:
            breaches.append(f"C.1: board {g.board} pairs {g.first} and {g.second}, on the do-not-pair list")
        elif not ent.compatible(g.first, g.second):
            breaches.append(f"C.3: board {g.board}: {g.first} and {g.second} both must have the same colour")
        elif ent.colours and frozenset((g.first, g.second)) not in pinned:
            c = allocate(ent, g.first, g.second)
            if (c.first, c.second) != (g.first, g.second):
                breaches.append(f"colours: board {g.board}: rule {c.rule} gives the first side to {c.first}")
    if bye is not None and bye not in ent.pab_eligible:
        breaches.append(f"C.2: {bye} gets the PAB but already had one or a win's points without playing")
    notes: list[str] = []
    legal = sum(1 for g in stored.games if ent.compatible(g.first, g.second))
    certified = _complete(ent, legal + (1 if bye is not None and bye in ent.pab_eligible else 0), notes)
    optimal = None
    if stored.source == "engine":
        optimal = _first_best(state, before, rnd, notes)
    return RoundCheck(rnd, tuple(breaches), tuple(notes), optimal, certified)


def _complete(ent: Entrants, made: int, notes: list[str]) -> bool:
    players = list(ent.order)
    n = len(players)
    edges = [(i, j) for i in range(n) for j in range(i + 1, n) if ent.compatible(players[i], players[j])]
    if n % 2:
        edges += [(i, n) for i, p in enumerate(players) if p in ent.pab_eligible]
    best = maximum_cardinality(n + 1, edges)
    if made >= best:
        notes.append(f"completion (Berge): {best} boards and PAB are the most the absolute criteria allow")
        return True
    notes.append(f"completion: {best} legal boards and PAB were possible")
    return False


def _first_best(state: EventState, before: EventState, rnd: int, notes: list[str]) -> bool:
    stored = state.round(rnd)
    assert stored is not None
    shown = Draft(rnd, stored_boards(stored), stored.byes, MappingProxyType({}), "")
    try:
        again = draft_dutch(before, _overrides_of(before, shown))
    except NoPairingError as e:
        notes.append(f"Dutch system: {e}")
        return False
    mine = {frozenset((g.first, g.second)) for g in stored.games}
    theirs = {frozenset((b.first, b.second)) for b in again.boards}
    bye: PlayerId | None = next((y.player for y in stored.byes if y.kind is ByeKind.PAIRING), None)
    if mine == theirs and bye == again.pairing_bye:
        notes.append("Dutch system run again: same pairs and PAB, the first best candidate in every bracket")
        return True
    extra = sorted("-".join(sorted(p)) for p in mine - theirs)
    notes.append(f"Dutch system run again pairs differently: stored pairs not chosen: {', '.join(extra) or '-'}; "
                 f"PAB {bye or '-'} against {again.pairing_bye or '-'}")
    return False

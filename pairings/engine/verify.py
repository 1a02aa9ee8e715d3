"""Re-check a stored round: hard-rule breaches, the optimum, and Berge's certificate.

Notes
-----
Each round is checked against the history *before* it (the state is cut back
to the earlier rounds), so later rounds never change the verdict.

- H1-H5 are checked board by board on the stored pairs and sides.
- For a round the engine drafted (``source == "engine"``), the stored pairing
  is proved optimal under the pins and absences the round shows by a dual
  certificate (:mod:`pairings.engine.proof`: feasibility and complementary
  slackness checked independently of the solver that produced the dual).
  Below ``DEEP_BELOW`` players, on request (``deep``), or when no certificate
  is reached, the optimum is also recomputed with the reference solver
  (networkx on the full candidate graph), and its cost vector must equal the
  stored pairing's recomputed cost vector.
- Berge's theorem (a matching is maximum if and only if no augmenting path
  exists) certifies that the round pairs as many players as the *allowed*
  graph (edges breaking none of H1, H2, H3, H5) permits: a maximum matching of
  that graph is computed independently; when its size equals the number of the
  round's legal boards (the pairing bye counted as an edge to a bye vertex),
  no augmenting path exists, so no pairing with more legal boards exists.
  When every player to pair is on a legal board or the legal bye, the round
  is a perfect matching of the allowed graph, which no matching exceeds, and
  nothing is computed.
"""

from __future__ import annotations

from dataclasses import replace
from types import MappingProxyType
from typing import Callable

from pairings.engine import proof
from pairings.engine.criteria import REMATCH, REPEAT_BYE, SIDE_RULE, Field
from pairings.engine.draft import draft_round, rebuild
from pairings.engine.explain import _overrides_of, compare
from pairings.engine.roundcheck import RoundCheck, stored_boards
from pairings.engine.types import Draft, Overrides
from pairings.errors import InputError, NoPairingError
from pairings.state import ByeKind, EventState, PlayerId, Round, System

DEEP_BELOW = 300
"""Fields smaller than this are also re-solved with networkx on the full graph (a few seconds at most)."""


def state_before(state: EventState, round_number: int) -> EventState:
    """The state as it was when ``round_number`` was drafted (earlier rounds only)."""
    records = {
        pid: replace(rec, entries=tuple(e for e in rec.entries if e.round < round_number),
                     score=rec.score_before(round_number))  # keeps the late-entry points
        for pid, rec in state.records.items()
    }
    return replace(state, rounds=state.rounds[:round_number - 1], records=MappingProxyType(records))


def verify_round(state: EventState, round_number: int, deep: bool = False) -> RoundCheck:
    """H1-H5 breaches of stored round ``round_number``; for engine rounds, the optimum too.

    ``deep`` also re-solves the round with networkx on the full graph, whatever its size.
    """
    stored = state.round(round_number)
    if stored is None:
        raise InputError(f"there is no round {round_number} to verify")
    before = state_before(state, round_number)
    breaches, fld = _breaches(before, stored, lambda pid: state.players[pid].name if pid in state.players else pid)
    if fld is None:
        return RoundCheck(round_number, breaches, (), None, False)
    if before.settings.system is System.DUTCH:
        from pairings.engine.dutch.verify import check_round  # the Dutch criteria, C.04.3

        return check_round(state, before, round_number)
    pairs = [(g.first, g.second) for g in stored.games]
    pairing_bye = next((y.player for y in stored.byes if y.kind is ByeKind.PAIRING), None)
    notes: list[str] = []
    certified = _berge(fld, pairs, pairing_bye, notes)
    optimal = None
    if stored.source == "engine":
        optimal = _optimum_confirmed(state, before, round_number, notes, deep)
    elif stored.source == "override":
        notes.append("optimum not checked: the organiser changed this round (" + "; ".join(stored.notes)
                     + "); the engine's optimum is compared only for rounds it drafted")
    else:
        notes.append(f"optimum not checked: the round is {stored.source}, not drafted by the engine")
    return RoundCheck(round_number, breaches, tuple(notes), optimal, certified)


def hard_breaches(state: EventState, round_number: int,
                  name: Callable[[PlayerId], str] = str) -> tuple[str, ...]:
    """The H1-H5 breaches of round ``round_number`` (also a draft) against the history before it."""
    stored = state.round(round_number)
    if stored is None:
        raise InputError(f"there is no round {round_number} to check")
    return _breaches(state_before(state, round_number), stored, name)[0]


def _breaches(before: EventState, stored: Round, name: Callable[[PlayerId], str]
              ) -> tuple[tuple[str, ...], Field | None]:
    """H4 first (the field is None when it fails, as nothing else can be checked); then H5, H1, H3, H2."""
    round_number = stored.number
    pairs = [(g.first, g.second) for g in stored.games]
    pairing_bye = next((y.player for y in stored.byes if y.kind is ByeKind.PAIRING), None)
    breaches: list[str] = []
    available = set(before.available(round_number))
    seen: set[PlayerId] = set()
    for pid in [p for pair in pairs for p in pair] + ([pairing_bye] if pairing_bye else []):
        if pid not in available:
            breaches.append(f"H4: {name(pid)} is paired but not available in round {round_number}")
        if pid in seen:
            breaches.append(f"H4: {name(pid)} is paired twice")
        seen.add(pid)
    if breaches:
        return tuple(breaches), None
    fld = Field(before, round_number, list(seen))
    for g in stored.games:
        cost = fld.pair(g.first, g.second, (g.first, g.second))[1]
        a, b = name(g.first), name(g.second)
        if fld.forbidden(g.first, g.second):
            breaches.append(f"H5: board {g.board} pairs {a} and {b}, on the do-not-pair list")
        if cost[REMATCH]:
            breaches.append(f"H1: board {g.board}: {a} and {b} have met before")
        if cost[SIDE_RULE]:
            breaches.append(f"H3: board {g.board}: a side rule is broken ({a} - {b})")
    if pairing_bye is not None and fld.bye(pairing_bye)[REPEAT_BYE]:
        breaches.append(f"H2: {name(pairing_bye)} gets a second pairing bye or one after an unplayed point")
    return tuple(breaches), fld


def _berge(fld: Field, pairs: list[tuple[PlayerId, PlayerId]], bye: PlayerId | None,
           notes: list[str]) -> bool:
    players = list(fld.order)
    bye_vertex = len(players)

    def legal(a: PlayerId, b: PlayerId) -> bool:
        cost = fld.pair(a, b)[1]
        return not fld.forbidden(a, b) and not cost[REMATCH] and not cost[SIDE_RULE]

    boards = sum(1 for a, b in pairs if legal(a, b))
    legal_bye = bye is not None and not fld.bye(bye)[REPEAT_BYE]
    mine = boards + (1 if legal_bye else 0)
    made = f"{boards} legal board{'s' if boards != 1 else ''}" + (" and a legal pairing bye" if legal_bye else "")
    if 2 * mine == len(players) + len(players) % 2:
        notes.append(f"Berge certificate: {made} pair every player, a perfect matching of the allowed "
                     "graph, so no augmenting path exists and no pairing has more legal boards")
        return True
    from pairings.engine.solver import maximum_cardinality  # networkx or rustworkx: only when needed

    allowed = [(i, j) for i in range(len(players)) for j in range(i + 1, len(players))
               if legal(players[i], players[j])]
    if len(players) % 2:
        allowed += [(i, bye_vertex) for i, p in enumerate(players) if not fld.bye(p)[REPEAT_BYE]]
    best = maximum_cardinality(len(players) + 1, allowed)
    if mine == best:
        notes.append(f"Berge certificate: {made}, and no augmenting path exists in the "
                     "allowed graph, so no pairing has more legal boards")
        return True
    notes.append(f"Berge: an augmenting path exists: {best} legal boards and byes were possible, {made} made")
    return False


def _optimum_confirmed(state: EventState, before: EventState, rnd: int, notes: list[str],
                       deep: bool = False) -> bool:
    """The dual certificate's verdict, and networkx's when it runs (small fields, ``deep``, no certificate)."""
    stored = state.round(rnd)
    assert stored is not None
    drafted = Draft(rnd, stored_boards(stored), stored.byes, MappingProxyType({}), "")
    ov = _overrides_of(before, drafted)
    pairs = [(b.first, b.second) for b in drafted.boards]
    bye = next((y.player for y in stored.byes if y.kind is ByeKind.PAIRING), None)
    mine = rebuild(before, rnd, pairs, bye, base=drafted)
    proved: bool | None = None
    if before.settings.system is not System.ROUND_ROBIN:
        proved, size = _certificate(before, rnd, drafted, ov, bye, mine, notes)
        if proved is not None and not deep and size >= DEEP_BELOW:
            return proved
    try:
        if before.settings.system is System.ROUND_ROBIN:
            best = draft_round(before, Overrides(absent=ov.absent))
        else:
            best = draft_round(before, ov, reference=True)
    except NoPairingError as e:
        notes.append(f"reference solver: {e}")
        return False
    delta = compare(best, mine)
    if mine.key() == best.key():
        notes.append("reference solver (networkx, full graph) confirms the cost: optimal")
        found = True
    else:
        notes.append(f"reference solver finds a cheaper pairing: stored round is {delta.describe()}")
        found = False
    if proved is not None and proved != found:
        notes.append("the dual certificate and the reference solver disagree: please report this event")
    return found


def _certificate(before: EventState, rnd: int, drafted: Draft, ov: Overrides, bye: PlayerId | None,
                 mine: Draft, notes: list[str]) -> tuple[bool | None, int]:
    """The dual certificate's verdict on the stored pairing (None: not reached) and the field's size."""
    fld = Field(before, rnd, [p for p in before.available(rnd) if p not in ov.absent])
    placed = {p for pair in ov.pinned for p in pair}
    free = [p for p in fld.order if p not in placed]
    loose = [(b.first, b.second) for b in drafted.boards if frozenset((b.first, b.second)) not in
             {frozenset(p) for p in ov.pinned}]
    matched = proof.index_pairs(free, loose, bye)
    if matched is None:
        notes.append("dual certificate: not made (the stored boards do not pair the round's players once each)")
        return None, len(fld.order)
    found = proof.prove(fld, free, (), matched)
    if found is None:
        notes.append("dual certificate: not reached (values beyond the kernels' range); re-solved instead")
        return None, len(fld.order)
    where = f"the {found.pairs:,} pairs and byes a pairing as good could use (checked by the {found.checker})"
    if found.optimal:
        notes.append(f"dual certificate: feasible on {where}; complementary slackness holds on every "
                     "board: optimal")
        return True, len(fld.order)
    best_pairs = list(ov.pinned) + [(free[i], free[j]) for i, j in found.best if j < len(free)]
    best_bye = next((free[i] for i, j in found.best if j == len(free)), None)
    best = rebuild(before, rnd, best_pairs, best_bye, base=drafted)
    notes.append(f"dual certificate ({where}) proves a cheaper pairing: stored round is "
                 f"{compare(best, mine).describe()}")
    return False, len(fld.order)

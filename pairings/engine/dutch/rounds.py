"""A whole Dutch round: brackets from the top score group down, colours, boards (C.04.3).

:func:`plan` pairs the brackets in order (Art. 1.3.2: a bracket is one score
group's residents plus the players the bracket above left unpaired); the last
bracket's floater, if any, is the pairing-allocated bye (C.04.1 rule 3,
eligibility rule 4: it falls out of the lowest bracket's processing).
Completion (C.4, the PPB/CLB route as remembered from the 2017 text, which
the 2025 edition keeps in renumbered articles): each bracket is paired
normally (C.7 included); when its floaters and every player below cannot be
paired any more, that bracket is the penultimate pairing bracket (PPB), paired
again with its floaters chosen so that the rest can be (C.4 absolute, C.7 not
applied: it looks "just at the following bracket", which is now the last),
and the rest, the PPB's floaters as its MDPs, is paired as the collapsed last
bracket (CLB). Pairing the PPB again always succeeds: the bracket above left
a rest that can be paired, and that pairing restricted to the PPB is one of
its candidates (two of its MDPs paired with each other there both float into
the CLB, which is paired as one group if it must).
:func:`draft_dutch` turns the plan into a :class:`~pairings.engine.types.Draft`:
colours by :mod:`.colours`, boards in the order of C.04.2 (from memory): the
higher pairing score of the pair, then the pair's sum, then the rank (Art.
1.2) of its higher player; the PAB is listed after the boards.

Organiser overrides: pinned pairs keep their boards and sides and are taken
out before the system pairs the rest; a forced bye player is taken out too;
``no_bye`` players are not PAB-eligible; extra do-not-pair pairs count as
absolute (C.1-like).
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Iterable, Mapping, Sequence

from pairings.engine.criteria import Field
from pairings.engine.boards import assemble
from pairings.engine.dutch.bracket import BracketSolver, completable
from pairings.engine.dutch.colours import Colours, allocate, breaks, missed
from pairings.engine.dutch.criteria import Bracket, Costs
from pairings.engine.dutch.entrants import Entrants
from pairings.engine.types import Draft, DraftBoard, Overrides
from pairings.errors import NoPairingError
from pairings.state import EventState, Float, PlayerId

Pair = tuple[PlayerId, PlayerId]


@dataclass(frozen=True)
class Paired:
    """One bracket as paired: the bracket, its pairs and its floaters."""

    bracket: Bracket
    pairs: tuple[Pair, ...]
    floaters: tuple[PlayerId, ...]


@dataclass(frozen=True)
class Plan:
    """A Dutch round before boards are numbered."""

    entrants: Entrants
    brackets: tuple[Paired, ...]
    bye: PlayerId | None

    def colours(self) -> list[Colours]:
        return [allocate(self.entrants, a, b) for p in self.brackets for a, b in p.pairs]


def players_of(state: EventState, ov: Overrides) -> list[PlayerId]:
    """The players the system pairs: available, not absent, not pinned, not on a forced bye."""
    gone = set(ov.absent) | {x for pair in ov.pinned for x in pair}
    if ov.bye is not None:
        gone.add(ov.bye)
    return [p for p in state.available(state.next_round_number) if p not in gone]


def bracket_of(ent: Entrants, groups: list[list[PlayerId]], top: int, carried: list[PlayerId]) -> Bracket:
    """The bracket of score group ``top`` with the players ``carried`` down from above."""
    members = tuple(sorted(carried + groups[top], key=ent.rank.__getitem__))
    lower = tuple(p for g in groups[top + 1:] for p in g)
    nxt = tuple(groups[top + 1]) if top + 1 < len(groups) else ()
    return Bracket(members, frozenset(carried), ent.score[groups[top][0]], nxt, lower)


def plan(state: EventState, ov: Overrides = Overrides()) -> Plan:
    """Pair round ``state.next_round_number`` by the Dutch system (see the module notes)."""
    ent = Entrants(state, state.next_round_number, players_of(state, ov), ov.forbidden, ov.no_bye)
    if not completable(ent, list(ent.order)):
        raise NoPairingError(
            f"round {ent.round}: no pairing meets the Dutch system's absolute criteria (no rematch, "
            "no two players with the same absolute colour, one PAB to an eligible player)"
        )
    groups = ent.groups()
    if not groups:
        return Plan(ent, (), None)
    cache: dict[object, Costs] = {}
    done: list[Paired] = []
    carried: list[PlayerId] = []
    for top in range(len(groups) - 1):
        br = bracket_of(ent, groups, top, carried)
        found = BracketSolver(ent, br, cache).run()
        assert found is not None, "only the last bracket can lack a candidate"
        if not completable(ent, found[1] + list(br.lower)):
            # C.4: this bracket is the PPB; everyone below collapses into the CLB
            ppb = br.penultimate()
            again = BracketSolver(ent, ppb, cache).run()
            assert again is not None, "the bracket above left a rest that can be paired"
            done.append(Paired(ppb, tuple(again[0]), tuple(again[1])))
            return _finish(ent, done, collapsed_last(ent, ppb, again[1]), cache)
        done.append(Paired(br, tuple(found[0]), tuple(found[1])))
        carried = found[1]
    return _finish(ent, done, bracket_of(ent, groups, len(groups) - 1, carried), cache)


def collapsed_last(ent: Entrants, ppb: Bracket, floaters: Sequence[PlayerId]) -> Bracket:
    """The CLB: the PPB's floaters (its MDPs) and every player below the PPB, paired as one last bracket."""
    members = tuple(sorted([*floaters, *ppb.lower], key=ent.rank.__getitem__))
    return Bracket(members, frozenset(floaters), min(ent.score[p] for p in ppb.lower), (), ())


def _finish(ent: Entrants, done: list[Paired], last: Bracket, cache: dict[object, Costs]) -> Plan:
    """Pair the last bracket (as one group if its MDPs could only be paired with each other) and close the plan."""
    found = BracketSolver(ent, last, cache).run()
    if found is None and last.heterogeneous:
        last = replace(last, collapsed=True)
        found = BracketSolver(ent, last, cache).run()
    assert found is not None, "the bracket above left a rest that can be paired"
    pairs, floaters = found
    assert len(floaters) <= 1
    done.append(Paired(last, tuple(pairs), tuple(floaters)))
    return Plan(ent, tuple(done), floaters[0] if floaters else None)


def draft_dutch(state: EventState, ov: Overrides = Overrides()) -> Draft:
    """Draft the next round by the FIDE (Dutch) System (C.04.3; editions in docs/engine.md)."""
    result = plan(state, ov)
    sided = list(ov.pinned) + [(c.first, c.second) for c in result.colours()]
    bye = ov.bye if ov.bye is not None else result.bye
    ent = result.entrants if not ov.pinned and ov.bye is None else None
    return boards(state, state.next_round_number, sided, bye, ent, pinned=ov.pinned, absent=ov.absent)


def rebuild_dutch(state: EventState, rnd: int, pairs: Sequence[Pair], bye: PlayerId | None,
                  kept: Mapping[frozenset[PlayerId], Pair], changed: Iterable[Pair], absent: Iterable[PlayerId]
                  ) -> Draft:
    """An organiser-made pairing of a Dutch round: the Dutch colour rules and board order (``kept``: pinned sides)."""
    everyone = [p for pair in pairs for p in pair] + ([bye] if bye is not None else [])
    ent = Entrants(state, rnd, everyone)
    sided = []
    for a, b in pairs:
        c = allocate(ent, a, b)
        sided.append(kept.get(frozenset((a, b)), (c.first, c.second)))
    return boards(state, rnd, sided, bye, ent, pinned=list(kept.values()), changed=changed, absent=absent)


def boards(state: EventState, rnd: int, sided: Sequence[Pair], bye: PlayerId | None, ent: Entrants | None,
           *, pinned: Iterable[Pair] = (), changed: Iterable[Pair] = (), absent: Iterable[PlayerId] = ()) -> Draft:
    """Number the boards (C.04.2 order, see the module notes) and flag them in the Dutch system's terms."""
    everyone = [p for pair in sided for p in pair] + ([bye] if bye is not None else [])
    if ent is None:
        ent = Entrants(state, rnd, everyone)
    fld = Field(state, rnd, everyone)
    base = assemble(state, fld, [(p, p) for p in sided], bye, pinned=pinned, changed=changed, absent=absent)
    rank = {p: i for i, p in enumerate(ent.order)}

    def order(b: DraftBoard) -> tuple[int, int, int]:
        hi = max(ent.score[b.first], ent.score[b.second])
        return (-hi, -(ent.score[b.first] + ent.score[b.second]), min(rank[b.first], rank[b.second]))

    numbered = tuple(
        DraftBoard(number, b.first, b.second, b.cost,
                   ("pinned",) if "pinned" in b.flags else _flags(ent, b) + (("changed",) if "changed" in b.flags
                                                                            else ()))
        for number, b in enumerate(sorted(base.boards, key=order), 1)
    )
    return Draft(base.round, numbered, base.byes, base.cost, base.engine_version, base.gaps, base.bye_cost,
                 base.unit)


def _flags(ent: Entrants, b: DraftBoard) -> tuple[str, ...]:
    """Board flags (the words of docs/naming.md) as the Dutch criteria see the board."""
    out: list[str] = []
    if b.second in ent.met[b.first]:
        out.append("rematch")  # only an organiser's change can make one (C.1)
    hi, lo = (b.first, b.second) if ent.score[b.first] >= ent.score[b.second] else (b.second, b.first)
    gap = ent.score[hi] - ent.score[lo]
    if gap:
        out.append(f"gap {ent.points(gap)}")
        if ent.floats[hi][0] is Float.DOWN or ent.floats[lo][0] is Float.UP:
            out.append("float")
    colours = Colours(b.first, b.second, 0)
    wide, third = breaks(ent, colours)
    if wide or third:
        out.append("side")
    if any(ent.pref[p].strength >= 2 for p in missed(ent, colours)):
        out.append("pref")
    return tuple(out)

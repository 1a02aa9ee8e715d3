"""The quality criteria of a bracket (C.04.3, 2017 numbering C.5-C.19, from memory) as additive costs.

A bracket's candidate is judged by a vector of counts, compared
lexicographically, smaller first. Every entry is a sum over the candidate's
pairs, its floaters and, for C.7, the next bracket's pairs and floaters, so
the same numbers serve the tests' brute force and the weights of
the bracket matching (:mod:`pairings.engine.dutch.bracket`).

Layers, in priority order (a :data:`Layer` is ``(criterion * 10 + part, level)``;
SD levels are listed from the largest score difference down, so comparing
the counts level by level compares the sorted lists of score differences):

- C.5  players of the bracket left unpaired (= maximise the pairs);
- C.6  PSD: one count per score difference (SD): a pair's SD is its score
  difference, a floater's SD is his score minus (the bracket's lowest score
  minus one point); "one point" is the event's win value (our decision);
- C.7  the next bracket (this bracket's floaters and the next score group):
  its players left unpaired, then its PSD; not in the penultimate pairing
  bracket (PPB) nor in the collapsed last bracket (CLB), whose
  :attr:`Bracket.next` is empty (the route: :mod:`pairings.engine.dutch.rounds`);
- C.8 / C.9  topscorers or their opponents ending with |CD| > 2 / getting one
  colour three times running (final round only);
- C.10 players not getting their colour preference; C.11 players not getting
  a strong (or absolute) one (our reading: an absolute preference is also strong);
- C.12 / C.14  floaters of this bracket (the PAB included: it is a downfloat)
  who also downfloated one / two rounds before;
- C.13 / C.15  residents paired with a higher-scored MDP who also upfloated
  one / two rounds before;
- C.16 / C.18  the SDs of the bracket's MDPs who also downfloated one / two
  rounds before: a paired MDP's pair SD, an MDP floating on with his floater
  SD; C.17 / C.19 the SDs of the upfloaters among C.13 / C.15.

MDPs paired in this bracket downfloat whatever candidate is chosen, so C.12 and
C.14 count this bracket's floaters only (the MDPs were counted where they
floated), and the residents of the CLB (or of a last bracket paired as one
group) paired with a lower-scored player, whose downfloat this bracket decides.
"""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass, replace

from pairings.engine.dutch.colours import Colours, allocate, breaks
from pairings.engine.dutch.entrants import Entrants
from pairings.state import Float, PlayerId, Side

Layer = tuple[int, int]
Costs = Counter[Layer]


@dataclass(frozen=True)
class Bracket:
    """One bracket (Art. 1.3.2): its members in BSN order and what lies below it."""

    members: tuple[PlayerId, ...]
    mdps: frozenset[PlayerId]
    score: int
    """The residents' score (the lowest in the bracket)."""
    next: tuple[PlayerId, ...]
    """The next score group's players, the residents C.7 looks at (empty for the last bracket and the PPB)."""
    lower: tuple[PlayerId, ...]
    """Every player below the bracket, next score group first."""
    collapsed: bool = False
    """Last bracket paired as one group, MDPs with each other too (see bracket.py)."""
    ppb: bool = False
    """The penultimate pairing bracket: its floaters must let the rest be paired (C.4), no C.7."""

    @property
    def last(self) -> bool:
        return not self.lower

    @property
    def next_is_last(self) -> bool:
        """The next bracket is the last one: its leftover, if any, is the PAB."""
        return bool(self.next) and len(self.lower) == len(self.next)

    def penultimate(self) -> "Bracket":
        """This bracket as the PPB: paired again with completion as an absolute criterion, C.7 not applied."""
        return replace(self, next=(), ppb=True)

    @property
    def heterogeneous(self) -> bool:
        return bool(self.mdps) and not self.collapsed

    def allows(self, ent: Entrants, u: PlayerId, v: PlayerId) -> bool:
        """The pair may be made inside this bracket: C.1, C.3, and no MDP-MDP pair (2017 B.2)."""
        if self.heterogeneous and u in self.mdps and v in self.mdps:
            return False
        return ent.compatible(u, v)


def _repeat(ent: Entrants, p: PlayerId, way: Float, back: int) -> bool:
    return ent.floats[p][back - 1] is way


def pair_costs(ent: Entrants, br: Bracket, u: PlayerId, v: PlayerId) -> tuple[Costs, Colours]:
    """Costs of the pair ``u``-``v`` inside the bracket, and its colours."""
    c: Costs = Counter()
    colours = allocate(ent, u, v)
    hi, lo = (u, v) if ent.score[u] >= ent.score[v] else (v, u)
    sd = ent.score[hi] - ent.score[lo]
    c[60, -sd] = 1
    if hi in ent.topscorers or lo in ent.topscorers:
        wide, third = breaks(ent, colours)
        c[80, 0] = len(wide)
        c[90, 0] = len(third)
    if ent.colours:
        first, second = ent.pref[colours.first], ent.pref[colours.second]
        lost = [p for p, side in ((first, Side.FIRST), (second, Side.SECOND)) if p.side not in (None, side)]
        if lost:
            c[100, 0] = len(lost)
            c[110, 0] = sum(1 for p in lost if p.strength >= 2)
    if sd:
        moved = br.heterogeneous and hi in br.mdps
        for back, part in ((1, 0), (2, 20)):
            if _repeat(ent, lo, Float.UP, back):
                c[130 + part, 0] += 1
                c[170 + part, -sd] += 1
            if _repeat(ent, hi, Float.DOWN, back):
                if moved:
                    c[160 + part, -sd] += 1
                else:  # a resident of the CLB (or a one-group last bracket) downfloats in this bracket
                    c[120 + part, 0] += 1
    return c, colours


def float_costs(ent: Entrants, br: Bracket, u: PlayerId) -> Costs:
    """Costs of ``u`` leaving the bracket unpaired (a downfloater, or the PAB in the last bracket)."""
    c: Costs = Counter()
    sd = ent.score[u] - (br.score - ent.win)
    c[50, 0] += 1
    c[60, -sd] += 1
    moved = br.heterogeneous and u in br.mdps
    for back, part in ((1, 0), (2, 20)):
        if _repeat(ent, u, Float.DOWN, back):
            c[120 + part, 0] += 1
            if moved:  # an MDP floating on: C.16 / C.18 take his floater SD
                c[160 + part, -sd] += 1
    return c


def next_pair_costs(ent: Entrants, br: Bracket, u: PlayerId, v: PlayerId) -> Costs:
    """C.7: a pair of the next bracket."""
    return Counter({(71, -abs(ent.score[u] - ent.score[v])): 1})


def next_float_costs(ent: Entrants, br: Bracket, u: PlayerId) -> Costs:
    """C.7: a player of the next bracket left unpaired there.

    When the next bracket is the last one its leftover is the PAB: one at
    most, PAB-eligible (C.2). Layer ``(69, 0)`` counts each player left there,
    an ineligible one twice, so a candidate whose next bracket can be paired
    legally (a count of at most one) beats every other on C.7. Those others
    are all equally bad for the Handbook; a choice among them cannot complete
    the round (unless its last bracket pairs as one group, see docs/engine.md)
    and the bracket is paired again as the PPB.
    """
    low = ent.score[br.next[0]] if br.next else br.score
    c = Counter({(70, 0): 1, (71, -(ent.score[u] - (low - ent.win))): 1})
    if br.next_is_last:
        c[69, 0] = 1 if u in ent.pab_eligible else 2
    return c

"""One bracket: candidates in the Handbook's order, criteria one by one, the first best taken.

C.04.3 (2017 mechanics as the spec states them, from memory; the 2025 edition
keeps them renumbered). The bracket's players get BSNs by Art. 1.2. The
candidates are pairings of S1 with S2 (homogeneous bracket or remainder) or,
in a heterogeneous bracket, the MDP-pairing of the ``M1`` highest MDPs with
the residents followed by the remainder's pairing. Each legal candidate
(C.1-C.3, plus C.2 for the last bracket's leftover and C.4 for the PPB) is
measured by C.5-C.19 as a tuple compared lexicographically; the first
candidate in the Handbook's order whose measure is the least is the answer.

To know the least measure without generating the (very redundant) candidate
list to its end, every distinct outcome (set of pairs) of the bracket is
measured first; the generation then stops at the first candidate with that
outcome's measure. Where every criterion can be at its ideal value (a
one-score bracket without MDPs), generation runs first and stops at the first
"perfect" candidate, as the Handbook itself does.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Callable, Iterator, Sequence

from pairings.state import PlayerId
from tests.dutch_reference.colours import allocate
from tests.dutch_reference.facts import STRONG, Facts
from tests.dutch_reference.generation import heterogeneous, homogeneous

Pair = tuple[PlayerId, PlayerId]
PERFECT_TRIES = 400
"""How many candidates are generated looking for a perfect one before measuring every outcome."""


@dataclass(frozen=True)
class Outcome:
    pairs: tuple[Pair, ...]
    floaters: tuple[PlayerId, ...]


@dataclass
class Bracket:
    """A bracket to pair: its MDPs, its residents and how its choice is judged.

    ``last``: the last bracket (at most the parity left over, and that one
    PAB-eligible, C.2). ``complete``: C.4, the floaters must let the rest be
    completed (the PPB). ``next_residents``: C.7 looks at the next bracket,
    judged as the last one if ``next_is_last``, and under ``next_complete``
    if given.
    """

    facts: Facts
    mdps: Sequence[PlayerId]
    residents: Sequence[PlayerId]
    last: bool = False
    complete: Callable[[frozenset[PlayerId]], bool] | None = None
    next_residents: Sequence[PlayerId] | None = None
    next_is_last: bool = False
    next_complete: Callable[[frozenset[PlayerId]], bool] | None = None

    def __post_init__(self) -> None:
        ordered = sorted([*self.mdps, *self.residents], key=self.facts.rank)
        self.players = ordered
        self.bsn = {p: i for i, p in enumerate(ordered, 1)}
        self.by_bsn = {i: p for p, i in self.bsn.items()}
        self.mdp_set = frozenset(self.mdps)
        self.lowest = min(self.facts.entrants[p].score for p in ordered)
        self._next: dict[frozenset[PlayerId], tuple[object, ...]] = {}

    # --- legality --------------------------------------------------------
    def legal(self, a: PlayerId, b: PlayerId) -> bool:
        if a in self.mdp_set and b in self.mdp_set:
            return False  # MDPs are paired with residents only (S1 = MDPs, S2 = residents)
        return self.facts.compatible(a, b)

    def mode_ok(self, floaters: Sequence[PlayerId]) -> bool:
        if self.last:
            return len(floaters) <= 1 and all(self.facts.entrants[f].pab_ok for f in floaters)
        if self.complete is not None:
            return self.complete(frozenset(floaters))
        return True

    # --- outcomes ----------------------------------------------------------
    def _matchings(self, items: list[PlayerId], unpaired: int) -> Iterator[tuple[list[Pair], list[PlayerId]]]:
        if (len(items) - unpaired) % 2 or unpaired > len(items):
            return
        if not items:
            yield [], []
            return
        first, rest = items[0], items[1:]
        if unpaired:
            for pairs, floaters in self._matchings(rest, unpaired - 1):
                yield pairs, [first, *floaters]
        for i, x in enumerate(rest):
            if self.legal(first, x):
                for pairs, floaters in self._matchings(rest[:i] + rest[i + 1:], unpaired):
                    yield [(first, x), *pairs], floaters

    def outcomes(self) -> list[Outcome]:
        """The legal outcomes with the most pairs (C.5) and, among them, the most MDPs paired (M1)."""
        n = len(self.players)
        counts = [n % 2] if self.last else range(n % 2, n + 1, 2)
        for u in counts:
            found = [Outcome(tuple(p), tuple(f)) for p, f in self._matchings(list(self.players), u)
                     if self.mode_ok(f)]
            if found:
                m1 = max(self.mdp_pairs(o) for o in found)
                return [o for o in found if self.mdp_pairs(o) == m1]
        return []

    def mdp_pairs(self, o: Outcome) -> int:
        return sum(1 for a, b in o.pairs if a in self.mdp_set or b in self.mdp_set)

    # --- criteria ------------------------------------------------------------
    def floater_sd(self, p: PlayerId) -> float:
        return self.facts.entrants[p].score - (self.lowest - self.facts.win)

    def psd(self, o: Outcome) -> tuple[float, ...]:
        """C.6: the score differences, largest first."""
        s = self.facts.entrants
        sds = [abs(s[a].score - s[b].score) for a, b in o.pairs] + [self.floater_sd(f) for f in o.floaters]
        return tuple(sorted(sds, reverse=True))

    def next_bracket(self, floaters: frozenset[PlayerId]) -> tuple[object, ...]:
        """C.7: (players left unpaired, PSD) of the next bracket at its best, given these floaters."""
        if self.next_residents is None:
            return ()
        if floaters not in self._next:
            # the next bracket keeps the absolute criteria: C.2 too when it is the last one
            mdps = sorted(floaters, key=self.facts.rank)
            nxt = Bracket(self.facts, mdps, self.next_residents, self.next_is_last, self.next_complete)
            found = nxt.outcomes()
            if not found and mdps and self.next_is_last:  # paired as one group, as the last bracket would be
                nxt = Bracket(self.facts, [], [*mdps, *self.next_residents], True)
                found = nxt.outcomes()
            worst = (len(nxt.players) + 1, ())
            self._next[floaters] = min(((len(o.floaters), nxt.psd(o)) for o in found), default=worst)
        return self._next[floaters]

    def measure(self, o: Outcome) -> tuple[object, ...]:
        """C.5-C.19 of one outcome, in priority order (smaller is better)."""
        f = self.facts
        s = f.entrants
        c8 = c9 = c10 = c11 = 0
        got: dict[PlayerId, str] = {}
        for a, b in o.pairs:
            white, black = allocate(f, a, b)
            got[white], got[black] = "W", "B"
        for a, b in o.pairs:
            topish = s[a].topscorer or s[b].topscorer
            for p in (a, b):
                e = s[p]
                seq = e.colours + (got[p],)
                cd = seq.count("W") - seq.count("B")
                if topish and abs(cd) > 2:
                    c8 += 1
                if topish and len(seq) >= 3 and seq[-1] == seq[-2] == seq[-3]:
                    c9 += 1
                colour, strength = e.preference
                if colour is not None and got[p] != colour:
                    c10 += 1
                    if strength >= STRONG:
                        c11 += 1
        # floats received in this bracket: its floaters (the PAB included) and, in a pair of unequal
        # scores, the higher resident (down; an MDP was counted where he floated) and the lower (up)
        down: list[tuple[PlayerId, float]] = [(p, self.floater_sd(p)) for p in o.floaters]
        up: list[tuple[PlayerId, float]] = []
        for a, b in o.pairs:
            hi, lo = (a, b) if s[a].score > s[b].score else (b, a)
            sd = s[hi].score - s[lo].score
            if sd:
                if hi not in self.mdp_set:
                    down.append((hi, sd))
                up.append((lo, sd))

        def repeated(floats: list[tuple[PlayerId, float]], attr: str, kind: str) -> list[float]:
            return sorted((sd for p, sd in floats if getattr(s[p], attr) == kind), reverse=True)

        # C.16 / C.18 (the spec: "the SDs of MDPs who repeat the downfloat"): every MDP of the
        # bracket, paired (his pair's SD) or floating on (his floater SD)
        mdp_sd = [(p, self.floater_sd(p)) for p in o.floaters if p in self.mdp_set]
        mdp_sd += [(p, abs(s[a].score - s[b].score)) for a, b in o.pairs for p in (a, b) if p in self.mdp_set]
        d1, u1 = repeated(down, "float1", "D"), repeated(up, "float1", "U")
        d2, u2 = repeated(down, "float2", "D"), repeated(up, "float2", "U")
        return (
            len(o.floaters), self.psd(o), self.next_bracket(frozenset(o.floaters)),
            c8, c9, c10, c11, len(d1), len(u1), len(d2), len(u2),
            tuple(repeated(mdp_sd, "float1", "D")), tuple(u1), tuple(repeated(mdp_sd, "float2", "D")), tuple(u2),
        )

    # --- the Handbook's order -------------------------------------------------
    def candidates(self, pairs: int, m1: int) -> Iterator[Outcome]:
        legal = lambda i, j: self.legal(self.by_bsn[i], self.by_bsn[j])  # noqa: E731
        mdps = [self.bsn[p] for p in self.mdps]
        residents = sorted(self.bsn[p] for p in self.residents)
        gen = heterogeneous(mdps, residents, m1, pairs, legal) if mdps else homogeneous(residents, pairs, legal)
        for cand in gen:
            paired = {i for pr in cand for i in pr}
            yield Outcome(
                tuple((self.by_bsn[i], self.by_bsn[j]) for i, j in cand),
                tuple(self.by_bsn[i] for i in sorted(self.bsn.values()) if i not in paired),
            )

    def _perfect(self) -> Outcome | None:
        """A one-score bracket without MDPs: the first candidate meeting every criterion, if found soon."""
        s = self.facts.entrants
        if self.mdps or len({s[p].score for p in self.players}) != 1:
            return None
        n = len(self.players)
        u = n % 2
        if u and self.next_residents is not None:
            return None  # C.7 depends on who floats
        ideal = (u, (self.facts.win,) * u + (0.0,) * ((n - u) // 2),
                 self.next_bracket(frozenset()) if u == 0 else (), 0, 0, 0, 0, 0, 0, 0, 0, (), (), (), ())
        for tries, o in enumerate(self.candidates((n - u) // 2, 0)):
            if tries >= PERFECT_TRIES:
                return None
            if self.mode_ok(o.floaters) and self.measure(o) == ideal:
                return o
        return None

    def solve(self) -> Outcome | None:
        """The first best candidate, or None when the bracket has no legal candidate."""
        quick = self._perfect()
        if quick is not None:
            return quick
        found = self.outcomes()
        if not found:
            return None
        measures = {frozenset(frozenset(p) for p in o.pairs): self.measure(o) for o in found}
        best = min(measures.values())
        wanted = {k for k, v in measures.items() if v == best}
        pairs = len(found[0].pairs)
        m1 = self.mdp_pairs(found[0])
        for o in self.candidates(pairs, m1):
            if frozenset(frozenset(p) for p in o.pairs) in wanted and self.mode_ok(o.floaters):
                return o
        raise AssertionError("an optimal outcome was never generated")

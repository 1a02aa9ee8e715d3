"""One bracket's choice by maximum-weight perfect matching (Edmonds' blossom), and the completion test.

Method (ours; the criteria are C.04.3's):

- **Weights.** Every edge carries the counts of :mod:`.criteria` (C.5-C.19);
  :func:`.graph.encode` packs them into one integer per edge, each layer's radix above
  the largest total any perfect matching can reach, so the maximum-weight
  perfect matching minimises the layers lexicographically, exactly.
- **Graphs** (:class:`.graph.BracketGraph`, built and solved at scale there), tried in this order, each used only when it is
  provably exact for the bracket at hand (:meth:`BracketSolver.run`):
  *compact*, the bracket alone plus as few float places as let it be paired;
  *fast*, the bracket and the next score group, each vertex given a private
  way to stay unpaired by doubling the graph (two copies, each vertex joined
  to its own copy: a perfect matching of the doubled graph is two equally good
  matchings of the original), which is C.7's own look at the next bracket;
  *exact*, for the PPB only: the bracket and every lower player (plus one bye
  vertex, joined to the PAB-eligible, when the count is odd), where a member
  matched below the bracket floats, so that a perfect matching is a
  completion of the round.
- **The Handbook's route (C.04.3 C.4, C.7; the PPB and CLB, from memory).** A
  bracket is paired by C.5-C.19, C.7 included, without looking further down;
  :mod:`.rounds` then checks that its floaters and every lower player can
  still be paired under the absolute criteria with at most one PAB to an
  eligible player (:func:`completable`: Dirac's degree bound, else a
  matching). When they cannot, the bracket is the penultimate pairing bracket
  (PPB): paired again with that completion as an absolute requirement and
  without C.7 (its :attr:`~.criteria.Bracket.next` is empty), and every
  player below it, with its floaters as MDPs, forms the collapsed last bracket
  (CLB), paired as one last bracket. Where the next bracket is the last one,
  C.7 counts a leftover beyond one PAB-eligible player as a breach (see
  :func:`.criteria.next_float_costs`).
- **Generation order (the final tie-break).** After the quality solve, the
  optimal dual marks the quality-optimal face: an edge's penalty is 1 if its
  reduced cost is not zero, plus 1 per positive-dual blossom it crosses; by
  complementary slackness the matchings of least penalty are exactly the
  quality-optimal ones. Tie-break solves then minimise (penalty, digits) on
  small integers, deciding the generation order step by step (heterogeneous
  brackets: MDP part first, then the remainder; see
  :func:`.generation.generation_key` for why the first appearance of a
  candidate is the exchange whose S1 holds each pair's lower BSN):
  (1, 2) players swapped and BSN sum: sums over the pairs' S1 sides;
  (3) "the S1-to-S2 group holds the highest differing BSN": binary digits, a
  cost ``2**k`` for an original S1 player who stays, highest BSN first;
  (4) "the S2-to-S1 group holds the lowest differing BSN": a reward likewise;
  then the transpositions, lexicographic in the partners' BSNs, a block of S1
  places at a time (digit base ``len(S2) + 1``), each block's pairs fixed
  before the next; an S1 player whose partner in the current (optimal)
  matching is the first of his possible partners, or can be made so by an
  alternating cycle that keeps the matching optimal
  (:meth:`.graph.BracketGraph.swap_in`), is fixed without a solve, and a
  term below each block's digits pairs the later S1 players in BSN order so
  that most of them are. The exchange solve is skipped when the current
  matching's S1 is already the first players (the least its digits can be),
  or can be made so without raising the penalty by unpairing the pairs of two
  first players or of two others and joining the players so freed by
  alternating paths (:meth:`.graph.BracketGraph.repair`). Digits that would
  pass the compiled kernel's integers are avoided by the block sizes; the
  pure-Python blossom takes any size.
- A last bracket (the CLB included) that cannot be paired without pairing
  MDPs with each other is paired as one homogeneous group (our decision).
"""

from __future__ import annotations

from collections import Counter
from typing import Any, Callable, Iterable, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine import blossom
from pairings.engine.dutch.criteria import Bracket, Costs, float_costs, next_float_costs, next_pair_costs, pair_costs
from pairings.engine.dutch.entrants import Entrants
from pairings.engine.dutch.graph import BracketGraph as _Graph
from pairings.state import PlayerId

Pair = tuple[PlayerId, PlayerId]

SHORTCUTS = True
"""Skip the tie-break solves whose answer is known without them (:meth:`BracketSolver._choose`; tests set
it False to compare)."""


def completable(ent: Entrants, players: Sequence[PlayerId]) -> bool:
    """C.4: ``players`` can all be paired (C.1, C.3) but one, who must be PAB-eligible if the count is odd."""
    rest = list(players)
    if len(rest) % 2:
        eligible = [p for p in reversed(ent.order) if p in ent.pab_eligible and p in set(rest)]
        if not eligible:
            return False
        if _dirac(ent, [p for p in rest if p != eligible[0]]):
            return True
    elif _dirac(ent, rest):
        return True
    index = {p: i for i, p in enumerate(rest)}
    edges = [(index[p], index[q], 1) for i, p in enumerate(rest) for q in rest[i + 1:] if ent.compatible(p, q)]
    if len(rest) % 2:
        edges += [(index[p], len(rest), 1) for p in rest if p in ent.pab_eligible]
    return blossom.perfect_matching(len(rest) + len(rest) % 2, edges) is not None


def _dirac(ent: Entrants, players: Sequence[PlayerId]) -> bool:
    """Dirac (1952): every degree at least n/2 gives a Hamiltonian cycle, hence a perfect matching (n even)."""
    n = len(players)
    if n == 0:
        return True
    here = set(players)
    absolute: Counter[object] = Counter(ent.absolute(p) for p in players if p not in ent.topscorers)
    for p in players:
        blocked = len(ent.met[p] & here) + sum(1 for f in ent.forbidden if p in f and not f - here)
        side = ent.absolute(p)
        if side is not None and p not in ent.topscorers:
            blocked += absolute[side] - 1
        if n - 1 - blocked < n / 2:
            return False
    return True


class BracketSolver:
    """Pairs one bracket: :meth:`run` returns its pairs and its floaters (C.04.3 via matching)."""

    def __init__(self, ent: Entrants, br: Bracket, cache: dict[object, Costs]) -> None:
        self.ent, self.br, self.cache = ent, br, cache
        self.members = set(br.members)
        self.next = set(br.next)
        self.memo: dict[tuple[object, ...], Costs] = {}

    def pair_cost(self, u: PlayerId, v: PlayerId) -> Costs:
        """The pair's costs, shared by every pair of the same two player profiles.

        Outside topscorers' pairs the costs depend only on the two scores,
        colour preferences (side and strength), float histories and whether
        the higher is one of the bracket's MDPs (C.12 or C.16, see
        :func:`.criteria.pair_costs`): when both want one colour exactly one
        misses it, the weaker (rule 2) or one of equal strength, so who gets it
        changes no count.
        """
        ent, br = self.ent, self.br
        hi, lo = (u, v) if ent.score[u] >= ent.score[v] else (v, u)
        moved = ent.score[hi] != ent.score[lo] and br.heterogeneous and hi in br.mdps
        if u in ent.topscorers or v in ent.topscorers:
            key: object = (frozenset((u, v)), moved)
        else:
            a, b = self.profile(hi), self.profile(lo)
            key = (a, b, moved) if ent.score[hi] != ent.score[lo] else frozenset((a, b))
        if key not in self.cache:
            self.cache[key] = pair_costs(ent, br, u, v)[0]
        return self.cache[key]

    def profile(self, p: PlayerId) -> tuple[object, ...]:
        pref = self.ent.pref[p]
        return (self.ent.score[p], pref.side, pref.strength, self.ent.floats[p])

    def shared(self, key: tuple[object, ...], make: Callable[[], Costs]) -> Costs:
        """One cost object per key (edges share them; :func:`.graph.encode` packs each once). Never mutated."""
        if key not in self.memo:
            self.memo[key] = make()
        return self.memo[key]

    def floats(self, u: PlayerId) -> Costs:
        """``u`` leaves the bracket unpaired (an MDP floating again also counts for the MDP digit)."""
        def make() -> Costs:
            c = float_costs(self.ent, self.br, u)
            if self.br.heterogeneous and u in self.br.mdps:
                c[200, 0] += 1
            return c

        return self.shared(("float", u), make)

    def lone(self, u: PlayerId) -> Costs:
        """``u`` floats from the bracket and is not paired in the next one either."""
        return self.shared(("lone", u), lambda: self.floats(u) + (
            next_float_costs(self.ent, self.br, u) if self.br.next else Counter()))

    def below(self, u: PlayerId, v: PlayerId) -> Costs:
        """Member ``u`` floats and meets ``v`` below the bracket (in the next bracket or further down)."""
        if v in self.next:
            return self.shared(("meets next", u, self.ent.score[v]), lambda: self.floats(u) + next_pair_costs(
                self.ent, self.br, u, v))
        return self.lone(u)

    def alone(self, u: PlayerId, exact: bool) -> Costs | None:
        """The cost of ``u`` staying unpaired in a graph; None where that is not allowed.

        Exact form: only the PAB-eligible may take the bye vertex. Fast form:
        anybody may stay unpaired in the next bracket (where that is the last
        one, :func:`.criteria.next_float_costs` makes it a C.7 breach).
        """
        ent, br = self.ent, self.br
        cost = self.lone(u) if u in self.members else \
            next_float_costs(ent, br, u) if u in self.next else Counter()
        if exact or br.last:
            return cost if u in ent.pab_eligible else None
        return cost

    def run(self) -> tuple[list[Pair], list[PlayerId]] | None:
        """The bracket's pairs and floaters, by the cheapest form that is provably exact here.

        - Last bracket (and CLB): the compact form with a float place only if
          the count is odd, open to the PAB-eligible: the exact form there. None
          when no candidate exists (the caller then pairs it as one group).
        - PPB (C.4 absolute, no C.7): the compact form when its first best
          candidate lets the rest be paired (the first best of all candidates
          is then the first best of the completing ones), else the exact form,
          every lower player in the graph.
        - Any other bracket: the compact form, the bracket alone with as few
          float places as let it be paired (so C.5 is met), when its floaters
          all hold the bracket's lowest score (no candidate can float lower
          ones, and C.6 fixed their number) and the next bracket can then be
          paired at its ideal for C.7 (every floater meets a next-group
          player, the rest of that group pairs up, one left over at most, the
          PAB-eligible if the next bracket is the last): no candidate does
          better on C.7, and the compact choice is best on every other
          criterion. Else the fast form (bracket and next group), which is C.7
          itself. Completion is not looked at here: the caller checks it and
          re-pairs the bracket as the PPB when it fails (:mod:`.rounds`).
        """
        members = len(self.br.members)
        most = members % 2 if self.br.last else min(members, 4)
        for slots in range(members % 2, most + 1, 2):
            g = _Graph(self, "compact", slots)
            if g.optimise():
                pairs = self._decide(g)
                floaters = self._floaters(pairs)
                if self.br.last or (completable(self.ent, floaters + list(self.br.lower)) if self.br.ppb
                                    else self._ideal_next(floaters)):
                    return pairs, floaters
                break
        if self.br.last:
            return None
        g = _Graph(self, "exact" if self.br.ppb else "fast")
        found = g.optimise()
        assert found, "anybody may float from the fast form; the exact one: the bracket above left a pairable rest"
        pairs = self._decide(g)
        return pairs, self._floaters(pairs)

    def _ideal_next(self, floaters: list[PlayerId]) -> bool:
        """The compact form's exactness test (see :meth:`run`); a concrete next bracket is built."""
        ent, br = self.ent, self.br
        if any(ent.score[f] != br.score for f in floaters) or len(floaters) > len(br.next):
            return False
        free = list(br.next)
        for f in floaters:
            mate = next((q for q in free if ent.compatible(f, q)), None)
            if mate is None:
                return False
            free.remove(mate)
        if len(free) % 2:
            return any(_dirac(ent, [q for q in free if q != x]) and (x in ent.pab_eligible or not br.next_is_last)
                       for x in reversed(free))
        return _dirac(ent, free)

    def _floaters(self, pairs: list[Pair]) -> list[PlayerId]:
        paired = {p for pair in pairs for p in pair}
        return [p for p in self.br.members if p not in paired]

    def _decide(self, g: _Graph) -> list[Pair]:
        """Fix the bracket's pairs in the Handbook's generation order (MDP part first, then the remainder)."""
        br = self.br
        fixed: list[Pair] = []
        is_pair = g.pu >= 0
        pu, pv = np.maximum(g.pu, 0), np.maximum(g.pv, 0)
        if br.heterogeneous:
            mdps = [p for p in br.members if p in br.mdps]
            residents = [p for p in br.members if p not in br.mdps]
            made = sum(1 for m in mdps if g.partner(m) is not None)
            mdp = np.zeros(g.n, dtype=bool)
            mdp[[g.index[m] for m in mdps]] = True
            relevant = is_pair & (mdp[pu] != mdp[pv])
            fixed += self._choose(g, mdps, residents, made, relevant, np.where(mdp[pu], pu, pv),
                                  np.where(mdp[pu], pv, pu), lambda p, q: q not in br.mdps)
            limbo = np.zeros(g.n, dtype=bool)
            limbo[[g.index[m] for m in mdps if all(m not in pair for pair in fixed)]] = True
            g.drop(is_pair & (limbo[pu] | limbo[pv]))
        rest = [p for p in br.members if all(p not in pair for pair in fixed)
                and not (br.heterogeneous and p in br.mdps)]
        inside = set(rest)
        made = sum(1 for p in rest if (q := g.partner(p)) is not None and q in inside) // 2
        rank = np.zeros(g.n, dtype=np.int64)
        rank[[g.index[p] for p in rest]] = np.arange(1, len(rest) + 1)
        relevant = is_pair & (rank[pu] > 0) & (rank[pv] > 0)
        low = rank[pu] < rank[pv]
        order = {p: i for i, p in enumerate(rest)}
        fixed += self._choose(g, rest, rest, made, relevant, np.where(low, pu, pv), np.where(low, pv, pu),
                              lambda p, q: q in order and order[p] < order[q])
        return fixed

    def _choose(self, g: _Graph, leads: list[PlayerId], follows: list[PlayerId], count: int,
                relevant: NDArray[np.bool_], lead: NDArray[np.int64], follow: NDArray[np.int64],
                heads: Callable[[PlayerId, PlayerId], bool]) -> list[Pair]:
        """One phase of the generation order: exchanges (which ``leads`` are S1), then transpositions.

        ``count`` pairs are made between S1 (``count`` of ``leads``) and
        ``follows``; on each ``relevant`` edge ``lead`` is the vertex on S1's
        side and ``follow`` its partner. Returns the pairs, fixed in the graph.
        """
        if count == 0:
            return []
        lrank = np.zeros(g.n, dtype=np.int64)
        lrank[[g.index[p] for p in leads]] = np.arange(1, len(leads) + 1)
        frank = np.zeros(g.n, dtype=np.int64)
        frank[[g.index[p] for p in follows]] = np.arange(1, len(follows) + 1)
        spread = g.copies * len(leads) ** 2 + 1
        swap_limit = (g.copies * len(leads) + 1) * spread
        # tests 1 and 2: players swapped into S1, then the BSN sum of S1
        swaps = np.where(relevant, (lrank[lead] > count) * spread + lrank[lead], 0)
        first = set(leads[:count])
        # A matching whose S1 is the first ``count`` leads in every copy has the least swaps already;
        # one that pairs no two of them and no two of the others (with the same penalty) is one.
        settled = SHORTCUTS and all(self._leads(g, leads, heads, copy) == first for copy in range(g.copies))
        if SHORTCUTS and not settled:
            within = (lrank[follow] >= 1) & (lrank[follow] <= count)
            settled = g.repair(relevant & ((lrank[lead] > count) | within)) and self._leads(g, leads, heads) == first
        if not settled:
            g.tiebreak(swaps, swap_limit)
        chosen = self._leads(g, leads, heads)
        if chosen != first:
            chosen = self._membership(g, leads, count, relevant, lead, swaps, swap_limit, heads)
        self._settle(g, leads, chosen, relevant, lead)
        order = sorted(chosen, key=leads.index)
        # Below the block's digits, a term that pairs the S1 players after the block in BSN order with
        # their partners (largest sum of rank products), so the next S1 players mostly need no solve.
        spread = g.copies * count * (len(leads) + 1) * (len(follows) + 1) + 1
        after = np.where(relevant, (len(leads) + 1 - lrank[lead]) * frank[follow], 0)
        budget = 2 ** max(8, 100 - g.n.bit_length() - spread.bit_length())
        out: list[Pair] = []
        # The S1 players' edges by S1 player (no edge is dropped below; players leave by ``remove``).
        ids = np.flatnonzero(relevant & g.keep)
        ids = ids[np.argsort(lead[ids], kind="stable")]
        heads_of = lead[ids]

        def edges_of(x: PlayerId) -> tuple[NDArray[np.int64], NDArray[np.int64]]:
            """``x``'s edges still live, and the ranks of their partners."""
            at = g.index[x]
            mine = ids[np.searchsorted(heads_of, at, "left"):np.searchsorted(heads_of, at, "right")]
            mine = mine[g.live[g.eu[mine]] & g.live[g.ev[mine]]]
            return mine, np.unique(frank[follow[mine]])

        k = 0
        while k < len(order):
            # Transpositions: each S1 player's partner digit is its rank among the partners still
            # possible for him (the BSN order kept), so a block holds as many places as the budget allows.
            # An S1 player whose partner in the current (optimal) matching is the first of his possible
            # partners, or can be made so by an alternating cycle that keeps it optimal, has it in the
            # first candidate too: fixed without a solve.
            while k < len(order):
                y = g.partner(order[k])
                options = edges_of(order[k])[1]
                if not len(options):
                    break
                if y is None or frank[g.index[y]] != options[0]:
                    y = follows[int(options[0]) - 1]
                    if not SHORTCUTS or not g.swap_in(order[k], y):
                        break
                out.append((order[k], y))
                g.remove((order[k], y))
                k += 1
            if k == len(order):
                break
            block: list[tuple[PlayerId, NDArray[np.int64], NDArray[np.int64]]] = []
            product = 1
            for x in order[k:]:
                mine, options = edges_of(x)
                if block and product * len(options) > budget:
                    break
                block.append((x, mine, options))
                product *= max(1, len(options))
            digits = after.copy()
            terms = []
            weight = product
            for x, mine, options in block:
                weight //= max(1, len(options))
                digits[mine] = 0
                terms.append((mine, np.searchsorted(options, frank[follow[mine]]), weight * spread))
            # One limit for every block (a block's product is at most the budget, or one player's
            # options), so that each solve starts from the last one's dual.
            g.tiebreak(digits, g.copies * max(budget, len(follows) + 1) * spread, terms, carry=True)
            for x, _, _ in block:
                y = g.partner(x)
                assert y is not None
                out.append((x, y))
                g.remove((x, y))
            k += len(block)
        return out

    def _leads(self, g: _Graph, leads: list[PlayerId], heads: Callable[[PlayerId, PlayerId], bool],
               copy: int = 0) -> set[PlayerId]:
        """The ``leads`` on S1's side of their pair in the current matching (``heads(p, q)``: p is), in
        the doubled graph's ``copy``."""
        out = set()
        for p in leads:
            q = g.partner(p, copy)
            if q is not None and heads(p, q):
                out.add(p)
        return out

    def _settle(self, g: _Graph, leads: list[PlayerId], chosen: Iterable[PlayerId], relevant: NDArray[np.bool_],
                lead: NDArray[np.int64]) -> None:
        """Keep S1 players on S1's side of a pair, and the others off it."""
        inside = np.zeros(g.n, dtype=bool)
        inside[[g.index[p] for p in chosen]] = True
        candidate = np.zeros(g.n, dtype=bool)
        candidate[[g.index[p] for p in leads]] = True
        outside = candidate & ~inside
        bad = np.zeros(len(g.eu), dtype=bool)
        for end in (g.cu, g.cv):
            own = relevant & (lead == end)
            bad |= (inside[end] & ~own) | (outside[end] & own)
        g.drop(bad)

    def _membership(self, g: _Graph, leads: list[PlayerId], count: int, relevant: NDArray[np.bool_],
                    lead: NDArray[np.int64], swaps: NDArray[Any], swap_limit: int,
                    heads: Callable[[PlayerId, PlayerId], bool]) -> set[PlayerId]:
        """Tests 3 and 4 of the exchange order, a block of players at a time, highest S1 BSN first."""
        width = max(1, 100 - 5 * g.n.bit_length())
        s1 = leads[:count][::-1]
        s2 = leads[count:]
        for group, keep in ((s1, False), (s2, True)):
            for start in range(0, len(group), width):
                block = group[start:start + width]
                size = len(block)
                spread = g.copies * len(leads) * 2 ** size + 1
                place = np.full(g.n, -1, dtype=np.int64)
                place[[g.index[p] for p in block]] = np.arange(size)
                power = np.array([2 ** (size - 1 - k) for k in range(size)] + [0], dtype=object)
                at = np.where(relevant, place[lead], -1)
                bit = np.where(at >= 0, power[at], 0)
                # test 3: an S1 player leaving S1 is preferred, the higher BSN first (a cost to stay);
                # test 4: an S2 player entering S1 is preferred, the lower BSN first (a reward to enter)
                extra = np.where(relevant, 2 ** size - bit, 0) if keep else bit
                g.tiebreak(swaps.astype(object) * spread + extra, swap_limit * spread)
                now = self._leads(g, leads, heads)
                self._settle(g, block, [p for p in block if p in now], relevant, lead)
        return self._leads(g, leads, heads)

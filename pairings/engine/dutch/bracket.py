"""One bracket's choice by maximum-weight perfect matching (Edmonds' blossom), and the completion check.

Method (ours; the criteria are C.04.3's):

- **Graph.** Fast form: the bracket's members and the next score group, each
  given a private way to stay unpaired by the doubling construction (two
  copies of the graph, every vertex joined to its own copy by an edge carrying
  the cost of staying unpaired: a perfect matching of the doubled graph is two
  equally good matchings of the original, so its optimum is one optimum of the
  original twice). Exact form: the members and *every* lower player (plus one
  bye vertex when the count is odd, joined to the PAB-eligible players), as a
  plain perfect matching: a member matched below the bracket floats.
- **Weights.** Every edge carries the counts of :mod:`.criteria` (C.5-C.19) and,
  below them, the generation-order digits of this module; the counts are
  packed into one integer per edge, each layer's radix above the largest total
  any perfect matching can reach (the sum over vertices of the layer's largest
  incident value), so the maximum-weight perfect matching minimises the layers
  lexicographically, exactly.
- **Completion (C.4).** The players left for later (this bracket's floaters and
  all lower players) must still be pairable under the absolute criteria with
  at most one PAB to an eligible player. The fast form is a relaxation (every
  choice the exact form allows it allows too, at the same cost), so its
  optimum is exact when it is feasible: when the players it leaves unpaired
  below the next bracket can, with everyone lower, still be paired
  (:func:`completable`: Dirac's degree bound, else a matching). When the check
  fails, the exact form is solved instead, which cannot leave the rest
  unpairable. Checking completion in every bracket replaces the Handbook's
  PPB/CLB re-pairing (a decision: it gives the same pairing whenever only the
  bracket just above the unpairable rest has to change).
- **Generation order (the final tie-break).** Two solves per bracket:
  a heterogeneous bracket first fixes its MDP pairs with the MDP-exchange and
  MDP-transposition digits, then the remainder (or a homogeneous bracket) is
  solved with the remainder's exchange and transposition digits. Why digits
  reproduce the order exactly (see :func:`.generation.generation_key`): among
  equally good candidates, (1) the number of swapped players and (2) the sum
  difference are sums over the pairs' lower BSNs; (3) "the S1-to-S2 group holds
  the highest differing BSN" is a binary comparison, cost ``2**j`` for an
  original S1 player ``j`` who stays S1's side of his pair; (4) "the S2-to-S1
  group holds the lowest differing BSN" likewise with reward ``2**(n - j)``;
  and the lexicographic order of transpositions is the partner's BSN in base
  ``n + 1`` at the digit of the S1 player's BSN. Each solve is told the number
  of pairs it will make (S1's size): first the upper bound, then, if fewer are
  made, the number made, which the quality layers already fixed.
- A last bracket that cannot be paired without pairing MDPs with each other
  is paired as one homogeneous group (the collapsed last bracket: our reading
  of the Handbook's CLB).
"""

from __future__ import annotations

from collections import Counter
from typing import Callable, Iterable, Sequence

from pairings.engine import blossom
from pairings.engine.dutch.criteria import (
    Bracket, Costs, Layer, float_costs, next_float_costs, next_pair_costs, pair_costs,
)
from pairings.engine.dutch.entrants import Entrants
from pairings.state import PlayerId

Pair = tuple[PlayerId, PlayerId]
CostEdge = tuple[int, int, Costs]


def encode(edges: Sequence[CostEdge]) -> list[tuple[int, int, int]]:
    """Integer weights whose maximum perfect matching minimises the cost layers lexicographically."""
    layers = sorted({layer for _, _, c in edges for layer, n in c.items() if n})
    top: dict[tuple[int, Layer], int] = {}
    for u, v, c in edges:
        for layer, n in c.items():
            for x in (u, v):
                if n > top.get((x, layer), 0):
                    top[x, layer] = n
    bound: Counter[Layer] = Counter()
    for (_, layer), n in top.items():
        bound[layer] += n
    scale: dict[Layer, int] = {}
    step = 1
    for layer in reversed(layers):
        scale[layer] = step
        step *= bound[layer] + 1
    costs = [sum(n * scale[layer] for layer, n in c.items() if n) for _, _, c in edges]
    ceiling = max(costs, default=0) + 1
    return [(u, v, ceiling - cost) for (u, v, _), cost in zip(edges, costs)]


def solve(n: int, edges: Sequence[CostEdge]) -> list[tuple[int, int]] | None:
    """The lexicographically cheapest perfect matching of ``n`` vertices, or None if none exists."""
    found = blossom.perfect_matching(n, encode(edges))
    return None if found is None else found[0]


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

    def __init__(self, ent: Entrants, br: Bracket, cache: dict[frozenset[PlayerId], Costs]) -> None:
        self.ent, self.br, self.cache = ent, br, cache
        self.bsn = {p: i + 1 for i, p in enumerate(br.members)}
        self.members = set(br.members)
        self.next = set(br.next)

    def pair_cost(self, u: PlayerId, v: PlayerId) -> Costs:
        key = frozenset((u, v))
        if key not in self.cache:
            self.cache[key] = pair_costs(self.ent, self.br, u, v)[0]
        return self.cache[key]

    def run(self) -> tuple[list[Pair], list[PlayerId]]:
        """The bracket's pairs and floaters.

        The fast form is a relaxation (it ignores everything below the next
        score group): its optimum is exact when the players it leaves unpaired
        beyond the next bracket, with everyone lower, can still be paired.
        """
        out = self._stages(exact=False)
        if out is not None and completable(self.ent, out[2] + list(self.br.lower[len(self.br.next):])):
            return out[0], out[1]
        out = self._stages(exact=True)
        if out is None:
            raise ValueError("no completion exists: the caller checks the round first")
        return out[0], out[1]

    def _stages(self, exact: bool) -> tuple[list[Pair], list[PlayerId], list[PlayerId]] | None:
        br, fixed = self.br, []
        if br.heterogeneous:
            mdps = [p for p in br.members if p in br.mdps]
            residents = [p for p in br.members if p not in br.mdps]
            m1 = min(len(mdps), len(residents))
            while True:
                got = self._solve(exact, [], self._mdp_digits(mdps, residents, m1), True)
                if got is None:
                    return None
                fixed = [(a, b) for a, b in got[0] if (a in br.mdps) != (b in br.mdps)]
                if len(fixed) == m1:
                    break
                m1 = len(fixed)
        placed = {x for pair in fixed for x in pair}
        rest = [p for p in br.members if p not in placed and (not br.heterogeneous or p not in br.mdps)]
        pairs = len(rest) // 2
        while True:
            got = self._solve(exact, fixed, self._remainder_digits(rest, pairs), False)
            if got is None:
                return None
            made = sum(1 for a, b in got[0] if a in set(rest) and b in set(rest))
            if made == pairs:
                return got
            pairs = made

    def _mdp_digits(self, mdps: list[PlayerId], residents: list[PlayerId], m1: int
                    ) -> dict[frozenset[PlayerId], Costs]:
        """MDP exchange (D.3) and MDP-pairing transposition digits on the MDP-resident pairs."""
        out: dict[frozenset[PlayerId], Costs] = {}
        size, base = len(mdps), len(residents) + 1
        for i, m in enumerate(mdps, 1):
            for k, r in enumerate(residents, 1):
                c: Costs = Counter()
                c[210, 0] = 1 if i > m1 else 0
                c[211, 0] = i
                c[212, 0] = 2 ** i if i <= m1 else 0
                c[213, 0] = 2 ** size - (2 ** (size - i) if i > m1 else 0)
                c[214, 0] = k * base ** (size - i)
                out[frozenset((m, r))] = c
        return out

    def _remainder_digits(self, rest: list[PlayerId], pairs: int) -> dict[frozenset[PlayerId], Costs]:
        """Resident exchange (D.2) and transposition (D.1) digits on the remainder's pairs."""
        out: dict[frozenset[PlayerId], Costs] = {}
        size, base = len(rest), len(rest) + 1
        for ja, a in enumerate(rest, 1):
            for jb in range(ja + 1, size + 1):
                c: Costs = Counter()
                c[220, 0] = 1 if ja > pairs else 0
                c[221, 0] = ja
                c[222, 0] = 2 ** ja if ja <= pairs else 0
                c[223, 0] = 2 ** size - (2 ** (size - ja) if ja > pairs else 0)
                c[224, 0] = jb * base ** (size - ja)
                out[frozenset((a, rest[jb - 1]))] = c
        return out

    def _solve(self, exact: bool, fixed: Iterable[Pair], digits: dict[frozenset[PlayerId], Costs],
               mdp_pairs: bool) -> tuple[list[Pair], list[PlayerId], list[PlayerId]] | None:
        """One solve; ``mdp_pairs`` False once the MDP pairs are fixed (Limbo MDPs then float)."""
        ent, br = self.ent, self.br
        placed = {x for pair in fixed for x in pair}
        members = [p for p in br.members if p not in placed]
        below = list(br.lower) if exact else list(br.next)
        vertices = members + below
        idx = {p: i for i, p in enumerate(vertices)}
        n = len(vertices)
        mdp_float: Costs = Counter({(200, 0): 1})
        edges: list[CostEdge] = []

        def floats(u: PlayerId) -> Costs:
            c = float_costs(ent, br, u)
            if br.heterogeneous and u in br.mdps:
                c = c + mdp_float
            return c

        for i, u in enumerate(vertices):
            for v in vertices[i + 1:]:
                if u in self.members and v in self.members:
                    limbo = br.heterogeneous and not mdp_pairs and (u in br.mdps or v in br.mdps)
                    if br.allows(ent, u, v) and not limbo:
                        c = self.pair_cost(u, v) + digits.get(frozenset((u, v)), Counter())
                    elif exact and not br.last and ent.compatible(u, v):  # both float, meet further down
                        c = floats(u) + floats(v) + next_float_costs(ent, br, u) + next_float_costs(ent, br, v)
                    else:
                        continue
                elif not ent.compatible(u, v):
                    continue
                elif u in self.members:
                    c = floats(u) + (next_pair_costs(ent, br, u, v) if v in self.next
                                     else next_float_costs(ent, br, u) if br.next else Counter())
                elif u in self.next and v in self.next:
                    c = next_pair_costs(ent, br, u, v)
                elif u in self.next or v in self.next:
                    c = next_float_costs(ent, br, u if u in self.next else v)
                else:
                    c = Counter()
                edges.append((idx[u], idx[v], c))
        lone = [self._alone(u, floats, exact) for u in vertices]
        if exact:
            if n % 2:
                edges += [(idx[u], n, c) for u, c in zip(vertices, lone) if c is not None]
                n += 1
            found = solve(n, edges)
            if found is None:
                return None
            mate = {}
            for a, b in found:
                mate[a], mate[b] = b, a
        else:
            doubled = edges + [(u + n, v + n, c) for u, v, c in edges]
            doubled += [(i, i + n, c + c) for i, c in enumerate(lone) if c is not None]
            found = solve(2 * n, doubled)
            if found is None:
                return None
            mate = {a: b for a, b in found if a < n} | {b: a for a, b in found if b < n}
        pairs = list(fixed)
        floaters = []
        for u in members:
            m = mate[idx[u]]
            if m < len(vertices) and vertices[m] in self.members:
                if idx[u] < m:
                    pairs.append((u, vertices[m]))
            else:
                floaters.append(u)
        beyond = [u for u in vertices if mate[idx[u]] >= len(vertices)]
        return pairs, floaters, beyond

    def _alone(self, u: PlayerId, floats: Callable[[PlayerId], Costs], exact: bool) -> Costs | None:
        """The cost of ``u`` staying unpaired in this graph; None where that is not allowed.

        Exact form: only the PAB-eligible may take the bye vertex. Fast form: a
        relaxation (anybody may float below the graph, except from the last
        bracket and, when nothing lies below it, from the next score group).
        """
        ent, br = self.ent, self.br
        if u in self.members:
            cost = floats(u) + (next_float_costs(ent, br, u) if br.next else Counter())
        elif u in self.next:
            cost = next_float_costs(ent, br, u)
        else:
            cost = Counter()
        if exact or br.last or (u in self.next and len(br.lower) == len(br.next)):
            return cost if u in ent.pab_eligible else None
        return cost

"""A bracket's matching graph as arrays, its optimal solve and the tie-break solves (C.04.3 via matching).

The graph forms and what their edges mean are in :mod:`.bracket`'s notes;
this module builds them and solves them at scale (ours):

- **Edges as arrays.** A bracket of ``k`` players has about ``k**2 / 2``
  edges, but few distinct costs: outside topscorers' pairs a pair's costs
  depend only on the two players' profiles (score, colour preference, float
  history, and whether he is one of the bracket's MDPs, which decides between
  C.12 and C.16; :meth:`.bracket.BracketSolver.pair_cost`). Edges are enumerated in
  numpy, row by row, and each gets the index of its cost object in a small
  table (:class:`CostTable`), one Python call per distinct profile pair;
  :func:`encode` packs the table, not the edges.
- **Pruned solve with a certificate** (:data:`PRUNE`). The quality solve runs
  on each vertex's edges nearest the rank-order ideal (``S1[i]`` with
  ``S2[i]``) plus its heaviest ones; its Edmonds dual is checked on every edge
  of the full graph (:func:`pairings.engine.certificate.reduced_costs`): an
  edge left out with a non-negative reduced cost cannot improve the matching,
  so once none is negative the matching is optimal on the full graph (LP
  duality, :mod:`pairings.engine.certificate`), and the dual, feasible on
  every edge, marks the full graph's optimal face as an unpruned solve's does
  (complementary slackness holds for every optimal dual). Edges with negative
  reduced cost are added and the solve repeated, warm-started.
- **Tie-break solves** run on the tight edges only. Those whose weights fit
  64 bits (the exchange steps) are pruned and certified the same way, seeded
  with the current matching (an optimal one, which the next solve mostly
  keeps); the transpositions' wide digits are solved on every tight edge
  (pruning them cost more than it saved when measured: the seed cannot see the
  digits' order in floating point), as 128-bit weights built in int64 limbs
  (:func:`_wide`), warm-started from the current matching and from the last
  block's dual (one weight ceiling per phase keeps that dual feasible).
- **Solves avoided** (:meth:`BracketGraph.swap_in`, :meth:`BracketGraph.repair`):
  alternating paths on the tight edges change the current optimal matching
  without a solve when the change provably keeps its penalty least; the
  search does not shrink blossoms, so it may miss a path, and the caller then
  solves.
"""

from __future__ import annotations

from collections import Counter
from typing import TYPE_CHECKING, Any, Callable, Iterable, Sequence

import numpy as np
from numpy.typing import NDArray

from pairings.engine import blossom
from pairings.engine.candidates import index_pairs
from pairings.engine.certificate import reduced_costs
from pairings.engine.dutch.criteria import Costs, next_pair_costs
from pairings.engine.sparse import Priced, SparseGraph, best_per_vertex, certify
from pairings.engine.vector import AnyArray, IntArray
from pairings.state import PlayerId, Side

if TYPE_CHECKING:
    from pairings.engine.dutch.bracket import BracketSolver

PRUNE = True
"""Solve the quality layers on a pruned graph and certify it on every edge (tests set it False to compare)."""
PRUNE_WINDOW = 2
"""Pairs kept around the rank-order ideal, either side (``S1[i]`` with ``S2[i - 2..i + 2]``)."""
PRUNE_BEST = 12
"""... plus each vertex's heaviest edges."""
PRUNE_ADD = 12
"""Per vertex, the most violated edges added after the first failed certificate (doubled after each).
With 4 and 4 the Dutch draft of a simulated 10,000-player round took 58 full-graph certificate checks and
about a fifth more processor time (measured at 1,000, 3,000 and 10,000 players)."""
PRUNE_ROUNDS = 6
"""Pruned solves before the full graph is solved instead."""
ROW_PAIRS = 1 << 22
"""Vertex pairs enumerated at a time (memory of the exact form's graphs)."""
SMALL = 2**62
"""Weights below this go to the kernel as int64 (no Python integer per edge)."""
REROUTE_DEPTH = 3
"""Matched edges walked at most when looking for an alternating cycle (:meth:`BracketGraph.swap_in`)."""


class CostTable:
    """Distinct cost objects of a graph's edges, each once (edges hold their index)."""

    def __init__(self) -> None:
        self.costs: list[Costs] = []
        self._slot: dict[int, int] = {}

    def add(self, c: Costs) -> int:
        key = id(c)  # cost objects are shared and never mutated (BracketSolver.shared)
        if key not in self._slot:
            self._slot[key] = len(self.costs)
            self.costs.append(c)
        return self._slot[key]

    def classes(self, keys: IntArray, make: Callable[[int], Costs], memo: dict[int, int]) -> IntArray:
        """Per edge, the index of its cost: one ``make(first edge)`` call per distinct ``keys`` value."""
        if not len(keys):
            return np.zeros(0, dtype=np.int64)
        values, first, inverse = np.unique(keys, return_index=True, return_inverse=True)
        ids = np.empty(len(values), dtype=np.int64)
        for k, (key, at) in enumerate(zip(values.tolist(), first.tolist())):
            if key not in memo:
                memo[key] = self.add(make(at))
            ids[k] = memo[key]
        return ids[inverse.reshape(-1)]


def encode(u: IntArray, v: IntArray, which: IntArray, costs: Sequence[Costs]) -> AnyArray:
    """Integer weights whose maximum perfect matching minimises the cost layers lexicographically.

    Edge ``k`` costs ``costs[which[k]]``. A layer's total over a matching is
    at most half the sum, over vertices, of the layer's largest value on an
    edge at that vertex (each matched edge's value is at most the mean of its
    two ends' largest values); its radix is one more. int64 when the weights
    fit, else Python integers.
    """
    if not len(u):
        return np.zeros(0, dtype=np.int64)
    layers = sorted({layer for c in costs for layer, n in c.items() if n})
    if not layers:
        return np.ones(len(u), dtype=np.int64)
    col = {layer: j for j, layer in enumerate(layers)}
    table = np.zeros((len(costs), len(layers)), dtype=np.int64)
    for i, c in enumerate(costs):
        for layer, n in c.items():
            if n:
                table[i, col[layer]] = n
    size = int(max(u.max(), v.max())) + 1
    top = np.zeros((size, len(layers)), dtype=np.int64)
    for ends in (u, v):  # each (vertex, cost) once
        seen = np.unique(ends * len(costs) + which)
        np.maximum.at(top, seen // len(costs), table[seen % len(costs)])
    bound = (top.sum(axis=0) + 1) // 2
    scale: list[int] = [0] * len(layers)
    step = 1
    for j in reversed(range(len(layers))):
        scale[j] = step
        step *= int(bound[j]) + 1
    packed = [sum(int(n) * scale[j] for j, n in enumerate(row) if n) for row in table.tolist()]
    used = np.unique(which)
    ceiling = max(packed[k] for k in used.tolist()) + 1
    dtype: Any = np.int64 if ceiling < SMALL else object
    return np.array([ceiling - x for x in packed], dtype=dtype)[which]


def _side_code(side: Side | None) -> int:
    return 0 if side is None else 1 if side is Side.FIRST else 2


class BracketGraph:
    """A bracket's matching graph, its quality-optimal face, and lexicographic tie-break solves.

    Built once per form (:mod:`.bracket`): *compact*, the members and
    float places; *fast*, the members and the next score group, doubled (its
    leftovers cost C.7, :func:`.criteria.next_float_costs`); *exact*, the
    PPB's form (no next group, no C.7), the members and every lower player (a
    member matched to one floats; two lower players meet at no cost here), and
    a bye vertex for the PAB-eligible when the count is odd.
    :meth:`optimise` solves the quality layers and keeps the optimal dual;
    afterwards every edge carries a penalty (1 if its reduced cost is not
    zero, plus 1 for each blossom with a positive dual it crosses). By
    complementary slackness a perfect matching is quality-optimal exactly
    when all its edges are tight and it crosses every such blossom once, i.e.
    when its penalty is the least possible, so the tie-break solves minimise
    (penalty, digits) on small integers instead of (quality, digits) on large
    ones. Removing both players of a pair that the current optimum holds, or
    edges that it does not use, keeps that property (an optimal matching
    survives, and crossing counts keep their parity).
    """

    def __init__(self, solver: "BracketSolver", form: str, slots: int = 0) -> None:
        self.solver = solver
        br = solver.br
        exact = form == "exact"
        assert not (exact and br.next), "the exact form is the PPB's, which has no next bracket (no C.7)"
        self.vertices = list(br.members) + (list(br.lower) if exact else list(br.next) if form == "fast" else [])
        self.real = len(self.vertices)
        self.index = {p: i for i, p in enumerate(self.vertices)}
        self.table = CostTable()
        u, v, which, pair, rank = self._pairs(exact)
        n = self.real
        self.copies = 2 if form == "fast" else 1
        alone = [solver.alone(p, exact) for p in self.vertices]
        extra: list[tuple[int, int, Costs]] = []
        if form == "compact":  # ``slots`` places to float to, each open to every member
            nothing = solver.shared(("nothing",), Counter)
            for k in range(slots):
                extra += [(i, n + k, solver.floats(p)) for i, p in enumerate(self.vertices)
                          if not br.last or p in solver.ent.pab_eligible]
                extra += [(n + k, n + j, nothing) for j in range(k + 1, slots)]
            n += slots
        elif exact:
            if n % 2:
                extra += [(i, n, c) for i, c in enumerate(alone) if c is not None]
                n += 1
        else:
            u, v = np.concatenate([u, u + n]), np.concatenate([v, v + n])
            which, pair, rank = np.tile(which, 2), np.tile(pair, 2), np.tile(rank, 2)
            extra += [(i, i + n, c + c) for i, c in enumerate(alone) if c is not None]
            n *= 2
        self.n = n
        self.u = np.concatenate([u, np.array([e[0] for e in extra], dtype=np.int64)])
        self.v = np.concatenate([v, np.array([e[1] for e in extra], dtype=np.int64)])
        self.which = np.concatenate([which, np.array([self.table.add(e[2]) for e in extra], dtype=np.int64)])
        self.pair = np.concatenate([pair, np.zeros(len(extra), dtype=bool)])
        self.rank = np.concatenate([rank, np.zeros(len(extra), dtype=np.int64)])
        self.mate: dict[int, int] = {}
        self._carried: tuple[int, IntArray, list[int]] | None = None

    def _pairs(self, exact: bool) -> tuple[IntArray, IntArray, IntArray, NDArray[np.bool_], IntArray]:
        """The edges between real vertices, in row order: ends, cost index, bracket pair or not, rank."""
        solver, ent, br, table = self.solver, self.solver.ent, self.solver.br, self.table
        vx = self.vertices
        n = len(vx)
        member = np.array([p in solver.members for p in vx], dtype=bool)
        nxt = np.array([p in solver.next for p in vx], dtype=bool)
        mdp = np.array([br.heterogeneous and p in br.mdps for p in vx], dtype=bool)
        must = np.array([_side_code(ent.must[p]) for p in vx], dtype=np.int64)
        topscorer = np.array([p in ent.topscorers for p in vx], dtype=bool)
        score = np.array([ent.score[p] for p in vx], dtype=np.int64)
        profiles: dict[object, int] = {}
        # The MDP flag too: the higher player's downfloat counts for C.16 if he is an MDP, else for C.12.
        profile = np.array([profiles.setdefault(("top", p) if p in ent.topscorers else (solver.profile(p), bool(m)),
                                                len(profiles)) for p, m in zip(vx, mdp)], dtype=np.int64)
        banned = self._banned()
        half = max(1, int(member.sum()) // 2)
        memos: list[dict[int, int]] = [{} for _ in range(4)]
        us, vs, whiches, pairs, ranks = [], [], [], [], []
        row = 0
        while row < n:
            stop = row + 1
            while stop < n and (stop - row) * (n - row) < ROW_PAIRS:
                stop += 1
            i, j = index_pairs(np.zeros(n, dtype=np.int64), None, range(row, stop))
            start = row * (2 * n - row - 1) // 2  # position of the pair (row, row + 1) in row order
            clear = np.ones(len(i), dtype=bool)
            hit = banned[(banned >= start) & (banned < start + len(i))] - start
            clear[hit] = False
            clear &= ~((must[i] > 0) & (must[i] == must[j]) & ~(topscorer[i] | topscorer[j]))  # C.3
            row = stop
            both = member[i] & member[j]
            allowed = both & clear & ~(mdp[i] & mdp[j])
            which = np.full(len(i), -1, dtype=np.int64)
            a, b = i[allowed], j[allowed]
            which[allowed] = table.classes(profile[a] * n + profile[b],
                                           lambda k: solver.pair_cost(vx[a[k]], vx[b[k]]), memos[0])
            if exact and not br.last:  # both float and meet further down (only MDP-MDP pairs)
                for k in np.flatnonzero(both & clear & ~allowed).tolist():
                    which[k] = table.add(solver.lone(vx[i[k]]) + solver.lone(vx[j[k]]))
            down = member[i] & ~member[j] & clear
            meet = down & nxt[j]
            a, b = i[meet], j[meet]
            which[meet] = table.classes(a * (score.max() + 1) + score[b],
                                        lambda k: solver.below(vx[a[k]], vx[b[k]]), memos[1])
            lone = down & ~nxt[j]
            a = i[lone]
            which[lone] = table.classes(a, lambda k: solver.lone(vx[a[k]]), memos[2])
            rest = ~member[i] & clear
            both_next = rest & nxt[i] & nxt[j]
            a, b = i[both_next], j[both_next]
            which[both_next] = table.classes(
                score[a] * (score.max() + 1) + score[b],
                lambda k: solver.shared(("next pair", ent.score[vx[a[k]]], ent.score[vx[b[k]]]),
                                        lambda: next_pair_costs(ent, br, vx[a[k]], vx[b[k]])), memos[3])
            # Lower players meeting each other (exact form, whose PPB has no next group): no cost here.
            which[rest & ~nxt[i] & ~nxt[j]] = table.add(solver.shared(("nothing",), Counter))
            keep = which >= 0
            i, j = i[keep], j[keep]
            us.append(i)
            vs.append(j)
            whiches.append(which[keep])
            pairs.append(allowed[keep])
            ranks.append(np.abs(j - i - np.where(member[i] & member[j], half, 1)))
        empty = np.zeros(0, dtype=np.int64)
        return (np.concatenate(us) if us else empty, np.concatenate(vs) if vs else empty,
                np.concatenate(whiches) if whiches else empty,
                np.concatenate(pairs) if pairs else np.zeros(0, dtype=bool), np.concatenate(ranks) if ranks else empty)

    def _banned(self) -> IntArray:
        """Row-order positions of the vertex pairs that C.1 forbids (met before, or on the do-not-pair list)."""
        ent, idx, n = self.solver.ent, self.index, self.real
        out = []
        for a, p in enumerate(self.vertices):
            for q in ent.met[p]:
                b = idx.get(q)
                if b is not None and a < b:
                    out.append(a * (2 * n - a - 1) // 2 + b - a - 1)
        for f in ent.forbidden:
            ends = sorted(idx[p] for p in f if p in idx)
            if len(ends) == 2:
                a, b = ends
                out.append(a * (2 * n - a - 1) // 2 + b - a - 1)
        return np.array(out, dtype=np.int64)

    def optimise(self) -> bool:
        """Solve the quality layers; False when no perfect matching exists."""
        w = encode(self.u, self.v, self.which, self.table.costs)
        found = certified(self.n, self.u, self.v, w, self.rank <= PRUNE_WINDOW)
        if found is None:
            return False
        pairs, dual = found
        self._read(pairs)
        u, v = self.u, self.v
        tight = reduced_costs(u, v, w, dual) == 0
        crossings = np.zeros(len(u), dtype=np.int64)
        for group, z in dual.blossoms:
            if z > 0:
                inside = np.zeros(self.n, dtype=bool)
                inside[list(group)] = True
                crossings += inside[u] != inside[v]
        # An optimal matching uses tight edges only: the others can go.
        self.eu, self.ev, self.pen, self.near = u[tight], v[tight], crossings[tight], self.rank[tight] <= PRUNE_WINDOW
        pair = self.pair[tight]
        self.cu = self.eu % self.real if self.copies == 2 else self.eu
        self.cv = self.ev % self.real if self.copies == 2 else self.ev
        self.pu = np.where(pair, self.cu, -1)
        self.pv = np.where(pair, self.cv, -1)
        self.keep = np.ones(len(self.eu), dtype=bool)
        self.live = np.ones(self.n, dtype=bool)
        keys = np.minimum(self.eu, self.ev) * self.n + np.maximum(self.eu, self.ev)
        self._by_key = np.argsort(keys, kind="stable")
        self._keys = keys[self._by_key]
        ends = np.concatenate([self.eu, self.ev])
        order = np.argsort(ends, kind="stable")
        self._adj_ptr = np.searchsorted(ends[order], np.arange(self.n + 1))
        self._adj_to = np.concatenate([self.ev, self.eu])[order]
        self._adj_edge = np.concatenate([np.arange(len(self.eu))] * 2)[order]
        return True

    def _edge(self, a: int, b: int) -> int | None:
        """The index of the usable tight edge ``(a, b)`` (kept, both ends live), or None."""
        key = min(a, b) * self.n + max(a, b)
        at = int(np.searchsorted(self._keys, key))
        if at == len(self._keys) or self._keys[at] != key:
            return None
        k = int(self._by_key[at])
        return k if self.keep[k] and self.live[a] and self.live[b] else None

    def _mates(self) -> IntArray:
        """The current matching as an array (-1: no partner)."""
        mate = np.full(self.n, -1, dtype=np.int64)
        ends = np.fromiter(self.mate.keys(), dtype=np.int64, count=len(self.mate))
        mate[ends] = np.fromiter(self.mate.values(), dtype=np.int64, count=len(self.mate))
        return mate

    def _path(self, mate: IntArray, source: int, target: NDArray[np.bool_], seen: NDArray[np.bool_],
              allowed: NDArray[np.bool_], depth: int) -> list[int] | None:
        """An alternating path ``source c1 d1 ... u t`` to a ``target`` vertex, breadth first.

        Its edges alternate: unmatched (``source c1``, ..., ``u t``, each an ``allowed`` edge)
        and matched (``c1 d1``, ...); at most ``depth`` matched edges; no vertex of ``seen``
        (which the search marks) and none twice. A sufficient search only: it does not
        shrink blossoms, so a path found is real but one may be missed.
        """
        back: dict[int, tuple[int, int]] = {}  # a vertex reached by its matched edge: (where from, via)
        frontier = np.array([source], dtype=np.int64)
        for level in range(depth + 1):
            start, stop = self._adj_ptr[frontier], self._adj_ptr[frontier + 1]
            span = stop - start
            at = np.repeat(start - np.cumsum(span) + span, span) + np.arange(int(span.sum()))
            src = np.repeat(frontier, span)
            dst, edge = self._adj_to[at], self._adj_edge[at]
            ok = allowed[edge] & (mate[src] != dst) & ~seen[dst]
            src, dst = src[ok], dst[ok]
            hit = np.flatnonzero(target[dst])
            if len(hit):
                u = int(src[hit[0]])
                path = [int(dst[hit[0]]), u]
                while u != source:
                    u, via = back[u]
                    path += [via, u]
                return path[::-1]
            if level == depth:
                return None
            dst, first = np.unique(dst, return_index=True)
            src, nxt = src[first], mate[dst]
            fresh = (nxt >= 0) & ~seen[np.maximum(nxt, 0)]
            dst, src, nxt = dst[fresh], src[fresh], nxt[fresh]
            nxt, first = np.unique(nxt, return_index=True)
            dst, src = dst[first], src[first]
            if not len(nxt):
                return None
            seen[dst] = True
            seen[nxt] = True
            for d, via, u in zip(nxt.tolist(), dst.tolist(), src.tolist()):
                back[d] = (u, via)
            frontier = nxt
        return None

    def _penalty(self, pairs: Iterable[tuple[int, int]]) -> int | None:
        """The pairs' penalty summed over every copy (None: some pair is no usable edge)."""
        total = 0
        for a, b in pairs:
            for shift in range(self.copies):
                e = self._edge(a + shift * self.real, b + shift * self.real)
                if e is None:
                    return None
                total += int(self.pen[e])
        return total

    def swap_in(self, p: PlayerId, q: PlayerId) -> bool:
        """Give ``p`` the partner ``q`` by one alternating cycle, if that keeps the matching optimal.

        With ``p``'s partner ``a`` and ``q``'s partner ``b``, a path from ``b`` to ``a`` that leaves
        each vertex by an unmatched edge and goes on by its matched one (:meth:`_path`,
        :data:`REROUTE_DEPTH` matched edges at most, first copy only) closes the cycle
        ``p q b ... a p``; exchanging the cycle's matched and unmatched edges covers the same
        vertices. The current matching's first copy is optimal for the bracket, so is the doubled
        matching that repeats it in both copies (their floaters are common), and that one has the
        least penalty; the exchange, made in every copy, changes the penalty by the cycle's edges'
        penalties: when that change is not positive the new matching is optimal too. Only the
        first copy is rewritten (later solves start from it; the second copy's pairs are left, and
        those that lost a vertex are ignored). False: no such cycle was found, nothing changed.
        """
        x, y = self.index[p], self.index[q]
        a, b = self.mate[x], self.mate[y]
        top = self.real if self.copies == 2 else self.n
        if a == y or a >= top or b >= top:
            return False
        seen = ~self.live
        seen[top:] = True
        seen[[x, y, b]] = True
        target = np.zeros(self.n, dtype=bool)
        target[a] = True
        path = self._path(self._mates(), b, target, seen, self.keep, REROUTE_DEPTH)
        if path is None:
            return False
        cycle = [x, y, *path]  # x y b ... a: alternately unmatched (x y, b c1, ..., u a) and matched
        new = [(cycle[k], cycle[k + 1]) for k in range(0, len(cycle), 2)]
        old = [(cycle[k], cycle[(k + 1) % len(cycle)]) for k in range(1, len(cycle), 2)]
        gain, loss = self._penalty(new), self._penalty(old)
        if gain is None or loss is None or gain > loss:
            return False
        for c, d in new:
            self.mate[c], self.mate[d] = d, c
        return True

    def repair(self, banned: NDArray[np.bool_]) -> bool:
        """Change the matching so that it uses no ``banned`` edge and stays optimal, if found cheaply.

        The banned edges it uses are unmatched, and each vertex left without a partner is joined
        to another such vertex by an alternating path (:meth:`_path`) over edges not banned, which
        flipping adds to the matching. Accepted only when every vertex is matched again and the
        penalty did not grow (the matching is then optimal: the least penalty). Single graphs only
        (a doubled graph's copies would have to be repaired alike). False: nothing changed.
        """
        if self.copies != 1:
            return False
        mate = self._mates()
        live = np.flatnonzero(self.live)
        bad = [(int(a), int(mate[a])) for a in live
               if 0 <= mate[a] and a < mate[a] and (e := self._edge(int(a), int(mate[a]))) is not None and banned[e]]
        if not bad:
            return True
        before = self._penalty(bad)
        allowed = self.keep & ~banned
        open_ = np.zeros(self.n, dtype=bool)
        for a, b in bad:
            mate[a] = mate[b] = -1
            open_[a] = open_[b] = True
        added: list[tuple[int, int]] = []
        removed: list[tuple[int, int]] = []
        for r in [x for pair in bad for x in pair]:
            if not open_[r]:
                continue
            open_[r] = False
            seen = ~self.live
            seen[r] = True
            path = self._path(mate, r, open_, seen, allowed, self.n)
            if path is None:
                return False
            open_[path[-1]] = False
            for k in range(1, len(path) - 1, 2):
                removed.append((path[k], path[k + 1]))
            for k in range(0, len(path), 2):
                c, d = path[k], path[k + 1]
                mate[c], mate[d] = d, c
                added.append((c, d))
        gain, loss = self._penalty(added), self._penalty(removed)
        if before is None or gain is None or loss is None or gain > before + loss:
            return False
        for a in live.tolist():
            self.mate[a] = int(mate[a])
        return True

    def _read(self, pairs: Iterable[tuple[int, int]]) -> None:
        for a, b in pairs:
            self.mate[a], self.mate[b] = b, a

    def tiebreak(self, digits: NDArray[Any], limit: int, terms: Sequence[Term] = (), carry: bool = False) -> None:
        """Among the quality-optimal matchings left, one with the least digits (one value per edge).

        An edge's digits are ``digits`` plus, for each term ``(edges, d, scale)``,
        ``d[i] * scale`` on ``edges[i]`` (the transpositions' wide digits, kept as
        small integers and one scale per S1 player). ``limit`` exceeds the digits' sum
        over any matching, so one more penalty always outweighs them.

        ``carry`` (with ``terms``): the weights are ``(most penalty + 1) * limit`` less the cost, a
        ceiling that stays while the caller keeps ``limit`` from one solve to the next, so that the
        weights of the edges whose digits did not change stay too and the last solve's dual
        (flattened onto the vertices still live) starts this one: only the players whose digits
        changed start unmatched, more or less. Any ceiling gives the same optimum (every perfect
        matching has as many edges).
        """
        use = self.keep & self.live[self.eu] & self.live[self.ev]
        local = np.cumsum(self.live) - 1
        pen, part = self.pen[use], np.asarray(digits)[use]
        wide: blossom.Wide | None = None
        if terms:
            fixed = (int(self.pen.max(initial=0)) + 1) * limit if carry else None
            ceiling, wide = _wide(self.pen, limit, np.asarray(digits, dtype=np.int64), terms, use, fixed)
            if ceiling < SMALL:
                w: NDArray[Any] = wide.lo.astype(np.int64)
                wide = None
        elif part.dtype != object and (not len(part) or int(pen.max()) * limit + int(part.max()) < SMALL):
            cost: NDArray[Any] = pen * limit + part  # int64 without overflow: no Python integer per edge
            ceiling = (int(cost.max()) if len(cost) else 0) + 1
            w = ceiling - cost
        else:
            cost = pen.astype(object) * limit + part.astype(object)
            ceiling = (max(cost.tolist()) if len(cost) else 0) + 1
            w = ceiling - cost
        n, u, v = int(self.live.sum()), local[self.eu[use]], local[self.ev[use]]
        if ceiling < SMALL:  # the exchange steps' small weights: a pruned solve seeded with the current matching
            mate = self._mates()
            found = certified(n, u, v, w.astype(np.int64), (mate[self.eu[use]] == self.ev[use]) | self.near[use])
        else:  # the transpositions' wide digits: warm-started from the current matching
            warm = [(int(local[a]), int(local[b])) for a, b in self.mate.items()
                    if a < b and self.live[a] and self.live[b]]
            start = None
            if carry and self._carried is not None and self._carried[0] == ceiling:
                _, ids, flat = self._carried
                start = blossom.Dual([d for d, alive in zip(flat, self.live[ids].tolist()) if alive], [])
            found = blossom.perfect_matching_arrays(n, u, v, w if wide is None else wide, warm, start)
            if found is not None and carry:
                self._carried = ceiling, np.flatnonzero(self.live), found[1].flat()
        assert found is not None, "a quality-optimal matching survives every restriction"
        order = np.flatnonzero(self.live)
        self._read((int(order[a]), int(order[b])) for a, b in found[0])

    def drop(self, bad: NDArray[np.bool_]) -> None:
        """Remove the edges ``bad`` marks (the current matching uses none of them)."""
        self.keep &= ~bad

    def remove(self, players: Iterable[PlayerId]) -> None:
        """Take the players (a decided pair) out of every copy."""
        for p in players:
            i = self.index[p]
            self.live[i] = False
            if self.copies == 2:
                self.live[i + self.real] = False

    def partner(self, p: PlayerId, copy: int = 0) -> PlayerId | None:
        """``p``'s partner inside the bracket in the current matching (None: floats); ``copy`` 1: in the
        doubled graph's second copy."""
        m = self.mate[self.index[p] + copy * self.real] - copy * self.real
        return self.vertices[m] if 0 <= m < self.real and self.vertices[m] in self.solver.members else None


Term = tuple[IntArray, IntArray, int]
"""Wide digits ``d * scale`` on some edges (:meth:`BracketGraph.tiebreak`)."""
_LIMB = 40
_MASK = (1 << _LIMB) - 1


def _limbs3(x: int) -> tuple[int, int, int]:
    return x & _MASK, (x >> _LIMB) & _MASK, x >> 2 * _LIMB


def _carry(c: list[IntArray]) -> None:
    """Normalise three limbs in place: the lower two in ``[0, 2**40)``."""
    for k in (0, 1):
        up = c[k] >> _LIMB
        c[k] &= _MASK
        c[k + 1] += up


def _wide(pen: IntArray, limit: int, digits: IntArray, terms: Sequence[Term], use: NDArray[np.bool_],
          ceiling: int | None = None) -> tuple[int, blossom.Wide]:
    """``ceiling - (pen * limit + digits + terms)`` on the ``use`` edges, exactly, in int64 limbs.

    ``ceiling`` (default: the cost's maximum plus one, as the Python-integer route computes it)
    must exceed every cost. Every value is held as three 40-bit limbs (int64 columns) while it
    is summed; the terms' small factors keep every partial sum far inside int64.
    """
    assert int(pen.max(initial=0)) < 1 << 20 and int(digits.max(initial=0)) < 1 << _LIMB
    scale = _limbs3(limit)
    at = np.cumsum(use) - 1  # an edge's place among the ``use`` edges
    pen = pen[use]
    c = [digits[use] + pen * scale[0], pen * scale[1], pen * scale[2]]
    for edges, d, factor in terms:
        assert int(d.max(initial=0)) < 1 << 20 and bool(use[edges].all())
        for k, f in enumerate(_limbs3(factor)):
            c[k][at[edges]] += d * f
    _carry(c)
    if not len(c[0]):
        return 1, blossom.Wide(np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.uint64))
    top = int(np.lexsort((c[0], c[1], c[2]))[-1])
    most = (int(c[2][top]) << 2 * _LIMB) + (int(c[1][top]) << _LIMB) + int(c[0][top])
    assert ceiling is None or ceiling > most, "the ceiling must exceed every cost"
    ceiling = most + 1 if ceiling is None else ceiling
    w = [f - x for f, x in zip(_limbs3(ceiling), c)]
    _carry(w)
    low24 = (1 << 64 - _LIMB) - 1
    lo = w[0].astype(np.uint64) | ((w[1] & low24).astype(np.uint64) << np.uint64(_LIMB))
    return ceiling, blossom.Wide((w[1] >> (64 - _LIMB)) + (w[2] << (2 * _LIMB - 64)), lo)


def certified(n: int, u: IntArray, v: IntArray, w: AnyArray, seed: NDArray[np.bool_]
              ) -> tuple[list[tuple[int, int]], blossom.Dual] | None:
    """A maximum-weight perfect matching of ``(u, v, w)`` and its dual, solved on few edges (:data:`PRUNE`).

    The whole-round engine's repeated sparse solve (:func:`pairings.engine.sparse.certify`): start from
    the ``seed`` edges and each vertex's heaviest ones, solve, check the dual on every edge, add each
    vertex's most violated edges (twice as many after each failed check) and repeat; after
    :data:`PRUNE_ROUNDS` solves (or a subgraph without a perfect matching) the whole graph is solved.
    """
    if PRUNE and len(u) > 4 * n:
        keys = u * n + v
        order = np.argsort(keys, kind="stable")

        def weigh(i: IntArray, j: IntArray) -> AnyArray:
            return w[order[np.searchsorted(keys[order], i * n + j)]]

        failed = 0

        def pricing(dual: blossom.Dual) -> Priced:
            nonlocal failed
            rc = reduced_costs(u, v, w, dual)
            bad = rc < 0
            add = best_per_vertex(u, v, -rc, bad, PRUNE_ADD << failed)
            failed += 1
            tight = rc == 0
            return Priced(u[add], v[add], int(bad.sum()), u[tight], v[tight])

        score = w if w.dtype != object else w.astype(float)
        first = seed | best_per_vertex(u, v, score, np.ones(len(u), dtype=bool), PRUNE_BEST)
        graph = SparseGraph(n, weigh)
        graph.add(u[first], v[first], w[first])
        found = certify(graph, pricing, solves=PRUNE_ROUNDS)
        if found is not None:
            return list(found.pairs), found.dual
    return blossom.perfect_matching_arrays(n, u, v, w)

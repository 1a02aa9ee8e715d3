"""The search of Edmonds' blossom algorithm on named structures (the design both kernels share).

:mod:`pairings.engine.blossom` prepares a feasible dual and a matching of
tight edges; :class:`Search` turns them into a maximum-weight perfect
matching and an optimal dual. ``_blossom_c.c`` is the same design in C, with
the same names: one reading explains both, and on the same input both make
the same choices (the same matching, the same dual).

Formulation
-----------
The linear programme is Edmonds' description of the perfect matching
polytope (Edmonds 1965b): maximise ``w(M)`` subject to one matched edge per
vertex and at most ``(|B| - 1) / 2`` matched edges inside each odd set ``B``.
Its dual gives each vertex a free ``y_v`` and each odd set a ``z_B >= 0``
with reduced cost ``y_u + y_v + sum(z_B : u, v in B) - w_uv >= 0`` on every
edge. The primal-dual method (Edmonds 1965a; the weighted form as in Galil
1986, section 3, and Korte & Vygen, chapter 11) keeps the dual feasible, the
matched edges tight (reduced cost 0) and ``z_B > 0`` only on shrunken odd
sets (blossoms) with ``(|B| - 1) / 2`` matched edges inside, and adds one
matched edge per stage until the matching is perfect; complementary
slackness then proves it optimal.

A stage grows one alternating tree from one exposed vertex (the root) over
tight edges, with blossoms shrunk to single nodes. When no tight edge lets
the tree grow, the dual moves by ``delta``: ``y2`` (twice ``y``, see *Integers*)
of every vertex of an outer node loses ``delta``, of an inner node gains
it, and an outer blossom's ``z`` gains ``delta``, an inner blossom's loses
it (so no edge inside a blossom changes its reduced cost). The largest ``delta`` that keeps the dual feasible is set by
the first of four events (:class:`DualStep`): an edge from the tree to a
free node becomes tight (GROW, or AUGMENT when that node is exposed), an
edge between two outer nodes becomes tight (SHRINK: an odd cycle), or an
inner blossom's ``z`` reaches 0 (EXPAND). When none bounds ``delta`` the
dual objective is unbounded below (one more outer vertex than inner), so by
weak duality the graph has no perfect matching. Warm starts need no special
case: vertex duals are free, so any feasible dual and any matching of tight
edges is a valid start.

Integers
--------
``y2[v]`` is ``2 y_v`` and ``z[b]`` is ``z_B``, so the doubled reduced cost
of an edge between two top-level nodes is ``y2[u] + y2[v] - 2 w_uv`` (an
edge inside a blossom also counts ``2 z_B`` of each blossom holding both
ends; the search never prices one). Tree edges and blossom cycle edges are
tight, so every vertex of the tree has the parity of the root: an edge
between two outer nodes has an even reduced cost and every ``delta`` is an
integer.

Locality
--------
Everything a stage labels is listed (:attr:`Search.tree_nodes`,
:attr:`Search.tree_vertices`, :attr:`Search.reached`), so a stage costs what
its tree costs, not ``O(n)``: with a warm start that leaves few exposed
vertices the whole search is cheap.

References
----------
J. Edmonds (1965a), "Paths, trees, and flowers", Canadian J. Math. 17.
J. Edmonds (1965b), "Maximum matching and a polyhedron with 0,1-vertices",
J. Res. Nat. Bur. Standards 69B.
Z. Galil (1986), "Efficient algorithms for finding maximum matching in
graphs", ACM Computing Surveys 18.
B. Korte and J. Vygen, *Combinatorial Optimization: Theory and Algorithms*,
chapter 11 (weighted matching), Springer.
"""

from __future__ import annotations

from enum import IntEnum
from typing import Sequence

NONE = -1
"""No vertex, node or edge."""


class Label(IntEnum):
    """The place of a top-level node in the current stage's tree."""

    FREE = 0
    """Not in the tree (its dual does not move)."""
    OUTER = 1
    """At even distance from the root; its vertices' duals fall by ``delta``."""
    INNER = 2
    """At odd distance; its vertices' duals rise by ``delta``."""


FREE, OUTER, INNER = Label.FREE, Label.OUTER, Label.INNER


class DualStep(IntEnum):
    """What bounds a dual step, and what the search does after it."""

    UNBOUNDED = 0
    """Nothing: the dual is unbounded below and there is no perfect matching."""
    GROW = 1
    """An edge from an outer vertex to a free node with a matched base becomes tight: two new labels."""
    AUGMENT = 2
    """An edge from an outer vertex to an exposed free node becomes tight: the stage ends."""
    SHRINK = 3
    """An edge between two outer nodes becomes tight: the odd cycle becomes a blossom."""
    EXPAND = 4
    """An inner blossom's ``z`` reaches 0: it is dissolved into its cycle."""


class Search:
    """One solve: the blossom tree, the current stage's alternating tree, and the dual.

    Node ids: vertices ``0..n-1``, blossoms ``n..2n-1`` (ids are reused). For
    every structure below the comment states what always holds between two
    operations of the search.
    """

    def __init__(self, n: int, eu: Sequence[int], ev: Sequence[int], w: Sequence[int],
                 y2: list[int], mate: list[int]) -> None:
        self.n = n
        self.eu, self.ev, self.w = eu, ev, w
        # adjacency[v]: (edge, other end) of every edge at v, in edge order.
        self.adjacency: list[list[tuple[int, int]]] = [[] for _ in range(n)]
        for k in range(len(eu)):
            self.adjacency[eu[k]].append((k, ev[k]))
            self.adjacency[ev[k]].append((k, eu[k]))
        # y2[v] = 2 y_v; the dual is feasible on every edge.
        self.y2 = y2
        # z[b] = z_B >= 0 for a blossom id, > 0 for a top-level blossom between stages (a nested one
        # may keep 0); 0 for vertices and unused ids.
        self.z = [0] * (2 * n)
        # mate[v]: v's partner or NONE; matched edges are tight.
        self.mate = mate
        # parent[x]: the blossom whose cycle holds node x, NONE for a top-level node or an unused id.
        self.parent = [NONE] * (2 * n)
        # top[v]: the top-level node holding vertex v.
        self.top = list(range(n))
        # cycle[b]: the children of blossom b around its odd cycle, the one holding the base first.
        self.cycle: list[list[int]] = [[] for _ in range(2 * n)]
        # links[b][i] = (a, c): a tight edge with a in cycle[b][i] and c in the next child
        # (cyclically); it is matched exactly when i is odd, so only the base is matched outside b.
        self.links: list[list[tuple[int, int]]] = [[] for _ in range(2 * n)]
        # base[x]: the one vertex of node x not matched inside it (x itself for a vertex).
        self.base = list(range(n)) + [NONE] * n
        # members[b]: the vertices of blossom b, its children's members in cycle order at creation.
        self.members: list[list[int]] = [[v] for v in range(n)] + [[] for _ in range(n)]
        # unused: blossom ids not in use, the next one last.
        self.unused = list(range(2 * n - 1, n - 1, -1))
        # label[x]: meaningful for top-level nodes only; FREE outside the current stage.
        self.label = [Label.FREE] * (2 * n)
        # via_in[x], via_out[x]: for a labelled non-root node x, the tree edge to its parent node
        # (via_in in x, via_out in the parent node); an outer node's is its base's matched edge,
        # an inner node's is tight and unmatched. NONE for the root.
        self.via_in = [NONE] * (2 * n)
        self.via_out = [NONE] * (2 * n)
        # outer_edges[x]: for an outer top-level node, edges from it to other outer nodes, every
        # outer-outer edge of the tree being in the list of at least one of its two ends' nodes;
        # best_outer[x] is one of least reduced cost among them (NONE when the list is empty).
        self.outer_edges: list[list[int]] = [[] for _ in range(2 * n)]
        self.best_outer = [NONE] * (2 * n)
        # reach[v]: for a vertex not in an outer node, an edge of least reduced cost from an outer
        # vertex to v (NONE if none); the vertices having one are listed in reached.
        self.reach = [NONE] * n
        self.reached: list[int] = []
        # tree_nodes: every id labelled this stage, once (in_tree marks them); some may since have
        # become children, or been expanded: only top-level labelled entries are in the tree.
        self.tree_nodes: list[int] = []
        self.in_tree = [False] * (2 * n)
        # tree_vertices: every vertex of a node labelled this stage, once; its label is its top's.
        self.tree_vertices: list[int] = []
        self.vertex_in_tree = [False] * n
        # queue[head:]: outer vertices whose edges are not scanned yet.
        self.queue: list[int] = []
        self.head = 0
        # seen: outer nodes visited by shrink's walk towards the common ancestor (cleared after).
        self.seen = [False] * (2 * n)

    def slack(self, k: int) -> int:
        """The doubled reduced cost of edge ``k`` between two top-level nodes."""
        return self.y2[self.eu[k]] + self.y2[self.ev[k]] - 2 * self.w[k]

    def run(self) -> bool:
        """Augment from every exposed vertex in turn; False when there is no perfect matching."""
        for root in range(self.n):
            if self.mate[root] != NONE:
                continue
            self.label_node(self.top[root], Label.OUTER, NONE, NONE)
            while not self.scan_queue():
                kind, delta, arg = self.dual_step()
                if kind == DualStep.UNBOUNDED:
                    return False
                self.move_dual(delta)
                if self.take(kind, arg):
                    break
            self.end_stage()
        return True

    def label_node(self, x: int, label: Label, via_in: int, via_out: int) -> None:
        """Put top-level node ``x`` in the tree; an outer node's vertices wait to be scanned."""
        self.label[x] = label
        self.via_in[x], self.via_out[x] = via_in, via_out
        if not self.in_tree[x]:
            self.in_tree[x] = True
            self.tree_nodes.append(x)
        for v in self.members[x]:
            if not self.vertex_in_tree[v]:
                self.vertex_in_tree[v] = True
                self.tree_vertices.append(v)
            if label == Label.OUTER:
                self.queue.append(v)

    def scan_queue(self) -> bool:
        """Scan the waiting outer vertices' edges; True when the stage augmented."""
        top, label, y2, w, eu, ev, reach = self.top, self.label, self.y2, self.w, self.eu, self.ev, self.reach
        while self.head < len(self.queue):
            x = self.queue[self.head]
            self.head += 1
            for k, y in self.adjacency[x]:
                tx, ty = top[x], top[y]  # top[x] changes when a shrink swallows x's node
                if tx == ty:
                    continue
                s = y2[x] + y2[y] - 2 * w[k]
                if label[ty] == OUTER:
                    if s == 0:
                        self.shrink(x, y)
                    else:
                        self.note_outer(tx, k, s)
                else:
                    r = reach[y]
                    if r == NONE:
                        self.reached.append(y)
                        reach[y] = k
                    elif s < y2[eu[r]] + y2[ev[r]] - 2 * w[r]:
                        reach[y] = k
                    if s == 0 and label[ty] == FREE and self.grow(x, y):
                        return True
        return False

    def note_outer(self, x: int, k: int, s: int) -> None:
        """Record edge ``k`` (reduced cost ``s``) between outer node ``x`` and another outer node."""
        self.outer_edges[x].append(k)
        if self.best_outer[x] == NONE or s < self.slack(self.best_outer[x]):
            self.best_outer[x] = k

    def grow(self, x: int, y: int) -> bool:
        """Tight edge from outer vertex ``x`` to ``y`` in a free node: label it, or augment (True)."""
        ty = self.top[y]
        b = self.base[ty]
        if self.mate[b] == NONE:
            self.augment(x, y)
            return True
        self.label_node(ty, Label.INNER, y, x)
        m = self.mate[b]
        self.label_node(self.top[m], Label.OUTER, m, b)
        return False

    def dual_step(self) -> tuple[DualStep, int, int]:
        """The kind, size and edge (or blossom) of the largest feasible dual step."""
        kind, delta, arg = DualStep.UNBOUNDED, 0, NONE
        label, top, reach, y2, w, eu, ev = self.label, self.top, self.reach, self.y2, self.w, self.eu, self.ev
        for v in self.reached:
            if label[top[v]] == FREE:
                k = reach[v]
                s = y2[eu[k]] + y2[ev[k]] - 2 * w[k]
                if kind == DualStep.UNBOUNDED or s < delta:
                    kind, delta, arg = DualStep.GROW, s, k
        for x in self.tree_nodes:
            if self.parent[x] != NONE:
                continue
            if label[x] == Label.OUTER and self.best_outer[x] != NONE:
                s = self.slack(self.best_outer[x])
                assert s % 2 == 0, "odd reduced cost between two outer nodes"
                if kind == DualStep.UNBOUNDED or s // 2 < delta:
                    kind, delta, arg = DualStep.SHRINK, s // 2, self.best_outer[x]
            elif label[x] == Label.INNER and x >= self.n and (kind == DualStep.UNBOUNDED or self.z[x] < delta):
                kind, delta, arg = DualStep.EXPAND, self.z[x], x
        if kind == DualStep.GROW:
            _, y = self.outer_end(arg)
            if self.mate[self.base[top[y]]] == NONE:
                kind = DualStep.AUGMENT
        return kind, delta, arg

    def move_dual(self, delta: int) -> None:
        """Outer vertices' ``y2`` lose ``delta``, inner ones' gain it; top-level blossoms' ``z`` the other way."""
        if delta == 0:
            return
        label, top, y2, z = self.label, self.top, self.y2, self.z
        for v in self.tree_vertices:
            lab = label[top[v]]
            if lab == Label.OUTER:
                y2[v] -= delta
            elif lab == Label.INNER:
                y2[v] += delta
        for x in self.tree_nodes:
            if x >= self.n and self.parent[x] == NONE:
                if label[x] == Label.OUTER:
                    z[x] += delta
                elif label[x] == Label.INNER:
                    z[x] -= delta

    def take(self, kind: DualStep, arg: int) -> bool:
        """Act on the event that bounded the step; True when the stage augmented."""
        if kind == DualStep.EXPAND:
            self.expand(arg)
            return False
        x, y = self.outer_end(arg)
        if kind == DualStep.SHRINK:
            self.shrink(x, y)
            return False
        return self.grow(x, y)

    def outer_end(self, k: int) -> tuple[int, int]:
        """The ends of edge ``k``, the one in an outer node first."""
        u, v = self.eu[k], self.ev[k]
        return (u, v) if self.label[self.top[u]] == Label.OUTER else (v, u)

    def shrink(self, x: int, y: int) -> None:
        """Tight edge between outer vertices ``x`` and ``y`` of two nodes: make the odd cycle a blossom."""
        top, via_in, via_out, seen = self.top, self.via_in, self.via_out, self.seen
        tx, ty = top[x], top[y]
        # Walk up from both nodes, one outer ancestor per side in turn, until a walk meets a node
        # the other has seen: the nearest common ancestor (always outer: an inner node has one child).
        paths = ([tx], [ty])
        heads = [tx, ty]
        seen[tx] = seen[ty] = True
        ancestor, side = NONE, 0
        while ancestor == NONE:
            h = heads[side]
            if h != NONE and via_out[h] != NONE:
                inner = top[via_out[h]]
                outer = top[via_out[inner]]
                paths[side].append(inner)
                if seen[outer]:
                    ancestor = outer
                else:
                    seen[outer] = True
                    paths[side].append(outer)
                heads[side] = outer
            else:
                heads[side] = NONE
            side ^= 1
        for path in paths:
            for node in path:
                seen[node] = False
        side_x, side_y = (p[:p.index(ancestor)] if ancestor in p else p for p in paths)
        cycle = [ancestor] + side_x[::-1] + side_y
        links = [(via_out[c], via_in[c]) for c in reversed(side_x)] + [(x, y)] + \
                [(via_in[c], via_out[c]) for c in side_y]
        b = self.unused.pop()
        self.cycle[b], self.links[b] = cycle, links
        self.base[b], self.z[b], self.parent[b] = self.base[ancestor], 0, NONE
        self.members[b] = [v for c in cycle for v in self.members[c]]
        for c in cycle:
            self.parent[c] = b
        for v in self.members[b]:
            top[v] = b
        self.replace_in_tree(b, ancestor)
        for c in cycle:
            if self.label[c] == Label.INNER:  # its vertices are outer now
                self.queue.extend(self.members[c])
        self.merge_outer_edges(b)

    def replace_in_tree(self, b: int, ancestor: int) -> None:
        """A new blossom takes its ancestor's place in the tree (an outer node, already listed vertices)."""
        self.label[b] = Label.OUTER
        self.via_in[b], self.via_out[b] = self.via_in[ancestor], self.via_out[ancestor]
        if not self.in_tree[b]:
            self.in_tree[b] = True
            self.tree_nodes.append(b)

    def merge_outer_edges(self, b: int) -> None:
        """The outer children's edge lists become ``b``'s: one edge of least reduced cost per other node."""
        pick: dict[int, int] = {}
        top, eu, ev = self.top, self.eu, self.ev
        for c in self.cycle[b]:
            if self.label[c] != Label.OUTER:
                continue
            for k in self.outer_edges[c]:
                other = top[eu[k]] if top[eu[k]] != b else top[ev[k]]
                if other != b and (other not in pick or self.slack(k) < self.slack(pick[other])):
                    pick[other] = k
            self.outer_edges[c], self.best_outer[c] = [], NONE
        self.outer_edges[b] = list(pick.values())
        self.best_outer[b] = NONE
        for k in self.outer_edges[b]:
            if self.best_outer[b] == NONE or self.slack(k) < self.slack(self.best_outer[b]):
                self.best_outer[b] = k

    def child_holding(self, b: int, v: int) -> int:
        """The child of blossom ``b`` that holds vertex ``v``."""
        x = v
        while self.parent[x] != b:
            x = self.parent[x]
        return x

    def expand(self, b: int) -> None:
        """Dissolve inner blossom ``b`` (``z = 0``): the even path of its cycle stays in the tree."""
        cycle, links = self.cycle[b], self.links[b]
        k = len(cycle)
        entry, parent_end = self.via_in[b], self.via_out[b]
        j = cycle.index(self.child_holding(b, entry))
        for c in cycle:
            self.parent[c] = NONE
            self.label[c] = Label.FREE
            for v in self.members[c]:
                self.top[v] = c
        self.label_node(cycle[j], Label.INNER, entry, parent_end)
        # From the entry child to the base child along the side with an even number of edges.
        if j % 2 == 0:
            hops = [(cycle[i], links[i][0], links[i][1]) for i in range(j - 1, -1, -1)]
        else:
            hops = [(cycle[(i + 1) % k], links[i][1], links[i][0]) for i in range(j, k)]
        for t, (c, inside, outside) in enumerate(hops):
            self.label_node(c, Label.OUTER if t % 2 == 0 else Label.INNER, inside, outside)
        self.release(b)

    def release(self, b: int) -> None:
        """Blossom id ``b`` is unused again."""
        self.cycle[b], self.links[b], self.members[b] = [], [], []
        self.base[b], self.parent[b], self.label[b], self.z[b] = NONE, NONE, Label.FREE, 0
        self.outer_edges[b], self.best_outer[b] = [], NONE
        self.unused.append(b)

    def rebase(self, b: int, v: int) -> None:
        """Make vertex ``v`` the base of node ``b``: flip the even path from its child to the base child.

        Nested blossoms are handled from an explicit list of (node, new base)
        tasks; each task changes only its own node, so their order is free.
        """
        tasks = [(b, v)]
        while tasks:
            b, v = tasks.pop()
            if b < self.n:
                continue
            cycle, links = self.cycle[b], self.links[b]
            k = len(cycle)
            j = cycle.index(self.child_holding(b, v))
            tasks.append((cycle[j], v))
            for i in (range(0, j, 2) if j % 2 == 0 else range(j + 1, k, 2)):
                a, c = links[i]
                tasks.append((cycle[i], a))
                tasks.append((cycle[(i + 1) % k], c))
                self.mate[a], self.mate[c] = c, a
            self.cycle[b], self.links[b] = cycle[j:] + cycle[:j], links[j:] + links[:j]
            self.base[b] = v

    def augment(self, x: int, y: int) -> None:
        """Match the tight edge ``xy`` (``x`` outer, ``y`` exposed) and flip the tree path to the root."""
        top = self.top
        self.rebase(top[y], y)
        while True:
            tx = top[x]
            self.rebase(tx, x)
            self.mate[x], self.mate[y] = y, x
            if self.via_out[tx] == NONE:
                return
            inner = top[self.via_out[tx]]
            x, y = self.via_out[inner], self.via_in[inner]
            self.rebase(inner, y)

    def end_stage(self) -> None:
        """Dissolve the stage's top-level blossoms of ``z = 0`` and clear its labels and lists."""
        for x in self.tree_nodes:
            if x >= self.n and self.parent[x] == NONE and self.cycle[x] and self.z[x] == 0:
                self.dissolve(x)
        for x in self.tree_nodes:
            self.label[x], self.in_tree[x] = Label.FREE, False
            self.outer_edges[x], self.best_outer[x] = [], NONE
        for v in self.reached:
            self.reach[v] = NONE
        for v in self.tree_vertices:
            self.vertex_in_tree[v] = False
        self.tree_nodes, self.reached, self.tree_vertices, self.queue, self.head = [], [], [], [], 0

    def dissolve(self, b: int) -> None:
        """Release top-level blossom ``b`` and, nested in it, every blossom of ``z = 0``."""
        work = [b]
        while work:
            b = work.pop()
            for c in self.cycle[b]:
                self.parent[c] = NONE
                self.label[c] = Label.FREE
                if c >= self.n and self.z[c] == 0:
                    work.append(c)
                else:
                    for v in self.members[c]:
                        self.top[v] = c
            self.release(b)

    def blossoms(self) -> list[tuple[frozenset[int], int]]:
        """(vertices, z) of every blossom with ``z > 0``, by id."""
        return [(frozenset(self.members[b]), self.z[b]) for b in range(self.n, 2 * self.n)
                if self.cycle[b] and self.z[b] > 0]

/* Maximum-weight perfect matching with its optimal dual: the compiled twin of
 * pairings/engine/edmonds.py (Edmonds' blossom algorithm).
 *
 * Same design, same names: struct Search holds the structures of edmonds.Search (each with the
 * invariant it keeps, stated there and repeated here), and each function below is the method of
 * the same name. edmonds.py's module notes give the formulation (the primal-dual method of
 * Edmonds 1965, in the weighted form of Galil 1986 and Korte & Vygen, chapter 11), the doubled
 * integer duals and the locality of a stage. On the same input both make the same choices: the
 * same lists in the same order, the same strict comparisons, the same blossom ids.
 *
 * What C does its own way, without changing a choice:
 * - a blossom's members are a chain through member_next from first_member to last_member (the
 *   children's chains joined in cycle order when it is made: the order of edmonds.py's list),
 *   so memory stays O(n + m);
 * - no recursion: rebase and dissolve work from explicit task arrays, as in edmonds.py;
 * - arithmetic is __int128: every |w| < 2**118 and every dual stays below 2**124 in absolute
 *   value (checked where a dual is set or moved), so no reduced cost can overflow; beyond that
 *   the kernel raises Unsupported and blossom.py runs the Python search instead.
 *
 * The search runs without the GIL. Buffers in and out: int64 values in native byte order,
 * int128 values as 16 bytes little-endian two's complement (see solve()'s docstring).
 *
 * References
 * J. Edmonds, "Paths, trees, and flowers", Canadian J. Math. 17 (1965).
 * J. Edmonds, "Maximum matching and a polyhedron with 0,1-vertices",
 * J. Res. Nat. Bur. Standards 69B (1965).
 * Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
 * ACM Computing Surveys 18 (1986).
 * B. Korte and J. Vygen, Combinatorial Optimization, chapter 11 (weighted matching).
 */
#define PY_SSIZE_T_CLEAN
#include <Python.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

typedef __int128 i128;
typedef unsigned __int128 u128;
typedef int32_t idx; /* a vertex, node or edge id */

#define NONE (-1)
#define WEIGHT_LIMIT ((i128)1 << 118)
#define DUAL_LIMIT ((i128)1 << 124)
#define MAX_VERTICES ((Py_ssize_t)1 << 28)
#define MAX_EDGES ((Py_ssize_t)1 << 29)

typedef enum { FREE = 0, OUTER = 1, INNER = 2 } Label;                          /* edmonds.Label */
typedef enum { UNBOUNDED = 0, GROW = 1, AUGMENT = 2, SHRINK = 3, EXPAND = 4 } DualStep; /* .DualStep */
enum { OK = 0, FAIL_MEMORY = 1, FAIL_RANGE = 2, FAIL_INTERNAL = 3 };

static PyObject *Unsupported; /* values out of range: the caller runs the Python search */

/* A cycle edge of a blossom: a in cycle[i], c in the next child (cyclically). */
typedef struct {
    idx a, c;
} Link;

/* A growable list of edge ids. */
typedef struct {
    idx *at;
    idx len, cap;
} EdgeList;

typedef struct {
    idx n;
    Py_ssize_t m;
    idx *eu, *ev;             /* m: the ends of each edge */
    i128 *w;                  /* m */
    idx *adj_start;           /* n + 1: adjacency of v is adj_edge/adj_other[adj_start[v]..], edge order */
    idx *adj_edge, *adj_other;
    i128 *y2;                 /* n: 2 y_v; the dual is feasible on every edge */
    i128 *z;                  /* 2n: z_B >= 0 for a blossom id, > 0 top-level between stages */
    idx *mate;                /* n: partner or NONE; matched edges are tight */
    idx *parent;              /* 2n: the blossom whose cycle holds the node, NONE for top-level/unused */
    idx *top;                 /* n: the top-level node holding each vertex */
    idx **cycle;              /* 2n: children around the odd cycle, the one holding the base first */
    Link **links;             /* 2n: links[b][i] matched exactly when i is odd */
    idx *cycle_len;           /* 2n */
    idx *base;                /* 2n: the one vertex of the node not matched inside it */
    idx *first_member, *last_member; /* 2n: the node's vertices, a chain through member_next */
    idx *member_next;         /* n */
    idx *unused;              /* blossom ids not in use, the next one last */
    idx nunused;
    int8_t *label;            /* 2n: meaningful for top-level nodes; FREE outside the stage */
    idx *via_in, *via_out;    /* 2n: tree edge of a labelled non-root node to its parent node */
    EdgeList *outer_edges;    /* 2n: edges from an outer top-level node to other outer nodes */
    idx *best_outer;          /* 2n: one of least reduced cost among them, or NONE */
    idx *reach;               /* n: least-cost edge from an outer vertex to a non-outer vertex */
    idx *reached;             /* the vertices with a reach edge */
    idx nreached;
    idx *tree_nodes;          /* every id labelled this stage, once (in_tree marks them) */
    char *in_tree;
    idx ntree_nodes;
    idx *tree_vertices;       /* every vertex of a node labelled this stage, once */
    char *vertex_in_tree;
    idx ntree_vertices;
    idx *queue;               /* queue[head..len): outer vertices not scanned yet (each once a stage) */
    idx head, queue_len;
    char *seen;               /* 2n: outer nodes visited by shrink's walk (cleared after) */
    /* scratch */
    idx *path_x, *path_y;     /* 2n each: shrink's two walks */
    idx *pick, *pick_order;   /* 2n each: merge_outer_edges, one edge per other node */
    idx *tasks;               /* 2 * 2n: rebase's (node, vertex) tasks, or dissolve's nodes */
    idx *spare_nodes;         /* n: rotating a cycle */
    Link *spare_links;        /* n */
    int fail;
} Search;

static void *alloc(size_t count, size_t size) { return calloc(count ? count : 1, size); }

static inline i128 slack(const Search *s, idx k) { return s->y2[s->eu[k]] + s->y2[s->ev[k]] - 2 * s->w[k]; }

static inline void check_dual(Search *s, i128 x) {
    if (x >= DUAL_LIMIT || x <= -DUAL_LIMIT) s->fail = FAIL_RANGE;
}

/* Members of node x: for (v = first_member[x]; v != NONE; v = next_member(s, x, v)). */
static inline idx next_member(const Search *s, idx x, idx v) {
    return v == s->last_member[x] ? NONE : s->member_next[v];
}

static int edges_push(EdgeList *list, idx k) {
    if (list->len == list->cap) {
        idx cap = list->cap ? 2 * list->cap : 8;
        idx *at = realloc(list->at, (size_t)cap * sizeof(idx));
        if (!at) return -1;
        list->at = at;
        list->cap = cap;
    }
    list->at[list->len++] = k;
    return 0;
}

static void edges_clear(EdgeList *list) {
    free(list->at);
    list->at = NULL;
    list->len = list->cap = 0;
}

/* Each vertex turns outer at most once a stage, so the queue never holds more than n. */
static inline void enqueue(Search *s, idx v) {
    if (s->queue_len < s->n)
        s->queue[s->queue_len++] = v;
    else
        s->fail = FAIL_INTERNAL;
}

static void label_node(Search *s, idx x, Label label, idx via_in, idx via_out) {
    s->label[x] = (int8_t)label;
    s->via_in[x] = via_in;
    s->via_out[x] = via_out;
    if (!s->in_tree[x]) {
        s->in_tree[x] = 1;
        s->tree_nodes[s->ntree_nodes++] = x;
    }
    for (idx v = s->first_member[x]; v != NONE; v = next_member(s, x, v)) {
        if (!s->vertex_in_tree[v]) {
            s->vertex_in_tree[v] = 1;
            s->tree_vertices[s->ntree_vertices++] = v;
        }
        if (label == OUTER) enqueue(s, v);
    }
}

static void note_outer(Search *s, idx x, idx k, i128 sl) {
    if (edges_push(&s->outer_edges[x], k)) {
        s->fail = FAIL_MEMORY;
        return;
    }
    if (s->best_outer[x] == NONE || sl < slack(s, s->best_outer[x])) s->best_outer[x] = k;
}

static idx child_holding(const Search *s, idx b, idx v) {
    idx x = v;
    while (s->parent[x] != b) x = s->parent[x];
    return x;
}

static idx index_in_cycle(const Search *s, idx b, idx c) {
    idx j = 0;
    while (s->cycle[b][j] != c) j++;
    return j;
}

static void release(Search *s, idx b) {
    free(s->cycle[b]);
    free(s->links[b]);
    s->cycle[b] = NULL;
    s->links[b] = NULL;
    s->cycle_len[b] = 0;
    s->first_member[b] = s->last_member[b] = NONE;
    s->base[b] = s->parent[b] = NONE;
    s->label[b] = FREE;
    s->z[b] = 0;
    edges_clear(&s->outer_edges[b]);
    s->best_outer[b] = NONE;
    s->unused[s->nunused++] = b;
}

/* Make vertex v the base of node b; each task changes only its own node. */
static void rebase(Search *s, idx b0, idx v0) {
    idx *tasks = s->tasks, ntasks = 0;
    tasks[ntasks++] = b0;
    tasks[ntasks++] = v0;
    while (ntasks) {
        idx v = tasks[--ntasks], b = tasks[--ntasks];
        if (b < s->n) continue;
        idx *cycle = s->cycle[b], k = s->cycle_len[b];
        Link *links = s->links[b];
        idx j = index_in_cycle(s, b, child_holding(s, b, v));
        tasks[ntasks++] = cycle[j];
        tasks[ntasks++] = v;
        for (idx i = (j % 2 == 0) ? 0 : j + 1; i < ((j % 2 == 0) ? j : k); i += 2) {
            idx a = links[i].a, c = links[i].c;
            tasks[ntasks++] = cycle[i];
            tasks[ntasks++] = a;
            tasks[ntasks++] = cycle[(i + 1) % k];
            tasks[ntasks++] = c;
            s->mate[a] = c;
            s->mate[c] = a;
        }
        for (idx i = 0; i < k; i++) {
            s->spare_nodes[i] = cycle[(i + j) % k];
            s->spare_links[i] = links[(i + j) % k];
        }
        memcpy(cycle, s->spare_nodes, (size_t)k * sizeof(idx));
        memcpy(links, s->spare_links, (size_t)k * sizeof(Link));
        s->base[b] = v;
    }
}

static void augment(Search *s, idx x, idx y) {
    rebase(s, s->top[y], y);
    for (;;) {
        idx tx = s->top[x];
        rebase(s, tx, x);
        s->mate[x] = y;
        s->mate[y] = x;
        if (s->via_out[tx] == NONE) return;
        idx inner = s->top[s->via_out[tx]];
        x = s->via_out[inner];
        y = s->via_in[inner];
        rebase(s, inner, y);
    }
}

/* 1 when the stage augmented. */
static int grow(Search *s, idx x, idx y) {
    idx ty = s->top[y], b = s->base[ty];
    if (s->mate[b] == NONE) {
        augment(s, x, y);
        return 1;
    }
    label_node(s, ty, INNER, y, x);
    idx m = s->mate[b];
    label_node(s, s->top[m], OUTER, m, b);
    return 0;
}

static void replace_in_tree(Search *s, idx b, idx ancestor) {
    s->label[b] = OUTER;
    s->via_in[b] = s->via_in[ancestor];
    s->via_out[b] = s->via_out[ancestor];
    if (!s->in_tree[b]) {
        s->in_tree[b] = 1;
        s->tree_nodes[s->ntree_nodes++] = b;
    }
}

static void merge_outer_edges(Search *s, idx b) {
    idx npick = 0;
    for (idx q = 0; q < s->cycle_len[b]; q++) {
        idx c = s->cycle[b][q];
        if (s->label[c] != OUTER) continue;
        EdgeList *list = &s->outer_edges[c];
        for (idx e = 0; e < list->len; e++) {
            idx k = list->at[e];
            idx other = s->top[s->eu[k]] != b ? s->top[s->eu[k]] : s->top[s->ev[k]];
            if (other == b) continue;
            if (s->pick[other] == NONE) {
                s->pick_order[npick++] = other;
                s->pick[other] = k;
            } else if (slack(s, k) < slack(s, s->pick[other])) {
                s->pick[other] = k;
            }
        }
        edges_clear(list);
        s->best_outer[c] = NONE;
    }
    edges_clear(&s->outer_edges[b]);
    s->best_outer[b] = NONE;
    for (idx q = 0; q < npick; q++) {
        idx k = s->pick[s->pick_order[q]];
        s->pick[s->pick_order[q]] = NONE;
        if (!s->fail && edges_push(&s->outer_edges[b], k)) s->fail = FAIL_MEMORY;
        if (s->best_outer[b] == NONE || slack(s, k) < slack(s, s->best_outer[b])) s->best_outer[b] = k;
    }
}

static void shrink(Search *s, idx x, idx y) {
    idx *top = s->top, *via_in = s->via_in, *via_out = s->via_out;
    idx tx = top[x], ty = top[y];
    idx *paths[2] = {s->path_x, s->path_y}, lens[2] = {1, 1}, heads[2] = {tx, ty};
    paths[0][0] = tx;
    paths[1][0] = ty;
    s->seen[tx] = s->seen[ty] = 1;
    idx ancestor = NONE;
    int side = 0;
    while (ancestor == NONE) {
        idx h = heads[side];
        if (h != NONE && via_out[h] != NONE) {
            idx inner = top[via_out[h]], outer = top[via_out[inner]];
            paths[side][lens[side]++] = inner;
            if (s->seen[outer]) {
                ancestor = outer;
            } else {
                s->seen[outer] = 1;
                paths[side][lens[side]++] = outer;
            }
            heads[side] = outer;
        } else {
            heads[side] = NONE;
        }
        side ^= 1;
    }
    for (int p = 0; p < 2; p++) {
        idx cut = lens[p];
        for (idx i = 0; i < lens[p]; i++) {
            s->seen[paths[p][i]] = 0;
            if (paths[p][i] == ancestor && cut == lens[p]) cut = i;
        }
        lens[p] = cut; /* the walk up to the ancestor, exclusive */
    }
    idx *side_x = paths[0], *side_y = paths[1], nx = lens[0], ny = lens[1], k = 1 + nx + ny;
    idx b = s->unused[--s->nunused];
    idx *cycle = malloc((size_t)k * sizeof(idx));
    Link *links = malloc((size_t)k * sizeof(Link));
    if (!cycle || !links) {
        free(cycle);
        free(links);
        s->unused[s->nunused++] = b;
        s->fail = FAIL_MEMORY;
        return;
    }
    idx q = 0;
    cycle[q] = ancestor;
    for (idx i = nx - 1; i >= 0; i--) {
        idx c = side_x[i];
        links[q] = (Link){via_out[c], via_in[c]};
        cycle[++q] = c;
    }
    links[q] = (Link){x, y};
    for (idx i = 0; i < ny; i++) {
        idx c = side_y[i];
        cycle[++q] = c;
        links[q] = (Link){via_in[c], via_out[c]};
    }
    s->cycle[b] = cycle;
    s->links[b] = links;
    s->cycle_len[b] = k;
    s->base[b] = s->base[ancestor];
    s->z[b] = 0;
    s->parent[b] = NONE;
    s->first_member[b] = s->first_member[cycle[0]];
    s->last_member[b] = s->last_member[cycle[k - 1]];
    for (idx i = 0; i + 1 < k; i++) s->member_next[s->last_member[cycle[i]]] = s->first_member[cycle[i + 1]];
    for (idx i = 0; i < k; i++) s->parent[cycle[i]] = b;
    for (idx v = s->first_member[b]; v != NONE; v = next_member(s, b, v)) top[v] = b;
    replace_in_tree(s, b, ancestor);
    for (idx i = 0; i < k; i++) {
        idx c = cycle[i];
        if (s->label[c] == INNER)
            for (idx v = s->first_member[c]; v != NONE; v = next_member(s, c, v)) enqueue(s, v);
    }
    merge_outer_edges(s, b);
}

static void expand(Search *s, idx b) {
    idx *cycle = s->cycle[b], k = s->cycle_len[b];
    Link *links = s->links[b];
    idx entry = s->via_in[b], parent_end = s->via_out[b];
    idx j = index_in_cycle(s, b, child_holding(s, b, entry));
    for (idx i = 0; i < k; i++) {
        idx c = cycle[i];
        s->parent[c] = NONE;
        s->label[c] = FREE;
        for (idx v = s->first_member[c]; v != NONE; v = next_member(s, c, v)) s->top[v] = c;
    }
    label_node(s, cycle[j], INNER, entry, parent_end);
    idx t = 0;
    if (j % 2 == 0) {
        for (idx i = j - 1; i >= 0; i--, t++)
            label_node(s, cycle[i], t % 2 == 0 ? OUTER : INNER, links[i].a, links[i].c);
    } else {
        for (idx i = j; i < k; i++, t++)
            label_node(s, cycle[(i + 1) % k], t % 2 == 0 ? OUTER : INNER, links[i].c, links[i].a);
    }
    release(s, b);
}

/* 1 when the stage augmented. */
static int scan_queue(Search *s) {
    idx *top = s->top;
    int8_t *label = s->label;
    while (s->head < s->queue_len) {
        idx x = s->queue[s->head++];
        for (idx e = s->adj_start[x]; e < s->adj_start[x + 1]; e++) {
            idx k = s->adj_edge[e], y = s->adj_other[e];
            idx tx = top[x], ty = top[y]; /* top[x] changes when a shrink swallows x's node */
            if (tx == ty) continue;
            i128 sl = s->y2[x] + s->y2[y] - 2 * s->w[k];
            if (label[ty] == OUTER) {
                if (sl == 0)
                    shrink(s, x, y);
                else
                    note_outer(s, tx, k, sl);
            } else {
                if (s->reach[y] == NONE || sl < slack(s, s->reach[y])) {
                    if (s->reach[y] == NONE) s->reached[s->nreached++] = y;
                    s->reach[y] = k;
                }
                if (sl == 0 && label[ty] == FREE && grow(s, x, y)) return 1;
            }
            if (s->fail) return 0;
        }
    }
    return 0;
}

static inline void outer_end(const Search *s, idx k, idx *x, idx *y) {
    idx u = s->eu[k], v = s->ev[k];
    if (s->label[s->top[u]] == OUTER) {
        *x = u;
        *y = v;
    } else {
        *x = v;
        *y = u;
    }
}

static DualStep dual_step(Search *s, i128 *delta_out, idx *arg_out) {
    DualStep kind = UNBOUNDED;
    i128 delta = 0;
    idx arg = NONE;
    for (idx q = 0; q < s->nreached; q++) {
        idx v = s->reached[q];
        if (s->label[s->top[v]] == FREE) {
            i128 sl = slack(s, s->reach[v]);
            if (kind == UNBOUNDED || sl < delta) {
                kind = GROW;
                delta = sl;
                arg = s->reach[v];
            }
        }
    }
    for (idx q = 0; q < s->ntree_nodes; q++) {
        idx x = s->tree_nodes[q];
        if (s->parent[x] != NONE) continue;
        if (s->label[x] == OUTER && s->best_outer[x] != NONE) {
            i128 sl = slack(s, s->best_outer[x]);
            if (sl % 2) {
                s->fail = FAIL_INTERNAL;
                return UNBOUNDED;
            }
            if (kind == UNBOUNDED || sl / 2 < delta) {
                kind = SHRINK;
                delta = sl / 2;
                arg = s->best_outer[x];
            }
        } else if (s->label[x] == INNER && x >= s->n && (kind == UNBOUNDED || s->z[x] < delta)) {
            kind = EXPAND;
            delta = s->z[x];
            arg = x;
        }
    }
    if (kind == GROW) {
        idx x, y;
        outer_end(s, arg, &x, &y);
        if (s->mate[s->base[s->top[y]]] == NONE) kind = AUGMENT;
    }
    *delta_out = delta;
    *arg_out = arg;
    return kind;
}

static void move_dual(Search *s, i128 delta) {
    if (delta == 0) return;
    for (idx q = 0; q < s->ntree_vertices; q++) {
        idx v = s->tree_vertices[q];
        int8_t lab = s->label[s->top[v]];
        if (lab == OUTER)
            s->y2[v] -= delta;
        else if (lab == INNER)
            s->y2[v] += delta;
        else
            continue;
        check_dual(s, s->y2[v]);
    }
    for (idx q = 0; q < s->ntree_nodes; q++) {
        idx x = s->tree_nodes[q];
        if (x >= s->n && s->parent[x] == NONE) {
            if (s->label[x] == OUTER)
                s->z[x] += delta;
            else if (s->label[x] == INNER)
                s->z[x] -= delta;
            check_dual(s, s->z[x]);
        }
    }
}

/* 1 when the stage augmented. */
static int take(Search *s, DualStep kind, idx arg) {
    if (kind == EXPAND) {
        expand(s, arg);
        return 0;
    }
    idx x, y;
    outer_end(s, arg, &x, &y);
    if (kind == SHRINK) {
        shrink(s, x, y);
        return 0;
    }
    return grow(s, x, y);
}

static void dissolve(Search *s, idx b0) {
    idx *work = s->tasks, nwork = 0;
    work[nwork++] = b0;
    while (nwork) {
        idx b = work[--nwork];
        for (idx i = 0; i < s->cycle_len[b]; i++) {
            idx c = s->cycle[b][i];
            s->parent[c] = NONE;
            s->label[c] = FREE;
            if (c >= s->n && s->z[c] == 0)
                work[nwork++] = c;
            else
                for (idx v = s->first_member[c]; v != NONE; v = next_member(s, c, v)) s->top[v] = c;
        }
        release(s, b);
    }
}

static void end_stage(Search *s) {
    for (idx q = 0; q < s->ntree_nodes; q++) {
        idx x = s->tree_nodes[q];
        if (x >= s->n && s->parent[x] == NONE && s->cycle_len[x] && s->z[x] == 0) dissolve(s, x);
    }
    for (idx q = 0; q < s->ntree_nodes; q++) {
        idx x = s->tree_nodes[q];
        s->label[x] = FREE;
        s->in_tree[x] = 0;
        edges_clear(&s->outer_edges[x]);
        s->best_outer[x] = NONE;
    }
    for (idx q = 0; q < s->nreached; q++) s->reach[s->reached[q]] = NONE;
    for (idx q = 0; q < s->ntree_vertices; q++) s->vertex_in_tree[s->tree_vertices[q]] = 0;
    s->ntree_nodes = s->nreached = s->ntree_vertices = s->queue_len = s->head = 0;
}

/* 1: perfect matching found; 0: none exists; -1: s->fail says why. */
static int run(Search *s) {
    for (idx root = 0; root < s->n; root++) {
        if (s->mate[root] != NONE) continue;
        label_node(s, s->top[root], OUTER, NONE, NONE);
        while (!scan_queue(s)) {
            if (s->fail) return -1;
            i128 delta;
            idx arg;
            DualStep kind = dual_step(s, &delta, &arg);
            if (s->fail) return -1;
            if (kind == UNBOUNDED) return 0;
            move_dual(s, delta);
            if (s->fail) return -1;
            if (take(s, kind, arg)) break;
            if (s->fail) return -1;
        }
        if (s->fail) return -1;
        end_stage(s);
    }
    return 1;
}

/* ---- set-up, the start of blossom.python_perfect_matching, and the Python entry point ---- */

#define SEARCH_ARRAYS(s)                                                                              \
    {(s)->eu, (s)->ev, (s)->w, (s)->adj_start, (s)->adj_edge, (s)->adj_other, (s)->y2, (s)->z,          \
     (s)->mate, (s)->parent, (s)->top, (s)->cycle, (s)->links, (s)->cycle_len, (s)->base,              \
     (s)->first_member, (s)->last_member, (s)->member_next, (s)->unused, (s)->label, (s)->via_in,      \
     (s)->via_out, (s)->outer_edges, (s)->best_outer, (s)->reach, (s)->reached, (s)->tree_nodes,       \
     (s)->in_tree, (s)->tree_vertices, (s)->vertex_in_tree, (s)->queue, (s)->seen, (s)->path_x,        \
     (s)->path_y, (s)->pick, (s)->pick_order, (s)->tasks, (s)->spare_nodes, (s)->spare_links}

static void search_free(Search *s) {
    for (Py_ssize_t b = 0; b < 2 * (Py_ssize_t)s->n; b++) {
        if (s->cycle) free(s->cycle[b]);
        if (s->links) free(s->links[b]);
        if (s->outer_edges) free(s->outer_edges[b].at);
    }
    void *arrays[] = SEARCH_ARRAYS(s);
    for (size_t q = 0; q < sizeof arrays / sizeof arrays[0]; q++) free(arrays[q]);
}

static int search_alloc(Search *s, idx n, Py_ssize_t m) {
    size_t n2 = 2 * (size_t)n, mm = (size_t)m;
    memset(s, 0, sizeof *s);
    s->n = n;
    s->m = m;
    s->eu = alloc(mm, sizeof(idx));
    s->ev = alloc(mm, sizeof(idx));
    s->w = alloc(mm, sizeof(i128));
    s->adj_start = alloc((size_t)n + 1, sizeof(idx));
    s->adj_edge = alloc(2 * mm, sizeof(idx));
    s->adj_other = alloc(2 * mm, sizeof(idx));
    s->y2 = alloc(n, sizeof(i128));
    s->z = alloc(n2, sizeof(i128));
    s->mate = alloc(n, sizeof(idx));
    s->parent = alloc(n2, sizeof(idx));
    s->top = alloc(n, sizeof(idx));
    s->cycle = alloc(n2, sizeof(idx *));
    s->links = alloc(n2, sizeof(Link *));
    s->cycle_len = alloc(n2, sizeof(idx));
    s->base = alloc(n2, sizeof(idx));
    s->first_member = alloc(n2, sizeof(idx));
    s->last_member = alloc(n2, sizeof(idx));
    s->member_next = alloc(n, sizeof(idx));
    s->unused = alloc(n, sizeof(idx));
    s->label = alloc(n2, sizeof(int8_t));
    s->via_in = alloc(n2, sizeof(idx));
    s->via_out = alloc(n2, sizeof(idx));
    s->outer_edges = alloc(n2, sizeof(EdgeList));
    s->best_outer = alloc(n2, sizeof(idx));
    s->reach = alloc(n, sizeof(idx));
    s->reached = alloc(n, sizeof(idx));
    s->tree_nodes = alloc(n2, sizeof(idx));
    s->in_tree = alloc(n2, 1);
    s->tree_vertices = alloc(n, sizeof(idx));
    s->vertex_in_tree = alloc(n, 1);
    s->queue = alloc(n, sizeof(idx));
    s->seen = alloc(n2, 1);
    s->path_x = alloc(n2 + 1, sizeof(idx));
    s->path_y = alloc(n2 + 1, sizeof(idx));
    s->pick = alloc(n2, sizeof(idx));
    s->pick_order = alloc(n2, sizeof(idx));
    s->tasks = alloc(2 * n2 + 2, sizeof(idx));
    s->spare_nodes = alloc(n, sizeof(idx));
    s->spare_links = alloc(n, sizeof(Link));
    void *arrays[] = SEARCH_ARRAYS(s);
    for (size_t q = 0; q < sizeof arrays / sizeof arrays[0]; q++)
        if (!arrays[q]) return -1;
    for (idx v = 0; v < n; v++) {
        s->top[v] = v;
        s->mate[v] = NONE;
        s->member_next[v] = NONE;
        s->reach[v] = NONE;
        s->unused[v] = 2 * n - 1 - v; /* popped from the end: n first */
    }
    s->nunused = n;
    for (size_t x = 0; x < n2; x++) {
        idx id = (idx)x;
        s->parent[x] = s->via_in[x] = s->via_out[x] = s->best_outer[x] = s->pick[x] = NONE;
        s->base[x] = s->first_member[x] = s->last_member[x] = id < n ? id : NONE;
    }
    return 0;
}

/* Adjacency in edge order: the edges at v are adj_edge[adj_start[v]..adj_start[v + 1]). */
static void build_adjacency(Search *s) {
    idx n = s->n;
    for (Py_ssize_t k = 0; k < s->m; k++) {
        s->adj_start[s->eu[k] + 1]++;
        s->adj_start[s->ev[k] + 1]++;
    }
    for (idx v = 0; v < n; v++) s->adj_start[v + 1] += s->adj_start[v];
    idx *fill = s->tree_nodes; /* 2n >= n scratch, empty until the search starts */
    for (idx v = 0; v < n; v++) fill[v] = s->adj_start[v];
    for (Py_ssize_t k = 0; k < s->m; k++) {
        idx u = s->eu[k], v = s->ev[k];
        s->adj_edge[fill[u]] = (idx)k;
        s->adj_other[fill[u]++] = v;
        s->adj_edge[fill[v]] = (idx)k;
        s->adj_other[fill[v]++] = u;
    }
}

/* blossom._tighten: lower the feasible doubled dual so the warm edges become tight. */
static void tighten(Search *s, const idx *warm, Py_ssize_t nwarm) {
    for (int pass = 0; pass < 3 && nwarm > 0; pass++)
        for (Py_ssize_t q = 0; q < nwarm; q++) {
            idx k = warm[q], u = s->eu[k], v = s->ev[k];
            i128 w2 = 2 * s->w[k];
            if (s->y2[u] + s->y2[v] == w2) continue;
            i128 least[2] = {0, 0};
            int found[2] = {0, 0};
            idx ends[2] = {u, v};
            for (int side = 0; side < 2; side++) {
                idx x = ends[side], skip = ends[1 - side];
                for (idx e = s->adj_start[x]; e < s->adj_start[x + 1]; e++) {
                    idx y = s->adj_other[e];
                    if (y == skip) continue;
                    i128 val = 2 * s->w[s->adj_edge[e]] - s->y2[y];
                    if (!found[side] || val > least[side]) {
                        least[side] = val;
                        found[side] = 1;
                    }
                }
            }
            i128 lu = found[0] ? least[0] : w2 - s->y2[v];
            i128 lv = found[1] ? least[1] : w2 - lu;
            if (lu + lv <= w2) {
                s->y2[u] = lu;
                s->y2[v] = w2 - lu;
                check_dual(s, s->y2[u]);
                check_dual(s, s->y2[v]);
                if (s->fail) return;
            }
        }
}

typedef struct {
    const idx *warm;
    Py_ssize_t nwarm;
    int has_dual;
    const i128 *y2;
    const idx *members;
    const Py_ssize_t *offsets;
    const i128 *z;
    Py_ssize_t nblossoms;
} Start;

/* blossom.python_perfect_matching after the parity check: the start, then run(). */
static int solve_search(Search *s, const Start *start) {
    idx n = s->n;
    char *seen = s->seen; /* zero here; cleared again below */
    for (Py_ssize_t k = 0; k < s->m; k++) {
        idx ends[2] = {s->eu[k], s->ev[k]};
        for (int e = 0; e < 2; e++) {
            idx x = ends[e];
            if (!seen[x] || s->w[k] > s->y2[x]) {
                s->y2[x] = s->w[k];
                seen[x] = 1;
            }
        }
    }
    int all_seen = 1;
    for (idx x = 0; x < n; x++) {
        all_seen &= seen[x];
        seen[x] = 0;
    }
    if (!all_seen) return 0;
    if (start->has_dual) { /* blossom._carried */
        for (idx x = 0; x < n; x++) s->y2[x] = start->y2[x];
        for (Py_ssize_t b = 0; b < start->nblossoms; b++)
            for (Py_ssize_t q = start->offsets[b]; q < start->offsets[b + 1]; q++) {
                idx x = start->members[q];
                s->y2[x] += start->z[b];
                check_dual(s, s->y2[x]);
                if (s->fail) return -1;
            }
        for (Py_ssize_t k = 0; k < s->m; k++) {
            idx u = s->eu[k], v = s->ev[k];
            i128 shortfall = 2 * s->w[k] - s->y2[u] - s->y2[v];
            if (shortfall > 0) {
                s->y2[u] += shortfall;
                check_dual(s, s->y2[u]);
                if (s->fail) return -1;
            }
        }
    }
    tighten(s, start->warm, start->nwarm);
    if (s->fail) return -1;
    for (Py_ssize_t q = 0; q < start->nwarm; q++) {
        idx k = start->warm[q], u = s->eu[k], v = s->ev[k];
        if (s->mate[u] == NONE && s->mate[v] == NONE && s->y2[u] + s->y2[v] == 2 * s->w[k]) {
            s->mate[u] = v;
            s->mate[v] = u;
        }
    }
    return run(s);
}

static i128 read_i128(const unsigned char *p) {
    u128 x = 0;
    for (int k = 15; k >= 0; k--) x = (x << 8) | p[k];
    return (i128)x;
}

static void write_i128(unsigned char *p, i128 value) {
    u128 x = (u128)value;
    for (int k = 0; k < 16; k++) {
        p[k] = (unsigned char)(x & 0xff);
        x >>= 8;
    }
}

static int check_buffer(const Py_buffer *b, Py_ssize_t count, Py_ssize_t size, const char *name) {
    if (b->len != count * size) {
        PyErr_Format(PyExc_ValueError, "%s: %zd bytes, expected %zd", name, b->len, count * size);
        return -1;
    }
    return 0;
}

PyDoc_STRVAR(solve_doc,
"solve(n, u, v, w, warm_edges, warm_pairs, has_dual, y2, members, offsets, z)\n"
"\n"
"Maximum-weight perfect matching of vertices 0..n-1 with an optimal dual (Edmonds 1965,\n"
"Galil 1986): blossom.python_perfect_matching in C. Buffers (any contiguous bytes-like):\n"
"u, v, warm_edges, warm_pairs, members: int64 in native order; offsets: int64, one more than\n"
"the carried blossoms; w (one per edge), y2 (n) and z (one per carried blossom): 16 bytes\n"
"each, little-endian two's complement. warm_edges are edge indices, warm_pairs vertex pairs\n"
"(a pair that is no edge is ignored); both are used, edges first. has_dual: y2, members,\n"
"offsets and z give a carried dual (blossom.Dual flattened).\n"
"\n"
"Returns None when there is no perfect matching, else (partner, y2, members, offsets, z):\n"
"partner is int64 per vertex, the rest as above for the blossoms with z > 0, by id.\n"
"Raises Unsupported when a self-loop, |w| >= 2**118 or a dual beyond 2**124 would be\n"
"needed (the caller then runs the Python search) and ValueError, IndexError on bad input.");

static PyObject *solve(PyObject *self, PyObject *args) {
    Py_ssize_t n;
    int has_dual;
    Py_buffer bu, bv, bw, bwe, bwp, by, bm, bo, bz;
    (void)self;
    if (!PyArg_ParseTuple(args, "ny*y*y*y*y*py*y*y*y*:solve", &n, &bu, &bv, &bw, &bwe, &bwp, &has_dual,
                          &by, &bm, &bo, &bz))
        return NULL;
    Py_buffer *all[] = {&bu, &bv, &bw, &bwe, &bwp, &by, &bm, &bo, &bz};
    PyObject *out = NULL;
    Search s;
    int have_search = 0;
    idx *warm = NULL, *members = NULL;
    Py_ssize_t *offsets = NULL;
    i128 *y2 = NULL, *z = NULL;
    Py_ssize_t m = bu.len / 8, nwe = bwe.len / 8, nwp = bwp.len / 16, nb = 0, nm = bm.len / 8;

    if (n < 0 || n >= MAX_VERTICES || m >= MAX_EDGES) {
        PyErr_SetString(Unsupported, "graph too large for 32-bit ids");
        goto done;
    }
    if (check_buffer(&bu, m, 8, "u") || check_buffer(&bv, m, 8, "v") || check_buffer(&bw, m, 16, "w") ||
        check_buffer(&bwe, nwe, 8, "warm_edges") || check_buffer(&bwp, nwp, 16, "warm_pairs") ||
        check_buffer(&bm, nm, 8, "members"))
        goto done;
    if (has_dual) {
        nb = bo.len / 8 - 1;
        if (nb < 0 || check_buffer(&bo, nb + 1, 8, "offsets") || check_buffer(&by, n, 16, "y2") ||
            check_buffer(&bz, nb, 16, "z"))
            goto done;
    }
    if (search_alloc(&s, (idx)n, m)) {
        search_free(&s);
        PyErr_NoMemory();
        goto done;
    }
    have_search = 1;
    {
        const int64_t *pu = bu.buf, *pv = bv.buf;
        const unsigned char *pw = bw.buf;
        for (Py_ssize_t k = 0; k < m; k++) {
            if (pu[k] < 0 || pu[k] >= n || pv[k] < 0 || pv[k] >= n) {
                PyErr_Format(PyExc_ValueError, "edge %zd: a vertex outside 0..%zd", k, n - 1);
                goto done;
            }
            if (pu[k] == pv[k]) {
                PyErr_SetString(Unsupported, "a self-loop");
                goto done;
            }
            s.eu[k] = (idx)pu[k];
            s.ev[k] = (idx)pv[k];
            s.w[k] = read_i128(pw + 16 * k);
            if (s.w[k] >= WEIGHT_LIMIT || s.w[k] <= -WEIGHT_LIMIT) {
                PyErr_SetString(Unsupported, "a weight of 2**118 or more");
                goto done;
            }
        }
    }
    build_adjacency(&s);
    warm = alloc((size_t)(nwe + nwp), sizeof(idx));
    if (!warm) {
        PyErr_NoMemory();
        goto done;
    }
    Py_ssize_t nwarm = 0;
    {
        const int64_t *pe = bwe.buf, *pp = bwp.buf;
        for (Py_ssize_t q = 0; q < nwe; q++) {
            if (pe[q] < 0 || pe[q] >= m) {
                PyErr_Format(PyExc_IndexError, "warm edge %lld out of range", (long long)pe[q]);
                goto done;
            }
            warm[nwarm++] = (idx)pe[q];
        }
        for (Py_ssize_t q = 0; q < nwp; q++) {
            int64_t a = pp[2 * q], b = pp[2 * q + 1];
            if (a < 0 || a >= n || b < 0 || b >= n) continue;
            for (idx e = s.adj_start[a]; e < s.adj_start[a + 1]; e++)
                if (s.adj_other[e] == b) {
                    warm[nwarm++] = s.adj_edge[e];
                    break;
                }
        }
    }
    Start start = {warm, nwarm, has_dual, NULL, NULL, NULL, NULL, 0};
    if (has_dual) {
        y2 = alloc((size_t)n, sizeof(i128));
        z = alloc((size_t)nb, sizeof(i128));
        members = alloc((size_t)nm, sizeof(idx));
        offsets = alloc((size_t)nb + 1, sizeof(Py_ssize_t));
        if (!y2 || !z || !members || !offsets) {
            PyErr_NoMemory();
            goto done;
        }
        const unsigned char *py = by.buf, *pz = bz.buf;
        const int64_t *pm = bm.buf, *po = bo.buf;
        for (Py_ssize_t x = 0; x < n; x++) {
            y2[x] = read_i128(py + 16 * x);
            if (y2[x] >= DUAL_LIMIT || y2[x] <= -DUAL_LIMIT) {
                PyErr_SetString(Unsupported, "a carried dual of 2**124 or more");
                goto done;
            }
        }
        for (Py_ssize_t b = 0; b < nb; b++) {
            z[b] = read_i128(pz + 16 * b);
            if (z[b] >= DUAL_LIMIT || z[b] <= -DUAL_LIMIT) {
                PyErr_SetString(Unsupported, "a carried dual of 2**124 or more");
                goto done;
            }
        }
        for (Py_ssize_t q = 0; q < nm; q++) {
            if (pm[q] < 0 || pm[q] >= n) {
                PyErr_SetString(PyExc_ValueError, "a blossom member outside the vertices");
                goto done;
            }
            members[q] = (idx)pm[q];
        }
        for (Py_ssize_t b = 0; b <= nb; b++) {
            offsets[b] = (Py_ssize_t)po[b];
            if (offsets[b] < 0 || offsets[b] > nm || (b > 0 && offsets[b] < offsets[b - 1])) {
                PyErr_SetString(PyExc_ValueError, "blossom offsets out of order");
                goto done;
            }
        }
        start.y2 = y2;
        start.members = members;
        start.offsets = offsets;
        start.z = z;
        start.nblossoms = nb;
    }
    int found;
    Py_BEGIN_ALLOW_THREADS
    found = solve_search(&s, &start);
    Py_END_ALLOW_THREADS
    if (found < 0) {
        if (s.fail == FAIL_MEMORY)
            PyErr_NoMemory();
        else if (s.fail == FAIL_RANGE)
            PyErr_SetString(Unsupported, "a dual of 2**124 or more");
        else
            PyErr_SetString(PyExc_RuntimeError, "blossom kernel: odd reduced cost between two outer nodes");
        goto done;
    }
    if (found == 0) {
        out = Py_NewRef(Py_None);
        goto done;
    }
    {
        Py_ssize_t count = 0, size = 0;
        for (idx b = (idx)n; b < 2 * (idx)n; b++)
            if (s.cycle_len[b] && s.z[b] > 0) {
                count++;
                for (idx x = s.first_member[b]; x != NONE; x = next_member(&s, b, x)) size++;
            }
        PyObject *partner = PyBytes_FromStringAndSize(NULL, 8 * n);
        PyObject *ys = PyBytes_FromStringAndSize(NULL, 16 * n);
        PyObject *mem = PyBytes_FromStringAndSize(NULL, 8 * size);
        PyObject *off = PyBytes_FromStringAndSize(NULL, 8 * (count + 1));
        PyObject *zs = PyBytes_FromStringAndSize(NULL, 16 * count);
        if (!partner || !ys || !mem || !off || !zs) {
            Py_XDECREF(partner);
            Py_XDECREF(ys);
            Py_XDECREF(mem);
            Py_XDECREF(off);
            Py_XDECREF(zs);
            goto done;
        }
        int64_t *pp = (int64_t *)PyBytes_AS_STRING(partner);
        unsigned char *py = (unsigned char *)PyBytes_AS_STRING(ys);
        int64_t *pm = (int64_t *)PyBytes_AS_STRING(mem), *po = (int64_t *)PyBytes_AS_STRING(off);
        unsigned char *pz = (unsigned char *)PyBytes_AS_STRING(zs);
        for (idx x = 0; x < (idx)n; x++) {
            int64_t y = s.mate[x];
            memcpy(pp + x, &y, sizeof y);
            write_i128(py + 16 * x, s.y2[x]);
        }
        Py_ssize_t c = 0, used = 0;
        int64_t zero = 0;
        memcpy(po, &zero, sizeof zero);
        for (idx b = (idx)n; b < 2 * (idx)n; b++)
            if (s.cycle_len[b] && s.z[b] > 0) {
                for (idx x = s.first_member[b]; x != NONE; x = next_member(&s, b, x)) {
                    int64_t y = x;
                    memcpy(pm + used++, &y, sizeof y);
                }
                write_i128(pz + 16 * c, s.z[b]);
                int64_t e = used;
                memcpy(po + ++c, &e, sizeof e);
            }
        out = PyTuple_Pack(5, partner, ys, mem, off, zs);
        Py_DECREF(partner);
        Py_DECREF(ys);
        Py_DECREF(mem);
        Py_DECREF(off);
        Py_DECREF(zs);
    }
done:
    if (have_search) search_free(&s);
    free(warm);
    free(members);
    free(offsets);
    free(y2);
    free(z);
    for (size_t q = 0; q < sizeof all / sizeof all[0]; q++) PyBuffer_Release(all[q]);
    return out;
}

static PyMethodDef methods[] = {
    {"solve", solve, METH_VARARGS, solve_doc},
    {NULL, NULL, 0, NULL},
};

PyDoc_STRVAR(module_doc,
"Compiled twin of pairings.engine.edmonds: maximum-weight perfect matching with its optimal\n"
"dual, Edmonds' blossom algorithm (Edmonds 1965, Galil 1986). Use blossom.perfect_matching.");

static struct PyModuleDef module = {PyModuleDef_HEAD_INIT, "_blossom_c", module_doc, -1, methods,
                                    NULL, NULL, NULL, NULL};

PyMODINIT_FUNC PyInit__blossom_c(void) {
    PyObject *mod = PyModule_Create(&module);
    if (!mod) return NULL;
    Unsupported = PyErr_NewExceptionWithDoc(
        "pairings.engine._blossom_c.Unsupported",
        "A value out of the kernel's range (|w| >= 2**118, a dual of 2**124 or more, a self-loop).",
        PyExc_ArithmeticError, NULL);
    if (!Unsupported || PyModule_AddObjectRef(mod, "Unsupported", Unsupported) < 0) {
        Py_DECREF(mod);
        return NULL;
    }
    return mod;
}

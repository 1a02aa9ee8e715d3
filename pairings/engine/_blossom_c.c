/* Maximum-weight perfect matching with its optimal dual: the compiled kernel of
 * pairings/engine/blossom.py (same algorithm, same integer dual, same warm starts).
 *
 * The primal-dual method of Edmonds (1965) in the O(n^3) form surveyed by Galil (1986):
 * one alternating tree at a time grows from an exposed vertex, odd cycles are shrunk into
 * blossoms, and the dual of the tree moves by the largest step that keeps every reduced cost
 * non-negative. blossom.py's module notes explain the doubled integer duals and the locality
 * of a stage; this file follows its structure function by function.
 *
 * Differences from the Python version that do not change the result's optimality:
 * - the sets (labelled blossoms, vertices with a best edge) are arrays in insertion order,
 *   so among dual steps of equal size another one may be taken (a different optimum of
 *   equal weight may come out), but the same input always gives the same output;
 * - a blossom's vertices are a chain through next[] from first[b] to last[b] (the children's
 *   chains joined in cycle order) instead of a cached list per blossom: O(n) memory;
 * - the recursions of blossom.py (expanding nested blossoms of zero dual at the end of a
 *   stage, augmenting through nested blossoms) run on explicit heap stacks: blossoms nest up
 *   to n / 2 deep and the C stack is never at risk.
 *
 * Arithmetic: weights, duals and slacks are __int128. Every weight must satisfy |w| < 2**118
 * and every dual stays below 2**124 in absolute value (checked where a dual changes), so no
 * sum of the form d[u] + d[v] - 2 w can overflow; a dual beyond the bound raises
 * Unsupported and the Python wrapper runs the pure-Python code instead.
 *
 * Buffers in and out: int64 values in native byte order, int128 values as 16 bytes
 * little-endian two's complement (see solve()'s docstring).
 *
 * References
 * J. Edmonds, "Maximum matching and a polyhedron with 0,1-vertices",
 * J. Res. Nat. Bur. Standards 69B (1965).
 * Z. Galil, "Efficient algorithms for finding maximum matching in graphs",
 * ACM Computing Surveys 18 (1986).
 */
#define PY_SSIZE_T_CLEAN
#include <Python.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

typedef __int128 i128;
typedef unsigned __int128 u128;
typedef int32_t idx; /* vertex, blossom, endpoint or edge id */

#define WEIGHT_LIMIT ((i128)1 << 118)
#define DUAL_LIMIT ((i128)1 << 124)
#define MAX_VERTICES ((Py_ssize_t)1 << 28)
#define MAX_EDGES ((Py_ssize_t)1 << 29)

enum { OK = 0, FAIL_MEMORY = 1, FAIL_RANGE = 2, FAIL_INTERNAL = 3 };

static PyObject *Unsupported; /* values out of range: the caller uses the Python version */

typedef struct {
    idx n;
    Py_ssize_t m;
    idx *end;      /* 2m: endpoint p of edge p / 2 */
    i128 *w;       /* m */
    idx *nbstart;  /* n + 1: CSR of the endpoints facing away from each vertex, in edge order */
    idx *nb;       /* 2m */
    i128 *d;       /* 2n: doubled vertex duals, then z of the blossoms */
    idx *mate;     /* n: endpoint of the mate, or -1 */
    idx *top;      /* n: top-level blossom of each vertex */
    idx *parent;   /* 2n */
    idx **childs;  /* 2n: sub-blossoms in cycle order, base's first */
    idx **endps;   /* 2n: endpoints of the cycle edges */
    idx *nchild;   /* 2n */
    idx *first, *last, *next; /* vertices of a blossom: a chain from first[b] to last[b] */
    idx *base;     /* 2n, -1 for an unused blossom id */
    idx *unused;
    idx nunused;
    int8_t *label; /* 2n: 0 none, 1 outer, 2 inner, 5 outer being scanned */
    idx *labelend; /* 2n */
    idx *best;     /* 2n: least-slack edge to an outer blossom, or -1 */
    idx **bestlist; /* 2n: per outer blossom, its least-slack edge to each other outer blossom */
    idx *nbest;    /* 2n: length of bestlist, -1 for none */
    char *allowed; /* m */
    idx *queue;
    Py_ssize_t nqueue, capqueue;
    idx *touched;  /* ids whose label or best edge changed this stage */
    char *is_touched;
    idx ntouched;
    idx *freeb;    /* vertices with a best edge (candidates of a step of kind 2) */
    char *is_freeb;
    idx nfreeb;
    idx *forest;   /* labelled top-level ids */
    idx *fpos;     /* position in forest, or -1 */
    idx nforest;
    idx *opened;   /* edges allowed this stage */
    Py_ssize_t nopened;
    idx *exposed;  /* a stack: the next exposed vertex is the last */
    idx nexposed;
    /* scratch */
    idx *spath, *sendp, *sforest;
    idx *bt_edge;  /* 2n: per outer blossom, the best edge found in add_blossom, or -1 */
    i128 *bt_slack;
    idx *bt_keys;
    idx *fstack_b, *fstack_i; /* expand at the end of a stage */
    struct aframe *astack;    /* augment through nested blossoms */
    int fail;
} Run;

struct aframe {
    idx b, v, i, j, step, trick, p;
    int state;
};

static void *alloc(size_t count, size_t size) { return calloc(count ? count : 1, size); }

static inline idx at(const idx *a, idx j, idx len) { return a[j < 0 ? j + len : j]; }

static inline i128 slack(const Run *r, idx k) {
    return r->d[r->end[2 * k]] + r->d[r->end[2 * k + 1]] - 2 * r->w[k];
}

static inline void check_dual(Run *r, i128 x) {
    if (x >= DUAL_LIMIT || x <= -DUAL_LIMIT) r->fail = FAIL_RANGE;
}

static inline idx leaf_next(const Run *r, idx b, idx x) { return x == r->last[b] ? -1 : r->next[x]; }

static inline void touch(Run *r, idx x) {
    if (!r->is_touched[x]) {
        r->is_touched[x] = 1;
        r->touched[r->ntouched++] = x;
    }
}

static inline void forest_add(Run *r, idx b) {
    if (r->fpos[b] < 0) {
        r->fpos[b] = r->nforest;
        r->forest[r->nforest++] = b;
    }
}

static inline void forest_remove(Run *r, idx b) {
    idx at_ = r->fpos[b];
    if (at_ >= 0) {
        idx moved = r->forest[--r->nforest];
        r->forest[at_] = moved;
        r->fpos[moved] = at_;
        r->fpos[b] = -1;
    }
}

static inline void push_queue(Run *r, idx x) {
    if (r->nqueue == r->capqueue) {
        Py_ssize_t cap = 2 * r->capqueue + 16;
        idx *grown = realloc(r->queue, (size_t)cap * sizeof(idx));
        if (!grown) {
            r->fail = FAIL_MEMORY;
            return;
        }
        r->queue = grown;
        r->capqueue = cap;
    }
    r->queue[r->nqueue++] = x;
}

static inline void allow(Run *r, idx k) {
    r->allowed[k] = 1;
    r->opened[r->nopened++] = k;
}

static void assign(Run *r, idx w, int t, idx p) {
    for (;;) {
        idx b = r->top[w];
        r->label[w] = r->label[b] = (int8_t)t;
        r->labelend[w] = r->labelend[b] = p;
        r->best[w] = r->best[b] = -1;
        touch(r, w);
        touch(r, b);
        forest_add(r, b);
        if (t == 1) {
            for (idx x = r->first[b]; x != -1; x = leaf_next(r, b, x)) push_queue(r, x);
            return;
        }
        idx mm = r->mate[r->base[b]];
        w = r->end[mm];
        t = 1;
        p = mm ^ 1;
    }
}

/* The base of the blossom closed by an edge between outer v and w, or -1: an augmenting path. */
static idx scan(Run *r, idx v, idx w) {
    idx npath = 0, base = -1;
    while (v != -1 || w != -1) {
        idx b = r->top[v];
        if (r->label[b] & 4) {
            base = r->base[b];
            break;
        }
        r->spath[npath++] = b;
        r->label[b] = 5;
        if (r->labelend[b] == -1)
            v = -1;
        else
            v = r->end[r->labelend[r->top[r->end[r->labelend[b]]]]];
        if (w != -1) {
            idx t = v;
            v = w;
            w = t;
        }
    }
    for (idx q = 0; q < npath; q++) r->label[r->spath[q]] = 1;
    return base;
}

static void free_bestlist(Run *r, idx b) {
    free(r->bestlist[b]);
    r->bestlist[b] = NULL;
    r->nbest[b] = -1;
}

static void add_blossom(Run *r, idx base, idx k) {
    idx v = r->end[2 * k], w = r->end[2 * k + 1];
    idx bb = r->top[base], bv = r->top[v], bw = r->top[w];
    idx b = r->unused[--r->nunused];
    idx *path = r->spath, *endps = r->sendp, len = 0;
    r->base[b] = base;
    r->parent[b] = -1;
    r->parent[bb] = b;
    while (bv != bb) {
        r->parent[bv] = b;
        path[len] = bv;
        endps[len++] = r->labelend[bv];
        bv = r->top[r->end[r->labelend[bv]]];
    }
    path[len++] = bb;
    for (idx i = 0, j = len - 1; i < j; i++, j--) {
        idx t = path[i];
        path[i] = path[j];
        path[j] = t;
    }
    for (idx i = 0, j = len - 2; i < j; i++, j--) {
        idx t = endps[i];
        endps[i] = endps[j];
        endps[j] = t;
    }
    endps[len - 1] = 2 * k;
    while (bw != bb) {
        r->parent[bw] = b;
        path[len] = bw;
        endps[len++] = r->labelend[bw] ^ 1;
        bw = r->top[r->end[r->labelend[bw]]];
    }
    idx *cs = malloc((size_t)len * sizeof(idx)), *es = malloc((size_t)len * sizeof(idx));
    if (!cs || !es) {
        free(cs);
        free(es);
        r->fail = FAIL_MEMORY;
        return;
    }
    memcpy(cs, path, (size_t)len * sizeof(idx));
    memcpy(es, endps, (size_t)len * sizeof(idx));
    r->childs[b] = cs;
    r->endps[b] = es;
    r->nchild[b] = len;
    for (idx i = 0; i + 1 < len; i++) r->next[r->last[cs[i]]] = r->first[cs[i + 1]];
    r->first[b] = r->first[cs[0]];
    r->last[b] = r->last[cs[len - 1]];
    r->label[b] = 1;
    r->labelend[b] = r->labelend[bb];
    r->d[b] = 0;
    touch(r, b);
    for (idx i = 0; i < len; i++) forest_remove(r, cs[i]);
    forest_add(r, b);
    for (idx x = r->first[b]; x != -1; x = leaf_next(r, b, x)) {
        if (r->label[r->top[x]] == 2) push_queue(r, x);
        r->top[x] = b;
    }
    /* per neighbouring outer blossom, the edge of least slack (first found among equals) */
    idx nkeys = 0;
    for (idx s = 0; s < len; s++) {
        idx sub = cs[s];
        idx count = r->nbest[sub];
        idx *list = r->bestlist[sub];
        idx x = -1;
        Py_ssize_t q = 0, qend = 0;
        if (count < 0) { /* every edge of every vertex of sub */
            x = r->first[sub];
            q = r->nbstart[x];
            qend = r->nbstart[x + 1];
        }
        for (idx c = 0;;) {
            idx kk;
            if (count >= 0) {
                if (c >= count) break;
                kk = list[c++];
            } else {
                while (q == qend) {
                    x = leaf_next(r, sub, x);
                    if (x == -1) break;
                    q = r->nbstart[x];
                    qend = r->nbstart[x + 1];
                }
                if (x == -1) break;
                kk = r->nb[q++] >> 1;
            }
            idx i = r->end[2 * kk], j = r->end[2 * kk + 1];
            if (r->top[j] == b) {
                idx t = i;
                i = j;
                j = t;
            }
            idx bj = r->top[j];
            if (bj != b && r->label[bj] == 1) {
                i128 sl = r->d[i] + r->d[j] - 2 * r->w[kk];
                if (r->bt_edge[bj] == -1) {
                    r->bt_edge[bj] = kk;
                    r->bt_slack[bj] = sl;
                    r->bt_keys[nkeys++] = bj;
                } else if (sl < r->bt_slack[bj]) {
                    r->bt_edge[bj] = kk;
                    r->bt_slack[bj] = sl;
                }
            }
        }
        free_bestlist(r, sub);
        r->best[sub] = -1;
    }
    idx *list = malloc((size_t)(nkeys ? nkeys : 1) * sizeof(idx));
    if (!list) {
        r->fail = FAIL_MEMORY;
        for (idx q = 0; q < nkeys; q++) r->bt_edge[r->bt_keys[q]] = -1;
        return;
    }
    idx bestk = -1;
    i128 bests = 0;
    for (idx q = 0; q < nkeys; q++) {
        idx key = r->bt_keys[q];
        list[q] = r->bt_edge[key];
        if (bestk == -1 || r->bt_slack[key] < bests) {
            bestk = r->bt_edge[key];
            bests = r->bt_slack[key];
        }
        r->bt_edge[key] = -1;
    }
    r->bestlist[b] = list;
    r->nbest[b] = nkeys;
    r->best[b] = bestk;
}

/* The end of expand(): blossom id b is free again. */
static void release(Run *r, idx b) {
    r->label[b] = 0;
    r->labelend[b] = -1;
    r->best[b] = -1;
    free(r->childs[b]);
    free(r->endps[b]);
    r->childs[b] = r->endps[b] = NULL;
    r->nchild[b] = 0;
    free_bestlist(r, b);
    r->base[b] = -1;
    r->unused[r->nunused++] = b;
}

/* Expand top-level b and, depth first, each sub-blossom whose dual is zero (end of a stage). */
static void expand_end_of_stage(Run *r, idx b0) {
    idx sp = 0;
    r->fstack_b[sp] = b0;
    r->fstack_i[sp++] = 0;
    while (sp > 0) {
        idx b = r->fstack_b[sp - 1], i = r->fstack_i[sp - 1];
        if (i < r->nchild[b]) {
            r->fstack_i[sp - 1] = i + 1;
            idx s = r->childs[b][i];
            r->parent[s] = -1;
            if (s < r->n)
                r->top[s] = s;
            else if (r->d[s] == 0) {
                r->fstack_b[sp] = s;
                r->fstack_i[sp++] = 0;
            } else
                for (idx x = r->first[s]; x != -1; x = leaf_next(r, s, x)) r->top[x] = s;
        } else {
            forest_remove(r, b);
            release(r, b);
            sp--;
        }
    }
}

/* Expand the inner blossom b during a stage (its dual reached zero) and relabel its children. */
static void expand_inner(Run *r, idx b) {
    idx len = r->nchild[b];
    idx *childs = r->childs[b], *endps = r->endps[b];
    for (idx i = 0; i < len; i++) {
        idx s = childs[i];
        r->parent[s] = -1;
        if (s < r->n)
            r->top[s] = s;
        else
            for (idx x = r->first[s]; x != -1; x = leaf_next(r, s, x)) r->top[x] = s;
    }
    forest_remove(r, b);
    if (r->label[b] == 2) {
        idx entry = r->top[r->end[r->labelend[b] ^ 1]];
        idx j = 0, step, trick;
        while (childs[j] != entry) j++;
        if (j & 1) {
            j -= len;
            step = 1;
            trick = 0;
        } else {
            step = -1;
            trick = 1;
        }
        idx p = r->labelend[b];
        while (j != 0) {
            r->label[r->end[p ^ 1]] = 0;
            r->label[r->end[at(endps, j - trick, len) ^ trick ^ 1]] = 0;
            assign(r, r->end[p ^ 1], 2, p);
            allow(r, at(endps, j - trick, len) / 2);
            j += step;
            p = at(endps, j - trick, len) ^ trick;
            allow(r, p / 2);
            j += step;
        }
        idx bv = at(childs, j, len);
        r->label[r->end[p ^ 1]] = r->label[bv] = 2;
        r->labelend[r->end[p ^ 1]] = r->labelend[bv] = p;
        r->best[bv] = -1;
        touch(r, r->end[p ^ 1]);
        touch(r, bv);
        forest_add(r, bv);
        j += step;
        while (at(childs, j, len) != entry) {
            bv = at(childs, j, len);
            if (r->label[bv] == 1) {
                j += step;
                continue;
            }
            idx hit = -1;
            for (idx x = r->first[bv]; x != -1; x = leaf_next(r, bv, x))
                if (r->label[x] != 0) {
                    hit = x;
                    break;
                }
            if (hit != -1) {
                r->label[hit] = 0;
                r->label[r->end[r->mate[r->base[bv]]]] = 0;
                assign(r, hit, 2, r->labelend[hit]);
            }
            j += step;
        }
    }
    release(r, b);
}

static void rotate(idx *a, idx len, idx i) {
    /* a[i:] + a[:i] by three reversals */
    for (idx x = 0, y = i - 1; x < y; x++, y--) { idx t = a[x]; a[x] = a[y]; a[y] = t; }
    for (idx x = i, y = len - 1; x < y; x++, y--) { idx t = a[x]; a[x] = a[y]; a[y] = t; }
    for (idx x = 0, y = len - 1; x < y; x++, y--) { idx t = a[x]; a[x] = a[y]; a[y] = t; }
}

/* Swap matched and unmatched edges inside b on the path from vertex v to the base (v becomes
 * the base), through the nested sub-blossoms: blossom.py's recursion on an explicit stack. */
static void augment_blossom(Run *r, idx b0, idx v0) {
    struct aframe *st = r->astack;
    idx sp = 0;
    st[sp++] = (struct aframe){b0, v0, 0, 0, 0, 0, 0, 0};
    while (sp > 0) {
        struct aframe *f = &st[sp - 1];
        idx b = f->b, len = r->nchild[b];
        idx *childs = r->childs[b], *endps = r->endps[b];
        switch (f->state) {
        case 0: {
            idx t = f->v;
            while (r->parent[t] != b) t = r->parent[t];
            idx i = 0;
            while (childs[i] != t) i++;
            f->i = f->j = i;
            if (i & 1) {
                f->j -= len;
                f->step = 1;
                f->trick = 0;
            } else {
                f->step = -1;
                f->trick = 1;
            }
            f->state = 1;
            if (t >= r->n) st[sp++] = (struct aframe){t, f->v, 0, 0, 0, 0, 0, 0};
            break;
        }
        case 1: {
            if (f->j == 0) {
                rotate(childs, len, f->i);
                rotate(endps, len, f->i);
                r->base[b] = r->base[childs[0]];
                sp--;
                break;
            }
            f->j += f->step;
            idx t = at(childs, f->j, len);
            f->p = at(endps, f->j - f->trick, len) ^ f->trick;
            f->state = 2;
            if (t >= r->n) st[sp++] = (struct aframe){t, r->end[f->p], 0, 0, 0, 0, 0, 0};
            break;
        }
        case 2: {
            f->j += f->step;
            idx t = at(childs, f->j, len);
            f->state = 3;
            if (t >= r->n) st[sp++] = (struct aframe){t, r->end[f->p ^ 1], 0, 0, 0, 0, 0, 0};
            break;
        }
        default:
            r->mate[r->end[f->p]] = f->p ^ 1;
            r->mate[r->end[f->p ^ 1]] = f->p;
            f->state = 1;
            break;
        }
    }
}

static void augment(Run *r, idx k) {
    for (int side = 0; side < 2; side++) {
        idx s = side == 0 ? r->end[2 * k] : r->end[2 * k + 1];
        idx p = side == 0 ? 2 * k + 1 : 2 * k;
        for (;;) {
            idx bs = r->top[s];
            if (bs >= r->n) augment_blossom(r, bs, s);
            r->mate[s] = p;
            if (r->labelend[bs] == -1) break;
            idx bt = r->top[r->end[r->labelend[bs]]];
            idx j = r->end[r->labelend[bt] ^ 1];
            s = r->end[r->labelend[bt]];
            if (bt >= r->n) augment_blossom(r, bt, j);
            r->mate[j] = r->labelend[bt];
            p = r->labelend[bt] ^ 1;
        }
    }
}

static void reset_stage(Run *r) {
    for (idx q = 0; q < r->ntouched; q++) {
        idx x = r->touched[q];
        r->label[x] = 0;
        r->labelend[x] = -1;
        r->best[x] = -1;
        if (x >= r->n) free_bestlist(r, x);
        r->is_touched[x] = 0;
    }
    r->ntouched = 0;
    for (Py_ssize_t q = 0; q < r->nopened; q++) r->allowed[r->opened[q]] = 0;
    r->nopened = 0;
    for (idx q = 0; q < r->nfreeb; q++) r->is_freeb[r->freeb[q]] = 0;
    r->nfreeb = 0;
    for (idx q = 0; q < r->nforest; q++) r->fpos[r->forest[q]] = -1;
    r->nforest = 0;
    r->nqueue = 0;
}

/* Grow the tree along tight edges; 1 when the stage augmented. */
static int scan_queue(Run *r) {
    const idx *end = r->end, *top = r->top;
    while (r->nqueue > 0 && !r->fail) {
        idx v = r->queue[--r->nqueue];
        i128 dv = r->d[v];
        for (idx q = r->nbstart[v]; q < r->nbstart[v + 1]; q++) {
            idx p = r->nb[q], k = p >> 1, w = end[p];
            if (top[v] == top[w]) continue;
            i128 kslack = 0;
            if (!r->allowed[k]) {
                kslack = dv + r->d[w] - 2 * r->w[k];
                if (kslack <= 0) allow(r, k);
            }
            if (r->allowed[k]) {
                idx tw = top[w];
                int lw = r->label[tw];
                if (lw == 0 && r->mate[r->base[tw]] == -1) { /* another exposed vertex */
                    augment(r, k);
                    return 1;
                }
                if (lw == 0)
                    assign(r, w, 2, p ^ 1);
                else if (lw == 1) {
                    idx base = scan(r, v, w);
                    if (base >= 0) {
                        add_blossom(r, base, k);
                        if (r->fail) return 0;
                    } else {
                        augment(r, k);
                        return 1;
                    }
                } else if (r->label[w] == 0) {
                    r->label[w] = 2;
                    r->labelend[w] = p ^ 1;
                    touch(r, w);
                }
            } else if (r->label[top[w]] == 1) {
                idx b = top[v];
                if (r->best[b] == -1 || kslack < slack(r, r->best[b])) {
                    r->best[b] = k;
                    touch(r, b);
                }
            } else if (r->label[w] == 0) {
                if (r->best[w] == -1 || kslack < slack(r, r->best[w])) {
                    r->best[w] = k;
                    touch(r, w);
                    if (!r->is_freeb[w]) {
                        r->is_freeb[w] = 1;
                        r->freeb[r->nfreeb++] = w;
                    }
                }
            }
        }
    }
    return 0;
}

/* One dual step; 0 when none is possible (no perfect matching). */
static int step(Run *r) {
    int kind = 0;
    i128 delta = 0;
    idx arg = -1;
    for (idx q = 0; q < r->nfreeb; q++) {
        idx v = r->freeb[q], k = r->best[v];
        if (k != -1 && r->label[r->top[v]] == 0) {
            i128 s = slack(r, k);
            if (kind == 0 || s < delta) {
                kind = 2;
                delta = s;
                arg = k;
            }
        }
    }
    for (idx q = 0; q < r->nforest; q++) {
        idx b = r->forest[q];
        if (r->label[b] == 1 && r->best[b] != -1) {
            i128 s = slack(r, r->best[b]);
            if (s & 1) { /* tree edges keep one parity per tree (blossom.py's notes) */
                r->fail = FAIL_INTERNAL;
                return 0;
            }
            if (kind == 0 || s / 2 < delta) {
                kind = 3;
                delta = s / 2;
                arg = r->best[b];
            }
        } else if (r->label[b] == 2 && b >= r->n && (kind == 0 || r->d[b] < delta)) {
            kind = 4;
            delta = r->d[b];
            arg = b;
        }
    }
    if (kind == 0) return 0;
    for (idx q = 0; q < r->nforest; q++) {
        idx b = r->forest[q];
        i128 change = r->label[b] == 1 ? -delta : delta;
        for (idx x = r->first[b]; x != -1; x = leaf_next(r, b, x)) {
            r->d[x] += change;
            check_dual(r, r->d[x]);
        }
        if (b >= r->n) {
            r->d[b] -= change;
            check_dual(r, r->d[b]);
        }
    }
    if (r->fail) return 0;
    if (kind == 4)
        expand_inner(r, arg);
    else {
        allow(r, arg);
        idx i = r->end[2 * arg], j = r->end[2 * arg + 1];
        if (kind == 2 && r->label[r->top[i]] == 0) i = j;
        push_queue(r, i);
    }
    return 1;
}

/* 1: perfect matching found, 0: none exists, -1: r->fail says why. */
static int run(Run *r) {
    for (;;) {
        reset_stage(r);
        while (r->nexposed && r->mate[r->exposed[r->nexposed - 1]] != -1) r->nexposed--;
        if (!r->nexposed) return 1;
        assign(r, r->exposed[r->nexposed - 1], 1, -1);
        for (;;) {
            int done = scan_queue(r);
            if (r->fail) return -1;
            if (done) break;
            if (!step(r)) return r->fail ? -1 : 0;
            if (r->fail) return -1;
        }
        idx count = r->nforest;
        memcpy(r->sforest, r->forest, (size_t)count * sizeof(idx));
        for (idx q = 0; q < count; q++) {
            idx b = r->sforest[q];
            if (b >= r->n && r->parent[b] == -1 && r->label[b] == 1 && r->d[b] == 0)
                expand_end_of_stage(r, b);
        }
    }
}

/* Every array a run allocates: freed together, checked together (one list, so none is forgotten). */
#define RUN_ARRAYS(r)                                                                                  \
    {(r)->end, (r)->w, (r)->nbstart, (r)->nb, (r)->d, (r)->mate, (r)->top, (r)->parent, (r)->childs,   \
     (r)->endps, (r)->nchild, (r)->first, (r)->last, (r)->next, (r)->base, (r)->unused, (r)->label,    \
     (r)->labelend, (r)->best, (r)->bestlist, (r)->nbest, (r)->allowed, (r)->queue, (r)->touched,      \
     (r)->is_touched, (r)->freeb, (r)->is_freeb, (r)->forest, (r)->fpos, (r)->opened, (r)->exposed,    \
     (r)->spath, (r)->sendp, (r)->sforest, (r)->bt_edge, (r)->bt_slack, (r)->bt_keys, (r)->fstack_b,   \
     (r)->fstack_i, (r)->astack}

static void run_free(Run *r) {
    for (Py_ssize_t b = 0; b < 2 * (Py_ssize_t)r->n; b++) {
        if (r->childs) free(r->childs[b]);
        if (r->endps) free(r->endps[b]);
        if (r->bestlist) free(r->bestlist[b]);
    }
    void *arrays[] = RUN_ARRAYS(r);
    for (size_t q = 0; q < sizeof arrays / sizeof arrays[0]; q++) free(arrays[q]);
}

static int run_alloc(Run *r, idx n, Py_ssize_t m) {
    size_t n2 = 2 * (size_t)n, mm = (size_t)m;
    memset(r, 0, sizeof *r);
    r->n = n;
    r->m = m;
    r->end = alloc(2 * mm, sizeof(idx));
    r->w = alloc(mm, sizeof(i128));
    r->nbstart = alloc((size_t)n + 1, sizeof(idx));
    r->nb = alloc(2 * mm, sizeof(idx));
    r->d = alloc(n2, sizeof(i128));
    r->mate = alloc(n, sizeof(idx));
    r->top = alloc(n, sizeof(idx));
    r->parent = alloc(n2, sizeof(idx));
    r->childs = alloc(n2, sizeof(idx *));
    r->endps = alloc(n2, sizeof(idx *));
    r->nchild = alloc(n2, sizeof(idx));
    r->first = alloc(n2, sizeof(idx));
    r->last = alloc(n2, sizeof(idx));
    r->next = alloc(n, sizeof(idx));
    r->base = alloc(n2, sizeof(idx));
    r->unused = alloc(n, sizeof(idx));
    r->label = alloc(n2, sizeof(int8_t));
    r->labelend = alloc(n2, sizeof(idx));
    r->best = alloc(n2, sizeof(idx));
    r->bestlist = alloc(n2, sizeof(idx *));
    r->nbest = alloc(n2, sizeof(idx));
    r->allowed = alloc(mm, 1);
    r->touched = alloc(n2, sizeof(idx));
    r->is_touched = alloc(n2, 1);
    r->freeb = alloc(n, sizeof(idx));
    r->is_freeb = alloc(n, 1);
    r->forest = alloc(n2, sizeof(idx));
    r->fpos = alloc(n2, sizeof(idx));
    r->opened = alloc(mm, sizeof(idx));
    r->exposed = alloc(n, sizeof(idx));
    r->spath = alloc(n2 + 2, sizeof(idx));
    r->sendp = alloc(n2 + 2, sizeof(idx));
    r->sforest = alloc(n2, sizeof(idx));
    r->bt_edge = alloc(n2, sizeof(idx));
    r->bt_slack = alloc(n2, sizeof(i128));
    r->bt_keys = alloc(n2, sizeof(idx));
    r->fstack_b = alloc((size_t)n + 2, sizeof(idx));
    r->fstack_i = alloc((size_t)n + 2, sizeof(idx));
    r->astack = alloc((size_t)n + 2, sizeof(struct aframe));
    r->capqueue = n + 16;
    r->queue = alloc((size_t)r->capqueue, sizeof(idx));
    void *arrays[] = RUN_ARRAYS(r);
    for (size_t q = 0; q < sizeof arrays / sizeof arrays[0]; q++)
        if (!arrays[q]) return -1;
    for (idx x = 0; x < n; x++) {
        r->top[x] = x;
        r->first[x] = r->last[x] = x;
        r->next[x] = -1;
        r->mate[x] = -1;
        r->unused[x] = 2 * n - 1 - x; /* popped from the end: n first */
    }
    r->nunused = n;
    for (size_t x = 0; x < n2; x++) {
        r->parent[x] = -1;
        r->base[x] = (idx)x < n ? (idx)x : -1;
        r->labelend[x] = -1;
        r->best[x] = -1;
        r->nbest[x] = -1;
        r->fpos[x] = -1;
        r->bt_edge[x] = -1;
    }
    return 0;
}

/* CSR of the endpoints facing away from each vertex, in edge order. */
static void build_adjacency(Run *r) {
    idx n = r->n;
    for (Py_ssize_t k = 0; k < r->m; k++) {
        r->nbstart[r->end[2 * k] + 1]++;
        r->nbstart[r->end[2 * k + 1] + 1]++;
    }
    for (idx x = 0; x < n; x++) r->nbstart[x + 1] += r->nbstart[x];
    idx *fill = r->sforest; /* n2 >= n scratch */
    for (idx x = 0; x < n; x++) fill[x] = r->nbstart[x];
    for (Py_ssize_t k = 0; k < r->m; k++) {
        idx u = r->end[2 * k], v = r->end[2 * k + 1];
        r->nb[fill[u]++] = (idx)(2 * k + 1);
        r->nb[fill[v]++] = (idx)(2 * k);
    }
}

/* blossom.py's _tighten: lower the feasible doubled dual so the warm edges become tight. */
static void tighten(Run *r, const idx *warm, Py_ssize_t nwarm) {
    for (int pass = 0; pass < 3 && nwarm > 0; pass++)
        for (Py_ssize_t q = 0; q < nwarm; q++) {
            idx k = warm[q], u = r->end[2 * k], v = r->end[2 * k + 1];
            i128 w2 = 2 * r->w[k];
            if (r->d[u] + r->d[v] == w2) continue;
            i128 least[2] = {0, 0};
            int found[2] = {0, 0};
            idx ends[2] = {u, v};
            for (int s = 0; s < 2; s++) {
                idx x = ends[s], skip = ends[1 - s];
                for (idx e = r->nbstart[x]; e < r->nbstart[x + 1]; e++) {
                    idx p = r->nb[e], y = r->end[p];
                    if (y == skip) continue;
                    i128 val = 2 * r->w[p >> 1] - r->d[y];
                    if (!found[s] || val > least[s]) {
                        least[s] = val;
                        found[s] = 1;
                    }
                }
            }
            i128 lu = found[0] ? least[0] : w2 - r->d[v];
            i128 lv = found[1] ? least[1] : w2 - lu;
            if (lu + lv <= w2) {
                r->d[u] = lu;
                r->d[v] = w2 - lu;
                check_dual(r, r->d[u]);
                check_dual(r, r->d[v]);
                if (r->fail) return;
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

/* blossom.py's perfect_matching body after the parity check: 1, 0 or -1 as run(). */
static int solve_run(Run *r, const Start *s) {
    idx n = r->n;
    char *seen = r->is_freeb; /* zero here; cleared again below */
    for (Py_ssize_t k = 0; k < r->m; k++)
        for (int e = 0; e < 2; e++) {
            idx x = r->end[2 * k + e];
            if (!seen[x] || r->w[k] > r->d[x]) {
                r->d[x] = r->w[k];
                seen[x] = 1;
            }
        }
    int all_seen = 1;
    for (idx x = 0; x < n; x++) {
        all_seen &= seen[x];
        seen[x] = 0;
    }
    if (!all_seen) return 0;
    if (s->has_dual) { /* _carried */
        for (idx x = 0; x < n; x++) r->d[x] = s->y2[x];
        for (Py_ssize_t b = 0; b < s->nblossoms; b++)
            for (Py_ssize_t q = s->offsets[b]; q < s->offsets[b + 1]; q++) {
                idx x = s->members[q];
                r->d[x] += s->z[b];
                check_dual(r, r->d[x]);
                if (r->fail) return -1;
            }
        for (Py_ssize_t k = 0; k < r->m; k++) {
            idx u = r->end[2 * k], v = r->end[2 * k + 1];
            i128 shortfall = 2 * r->w[k] - r->d[u] - r->d[v];
            if (shortfall > 0) {
                r->d[u] += shortfall;
                check_dual(r, r->d[u]);
                if (r->fail) return -1;
            }
        }
    }
    tighten(r, s->warm, s->nwarm);
    if (r->fail) return -1;
    for (Py_ssize_t q = 0; q < s->nwarm; q++) {
        idx k = s->warm[q], u = r->end[2 * k], v = r->end[2 * k + 1];
        if (r->mate[u] == -1 && r->mate[v] == -1 && r->d[u] + r->d[v] == 2 * r->w[k]) {
            r->mate[u] = 2 * k + 1;
            r->mate[v] = 2 * k;
        }
    }
    for (idx x = 0; x < n; x++) /* exposed vertices start even (blossom.py) */
        if (r->mate[x] == -1 && (r->d[x] & 1)) {
            r->d[x] += 1;
            check_dual(r, r->d[x]);
        }
    if (r->fail) return -1;
    r->nexposed = 0;
    for (idx x = n - 1; x >= 0; x--)
        if (r->mate[x] == -1) r->exposed[r->nexposed++] = x;
    return run(r);
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
"Galil 1986), the body of blossom.perfect_matching. Buffers (any contiguous bytes-like):\n"
"u, v, warm_edges, warm_pairs, members: int64 in native order; offsets: int64, one more than\n"
"the carried blossoms; w (one per edge), y2 (n) and z (one per carried blossom): 16 bytes\n"
"each, little-endian two's complement. warm_edges are edge indices, warm_pairs vertex pairs\n"
"(a pair that is no edge is ignored); both are used, edges first. has_dual: y2, members,\n"
"offsets and z give a carried dual (blossom.Dual flattened).\n"
"\n"
"Returns None when there is no perfect matching, else (partner, y2, members, offsets, z):\n"
"partner is int64 per vertex, the rest as above for the blossoms with z > 0.\n"
"Raises Unsupported when a self-loop, |w| >= 2**118 or a dual beyond 2**124 would be\n"
"needed (the caller then runs the Python version) and ValueError, IndexError on bad input.");

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
    Run r;
    int have_run = 0;
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
    if (run_alloc(&r, (idx)n, m)) {
        run_free(&r);
        PyErr_NoMemory();
        goto done;
    }
    have_run = 1;
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
            r.end[2 * k] = (idx)pu[k];
            r.end[2 * k + 1] = (idx)pv[k];
            r.w[k] = read_i128(pw + 16 * k);
            if (r.w[k] >= WEIGHT_LIMIT || r.w[k] <= -WEIGHT_LIMIT) {
                PyErr_SetString(Unsupported, "a weight of 2**118 or more");
                goto done;
            }
        }
    }
    build_adjacency(&r);
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
            for (idx e = r.nbstart[a]; e < r.nbstart[a + 1]; e++)
                if (r.end[r.nb[e]] == b) {
                    warm[nwarm++] = r.nb[e] >> 1;
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
    found = solve_run(&r, &start);
    Py_END_ALLOW_THREADS
    if (found < 0) {
        if (r.fail == FAIL_MEMORY)
            PyErr_NoMemory();
        else if (r.fail == FAIL_RANGE)
            PyErr_SetString(Unsupported, "a dual of 2**124 or more");
        else
            PyErr_SetString(PyExc_RuntimeError, "blossom kernel: odd slack between outer blossoms");
        goto done;
    }
    if (found == 0) {
        out = Py_NewRef(Py_None);
        goto done;
    }
    {
        Py_ssize_t count = 0, size = 0;
        for (idx b = (idx)n; b < 2 * (idx)n; b++)
            if (r.base[b] >= 0 && r.d[b] > 0) {
                count++;
                for (idx x = r.first[b]; x != -1; x = leaf_next(&r, b, x)) size++;
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
            int64_t y = r.end[r.mate[x]];
            memcpy(pp + x, &y, sizeof y);
            write_i128(py + 16 * x, r.d[x]);
        }
        Py_ssize_t c = 0, s = 0;
        int64_t zero = 0;
        memcpy(po, &zero, sizeof zero);
        for (idx b = (idx)n; b < 2 * (idx)n; b++)
            if (r.base[b] >= 0 && r.d[b] > 0) {
                for (idx x = r.first[b]; x != -1; x = leaf_next(&r, b, x)) {
                    int64_t y = x;
                    memcpy(pm + s++, &y, sizeof y);
                }
                write_i128(pz + 16 * c, r.d[b]);
                int64_t e = s;
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
    if (have_run) run_free(&r);
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
"Compiled kernel of pairings.engine.blossom: maximum-weight perfect matching with its optimal\n"
"dual, Edmonds (1965) in the form surveyed by Galil (1986). Use blossom.perfect_matching.");

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

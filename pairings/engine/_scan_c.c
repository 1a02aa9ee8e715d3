/* Implicit scan of the pruned player pairs of one round (see pairings/engine/scan.py).
 *
 * Walks the pairs i < j in rank order that candidates.pruned_edges keeps, without materialising
 * them: per row i the partners j in (i, end[i]) (end from the score-gap bound; units are
 * non-increasing), less the do-not-pair keys, costed exactly as vector.Arrays.costs, kept when
 * candidates._not_above accepts the expanded cost. Three visits:
 *   stats     count, column maxima, score gaps present, rematch-free count;
 *   heaviest  per vertex the k pairs of largest weight (smallest encoded cost, weights.Encoder);
 *   violated  per vertex the k pairs of most negative doubled reduced cost
 *             rc = y2[i] + y2[j] + 2 * sum(z_B : i, j in B) - 2 w(i, j)   (LP duality over
 *             Edmonds' perfect matching polytope, certificate.py), the count of rc < 0, and every
 *             pair with rc == 0 (under an optimal dual: the pairs an optimum may use, canonical.py).
 * The blossom sum is P[lca(owner[i], owner[j])] in the laminar blossom tree (Euler tour plus a
 * sparse table of depth minima: constant time per pair). Exact integers: int32 cost columns,
 * __int128 place values, weights, duals and reduced costs (the Python wrapper bounds them).
 * The priority order of the criteria is not fixed here: prepare takes each criterion's column in the
 * cost row (the layout of pairings.costs, for the names ROLE_NAMES below). A pair's row is built in the
 * kernel's own order (the roles, then zeros for the pairing bye's own criteria), so costing and weighing
 * read fixed places; only the bound test walks the row in the table's order (slot), and the column
 * maxima go back in it.
 * Two threads take interleaved blocks of rows; per-vertex lists are merged under the total order
 * (key, i, j), so the answer does not depend on the threads.
 */
#define PY_SSIZE_T_CLEAN
#include <Python.h>
#include <pthread.h>
#include <stdint.h>
#include <stdlib.h>
#include <string.h>

typedef __int128 i128;

#define MAX_WIDTH 16
#define FIRST 1
#define SECOND (-1)
#define BLOCK 16
#define CAPSULE "pairings.engine._scan_c.Scan"

enum { MODE_STATS, MODE_HEAVIEST, MODE_VIOLATED };

/* The criteria this kernel costs (the others, the pairing bye's own, are 0 on every pair). The three
 * preferences are in strength order (criteria.MILD, STRONG, ABSOLUTE = 1, 2, 3). */
enum {
    ROLE_REMATCH, ROLE_SIDE_RULE, ROLE_SCORE_GAP, ROLE_PREF_MILD, ROLE_PREF_STRONG, ROLE_PREF_ABSOLUTE,
    ROLE_FLOAT_REPEAT, ROLE_FLOAT_REPEAT_2, ROLE_RANK_ORDER, ROLES
};
static const char *const ROLE_NAMES[ROLES] = {
    "rematch", "side_rule", "score_gap", "pref_mild", "pref_strong", "pref_absolute",
    "float_repeat", "float_repeat_2", "rank_order",
};

typedef struct {
    int32_t units, grank, gsize, abs_sd;
    int8_t want, strength;
    uint8_t breaks_first, breaks_second;
    uint8_t down1, up1, down2, up2;
    uint8_t miss_first;  /* strength (1..3) of the wish missed when this player gets the first side, 0: none */
    uint8_t miss_second; /* ... when it gets the second side */
} Player;

typedef struct {
    int64_t n;
    int sides;
    Player *p;
    int64_t *end;
    int64_t words;     /* history words per player */
    uint64_t *hfirst;  /* n * words: bit r set when the player had the first side in round r */
    uint64_t *hsecond;
    int64_t *rematch;
    Py_ssize_t nrematch;
    int64_t *forbid;
    Py_ssize_t nforbid;
    int64_t levels;    /* greedy pairing's largest gap (the bound's gap levels) */
    int width;               /* cost columns */
    int col[ROLES];          /* each role's column in the table's order */
    int8_t slot[MAX_WIDTH];  /* per table column: its place in the kernel's row (a role, or a zero slot) */
    int64_t *bound;    /* expanded bound, levels + width - 1 entries */
    int8_t *gapcmp;    /* per gap 0..levels: -1 below the bound, +1 above, 0 equal over the gap columns */
    int64_t span;      /* units[0] - units[n - 1] */
} Scan;

/* Blossom tree for the z sums: nodes 0..m-1 blossoms, m the virtual root. */
typedef struct {
    int64_t nodes;
    const int64_t *owner; /* per player: innermost blossom, or the root */
    int32_t *top;         /* per node: its top-level blossom (the root for the root) */
    int32_t *depth;
    int32_t *first;       /* first position in the Euler tour */
    int32_t *table;       /* levels x tour: node of least depth in [x, x + 2^level) */
    int64_t tour;
    const i128 *prefix;   /* per node: sum of z over the node and its ancestors */
} Tree;

typedef struct {
    i128 key;
    int64_t pid; /* i * n + j */
} Entry;

typedef struct {
    const Scan *s;
    int mode;
    int part, parts;
    int k;
    /* weights: the encoder's place values by place in the row (score_gap's 0) and by score gap (spread) */
    const i128 *cplace;
    const i128 *gplace;
    int64_t elevels;
    i128 top;
    /* reduced costs */
    const i128 *y2;
    const Tree *tree;
    /* outputs */
    int64_t count, rematch_free;
    int64_t maxima[MAX_WIDTH];
    uint8_t *gaps;
    Entry *entries;  /* n * k */
    int32_t *filled; /* n */
    int64_t *tight;  /* MODE_VIOLATED: keys of the pairs with rc == 0 */
    int64_t ntight, captight;
    int error;       /* 1: a gap beyond the encoder's levels; 2: out of memory */
} Work;

static void scan_free(Scan *s) {
    if (s == NULL)
        return;
    free(s->p);
    free(s->end);
    free(s->hfirst);
    free(s->hsecond);
    free(s->rematch);
    free(s->forbid);
    free(s->bound);
    free(s->gapcmp);
    free(s);
}

static void capsule_free(PyObject *capsule) {
    scan_free((Scan *)PyCapsule_GetPointer(capsule, CAPSULE));
}

static Py_ssize_t lower_bound(const int64_t *a, Py_ssize_t len, int64_t key) {
    Py_ssize_t lo = 0, hi = len;
    while (lo < hi) {
        Py_ssize_t mid = lo + (hi - lo) / 2;
        if (a[mid] < key)
            lo = mid + 1;
        else
            hi = mid;
    }
    return lo;
}

/* True when player i (ranked above j) gets the first side: vector.Arrays.first_of. */
static inline int first_of(const Scan *s, int64_t i, int64_t j) {
    const Player *a = &s->p[i], *b = &s->p[j];
    /* First the sides that break H3 for fewer of the two (breaks_* already leave out exempt players). */
    int i_first = a->breaks_first + b->breaks_second, j_first = b->breaks_first + a->breaks_second;
    if (i_first != j_first)
        return i_first < j_first;
    if (a->want != 0 && a->want != b->want)
        return a->want == FIRST;
    if (a->want == 0)
        return b->want == SECOND;
    /* Both want the same side: stronger, then larger |SD|, then alternation, then rank. */
    int i_wins;
    if (a->strength != b->strength)
        i_wins = a->strength > b->strength;
    else if (a->abs_sd != b->abs_sd)
        i_wins = a->abs_sd > b->abs_sd;
    else {
        i_wins = 1;
        const uint64_t *fi = s->hfirst + i * s->words, *si = s->hsecond + i * s->words;
        const uint64_t *fj = s->hfirst + j * s->words, *sj = s->hsecond + j * s->words;
        for (int64_t w = s->words - 1; w >= 0; w--) {
            uint64_t differ = (fi[w] & sj[w]) | (si[w] & fj[w]);
            if (differ) {
                int bit = 63 - __builtin_clzll(differ);
                int had = ((fi[w] >> bit) & 1) ? FIRST : SECOND;
                i_wins = had != a->want; /* whoever had the wanted side gives it up */
                break;
            }
        }
    }
    return i_wins == (a->want == FIRST);
}

/* Cost row of pair i < j, as vector.Arrays.costs, in the kernel's order (the rematch flag is given). */
static inline void cost_row(const Scan *s, int64_t i, int64_t j, int rematch, int32_t *c) {
    const Player *a = &s->p[i], *b = &s->p[j];
    memset(c, 0, sizeof(int32_t) * MAX_WIDTH);
    c[ROLE_REMATCH] = rematch;
    if (s->sides && (a->want != 0 || b->want != 0)) {
        const Player *f, *g;
        if (first_of(s, i, j)) {
            f = a;
            g = b;
        } else {
            f = b;
            g = a;
        }
        c[ROLE_SIDE_RULE] = f->breaks_first + g->breaks_second;
        if (f->miss_first)
            c[ROLE_PREF_MILD - 1 + f->miss_first] += 1;
        if (g->miss_second)
            c[ROLE_PREF_MILD - 1 + g->miss_second] += 1;
    }
    int32_t gap = a->units - b->units;
    c[ROLE_SCORE_GAP] = gap;
    if (gap > 0) {
        c[ROLE_FLOAT_REPEAT] = a->down1 + b->up1;
        c[ROLE_FLOAT_REPEAT_2] = a->down2 + b->up2;
        c[ROLE_RANK_ORDER] = b->grank + (a->gsize - 1 - a->grank);
    } else {
        int32_t d = b->grank - a->grank - a->gsize / 2;
        c[ROLE_RANK_ORDER] = d < 0 ? -d : d;
    }
}

/* candidates._not_above: the expanded row, walked in the table's order, is lexicographically <= the bound. */
static inline int not_above(const Scan *s, const int32_t *c) {
    const int64_t *b = s->bound;
    const int gi = s->col[ROLE_SCORE_GAP];
    for (int k = 0; k < gi; k++) {
        int32_t v = c[s->slot[k]];
        if (v != b[k])
            return v < b[k];
    }
    if (c[ROLE_SCORE_GAP] > s->levels)
        return 0;
    int8_t r = s->gapcmp[c[ROLE_SCORE_GAP]];
    if (r)
        return r < 0;
    const int64_t after = s->levels - 1; /* column k > gi sits at expanded position k - 1 + levels */
    for (int k = gi + 1; k < s->width; k++) {
        int32_t v = c[s->slot[k]];
        if (v != b[after + k])
            return v < b[after + k];
    }
    return 1;
}

/* candidates.admissible's filter on the row the engine weighs (implicit.py): the side-rule column
   less the players' unavoidable breaks (H3 broken whichever side they get; see the Notes of
   candidates.py). The row keeps that net column for the visit. */
static inline int admitted(const Scan *s, int64_t i, int64_t j, int32_t *c) {
    if (s->sides) {
        const Player *a = &s->p[i], *b = &s->p[j];
        c[ROLE_SIDE_RULE] -= (a->breaks_first & a->breaks_second) + (b->breaks_first & b->breaks_second);
    }
    return not_above(s, c);
}

static inline int before(i128 key, int64_t pid, const Entry *e) {
    return key < e->key || (key == e->key && pid < e->pid);
}

static inline void offer(Work *w, int64_t v, i128 key, int64_t pid) {
    int k = w->k;
    Entry *e = w->entries + v * k;
    int c = w->filled[v];
    if (c == k) {
        if (!before(key, pid, &e[k - 1]))
            return;
        c = k - 1;
    } else
        w->filled[v] = c + 1;
    while (c > 0 && before(key, pid, &e[c - 1])) {
        e[c] = e[c - 1];
        c--;
    }
    e[c].key = key;
    e[c].pid = pid;
}

static void keep_tight(Work *w, int64_t key) {
    if (w->ntight == w->captight) {
        int64_t cap = w->captight ? 2 * w->captight : 1024;
        int64_t *grown = realloc(w->tight, sizeof(int64_t) * cap);
        if (grown == NULL) {
            w->error = 2;
            return;
        }
        w->tight = grown;
        w->captight = cap;
    }
    w->tight[w->ntight++] = key;
}

static inline i128 encoded(Work *w, const int32_t *c) {
    const i128 *cplace = w->cplace;
    i128 total = 0;
    /* Unrolled: each role's test is its own branch, predicted role by role (score_gap's place is 0). */
#pragma GCC unroll 16
    for (int k = 0; k < ROLES; k++)
        if (c[k])
            total += (i128)c[k] * cplace[k];
    int32_t gap = c[ROLE_SCORE_GAP];
    if (gap) {
        if (gap > w->elevels) {
            w->error = 1;
            return 0;
        }
        total += w->gplace[gap];
    }
    return total;
}

static inline i128 common_z(const Tree *t, int64_t i, int64_t j) {
    int64_t a = t->owner[i], b = t->owner[j];
    if (t->top[a] != t->top[b] || a == t->nodes - 1)
        return 0; /* different top-level blossoms, or outside every blossom */
    if (a == b)
        return t->prefix[a];
    int32_t l = t->first[a], r = t->first[b];
    if (l > r) {
        int32_t x = l;
        l = r;
        r = x;
    }
    int level = 31 - __builtin_clz((unsigned)(r - l + 1));
    int32_t x = t->table[level * t->tour + l], y = t->table[level * t->tour + r - (1 << level) + 1];
    return t->prefix[t->depth[x] <= t->depth[y] ? x : y];
}

static void visit(Work *w, int64_t i, int64_t j, const int32_t *c) {
    const Scan *s = w->s;
    switch (w->mode) {
    case MODE_STATS:
        w->count++;
        w->rematch_free += c[ROLE_REMATCH] == 0;
#pragma GCC unroll 16
        for (int k = 0; k < ROLES; k++) /* by role; the zero slots stay 0 */
            if (c[k] > w->maxima[k])
                w->maxima[k] = c[k];
        w->gaps[c[ROLE_SCORE_GAP]] = 1;
        break;
    case MODE_HEAVIEST: {
        i128 key = encoded(w, c);
        int64_t pid = i * s->n + j;
        offer(w, i, key, pid);
        offer(w, j, key, pid);
        break;
    }
    default: {
        i128 weight = w->top - encoded(w, c);
        i128 rc = w->y2[i] + w->y2[j] + 2 * common_z(w->tree, i, j) - 2 * weight;
        if (rc == 0)
            keep_tight(w, i * s->n + j);
        else if (rc < 0) {
            int64_t pid = i * s->n + j;
            w->count++;
            offer(w, i, rc, pid);
            offer(w, j, rc, pid);
        }
    }
    }
}

static void *run(void *arg) {
    Work *w = (Work *)arg;
    const Scan *s = w->s;
    int64_t n = s->n;
    int32_t c[MAX_WIDTH];
    for (int64_t lo = (int64_t)w->part * BLOCK; lo < n; lo += (int64_t)w->parts * BLOCK) {
        int64_t hi = lo + BLOCK < n ? lo + BLOCK : n;
        for (int64_t i = lo; i < hi; i++) {
            int64_t end = s->end[i];
            if (end <= i + 1)
                continue;
            Py_ssize_t f = lower_bound(s->forbid, s->nforbid, i * n + i + 1);
            Py_ssize_t r = lower_bound(s->rematch, s->nrematch, i * n + i + 1);
            for (int64_t j = i + 1; j < end; j++) {
                int64_t key = i * n + j;
                while (f < s->nforbid && s->forbid[f] < key)
                    f++;
                if (f < s->nforbid && s->forbid[f] == key)
                    continue;
                while (r < s->nrematch && s->rematch[r] < key)
                    r++;
                cost_row(s, i, j, r < s->nrematch && s->rematch[r] == key, c);
                if (admitted(s, i, j, c))
                    visit(w, i, j, c);
            }
        }
    }
    return NULL;
}

/* Run the scan on `parts` threads (1 or 2) and merge into works[0]. */
static int run_all(Work *works, int parts) {
    pthread_t thread;
    int spawned = 0;
    if (parts > 1)
        spawned = pthread_create(&thread, NULL, run, &works[1]) == 0;
    if (parts > 1 && !spawned) {
        works[0].parts = 1; /* no second thread: one pass over every row */
        run(&works[0]);
        return 0;
    }
    run(&works[0]);
    if (!spawned)
        return 0;
    pthread_join(thread, NULL);
    Work *a = &works[0], *b = &works[1];
    a->count += b->count;
    a->rematch_free += b->rematch_free;
    a->error |= b->error;
    for (int64_t t = 0; t < b->ntight && !a->error; t++)
        keep_tight(a, b->tight[t]);
    for (int k = 0; k < ROLES; k++)
        if (b->maxima[k] > a->maxima[k])
            a->maxima[k] = b->maxima[k];
    if (a->gaps)
        for (int64_t g = 0; g <= a->s->span; g++)
            a->gaps[g] |= b->gaps[g];
    if (a->entries)
        for (int64_t v = 0; v < a->s->n; v++)
            for (int t = 0; t < b->filled[v]; t++)
                offer(a, v, b->entries[v * b->k + t].key, b->entries[v * b->k + t].pid);
    return 0;
}

static int buffer_of(Py_buffer *buf, Py_ssize_t count, Py_ssize_t itemsize, const char *what) {
    if (buf->len != count * itemsize) {
        PyErr_Format(PyExc_ValueError, "%s: expected %zd bytes, got %zd", what, count * itemsize, buf->len);
        return -1;
    }
    return 0;
}

#define SCORE_LIMIT (1LL << 30)

/* The caller's inputs, checked before anything is read through them: NULL when they hold, else why not.
 * The walk indexes players by the partner ranges (ends), the gap table by score differences (the rank
 * order: scores never rise), the preference columns by the missed strengths, and searches the sorted keys. */
static const char *bad_players(const int64_t *pl, const int64_t *ends, Py_ssize_t n) {
    for (Py_ssize_t i = 0; i < n; i++) {
        const int64_t *x = pl + 14 * i, *prev = pl + 14 * (i - 1);
        if (x[0] <= -SCORE_LIMIT || x[0] >= SCORE_LIMIT || x[3] < 0 || x[3] >= SCORE_LIMIT)
            return "a player's score or side difference is beyond the scan's range";
        if (i > 0 && (x[0] > prev[0] || (x[0] == prev[0] && x[1] <= prev[1])))
            return "the players are not in rank order (score, then rank in the score group)";
        if (x[2] < 1 || x[2] >= SCORE_LIMIT || x[1] < 0 || x[1] >= x[2])
            return "a player's rank in its score group is outside the group";
        if (x[4] < -1 || x[4] > 1 || x[5] < 0 || x[5] > 3)
            return "a side wish or its strength is out of range";
        for (int k = 6; k < 12; k++)
            if (x[k] != 0 && x[k] != 1)
                return "a side-rule or float flag is neither 0 nor 1";
        for (int k = 12; k < 14; k++)
            if (x[k] < 0 || x[k] > 3)
                return "a missed-preference strength is not 0, 1, 2 or 3";
        if (ends[i] < 0 || ends[i] > n)
            return "a player's partner range ends outside the field";
    }
    return NULL;
}

static const char *bad_keys(const int64_t *keys, Py_ssize_t count, Py_ssize_t n) {
    for (Py_ssize_t k = 0; k < count; k++) {
        if (keys[k] < 0 || keys[k] >= (int64_t)n * n)
            return "a rematch or do-not-pair key names a player outside the field";
        if (k > 0 && keys[k] <= keys[k - 1])
            return "the rematch and do-not-pair keys are not sorted without repeats";
    }
    return NULL;
}

/* The cost layout: width columns, each role's column (int64 x ROLES), distinct and inside the row. */
static const char *bad_layout(Py_ssize_t width, const Py_buffer *layout) {
    if (width < ROLES || width > MAX_WIDTH)
        return "the cost row's width is outside what the scan handles";
    if (layout->len != ROLES * 8)
        return "the layout does not name a column for every criterion the scan costs";
    const int64_t *col = layout->buf;
    for (int r = 0; r < ROLES; r++) {
        if (col[r] < 0 || col[r] >= width)
            return "a criterion's column is outside the cost row";
        for (int q = 0; q < r; q++)
            if (col[q] == col[r])
                return "two criteria share a column";
    }
    return NULL;
}

/* prepare(n, players, ends, words, hfirst, hsecond, rematch, forbid, sides, levels, bound, width, layout)
 * players: int64 n x 14 (units, grank, gsize, abs_sd, want, strength, breaks_first, breaks_second,
 * down1, up1, down2, up2, miss_first, miss_second); layout: the column of each ROLE_NAMES entry. */
static PyObject *prepare(PyObject *self, PyObject *args) {
    Py_ssize_t n, words, levels, width;
    int sides;
    Py_buffer players, ends, hfirst, hsecond, rematch, forbid, bound, layout;
    if (!PyArg_ParseTuple(args, "ny*y*ny*y*y*y*pny*ny*", &n, &players, &ends, &words, &hfirst, &hsecond,
                          &rematch, &forbid, &sides, &levels, &bound, &width, &layout))
        return NULL;
    PyObject *out = NULL;
    Scan *s = calloc(1, sizeof(Scan));
    if (s == NULL) {
        PyErr_NoMemory();
        goto done;
    }
    const char *why = bad_layout(width, &layout);
    if (why != NULL) {
        PyErr_SetString(PyExc_ValueError, why);
        goto done;
    }
    Py_ssize_t expanded = levels + width - 1; /* the bound: score_gap expanded into its levels */
    if (n < 0 || n >= (1 << 20) || words < 1 || words >= (1 << 16) || levels < 0 || levels >= (1 << 20) ||
        buffer_of(&players, n * 14, 8, "players") ||
        buffer_of(&ends, n, 8, "ends") || buffer_of(&hfirst, n * words, 8, "history") ||
        buffer_of(&hsecond, n * words, 8, "history") || buffer_of(&bound, expanded, 8, "bound") ||
        rematch.len % 8 || forbid.len % 8) {
        if (!PyErr_Occurred())
            PyErr_SetString(PyExc_ValueError, "bad scan arguments");
        goto done;
    }
    why = bad_players(players.buf, ends.buf, n);
    if (why == NULL)
        why = bad_keys(rematch.buf, rematch.len / 8, n);
    if (why == NULL)
        why = bad_keys(forbid.buf, forbid.len / 8, n);
    for (Py_ssize_t k = 0; why == NULL && k < expanded; k++)
        if (((const int64_t *)bound.buf)[k] < 0)
            why = "a bound entry is negative";
    if (why != NULL) {
        PyErr_SetString(PyExc_ValueError, why);
        goto done;
    }
    s->n = n;
    s->sides = sides;
    s->words = words;
    s->levels = levels;
    s->width = (int)width;
    memset(s->slot, -1, sizeof(s->slot));
    for (int r = 0; r < ROLES; r++) {
        s->col[r] = (int)((const int64_t *)layout.buf)[r];
        s->slot[s->col[r]] = (int8_t)r;
    }
    for (int k = 0, zero = ROLES; k < width; k++)
        if (s->slot[k] < 0)
            s->slot[k] = (int8_t)zero++; /* a column no role claims (0 on every pair): a zero slot */
    s->nrematch = rematch.len / 8;
    s->nforbid = forbid.len / 8;
    s->p = calloc(n ? n : 1, sizeof(Player));
    s->end = malloc((n ? n : 1) * 8);
    s->hfirst = malloc((n ? n : 1) * words * 8);
    s->hsecond = malloc((n ? n : 1) * words * 8);
    s->rematch = malloc(rematch.len ? rematch.len : 8);
    s->forbid = malloc(forbid.len ? forbid.len : 8);
    s->bound = malloc(expanded * 8);
    s->gapcmp = calloc(levels + 1, 1);
    if (!s->p || !s->end || !s->hfirst || !s->hsecond || !s->rematch || !s->forbid || !s->bound || !s->gapcmp) {
        PyErr_NoMemory();
        goto done;
    }
    const int64_t *pl = players.buf;
    for (Py_ssize_t i = 0; i < n; i++) {
        const int64_t *x = pl + 14 * i;
        Player *p = &s->p[i];
        p->units = (int32_t)x[0];
        p->grank = (int32_t)x[1];
        p->gsize = (int32_t)x[2];
        p->abs_sd = (int32_t)x[3];
        p->want = (int8_t)x[4];
        p->strength = (int8_t)x[5];
        p->breaks_first = (uint8_t)x[6];
        p->breaks_second = (uint8_t)x[7];
        p->down1 = (uint8_t)x[8];
        p->up1 = (uint8_t)x[9];
        p->down2 = (uint8_t)x[10];
        p->up2 = (uint8_t)x[11];
        p->miss_first = (uint8_t)x[12];
        p->miss_second = (uint8_t)x[13];
    }
    memcpy(s->end, ends.buf, n * 8);
    memcpy(s->hfirst, hfirst.buf, n * words * 8);
    memcpy(s->hsecond, hsecond.buf, n * words * 8);
    memcpy(s->rematch, rematch.buf, rematch.len);
    memcpy(s->forbid, forbid.buf, forbid.len);
    memcpy(s->bound, bound.buf, expanded * 8);
    for (Py_ssize_t g = 0; g <= levels; g++) {
        for (Py_ssize_t d = levels; d >= 1; d--) {
            int64_t e = g == d, b = s->bound[s->col[ROLE_SCORE_GAP] + levels - d];
            if (e != b) {
                s->gapcmp[g] = e < b ? -1 : 1;
                break;
            }
        }
    }
    s->span = n ? s->p[0].units - s->p[n - 1].units : 0;
    if (s->span < 0)
        s->span = 0;
    out = PyCapsule_New(s, CAPSULE, capsule_free);
    if (out != NULL)
        s = NULL;
done:
    scan_free(s);
    PyBuffer_Release(&players);
    PyBuffer_Release(&ends);
    PyBuffer_Release(&hfirst);
    PyBuffer_Release(&hsecond);
    PyBuffer_Release(&rematch);
    PyBuffer_Release(&forbid);
    PyBuffer_Release(&bound);
    PyBuffer_Release(&layout);
    return out;
}

static void works_free(Work *works, int parts) {
    for (int t = 0; t < parts; t++) {
        free(works[t].gaps);
        free(works[t].entries);
        free(works[t].filled);
        free(works[t].tight);
    }
}

static int works_init(Work *works, int parts, const Scan *s, int mode, int k) {
    memset(works, 0, sizeof(Work) * 2);
    for (int t = 0; t < parts; t++) {
        Work *w = &works[t];
        w->s = s;
        w->mode = mode;
        w->part = t;
        w->parts = parts;
        w->k = k;
        if (mode == MODE_STATS) {
            w->gaps = calloc(s->span + 1, 1);
            if (!w->gaps)
                return -1;
        } else {
            w->entries = malloc(sizeof(Entry) * (s->n ? s->n : 1) * k);
            w->filled = calloc(s->n ? s->n : 1, sizeof(int32_t));
            if (!w->entries || !w->filled)
                return -1;
        }
    }
    return 0;
}

static Scan *scan_of(PyObject *capsule) {
    return (Scan *)PyCapsule_GetPointer(capsule, CAPSULE);
}

static PyObject *stats(PyObject *self, PyObject *args) {
    PyObject *capsule;
    int parts;
    if (!PyArg_ParseTuple(args, "Oi", &capsule, &parts))
        return NULL;
    Scan *s = scan_of(capsule);
    if (s == NULL)
        return NULL;
    parts = parts > 1 ? 2 : 1;
    Work works[2];
    if (works_init(works, parts, s, MODE_STATS, 0)) {
        works_free(works, parts);
        return PyErr_NoMemory();
    }
    Py_BEGIN_ALLOW_THREADS
    run_all(works, parts);
    Py_END_ALLOW_THREADS
    Work *w = &works[0];
    PyObject *maxima = PyTuple_New(s->width), *gaps = PyList_New(0), *out = NULL;
    if (maxima && gaps) {
        for (int k = 0; k < s->width; k++) /* in the table's order */
            PyTuple_SET_ITEM(maxima, k, PyLong_FromLongLong(w->maxima[s->slot[k]]));
        for (int64_t g = 0; g <= s->span; g++)
            if (w->gaps[g]) {
                PyObject *x = PyLong_FromLongLong(g);
                if (x == NULL || PyList_Append(gaps, x)) {
                    Py_XDECREF(x);
                    goto fail;
                }
                Py_DECREF(x);
            }
        out = Py_BuildValue("LOOL", (long long)w->count, maxima, gaps, (long long)w->rematch_free);
    }
fail:
    Py_XDECREF(maxima);
    Py_XDECREF(gaps);
    works_free(works, parts);
    return out;
}

/* Pair keys of every per-vertex list (duplicates possible), as int64 bytes. */
static PyObject *collect(Work *w) {
    int64_t total = 0;
    for (int64_t v = 0; v < w->s->n; v++)
        total += w->filled[v];
    PyObject *out = PyBytes_FromStringAndSize(NULL, total * 8);
    if (out == NULL)
        return NULL;
    int64_t *keys = (int64_t *)PyBytes_AS_STRING(out), at = 0;
    for (int64_t v = 0; v < w->s->n; v++)
        for (int t = 0; t < w->filled[v]; t++)
            keys[at++] = w->entries[v * w->k + t].pid;
    return out;
}

static int int128_ok(Py_buffer *buf, Py_ssize_t count, const char *what) {
    return buffer_of(buf, count, 16, what) == 0;
}

static i128 int128_at(const void *buf, int64_t index) {
    i128 x;
    memcpy(&x, (const char *)buf + 16 * index, 16);
    return x;
}

/* The encoder's place values (weights.Encoder.place: the expanded components in the table's order,
 * score_gap's levels L..1 in its place) spread for encoded: role[r] for role r (0 for score_gap) and
 * the returned level[g] for a gap of g units (level[0] = 0). NULL when out of memory. */
static i128 *spread(const Scan *s, const void *place, int64_t elevels, i128 *role) {
    int gi = s->col[ROLE_SCORE_GAP];
    for (int r = 0; r < ROLES; r++) {
        int k = s->col[r];
        role[r] = k < gi ? int128_at(place, k) : k == gi ? 0 : int128_at(place, elevels - 1 + k);
    }
    i128 *level = malloc(sizeof(i128) * (elevels + 1));
    if (level != NULL) {
        level[0] = 0;
        for (int64_t g = 1; g <= elevels; g++)
            level[g] = int128_at(place, gi + elevels - g);
    }
    return level;
}

/* heaviest(capsule, parts, k, elevels, place (16-byte values), top (16 bytes)) -> bytes of keys */
static PyObject *heaviest(PyObject *self, PyObject *args) {
    PyObject *capsule;
    int parts, k;
    Py_ssize_t elevels;
    Py_buffer place, top;
    if (!PyArg_ParseTuple(args, "Oiiny*y*", &capsule, &parts, &k, &elevels, &place, &top))
        return NULL;
    PyObject *out = NULL;
    Scan *s = scan_of(capsule);
    Work works[2];
    i128 cplace[ROLES], *gplace = NULL;
    parts = parts > 1 ? 2 : 1;
    memset(works, 0, sizeof(works));
    if (s == NULL || k < 1 || elevels < 0 || !int128_ok(&place, elevels + s->width - 1, "place") || !int128_ok(&top, 1, "top")) {
        if (!PyErr_Occurred())
            PyErr_SetString(PyExc_ValueError, "bad heaviest arguments");
        goto done;
    }
    gplace = spread(s, place.buf, elevels, cplace);
    if (gplace == NULL || works_init(works, parts, s, MODE_HEAVIEST, k)) {
        PyErr_NoMemory();
        goto done;
    }
    for (int t = 0; t < parts; t++) {
        works[t].cplace = cplace;
        works[t].gplace = gplace;
        works[t].elevels = elevels;
    }
    Py_BEGIN_ALLOW_THREADS
    run_all(works, parts);
    Py_END_ALLOW_THREADS
    if (works[0].error)
        PyErr_SetString(PyExc_ValueError, "a pair's score gap is beyond the encoder's levels");
    else
        out = collect(&works[0]);
done:
    free(gplace);
    works_free(works, parts);
    PyBuffer_Release(&place);
    PyBuffer_Release(&top);
    return out;
}

static int build_tree(Tree *t, const int64_t *parent, int64_t nodes) {
    int64_t root = nodes - 1;
    int32_t *count = calloc(nodes + 1, sizeof(int32_t)), *kids = malloc(sizeof(int32_t) * nodes);
    int32_t *stack = malloc(sizeof(int32_t) * nodes), *next = malloc(sizeof(int32_t) * nodes);
    int32_t *euler = malloc(sizeof(int32_t) * (2 * nodes));
    t->top = malloc(sizeof(int32_t) * nodes);
    t->depth = malloc(sizeof(int32_t) * nodes);
    t->first = malloc(sizeof(int32_t) * nodes);
    int ok = count && kids && stack && next && euler && t->top && t->depth && t->first;
    if (ok) {
        for (int64_t b = 0; b < root; b++)
            count[parent[b] + 1]++;
        for (int64_t b = 0; b < nodes; b++)
            count[b + 1] += count[b];
        for (int64_t b = 0; b < nodes; b++)
            next[b] = count[b];
        for (int64_t b = 0; b < root; b++)
            kids[next[parent[b]]++] = (int32_t)b;
        for (int64_t b = 0; b < nodes; b++)
            next[b] = count[b];
        /* Iterative depth-first Euler tour from the root. */
        int64_t sp = 0, len = 0;
        stack[sp++] = (int32_t)root;
        t->depth[root] = 0;
        t->top[root] = (int32_t)root;
        t->first[root] = 0;
        euler[len++] = (int32_t)root;
        while (sp) {
            int32_t b = stack[sp - 1];
            if (next[b] < count[b + 1]) {
                int32_t c = kids[next[b]++];
                t->depth[c] = t->depth[b] + 1;
                t->top[c] = b == root ? c : t->top[b];
                t->first[c] = (int32_t)len;
                euler[len++] = c;
                stack[sp++] = c;
            } else {
                sp--;
                if (sp)
                    euler[len++] = stack[sp - 1];
            }
        }
        t->tour = len;
        int levels = 1;
        while ((1LL << levels) <= len)
            levels++;
        t->table = malloc(sizeof(int32_t) * levels * len);
        ok = t->table != NULL;
        if (ok) {
            memcpy(t->table, euler, sizeof(int32_t) * len);
            for (int l = 1; l < levels; l++) {
                int32_t *row = t->table + l * len, *prev = row - len;
                int64_t half = 1LL << (l - 1);
                for (int64_t x = 0; x + (1LL << l) <= len; x++) {
                    int32_t a = prev[x], b = prev[x + half];
                    row[x] = t->depth[a] <= t->depth[b] ? a : b;
                }
            }
        }
    }
    free(count);
    free(kids);
    free(stack);
    free(next);
    free(euler);
    return ok ? 0 : -1;
}

static void tree_free(Tree *t) {
    free(t->top);
    free(t->depth);
    free(t->first);
    free(t->table);
}

/* violated(capsule, parts, k, elevels, place, top, y2 (16 bytes per player), owner (int64 per player),
 *          parent (int64 per blossom, root = m), prefix (16 bytes per node, m + 1))
 * -> (keys of every vertex's k most violated pairs, count of rc < 0, keys of every pair with rc == 0) */
static PyObject *by_dual(PyObject *capsule, int parts, int k, Py_ssize_t elevels, Py_buffer *place,
                         Py_buffer *top, Py_buffer *y2, Py_buffer *owner, Py_buffer *parent, Py_buffer *prefix) {
    PyObject *out = NULL, *keys = NULL, *tight = NULL;
    Scan *s = scan_of(capsule);
    Work works[2];
    i128 cplace[ROLES], *gplace = NULL;
    Tree tree;
    memset(&tree, 0, sizeof(tree));
    memset(works, 0, sizeof(works));
    parts = parts > 1 ? 2 : 1;
    int64_t nodes = prefix->len / 16;
    if (s == NULL || k < 1 || elevels < 0 || nodes < 1 || !int128_ok(place, elevels + s->width - 1, "place") ||
        !int128_ok(top, 1, "top") || !int128_ok(y2, s->n, "y2") || !int128_ok(prefix, nodes, "prefix") ||
        buffer_of(owner, s->n, 8, "owner") || buffer_of(parent, nodes - 1, 8, "parent")) {
        if (!PyErr_Occurred())
            PyErr_SetString(PyExc_ValueError, "bad dual scan arguments");
        goto done;
    }
    const int64_t *own = owner->buf, *par = parent->buf;
    for (int64_t v = 0; v < s->n; v++)
        if (own[v] < 0 || own[v] >= nodes) {
            PyErr_SetString(PyExc_ValueError, "owner out of range");
            goto done;
        }
    for (int64_t b = 0; b < nodes - 1; b++)
        if (par[b] <= b || par[b] >= nodes) { /* parents are listed after their children */
            PyErr_SetString(PyExc_ValueError, "parent out of order");
            goto done;
        }
    tree.nodes = nodes;
    tree.owner = own;
    tree.prefix = prefix->buf;
    gplace = spread(s, place->buf, elevels, cplace);
    if (gplace == NULL || build_tree(&tree, par, nodes) || works_init(works, parts, s, MODE_VIOLATED, k)) {
        PyErr_NoMemory();
        goto done;
    }
    i128 topv;
    memcpy(&topv, top->buf, 16);
    for (int t = 0; t < parts; t++) {
        works[t].cplace = cplace;
        works[t].gplace = gplace;
        works[t].elevels = elevels;
        works[t].top = topv;
        works[t].y2 = y2->buf;
        works[t].tree = &tree;
    }
    Py_BEGIN_ALLOW_THREADS
    run_all(works, parts);
    Py_END_ALLOW_THREADS
    if (works[0].error) {
        if (works[0].error & 2)
            PyErr_NoMemory();
        else
            PyErr_SetString(PyExc_ValueError, "a pair's score gap is beyond the encoder's levels");
        goto done;
    }
    keys = collect(&works[0]);
    tight = PyBytes_FromStringAndSize((const char *)works[0].tight, works[0].ntight * 8);
    if (keys && tight)
        out = Py_BuildValue("OLO", keys, (long long)works[0].count, tight);
done:
    Py_XDECREF(keys);
    Py_XDECREF(tight);
    free(gplace);
    tree_free(&tree);
    works_free(works, parts);
    return out;
}

/* The Python entry point of by_dual (above). */
static PyObject *violated(PyObject *self, PyObject *args) {
    PyObject *capsule;
    int parts, k;
    Py_ssize_t elevels;
    Py_buffer place, top, y2, owner, parent, prefix;
    if (!PyArg_ParseTuple(args, "Oiiny*y*y*y*y*y*", &capsule, &parts, &k, &elevels, &place, &top, &y2, &owner,
                          &parent, &prefix))
        return NULL;
    PyObject *out = by_dual(capsule, parts, k, elevels, &place, &top, &y2, &owner, &parent, &prefix);
    PyBuffer_Release(&place);
    PyBuffer_Release(&top);
    PyBuffer_Release(&y2);
    PyBuffer_Release(&owner);
    PyBuffer_Release(&parent);
    PyBuffer_Release(&prefix);
    return out;
}

static PyMethodDef methods[] = {
    {"prepare", prepare, METH_VARARGS, "Per-player fields of one round's scan, as a capsule."},
    {"stats", stats, METH_VARARGS, "(count, column maxima, gaps, rematch-free count) of the pruned pairs."},
    {"heaviest", heaviest, METH_VARARGS, "Keys i * n + j of every vertex's k heaviest pruned pairs."},
    {"violated", violated, METH_VARARGS,
     "Keys of every vertex's k most violated pruned pairs, their count, and the keys of the tight pairs."},
    {NULL, NULL, 0, NULL},
};

static struct PyModuleDef module = {PyModuleDef_HEAD_INIT, "_scan_c", NULL, -1, methods};

/* The module, with ROLES: the names of the criteria prepare's layout gives a column for, in its order. */
PyMODINIT_FUNC PyInit__scan_c(void) {
    PyObject *m = PyModule_Create(&module), *roles = PyTuple_New(ROLES);
    if (m == NULL || roles == NULL)
        goto fail;
    for (int r = 0; r < ROLES; r++) {
        PyObject *name = PyUnicode_FromString(ROLE_NAMES[r]);
        if (name == NULL)
            goto fail;
        PyTuple_SET_ITEM(roles, r, name);
    }
    if (PyModule_AddObject(m, "ROLES", roles) == 0)
        return m;
fail:
    Py_XDECREF(roles);
    Py_XDECREF(m);
    return NULL;
}

/*
 * crystal_load.c - read one crystal YAML file into a dk_crystal.
 *
 * The only module that calls libyaml. The file is loaded as a libyaml
 * document (node graph with source marks), then walked with a strict
 * schema (crystals/README.md): unknown and duplicate keys, wrong types,
 * unknown formula kinds and non-finite numbers are errors reported with
 * file, line and column. Everything allocated lives in the crystal's arena.
 *
 * Limits, because every command loads every file of the folder: a file is
 * read only if it is a regular file (a FIFO or device would block or never
 * end) of at most DK_CRYSTAL_MAX_BYTES; the document is built from
 * libyaml's events in one pass that refuses nesting deeper than
 * DK_CRYSTAL_MAX_DEPTH, more than DK_CRYSTAL_MAX_NODES nodes and aliases
 * as they come (load_document).
 * The duplicate-key check sorts the keys of a mapping (n log n, no
 * quadratic worst case). A file whose top level is not a mapping with an
 * 'id' is "not a crystal file" and nothing of its content is quoted; all
 * quoted text has its control characters escaped, and names and texts
 * with control characters are refused (deltak/text.h).
 */
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>
#include <unistd.h>
#include <yaml.h>

#include "core/arena.h"
#include "data/crystal_load.h"
#include "deltak/crystal.h"
#include "deltak/text.h"

typedef struct ctx {
    const char *path;
    yaml_document_t *doc;
    dk_arena *arena;
    dk_error *err;
} ctx;

/* Coefficients of one axis, as the paper names them. */
typedef struct coef_table {
    int n;
    const char *names[64];
    double values[64];
} coef_table;

static dk_status
fail(ctx *c, const yaml_node_t *at, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

/* @path as it may be quoted: control characters escaped, long paths cut. */
typedef struct shown_path {
    char s[200];
} shown_path;

static shown_path
show_path(const char *path)
{
    shown_path p;
    dk_text_escape(path, p.s, sizeof p.s);
    return p;
}

static dk_status
fail(ctx *c, const yaml_node_t *at, const char *fmt, ...)
{
    char raw[384], what[300];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(raw, sizeof raw, fmt, ap);
    va_end(ap);
    dk_text_escape(raw, what, sizeof what); /* it may quote the file */
    shown_path p = show_path(c->path);
    if (at)
        return dk_error_set(c->err, DK_EPARSE,
                            "cannot load '%s': line %zu, column %zu: %s",
                            p.s, at->start_mark.line + 1,
                            at->start_mark.column + 1, what);
    return dk_error_set(c->err, DK_EPARSE, "cannot load '%s': %s", p.s, what);
}

static yaml_node_t *
node_at(ctx *c, int id)
{
    return yaml_document_get_node(c->doc, id);
}

static const char *
scalar(const yaml_node_t *n)
{
    return n && n->type == YAML_SCALAR_NODE ? (const char *)n->data.scalar.value
                                            : NULL;
}

/* A key of a mapping and its place in the file, for the duplicate check. */
typedef struct key_ref {
    const char *key;
    size_t index;
} key_ref;

static int
by_key_then_place(const void *a, const void *b)
{
    const key_ref *x = a, *y = b;
    int d = strcmp(x->key, y->key);
    return d ? d : (x->index > y->index) - (x->index < y->index);
}

/*
 * The first key of @map (in file order) that repeats an earlier one, or
 * -1; -2 when out of memory. The keys are sorted by (text, place): a
 * repeat is any entry equal to the one before it. n log n.
 */
static long
first_duplicate(ctx *c, yaml_node_t *map)
{
    size_t n = (size_t)(map->data.mapping.pairs.top -
                        map->data.mapping.pairs.start);
    if (n < 2)
        return -1;
    key_ref *refs = malloc(n * sizeof *refs);
    if (!refs)
        return -2;
    for (size_t i = 0; i < n; i++) {
        refs[i].key = scalar(node_at(c, map->data.mapping.pairs.start[i].key));
        refs[i].index = i;
    }
    qsort(refs, n, sizeof *refs, by_key_then_place);
    long first = -1;
    for (size_t i = 1; i < n; i++)
        if (strcmp(refs[i].key, refs[i - 1].key) == 0 &&
            (first < 0 || refs[i].index < (size_t)first))
            first = (long)refs[i].index;
    free(refs);
    return first;
}

/* Check that @map is a mapping whose keys are unique and all allowed. */
static dk_status
check_keys(ctx *c, yaml_node_t *map, const char *what,
           const char *const allowed[])
{
    if (!map || map->type != YAML_MAPPING_NODE)
        return fail(c, map, "%s must be a mapping of keys to values", what);
    for (yaml_node_pair_t *p = map->data.mapping.pairs.start;
         p < map->data.mapping.pairs.top; p++) {
        yaml_node_t *k = node_at(c, p->key);
        const char *ks = scalar(k);
        if (!ks)
            return fail(c, k, "keys of %s must be plain words", what);
        if (!dk_text_is_clean(ks, 0))
            return fail(c, k, "a key of %s contains control characters",
                        what);
        if (allowed) {
            int ok = 0;
            for (int i = 0; allowed[i]; i++)
                if (strcmp(allowed[i], ks) == 0)
                    ok = 1;
            if (!ok)
                return fail(c, k, "unknown key '%s' in %s", ks, what);
        }
    }
    long dup = first_duplicate(c, map);
    if (dup == -2)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    if (dup >= 0) {
        yaml_node_t *k = node_at(c, map->data.mapping.pairs.start[dup].key);
        return fail(c, k, "duplicate key '%s' in %s", scalar(k), what);
    }
    return DK_OK;
}

static yaml_node_t *
get(ctx *c, yaml_node_t *map, const char *key)
{
    for (yaml_node_pair_t *p = map->data.mapping.pairs.start;
         p < map->data.mapping.pairs.top; p++) {
        const char *ks = scalar(node_at(c, p->key));
        if (ks && strcmp(ks, key) == 0)
            return node_at(c, p->value);
    }
    return NULL;
}

/* Keys whose text names something (shown in tables, CSV, file names):
 * one line. Other texts (citations, notes) may have line breaks. */
static int
is_name_key(const char *key)
{
    return strcmp(key, "id") == 0 || strcmp(key, "name") == 0 ||
           strcmp(key, "aliases") == 0;
}

/* Text from a crystal file reaches terminals, reports and CSV files: no
 * control characters (escape sequences), and names on one line. */
static int
text_ok(const char *key, const char *s)
{
    return dk_text_is_clean(s, !is_name_key(key));
}

static dk_status
get_string(ctx *c, yaml_node_t *map, const char *key, int required,
           const char **out)
{
    yaml_node_t *n = get(c, map, key);
    if (!n) {
        if (required)
            return fail(c, map, "missing required key '%s'", key);
        *out = NULL;
        return DK_OK;
    }
    const char *s = scalar(n);
    if (!s)
        return fail(c, n, "'%s' must be text", key);
    if (!text_ok(key, s))
        return fail(c, n, "'%s' contains control characters%s", key,
                    is_name_key(key) ? " or line breaks (a name is one line)"
                                     : "");
    *out = dk_arena_strdup(c->arena, s);
    if (!*out)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    return DK_OK;
}

static dk_status
parse_number(ctx *c, yaml_node_t *n, const char *what, double *out)
{
    const char *s = scalar(n);
    if (!s || !*s)
        return fail(c, n, "'%s' must be a number", what);
    char *end;
    errno = 0;
    double v = strtod(s, &end);
    if (end == s || *end != '\0')
        return fail(c, n, "'%s' must be a number, not '%s'", what, s);
    if (!isfinite(v) || errno == ERANGE)
        return fail(c, n, "'%s' is not a finite number: '%s'", what, s);
    *out = v;
    return DK_OK;
}

static dk_status
get_number(ctx *c, yaml_node_t *map, const char *key, int required,
           double *out)
{
    yaml_node_t *n = get(c, map, key);
    if (!n)
        return required ? fail(c, map, "missing required key '%s'", key)
                        : DK_OK;
    return parse_number(c, n, key, out);
}

/* A two-element [lo, hi] list with lo <= hi. */
static dk_status
get_range(ctx *c, yaml_node_t *map, const char *key, int required,
          double out[2])
{
    yaml_node_t *n = get(c, map, key);
    if (!n)
        return required ? fail(c, map, "missing required key '%s'", key)
                        : DK_OK;
    if (n->type != YAML_SEQUENCE_NODE ||
        n->data.sequence.items.top - n->data.sequence.items.start != 2)
        return fail(c, n, "'%s' must be a list of two numbers [low, high]",
                    key);
    double v[2];
    for (int i = 0; i < 2; i++) {
        dk_status s = parse_number(
            c, node_at(c, n->data.sequence.items.start[i]), key, &v[i]);
        if (s)
            return s;
    }
    if (v[0] > v[1])
        return fail(c, n, "'%s' must be [low, high] with low <= high", key);
    out[0] = v[0];
    out[1] = v[1];
    return DK_OK;
}

static int
seq_len(const yaml_node_t *n)
{
    return (int)(n->data.sequence.items.top - n->data.sequence.items.start);
}

static dk_status
get_string_list(ctx *c, yaml_node_t *map, const char *key,
                const char ***out, int *count)
{
    yaml_node_t *n = get(c, map, key);
    *count = 0;
    *out = NULL;
    if (!n)
        return DK_OK;
    if (n->type != YAML_SEQUENCE_NODE)
        return fail(c, n, "'%s' must be a list of texts", key);
    int len = seq_len(n);
    /* Every name of every crystal is compared with every other's when a
     * folder loads: keep the names few. */
    if (strcmp(key, "aliases") == 0 && len > DK_CRYSTAL_MAX_ALIASES)
        return fail(c, n, "more than %d aliases (the limit for a crystal "
                          "file)",
                    DK_CRYSTAL_MAX_ALIASES);
    const char **list = dk_arena_alloc(c->arena, sizeof(char *) * (len + 1));
    if (!list)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    for (int i = 0; i < len; i++) {
        yaml_node_t *it = node_at(c, n->data.sequence.items.start[i]);
        if (!scalar(it))
            return fail(c, it, "items of '%s' must be texts", key);
        if (!text_ok(key, scalar(it)))
            return fail(c, it, "an item of '%s' contains control "
                               "characters%s",
                        key, is_name_key(key) ? " or line breaks" : "");
        list[i] = dk_arena_strdup(c->arena, scalar(it));
        if (!list[i])
            return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    }
    *out = list;
    *count = len;
    return DK_OK;
}

static int
axis_index(const char *s)
{
    if (!s || strlen(s) != 1)
        return -1;
    switch (s[0]) {
    case 'X': return 0;
    case 'Y': return 1;
    case 'Z': return 2;
    }
    return -1;
}

/* ---- dispersion sets ---- */

static dk_status
read_coefficients(ctx *c, yaml_node_t *map, coef_table *t)
{
    t->n = 0;
    yaml_node_t *n = get(c, map, "coefficients");
    if (!n)
        return DK_OK;
    dk_status s = check_keys(c, n, "'coefficients'", NULL);
    if (s)
        return s;
    for (yaml_node_pair_t *p = n->data.mapping.pairs.start;
         p < n->data.mapping.pairs.top; p++) {
        if (t->n >= 64)
            return fail(c, n, "more than 64 coefficients");
        const char *name = scalar(node_at(c, p->key));
        t->names[t->n] = name;
        s = parse_number(c, node_at(c, p->value), name, &t->values[t->n]);
        if (s)
            return s;
        t->n++;
    }
    return DK_OK;
}

/* A literal number, a coefficient name, or a negated name "-a6". */
static dk_status
resolve_value(ctx *c, yaml_node_t *n, const coef_table *t, double *out)
{
    const char *s = scalar(n);
    if (!s || !*s)
        return fail(c, n, "a term coefficient must be a number or a name");
    char *end;
    double v = strtod(s, &end);
    if (end != s && *end == '\0') {
        if (!isfinite(v))
            return fail(c, n, "'%s' is not a finite number", s);
        *out = v;
        return DK_OK;
    }
    double sign = 1;
    const char *name = s;
    if (*name == '-') {
        sign = -1;
        name++;
    }
    for (int i = 0; i < t->n; i++)
        if (strcmp(t->names[i], name) == 0) {
            *out = sign * t->values[i];
            return DK_OK;
        }
    return fail(c, n, "'%s' is neither a number nor a name in "
                      "'coefficients'", s);
}

static dk_status
read_poly(ctx *c, yaml_node_t *term, const char *key, int required,
          const coef_table *t, dk_poly *p)
{
    yaml_node_t *n = get(c, term, key);
    p->n = 0;
    if (!n)
        return required ? fail(c, term, "term needs '%s'", key) : DK_OK;
    if (n->type == YAML_SCALAR_NODE) {
        p->n = 1;
        return resolve_value(c, n, t, &p->c[0]);
    }
    if (n->type != YAML_SEQUENCE_NODE || seq_len(n) < 1 ||
        seq_len(n) > DK_POLY_MAX)
        return fail(c, n,
                    "'%s' must be a list of 1 to %d coefficients "
                    "[c0, c1, ...] (polynomial in the temperature variable)",
                    key, DK_POLY_MAX);
    p->n = seq_len(n);
    for (int i = 0; i < p->n; i++) {
        dk_status s = resolve_value(
            c, node_at(c, n->data.sequence.items.start[i]), t, &p->c[i]);
        if (s)
            return s;
    }
    return DK_OK;
}

static const char *const term_keys[] = {
    "kind", "value", "strength", "position", "squared", "exponent",
    "factor", "upper", "lower", NULL};

static dk_status
read_term(ctx *c, yaml_node_t *n, const coef_table *t, int has_temp,
          dk_term *tm)
{
    dk_status s = check_keys(c, n, "a term", term_keys);
    if (s)
        return s;
    const char *kind = scalar(get(c, n, "kind"));
    if (!kind)
        return fail(c, n, "term needs 'kind' (constant, pole, pole_x2, "
                          "power or log_ratio)");
    memset(tm, 0, sizeof *tm);
    tm->factor = 1;
    if (strcmp(kind, "constant") == 0) {
        tm->kind = DK_TERM_CONSTANT;
        s = read_poly(c, n, "value", 1, t, &tm->strength);
    } else if (strcmp(kind, "pole") == 0 || strcmp(kind, "pole_x2") == 0) {
        tm->kind = kind[4] ? DK_TERM_POLE_X2 : DK_TERM_POLE;
        s = read_poly(c, n, "strength", 1, t, &tm->strength);
        if (!s)
            s = read_poly(c, n, "position", 1, t, &tm->position);
        yaml_node_t *sq = get(c, n, "squared");
        if (!s && sq) {
            const char *v = scalar(sq);
            if (v && strcmp(v, "true") == 0)
                tm->squared = 1;
            else if (!v || strcmp(v, "false") != 0)
                return fail(c, sq, "'squared' must be true or false");
        }
    } else if (strcmp(kind, "power") == 0) {
        tm->kind = DK_TERM_POWER;
        s = read_poly(c, n, "strength", 1, t, &tm->strength);
        if (!s)
            s = get_number(c, n, "exponent", 1, &tm->exponent);
    } else if (strcmp(kind, "log_ratio") == 0) {
        tm->kind = DK_TERM_LOG_RATIO;
        s = read_poly(c, n, "strength", 1, t, &tm->strength);
        if (!s)
            s = read_poly(c, n, "upper", 1, t, &tm->position);
        if (!s)
            s = read_poly(c, n, "lower", 1, t, &tm->lower);
    } else {
        return fail(c, get(c, n, "kind"),
                    "unknown term kind '%s' (known: constant, pole, "
                    "pole_x2, power, log_ratio)",
                    kind);
    }
    if (s)
        return s;
    yaml_node_t *fac = get(c, n, "factor");
    if (fac) {
        const char *v = scalar(fac);
        if (v && strcmp(v, "1/pi") == 0)
            tm->factor = 1 / M_PI;
        else if ((s = parse_number(c, fac, "factor", &tm->factor)))
            return s;
    }
    if (!has_temp && (tm->strength.n > 1 || tm->position.n > 1 ||
                      tm->lower.n > 1))
        return fail(c, n, "temperature coefficients given but the set has "
                          "no 'temperature_variable'");
    return DK_OK;
}

static const char *const axis_keys[] = {"formula", "coefficients", "terms",
                                        "citation", NULL};

static dk_status
read_axis(ctx *c, yaml_node_t *n, const dk_dispersion_set *set,
          dk_axis_formula *ax)
{
    dk_status s = check_keys(c, n, "an axis of a dispersion set", axis_keys);
    if (s)
        return s;
    if ((s = get_string(c, n, "formula", 1, &ax->formula)) ||
        (s = get_string(c, n, "citation", 0, &ax->citation)))
        return s;
    coef_table t;
    if ((s = read_coefficients(c, n, &t)))
        return s;
    yaml_node_t *terms = get(c, n, "terms");
    if (!terms || terms->type != YAML_SEQUENCE_NODE || seq_len(terms) < 1)
        return fail(c, terms ? terms : n, "axis needs a non-empty list "
                                          "'terms'");
    ax->nterms = seq_len(terms);
    ax->terms = dk_arena_alloc(c->arena, sizeof(dk_term) * ax->nterms);
    if (!ax->terms)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    for (int i = 0; i < ax->nterms; i++) {
        s = read_term(c, node_at(c, terms->data.sequence.items.start[i]), &t,
                      set->temp_form != DK_TEMP_NONE, &ax->terms[i]);
        if (s)
            return s;
    }
    return DK_OK;
}

static const char *const thermo_keys[] = {
    "citation", "formula", "reference_temperature_C", "temperature_range_C",
    "factor", "lambda_exponents", "axes", NULL};

static dk_status
read_thermo(ctx *c, yaml_node_t *n, dk_dispersion_set *set)
{
    dk_status s = check_keys(c, n, "'thermo_optic'", thermo_keys);
    if (s)
        return s;
    dk_thermo *th = &set->thermo;
    th->factor = 1;
    if ((s = get_string(c, n, "citation", 1, &th->citation)) ||
        (s = get_string(c, n, "formula", 1, &th->formula)) ||
        (s = get_number(c, n, "reference_temperature_C", 1,
                        &th->reference_temperature_c)) ||
        (s = get_range(c, n, "temperature_range_C", 1,
                       th->temperature_range_c)) ||
        (s = get_number(c, n, "factor", 0, &th->factor)))
        return s;
    yaml_node_t *ex = get(c, n, "lambda_exponents");
    if (!ex || ex->type != YAML_SEQUENCE_NODE || seq_len(ex) < 1 ||
        seq_len(ex) > DK_THERMO_EXPS)
        return fail(c, ex ? ex : n, "'lambda_exponents' must be a list of 1 "
                                    "to %d numbers", DK_THERMO_EXPS);
    th->nexps = seq_len(ex);
    for (int j = 0; j < th->nexps; j++)
        if ((s = parse_number(c, node_at(c, ex->data.sequence.items.start[j]),
                              "lambda_exponents", &th->exps[j])))
            return s;
    yaml_node_t *axes = get(c, n, "axes");
    if ((s = check_keys(c, axes, "'thermo_optic: axes'", NULL)))
        return s;
    static const char *const tax_keys[] = {"coefficients", "orders",
                                           "order_factors", NULL};
    for (yaml_node_pair_t *p = axes->data.mapping.pairs.start;
         p < axes->data.mapping.pairs.top; p++) {
        yaml_node_t *k = node_at(c, p->key), *v = node_at(c, p->value);
        const char *label = scalar(k);
        dk_axis_formula *ax = NULL;
        for (int i = 0; i < set->naxes; i++)
            if (strlen(label) == 1 && set->axes[i].label == label[0])
                ax = &set->axes[i];
        if (!ax)
            return fail(c, k, "thermo-optic axis '%s' is not an axis of set "
                              "'%s'", label, set->name);
        if ((s = check_keys(c, v, "a thermo-optic axis", tax_keys)))
            return s;
        coef_table t;
        if ((s = read_coefficients(c, v, &t)))
            return s;
        yaml_node_t *ord = get(c, v, "orders");
        if (!ord || ord->type != YAML_SEQUENCE_NODE || seq_len(ord) < 1 ||
            seq_len(ord) > DK_THERMO_ORDERS)
            return fail(c, ord ? ord : v, "'orders' must be a list of 1 to "
                                          "%d lists", DK_THERMO_ORDERS);
        ax->thermo.orders = seq_len(ord);
        for (int k2 = 0; k2 < ax->thermo.orders; k2++) {
            yaml_node_t *row = node_at(c, ord->data.sequence.items.start[k2]);
            if (row->type != YAML_SEQUENCE_NODE ||
                seq_len(row) != th->nexps)
                return fail(c, row, "each row of 'orders' must list one "
                                    "coefficient per lambda exponent (%d)",
                            th->nexps);
            for (int j = 0; j < th->nexps; j++)
                if ((s = resolve_value(
                         c, node_at(c, row->data.sequence.items.start[j]), &t,
                         &ax->thermo.c[k2][j])))
                    return s;
        }
        for (int k2 = 0; k2 < DK_THERMO_ORDERS; k2++)
            ax->thermo.order_factor[k2] = 1;
        yaml_node_t *of = get(c, v, "order_factors");
        if (of) {
            if (of->type != YAML_SEQUENCE_NODE ||
                seq_len(of) != ax->thermo.orders)
                return fail(c, of, "'order_factors' must list one factor per "
                                   "row of 'orders' (%d)", ax->thermo.orders);
            for (int k2 = 0; k2 < ax->thermo.orders; k2++)
                if ((s = resolve_value(
                         c, node_at(c, of->data.sequence.items.start[k2]), &t,
                         &ax->thermo.order_factor[k2])))
                    return s;
        }
        ax->has_thermo = 1;
    }
    set->has_thermo = 1;
    return DK_OK;
}

static const char *const set_keys[] = {
    "name", "citation", "doi", "status", "note", "wavelength_range_um",
    "temperature_range_C", "reference_temperature_C", "variable",
    "energy_constant_eV_um", "temperature_variable", "quantity", "axes",
    "thermo_optic", NULL};

static dk_status
read_set(ctx *c, yaml_node_t *n, const char *labels, dk_dispersion_set *set)
{
    dk_status s = check_keys(c, n, "a dispersion set", set_keys);
    if (s)
        return s;
    const char *status = NULL, *var = NULL, *qty = NULL;
    if ((s = get_string(c, n, "name", 1, &set->name)) ||
        (s = get_string(c, n, "citation", 1, &set->citation)) ||
        (s = get_string(c, n, "doi", 0, &set->doi)) ||
        (s = get_string(c, n, "note", 0, &set->note)) ||
        (s = get_string(c, n, "status", 1, &status)) ||
        (s = get_range(c, n, "wavelength_range_um", 1,
                       set->wavelength_range_um)) ||
        (s = get_number(c, n, "reference_temperature_C", 1,
                        &set->reference_temperature_c)) ||
        (s = get_string(c, n, "variable", 0, &var)) ||
        (s = get_string(c, n, "quantity", 1, &qty)))
        return s;
    if (strcmp(status, "checked") == 0)
        set->from_memory = 0;
    else if (strcmp(status, "from memory") == 0)
        set->from_memory = 1;
    else
        return fail(c, get(c, n, "status"), "'status' must be 'checked' or "
                                            "'from memory'");
    if (!var || strcmp(var, "wavelength_um") == 0) {
        set->variable = DK_VAR_WAVELENGTH_UM;
    } else if (strcmp(var, "photon_energy_eV") == 0) {
        set->variable = DK_VAR_ENERGY_EV;
        if ((s = get_number(c, n, "energy_constant_eV_um", 1,
                            &set->energy_constant_ev_um)))
            return s;
    } else {
        return fail(c, get(c, n, "variable"), "unknown variable '%s' (known: "
                                              "wavelength_um, photon_energy_eV)",
                    var);
    }
    if (strcmp(qty, "n_squared") == 0)
        set->quantity = DK_QTY_N_SQUARED;
    else if (strcmp(qty, "n") == 0)
        set->quantity = DK_QTY_N;
    else
        return fail(c, get(c, n, "quantity"), "unknown quantity '%s' "
                                              "(known: n_squared, n)", qty);

    set->temp_form = DK_TEMP_NONE;
    yaml_node_t *tv = get(c, n, "temperature_variable");
    if (tv) {
        static const char *const tv_keys[] = {"form", "t0", "t1", NULL};
        const char *form = NULL;
        if ((s = check_keys(c, tv, "'temperature_variable'", tv_keys)) ||
            (s = get_string(c, tv, "form", 1, &form)) ||
            (s = get_number(c, tv, "t0", 1, &set->t0)))
            return s;
        if (strcmp(form, "difference") == 0)
            set->temp_form = DK_TEMP_DIFFERENCE;
        else if (strcmp(form, "product") == 0) {
            set->temp_form = DK_TEMP_PRODUCT;
            if ((s = get_number(c, tv, "t1", 1, &set->t1)))
                return s;
        } else
            return fail(c, tv, "unknown temperature form '%s' (known: "
                               "difference, product)", form);
        if ((s = get_range(c, n, "temperature_range_C", 1,
                           set->temperature_range_c)))
            return s;
    } else {
        set->temperature_range_c[0] = set->temperature_range_c[1] =
            set->reference_temperature_c;
        if ((s = get_range(c, n, "temperature_range_C", 0,
                           set->temperature_range_c)))
            return s;
    }

    yaml_node_t *axes = get(c, n, "axes");
    if (!axes)
        return fail(c, n, "dispersion set '%s' needs 'axes'", set->name);
    if ((s = check_keys(c, axes, "'axes'", NULL)))
        return s;
    for (yaml_node_pair_t *p = axes->data.mapping.pairs.start;
         p < axes->data.mapping.pairs.top; p++) {
        yaml_node_t *k = node_at(c, p->key);
        const char *label = scalar(k);
        if (strlen(label) != 1 || !strchr(labels, label[0]))
            return fail(c, k, "axis '%s' does not fit this crystal's class "
                              "(use one of '%s')", label, labels);
        dk_axis_formula *ax = &set->axes[set->naxes++];
        ax->label = label[0];
        if ((s = read_axis(c, node_at(c, p->value), set, ax)))
            return s;
    }
    if (set->naxes == 0)
        return fail(c, axes, "dispersion set '%s' has no axes", set->name);
    yaml_node_t *th = get(c, n, "thermo_optic");
    if (th) {
        if (set->temp_form != DK_TEMP_NONE)
            return fail(c, th, "set '%s' already depends on temperature; a "
                               "'thermo_optic' add-on would count it twice",
                        set->name);
        if ((s = read_thermo(c, th, set)))
            return s;
    }
    return DK_OK;
}

/* ---- the crystal ---- */

static dk_status
read_expansion(ctx *c, yaml_node_t *n, dk_crystal *cr)
{
    static const char *const keys[] = {"citation", "doi", "reference_temperature_C",
                                       "axes", "note", NULL};
    static const char *const ax_keys[] = {"alpha_per_C", "beta_per_C2", NULL};
    const char *doi = NULL, *note = NULL;
    dk_status s;
    if ((s = check_keys(c, n, "'thermal_expansion'", keys)) ||
        (s = get_string(c, n, "citation", 1, &cr->expansion_citation)) ||
        (s = get_string(c, n, "doi", 0, &doi)) ||
        (s = get_string(c, n, "note", 0, &note)) ||
        (s = get_number(c, n, "reference_temperature_C", 1,
                        &cr->expansion_reference_c)))
        return s;
    yaml_node_t *axes = get(c, n, "axes");
    if (!axes)
        return fail(c, n, "'thermal_expansion' needs 'axes'");
    if ((s = check_keys(c, axes, "'thermal_expansion: axes'", NULL)))
        return s;
    for (yaml_node_pair_t *p = axes->data.mapping.pairs.start;
         p < axes->data.mapping.pairs.top; p++) {
        yaml_node_t *k = node_at(c, p->key), *v = node_at(c, p->value);
        int i = axis_index(scalar(k));
        if (i < 0)
            return fail(c, k, "expansion axis must be X, Y or Z");
        if ((s = check_keys(c, v, "an expansion axis", ax_keys)) ||
            (s = get_number(c, v, "alpha_per_C", 1,
                            &cr->expansion[i].alpha_per_c)) ||
            (s = get_number(c, v, "beta_per_C2", 0,
                            &cr->expansion[i].beta_per_c2)))
            return s;
        cr->expansion[i].present = 1;
    }
    cr->has_expansion = 1;
    return DK_OK;
}

static int
valid_d_name(const char *s)
{
    return s && strlen(s) == 3 && s[0] == 'd' && s[1] >= '1' && s[1] <= '3' &&
           s[2] >= '1' && s[2] <= '6';
}

static dk_status
read_nonlinear(ctx *c, yaml_node_t *n, dk_crystal *cr)
{
    static const char *const keys[] = {"citation", "doi", "wavelength_um",
                                       "convention", "status", "note",
                                       "d_pm_per_V", NULL};
    const char *status = NULL, *doi = NULL, *note = NULL;
    dk_status s;
    if ((s = check_keys(c, n, "'nonlinear'", keys)) ||
        (s = get_string(c, n, "citation", 1, &cr->nl_citation)) ||
        (s = get_string(c, n, "doi", 0, &doi)) ||
        (s = get_string(c, n, "note", 0, &note)) ||
        (s = get_string(c, n, "convention", 1, &cr->nl_convention)) ||
        (s = get_string(c, n, "status", 1, &status)) ||
        (s = get_number(c, n, "wavelength_um", 1, &cr->nl_wavelength_um)))
        return s;
    if (strcmp(status, "checked") == 0)
        cr->nl_from_memory = 0;
    else if (strcmp(status, "from memory") == 0)
        cr->nl_from_memory = 1;
    else
        return fail(c, get(c, n, "status"), "'status' must be 'checked' or "
                                            "'from memory'");
    yaml_node_t *d = get(c, n, "d_pm_per_V");
    if (!d)
        return fail(c, n, "'nonlinear' needs 'd_pm_per_V'");
    if ((s = check_keys(c, d, "'d_pm_per_V'", NULL)))
        return s;
    for (yaml_node_pair_t *p = d->data.mapping.pairs.start;
         p < d->data.mapping.pairs.top; p++) {
        yaml_node_t *k = node_at(c, p->key);
        const char *name = scalar(k);
        if (!valid_d_name(name))
            return fail(c, k, "'%s' is not a d coefficient name (d11 .. d36)",
                        name);
        if (cr->nd >= DK_D_MAX)
            return fail(c, k, "too many d coefficients");
        memcpy(cr->d_names[cr->nd], name, 4);
        if ((s = parse_number(c, node_at(c, p->value), name,
                              &cr->d_values[cr->nd])))
            return s;
        cr->nd++;
    }
    cr->has_nonlinear = 1;
    return DK_OK;
}

static dk_status
read_cautions(ctx *c, yaml_node_t *root, dk_crystal *cr)
{
    dk_status s = get_string_list(c, root, "cautions", &cr->cautions,
                                  &cr->ncautions);
    if (s)
        return s;
    yaml_node_t *r = get(c, root, "caution_ranges");
    if (!r)
        return DK_OK;
    if (r->type != YAML_SEQUENCE_NODE)
        return fail(c, r, "'caution_ranges' must be a list");
    cr->ncaution_ranges = seq_len(r);
    cr->caution_ranges = dk_arena_alloc(
        c->arena, sizeof(dk_caution_range) * (cr->ncaution_ranges + 1));
    if (!cr->caution_ranges)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    static const char *const keys[] = {"below_C", "above_C", "text", NULL};
    for (int i = 0; i < cr->ncaution_ranges; i++) {
        yaml_node_t *it = node_at(c, r->data.sequence.items.start[i]);
        dk_caution_range *cr_i = &cr->caution_ranges[i];
        if ((s = check_keys(c, it, "a caution range", keys)) ||
            (s = get_string(c, it, "text", 1, &cr_i->text)))
            return s;
        yaml_node_t *b = get(c, it, "below_C"), *a = get(c, it, "above_C");
        if (!!a == !!b)
            return fail(c, it, "a caution range needs exactly one of "
                               "'below_C' or 'above_C'");
        cr_i->below = b != NULL;
        if ((s = parse_number(c, b ? b : a, b ? "below_C" : "above_C",
                              &cr_i->temp_c)))
            return s;
    }
    return DK_OK;
}

static dk_status
read_wavelength_cautions(ctx *c, yaml_node_t *root, dk_crystal *cr)
{
    yaml_node_t *r = get(c, root, "wavelength_cautions");
    if (!r)
        return DK_OK;
    if (r->type != YAML_SEQUENCE_NODE)
        return fail(c, r, "'wavelength_cautions' must be a list");
    cr->nwavelength_cautions = seq_len(r);
    cr->wavelength_cautions = dk_arena_alloc(
        c->arena,
        sizeof(dk_wavelength_caution) * (cr->nwavelength_cautions + 1));
    if (!cr->wavelength_cautions)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    static const char *const keys[] = {"below_um", "above_um", "text", NULL};
    for (int i = 0; i < cr->nwavelength_cautions; i++) {
        yaml_node_t *it = node_at(c, r->data.sequence.items.start[i]);
        dk_wavelength_caution *w = &cr->wavelength_cautions[i];
        dk_status s;
        if ((s = check_keys(c, it, "a wavelength caution", keys)) ||
            (s = get_string(c, it, "text", 1, &w->text)))
            return s;
        yaml_node_t *b = get(c, it, "below_um"), *a = get(c, it, "above_um");
        if (!!a == !!b)
            return fail(c, it, "a wavelength caution needs exactly one of "
                               "'below_um' or 'above_um'");
        w->below = b != NULL;
        if ((s = parse_number(c, b ? b : a, b ? "below_um" : "above_um",
                              &w->lambda_um)))
            return s;
        if (!(w->lambda_um > 0))
            return fail(c, b ? b : a, "a caution wavelength must be "
                                      "positive (in um)");
    }
    return DK_OK;
}

/* default_sets: {angle: {set, reason}, qpm: {set, reason}}, both optional. */
static dk_status
read_default_sets(ctx *c, yaml_node_t *root, dk_crystal *cr)
{
    cr->default_set[0] = cr->default_set[1] = 0;
    cr->default_reason[0] = cr->default_reason[1] = NULL;
    yaml_node_t *d = get(c, root, "default_sets");
    if (!d)
        return DK_OK;
    static const char *const keys[] = {"angle", "qpm", NULL};
    static const char *const use_keys[] = {"set", "reason", NULL};
    dk_status s = check_keys(c, d, "'default_sets'", keys);
    if (s)
        return s;
    for (int u = 0; u < 2; u++) {
        yaml_node_t *e = get(c, d, keys[u]);
        if (!e)
            continue;
        const char *name = NULL;
        if ((s = check_keys(c, e, "a default set", use_keys)) ||
            (s = get_string(c, e, "set", 1, &name)) ||
            (s = get_string(c, e, "reason", 1, &cr->default_reason[u])))
            return s;
        int found = -1;
        for (int i = 0; i < cr->nsets; i++)
            if (strcasecmp(cr->sets[i].name, name) == 0)
                found = i;
        if (found < 0)
            return fail(c, get(c, e, "set"), "default set '%s' is not a "
                                             "data set of this file", name);
        if (u == 0 && found != 0)
            return fail(c, get(c, e, "set"),
                        "the default set for angles must be listed first "
                        "under 'dispersion' ('%s' is not)", name);
        cr->default_set[u] = found;
    }
    return DK_OK;
}

static const char *const crystal_keys[] = {
    "id", "name", "aliases", "class", "point_group", "frame",
    "transparency_um", "transparency_source", "poling", "polar_axis",
    "grating_axis", "cautions", "caution_ranges", "wavelength_cautions",
    "damage_threshold", "dispersion", "default_sets", "thermal_expansion",
    "nonlinear", NULL};

static dk_status
read_crystal(ctx *c, yaml_node_t *root, dk_crystal *cr)
{
    dk_status s = check_keys(c, root, "the crystal file", crystal_keys);
    if (s)
        return s;
    const char *klass = NULL, *poling = NULL, *polar = NULL, *grating = NULL;
    if ((s = get_string(c, root, "id", 1, &cr->id)) ||
        (s = get_string(c, root, "name", 1, &cr->name)) ||
        (s = get_string(c, root, "class", 1, &klass)) ||
        (s = get_string(c, root, "point_group", 1, &cr->point_group)) ||
        (s = get_string(c, root, "frame", 1, &cr->frame)) ||
        (s = get_range(c, root, "transparency_um", 1, cr->transparency_um)) ||
        (s = get_string(c, root, "transparency_source", 1,
                        &cr->transparency_source)) ||
        (s = get_string(c, root, "poling", 0, &poling)) ||
        (s = get_string(c, root, "polar_axis", 0, &polar)) ||
        (s = get_string(c, root, "grating_axis", 0, &grating)) ||
        (s = get_string_list(c, root, "aliases", &cr->aliases,
                             &cr->naliases)) ||
        (s = read_cautions(c, root, cr)) ||
        (s = read_wavelength_cautions(c, root, cr)))
        return s;
    if (!(cr->transparency_um[0] > 0))
        return fail(c, get(c, root, "transparency_um"),
                    "transparency range must be positive");
    const char *labels;
    if (strcmp(klass, "isotropic") == 0)
        cr->optical_class = DK_ISOTROPIC, labels = "n";
    else if (strcmp(klass, "uniaxial") == 0)
        cr->optical_class = DK_UNIAXIAL, labels = "oe";
    else if (strcmp(klass, "biaxial") == 0)
        cr->optical_class = DK_BIAXIAL, labels = "XYZ";
    else
        return fail(c, get(c, root, "class"), "unknown class '%s' (known: "
                                              "isotropic, uniaxial, biaxial)",
                    klass);
    cr->poling = DK_POLING_NONE;
    cr->polar_axis = cr->grating_axis = -1;
    if (poling && strcmp(poling, "periodic") == 0)
        cr->poling = DK_POLING_PERIODIC;
    else if (poling && strcmp(poling, "orientation-patterned") == 0)
        cr->poling = DK_POLING_ORIENTATION;
    else if (poling && strcmp(poling, "none") != 0)
        return fail(c, get(c, root, "poling"), "unknown poling '%s' (known: "
                                               "periodic, "
                                               "orientation-patterned, none)",
                    poling);
    if (polar && (cr->polar_axis = axis_index(polar)) < 0)
        return fail(c, get(c, root, "polar_axis"), "'polar_axis' must be X, "
                                                   "Y or Z");
    if (grating && (cr->grating_axis = axis_index(grating)) < 0)
        return fail(c, get(c, root, "grating_axis"), "'grating_axis' must be "
                                                     "X, Y or Z");
    if (cr->poling != DK_POLING_NONE && cr->grating_axis < 0)
        return fail(c, root, "a poled crystal needs 'grating_axis'");

    yaml_node_t *dmg = get(c, root, "damage_threshold");
    if (dmg) {
        static const char *const keys[] = {"value_GW_per_cm2", "pulse",
                                           "source", NULL};
        if ((s = check_keys(c, dmg, "'damage_threshold'", keys)) ||
            (s = get_number(c, dmg, "value_GW_per_cm2", 1,
                            &cr->damage_gw_per_cm2)) ||
            (s = get_string(c, dmg, "pulse", 1, &cr->damage_pulse)) ||
            (s = get_string(c, dmg, "source", 1, &cr->damage_source)))
            return s;
        cr->has_damage = 1;
    }

    yaml_node_t *sets = get(c, root, "dispersion");
    if (!sets || sets->type != YAML_SEQUENCE_NODE || seq_len(sets) < 1)
        return fail(c, sets ? sets : root, "'dispersion' must be a non-empty "
                                           "list of data sets");
    cr->nsets = seq_len(sets);
    cr->sets = dk_arena_alloc(c->arena, sizeof(dk_dispersion_set) * cr->nsets);
    if (!cr->sets)
        return dk_error_set(c->err, DK_ENOMEM, "out of memory");
    for (int i = 0; i < cr->nsets; i++) {
        yaml_node_t *sn = node_at(c, sets->data.sequence.items.start[i]);
        if ((s = read_set(c, sn, labels, &cr->sets[i])))
            return s;
        for (int j = 0; j < i; j++)
            if (strcasecmp(cr->sets[j].name, cr->sets[i].name) == 0)
                return fail(c, sn, "duplicate data set name '%s'",
                            cr->sets[i].name);
    }
    if ((s = read_default_sets(c, root, cr)))
        return s;
    yaml_node_t *ex = get(c, root, "thermal_expansion");
    if (ex && (s = read_expansion(c, ex, cr)))
        return s;
    if (cr->poling != DK_POLING_NONE &&
        (!cr->has_expansion || !cr->expansion[cr->grating_axis].present))
        return fail(c, root, "a poled crystal needs 'thermal_expansion' "
                             "along its grating axis");
    yaml_node_t *nl = get(c, root, "nonlinear");
    if (nl && (s = read_nonlinear(c, nl, cr)))
        return s;
    return DK_OK;
}

/* A libyaml syntax error, with its position; libyaml's problem texts are
 * fixed strings, never the file's content. */
static dk_status
syntax_error(const char *path, const yaml_parser_t *parser, dk_error *err)
{
    if (parser->error == YAML_MEMORY_ERROR)
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    shown_path p = show_path(path);
    return dk_error_set(err, DK_EPARSE,
                        "cannot load '%s': line %zu, column %zu: %s", p.s,
                        parser->problem_mark.line + 1,
                        parser->problem_mark.column + 1,
                        parser->problem ? parser->problem
                                        : "YAML syntax error");
}

static dk_status
limit_error(const char *path, yaml_mark_t at, const char *what,
            dk_error *err)
{
    shown_path p = show_path(path);
    return dk_error_set(err, DK_EPARSE,
                        "cannot load '%s': line %zu, column %zu: %s", p.s,
                        at.line + 1, at.column + 1, what);
}

/* The node of an event with its marks, or 0 (out of memory, or a value
 * libyaml refuses to store). A tag "!" is the default tag, as
 * yaml_parser_load() reads it. */
static int
add_node(yaml_document_t *doc, const yaml_event_t *ev)
{
    int id = 0;
    switch (ev->type) {
    case YAML_SCALAR_EVENT: {
        yaml_char_t *tag = ev->data.scalar.tag;
        id = yaml_document_add_scalar(
            doc, tag && strcmp((char *)tag, "!") ? tag : NULL,
            ev->data.scalar.value, (int)ev->data.scalar.length,
            ev->data.scalar.style);
        break;
    }
    case YAML_SEQUENCE_START_EVENT: {
        yaml_char_t *tag = ev->data.sequence_start.tag;
        id = yaml_document_add_sequence(
            doc, tag && strcmp((char *)tag, "!") ? tag : NULL,
            ev->data.sequence_start.style);
        break;
    }
    case YAML_MAPPING_START_EVENT: {
        yaml_char_t *tag = ev->data.mapping_start.tag;
        id = yaml_document_add_mapping(
            doc, tag && strcmp((char *)tag, "!") ? tag : NULL,
            ev->data.mapping_start.style);
        break;
    }
    default:
        return 0;
    }
    if (id) {
        yaml_node_t *n = yaml_document_get_node(doc, id);
        n->start_mark = ev->start_mark;
        n->end_mark = ev->end_mark;
    }
    return id;
}

/* The containers open while a document is built: node ids and, for a
 * mapping, the key waiting for its value (0: none). */
typedef struct open_nodes {
    int n;
    int id[DK_CRYSTAL_MAX_DEPTH + 1];
    int key[DK_CRYSTAL_MAX_DEPTH + 1];
} open_nodes;

/* Attach node @id to the innermost open container; 0 out of memory. */
static int
attach(yaml_document_t *doc, open_nodes *o, int id)
{
    if (o->n == 0)
        return 1;   /* the root: the document's first node */
    int top = o->id[o->n - 1];
    if (yaml_document_get_node(doc, top)->type == YAML_SEQUENCE_NODE)
        return yaml_document_append_sequence_item(doc, top, id);
    if (!o->key[o->n - 1]) {
        o->key[o->n - 1] = id;
        return 1;
    }
    int key = o->key[o->n - 1];
    o->key[o->n - 1] = 0;
    return yaml_document_append_mapping_pair(doc, top, key, id);
}

/*
 * One pass over the events of @data: refuse deep nesting, too many nodes
 * and aliases (so that a hostile file costs little, and no node is built
 * beyond the limits) while building the stream's first document with
 * libyaml's document API - the nodes, marks and tags yaml_parser_load()
 * gives. Later documents are parsed and checked, not kept, as before
 * (a check pass, then yaml_parser_load(): the same answers, one scan).
 * On success *doc is initialised (no root node when the stream holds no
 * document); on failure nothing needs freeing.
 */
static dk_status
load_document(const char *path, const unsigned char *data, size_t size,
              yaml_document_t *doc, dk_error *err)
{
    yaml_parser_t parser;
    if (!yaml_document_initialize(doc, NULL, NULL, NULL, 1, 1))
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    if (!yaml_parser_initialize(&parser)) {
        yaml_document_delete(doc);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    yaml_parser_set_input_string(&parser, data, size);
    long depth = 0, nodes = 0;
    int documents = 0, building = 0;
    open_nodes o = {0};
    char what[160];
    dk_status s = DK_OK;
    for (;;) {
        yaml_event_t ev;
        if (!yaml_parser_parse(&parser, &ev)) {
            s = syntax_error(path, &parser, err);
            break;
        }
        yaml_event_type_t type = ev.type;
        yaml_mark_t at = ev.start_mark;
        if (type == YAML_STREAM_END_EVENT) {
            yaml_event_delete(&ev);
            break;
        }
        if (type == YAML_ALIAS_EVENT) {
            yaml_event_delete(&ev);
            s = limit_error(path, at,
                            "aliases (*name) are not allowed in crystal "
                            "files: write the value out",
                            err);
            break;
        }
        if (type == YAML_DOCUMENT_START_EVENT)
            building = documents++ == 0;
        if (type == YAML_DOCUMENT_END_EVENT)
            building = 0;
        int end = type == YAML_SEQUENCE_END_EVENT ||
                  type == YAML_MAPPING_END_EVENT;
        int start = type == YAML_SEQUENCE_START_EVENT ||
                    type == YAML_MAPPING_START_EVENT;
        if (end)
            depth--;
        if (start && ++depth > DK_CRYSTAL_MAX_DEPTH) {
            yaml_event_delete(&ev);
            snprintf(what, sizeof what,
                     "nested more than %d levels deep (the limit for a "
                     "crystal file)",
                     DK_CRYSTAL_MAX_DEPTH);
            s = limit_error(path, at, what, err);
            break;
        }
        if ((start || type == YAML_SCALAR_EVENT) &&
            ++nodes > DK_CRYSTAL_MAX_NODES) {
            yaml_event_delete(&ev);
            snprintf(what, sizeof what,
                     "more than %d keys, values and lists (the limit for a "
                     "crystal file)",
                     DK_CRYSTAL_MAX_NODES);
            s = limit_error(path, at, what, err);
            break;
        }
        int ok = 1;
        if (building && end && o.n > 0) {
            yaml_document_get_node(doc, o.id[o.n - 1])->end_mark = ev.end_mark;
            o.n--;
        } else if (building && (start || type == YAML_SCALAR_EVENT)) {
            int id = add_node(doc, &ev);
            ok = id && attach(doc, &o, id);
            if (ok && start) {
                o.id[o.n] = id;
                o.key[o.n++] = 0;
            }
        }
        yaml_event_delete(&ev);
        if (!ok) {
            s = limit_error(path, at,
                            "cannot store this value (out of memory, or "
                            "text that is not UTF-8)",
                            err);
            break;
        }
    }
    yaml_parser_delete(&parser);
    if (s)
        yaml_document_delete(doc);
    return s;
}

/* The root of a crystal file: a mapping with an 'id' key. */
static int
looks_like_crystal(yaml_document_t *doc, yaml_node_t *root)
{
    if (!root || root->type != YAML_MAPPING_NODE)
        return 0;
    for (yaml_node_pair_t *p = root->data.mapping.pairs.start;
         p < root->data.mapping.pairs.top; p++) {
        const char *k = scalar(yaml_document_get_node(doc, p->key));
        if (k && strcmp(k, "id") == 0)
            return 1;
    }
    return 0;
}

dk_status
dk_crystal_load_buffer(const char *path, const void *data, size_t size,
                       dk_crystal **out, dk_error *err)
{
    if (size > DK_CRYSTAL_MAX_BYTES) {
        shown_path p = show_path(path);
        return dk_error_set(err, DK_EPARSE,
                            "cannot load '%s': %zu bytes, more than the %d "
                            "allowed for a crystal file",
                            p.s, size, DK_CRYSTAL_MAX_BYTES);
    }
    yaml_document_t doc;
    dk_status s = load_document(path, data, size, &doc, err);
    if (s)
        return s;

    dk_arena *arena = dk_arena_new();
    dk_crystal *cr = arena ? dk_arena_alloc(arena, sizeof *cr) : NULL;
    if (cr)
        cr->path = dk_arena_strdup(arena, path);
    if (!cr || !cr->path) {
        dk_arena_free(arena);
        yaml_document_delete(&doc);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    cr->arena = arena;
    ctx c = {path, &doc, arena, err};
    yaml_node_t *root = yaml_document_get_root_node(&doc);
    if (!root)
        s = fail(&c, NULL, "the file is empty");
    else if (!looks_like_crystal(&doc, root))
        s = fail(&c, NULL, "not a crystal file: its top level must be a "
                           "mapping with 'id', 'class' and 'dispersion' "
                           "(see crystals/README.md)");
    else
        s = read_crystal(&c, root, cr);
    yaml_document_delete(&doc);
    if (s) {
        dk_arena_free(arena);
        return s;
    }
    *out = cr;
    return DK_OK;
}

/*
 * Read at most DK_CRYSTAL_MAX_BYTES + 1 bytes of the regular file @path
 * into *data (malloc'd). O_NONBLOCK: opening a FIFO does not wait for a
 * writer; it is refused by the fstat check that follows.
 */
static dk_status
read_bounded(const char *path, unsigned char **data, size_t *size,
             dk_error *err)
{
    shown_path p = show_path(path);
    int fd = open(path, O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
    if (fd < 0)
        return dk_error_set(err, DK_EIO, "cannot read '%s': %s", p.s,
                            strerror(errno));
    struct stat st;
    if (fstat(fd, &st) != 0) {
        int e = errno;
        close(fd);
        return dk_error_set(err, DK_EIO, "cannot read '%s': %s", p.s,
                            strerror(e));
    }
    if (!S_ISREG(st.st_mode)) {
        close(fd);
        return dk_error_set(err, DK_EIO,
                            "cannot read '%s': not a regular file (a crystal "
                            "file must be a regular file, or a link to one)",
                            p.s);
    }
    if (st.st_size > DK_CRYSTAL_MAX_BYTES) {
        close(fd);
        return dk_error_set(err, DK_EPARSE,
                            "cannot load '%s': %lld bytes, more than the %d "
                            "allowed for a crystal file",
                            p.s, (long long)st.st_size, DK_CRYSTAL_MAX_BYTES);
    }
    size_t cap = DK_CRYSTAL_MAX_BYTES + 1, len = 0;
    unsigned char *buf = malloc(cap);
    if (!buf) {
        close(fd);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    /* The file may grow after fstat: read one byte past the limit to
     * notice, and let dk_crystal_load_buffer refuse it. */
    while (len < cap) {
        ssize_t r = read(fd, buf + len, cap - len);
        if (r == 0)
            break;
        if (r < 0) {
            if (errno == EINTR)
                continue;
            int e = errno;
            free(buf);
            close(fd);
            return dk_error_set(err, DK_EIO, "cannot read '%s': %s", p.s,
                                strerror(e));
        }
        len += (size_t)r;
    }
    close(fd);
    *data = buf;
    *size = len;
    return DK_OK;
}

dk_status
dk_crystal_load(const char *path, dk_crystal **out, dk_error *err)
{
    if (!path || !*path)
        return dk_error_set(err, DK_EINVAL, "no crystal file named");
    unsigned char *data = NULL;
    size_t size = 0;
    dk_status s = read_bounded(path, &data, &size, err);
    if (s)
        return s;
    s = dk_crystal_load_buffer(path, data, size, out, err);
    free(data);
    return s;
}

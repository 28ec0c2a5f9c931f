/*
 * cli.c - messages, warnings, database loading and buffered output for
 * the command files (see cli.h).
 */
#include <ctype.h>
#include <glib.h>
#include <errno.h>
#include <getopt.h>
#include <math.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "cli.h"
#include "deltak/constants.h"
#include "deltak/design.h"
#include "deltak/material.h"
#include "deltak/text.h"
#include "deltak/units.h"

/* Everything the answer rests on: design notes and the command's own
 * warnings, shown by cli_warnings_flush(), cli_print_assumed() and
 * cli_notes_to_json(). */
static _Thread_local dk_notes notes;
static _Thread_local int out_mode;   /* CLI_TEXT, CLI_JSON or CLI_CSV */
/* Where this thread's command writes: the process's streams, or buffers
 * when a command is called in-process (deltak/command.h). */
static _Thread_local FILE *out_stream, *err_stream;

FILE *
cli_stdout(void)
{
    return out_stream ? out_stream : stdout;
}

FILE *
cli_stderr(void)
{
    return err_stream ? err_stream : stderr;
}

void
cli_set_streams(FILE *out, FILE *err)
{
    out_stream = out;
    err_stream = err;
    dk_notes_clear(&notes);
    out_mode = CLI_TEXT;
}

/* "error: MESSAGE" with every control character of the message shown
 * as \xNN: messages quote what the user typed, and a terminal must not
 * obey it. */
static void
print_error(const char *fmt, va_list ap)
{
    char msg[1024], esc[3072];
    vsnprintf(msg, sizeof msg, fmt, ap);
    fprintf(cli_stderr(), "error: %s\n", dk_text_escape(msg, esc, sizeof esc));
}

int
cli_error(const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    print_error(fmt, ap);
    va_end(ap);
    return CLI_FAIL;
}

void
cli_print_usage(FILE *f, const char *const usage[])
{
    for (int i = 0; usage[i]; i++) {
        const char *u = usage[i], *lead = i == 0 ? "usage: " : "";
        if (strlen(lead) + strlen(u) <= CLI_WIDTH) {
            fprintf(f, "%s%s\n", lead, u);
            continue;
        }
        /* A term and its description ("  --x <v>     what it does", two
         * spaces or more between them) keep the term as it is and fold
         * the description under itself; other lines fold 4 columns in
         * from their indent. */
        size_t ind = strspn(u, " "), hang = strlen(lead) + ind + 4;
        size_t body = ind;   /* where the folded text starts */
        const char *gap = strstr(u + ind, "  ");
        if (gap) {
            body = (size_t)(gap - u) + strspn(gap, " ");
            if (body < 40)
                hang = body;
        }
        char h[48], l[160];
        snprintf(h, sizeof h, "%*s", (int)(hang < 47 ? hang : 47), "");
        snprintf(l, sizeof l, "%s%.*s", lead, (int)body, u);
        cli_wrap(f, l, h, u + body);
    }
}

int
cli_usage_error(const char *const usage[], const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    print_error(fmt, ap);
    va_end(ap);
    cli_print_usage(cli_stderr(), usage);
    return CLI_USAGE;
}

void
cli_warn(const char *fmt, ...)
{
    char buf[DK_NOTE_TEXT_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    dk_notes_add(&notes, DK_NOTE_WARNING, "warning", "%s", buf);
}

void
cli_caution_laser(void)
{
    dk_notes_add(&notes, DK_NOTE_CAUTION, "laser-safety",
                 "laser safety: these are Class 3B/4 beams and the infrared "
                 "ones are invisible; wear eye protection rated for every "
                 "wavelength present, dump the residual pump, keep below the "
                 "crystal's damage threshold; local laser-safety rules and "
                 "your laser safety officer take precedence");
}

void
cli_take_notes(const dk_notes *from)
{
    dk_notes_merge(&notes, from);
}

/* The head of a note's text, for a figure: up to the first "; ", " (",
 * ": ", ", which" or " is/are typed from memory" (the rest says how to
 * change the choice, which a figure has no room for). */
static void
note_head(const char *text, char *buf, size_t n)
{
    static const char *const stops[] = {"; ", " (", ": ", ", which",
                                        " is typed from memory",
                                        " are typed from memory"};
    size_t len = strlen(text);
    for (size_t i = 0; i < sizeof stops / sizeof *stops; i++) {
        const char *at = strstr(text, stops[i]);
        if (at && (size_t)(at - text) < len)
            len = (size_t)(at - text);
    }
    if (len >= n)
        len = n - 1;
    memcpy(buf, text, len);
    buf[len] = '\0';
}

dk_status
cli_plot_add_notes(dk_plot *fig, dk_error *err)
{
    static const dk_note_kind kinds[] = {DK_NOTE_DEFAULT, DK_NOTE_MEMORY};
    static const char *const heads[] = {"assumed:", "from memory:"};
    for (int k = 0; k < 2; k++) {
        int first = 1;
        for (int i = 0; i < notes.n; i++) {
            const dk_note *nt = &notes.item[i];
            if (nt->kind != kinds[k])
                continue;
            char head[DK_NOTE_TEXT_MAX];
            note_head(nt->text, head, sizeof head);
            char *esc = g_markup_escape_text(head, -1);
            /* The kind heads its first note only: the notes are joined
             * into one footnote. */
            char *line = first ? g_strdup_printf("<i>%s</i> %s", heads[k],
                                                 esc)
                               : g_strdup(esc);
            dk_status s = dk_plot_add_note(fig, line, err);
            g_free(line);
            g_free(esc);
            if (s)
                return s;
            first = 0;
        }
    }
    return DK_OK;
}

void
cli_drop_note(const char *code)
{
    dk_notes_remove(&notes, code);
}

void
cli_warn_index(const dk_dispersion_set *set, unsigned flags, double lambda_um,
               double temp_c)
{
    char buf[1024];
    if (set->from_memory)
        dk_notes_add(&notes, DK_NOTE_MEMORY, "from-memory:set",
                     "data set '%s' is typed from memory and not yet checked "
                     "against an independent source (see 'deltak crystals')",
                     set->name);
    if (!dk_warning_text(set, flags, lambda_um, temp_c, buf, sizeof buf))
        return;
    char *sv = NULL;
    for (char *line = strtok_r(buf, "\n", &sv); line;
         line = strtok_r(NULL, "\n", &sv))
        dk_notes_add(&notes, DK_NOTE_RANGE,
                     strstr(line, " C ") ? "range:temperature"
                                         : "range:wavelength",
                     "%s", line);
}

void
cli_notes_to_json(json_object *obj)
{
    json_object *warn = json_object_new_array(), *all =
                                                    json_object_new_array();
    for (int i = 0; i < notes.n; i++) {
        const dk_note *nt = &notes.item[i];
        if (nt->kind != DK_NOTE_DEFAULT)
            json_object_array_add(warn, json_object_new_string(nt->text));
        json_object *o = json_object_new_object();
        json_object_object_add(o, "kind",
                               json_object_new_string(
                                   dk_note_kind_str(nt->kind)));
        json_object_object_add(o, "code", json_object_new_string(nt->code));
        json_object_object_add(o, "text", json_object_new_string(nt->text));
        json_object_array_add(all, o);
    }
    if (json_object_array_length(warn))
        json_object_object_add(obj, "warnings", warn);
    else
        json_object_put(warn);
    if (json_object_array_length(all))
        json_object_object_add(obj, "notes", all);
    else
        json_object_put(all);
}

void
cli_warnings_to_json(json_object *obj)
{
    cli_notes_to_json(obj);
}

void
cli_print_assumed(FILE *f)
{
    int first = 1;
    for (int i = 0; i < notes.n; i++)
        if (notes.item[i].kind == DK_NOTE_DEFAULT) {
            fprintf(f, "%sassumed: %s\n", first ? "\n" : "",
                    notes.item[i].text);
            first = 0;
        }
}

void
cli_set_output_mode(int mode)
{
    out_mode = mode;
}

const char *
cli_csv_flags(unsigned range, int shg, char *buf, size_t n)
{
    size_t used = dk_notes_codes(&notes, 1u << DK_NOTE_DEFAULT | 1u << DK_NOTE_MEMORY, buf, n);
    if (range && used + 1 < n) {
        if (used)
            buf[used++] = ';';
        dk_range_codes(range, shg, buf + used, n - used);
    }
    return buf;
}

void
cli_warnings_flush(void)
{
    for (int i = 0; i < notes.n; i++) {
        const dk_note *nt = &notes.item[i];
        if (nt->kind == DK_NOTE_DEFAULT && out_mode != CLI_CSV)
            continue;
        fprintf(cli_stderr(), "%s: %s\n",
                nt->kind == DK_NOTE_DEFAULT   ? "note"
                : nt->kind == DK_NOTE_CAUTION ? "caution"
                                              : "warning",
                nt->text);
    }
    if (notes.dropped)
        fprintf(cli_stderr(), "warning: %d more notes not shown\n", notes.dropped);
    dk_notes_clear(&notes);
}

/* Warn about the database's skipped files and shadowed names from
 * index @from on. */
static void
warn_db(const dk_db *db, int errors_from, int notices_from)
{
    for (int i = errors_from; i < db->nerrors; i++)
        cli_warn("%s (skipped)", db->errors[i]);
    for (int i = notices_from; i < db->nnotices; i++)
        cli_warn("%s", db->notices[i]);
}

/* Whether --crystal names a file rather than a crystal: ids and aliases
 * never contain '/' or end in .yaml. */
static int
names_a_file(const char *name)
{
    size_t n = strlen(name);
    return strchr(name, '/') ||
           (n > 5 && strcasecmp(name + n - 5, ".yaml") == 0) ||
           (n > 4 && strcasecmp(name + n - 4, ".yml") == 0);
}

int
cli_load_db(dk_db **db, const char *name)
{
    return cli_load_db_names(db, &name, name ? 1 : 0);
}

int
cli_load_db_names(dk_db **db, const char *const *names, int nnames)
{
    /* The search path: $DELTAK_CRYSTALS (colon-separated folders and
     * files, first wins), then the shipped database. */
    const char *env = getenv("DELTAK_CRYSTALS");
    char *copy = strdup(env ? env : "");
    size_t n = 1;
    for (const char *p = env ? env : ""; *p; p++)
        n += *p == ':';
    const char **paths = malloc((n + 1) * sizeof *paths);
    if (!copy || !paths) {
        free(copy);
        free(paths);
        return cli_error("out of memory");
    }
    size_t k = 0;
    char *sv = NULL;
    for (char *t = strtok_r(copy, ":", &sv); t && k < n;
         t = strtok_r(NULL, ":", &sv))
        paths[k++] = t;
    paths[k++] = dk_db_shipped_dir();
    dk_error err = {0};
    /* The shipped database alone: only the crystals asked for are read
     * when their files can be told from the others (dk_db_load_names); with
     * folders of the user's, every file (they may replace shipped ones). */
    int plain = k == 1 && nnames > 0;
    for (int i = 0; i < nnames && plain; i++)
        plain = !names_a_file(names[i]);
    dk_status st = plain ? dk_db_load_names(paths[0], names, nnames, db, &err)
                         : dk_db_load_path(paths, k, db, &err);
    free(paths);
    free(copy);
    if (st)
        return cli_error("%s", err.msg);
    warn_db(*db, 0, 0);
    return 0;
}

/* Edit distance ignoring ASCII case (99 beyond 64 characters). */
static int
distance_nocase(const char *a, const char *b)
{
    char la[65], lb[65];
    size_t i, j;
    for (i = 0; a[i] && i < 64; i++)
        la[i] = (char)tolower((unsigned char)a[i]);
    for (j = 0; b[j] && j < 64; j++)
        lb[j] = (char)tolower((unsigned char)b[j]);
    if (a[i] || b[j])
        return 99;
    la[i] = lb[j] = '\0';
    return cli_edit_distance(la, lb);
}

/* How far a misspelling may be from a name and still be suggested:
 * one edit in names of up to 3 characters, two up to 8, three beyond
 * (common practice for "did you mean"). */
static int
near_enough(const char *typed, int d)
{
    size_t n = strlen(typed);
    return d <= (n <= 3 ? 1 : n <= 8 ? 2 : 3);
}

/* The names nearest to @typed among @names, one per owner (@owner[i]
 * is the thing names[i] belongs to; NULL: each name its own), at most
 * CLI_SUGGEST_MAX: those at the smallest edit distance if near enough,
 * else those that start with @typed (for a truncated name). The owners
 * go to @out_owner when not NULL. Returns how many. */
#define CLI_SUGGEST_MAX 4
static int
suggest(const char *typed, const char *const *names,
        const char *const *owner, int n, const char *out[CLI_SUGGEST_MAX],
        const char *out_owner[CLI_SUGGEST_MAX])
{
    int best = 99, k = 0;
    size_t len = strlen(typed);
    for (int i = 0; i < n; i++) {
        int d = distance_nocase(typed, names[i]);
        if (d < best)
            best = d;
    }
    for (int pass = 0; pass < 2 && !k; pass++)
        for (int i = 0; i < n && k < CLI_SUGGEST_MAX; i++) {
            int hit = pass == 0
                          ? near_enough(typed, best) &&
                                distance_nocase(typed, names[i]) == best
                          : len >= 2 && strncasecmp(names[i], typed, len) == 0;
            const char *who = owner ? owner[i] : names[i];
            for (int j = 0; j < k && hit; j++)
                if ((owner ? out_owner[j] : out[j]) == who)
                    hit = 0;
            if (hit) {
                out[k] = names[i];
                if (owner)
                    out_owner[k] = who;
                k++;
            }
        }
    return k;
}

/* "; did you mean 'A' or 'B'?" into @buf for the suggestions (@ids[i]
 * in parentheses where it differs), or "" when there are none. */
static const char *
did_you_mean(const char *const *sugg, const char *const *ids, int k,
             char *buf, size_t n)
{
    size_t used = 0;
    buf[0] = '\0';
    for (int i = 0; i < k && used < n; i++) {
        int with_id = ids && ids[i] && strcasecmp(ids[i], sugg[i]) != 0;
        used += (size_t)snprintf(buf + used, n - used, "%s'%s'%s%s%s",
                                 i == 0       ? "; did you mean "
                                 : i + 1 == k ? " or "
                                              : ", ",
                                 sugg[i], with_id ? " (" : "",
                                 with_id ? ids[i] : "", with_id ? ")" : "");
    }
    if (k && used < n)
        snprintf(buf + used, n - used, "?");
    return buf;
}

/* Print @head, then the @n words of @list wrapped to 80 columns. */
static void
print_wrapped_list(FILE *f, const char *head, const char *const *list, int n)
{
    int col = fprintf(f, "%s", head);
    for (int i = 0; i < n; i++) {
        int w = (int)strlen(list[i]) + (i + 1 < n ? 1 : 0);
        if (col + 1 + w > 79) {
            fputs("\n ", f);
            col = 1;
        }
        col += fprintf(f, " %s%s", list[i], i + 1 < n ? "," : "");
    }
    fputc('\n', f);
}

const dk_crystal *
cli_find_crystal(dk_db *db, const char *name)
{
    char esc[200];
    if (!name) {
        cli_error("no crystal given: use --crystal NAME (see 'deltak "
                  "crystals' for the list)");
        return NULL;
    }
    if (names_a_file(name)) {
        /* A crystal file of the user's, for this command: it comes
         * before every folder of the search path. */
        const dk_crystal *c = NULL;
        dk_error err = {0};
        int from = db->nnotices;
        if (dk_db_add_file(db, name, &c, &err)) {
            cli_error("%s", err.msg);
            return NULL;
        }
        warn_db(db, db->nerrors, from);
        return c;
    }
    const dk_crystal *c = dk_db_find(db, name);
    if (c)
        return c;
    /* Every id and alias, and the id each belongs to. */
    int total = 0;
    for (int i = 0; i < db->ncrystals; i++)
        total += 1 + db->crystals[i]->naliases;
    const char **names = malloc(sizeof(char *) * (size_t)(total + 1));
    const char **owner = malloc(sizeof(char *) * (size_t)(total + 1));
    const char **ids = malloc(sizeof(char *) * (size_t)(db->ncrystals + 1));
    const char *sugg[CLI_SUGGEST_MAX], *sugg_id[CLI_SUGGEST_MAX];
    int k = 0;
    if (names && owner && ids) {
        int m = 0;
        for (int i = 0; i < db->ncrystals; i++) {
            const dk_crystal *x = db->crystals[i];
            ids[i] = x->id;
            names[m] = x->id, owner[m++] = x->id;
            for (int j = 0; j < x->naliases; j++)
                names[m] = x->aliases[j], owner[m++] = x->id;
        }
        k = suggest(name, names, owner, m, sugg, sugg_id);
    }
    char hint[400];
    fprintf(cli_stderr(), "error: unknown crystal '%s'%s\n",
            cli_escape(name, esc, sizeof esc),
            did_you_mean(sugg, sugg_id, k, hint, sizeof hint));
    if (!k && ids)
        print_wrapped_list(cli_stderr(), "known crystals:", ids,
                           db->ncrystals);
    fprintf(cli_stderr(), "('deltak crystals' lists every name, aliases such "
                          "as BBO or PPLN too;\n --crystal also takes a "
                          "crystal file, e.g. --crystal ./my-crystal.yaml)\n");
    free(names);
    free(owner);
    free(ids);
    return NULL;
}

int
cli_unknown_set(const dk_crystal *c, const char *name)
{
    char esc[200], hint[300];
    const char *names[64], *sugg[CLI_SUGGEST_MAX];
    int n = c->nsets < 64 ? c->nsets : 64;
    for (int i = 0; i < n; i++)
        names[i] = c->sets[i].name;
    int k = suggest(name, names, NULL, n, sugg, NULL);
    fprintf(cli_stderr(), "error: %s has no data set '%s'%s\n", c->id,
            cli_escape(name, esc, sizeof esc),
            did_you_mean(sugg, NULL, k, hint, sizeof hint));
    print_wrapped_list(cli_stderr(), "its sets are:", names, n);
    return CLI_FAIL;
}

const dk_dispersion_set *
cli_find_set(const dk_crystal *c, const char *name)
{
    const dk_dispersion_set *s = dk_crystal_find_set(c, name);
    if (s) {
        cli_warn_index(s, 0, 0, 0);
        return s;
    }
    cli_unknown_set(c, name);
    return NULL;
}

int
cli_out_open(cli_out *o)
{
    o->buf = NULL;
    o->len = 0;
    o->f = open_memstream(&o->buf, &o->len);
    return o->f ? 0 : cli_error("out of memory");
}

int
cli_out_commit(cli_out *o)
{
    /* Text answers end with the choices they rest on. */
    if (out_mode == CLI_TEXT)
        cli_print_assumed(o->f);
    if (fclose(o->f) != 0) {
        free(o->buf);
        return cli_error("out of memory");
    }
    size_t w = fwrite(o->buf, 1, o->len, cli_stdout());
    free(o->buf);
    if (w != o->len || fflush(cli_stdout()) != 0)
        return cli_error("cannot write the output");
    return 0;
}

void
cli_out_discard(cli_out *o)
{
    fclose(o->f);
    free(o->buf);
}

void
cli_out_json(cli_out *o, json_object *obj)
{
    fputs(json_object_to_json_string_ext(obj, JSON_C_TO_STRING_PRETTY |
                                                  JSON_C_TO_STRING_SPACED |
                                                  JSON_C_TO_STRING_NOSLASHESCAPE),
          o->f);
    fputc('\n', o->f);
    json_object_put(obj);
}

json_object *
cli_json_num(double v)
{
    if (!isfinite(v))
        return NULL; /* JSON null; callers avoid non-finite values */
    char buf[32];
    snprintf(buf, sizeof buf, "%.12g", v);
    return json_object_new_double_s(v, buf);
}

json_object *
cli_json_range(const double r[2])
{
    json_object *a = json_object_new_array();
    json_object_array_add(a, cli_json_num(r[0]));
    json_object_array_add(a, cli_json_num(r[1]));
    return a;
}

int
cli_parse_waves(const cli_wave_args *a, int need_two, dk_waves *w, int *shg,
                const char *const usage[])
{
    dk_error err = {0};
    *w = (dk_waves){0, 0, 0};
    *shg = 0;
    if (a->fundamental) {
        if (a->pump || a->signal || a->idler)
            return cli_usage_error(usage, "--fundamental (SHG) excludes "
                                          "--pump, --signal and --idler");
        double f;
        if (dk_parse_wavelength(a->fundamental, &f, &err))
            return cli_usage_error(usage, "%s", err.msg);
        *w = dk_waves_shg(f);
        *shg = 1;
        return 0;
    }
    const char *txt[3] = {a->pump, a->signal, a->idler};
    double *val[3] = {&w->pump_um, &w->signal_um, &w->idler_um};
    for (int i = 0; i < 3; i++)
        if (txt[i] && dk_parse_wavelength(txt[i], val[i], &err))
            return cli_usage_error(usage, "%s", err.msg);
    if (!need_two)
        return 0;
    if (dk_waves_complete(w, &err))
        return cli_usage_error(usage, "%s", err.msg);
    return 0;
}

void
cli_warn_caution(const dk_crystal *c, double temp_c)
{
    const char *t = dk_crystal_caution_at(c, temp_c);
    if (t)
        cli_warn("%s at %.4g C: %s", c->id, temp_c, t);
}

int
cli_parse_range(const char *s, int wavelengths, double r[2], dk_error *err)
{
    char buf[64];
    const char *colon = strchr(s, ':');
    const char *example = wavelengths ? "2.8um:4.2um" : "20:200";
    if (!colon || (size_t)(colon - s) >= sizeof buf)
        return dk_error_set(err, DK_EINVAL, "range '%s' must look like %s", s,
                            example);
    memcpy(buf, s, colon - s);
    buf[colon - s] = '\0';
    dk_status st =
        wavelengths ? dk_parse_wavelength(buf, &r[0], err)
                    : dk_parse_temperature(buf, &r[0], err);
    if (!st)
        st = wavelengths ? dk_parse_wavelength(colon + 1, &r[1], err)
                         : dk_parse_temperature(colon + 1, &r[1], err);
    if (st)
        return st;
    if (!(r[0] < r[1]))
        return dk_error_set(err, DK_EINVAL,
                            "range '%s' must have low < high, e.g. %s", s,
                            example);
    return 0;
}

int
cli_common_option(int ch, const char *arg, cli_common *cm,
                  const char *const usage[])
{
    switch (ch) {
    case 'c':
        if (cm->crystal)
            return cli_usage_error(usage, "--crystal is given twice; give "
                                          "it once");
        cm->crystal = arg;
        return 1;
    case 'd':
        if (cm->set_name)
            return cli_usage_error(usage, "--dispersion is given twice; "
                                          "give it once");
        cm->set_name = arg;
        return 1;
    case 'a': cm->all = 1; return 1;
    case 'j': cm->json = 1; return 1;
    case 'v': cm->csv = 1; return 1;
    }
    return 0;
}

int
cli_common_finish(const cli_common *cm, int argc, char **argv, int allow_all,
                  const char *const usage[])
{
    (void)argc;
    (void)argv;
    if (!cm->crystal)
        return cli_usage_error(usage, "--crystal is required");
    if (cm->json && cm->csv)
        return cli_usage_error(usage, "choose one of --json and --csv");
    if (cm->all && !allow_all)
        return cli_usage_error(usage, "--all-sets does not apply here; use "
                                      "--dispersion to pick a set");
    if (cm->all && cm->set_name)
        return cli_usage_error(usage, "choose one of --dispersion and "
                                      "--all-sets");
    cli_set_output_mode(cm->json ? CLI_JSON : cm->csv ? CLI_CSV : CLI_TEXT);
    return 0;
}


/* Strict reading of a plain number: no empty text, NaN, infinity,
 * hexadecimal form or trailing characters. */
static int
plain_number(const char *text, double *v)
{
    if (!text || !*text)
        return 0;
    for (const char *c = text; *c; c++)
        if (*c == 'x' || *c == 'X' || *c == 'n' || *c == 'N' || *c == 'i' ||
            *c == 'I')
            return 0;
    char *end;
    *v = strtod(text, &end);
    return end != text && !*end && isfinite(*v);
}

int
cli_real(const char *opt, const char *text, double lo, double hi, double *out,
         const char *const usage[])
{
    double v;
    if (!plain_number(text, &v))
        return cli_usage_error(usage, "%s '%s' must be a number", opt,
                               text ? text : "");
    if (!(v >= lo && v <= hi))
        return cli_usage_error(usage, "%s %s must lie between %g and %g", opt,
                               text, lo, hi);
    *out = v;
    return 0;
}

int
cli_int(const char *opt, const char *text, long lo, long hi, int *out,
        const char *const usage[])
{
    char *end;
    if (!text || !*text || strspn(text, "+-0123456789") != strlen(text))
        return cli_usage_error(usage, "%s '%s' must be a whole number", opt,
                               text ? text : "");
    errno = 0;
    long v = strtol(text, &end, 10);
    if (errno || *end || v < lo || v > hi)
        return cli_usage_error(usage, "%s %s must be a whole number from %ld "
                                      "to %ld",
                               opt, text, lo, hi);
    *out = (int)v;
    return 0;
}

int
cli_angle(const char *opt, const char *text, double lo_deg, double hi_deg,
          double *rad, const char *const usage[])
{
    double v;
    if (!plain_number(text, &v))
        return cli_usage_error(usage, "%s '%s' must be an angle in degrees, "
                                      "e.g. 22.8",
                               opt, text ? text : "");
    if (!(v >= lo_deg && v <= hi_deg))
        return cli_usage_error(usage, "%s %s must lie between %g and %g deg",
                               opt, text, lo_deg, hi_deg);
    *rad = v * DK_RAD_PER_DEG;
    return 0;
}

void
cli_flags_json(json_object *obj, unsigned range, int shg)
{
    char buf[160];
    if (!range)
        return;
    json_object *arr = json_object_new_array();
    dk_range_codes(range, shg, buf, sizeof buf);
    for (char *sv = NULL, *t = strtok_r(buf, ";", &sv); t;
         t = strtok_r(NULL, ";", &sv))
        json_object_array_add(arr, json_object_new_string(t));
    json_object_object_add(obj, "flags", arr);
}

void
cli_flags_text(FILE *f, unsigned range, int shg)
{
    char buf[160];
    if (range)
        fprintf(f, "  [extrapolated: %s]\n",
                dk_range_words(range, shg, buf, sizeof buf));
}

int
cli_edit_distance(const char *a, const char *b)
{
    size_t la = strlen(a), lb = strlen(b);
    if (la > 64 || lb > 64)
        return 99;
    int prev[65], cur[65];
    for (size_t j = 0; j <= lb; j++)
        prev[j] = (int)j;
    for (size_t i = 1; i <= la; i++) {
        cur[0] = (int)i;
        for (size_t j = 1; j <= lb; j++) {
            int sub = prev[j - 1] + (a[i - 1] != b[j - 1]);
            int del = prev[j] + 1, ins = cur[j - 1] + 1;
            cur[j] = sub < del ? (sub < ins ? sub : ins)
                               : (del < ins ? del : ins);
        }
        memcpy(prev, cur, sizeof(int) * (lb + 1));
    }
    return prev[lb];
}

const char *
cli_escape(const char *text, char *buf, size_t n)
{
    return dk_text_escape(text, buf, n);
}

const char *
cli_csv(const char *text, char *buf, size_t n)
{
    if (!strpbrk(text, ",\"\r\n")) {
        snprintf(buf, n, "%s", text);
        return buf;
    }
    /* RFC 4180: quote the field, double the quotes inside. */
    size_t k = 0;
    if (n < 3) {
        buf[0] = '\0';
        return buf;
    }
    buf[k++] = '"';
    for (; *text && k + 3 < n; text++) {
        if (*text == '"')
            buf[k++] = '"';
        buf[k++] = *text;
    }
    buf[k++] = '"';
    buf[k] = '\0';
    return buf;
}

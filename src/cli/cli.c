/*
 * cli.c - messages, warnings, database loading and buffered output for
 * the command files (see cli.h).
 */
#include <math.h>
#include <getopt.h>
#include <stdarg.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "deltak/material.h"
#include "deltak/units.h"

#define MAX_WARNINGS 64

static char *warnings[MAX_WARNINGS];
static int nwarnings;

int
cli_error(const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    fputs("error: ", stderr);
    vfprintf(stderr, fmt, ap);
    fputc('\n', stderr);
    va_end(ap);
    return CLI_FAIL;
}

void
cli_print_usage(FILE *f, const char *const usage[])
{
    for (int i = 0; usage[i]; i++)
        fprintf(f, "%s%s\n", i == 0 ? "usage: " : "", usage[i]);
}

int
cli_usage_error(const char *const usage[], const char *fmt, ...)
{
    va_list ap;
    va_start(ap, fmt);
    fputs("error: ", stderr);
    vfprintf(stderr, fmt, ap);
    fputc('\n', stderr);
    va_end(ap);
    cli_print_usage(stderr, usage);
    return CLI_USAGE;
}

void
cli_warn(const char *fmt, ...)
{
    char buf[DK_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    for (int i = 0; i < nwarnings; i++)
        if (strcmp(warnings[i], buf) == 0)
            return;
    if (nwarnings < MAX_WARNINGS) {
        char *copy = strdup(buf);
        if (copy)
            warnings[nwarnings++] = copy;
    }
}

void
cli_warn_index(const dk_dispersion_set *set, unsigned flags, double lambda_um,
               double temp_c)
{
    char buf[1024];
    if (set->from_memory)
        cli_warn("data set '%s' is typed from memory and not yet checked "
                 "against an independent source (see 'deltak crystals')",
                 set->name);
    if (!dk_warning_text(set, flags, lambda_um, temp_c, buf, sizeof buf))
        return;
    for (char *line = strtok(buf, "\n"); line; line = strtok(NULL, "\n"))
        cli_warn("%s", line);
}

void
cli_warnings_to_json(json_object *obj)
{
    if (!nwarnings)
        return;
    json_object *arr = json_object_new_array();
    for (int i = 0; i < nwarnings; i++)
        json_object_array_add(arr, json_object_new_string(warnings[i]));
    json_object_object_add(obj, "warnings", arr);
}

void
cli_warnings_flush(void)
{
    for (int i = 0; i < nwarnings; i++) {
        fprintf(stderr, "warning: %s\n", warnings[i]);
        free(warnings[i]);
    }
    nwarnings = 0;
}

int
cli_load_db(dk_db **db)
{
    const char *dir = getenv("DELTAK_CRYSTALS");
    if (!dir || !*dir)
        dir = DK_CRYSTAL_DIR;
    dk_error err = {0};
    if (dk_db_load(dir, db, &err))
        return cli_error("%s", err.msg);
    for (int i = 0; i < (*db)->nerrors; i++)
        cli_warn("%s (file skipped)", (*db)->errors[i]);
    return 0;
}

const dk_crystal *
cli_find_crystal(const dk_db *db, const char *name)
{
    if (!name) {
        cli_error("no crystal given: use --crystal NAME (see 'deltak "
                  "crystals' for the list)");
        return NULL;
    }
    const dk_crystal *c = dk_db_find(db, name);
    if (c)
        return c;
    fprintf(stderr, "error: unknown crystal '%s'; known crystals:", name);
    for (int i = 0; i < db->ncrystals; i++)
        fprintf(stderr, "%s %s", i ? "," : "", db->crystals[i]->id);
    fprintf(stderr, "\n(aliases such as BBO or PPLN work too; see 'deltak "
                    "crystals')\n");
    return NULL;
}

const dk_dispersion_set *
cli_find_set(const dk_crystal *c, const char *name)
{
    const dk_dispersion_set *s = dk_crystal_find_set(c, name);
    if (s) {
        cli_warn_index(s, 0, 0, 0);
        return s;
    }
    fprintf(stderr, "error: %s has no data set '%s'; its sets are:", c->id,
            name);
    for (int i = 0; i < c->nsets; i++)
        fprintf(stderr, "%s %s", i ? "," : "", c->sets[i].name);
    fputc('\n', stderr);
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
    if (fclose(o->f) != 0) {
        free(o->buf);
        return cli_error("out of memory");
    }
    size_t w = fwrite(o->buf, 1, o->len, stdout);
    free(o->buf);
    if (w != o->len || fflush(stdout) != 0)
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
cli_common_option(int ch, cli_common *cm)
{
    switch (ch) {
    case 'c': cm->crystal = optarg; return 1;
    case 'd': cm->set_name = optarg; return 1;
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
    if (optind < argc)
        return cli_usage_error(usage, "unexpected argument '%s'",
                               argv[optind]);
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
    return 0;
}

int
cli_bad_option(char **argv, const char *const usage[])
{
    return cli_usage_error(usage, "unknown or incomplete option '%s'",
                           argv[optind - 1]);
}

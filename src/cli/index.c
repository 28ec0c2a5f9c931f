/*
 * index.c - `deltak index`: n, group index, GVD, TOD and dn/dT of every
 * axis of a crystal at one wavelength and temperature, for one data set
 * or for all of them with the spread between sets.
 */
#include <getopt.h>
#include <math.h>
#include <string.h>

#include "cli.h"
#include "options.h"
#include "commands.h"
#include "deltak/group.h"
#include "deltak/material.h"
#include "deltak/units.h"

static const char *const index_usage[] = {
    "deltak index --crystal <name> --wavelength <wl> [--temp <T>]",
    "             [--dispersion <set> | --all-sets] [--json | --csv]",
    "",
    "  --crystal <name>     crystal id or alias, e.g. MgO:LN, BBO, KTP",
    "  --wavelength <wl>    vacuum wavelength with unit: 1064nm, 1.064um, "
    "9398cm-1, 281.8THz",
    "  --temp <T>           temperature in C (or with K suffix); default 25",
    "  --dispersion <set>   one published data set (default: the crystal's "
    "first)",
    "  --all-sets           every data set, with the spread between them",
    "  --json, --csv        machine-readable output",
    NULL};

/* One row of results: one axis of one set. */
typedef struct row {
    const dk_dispersion_set *set;
    char axis;
    double temp_c;   /* the temperature actually used */
    dk_index_value v;
    double ng, gvd, tod;
} row;

#define MAX_ROWS 64

static json_object *
axis_json(const row *r)
{
    json_object *a = json_object_new_object();
    char lab[2] = {r->axis, 0};
    json_object_object_add(a, "axis", json_object_new_string(lab));
    json_object_object_add(a, "n", cli_json_num(r->v.n));
    json_object_object_add(a, "group_index", cli_json_num(r->ng));
    json_object_object_add(a, "gvd_fs2_per_mm", cli_json_num(r->gvd));
    json_object_object_add(a, "tod_fs3_per_mm", cli_json_num(r->tod));
    if (dk_set_has_temperature(r->set))
        json_object_object_add(a, "dn_dT_per_C", cli_json_num(r->v.dn_dt));
    if (r->v.warnings) {
        json_object *fl = json_object_new_array();
        if (r->v.warnings & DK_WARN_LAMBDA_RANGE)
            json_object_array_add(fl, json_object_new_string("range:wavelength"));
        if (r->v.warnings & DK_WARN_TEMP_RANGE)
            json_object_array_add(fl,
                                  json_object_new_string("range:temperature"));
        if (r->v.warnings & DK_WARN_NO_TEMP)
            json_object_array_add(fl, json_object_new_string(
                                          "no-temperature-dependence"));
        json_object_object_add(a, "flags", fl);
    }
    json_object_object_add(a, "dn_dlambda_per_um", cli_json_num(r->v.dn_dl));
    return a;
}

/* The rows of @set as a JSON array. */
static json_object *
axes_json(const row *rows, int n, const dk_dispersion_set *set)
{
    json_object *arr = json_object_new_array();
    for (int i = 0; i < n; i++)
        if (rows[i].set == set)
            json_object_array_add(arr, axis_json(&rows[i]));
    return arr;
}

static void
print_table(FILE *f, const dk_crystal *c, const row *rows, int n,
            double lambda_um, double temp_c, int all)
{
    fprintf(f, "%s at %.6g um (%.2f cm-1), %.6g C\n", c->id, lambda_um,
            1e4 / lambda_um, temp_c);
    const dk_dispersion_set *cur = NULL;
    for (int i = 0; i < n; i++) {
        const row *r = &rows[i];
        if (r->set != cur) {
            cur = r->set;
            fputc('\n', f);
            cli_wrapf(f, "", "    ", "data set %s%s: %s", cur->name,
                      cur->from_memory ? " [from memory]" : "", cur->citation);
            fprintf(f, "  %-4s %10s %12s %13s %13s %12s\n", "axis", "n",
                    "group index", "GVD fs2/mm", "TOD fs3/mm", "dn/dT 1/C");
        }
        char dndt[16];
        if (dk_set_has_temperature(r->set))
            snprintf(dndt, sizeof dndt, "%12.3e", r->v.dn_dt);
        else
            snprintf(dndt, sizeof dndt, "%12s", "n/a");
        fprintf(f, "  %-4c %10.6f %12.6f %13.2f %13.2f %s%s\n", r->axis,
                r->v.n, r->ng, r->gvd, r->tod, dndt,
                r->v.warnings & (DK_WARN_LAMBDA_RANGE | DK_WARN_TEMP_RANGE)
                    ? "  [extrapolated]"
                    : "");
    }
    if (!all)
        return;
    fprintf(f, "\nspread between data sets (max - min)\n");
    const char *labels = dk_crystal_axis_labels(c);
    for (const char *a = labels; *a; a++) {
        double lo = INFINITY, hi = -INFINITY, glo = INFINITY, ghi = -INFINITY;
        int k = 0;
        for (int i = 0; i < n; i++)
            if (rows[i].axis == *a) {
                lo = fmin(lo, rows[i].v.n), hi = fmax(hi, rows[i].v.n);
                glo = fmin(glo, rows[i].gvd), ghi = fmax(ghi, rows[i].gvd);
                k++;
            }
        if (k > 1)
            fprintf(f, "  %-4c n: %.2e over %d sets;  GVD: %.1f fs2/mm\n", *a,
                    hi - lo, k, ghi - glo);
    }
}

static json_object *
spread_json(const dk_crystal *c, const row *rows, int n)
{
    json_object *arr = json_object_new_array();
    for (const char *a = dk_crystal_axis_labels(c); *a; a++) {
        double lo = INFINITY, hi = -INFINITY;
        int k = 0;
        for (int i = 0; i < n; i++)
            if (rows[i].axis == *a) {
                lo = fmin(lo, rows[i].v.n), hi = fmax(hi, rows[i].v.n);
                k++;
            }
        if (!k)
            continue;
        json_object *o = json_object_new_object();
        char lab[2] = {*a, 0};
        json_object_object_add(o, "axis", json_object_new_string(lab));
        json_object_object_add(o, "n_min", cli_json_num(lo));
        json_object_object_add(o, "n_max", cli_json_num(hi));
        json_object_object_add(o, "n_spread", cli_json_num(hi - lo));
        json_object_object_add(o, "sets", json_object_new_int(k));
        json_object_array_add(arr, o);
    }
    return arr;
}

int
cmd_index(int argc, char **argv)
{
    enum { O_WL = 500, O_TEMP, O_END };
    static const struct option opts[] = {
        CLI_COMMON_OPTIONS,
        {"wavelength", required_argument, NULL, O_WL},
        {"temp", required_argument, NULL, O_TEMP},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_WL] = {0};
    cli_slots sl = {O_WL, O_END - O_WL, v, opts, index_usage};
    cli_common cm = {0};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, index_usage, &cm, NULL,
                                NULL, cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    const char *wl = v[0], *temp = v[1];
    if ((rc = cli_common_finish(&cm, argc, argv, 1, index_usage)))
        return rc;
    if (!wl)
        return cli_usage_error(index_usage, "--wavelength is required");
    const char *set_name = cm.set_name;
    int all = cm.all, json = cm.json, csv = cm.csv;
    dk_error err = {0};
    double lambda_um, temp_c = 25;
    if (dk_parse_wavelength(wl, &lambda_um, &err) ||
        (temp && dk_parse_temperature(temp, &temp_c, &err)))
        return cli_usage_error(index_usage, "%s", err.msg);

    dk_db *db = NULL;
    if (cli_load_db(&db, cm.crystal))
        return CLI_FAIL;
    rc = CLI_FAIL;
    const dk_crystal *c = cli_find_crystal(db, cm.crystal);
    const dk_dispersion_set *only = NULL;
    if (!c)
        goto done;
    if (!all && !set_name) {
        const char *why;
        only = dk_crystal_default_set(c, DK_USE_ANGLE, &why);
        if (c->nsets > 1) {
            dk_notes n;
            dk_notes_clear(&n);
            dk_notes_add(&n, DK_NOTE_DEFAULT, "default-set",
                         "data set %s (%s); %d sets exist: pick one with "
                         "--dispersion or compare them with --all-sets",
                         only->name, why, c->nsets);
            cli_take_notes(&n);
        }
    } else if (!all && !(only = cli_find_set(c, set_name))) {
        goto done;
    }
    if (!temp) {
        dk_notes n;
        dk_notes_clear(&n);
        dk_notes_add(&n, DK_NOTE_DEFAULT, "default-temperature",
                     "temperature 25 C (not given; set it with --temp; a set "
                     "without temperature dependence holds at its own)");
        cli_take_notes(&n);
    }

    row rows[MAX_ROWS];
    int n = 0;
    for (int s = 0; s < c->nsets; s++) {
        const dk_dispersion_set *set = &c->sets[s];
        if (only && set != only)
            continue;
        /* Without --temp a set with no T dependence is used at its own
         * reference temperature, silently. */
        double t = temp_c;
        if (!temp && !dk_set_has_temperature(set))
            t = set->reference_temperature_c;
        for (const char *a = dk_crystal_axis_labels(c); *a && n < MAX_ROWS;
             a++) {
            if (!dk_set_find_axis(set, *a))
                continue;
            row *r = &rows[n];
            r->set = set;
            r->axis = *a;
            r->temp_c = t;
            if (dk_material_index(c, set, *a, lambda_um, t, &r->v, &err)) {
                cli_error("%s", err.msg);
                goto done;
            }
            cli_warn_index(set, r->v.warnings, lambda_um, t);
            r->ng = dk_group_index(lambda_um, r->v.n, r->v.dn_dl);
            r->gvd = dk_gvd_fs2_per_mm(lambda_um, r->v.d2n_dl2);
            r->tod = dk_tod_fs3_per_mm(lambda_um, r->v.d2n_dl2, r->v.d3n_dl3);
            n++;
        }
        if (only && set->naxes < (int)strlen(dk_crystal_axis_labels(c)))
            cli_warn("data set '%s' gives only some axes of %s", set->name,
                     c->id);
    }

    cli_out out;
    if (cli_out_open(&out))
        goto done;
    if (json) {
        json_object *o = json_object_new_object();
        const dk_dispersion_set *first = rows[0].set;
        json_object_object_add(o, "crystal", json_object_new_string(c->id));
        json_object_object_add(o, "dispersion",
                               json_object_new_string(first->name));
        json_object_object_add(o, "wavelength_um", cli_json_num(lambda_um));
        json_object_object_add(o, "temperature_C", cli_json_num(temp_c));
        json_object_object_add(o, "axes", axes_json(rows, n, first));
        if (all) {
            json_object *sets = json_object_new_array();
            for (int s = 0; s < c->nsets; s++) {
                json_object *so = json_object_new_object();
                json_object_object_add(
                    so, "dispersion", json_object_new_string(c->sets[s].name));
                json_object_object_add(so, "axes",
                                       axes_json(rows, n, &c->sets[s]));
                json_object_array_add(sets, so);
            }
            json_object_object_add(o, "sets", sets);
            json_object_object_add(o, "spread", spread_json(c, rows, n));
        }
        cli_warnings_to_json(o);
        cli_out_json(&out, o);
    } else if (csv) {
        fprintf(out.f, "crystal,dispersion,axis,wavelength_um,temperature_C,"
                       "n,group_index,gvd_fs2_per_mm,tod_fs3_per_mm,"
                       "dn_dT_per_C,flags\n");
        for (int i = 0; i < n; i++) {
            char flags[256], dndt[32] = "";
            unsigned w = rows[i].v.warnings;
            size_t k = strlen(cli_csv_flags(0, 0, flags, sizeof flags));
            if (w & DK_WARN_LAMBDA_RANGE)
                k += snprintf(flags + k, sizeof flags - k, "%srange:wavelength",
                              k ? ";" : "");
            if ((w & DK_WARN_TEMP_RANGE) && k < sizeof flags)
                k += snprintf(flags + k, sizeof flags - k,
                              "%srange:temperature", k ? ";" : "");
            if ((w & DK_WARN_NO_TEMP) && k < sizeof flags)
                snprintf(flags + k, sizeof flags - k,
                         "%sno-temperature-dependence", k ? ";" : "");
            if (dk_set_has_temperature(rows[i].set))
                snprintf(dndt, sizeof dndt, "%.6g", rows[i].v.dn_dt);
            char q1[160], q2[160];
            fprintf(out.f, "%s,%s,%c,%.10g,%.10g,%.10g,%.10g,%.8g,%.8g,%s,%s\n",
                    cli_csv(c->id, q1, sizeof q1),
                    cli_csv(rows[i].set->name, q2, sizeof q2), rows[i].axis, lambda_um,
                    rows[i].temp_c, rows[i].v.n, rows[i].ng, rows[i].gvd,
                    rows[i].tod, dndt, flags);
        }
    } else {
        print_table(out.f, c, rows, n, lambda_um, temp_c, all);
    }
    rc = cli_out_commit(&out);
done:
    dk_db_free(db);
    return rc;
}

/*
 * crystals.c - `deltak crystals [NAME]`: list the database, or show one
 * crystal with every data set, range and source.
 */
#include <getopt.h>
#include <string.h>
#include <strings.h>

#include "cli.h"
#include "options.h"
#include "commands.h"

static const char *const crystals_usage[] = {
    "deltak crystals [--json] [<name> | <file.yaml>]",
    "   or: deltak crystals --names [<name>]",
    "",
    "  <name>      a crystal id or alias (case-insensitive): show it in full",
    "  <file.yaml> a crystal file of your own: check it and show it in full",
    "  --json      machine-readable output",
    "  --names     every crystal id and alias, one a line; with <name>, that",
    "              crystal's data sets (for scripts and shell completion)",
    "",
    "The database is the shipped folder plus your own: DELTAK_CRYSTALS lists",
    "folders and .yaml files (colon-separated) searched first, so a file of",
    "yours adds a crystal or, with the same name, replaces the shipped one",
    "(with a warning). Every command's --crystal also takes a file path.",
    NULL};

static const char *
poling_str(dk_poling p)
{
    switch (p) {
    case DK_POLING_PERIODIC: return "periodic poling";
    case DK_POLING_ORIENTATION: return "orientation patterning";
    case DK_POLING_NONE: break;
    }
    return "none";
}

static const char *
axis_name(int i)
{
    static const char *const n[] = {"X", "Y", "Z"};
    return i >= 0 && i < 3 ? n[i] : "-";
}

/* Columns a piece of UTF-8 text takes (one per code point; the names
 * in the database have no wide or combining characters). */
static int
text_width(const char *s, size_t len)
{
    int w = 0;
    for (size_t i = 0; i < len && s[i]; i++)
        w += ((unsigned char)s[i] & 0xC0) != 0x80;
    return w;
}

/* The list fits 80 columns: the table holds the crystal, its class and
 * transparency, and in the last column its data sets and then its other
 * names, each wrapped to that column. */
#define LIST_WIDTH 80

/* The most names one cell of the list shows (a file has at most 32
 * aliases, src/data/crystal_load.h). */
#define NAMES_MAX 64

/* One wrapped cell: @lead, then @words joined by ", ", from column
 * @indent (where the cursor is) to LIST_WIDTH; continuation lines are
 * indented under the first word. */
static void
print_words(FILE *f, int indent, const char *lead, const char *const *words,
            int n)
{
    int start = indent + text_width(lead, strlen(lead)), col = start;
    fputs(lead, f);
    for (int i = 0; i < n; i++) {
        int w = text_width(words[i], strlen(words[i])) + (i + 1 < n);
        if (i > 0 && col + 1 + w > LIST_WIDTH) {
            fprintf(f, "\n%*s", start, "");
            col = start;
        } else if (i > 0) {
            fputc(' ', f);
            col++;
        }
        fprintf(f, "%s%s", words[i], i + 1 < n ? "," : "");
        col += w;
    }
    fputc('\n', f);
}

/* 1 when @c comes from the shipped folder, not from a user's file. */
static int
is_shipped(const dk_crystal *c)
{
    const char *dir = dk_db_shipped_dir();
    size_t n = strlen(dir);
    return strncmp(c->path, dir, n) == 0 && c->path[n] == '/';
}

static void
print_list(FILE *f, const dk_db *db)
{
    int wid = 7, wrange = 12, own = 0;
    char range[32];
    for (int i = 0; i < db->ncrystals; i++) {
        const dk_crystal *c = db->crystals[i];
        int w = text_width(c->id, strlen(c->id)) + !is_shipped(c);
        wid = w > wid ? w : wid;
        w = snprintf(range, sizeof range, "%g-%g um", c->transparency_um[0],
                     c->transparency_um[1]);
        wrange = w > wrange ? w : wrange;
    }
    int indent = wid + 2 + 9 + 2 + wrange + 2;
    fprintf(f, "%-*s  %-9s  %-*s  %s\n", wid, "crystal", "class", wrange,
            "transparency", "data sets (default first); other names");
    for (int i = 0; i < db->ncrystals; i++) {
        const dk_crystal *c = db->crystals[i];
        const char *words[NAMES_MAX];
        int n = 0, user = !is_shipped(c);
        own += user;
        snprintf(range, sizeof range, "%g-%g um", c->transparency_um[0],
                 c->transparency_um[1]);
        fprintf(f, "%s%s%*s  %-9s  %-*s  ", c->id, user ? "*" : "",
                wid - text_width(c->id, strlen(c->id)) - user, "",
                dk_optical_class_str(c->optical_class), wrange, range);
        for (int j = 0; j < c->nsets && n < NAMES_MAX; j++)
            words[n++] = c->sets[j].name;
        print_words(f, indent, "", words, n);
        n = 0;
        for (int j = 0; j < c->naliases && n < NAMES_MAX; j++)
            if (strcasecmp(c->aliases[j], c->id) != 0)
                words[n++] = c->aliases[j];
        if (n) {
            fprintf(f, "%*s", indent, "");
            print_words(f, indent, "also ", words, n);
        }
    }
    fprintf(f, "\n%d crystals. 'deltak crystals NAME' shows one in full.\n",
            db->ncrystals);
    if (own)
        fprintf(f, "* from your own files (DELTAK_CRYSTALS or --crystal "
                   "FILE), not the shipped\n  database (%s)\n",
                dk_db_shipped_dir());
}

/* `--names`: every id and alias, or the data sets of @c. */
static void
print_names(FILE *f, const dk_db *db, const dk_crystal *c)
{
    if (c) {
        for (int i = 0; i < c->nsets; i++)
            fprintf(f, "%s\n", c->sets[i].name);
        return;
    }
    for (int i = 0; i < db->ncrystals; i++) {
        fprintf(f, "%s\n", db->crystals[i]->id);
        for (int j = 0; j < db->crystals[i]->naliases; j++)
            if (strcmp(db->crystals[i]->aliases[j], db->crystals[i]->id))
                fprintf(f, "%s\n", db->crystals[i]->aliases[j]);
    }
}

static void
print_set(FILE *f, const dk_dispersion_set *s, int is_default,
          int is_qpm_default)
{
    fprintf(f, "\n  data set %s%s%s\n", s->name,
            is_default && is_qpm_default ? " (default)"
            : is_default                 ? " (default; for QPM see below)"
            : is_qpm_default             ? " (default for QPM)"
                                         : "",
            s->from_memory ? "  [typed from memory, not yet checked]" : "");
    cli_wrap(f, "    source       ", "                 ", s->citation);
    if (s->doi)
        fprintf(f, "    doi          %s\n", s->doi);
    fprintf(f, "    fitted over  %g-%g um", s->wavelength_range_um[0],
            s->wavelength_range_um[1]);
    if (s->temp_form != DK_TEMP_NONE)
        fprintf(f, ", %g-%g C", s->temperature_range_c[0],
                s->temperature_range_c[1]);
    else
        fprintf(f, ", at %g C", s->reference_temperature_c);
    fputc('\n', f);
    for (int i = 0; i < s->naxes; i++) {
        char lead[32];
        snprintf(lead, sizeof lead, "    axis %c       ", s->axes[i].label);
        cli_wrap(f, lead, "                 ", s->axes[i].formula);
        if (s->axes[i].citation)
            cli_wrapf(f, "                 ", "                 ", "(from %s)", s->axes[i].citation);
    }
    if (s->has_thermo)
    {
        cli_wrapf(f, "    dn/dT        ", "                 ", "%s, %g-%g C", s->thermo.formula,
                  s->thermo.temperature_range_c[0],
                  s->thermo.temperature_range_c[1]);
        cli_wrapf(f, "                 ", "                 ", "(%s)", s->thermo.citation);
    }
    if (s->note)
        cli_wrap(f, "    note         ", "                 ", s->note);
}

static void
print_one(FILE *f, const dk_crystal *c)
{
    fprintf(f, "%s - %s\n", c->id, c->name);
    fprintf(f, "  file         %s\n", c->path);
    fprintf(f, "  aliases     ");
    for (int i = 0; i < c->naliases; i++)
        fprintf(f, " %s", c->aliases[i]);
    fprintf(f, "\n  class        %s, point group %s\n",
            dk_optical_class_str(c->optical_class), c->point_group);
    cli_wrap(f, "  frame        ", "               ", c->frame);
    cli_wrapf(f, "  transparent  ", "               ", "%g-%g um (%s)", c->transparency_um[0],
              c->transparency_um[1], c->transparency_source);
    fprintf(f, "  QPM          %s", poling_str(c->poling));
    if (c->poling != DK_POLING_NONE)
        fprintf(f, "; polar axis %s, grating along %s",
                axis_name(c->polar_axis), axis_name(c->grating_axis));
    fputc('\n', f);
    const char *why_a, *why_q;
    const dk_dispersion_set *def_a = dk_crystal_default_set(c, DK_USE_ANGLE,
                                                            &why_a);
    const dk_dispersion_set *def_q = dk_crystal_default_set(c, DK_USE_QPM,
                                                            &why_q);
    cli_wrapf(f, "  default set  ", "               ", "%s: %s", def_a->name, why_a);
    if (c->poling != DK_POLING_NONE || def_q != def_a)
        cli_wrapf(f, "  QPM default  ", "               ", "%s: %s", def_q->name, why_q);
    for (int i = 0; i < c->nsets; i++)
        print_set(f, &c->sets[i], &c->sets[i] == def_a,
                  &c->sets[i] == def_q);
    if (c->has_expansion) {
        fputc('\n', f);
        cli_wrapf(f, "  ", "    ", "thermal expansion (reference %g C; %s)",
                  c->expansion_reference_c, c->expansion_citation);
        for (int i = 0; i < 3; i++)
            if (c->expansion[i].present)
                fprintf(f, "    %s  alpha %.4g /C, beta %.4g /C^2\n",
                        axis_name(i), c->expansion[i].alpha_per_c,
                        c->expansion[i].beta_per_c2);
    }
    if (c->has_nonlinear) {
        fputc('\n', f);
        cli_wrapf(f, "  ", "    ", "nonlinear coefficients at %g um%s (%s)",
                  c->nl_wavelength_um,
                  c->nl_from_memory ? " [from memory]" : "", c->nl_citation);
        cli_wrapf(f, "    ", "      ", "convention: %s", c->nl_convention);
        fputs("   ", f);
        for (int i = 0; i < c->nd; i++)
            fprintf(f, " %s = %g pm/V%s", c->d_names[i], c->d_values[i],
                    i + 1 < c->nd ? "," : "\n");
    }
    if (c->ncautions || c->ncaution_ranges || c->nwavelength_cautions ||
        c->has_damage) {
        fprintf(f, "\n  cautions\n");
        for (int i = 0; i < c->ncautions; i++)
            cli_wrap(f, "    - ", "      ", c->cautions[i]);
        for (int i = 0; i < c->ncaution_ranges; i++)
            cli_wrapf(f, "    - ", "      ", "%s %g C: %s",
                    c->caution_ranges[i].below ? "below" : "above",
                    c->caution_ranges[i].temp_c, c->caution_ranges[i].text);
        for (int i = 0; i < c->nwavelength_cautions; i++)
            cli_wrapf(f, "    - ", "      ", "a wave %s %g um: %s",
                    c->wavelength_cautions[i].below ? "below" : "above",
                    c->wavelength_cautions[i].lambda_um,
                    c->wavelength_cautions[i].text);
        if (c->has_damage)
            cli_wrapf(f, "    - ", "      ",
                      "damage threshold about %g GW/cm^2 (%s; %s)",
                    c->damage_gw_per_cm2, c->damage_pulse, c->damage_source);
    }
}

static json_object *
crystal_json(const dk_crystal *c, int full)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "crystal", json_object_new_string(c->id));
    json_object_object_add(o, "name", json_object_new_string(c->name));
    json_object_object_add(o, "file", json_object_new_string(c->path));
    json_object_object_add(o, "shipped", json_object_new_boolean(is_shipped(c)));
    json_object *al = json_object_new_array();
    for (int i = 0; i < c->naliases; i++)
        json_object_array_add(al, json_object_new_string(c->aliases[i]));
    json_object_object_add(o, "aliases", al);
    json_object_object_add(
        o, "class",
        json_object_new_string(dk_optical_class_str(c->optical_class)));
    json_object_object_add(o, "point_group",
                           json_object_new_string(c->point_group));
    json_object_object_add(o, "transparency_um",
                           cli_json_range(c->transparency_um));
    json_object_object_add(o, "poling",
                           json_object_new_string(poling_str(c->poling)));
    json_object *sets = json_object_new_array();
    for (int i = 0; i < c->nsets; i++) {
        const dk_dispersion_set *s = &c->sets[i];
        json_object *so = json_object_new_object();
        json_object_object_add(so, "dispersion",
                               json_object_new_string(s->name));
        if (full) {
            json_object_object_add(so, "citation",
                                   json_object_new_string(s->citation));
            if (s->doi)
                json_object_object_add(so, "doi",
                                       json_object_new_string(s->doi));
            json_object_object_add(so, "wavelength_range_um",
                                   cli_json_range(s->wavelength_range_um));
            json_object_object_add(so, "temperature_range_C",
                                   cli_json_range(s->temperature_range_c));
            json_object_object_add(so, "temperature_dependent",
                                   json_object_new_boolean(
                                       dk_set_has_temperature(s)));
            json_object_object_add(so, "from_memory",
                                   json_object_new_boolean(s->from_memory));
            char axes[4] = {0};
            for (int j = 0; j < s->naxes; j++)
                axes[j] = s->axes[j].label;
            json_object_object_add(so, "axes", json_object_new_string(axes));
        }
        json_object_array_add(sets, so);
    }
    json_object_object_add(o, "sets", sets);
    if (full) {
        json_object *defs = json_object_new_object();
        static const char *const use_key[] = {"angle", "qpm"};
        for (int u = 0; u < 2; u++) {
            const char *why;
            const dk_dispersion_set *d =
                dk_crystal_default_set(c, u ? DK_USE_QPM : DK_USE_ANGLE, &why);
            json_object *dj = json_object_new_object();
            json_object_object_add(dj, "dispersion",
                                   json_object_new_string(d->name));
            json_object_object_add(dj, "reason", json_object_new_string(why));
            json_object_object_add(defs, use_key[u], dj);
        }
        json_object_object_add(o, "default_sets", defs);
    }
    if (full && c->has_nonlinear) {
        json_object *d = json_object_new_object();
        for (int i = 0; i < c->nd; i++)
            json_object_object_add(d, c->d_names[i],
                                   cli_json_num(c->d_values[i]));
        json_object_object_add(o, "d_pm_per_V", d);
    }
    if (full) {
        json_object *ca = json_object_new_array();
        for (int i = 0; i < c->ncautions; i++)
            json_object_array_add(ca, json_object_new_string(c->cautions[i]));
        json_object_object_add(o, "cautions", ca);
        json_object *wc = json_object_new_array();
        for (int i = 0; i < c->nwavelength_cautions; i++) {
            const dk_wavelength_caution *w = &c->wavelength_cautions[i];
            json_object *wo = json_object_new_object();
            json_object_object_add(wo, w->below ? "below_um" : "above_um",
                                   cli_json_num(w->lambda_um));
            json_object_object_add(wo, "text", json_object_new_string(w->text));
            json_object_array_add(wc, wo);
        }
        json_object_object_add(o, "wavelength_cautions", wc);
    }
    return o;
}

int
cmd_crystals(int argc, char **argv)
{
    enum { OPT_NAMES = 256 };
    static const struct option opts[] = {{"json", no_argument, NULL, 'j'},
                                         {"names", no_argument, NULL, OPT_NAMES},
                                         {"help", no_argument, NULL, 'h'},
                                         {NULL, 0, NULL, 0}};
    cli_common cm = {0};
    const char *pos[1];
    int npos = 1, rc;
    const char *names_flag = NULL;
    cli_slots own = {OPT_NAMES, 1, &names_flag, opts, crystals_usage};
    if ((rc = cli_parse_options(argc, argv, opts, crystals_usage, &cm, NULL,
                                NULL, cli_slot_option, &own, pos, &npos)))
        return rc == CLI_HELP ? 0 : rc;
    int json = cm.json;
    if (json && names_flag)
        return cli_usage_error(crystals_usage, "choose one of --json and "
                                               "--names");
    dk_db *db = NULL;
    const char *name = npos ? pos[0] : NULL;
    if (cli_load_db(&db, name))
        return CLI_FAIL;
    const dk_crystal *c = NULL;
    if (name && !(c = cli_find_crystal(db, name))) {
        dk_db_free(db);
        return CLI_FAIL;
    }
    cli_out out;
    if (cli_out_open(&out)) {
        dk_db_free(db);
        return CLI_FAIL;
    }
    if (names_flag) {
        print_names(out.f, db, c);
    } else if (json) {
        json_object *o;
        if (c) {
            o = crystal_json(c, 1);
        } else {
            o = json_object_new_object();
            json_object *arr = json_object_new_array();
            for (int i = 0; i < db->ncrystals; i++)
                json_object_array_add(arr, crystal_json(db->crystals[i], 0));
            json_object_object_add(o, "crystals", arr);
        }
        cli_warnings_to_json(o);
        cli_out_json(&out, o);
    } else if (c) {
        print_one(out.f, c);
    } else {
        print_list(out.f, db);
    }
    dk_db_free(db);
    return cli_out_commit(&out);
}

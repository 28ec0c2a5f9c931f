/*
 * crystal.c - the crystal database: load a folder of crystal files, look
 * crystals up by id or alias (case-insensitive) and data sets by name.
 *
 * Thermal expansion: L(T) = L(T_ref)·[1 + α(T − T_ref) + β(T − T_ref)²]
 * (the form of Kim & Smith, J. Appl. Phys. 40, 4637 (1969)).
 *
 * Folder loading reads the *.yaml names (hidden files skipped, at most
 * DK_DB_MAX_FILES), sorts them so that which of two clashing files wins is
 * reproducible, and loads each with dk_crystal_load() (which bounds each
 * file). Paths quoted in messages have control characters escaped.
 */
#include <dirent.h>
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>

#include "core/arena.h"
#include "deltak/crystal.h"
#include "deltak/text.h"

void
dk_crystal_free(dk_crystal *c)
{
    if (c)
        dk_arena_free(c->arena);
}

void
dk_db_free(dk_db *db)
{
    if (!db)
        return;
    for (int i = 0; i < db->ncrystals; i++)
        dk_crystal_free(db->crystals[i]);
    for (int i = 0; i < db->nerrors; i++)
        free(db->errors[i]);
    for (int i = 0; i < db->nnotices; i++)
        free(db->notices[i]);
    free(db->crystals);
    free(db->errors);
    free(db->notices);
    free(db);
}

int
dk_crystal_answers_to(const dk_crystal *c, const char *name)
{
    if (strcasecmp(c->id, name) == 0)
        return 1;
    for (int i = 0; i < c->naliases; i++)
        if (strcasecmp(c->aliases[i], name) == 0)
            return 1;
    return 0;
}

const dk_crystal *
dk_db_find(const dk_db *db, const char *name)
{
    if (!db || !name)
        return NULL;
    for (int i = 0; i < db->ncrystals; i++)
        if (dk_crystal_answers_to(db->crystals[i], name))
            return db->crystals[i];
    return NULL;
}

/* The first name of @c (id or alias) that @other also answers to. */
static const char *
clash(const dk_crystal *c, const dk_crystal *other)
{
    if (dk_crystal_answers_to(other, c->id))
        return c->id;
    for (int i = 0; i < c->naliases; i++)
        if (dk_crystal_answers_to(other, c->aliases[i]))
            return c->aliases[i];
    return NULL;
}

static int
add_error(dk_db *db, const char *msg)
{
    char **e = realloc(db->errors, sizeof(char *) * (db->nerrors + 1));
    if (!e)
        return -1;
    db->errors = e;
    db->errors[db->nerrors] = strdup(msg);
    if (!db->errors[db->nerrors])
        return -1;
    db->nerrors++;
    return 0;
}

static int
by_id(const void *a, const void *b)
{
    const dk_crystal *x = *(dk_crystal *const *)a;
    const dk_crystal *y = *(dk_crystal *const *)b;
    return strcasecmp(x->id, y->id);
}

static int
is_yaml(const char *name)
{
    size_t n = strlen(name);
    return name[0] != '.' && n > 5 && strcmp(name + n - 5, ".yaml") == 0;
}

static int
by_name(const void *a, const void *b)
{
    return strcmp(*(char *const *)a, *(char *const *)b);
}

dk_status
dk_db_load(const char *dir, dk_db **out, dk_error *err)
{
    char shown[200];
    dk_text_escape(dir, shown, sizeof shown);
    DIR *d = dir ? opendir(dir) : NULL;
    if (!d)
        return dk_error_set(err, DK_EIO,
                            "cannot read crystal folder '%s': %s (set "
                            "DELTAK_CRYSTALS to the folder of crystal files)",
                            shown, dir ? strerror(errno) : "no folder named");
    dk_db *db = calloc(1, sizeof *db);
    char **names = NULL;
    int nnames = 0, too_many = 0;
    struct dirent *e;
    while (db) {
        errno = 0;
        if (!(e = readdir(d))) {
            if (errno) {
                int saved = errno;
                closedir(d);
                for (int i = 0; i < nnames; i++)
                    free(names[i]);
                free(names);
                dk_db_free(db);
                return dk_error_set(err, DK_EIO,
                                    "cannot read crystal folder '%s': %s",
                                    shown, strerror(saved));
            }
            break;
        }
        if (!is_yaml(e->d_name))
            continue;
        if (nnames >= DK_DB_MAX_FILES) {
            too_many = 1;
            continue;
        }
        char **nn = realloc(names, sizeof(char *) * (nnames + 1));
        if (!nn || !(nn[nnames] = strdup(e->d_name))) {
            names = nn ? nn : names;
            goto oom;
        }
        names = nn;
        nnames++;
    }
    closedir(d);
    d = NULL;
    if (!db)
        goto oom;
    /* Sorted, so that which of two clashing files wins is reproducible.
     * An empty folder has no list to sort (qsort on NULL is undefined). */
    if (nnames > 1)
        qsort(names, nnames, sizeof(char *), by_name);
    db->crystals = calloc(nnames + 1, sizeof(dk_crystal *));
    if (!db->crystals)
        goto oom;
    if (too_many) {
        char msg[DK_ERROR_MSG_MAX];
        snprintf(msg, sizeof msg,
                 "crystal folder '%s' has more than %d .yaml files: only "
                 "the first %d by name were read",
                 shown, DK_DB_MAX_FILES, DK_DB_MAX_FILES);
        if (add_error(db, msg))
            goto oom;
    }
    for (int i = 0; i < nnames; i++) {
        size_t len = strlen(dir) + strlen(names[i]) + 2;
        char *path = malloc(len);
        if (!path)
            goto oom;
        snprintf(path, len, "%s/%s", dir, names[i]);
        dk_crystal *c = NULL;
        dk_error e1 = {0};
        dk_status s = dk_crystal_load(path, &c, &e1);
        free(path);
        if (s == DK_ENOMEM)
            goto oom;
        if (s) {
            if (add_error(db, e1.msg))
                goto oom;
            continue;
        }
        const char *dup = NULL;
        const dk_crystal *other = NULL;
        for (int j = 0; j < db->ncrystals && !dup; j++)
            if ((dup = clash(c, db->crystals[j])))
                other = db->crystals[j];
        if (dup) {
            char msg[DK_ERROR_MSG_MAX], p1[160], p2[160];
            snprintf(msg, sizeof msg,
                     "cannot load '%s': the name '%s' is already taken by "
                     "'%s'",
                     dk_text_escape(c->path, p1, sizeof p1), dup,
                     dk_text_escape(other->path, p2, sizeof p2));
            dk_crystal_free(c);
            if (add_error(db, msg))
                goto oom;
            continue;
        }
        db->crystals[db->ncrystals++] = c;
    }
    if (db->ncrystals > 1)
        qsort(db->crystals, db->ncrystals, sizeof(dk_crystal *), by_id);
    for (int i = 0; i < nnames; i++)
        free(names[i]);
    free(names);
    *out = db;
    return DK_OK;
oom:
    if (d)
        closedir(d);
    for (int i = 0; i < nnames; i++)
        free(names[i]);
    free(names);
    dk_db_free(db);
    return dk_error_set(err, DK_ENOMEM, "out of memory");
}

const dk_dispersion_set *
dk_crystal_find_set(const dk_crystal *c, const char *name)
{
    if (!name)
        return &c->sets[0];
    for (int i = 0; i < c->nsets; i++)
        if (strcasecmp(c->sets[i].name, name) == 0)
            return &c->sets[i];
    return NULL;
}

const char *
dk_crystal_axis_labels(const dk_crystal *c)
{
    switch (c->optical_class) {
    case DK_ISOTROPIC: return "n";
    case DK_UNIAXIAL: return "oe";
    case DK_BIAXIAL: return "XYZ";
    }
    return "";
}

const char *
dk_optical_class_str(dk_optical_class k)
{
    switch (k) {
    case DK_ISOTROPIC: return "isotropic";
    case DK_UNIAXIAL: return "uniaxial";
    case DK_BIAXIAL: return "biaxial";
    }
    return "unknown";
}

double
dk_crystal_expansion_factor(const dk_crystal *c, int axis, double temp_c)
{
    if (!c->has_expansion || axis < 0 || axis > 2 ||
        !c->expansion[axis].present)
        return 1.0;
    double dt = temp_c - c->expansion_reference_c;
    return 1.0 + c->expansion[axis].alpha_per_c * dt +
           c->expansion[axis].beta_per_c2 * dt * dt;
}

const char *
dk_crystal_caution_at(const dk_crystal *c, double temp_c)
{
    for (int i = 0; i < c->ncaution_ranges; i++) {
        const dk_caution_range *r = &c->caution_ranges[i];
        if (r->below ? temp_c < r->temp_c : temp_c > r->temp_c)
            return r->text;
    }
    return NULL;
}

const char *
dk_crystal_caution_wavelength(const dk_crystal *c, double lambda_um)
{
    for (int i = 0; i < c->nwavelength_cautions; i++) {
        const dk_wavelength_caution *w = &c->wavelength_cautions[i];
        if (w->below ? lambda_um < w->lambda_um : lambda_um > w->lambda_um)
            return w->text;
    }
    return NULL;
}

const dk_dispersion_set *
dk_crystal_default_set(const dk_crystal *c, dk_set_use use,
                       const char **reason)
{
    int u = use == DK_USE_QPM ? 1 : 0;
    int i = c->default_set[u];
    if (i < 0 || i >= c->nsets)
        i = 0;
    if (reason)
        *reason = c->default_reason[u] ? c->default_reason[u]
                                       : "first set in the file";
    return &c->sets[i];
}

/*
 * crystal.h - a crystal of the database and the database itself.
 *
 * A crystal is read from one YAML file (schema: crystals/README.md) by
 * the only module that calls libyaml (src/data/crystal_load.c). All strings
 * and arrays of a crystal live in one arena freed by dk_crystal_free().
 */
#ifndef DK_CRYSTAL_H
#define DK_CRYSTAL_H

#include "deltak/dispersion.h"
#include "deltak/status.h"

typedef enum dk_optical_class {
    DK_ISOTROPIC,
    DK_UNIAXIAL,
    DK_BIAXIAL
} dk_optical_class;

typedef enum dk_poling {
    DK_POLING_NONE,
    DK_POLING_PERIODIC,      /* ferroelectric domain inversion */
    DK_POLING_ORIENTATION    /* orientation-patterned growth */
} dk_poling;

/* A caution that applies below or above a temperature. */
typedef struct dk_caution_range {
    int below;            /* 1: applies below temp_c; 0: above */
    double temp_c;
    const char *text;
} dk_caution_range;

/* A caution that applies when a wave is below (or above) a wavelength,
 * e.g. two-photon absorption. */
typedef struct dk_wavelength_caution {
    int below;            /* 1: applies below lambda_um; 0: above */
    double lambda_um;
    const char *text;
} dk_wavelength_caution;

/* What a default data set is for: birefringent angles (and everything
 * else) or quasi-phase matching (poling periods). */
typedef enum dk_set_use {
    DK_USE_ANGLE,
    DK_USE_QPM
} dk_set_use;

/* Thermal expansion of one axis: L(T) = L_ref [1 + α ΔT + β ΔT²]. */
typedef struct dk_expansion_axis {
    int present;
    double alpha_per_c;
    double beta_per_c2;
} dk_expansion_axis;

#define DK_D_MAX 18   /* independent d_il elements a file may give */

typedef struct dk_crystal {
    const char *id;                 /* canonical name, e.g. "MgO:LiNbO3" */
    const char *name;               /* long name */
    const char *path;               /* the file it came from */
    int naliases;
    const char **aliases;
    dk_optical_class optical_class;
    const char *point_group;
    const char *frame;
    double transparency_um[2];
    const char *transparency_source;
    dk_poling poling;
    int polar_axis;                 /* 0, 1, 2 = X, Y, Z; -1 if none */
    int grating_axis;               /* 0, 1, 2 = X, Y, Z; -1 if none */
    int ncautions;
    const char **cautions;
    int ncaution_ranges;
    dk_caution_range *caution_ranges;
    int nwavelength_cautions;
    dk_wavelength_caution *wavelength_cautions;
    int has_damage;
    double damage_gw_per_cm2;
    const char *damage_pulse;
    const char *damage_source;

    int nsets;
    dk_dispersion_set *sets;        /* sets[0] is the default */
    int default_set[2];             /* index into sets per dk_set_use */
    const char *default_reason[2];  /* the file's reason, or NULL */

    int has_expansion;
    const char *expansion_citation;
    double expansion_reference_c;
    dk_expansion_axis expansion[3]; /* X, Y, Z */

    int has_nonlinear;
    const char *nl_citation;
    const char *nl_convention;
    double nl_wavelength_um;
    int nl_from_memory;
    int nd;                         /* elements as given in the file */
    char d_names[DK_D_MAX][4];      /* e.g. "d33" */
    double d_values[DK_D_MAX];      /* pm/V */

    void *arena;                    /* owns everything above */
} dk_crystal;

/* The loaded database: every crystal that loaded, and why others did not. */
typedef struct dk_db {
    int ncrystals;
    dk_crystal **crystals;          /* sorted by id */
    int nerrors;
    char **errors;                  /* one message per file that failed */
    int nnotices;
    char **notices;                 /* one message per name that two files
                                       of a search path share: which wins
                                       (dk_db_load_path, dk_db_add_file) */
} dk_db;

/*
 * dk_crystal_load:
 * @path: a crystal YAML file
 * @out: on success a new crystal, to be freed with dk_crystal_free()
 *
 * Returns: DK_OK; DK_EIO if the file cannot be read or is not a regular
 * file (or a link to one); DK_EPARSE with "cannot load 'PATH': line L,
 * column C: ..." for any schema error (missing field, wrong type, unknown
 * key or formula, duplicate key, non-finite number, control characters
 * in a text, not a crystal file) and for a file beyond the loader's limits
 * (256 kB, 32 levels of nesting, 20000 nodes, 32 aliases, no YAML
 * aliases (*name): see src/data/crystal_load.h); DK_EINVAL for an empty @path; DK_ENOMEM.
 * Messages never quote the content of a file that is not a crystal file,
 * and escape control characters in what they quote. On error *out is
 * unchanged.
 */
dk_status dk_crystal_load(const char *path, dk_crystal **out, dk_error *err);

/* Free @c and everything it owns; NULL does nothing. */
void dk_crystal_free(dk_crystal *c);

/*
 * dk_db_load:
 * @dir: a folder of *.yaml crystal files
 * @out: the database, to be freed with dk_db_free()
 *
 * A file that fails to load is recorded in (*out)->errors and skipped;
 * two files claiming the same name or alias are an error of the later one.
 * Files are read in name order; hidden files are skipped; at most
 * DK_DB_MAX_FILES files are read (the rest is one error in the list).
 * An empty folder gives an empty database.
 *
 * Returns: DK_OK (even with skipped files); DK_EIO if @dir cannot be read;
 * DK_ENOMEM.
 */
dk_status dk_db_load(const char *dir, dk_db **out, dk_error *err);

/* The most crystal files dk_db_load() reads from one folder. */
#define DK_DB_MAX_FILES 256

/*
 * dk_db_load_for:
 * @dir: a folder of *.yaml crystal files
 * @name: the crystal wanted (id or alias, case-insensitive); NULL: all
 * @out: the database, to be freed with dk_db_free()
 *
 * As dk_db_load(), but when the files' top-level `id:` and `aliases:`
 * lines show which single file answers to @name, only that file is
 * parsed and *out holds that one crystal (a command that names its
 * crystal starts in well under a millisecond instead of parsing the whole
 * folder). In every other case - the name unknown or claimed twice, a file
 * whose names are not written in the plain forms, more files than
 * DK_DB_MAX_FILES, the file failing to load - the whole folder is loaded
 * exactly as by dk_db_load(). Files that are not read are not reported in
 * (*out)->errors.
 *
 * Returns: as dk_db_load().
 */
dk_status dk_db_load_for(const char *dir, const char *name, dk_db **out,
                         dk_error *err);

/*
 * dk_db_load_names:
 * As dk_db_load_for() for @n names (ids or aliases; two names of one
 * crystal load it once): when the scan tells the file of every name,
 * only those files are parsed, in the order of @names; in every other
 * case (@n = 0 included) the whole folder is loaded as by dk_db_load().
 */
dk_status dk_db_load_names(const char *dir, const char *const *names, int n,
                           dk_db **out, dk_error *err);

/* Free @db and its crystals; NULL does nothing. */
void dk_db_free(dk_db *db);

/*
 * dk_db_shipped_dir:
 *
 * The folder of the crystal database that ships with this build of the
 * library, compiled in: the source tree's crystals/ for a build in the
 * tree, PREFIX/share/deltak/crystals for an installed one (`make
 * install PREFIX=...`).
 *
 * Returns: the folder, never NULL (it may not exist).
 */
const char *dk_db_shipped_dir(void);

/*
 * dk_db_load_path:
 * @paths: a search path, highest precedence first: folders of *.yaml
 *   crystal files (read as dk_db_load() does) and single crystal files;
 *   NULL and empty entries are skipped
 * @n: the number of entries in @paths
 * @out: the database, to be freed with dk_db_free()
 *
 * Loads every entry and merges them so that each name (id or alias)
 * belongs to one crystal: a crystal from an earlier entry wins.
 * A later crystal whose id is a name of an earlier one is left out; a
 * later crystal that only shares an alias keeps its other names and
 * loses that alias. Each such case adds a line to (*out)->notices
 * naming both files and which is used; a file with the same bytes as
 * the one that wins (the same file listed twice, an unchanged copy) is
 * left out silently. An entry that cannot be read, and every file that
 * fails to load, is a line in (*out)->errors, and is skipped.
 *
 * Typical use: the user's folders first, then dk_db_shipped_dir(), so
 * that a user's own files add to the shipped database and replace a
 * shipped crystal of the same name.
 *
 * Returns: DK_OK (even with skipped entries or files); DK_EINVAL when
 * @n is 0 or every entry is empty; DK_EIO when no entry could be read
 * (the message names the first); DK_ENOMEM.
 */
dk_status dk_db_load_path(const char *const *paths, size_t n, dk_db **out,
                          dk_error *err);

/*
 * dk_db_add_file:
 * @db: a loaded database
 * @path: one crystal file
 * @added: if not NULL, gets the crystal read from @path
 *
 * Adds the crystal of @path with precedence over every crystal in @db:
 * a crystal of @db with the same id (or whose id is one of the new
 * crystal's names) is removed, one that only shares an alias loses that
 * alias; each case adds a line to db->notices, as in dk_db_load_path().
 * Pointers to removed crystals become invalid.
 *
 * Returns: DK_OK; the status of dk_crystal_load() (DK_EIO, DK_EPARSE,
 * DK_EINVAL, DK_ENOMEM) with its message, @db unchanged; DK_ENOMEM
 * part-way through the merge, @db valid but perhaps without crystals
 * the new one would have replaced.
 */
dk_status dk_db_add_file(dk_db *db, const char *path,
                         const dk_crystal **added, dk_error *err);

/*
 * dk_db_find:
 * @name: an id or alias, matched case-insensitively
 *
 * Returns: the crystal, or NULL.
 */
const dk_crystal *dk_db_find(const dk_db *db, const char *name);

/* 1 when @c answers to @name: its id or one of its aliases, letter case
 * ignored; else 0. */
int dk_crystal_answers_to(const dk_crystal *c, const char *name);

/*
 * dk_crystal_find_set:
 * @name: a set name, matched case-insensitively; NULL for the default
 *
 * Returns: the set or NULL.
 */
const dk_dispersion_set *dk_crystal_find_set(const dk_crystal *c,
                                             const char *name);

/* The labels of the principal axes of @c's class: "oe", "XYZ" or "n". */
const char *dk_crystal_axis_labels(const dk_crystal *c);

/* "isotropic", "uniaxial" or "biaxial". */
const char *dk_optical_class_str(dk_optical_class k);

/*
 * dk_crystal_expansion_factor:
 * @axis: 0, 1, 2 = X, Y, Z
 * Returns: L(T)/L(T_ref) along @axis; 1 when the file gives none.
 */
double dk_crystal_expansion_factor(const dk_crystal *c, int axis,
                                   double temp_c);

/*
 * dk_crystal_caution_at:
 * Returns: the text of the first caution range of @c that applies at
 * @temp_c (e.g. photorefractive damage below 100 C), or NULL.
 */
const char *dk_crystal_caution_at(const dk_crystal *c, double temp_c);

/*
 * dk_crystal_caution_wavelength:
 * @lambda_um: vacuum wavelength of one wave, µm
 *
 * Returns: the text of the first wavelength caution of @c that applies at
 * @lambda_um (e.g. two-photon absorption below a stated wavelength), or
 * NULL. A caution "below L" applies for λ < L, "above L" for λ > L.
 * Call it once per wave of a process.
 */
const char *dk_crystal_caution_wavelength(const dk_crystal *c,
                                          double lambda_um);

/*
 * dk_crystal_default_set:
 * @use: DK_USE_ANGLE (birefringent angles and everything that is not a
 *       poling period) or DK_USE_QPM (quasi-phase matching)
 * @reason: if not NULL, gets a one-line reason, never NULL: the reason the
 *       crystal file states (`default_sets` in crystals/README.md), or
 *       "first set in the file"
 *
 * The set to use by default for @use. The default for angles is always
 * sets[0] (the loader insists); the default for QPM may differ (e.g. KTP,
 * where the set fitted to poled-crystal data gives the periods in use).
 * A crystal file without `default_sets` gets sets[0] for both.
 *
 * Returns: the set, never NULL for a loaded crystal.
 */
const dk_dispersion_set *dk_crystal_default_set(const dk_crystal *c,
                                                dk_set_use use,
                                                const char **reason);

#endif /* DK_CRYSTAL_H */

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
    int has_damage;
    double damage_gw_per_cm2;
    const char *damage_pulse;
    const char *damage_source;

    int nsets;
    dk_dispersion_set *sets;        /* sets[0] is the default */

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

/* Free @db and its crystals; NULL does nothing. */
void dk_db_free(dk_db *db);

/*
 * dk_db_find:
 * @name: an id or alias, matched case-insensitively
 *
 * Returns: the crystal, or NULL.
 */
const dk_crystal *dk_db_find(const dk_db *db, const char *name);

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

#endif /* DK_CRYSTAL_H */

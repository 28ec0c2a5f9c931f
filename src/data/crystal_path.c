/*
 * crystal_path.c - a crystal search path: several folders and files
 * merged into one database, earlier entries first (deltak/crystal.h,
 * dk_db_load_path and dk_db_add_file).
 *
 * Method: each entry is loaded on its own (a folder with dk_db_load(),
 * which keeps its rules for clashes inside one folder; a file with
 * dk_crystal_load()). Crystals are then taken in order of precedence
 * and every name (id or alias, case-insensitive) is given to the first
 * crystal that claims it: a later crystal whose id is taken is left
 * out, one that only shares an alias loses the alias. That a user's own
 * file wins over the shipped one of the same name follows the usual
 * rule of search paths (the shell's PATH: the first match is used;
 * common practice). Every such decision is written to db->notices,
 * except where both files hold the same bytes (nothing differs).
 */
#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>

#include "data/crystal_load.h"
#include "deltak/crystal.h"
#include "deltak/text.h"

/* More entries than this in one search path are refused (each may be a
 * folder of DK_DB_MAX_FILES files; the name check is quadratic). */
#define PATH_MAX_ENTRIES 32

/* Append a formatted line to @list; -1 when out of memory. */
static int
add_line(char ***list, int *n, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

static int
add_line(char ***list, int *n, const char *fmt, ...)
{
    char msg[DK_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(msg, sizeof msg, fmt, ap);
    va_end(ap);
    char **grown = realloc(*list, sizeof(char *) * (size_t)(*n + 1));
    if (!grown)
        return -1;
    *list = grown;
    if (!(grown[*n] = strdup(msg)))
        return -1;
    (*n)++;
    return 0;
}

static int
push_crystal(dk_db *db, dk_crystal *c)
{
    dk_crystal **grown =
        realloc(db->crystals, sizeof(dk_crystal *) * (size_t)(db->ncrystals + 2));
    if (!grown)
        return -1;
    db->crystals = grown;
    db->crystals[db->ncrystals++] = c;
    db->crystals[db->ncrystals] = NULL;
    return 0;
}

static void
remove_alias(dk_crystal *c, int i)
{
    memmove(&c->aliases[i], &c->aliases[i + 1],
            sizeof(const char *) * (size_t)(c->naliases - i - 1));
    c->naliases--;
}

/* 1 when the files @a and @b hold the same bytes (a file listed twice,
 * or an unchanged copy of it). Files beyond the loader's limit, or that
 * cannot be read, count as different. */
static int
same_bytes(const char *a, const char *b)
{
    struct stat sa, sb;
    if (stat(a, &sa) || stat(b, &sb))
        return 0;
    if (sa.st_dev == sb.st_dev && sa.st_ino == sb.st_ino)
        return 1;
    if (sa.st_size != sb.st_size || sa.st_size > DK_CRYSTAL_MAX_BYTES)
        return 0;
    FILE *fa = fopen(a, "rb"), *fb = fopen(b, "rb");
    int same = fa && fb;
    char ba[4096], bb[4096];
    while (same) {
        size_t na = fread(ba, 1, sizeof ba, fa);
        size_t nb = fread(bb, 1, sizeof bb, fb);
        if (na != nb || memcmp(ba, bb, na) != 0)
            same = 0;
        else if (na < sizeof ba)
            break;
    }
    if (same && (ferror(fa) || ferror(fb)))
        same = 0;
    if (fa)
        fclose(fa);
    if (fb)
        fclose(fb);
    return same;
}

static int
by_id(const void *a, const void *b)
{
    const dk_crystal *x = *(dk_crystal *const *)a;
    const dk_crystal *y = *(dk_crystal *const *)b;
    return strcasecmp(x->id, y->id);
}

/*
 * Give @c the names that @db has not given away, or leave it out; @db's
 * crystals come first. Takes @c (added or freed). -1 when out of memory.
 */
static int
merge_later(dk_db *db, dk_crystal *c)
{
    char p1[160], p2[160];
    for (int i = 0; i < db->ncrystals; i++) {
        const dk_crystal *h = db->crystals[i];
        if (!dk_crystal_answers_to(h, c->id))
            continue;
        int rc = 0;
        if (!same_bytes(h->path, c->path))
            rc = add_line(&db->notices, &db->nnotices,
                          "'%s' from '%s' is used, not '%s' from '%s' "
                          "(both are named '%s'; the earlier entry of the "
                          "crystal search path wins)",
                          h->id, dk_text_escape(h->path, p1, sizeof p1),
                          c->id, dk_text_escape(c->path, p2, sizeof p2),
                          c->id);
        dk_crystal_free(c);
        return rc;
    }
    for (int j = c->naliases - 1; j >= 0; j--)
        for (int i = 0; i < db->ncrystals; i++) {
            const dk_crystal *h = db->crystals[i];
            if (!dk_crystal_answers_to(h, c->aliases[j]))
                continue;
            if (add_line(&db->notices, &db->nnotices,
                         "the name '%s' means '%s' from '%s', not '%s' "
                         "from '%s' (the earlier entry of the crystal "
                         "search path wins)",
                         c->aliases[j], h->id,
                         dk_text_escape(h->path, p1, sizeof p1), c->id,
                         dk_text_escape(c->path, p2, sizeof p2))) {
                dk_crystal_free(c);
                return -1;
            }
            remove_alias(c, j);
            break;
        }
    if (push_crystal(db, c)) {
        dk_crystal_free(c);
        return -1;
    }
    return 0;
}

/* Load one entry into @part (a new database). Returns DK_OK, DK_EIO
 * (the entry cannot be read: message in @err) or DK_ENOMEM. */
static dk_status
load_entry(const char *entry, dk_db **part, dk_error *err)
{
    char shown[200];
    struct stat st;
    if (stat(entry, &st) != 0)
        return dk_error_set(err, DK_EIO,
                            "cannot read '%s' in the crystal search path: "
                            "%s",
                            dk_text_escape(entry, shown, sizeof shown),
                            strerror(errno));
    if (S_ISDIR(st.st_mode))
        return dk_db_load(entry, part, err);
    dk_db *db = calloc(1, sizeof *db);
    if (!db || !(db->crystals = calloc(2, sizeof(dk_crystal *)))) {
        free(db);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    dk_crystal *c = NULL;
    dk_error e1 = {0};
    dk_status s = dk_crystal_load(entry, &c, &e1);
    if (s == DK_ENOMEM || (s && add_line(&db->errors, &db->nerrors, "%s",
                                         e1.msg))) {
        dk_db_free(db);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    if (s == DK_EIO) {
        dk_db_free(db);
        *err = e1;
        return DK_EIO;
    }
    if (!s)
        db->crystals[db->ncrystals++] = c;
    *part = db;
    return DK_OK;
}

dk_status
dk_db_load_path(const char *const *paths, size_t n, dk_db **out,
                dk_error *err)
{
    dk_db *db = calloc(1, sizeof *db);
    if (!db || !(db->crystals = calloc(1, sizeof(dk_crystal *)))) {
        free(db);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    size_t used = 0, readable = 0;
    dk_error first = {0};
    for (size_t k = 0; k < n; k++) {
        const char *entry = paths ? paths[k] : NULL;
        if (!entry || !*entry)
            continue;
        if (++used > PATH_MAX_ENTRIES) {
            if (add_line(&db->errors, &db->nerrors,
                         "the crystal search path has more than %d "
                         "entries: only the first %d were read",
                         PATH_MAX_ENTRIES, PATH_MAX_ENTRIES))
                goto oom;
            break;
        }
        dk_db *part = NULL;
        dk_error e1 = {0};
        dk_status s = load_entry(entry, &part, &e1);
        if (s == DK_ENOMEM)
            goto oom;
        if (s) {
            if (!first.status)
                first = e1;
            if (add_line(&db->errors, &db->nerrors, "%s", e1.msg))
                goto oom;
            continue;
        }
        readable++;
        for (int i = 0; i < part->nerrors; i++)
            if (add_line(&db->errors, &db->nerrors, "%s", part->errors[i])) {
                dk_db_free(part);
                goto oom;
            }
        /* The crystals move to @db one by one (merge_later owns each). */
        int failed = 0;
        for (int i = 0; i < part->ncrystals; i++) {
            dk_crystal *c = part->crystals[i];
            part->crystals[i] = NULL;
            if (!failed && merge_later(db, c))
                failed = 1;
            else if (failed)
                dk_crystal_free(c);
        }
        part->ncrystals = 0;
        dk_db_free(part);
        if (failed)
            goto oom;
    }
    if (!used) {
        dk_db_free(db);
        return dk_error_set(err, DK_EINVAL,
                            "the crystal search path is empty: give at "
                            "least one folder or crystal file");
    }
    if (!readable) {
        dk_db_free(db);
        *err = first;
        return first.status;
    }
    if (db->ncrystals > 1)
        qsort(db->crystals, (size_t)db->ncrystals, sizeof(dk_crystal *),
              by_id);
    *out = db;
    return DK_OK;
oom:
    dk_db_free(db);
    return dk_error_set(err, DK_ENOMEM, "out of memory");
}

dk_status
dk_db_add_file(dk_db *db, const char *path, const dk_crystal **added,
               dk_error *err)
{
    dk_crystal *c = NULL;
    dk_status s = dk_crystal_load(path, &c, err);
    if (s)
        return s;
    /* Room first, so that nothing changes when memory runs out. */
    dk_crystal **grown =
        realloc(db->crystals, sizeof(dk_crystal *) * (size_t)(db->ncrystals + 2));
    if (!grown) {
        dk_crystal_free(c);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    db->crystals = grown;
    char p1[160], p2[160];
    for (int i = db->ncrystals - 1; i >= 0; i--) {
        dk_crystal *h = db->crystals[i];
        if (dk_crystal_answers_to(c, h->id)) {
            if (!same_bytes(c->path, h->path) &&
                add_line(&db->notices, &db->nnotices,
                         "'%s' from '%s' is used, not '%s' from '%s' "
                         "(both are named '%s'; the file added last wins)",
                         c->id, dk_text_escape(c->path, p1, sizeof p1),
                         h->id, dk_text_escape(h->path, p2, sizeof p2),
                         h->id))
                goto oom;
            dk_crystal_free(h);
            memmove(&db->crystals[i], &db->crystals[i + 1],
                    sizeof(dk_crystal *) * (size_t)(db->ncrystals - i - 1));
            db->ncrystals--;
            continue;
        }
        for (int j = h->naliases - 1; j >= 0; j--) {
            if (!dk_crystal_answers_to(c, h->aliases[j]))
                continue;
            if (add_line(&db->notices, &db->nnotices,
                         "the name '%s' means '%s' from '%s', not '%s' "
                         "from '%s' (the file added last wins)",
                         h->aliases[j], c->id,
                         dk_text_escape(c->path, p1, sizeof p1), h->id,
                         dk_text_escape(h->path, p2, sizeof p2)))
                goto oom;
            remove_alias(h, j);
        }
    }
    db->crystals[db->ncrystals++] = c;
    db->crystals[db->ncrystals] = NULL;
    if (db->ncrystals > 1)
        qsort(db->crystals, (size_t)db->ncrystals, sizeof(dk_crystal *),
              by_id);
    if (added)
        *added = c;
    return DK_OK;
oom:
    /* Crystals removed so far stay removed; the database stays valid. */
    dk_crystal_free(c);
    return dk_error_set(err, DK_ENOMEM, "out of memory");
}

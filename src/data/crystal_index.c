/*
 * crystal_index.c - load only the crystals a command names (see
 * dk_db_load_for and dk_db_load_names in deltak/crystal.h).
 *
 * Parsing every crystal file with libyaml costs far more than a command's
 * computation, and a command needs one crystal (a few to compare). Each
 * file's names are read from its top-level `id:` and `aliases: [...]`
 * lines by a plain text scan (no YAML parsing); only the files answering
 * to the names are then loaded with dk_crystal_load(). Whenever the scan is not conclusive - a file
 * whose names are written in another form, or that is not a regular
 * file, a name claimed by two files, no file answering, more files than
 * dk_db_load() reads, the chosen file failing to load or naming itself
 * otherwise than the scan read - the whole folder is loaded as by
 * dk_db_load(), so the answer (and any error) is exactly the same.
 */
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>

#include "deltak/crystal.h"

#define MAX_FILES DK_DB_MAX_FILES
#define MAX_NAMES 24      /* names one file may give in its quick scan */
#define NAME_LEN 64
#define MAX_FILE (1 << 20)

typedef struct quick {
    char file[256];
    int n;                             /* names read; 0: not conclusive */
    char names[MAX_NAMES][NAME_LEN];
} quick;

/* Trim blanks; drop a trailing " # comment". */
static char *
trim(char *s, char *end)
{
    while (s < end && (*s == ' ' || *s == '\t'))
        s++;
    for (char *h = s; h < end; h++)
        if (*h == '#' && (h == s || h[-1] == ' ' || h[-1] == '\t')) {
            end = h;
            break;
        }
    while (end > s && (end[-1] == ' ' || end[-1] == '\t' || end[-1] == '\r'))
        end--;
    *end = '\0';
    return s;
}

/* A plain or simply quoted scalar into @out; 0 when it is of another
 * form (escapes, anchors, flow collections, empty). */
static int
scalar(const char *s, char *out)
{
    size_t n = strlen(s);
    if (n == 0 || n >= NAME_LEN)
        return 0;
    if (s[0] == '"' || s[0] == '\'') {
        if (n < 3 || s[n - 1] != s[0] || strchr(s, '\\'))
            return 0;
        memcpy(out, s + 1, n - 2);
        out[n - 2] = '\0';
        return memchr(out, s[0], n - 2) == NULL;
    }
    if (strpbrk(s, "[]{}&*!|>\"'`%@,") || s[0] == '-' || s[0] == '?')
        return 0;
    memcpy(out, s, n + 1);
    return 1;
}

/* The names of one file from its text; q->n = 0 when not conclusive. */
static void
scan_text(char *text, quick *q)
{
    int have_id = 0, have_aliases = 0;
    q->n = 0;
    for (char *line = text; line && *line;) {
        char *nl = strchr(line, '\n');
        char *end = nl ? nl : line + strlen(line);
        char *next = nl ? nl + 1 : NULL;
        if (!strncmp(line, "id:", 3)) {
            if (have_id || q->n >= MAX_NAMES)
                return;
            char *v = trim(line + 3, end);
            if (!scalar(v, q->names[q->n]))
                return;
            q->n++, have_id = 1;
        } else if (!strncmp(line, "aliases:", 8)) {
            if (have_aliases)
                goto fail;
            char *v = trim(line + 8, end);
            size_t len = strlen(v);
            if (len < 2 || v[0] != '[' || v[len - 1] != ']')
                goto fail;
            v[len - 1] = '\0';
            for (char *item = v + 1; item;) {
                char *comma = strchr(item, ',');
                char *iend = comma ? comma : item + strlen(item);
                char *it = trim(item, iend);
                if (*it) {
                    if (q->n >= MAX_NAMES || !scalar(it, q->names[q->n]))
                        goto fail;
                    q->n++;
                }
                item = comma ? comma + 1 : NULL;
            }
            have_aliases = 1;
        }
        line = next;
    }
    if (have_id)
        return;
fail:
    q->n = 0;
}

static int
scan_file(const char *path, quick *q)
{
    /* Only regular files (or links to them) are read here: anything else
     * (a FIFO would block) is left to dk_db_load(), which reports it. */
    struct stat st;
    q->n = 0;
    if (stat(path, &st) || !S_ISREG(st.st_mode))
        return 0;
    FILE *f = fopen(path, "rb");
    if (!f)
        return 0;
    char *text = malloc(MAX_FILE + 1);
    size_t n = text ? fread(text, 1, MAX_FILE + 1, f) : 0;
    fclose(f);
    if (text && n <= MAX_FILE) {
        text[n] = '\0';
        if (strlen(text) == n)   /* no NUL bytes: a text file */
            scan_text(text, q);
    }
    free(text);
    return q->n > 0;
}

static int
is_yaml(const char *name)
{
    size_t n = strlen(name);
    return name[0] != '.' && n > 5 && strcmp(name + n - 5, ".yaml") == 0;
}

static int
by_file(const void *a, const void *b)
{
    return strcmp(((const quick *)a)->file, ((const quick *)b)->file);
}

static int
answers(const quick *q, const char *name)
{
    for (int i = 0; i < q->n; i++)
        if (strcasecmp(q->names[i], name) == 0)
            return 1;
    return 0;
}

/* The loaded crystal has exactly the names the scan read. */
static int
same_names(const dk_crystal *c, const quick *q)
{
    if (q->n != 1 + c->naliases || strcmp(q->names[0], c->id) != 0)
        return 0;
    for (int i = 0; i < c->naliases; i++)
        if (strcmp(q->names[1 + i], c->aliases[i]) != 0)
            return 0;
    return 1;
}

/* Scan the names of every file of @dir into @qs; -1 when the scan cannot
 * tell the files apart (see the top of this file). */
static int
scan_dir(const char *dir, quick *qs, int *nq)
{
    DIR *d = opendir(dir);
    if (!d)
        return -1;
    struct dirent *e;
    int n = 0, ok = 1;
    while ((e = readdir(d))) {
        if (!is_yaml(e->d_name))
            continue;
        if (n >= MAX_FILES || strlen(e->d_name) >= sizeof qs[0].file) {
            ok = 0;
            break;
        }
        snprintf(qs[n].file, sizeof qs[n].file, "%s", e->d_name);
        n++;
    }
    closedir(d);
    if (!ok)
        return -1;
    qsort(qs, n, sizeof *qs, by_file);
    char path[4096];
    for (int i = 0; i < n; i++) {
        snprintf(path, sizeof path, "%s/%s", dir, qs[i].file);
        if (!scan_file(path, &qs[i]))
            return -1;
    }
    *nq = n;
    /* A name claimed twice makes which file wins a matter for the full
     * load's rules. */
    for (int i = 0; i < n; i++)
        for (int k = 0; k < qs[i].n; k++)
            for (int j = i + 1; j < n; j++)
                if (answers(&qs[j], qs[i].names[k]))
                    return -1;
    return 0;
}

/* The file answering to @name among @nq scanned files, or -1. */
static int
find(const quick *qs, int nq, const char *name)
{
    for (int i = 0; i < nq; i++)
        if (answers(&qs[i], name))
            return i;
    return -1;
}

/* Load the files answering to @names alone into a new database; 0 when
 * the scan is not conclusive for one of them or a file fails to load. */
static dk_db *
load_picked(const char *dir, const char *const *names, int n, quick *qs,
            int nq)
{
    int *files = malloc((size_t)n * sizeof *files);
    dk_db *db = calloc(1, sizeof *db);
    if (db)
        db->crystals = calloc((size_t)n, sizeof *db->crystals);
    int ok = files && db && db->crystals;
    int nf = 0;
    for (int k = 0; ok && k < n; k++) {
        int i = find(qs, nq, names[k]);
        ok = i >= 0;
        int seen = 0;   /* two names of one crystal: loaded once */
        for (int j = 0; j < nf && ok; j++)
            seen |= files[j] == i;
        if (!ok || seen)
            continue;
        char path[4096];
        snprintf(path, sizeof path, "%s/%s", dir, qs[i].file);
        dk_crystal *c = NULL;
        ok = dk_crystal_load(path, &c, NULL) == DK_OK && same_names(c, &qs[i]);
        if (ok)
            db->crystals[db->ncrystals++] = c, files[nf++] = i;
        else
            dk_crystal_free(c);
    }
    free(files);
    if (ok)
        return db;
    dk_db_free(db);
    return NULL;
}

dk_status
dk_db_load_names(const char *dir, const char *const *names, int n,
                 dk_db **out, dk_error *err)
{
    if (!names || n <= 0 || n > MAX_FILES)
        return dk_db_load(dir, out, err);
    quick *qs = malloc(MAX_FILES * sizeof *qs);
    int nq = 0;
    dk_db *db = qs && scan_dir(dir, qs, &nq) == 0
                    ? load_picked(dir, names, n, qs, nq)
                    : NULL;
    free(qs);
    if (db) {
        *out = db;
        return DK_OK;
    }
    return dk_db_load(dir, out, err);
}

dk_status
dk_db_load_for(const char *dir, const char *name, dk_db **out,
               dk_error *err)
{
    return dk_db_load_names(dir, &name, name ? 1 : 0, out, err);
}

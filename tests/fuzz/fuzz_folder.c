/*
 * fuzz_folder.c - libFuzzer target for the crystal-folder loader
 * (dk_db_load): the input is cut into up to 8 files at each line
 * "%%%"; a piece that starts with one of the words below becomes a
 * special entry instead of a file:
 *   !fifo      a FIFO named like a crystal file
 *   !dir       a folder named like a crystal file
 *   !link      a link to the first piece's file
 *   !nowhere   a link to nothing
 *   !hidden    the piece written as a hidden file (.hN.yaml)
 *
 * Promises checked: the load returns DK_OK, every regular file read is
 * either a crystal or one printable error; the crystals are sorted by id
 * and no two answer to the same name; nothing blocks (FIFOs).
 */
#include <dirent.h>
#include <fcntl.h>
#include <strings.h>
#include <sys/stat.h>
#include <unistd.h>

#include "deltak/crystal.h"
#include "fuzz_common.h"

#define MAX_PIECES 8

static char folder[64];

static void
empty_folder(void)
{
    DIR *d = opendir(folder);
    if (!d)
        abort();
    struct dirent *e;
    char path[512];
    while ((e = readdir(d)))
        if (strcmp(e->d_name, ".") && strcmp(e->d_name, "..")) {
            snprintf(path, sizeof path, "%s/%s", folder, e->d_name);
            if (unlink(path) != 0)
                rmdir(path);
        }
    closedir(d);
}

static void
write_piece(const char *path, const uint8_t *p, size_t n)
{
    int fd = open(path, O_WRONLY | O_CREAT | O_TRUNC, 0600);
    if (fd < 0)
        abort();
    while (n > 0) {
        ssize_t w = write(fd, p, n);
        if (w <= 0)
            abort();
        p += w;
        n -= (size_t)w;
    }
    close(fd);
}

static int
starts(const uint8_t *p, size_t n, const char *word)
{
    size_t k = strlen(word);
    return n >= k && memcmp(p, word, k) == 0;
}

int
LLVMFuzzerTestOneInput(const uint8_t *data, size_t size)
{
    if (!folder[0]) {
        strcpy(folder, "/tmp/deltak-fuzz-folder-XXXXXX");
        if (!mkdtemp(folder))
            abort();
    }
    empty_folder();
    int expected = 0; /* entries dk_db_load should account for */
    size_t start = 0;
    char first[512] = "";
    for (int i = 0; i < MAX_PIECES && start <= size; i++) {
        const uint8_t *sep = NULL;
        for (size_t k = start; k + 5 <= size; k++)
            if (memcmp(data + k, "\n%%%\n", 5) == 0) {
                sep = data + k;
                break;
            }
        size_t end = sep ? (size_t)(sep - data) : size;
        const uint8_t *p = data + start;
        size_t n = end - start;
        char path[512];
        snprintf(path, sizeof path, "%s/c%d.yaml", folder, i);
        if (starts(p, n, "!fifo")) {
            if (mkfifo(path, 0600) != 0)
                abort();
        } else if (starts(p, n, "!dir")) {
            if (mkdir(path, 0700) != 0)
                abort();
        } else if (starts(p, n, "!link") && first[0]) {
            if (symlink(first, path) != 0)
                abort();
        } else if (starts(p, n, "!nowhere")) {
            if (symlink("/nonexistent/deltak-fuzz.yaml", path) != 0)
                abort();
        } else if (starts(p, n, "!hidden")) {
            snprintf(path, sizeof path, "%s/.h%d.yaml", folder, i);
            write_piece(path, p, n);
            expected--; /* hidden files are not read */
        } else {
            write_piece(path, p, n);
            if (!first[0])
                snprintf(first, sizeof first, "%s", path);
        }
        expected++;
        if (!sep)
            break;
        start = end + 5;
    }

    dk_db *db = NULL;
    dk_error err = {0};
    FUZZ_REQUIRE(dk_db_load(folder, &db, &err) == DK_OK);
    FUZZ_REQUIRE(db->ncrystals + db->nerrors == expected);
    for (int i = 0; i < db->nerrors; i++) {
        dk_error e = {0};
        snprintf(e.msg, sizeof e.msg, "%s", db->errors[i]);
        FUZZ_REQUIRE(fuzz_message_ok(&e));
    }
    for (int i = 0; i < db->ncrystals; i++) {
        const dk_crystal *c = db->crystals[i];
        FUZZ_REQUIRE(dk_db_find(db, c->id) == c);
        for (int k = 0; k < c->naliases; k++)
            FUZZ_REQUIRE(dk_db_find(db, c->aliases[k]) == c);
        if (i > 0)
            FUZZ_REQUIRE(strcasecmp(db->crystals[i - 1]->id, c->id) <= 0);
    }
    dk_db_free(db);
    return 0;
}

/*
 * safe_write.c - atomic, link-safe output files with cleanup on signals
 * (see deltak/safe_write.h for the rules by kind of target).
 *
 * Method: the target's folder is opened once (O_DIRECTORY) and everything
 * after that is relative to its descriptor (openat, renameat, unlinkat,
 * fstatat), so that a folder renamed or swapped for a link meanwhile
 * cannot redirect the rename or the cleanup. The temporary name carries
 * 64 random bits from getrandom(2) and is created with O_EXCL|O_NOFOLLOW.
 *
 * The signal registry is a fixed table of slots (folder descriptor and
 * temporary name) with a lock-free atomic state per slot: a slot is
 * filled while "claimed" and published as "active" with a release store;
 * the handler only reads active slots and calls only async-signal-safe
 * functions (unlinkat, sigaction, raise: POSIX.1-2017, 2.4.3). Signals
 * are blocked while the temporary file is created and published, so that
 * it cannot exist unregistered.
 *
 * References:
 *   IEEE Std 1003.1-2017 (POSIX): rename() replaces the target atomically
 *   within one file system; 2.4.3 Signal Actions (async-signal-safe list);
 *   open() O_EXCL with O_CREAT fails if the name exists, also as a link.
 *   Linux open(2): O_NOFOLLOW; getrandom(2).
 */
#include <errno.h>
#include <fcntl.h>
#include <limits.h>
#include <signal.h>
#include <stdatomic.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/random.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "deltak/safe_write.h"
#include "deltak/text.h"

#if ATOMIC_INT_LOCK_FREE != 2
#error "the signal registry needs lock-free atomic int"
#endif

#define TEMP_TRIES 16
#define TEMP_BASE_MAX 200   /* bytes of the target's name kept in the temp name */
#define TEMP_NAME_MAX 256

enum { SLOT_FREE, SLOT_CLAIMED, SLOT_ACTIVE };

static struct slot {
    atomic_int state;
    int dirfd;
    char name[TEMP_NAME_MAX];
} slots[DK_SAFE_WRITE_MAX_OPEN];

struct dk_safe_file {
    FILE *fp;
    int direct;        /* device, FIFO or socket written in place */
    int dirfd;         /* folder of the target (atomic mode) */
    int slot;          /* registry slot of the temporary file */
    char *shown;       /* the path as given, escaped, for messages */
    char *base;        /* the target's name inside dirfd */
};

static const int cleanup_signals[] = {SIGINT, SIGTERM, SIGHUP};
#define NSIGNALS (sizeof cleanup_signals / sizeof cleanup_signals[0])

void
dk_safe_write_remove_temporaries(void)
{
    for (int i = 0; i < DK_SAFE_WRITE_MAX_OPEN; i++)
        if (atomic_load_explicit(&slots[i].state, memory_order_acquire) ==
            SLOT_ACTIVE)
            unlinkat(slots[i].dirfd, slots[i].name, 0);
}

static void
on_signal(int sig)
{
    int saved = errno;
    dk_safe_write_remove_temporaries();
    struct sigaction dfl;
    memset(&dfl, 0, sizeof dfl);
    dfl.sa_handler = SIG_DFL;
    sigemptyset(&dfl.sa_mask);
    sigaction(sig, &dfl, NULL);
    /* Blocked while the handler runs: delivered with its default action
     * as soon as the handler returns. */
    raise(sig);
    errno = saved;
}

/* Install on_signal where the program left the default action. */
static void
install_handlers(void)
{
    static atomic_int installed;
    if (atomic_exchange(&installed, 1))
        return;
    for (size_t i = 0; i < NSIGNALS; i++) {
        struct sigaction old;
        if (sigaction(cleanup_signals[i], NULL, &old) != 0 ||
            (old.sa_flags & SA_SIGINFO) || old.sa_handler != SIG_DFL)
            continue;
        struct sigaction sa;
        memset(&sa, 0, sizeof sa);
        sa.sa_handler = on_signal;
        sigemptyset(&sa.sa_mask);
        sigaction(cleanup_signals[i], &sa, NULL);
    }
}

static void
block_signals(sigset_t *old)
{
    sigset_t set;
    sigemptyset(&set);
    for (size_t i = 0; i < NSIGNALS; i++)
        sigaddset(&set, cleanup_signals[i]);
    pthread_sigmask(SIG_BLOCK, &set, old);
}

static int
claim_slot(void)
{
    for (int i = 0; i < DK_SAFE_WRITE_MAX_OPEN; i++) {
        int expected = SLOT_FREE;
        if (atomic_compare_exchange_strong(&slots[i].state, &expected,
                                           SLOT_CLAIMED))
            return i;
    }
    return -1;
}

static void
release_slot(int i)
{
    if (i >= 0)
        atomic_store_explicit(&slots[i].state, SLOT_FREE,
                              memory_order_release);
}

/* 16 random hex digits; from getrandom, else from time and address (the
 * name is still created exclusively, so this only costs retries). */
static void
random_hex(char out[17])
{
    static const char hex[] = "0123456789abcdef";
    uint64_t r = 0;
    if (getrandom(&r, sizeof r, GRND_NONBLOCK) != (ssize_t)sizeof r) {
        struct timespec ts;
        clock_gettime(CLOCK_MONOTONIC, &ts);
        static atomic_uint counter;
        r = ((uint64_t)ts.tv_nsec << 20) ^ (uint64_t)ts.tv_sec ^
            ((uint64_t)getpid() << 40) ^ (uint64_t)(uintptr_t)out ^
            ((uint64_t)atomic_fetch_add(&counter, 1) << 32);
    }
    for (int i = 0; i < 16; i++)
        out[i] = hex[(r >> (4 * i)) & 15];
    out[16] = '\0';
}

static dk_status
io_error(const char *shown, const char *why, dk_error *err)
{
    return dk_error_set(err, DK_EIO, "cannot write '%s': %s", shown, why);
}

static void
free_file(dk_safe_file *f)
{
    free(f->shown);
    free(f->base);
    free(f);
}

/*
 * The descriptor that @path names by number: "/dev/stdout" (1),
 * "/dev/stderr" (2), "/dev/fd/N", "/proc/self/fd/N"; else -1. Opening such
 * a path anew would start at offset 0 of a redirected file (Linux opens
 * the file again rather than sharing the descriptor); writing to a copy of
 * the descriptor continues where the program's output stands.
 */
static int
numbered_stream(const char *path)
{
    if (strcmp(path, "/dev/stdout") == 0)
        return 1;
    if (strcmp(path, "/dev/stderr") == 0)
        return 2;
    const char *num = NULL;
    if (strncmp(path, "/dev/fd/", 8) == 0)
        num = path + 8;
    else if (strncmp(path, "/proc/self/fd/", 14) == 0)
        num = path + 14;
    if (!num || *num < '0' || *num > '9')
        return -1;
    long n = 0;
    for (; *num >= '0' && *num <= '9' && n < INT_MAX / 10; num++)
        n = 10 * n + (*num - '0');
    return *num ? -1 : (int)n;
}

/* Write in place: to a copy of the numbered descriptor @path names, or to
 * the existing non-regular @path. */
static dk_status
open_direct(dk_safe_file *f, const char *path, dk_error *err)
{
    int stream = numbered_stream(path);
    int fd = stream >= 0 ? fcntl(stream, F_DUPFD_CLOEXEC, 3)
                         : open(path, O_WRONLY | O_NOCTTY | O_CLOEXEC);
    if (fd < 0)
        return io_error(f->shown, strerror(errno), err);
    struct stat st;
    if (fstat(fd, &st) != 0 || S_ISDIR(st.st_mode) ||
        (stream < 0 && S_ISREG(st.st_mode))) {
        close(fd);
        return io_error(f->shown, "it changed while being opened", err);
    }
    f->fp = fdopen(fd, "wb");
    if (!f->fp) {
        int e = errno;
        close(fd);
        return io_error(f->shown, strerror(e), err);
    }
    f->direct = 1;
    return DK_OK;
}

/*
 * Create the temporary file beside @target (a path to the file to be
 * replaced, possibly not existing yet); @mode >= 0: permission bits to
 * give it (those of the file it replaces).
 */
static dk_status
open_atomic(dk_safe_file *f, const char *target, int mode, dk_error *err)
{
    const char *slash = strrchr(target, '/');
    const char *base = slash ? slash + 1 : target;
    if (!*base || strcmp(base, ".") == 0 || strcmp(base, "..") == 0)
        return dk_error_set(err, DK_EIO,
                            "cannot write '%s': it names a folder, not a "
                            "file",
                            f->shown);
    char *dir;
    if (!slash)
        dir = strdup(".");
    else if (slash == target)
        dir = strdup("/");
    else
        dir = strndup(target, (size_t)(slash - target));
    f->base = strdup(base);
    if (!dir || !f->base) {
        free(dir);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    f->dirfd = open(dir, O_RDONLY | O_DIRECTORY | O_CLOEXEC);
    int e = errno;
    free(dir);
    if (f->dirfd < 0)
        return io_error(f->shown, strerror(e), err);

    install_handlers();
    f->slot = claim_slot();
    if (f->slot < 0)
        return io_error(f->shown, "too many files open for writing at once",
                        err);
    struct slot *s = &slots[f->slot];
    s->dirfd = f->dirfd;
    int fd = -1;
    sigset_t old;
    block_signals(&old);
    for (int k = 0; k < TEMP_TRIES && fd < 0; k++) {
        char rnd[17];
        random_hex(rnd);
        snprintf(s->name, sizeof s->name, ".%.*s.%s.tmp", TEMP_BASE_MAX,
                 base, rnd);
        fd = openat(f->dirfd, s->name,
                    O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC,
                    0666);
        e = errno;
        if (fd < 0 && e != EEXIST)
            break;
    }
    if (fd >= 0)
        atomic_store_explicit(&s->state, SLOT_ACTIVE, memory_order_release);
    pthread_sigmask(SIG_SETMASK, &old, NULL);
    if (fd < 0)
        return io_error(f->shown, strerror(e), err);
    if (mode >= 0)
        fchmod(fd, (mode_t)mode); /* best effort: the umask'd default else */
    f->fp = fdopen(fd, "wb");
    if (!f->fp) {
        e = errno;
        close(fd);
        return io_error(f->shown, strerror(e), err);
    }
    return DK_OK;
}

/* Undo a partial open: remove the temporary file, close, free. */
static void
discard(dk_safe_file *f)
{
    if (f->fp)
        fclose(f->fp);
    if (f->slot >= 0 &&
        atomic_load(&slots[f->slot].state) == SLOT_ACTIVE)
        unlinkat(f->dirfd, slots[f->slot].name, 0);
    release_slot(f->slot);
    if (f->dirfd >= 0)
        close(f->dirfd);
    free_file(f);
}

dk_status
dk_safe_write_open(const char *path, dk_safe_file **out, dk_error *err)
{
    if (!path || !*path)
        return dk_error_set(err, DK_EINVAL, "no output file named");
    dk_safe_file *f = calloc(1, sizeof *f);
    char shown[200];
    dk_text_escape(path, shown, sizeof shown);
    if (!f || !(f->shown = strdup(shown))) {
        free(f);
        return dk_error_set(err, DK_ENOMEM, "out of memory");
    }
    f->dirfd = -1;
    f->slot = -1;

    dk_status s;
    struct stat lst, st;
    if (numbered_stream(path) >= 0) {
        s = open_direct(f, path, err);
    } else if (lstat(path, &lst) != 0) {
        if (errno != ENOENT)
            s = io_error(f->shown, strerror(errno), err);
        else
            s = open_atomic(f, path, -1, err);
    } else if (S_ISLNK(lst.st_mode)) {
        if (stat(path, &st) != 0)
            s = errno == ENOENT
                    ? dk_error_set(err, DK_EIO,
                                   "cannot write '%s': it is a link to a "
                                   "file that does not exist; remove the "
                                   "link or name another file",
                                   f->shown)
                    : io_error(f->shown, strerror(errno), err);
        else if (S_ISDIR(st.st_mode))
            s = dk_error_set(err, DK_EIO,
                             "cannot write '%s': it is a folder; name a "
                             "file",
                             f->shown);
        else if (!S_ISREG(st.st_mode))
            s = open_direct(f, path, err);
        else {
            char *real = realpath(path, NULL);
            s = real ? open_atomic(f, real, (int)(st.st_mode & 0777), err)
                     : io_error(f->shown, strerror(errno), err);
            free(real);
        }
    } else if (S_ISDIR(lst.st_mode)) {
        s = dk_error_set(err, DK_EIO,
                         "cannot write '%s': it is a folder; name a file",
                         f->shown);
    } else if (!S_ISREG(lst.st_mode)) {
        s = open_direct(f, path, err);
    } else {
        s = open_atomic(f, path, (int)(lst.st_mode & 0777), err);
    }
    if (s) {
        discard(f);
        return s;
    }
    *out = f;
    return DK_OK;
}

FILE *
dk_safe_write_stream(dk_safe_file *f)
{
    return f ? f->fp : NULL;
}

int
dk_safe_write_is_direct(const dk_safe_file *f)
{
    return f && f->direct;
}

dk_status
dk_safe_write_commit(dk_safe_file *f, dk_error *err)
{
    if (!f)
        return dk_error_set(err, DK_EINVAL, "no output file to finish");
    dk_status s = DK_OK;
    int e = 0;
    if (fflush(f->fp) != 0 || ferror(f->fp))
        e = errno ? errno : EIO;
    else if (!f->direct && fsync(fileno(f->fp)) != 0)
        e = errno;
    int closed = fclose(f->fp);
    f->fp = NULL;
    if (!e && closed != 0)
        e = errno;
    if (e)
        s = io_error(f->shown, strerror(e), err);
    if (!s && !f->direct) {
        /* Replace only a regular file (or nothing): if the name now holds
         * a device, FIFO or link, leave it alone. */
        struct stat st;
        if (fstatat(f->dirfd, f->base, &st, AT_SYMLINK_NOFOLLOW) == 0 &&
            !S_ISREG(st.st_mode))
            s = io_error(f->shown, "it was replaced by something that is "
                                   "not a regular file while being written",
                         err);
        else if (renameat(f->dirfd, slots[f->slot].name, f->dirfd,
                          f->base) != 0)
            s = io_error(f->shown, strerror(errno), err);
        else {
            release_slot(f->slot); /* renamed: nothing left to remove */
            f->slot = -1;
            fsync(f->dirfd);       /* durability of the rename; best effort */
        }
    }
    discard(f);
    return s;
}

void
dk_safe_write_abort(dk_safe_file *f)
{
    if (f)
        discard(f);
}

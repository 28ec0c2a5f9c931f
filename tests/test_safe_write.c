/*
 * test_safe_write.c - output files (deltak/safe_write.h) and the figure
 * writer that uses them (dk_plot_write).
 *
 * Rules checked against POSIX.1-2017 behaviour: rename() replaces the
 * directory entry (a link is replaced, not followed), so the old writer
 * turned a link to /dev/null into a regular file; open(O_EXCL) fails on
 * any existing name, links included.
 */
#include <dirent.h>
#include <fcntl.h>
#include <signal.h>
#include <sys/stat.h>
#include <sys/sysmacros.h>
#include <sys/wait.h>
#include <unistd.h>

#include <cairo.h>
#include <pango/pangocairo.h>

#include "testutil.h"

#include "deltak/plot.h"
#include "deltak/safe_write.h"

static char dir[64];

/* Fontconfig keeps its configuration for the life of the process (see
 * tests/test_plot.c for the reasoning). */
const char *__lsan_default_suppressions(void);
__attribute__((used)) const char *
__lsan_default_suppressions(void)
{
    return "leak:libfontconfig.so\n";
}

static int
setup(void **state)
{
    (void)state;
    strcpy(dir, "/tmp/deltak-safe-XXXXXX");
    return mkdtemp(dir) ? 0 : -1;
}

static void
clean(const char *d)
{
    DIR *dd = opendir(d);
    if (!dd)
        return;
    struct dirent *e;
    char path[512];
    while ((e = readdir(dd))) {
        if (!strcmp(e->d_name, ".") || !strcmp(e->d_name, ".."))
            continue;
        snprintf(path, sizeof path, "%s/%s", d, e->d_name);
        struct stat st;
        if (lstat(path, &st) == 0 && S_ISDIR(st.st_mode))
            clean(path);
        else
            unlink(path);
    }
    closedir(dd);
    rmdir(d);
}

static int
teardown(void **state)
{
    (void)state;
    clean(dir);
    pango_cairo_font_map_set_default(NULL);
    cairo_debug_reset_static_data();
    return 0;
}

/* A fresh empty sub-folder of dir for one test. */
static const char *
subdir(const char *name)
{
    static char path[256];
    snprintf(path, sizeof path, "%s/%s", dir, name);
    assert_int_equal(mkdir(path, 0755), 0);
    return path;
}

static const char *
in(const char *folder, const char *name)
{
    static char path[2][512];
    static int k;
    k ^= 1;
    snprintf(path[k], sizeof path[k], "%s/%s", folder, name);
    return path[k];
}

/* Entries of @folder other than . and ..; names of hidden ones counted
 * in *hidden. */
static int
entries(const char *folder, int *hidden)
{
    DIR *d = opendir(folder);
    assert_non_null(d);
    int n = 0, h = 0;
    struct dirent *e;
    while ((e = readdir(d)))
        if (strcmp(e->d_name, ".") && strcmp(e->d_name, "..")) {
            n++;
            h += e->d_name[0] == '.';
        }
    closedir(d);
    if (hidden)
        *hidden = h;
    return n;
}

static void
put_file(const char *path, const char *text, mode_t mode)
{
    int fd = open(path, O_WRONLY | O_CREAT | O_TRUNC, mode);
    assert_true(fd >= 0);
    assert_int_equal(write(fd, text, strlen(text)), (ssize_t)strlen(text));
    close(fd);
    chmod(path, mode);
}

static char *
read_file(const char *path)
{
    static char buf[4096];
    int fd = open(path, O_RDONLY);
    assert_true(fd >= 0);
    ssize_t n = read(fd, buf, sizeof buf - 1);
    close(fd);
    assert_true(n >= 0);
    buf[n] = '\0';
    return buf;
}

/* Write @text to @path through the API; returns the commit status. */
static dk_status
write_text(const char *path, const char *text, dk_error *err)
{
    dk_safe_file *f = NULL;
    dk_status s = dk_safe_write_open(path, &f, err);
    if (s)
        return s;
    fputs(text, dk_safe_write_stream(f));
    return dk_safe_write_commit(f, err);
}

static void
new_and_replaced_files(void **state)
{
    (void)state;
    const char *d = subdir("plain");
    const char *p = in(d, "report.md");
    dk_error err = {0};
    assert_int_equal(write_text(p, "first\n", &err), DK_OK);
    assert_string_equal(read_file(p), "first\n");
    int hidden;
    assert_int_equal(entries(d, &hidden), 1);
    assert_int_equal(hidden, 0);
    /* Replacing keeps the permission bits and swaps the file at once
     * (a new inode: readers of the old one keep a whole old file). */
    chmod(p, 0640);
    struct stat before, after;
    assert_int_equal(stat(p, &before), 0);
    assert_int_equal(write_text(p, "second\n", &err), DK_OK);
    assert_int_equal(stat(p, &after), 0);
    assert_string_equal(read_file(p), "second\n");
    assert_int_equal(after.st_mode & 0777, 0640);
    assert_true(after.st_ino != before.st_ino);
    assert_int_equal(entries(d, NULL), 1);
    /* A relative path works from the current folder. */
    char cwd[512];
    assert_non_null(getcwd(cwd, sizeof cwd));
    assert_int_equal(chdir(d), 0);
    assert_int_equal(write_text("rel.json", "{}\n", &err), DK_OK);
    assert_int_equal(chdir(cwd), 0);
    assert_string_equal(read_file(in(d, "rel.json")), "{}\n");
}

static void
abort_and_failure_leave_the_target(void **state)
{
    (void)state;
    const char *d = subdir("abort");
    const char *p = in(d, "keep.txt");
    put_file(p, "old\n", 0644);
    dk_safe_file *f = NULL;
    dk_error err = {0};
    assert_int_equal(dk_safe_write_open(p, &f, &err), DK_OK);
    assert_false(dk_safe_write_is_direct(f));
    fputs("half of a new", dk_safe_write_stream(f));
    int hidden;
    assert_int_equal(entries(d, &hidden), 2); /* target and temporary */
    assert_int_equal(hidden, 1);
    dk_safe_write_abort(f);
    assert_string_equal(read_file(p), "old\n");
    assert_int_equal(entries(d, NULL), 1);
    dk_safe_write_abort(NULL);
}

static void
temporary_names_are_unpredictable(void **state)
{
    (void)state;
    const char *d = subdir("names");
    const char *p = in(d, "fig.pdf");
    dk_safe_file *f[2];
    dk_error err = {0};
    for (int i = 0; i < 2; i++)
        assert_int_equal(dk_safe_write_open(p, &f[i], &err), DK_OK);
    char names[2][256];
    int k = 0;
    DIR *dd = opendir(d);
    struct dirent *e;
    while ((e = readdir(dd)))
        if (e->d_name[0] == '.' && strcmp(e->d_name, ".") &&
            strcmp(e->d_name, ".."))
            snprintf(names[k++], sizeof names[0], "%s", e->d_name);
    closedir(dd);
    assert_int_equal(k, 2);
    assert_string_not_equal(names[0], names[1]);
    for (int i = 0; i < 2; i++) {
        /* ".fig.pdf." + 16 hex digits + ".tmp" */
        assert_int_equal(strlen(names[i]), strlen(".fig.pdf.") + 16 + 4);
        assert_int_equal(strncmp(names[i], ".fig.pdf.", 9), 0);
        for (int j = 9; j < 25; j++)
            assert_non_null(strchr("0123456789abcdef", names[i][j]));
    }
    for (int i = 0; i < 2; i++)
        dk_safe_write_abort(f[i]);
    assert_int_equal(entries(d, NULL), 0);
}

static void
planted_links_are_not_followed(void **state)
{
    (void)state;
    /* The old figure writer's names were ".<name>.<pid>-<n>.tmp": plant
     * links under all of them, pointing at a file that must survive. */
    const char *d = subdir("planted");
    char victim[512];
    snprintf(victim, sizeof victim, "%s/victim", dir);
    put_file(victim, "precious\n", 0644);
    for (int n = 0; n < 100; n++) {
        char name[64];
        snprintf(name, sizeof name, ".out.png.%ld-%d.tmp", (long)getpid(), n);
        assert_int_equal(symlink(victim, in(d, name)), 0);
    }
    dk_error err = {0};
    assert_int_equal(write_text(in(d, "out.png"), "new\n", &err), DK_OK);
    assert_string_equal(read_file(victim), "precious\n");
    assert_string_equal(read_file(in(d, "out.png")), "new\n");
    unlink(victim);
}

static void
devices_and_fifos_are_written_in_place(void **state)
{
    (void)state;
    const char *d = subdir("devices");
    dk_error err = {0};
    /* A link to /dev/null stays a link; /dev/null stays a device. */
    const char *link = in(d, "null.pdf");
    assert_int_equal(symlink("/dev/null", link), 0);
    dk_safe_file *f = NULL;
    assert_int_equal(dk_safe_write_open(link, &f, &err), DK_OK);
    assert_true(dk_safe_write_is_direct(f));
    fputs("discarded", dk_safe_write_stream(f));
    assert_int_equal(dk_safe_write_commit(f, &err), DK_OK);
    struct stat st;
    assert_int_equal(lstat(link, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    assert_int_equal(stat("/dev/null", &st), 0);
    assert_true(S_ISCHR(st.st_mode));
    assert_int_equal(entries(d, NULL), 1);

    /* A device node of our own (as root only): written, not replaced
     * (or refused where the file system is mounted nodev). */
    const char *node = in(d, "node.svg");
    if (mknod(node, S_IFCHR | 0666, makedev(1, 3)) == 0) {
        dk_status s = write_text(node, "x", &err);
        assert_true(s == DK_OK || s == DK_EIO);
        assert_int_equal(lstat(node, &st), 0);
        assert_true(S_ISCHR(st.st_mode));
        unlink(node);
    }

    /* A FIFO: a reader gets the bytes, the FIFO stays a FIFO. */
    const char *fifo = in(d, "pipe.json");
    assert_int_equal(mkfifo(fifo, 0600), 0);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        int fd = open(fifo, O_RDONLY);
        char buf[64] = {0};
        ssize_t n = 0, r;
        while ((r = read(fd, buf + n, sizeof buf - 1 - (size_t)n)) > 0)
            n += r;
        _exit(strcmp(buf, "{\"through\": \"fifo\"}\n") == 0 ? 0 : 1);
    }
    assert_int_equal(write_text(fifo, "{\"through\": \"fifo\"}\n", &err),
                     DK_OK);
    int status;
    assert_int_equal(waitpid(pid, &status, 0), pid);
    assert_true(WIFEXITED(status) && WEXITSTATUS(status) == 0);
    assert_int_equal(lstat(fifo, &st), 0);
    assert_true(S_ISFIFO(st.st_mode));
    int hidden;
    entries(d, &hidden);
    assert_int_equal(hidden, 0);

    /* A write error on a device is reported at commit: /dev/full. */
    const char *full = in(d, "full.txt");
    assert_int_equal(symlink("/dev/full", full), 0);
    assert_int_equal(dk_safe_write_open(full, &f, &err), DK_OK);
    fputs("no room", dk_safe_write_stream(f));
    assert_int_equal(dk_safe_write_commit(f, &err), DK_EIO);
    assert_non_null(strstr(err.msg, full));
    assert_non_null(strstr(err.msg, "No space left"));
}

static void
standard_output_by_name(void **state)
{
    (void)state;
    /* "--plot /dev/stdout > file": the figure goes where the output
     * stands, between what was printed before and after; the file is
     * neither replaced nor overwritten from its start. */
    const char *d = subdir("stdout");
    const char *out = in(d, "out.txt");
    static const char *const names[] = {"/dev/stdout", "/dev/fd/1",
                                        "/proc/self/fd/1"};
    for (size_t i = 0; i < sizeof names / sizeof names[0]; i++) {
        int fd = open(out, O_WRONLY | O_CREAT | O_TRUNC, 0644);
        assert_true(fd >= 0);
        struct stat before;
        assert_int_equal(fstat(fd, &before), 0);
        pid_t pid = fork();
        assert_true(pid >= 0);
        if (pid == 0) {
            if (dup2(fd, 1) < 0 || write(1, "head\n", 5) != 5)
                _exit(2);
            dk_safe_file *f;
            if (dk_safe_write_open(names[i], &f, NULL) ||
                !dk_safe_write_is_direct(f))
                _exit(3);
            fputs("body\n", dk_safe_write_stream(f));
            if (dk_safe_write_commit(f, NULL))
                _exit(4);
            _exit(write(1, "tail\n", 5) == 5 ? 0 : 5);
        }
        close(fd);
        int status;
        assert_int_equal(waitpid(pid, &status, 0), pid);
        assert_true(WIFEXITED(status));
        assert_int_equal(WEXITSTATUS(status), 0);
        assert_string_equal(read_file(out), "head\nbody\ntail\n");
        struct stat after;
        assert_int_equal(stat(out, &after), 0);
        assert_true(after.st_ino == before.st_ino);
    }
    assert_int_equal(entries(d, NULL), 1);
    /* A descriptor that is not open. */
    dk_safe_file *f = NULL;
    dk_error err = {0};
    assert_int_equal(dk_safe_write_open("/dev/fd/987", &f, &err), DK_EIO);
    assert_non_null(strstr(err.msg, "/dev/fd/987"));
}

static void
links_to_files_and_to_nothing(void **state)
{
    (void)state;
    const char *d = subdir("links");
    dk_error err = {0};
    /* A link to a regular file: the file is replaced, the link stays. */
    const char *real = in(d, "runs-42.pdf");
    put_file(real, "old run\n", 0600);
    const char *link = in(d, "latest.pdf");
    assert_int_equal(symlink("runs-42.pdf", link), 0);
    assert_int_equal(write_text(link, "new run\n", &err), DK_OK);
    struct stat st;
    assert_int_equal(lstat(link, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    assert_string_equal(read_file(real), "new run\n");
    assert_int_equal(stat(real, &st), 0);
    assert_int_equal(st.st_mode & 0777, 0600);
    /* A dangling link is refused: nothing is created where it points. */
    const char *dangling = in(d, "dangling.md");
    assert_int_equal(symlink("/tmp/deltak-nowhere/x.md", dangling), 0);
    assert_int_equal(write_text(dangling, "x", &err), DK_EIO);
    assert_non_null(strstr(err.msg, "link to a file that does not exist"));
    assert_int_equal(lstat(dangling, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    /* A folder, directly or through a link, is refused. */
    assert_int_equal(write_text(d, "x", &err), DK_EIO);
    assert_non_null(strstr(err.msg, "folder"));
    char slash[512];
    snprintf(slash, sizeof slash, "%s/", d);
    assert_int_equal(write_text(slash, "x", &err), DK_EIO);
    const char *dlink = in(d, "to-folder");
    assert_int_equal(symlink(dir, dlink), 0);
    assert_int_equal(write_text(dlink, "x", &err), DK_EIO);
    assert_non_null(strstr(err.msg, "folder"));
    /* No folder, no name. */
    assert_int_equal(write_text(in(d, "no/such/file"), "x", &err), DK_EIO);
    assert_non_null(strstr(err.msg, "no/such/file"));
    dk_safe_file *f = NULL;
    assert_int_equal(dk_safe_write_open("", &f, &err), DK_EINVAL);
    assert_int_equal(dk_safe_write_open(NULL, &f, &err), DK_EINVAL);
    /* Control characters in a path are escaped in the message. */
    assert_int_equal(write_text(in(d, "no\x1b[2J/x"), "x", &err), DK_EIO);
    assert_non_null(strstr(err.msg, "no\\x1b[2J/x"));
}

static void
too_many_open_files(void **state)
{
    (void)state;
    const char *d = subdir("many");
    dk_safe_file *f[DK_SAFE_WRITE_MAX_OPEN + 1];
    dk_error err = {0};
    for (int i = 0; i < DK_SAFE_WRITE_MAX_OPEN; i++)
        assert_int_equal(dk_safe_write_open(in(d, "f"), &f[i], &err), DK_OK);
    assert_int_equal(dk_safe_write_open(in(d, "f"), &f[DK_SAFE_WRITE_MAX_OPEN],
                                        &err),
                     DK_EIO);
    assert_non_null(strstr(err.msg, "too many files"));
    for (int i = 0; i < DK_SAFE_WRITE_MAX_OPEN; i++)
        dk_safe_write_abort(f[i]);
    assert_int_equal(entries(d, NULL), 0);
    /* The slots are free again. */
    assert_int_equal(write_text(in(d, "f"), "ok", &err), DK_OK);
}

/* In a child: open three files in @d, write, then be killed by @sig. */
static void
killed_while_writing(const char *d, int sig)
{
    int ready[2];
    assert_int_equal(pipe(ready), 0);
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        close(ready[0]);
        dk_safe_file *f[3];
        static const char *const names[] = {"a.pdf", "b.md", "c.json"};
        for (int i = 0; i < 3; i++) {
            if (dk_safe_write_open(in(d, names[i]), &f[i], NULL))
                _exit(3);
            fputs("partial", dk_safe_write_stream(f[i]));
            fflush(dk_safe_write_stream(f[i]));
        }
        if (write(ready[1], "r", 1) != 1)
            _exit(4);
        for (;;)
            pause();
    }
    close(ready[1]);
    char c;
    assert_int_equal(read(ready[0], &c, 1), 1);
    close(ready[0]);
    int hidden;
    assert_int_equal(entries(d, &hidden), 3); /* three temporaries */
    assert_int_equal(hidden, 3);
    assert_int_equal(kill(pid, sig), 0);
    int status;
    assert_int_equal(waitpid(pid, &status, 0), pid);
    /* The child ended by the signal itself (default action re-raised)... */
    assert_true(WIFSIGNALED(status));
    assert_int_equal(WTERMSIG(status), sig);
    /* ...and left nothing behind. */
    assert_int_equal(entries(d, NULL), 0);
}

static void
signals_remove_temporaries(void **state)
{
    (void)state;
    killed_while_writing(subdir("sigterm"), SIGTERM);
    killed_while_writing(subdir("sigint"), SIGINT);
    killed_while_writing(subdir("sighup"), SIGHUP);
}

static void
a_program_handler_is_kept(void **state)
{
    (void)state;
    /* Where the program has its own SIGTERM handler, it stays in place
     * and may call dk_safe_write_remove_temporaries() itself. */
    const char *d = subdir("own-handler");
    pid_t pid = fork();
    assert_true(pid >= 0);
    if (pid == 0) {
        signal(SIGTERM, SIG_IGN);
        dk_safe_file *f;
        if (dk_safe_write_open(in(d, "x.png"), &f, NULL))
            _exit(3);
        raise(SIGTERM); /* ignored, as the program asked */
        int hidden;
        if (entries(d, &hidden) != 1)
            _exit(4);
        dk_safe_write_remove_temporaries();
        if (entries(d, NULL) != 0)
            _exit(5);
        /* The file is gone: the commit says so. */
        _exit(dk_safe_write_commit(f, NULL) == DK_EIO ? 0 : 6);
    }
    int status;
    assert_int_equal(waitpid(pid, &status, 0), pid);
    assert_true(WIFEXITED(status));
    assert_int_equal(WEXITSTATUS(status), 0);
    assert_int_equal(entries(d, NULL), 0);
}

static void
figures_use_it(void **state)
{
    (void)state;
    const char *d = subdir("figures");
    dk_plot *p = NULL;
    dk_error err = {0};
    assert_int_equal(dk_plot_new(80, 60, &p, &err), DK_OK);
    double x[] = {1, 2, 3}, y[] = {3, 1, 2};
    assert_int_equal(dk_plot_add_line(p, x, y, 3, "line", &err), DK_OK);
    /* Before: the link was replaced by a regular file. */
    const char *link = in(d, "to-null.png");
    assert_int_equal(symlink("/dev/null", link), 0);
    assert_int_equal(dk_plot_write(p, link, &err), DK_OK);
    struct stat st;
    assert_int_equal(lstat(link, &st), 0);
    assert_true(S_ISLNK(st.st_mode));
    /* A regular file is replaced whole. */
    const char *png = in(d, "fig.png");
    put_file(png, "old", 0644);
    assert_int_equal(dk_plot_write(p, png, &err), DK_OK);
    assert_int_equal(memcmp(read_file(png), "\x89PNG", 4), 0);
    assert_int_equal(entries(d, NULL), 2);
    dk_plot_free(p);
}

int
main(void)
{
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(new_and_replaced_files),
        cmocka_unit_test(abort_and_failure_leave_the_target),
        cmocka_unit_test(temporary_names_are_unpredictable),
        cmocka_unit_test(planted_links_are_not_followed),
        cmocka_unit_test(devices_and_fifos_are_written_in_place),
        cmocka_unit_test(standard_output_by_name),
        cmocka_unit_test(links_to_files_and_to_nothing),
        cmocka_unit_test(too_many_open_files),
        cmocka_unit_test(signals_remove_temporaries),
        cmocka_unit_test(a_program_handler_is_kept),
        cmocka_unit_test(figures_use_it),
    };
    return cmocka_run_group_tests_name("safe_write", tests, setup, teardown);
}

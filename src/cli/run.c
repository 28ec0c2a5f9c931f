/*
 * run.c - `deltak run FILE`: carry out a design file and write a report.
 *
 * A design file is plain text of our own: '#' starts a comment; "title:"
 * and "report:" lines name the design and the report file; every other
 * line is one deltak command without the leading "deltak", with
 * double-quoted arguments allowed. Each command runs as a child process
 * of this program (so one failing step cannot disturb the next); its
 * output, warnings and exit status go into a Markdown report, with the
 * program version, the crystal data sources of every crystal named, and
 * the laser-safety caution. The report is written only when every step
 * succeeded, atomically (temporary file, then rename).
 */
#include <errno.h>
#include <getopt.h>
#include <stdlib.h>
#include <string.h>
#include <sys/wait.h>
#include <unistd.h>

#include "cli.h"
#include "commands.h"

static const char *const run_usage[] = {
    "deltak run <design-file> [--report <file.md>]",
    "",
    "  <design-file>     'title:' and 'report:' lines, then one deltak "
    "command per line",
    "  --report <file>   where to write the report (default: the file's "
    "'report:' line, else stdout)",
    NULL};

#define MAX_STEPS 64
#define MAX_ARGS 64
#define MAX_LINE 2048

typedef struct step {
    int line;
    char text[MAX_LINE];
    char *out, *err;
    size_t nout, nerr;
    int status;
} step;

/* Split @s into words (double quotes group); returns the count or -1. */
static int
split_words(char *s, char *argv[], int max)
{
    int n = 0;
    while (*s) {
        while (*s == ' ' || *s == '\t')
            s++;
        if (!*s)
            break;
        if (n >= max - 1)
            return -1;
        char *w = s, *o = s;
        int quoted = 0;
        while (*s && (quoted || (*s != ' ' && *s != '\t'))) {
            if (*s == '"')
                quoted = !quoted, s++;
            else
                *o++ = *s++;
        }
        if (quoted)
            return -1;
        if (*s)
            s++;
        *o = '\0';
        argv[n++] = w;
    }
    argv[n] = NULL;
    return n;
}

/* Read all of @fd into a malloc'd buffer. */
static char *
drain(int fd, size_t *n)
{
    size_t cap = 4096, len = 0;
    char *buf = malloc(cap);
    ssize_t r;
    while (buf && (r = read(fd, buf + len, cap - len - 1)) != 0) {
        if (r < 0) {
            if (errno == EINTR)
                continue;
            break;
        }
        len += (size_t)r;
        if (cap - len < 1024) {
            char *nb = realloc(buf, cap *= 2);
            if (!nb) {
                free(buf);
                return NULL;
            }
            buf = nb;
        }
    }
    if (buf)
        buf[len] = '\0';
    *n = len;
    return buf;
}

/* Run this program with @args; capture stdout and stderr (stderr merged
 * after stdout; outputs here are small). */
static int
run_child(const char *self, char *args[], step *st)
{
    int po[2], pe[2];
    if (pipe(po) || pipe(pe))
        return -1;
    fflush(NULL);
    pid_t pid = fork();
    if (pid < 0)
        return -1;
    if (pid == 0) {
        dup2(po[1], 1);
        dup2(pe[1], 2);
        close(po[0]), close(po[1]), close(pe[0]), close(pe[1]);
        execv(self, args);
        _exit(127);
    }
    close(po[1]), close(pe[1]);
    st->out = drain(po[0], &st->nout);
    st->err = drain(pe[0], &st->nerr);
    close(po[0]), close(pe[0]);
    int ws;
    if (waitpid(pid, &ws, 0) < 0)
        return -1;
    st->status = WIFEXITED(ws) ? WEXITSTATUS(ws) : 128;
    return 0;
}

static void
write_report(FILE *f, const char *path, const char *title, step *steps,
             int n, const char *self)
{
    fprintf(f, "# %s\n\n", title[0] ? title : "deltak design report");
    fprintf(f, "Design file `%s`, carried out by deltak %s. Every number "
               "below comes from the crystal data sets named in each "
               "step; `deltak crystals NAME` lists their sources.\n\n",
            path, DK_VERSION);
    for (int i = 0; i < n; i++) {
        fprintf(f, "## Step %d\n\n```\ndeltak %s\n```\n\n", i + 1,
                steps[i].text);
        if (steps[i].nout)
            fprintf(f, "```\n%s%s```\n\n", steps[i].out,
                    steps[i].out[steps[i].nout - 1] == '\n' ? "" : "\n");
        if (steps[i].nerr)
            fprintf(f, "Warnings:\n\n```\n%s%s```\n\n", steps[i].err,
                    steps[i].err[steps[i].nerr - 1] == '\n' ? "" : "\n");
    }
    /* The sources of every crystal the steps name. */
    fprintf(f, "## Crystal data\n\n");
    for (int i = 0; i < n; i++) {
        const char *c = strstr(steps[i].text, "--crystal ");
        if (!c)
            continue;
        char name[64];
        if (sscanf(c + 10, "%63s", name) != 1)
            continue;
        int seen = 0;
        for (int j = 0; j < i && !seen; j++) {
            const char *d = strstr(steps[j].text, "--crystal ");
            char other[64];
            seen = d && sscanf(d + 10, "%63s", other) == 1 &&
                   !strcmp(other, name);
        }
        if (seen)
            continue;
        step st = {0};
        char *args[] = {(char *)self, "crystals", name, NULL};
        if (!run_child(self, args, &st) && st.status == 0)
            fprintf(f, "```\n%s```\n\n", st.out);
        free(st.out);
        free(st.err);
    }
    fprintf(f, "## Laser safety\n\nThese designs are for Class 3B/4 lasers; "
               "mid-infrared beams are invisible. Wear eye and skin "
               "protection matched to every wavelength present, dump "
               "residual pump and unused beams, and stay below the "
               "crystals' damage thresholds. Local laser-safety rules (e.g. "
               "IEC 60825-1, ANSI Z136.1) and the site's laser safety "
               "officer take precedence over this report.\n");
}

int
cmd_run(int argc, char **argv)
{
    static const struct option opts[] = {
        {"report", required_argument, NULL, 'r'},
        {"help", no_argument, NULL, 'h'},
        {NULL, 0, NULL, 0}};
    const char *report = NULL;
    int ch;
    optind = 1;
    opterr = 0;
    while ((ch = getopt_long(argc, argv, "+h", opts, NULL)) != -1) {
        if (ch == 'r')
            report = optarg;
        else if (ch == 'h') {
            cli_print_usage(stdout, run_usage);
            return 0;
        } else
            return cli_bad_option(argv, run_usage);
    }
    if (argc - optind != 1)
        return cli_usage_error(run_usage, "give one design file");
    const char *path = argv[optind];
    FILE *in = fopen(path, "r");
    if (!in)
        return cli_error("cannot read design file '%s': %s", path,
                         strerror(errno));
    char self[4096];
    ssize_t sl = readlink("/proc/self/exe", self, sizeof self - 1);
    if (sl <= 0) {
        fclose(in);
        return cli_error("cannot find the deltak program to run the steps");
    }
    self[sl] = '\0';
    static step steps[MAX_STEPS];
    char title[256] = "", report_line[1024] = "", line[MAX_LINE];
    int n = 0, lineno = 0, rc = 0;
    while (fgets(line, sizeof line, in)) {
        lineno++;
        line[strcspn(line, "\r\n")] = '\0';
        char *s = line;
        while (*s == ' ' || *s == '\t')
            s++;
        if (!*s || *s == '#')
            continue;
        if (!strncmp(s, "title:", 6)) {
            snprintf(title, sizeof title, "%s", s + 6 + strspn(s + 6, " "));
            continue;
        }
        if (!strncmp(s, "report:", 7)) {
            snprintf(report_line, sizeof report_line, "%s",
                     s + 7 + strspn(s + 7, " "));
            continue;
        }
        if (n >= MAX_STEPS) {
            fclose(in);
            return cli_error("'%s': more than %d steps", path, MAX_STEPS);
        }
        if (!strncmp(s, "deltak ", 7))
            s += 7;
        if (!strncmp(s, "run", 3) && (s[3] == ' ' || !s[3])) {
            fclose(in);
            return cli_error("'%s', line %d: a design file cannot run "
                             "another one", path, lineno);
        }
        steps[n].line = lineno;
        snprintf(steps[n].text, sizeof steps[n].text, "%s", s);
        n++;
    }
    fclose(in);
    if (n == 0)
        return cli_error("'%s' has no commands to run", path);
    for (int i = 0; i < n && !rc; i++) {
        char buf[MAX_LINE], *args[MAX_ARGS + 1];
        snprintf(buf, sizeof buf, "%s", steps[i].text);
        args[0] = self;
        int na = split_words(buf, args + 1, MAX_ARGS);
        if (na < 1) {
            rc = cli_error("'%s', line %d: cannot split the command (unclosed "
                           "quote or too many words)", path, steps[i].line);
            break;
        }
        if (run_child(self, args, &steps[i]))
            rc = cli_error("cannot run step %d of '%s'", i + 1, path);
        else if (steps[i].status != 0) {
            fprintf(stderr, "%s", steps[i].err ? steps[i].err : "");
            rc = cli_error("'%s', line %d failed (exit %d): deltak %s; no "
                           "report written",
                           path, steps[i].line, steps[i].status,
                           steps[i].text);
        }
    }
    if (!rc) {
        const char *dest = report ? report : report_line[0] ? report_line
                                                             : NULL;
        if (!dest) {
            write_report(stdout, path, title, steps, n, self);
        } else {
            char tmp[4200];
            snprintf(tmp, sizeof tmp, "%s.tmp-%ld", dest, (long)getpid());
            FILE *f = fopen(tmp, "w");
            if (!f)
                rc = cli_error("cannot write report '%s': %s", dest,
                               strerror(errno));
            else {
                write_report(f, path, title, steps, n, self);
                if (fclose(f) || rename(tmp, dest)) {
                    unlink(tmp);
                    rc = cli_error("cannot write report '%s': %s", dest,
                                   strerror(errno));
                } else {
                    printf("ran %d steps of '%s'; report in %s\n", n, path,
                           dest);
                }
            }
        }
    }
    for (int i = 0; i < n; i++) {
        free(steps[i].out);
        free(steps[i].err);
    }
    return rc;
}

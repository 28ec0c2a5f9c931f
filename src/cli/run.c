/*
 * run.c - `deltak run FILE`: carry out a design file and write a report.
 *
 * A design file is plain UTF-8 text of our own: '#' starts a comment;
 * "title:" names the design and "report:" the report file; every other
 * line is one deltak command without the leading "deltak", with
 * double-quoted arguments allowed. The file is read whole first and
 * refused, with the line number, for a NUL byte, a control character, a
 * line longer than RUN_MAX_LINE bytes, more than RUN_MAX_STEPS steps, or
 * a command that is not one of the analysis commands (a design file never
 * runs `run`: the parsed command name is checked, and the environment
 * variable DELTAK_RUN_DEPTH stops nesting by any other route).
 *
 * What a design file may write: only its report (FILE.md and FILE.json)
 * and the figures its steps draw (--plot), and only inside the folder
 * that holds the design file. Their paths are resolved against that
 * folder; absolute paths, ".." and links that point elsewhere are refused.
 * The report says where each file went. (`--report PATH` on the command
 * line is the user's own choice and is taken relative to the current
 * folder.)
 *
 * Each step runs as a child process of this program (execv, no shell),
 * which dies with the runner (PR_SET_PDEATHSIG), so one failing step
 * cannot disturb the next and a killed run leaves no step writing on. The
 * report — Markdown for people, JSON beside it for programs — is written
 * only when every step succeeded, through dk_safe_write (never half a
 * file, never over something that is not a regular file).
 */
#include <errno.h>
#include <fcntl.h>
#include <json-c/json.h>
#include <limits.h>
#include <signal.h>
#include <stdlib.h>
#include <string.h>
#include <sys/prctl.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <unistd.h>

#include "cli.h"
#include "commands.h"
#include "options.h"
#include "deltak/safe_write.h"
#include "deltak/text.h"

static const char *const run_usage[] = {
    "deltak run <design-file> [--report <file.md>] [--check]",
    "",
    "  <design-file>     'title:' and 'report:' lines, then one deltak "
    "command per line",
    "  --check           only read and check the design file; run nothing",
    "  --report <file>   where to write the report (default: the file's "
    "'report:' line, else stdout); a",
    "                    JSON report is written beside it (same name, "
    ".json)",
    "",
    "A design file may write only inside its own folder: its report and "
    "the figures of --plot.",
    NULL};

#define RUN_MAX_STEPS 64
#define RUN_MAX_ARGS 64
#define RUN_MAX_LINE 4096
#define RUN_MAX_FILE (1 << 20)
#define RUN_MAX_DEPTH 1   /* a run inside a run is refused */

/* The commands a design file may use. */
static const char *const allowed[] = {"angle",  "chip",  "crystals",
                                      "gain",   "index", "period",
                                      "pulse",  "sweep", "tolerance"};

typedef struct step {
    int line;
    char text[RUN_MAX_LINE + 1];     /* as written (cleaned) */
    int argc;
    char *argv[RUN_MAX_ARGS + 2];    /* argv[0] is this program */
    char buf[RUN_MAX_LINE + 1];      /* the words of argv */
    char figure[PATH_MAX];           /* resolved --plot path, or "" */
    char *out, *err, *json;
    size_t nout, nerr, njson;
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
        if (n >= max)
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

/* Read all of @fd into a malloc'd, NUL-terminated buffer. */
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

static volatile sig_atomic_t child_pid;

/* SIGINT/SIGTERM while a step runs: end the step too, then die as the
 * signal would have killed us. */
static void
forward_signal(int sig)
{
    if (child_pid > 0)
        kill((pid_t)child_pid, SIGTERM);
    signal(sig, SIG_DFL);
    raise(sig);
}

/* Run this program with @args; capture stdout and stderr. Returns 0 and
 * the exit status in *status, or -1 when it could not be started. */
static int
run_child(const char *self, char *args[], char **out, size_t *nout,
          char **err, size_t *nerr, int *status)
{
    int po[2], pe[2];
    if (pipe(po))
        return -1;
    if (pipe(pe)) {
        close(po[0]), close(po[1]);
        return -1;
    }
    fflush(NULL);
    pid_t parent = getpid();
    pid_t pid = fork();
    if (pid < 0) {
        close(po[0]), close(po[1]), close(pe[0]), close(pe[1]);
        return -1;
    }
    if (pid == 0) {
        /* Die with the runner, however it ends. */
        prctl(PR_SET_PDEATHSIG, SIGTERM);
        if (getppid() != parent)
            _exit(128);
        signal(SIGINT, SIG_DFL);
        signal(SIGTERM, SIG_DFL);
        dup2(po[1], 1);
        dup2(pe[1], 2);
        close(po[0]), close(po[1]), close(pe[0]), close(pe[1]);
        execv(self, args);
        _exit(127);
    }
    child_pid = pid;
    close(po[1]), close(pe[1]);
    /* Outputs are small; stderr after stdout is enough. */
    *out = drain(po[0], nout);
    *err = drain(pe[0], nerr);
    close(po[0]), close(pe[0]);
    int ws;
    while (waitpid(pid, &ws, 0) < 0)
        if (errno != EINTR) {
            child_pid = 0;
            return -1;
        }
    child_pid = 0;
    *status = WIFEXITED(ws) ? WEXITSTATUS(ws) : 128 + WTERMSIG(ws);
    return 0;
}

/* @rel resolved against folder @dir, refusing anything that leaves it.
 * Returns 0, or an exit code after printing. */
static int
inside(const char *dir, const char *rel, const char *file, int line,
       char *out, size_t n)
{
    if (!rel[0] || rel[0] == '/')
        return cli_error("'%s', line %d: '%s' must be a path inside the "
                         "design file's folder (relative, no '..')",
                         file, line, rel);
    for (const char *p = rel; *p; p++)
        if (p[0] == '.' && p[1] == '.' && (p == rel || p[-1] == '/') &&
            (p[2] == '/' || !p[2]))
            return cli_error("'%s', line %d: '%s' leaves the design file's "
                             "folder; a design file writes only inside it",
                             file, line, rel);
    if ((size_t)snprintf(out, n, "%s/%s", dir, rel) >= n)
        return cli_error("'%s', line %d: the path '%s' is too long", file,
                         line, rel);
    struct stat st;
    if (lstat(out, &st) == 0 && !S_ISREG(st.st_mode))
        return cli_error("'%s', line %d: '%s' exists and is not a regular "
                         "file (a link, device or folder); a design file "
                         "writes only regular files",
                         file, line, rel);
    return 0;
}

/* The folder holding @path ("." when none). */
static void
folder_of(const char *path, char *dir, size_t n)
{
    const char *slash = strrchr(path, '/');
    if (!slash)
        snprintf(dir, n, ".");
    else if (slash == path)
        snprintf(dir, n, "/");
    else
        snprintf(dir, n, "%.*s", (int)(slash - path), path);
}

/* Make the folders of @path that are missing, below @base. */
static void
make_parents(const char *base, const char *path)
{
    char tmp[PATH_MAX];
    size_t skip = strlen(base) + 1;
    snprintf(tmp, sizeof tmp, "%s", path);
    for (char *p = tmp + skip; *p; p++)
        if (*p == '/') {
            *p = '\0';
            mkdir(tmp, 0777);
            *p = '/';
        }
}

typedef struct design_file {
    char title[512];
    char report[PATH_MAX];   /* resolved, or "" */
    int nsteps;
    step *steps;
} design_file;

/* Check one command line and split it. Returns 0 or an exit code. */
static int
parse_step(const char *path, const char *dir, int lineno, const char *s,
           const char *self, step *st)
{
    st->line = lineno;
    snprintf(st->text, sizeof st->text, "%s", s);
    snprintf(st->buf, sizeof st->buf, "%s", s);
    st->argv[0] = (char *)self;
    int na = split_words(st->buf, st->argv + 1, RUN_MAX_ARGS);
    if (na < 1)
        return cli_error("'%s', line %d: cannot split the command (an "
                         "unclosed quote, or more than %d words)",
                         path, lineno, RUN_MAX_ARGS);
    if (!strcmp(st->argv[1], "deltak")) {
        memmove(st->argv + 1, st->argv + 2, na * sizeof *st->argv);
        na--;
    }
    if (na < 1)
        return cli_error("'%s', line %d: no command after 'deltak'", path,
                         lineno);
    const char *cmd = st->argv[1];
    size_t i = 0;
    while (i < sizeof allowed / sizeof allowed[0] && strcmp(allowed[i], cmd))
        i++;
    if (i == sizeof allowed / sizeof allowed[0])
        return cli_error("'%s', line %d: '%s' is not a command a design "
                         "file may run (a design file cannot run another "
                         "one; allowed: angle, chip, crystals, gain, index, "
                         "period, pulse, sweep, tolerance)",
                         path, lineno, cmd);
    st->argc = na + 1;
    /* A figure path is resolved against the design file's folder. */
    for (int k = 2; k < st->argc; k++) {
        const char *a = st->argv[k], *val = NULL;
        int joined = 0;
        if (!strcmp(a, "--plot") && k + 1 < st->argc)
            val = st->argv[k + 1];
        else if (!strncmp(a, "--plot=", 7))
            val = a + 7, joined = 1;
        if (!val)
            continue;
        int rc = inside(dir, val, path, lineno, st->figure,
                        sizeof st->figure);
        if (rc)
            return rc;
        if (joined)
            return cli_error("'%s', line %d: write '--plot FILE' with a "
                             "space",
                             path, lineno);
        st->argv[k + 1] = st->figure;
    }
    return 0;
}

/* Read and check the whole design file. Returns 0 or an exit code. */
static int
read_design(const char *path, const char *self, design_file *df)
{
    char dir[PATH_MAX];
    folder_of(path, dir, sizeof dir);
    int fd = open(path, O_RDONLY | O_NOCTTY);
    if (fd < 0)
        return cli_error("cannot read design file '%s': %s", path,
                         strerror(errno));
    struct stat st;
    if (fstat(fd, &st) || !S_ISREG(st.st_mode)) {
        close(fd);
        return cli_error("design file '%s' is not a regular file", path);
    }
    if (st.st_size > RUN_MAX_FILE) {
        close(fd);
        return cli_error("design file '%s' is larger than %d bytes", path,
                         RUN_MAX_FILE);
    }
    size_t len;
    char *text = drain(fd, &len);
    close(fd);
    if (!text)
        return cli_error("out of memory");
    const char *nul = memchr(text, '\0', len);
    if (nul) {
        int line = 1;
        for (const char *p = text; p < nul; p++)
            line += *p == '\n';
        free(text);
        return cli_error("'%s', line %d: a NUL byte; design files are "
                         "text",
                         path, line);
    }
    int lineno = 0, rc = 0;
    char *next = text;
    for (char *ln = next; ln && !rc; ln = next) {
        char *nl = strchr(ln, '\n');
        next = nl ? nl + 1 : NULL;
        if (nl)
            *nl = '\0';
        lineno++;
        if (!nl && !*ln)
            break;
        size_t l = strlen(ln);
        if (l && ln[l - 1] == '\r')
            ln[--l] = '\0';
        if (l > RUN_MAX_LINE) {
            rc = cli_error("'%s', line %d is longer than %d bytes", path,
                           lineno, RUN_MAX_LINE);
            break;
        }
        if (!dk_text_is_clean(ln, 0)) {
            /* A tab is fine between words; nothing else. */
            char *t;
            while ((t = strchr(ln, '\t')))
                *t = ' ';
            if (!dk_text_is_clean(ln, 0)) {
                rc = cli_error("'%s', line %d: a control character or "
                               "invalid UTF-8",
                               path, lineno);
                break;
            }
        }
        char *s = ln + strspn(ln, " \t");
        if (!*s || *s == '#')
            continue;
        if (!strncmp(s, "title:", 6)) {
            s += 6 + strspn(s + 6, " ");
            if (strlen(s) >= sizeof df->title)
                rc = cli_error("'%s', line %d: the title is longer than %zu "
                               "bytes",
                               path, lineno, sizeof df->title - 1);
            else
                snprintf(df->title, sizeof df->title, "%s", s);
            continue;
        }
        if (!strncmp(s, "report:", 7)) {
            s += 7 + strspn(s + 7, " ");
            rc = inside(dir, s, path, lineno, df->report,
                        sizeof df->report);
            continue;
        }
        if (df->nsteps >= RUN_MAX_STEPS) {
            rc = cli_error("'%s', line %d: more than %d steps", path, lineno,
                           RUN_MAX_STEPS);
            break;
        }
        rc = parse_step(path, dir, lineno, s, self, &df->steps[df->nsteps]);
        if (!rc)
            df->nsteps++;
    }
    free(text);
    if (!rc && df->nsteps == 0)
        rc = cli_error("'%s' has no commands to run", path);
    return rc;
}

/* Text that goes into a Markdown code block: no fence can be closed. */
static void
fenced(FILE *f, const char *text, size_t n)
{
    fputs("```\n", f);
    for (size_t i = 0; i < n; i++) {
        if (text[i] == '`' && i + 2 < n && text[i + 1] == '`' &&
            text[i + 2] == '`') {
            fputs("'''", f);
            i += 2;
            continue;
        }
        fputc(text[i], f);
    }
    if (n && text[n - 1] != '\n')
        fputc('\n', f);
    fputs("```\n\n", f);
}

/* @target relative to the folder of @from (both resolved paths). */
static const char *
relative_to(const char *from, const char *target)
{
    char dir[PATH_MAX];
    folder_of(from, dir, sizeof dir);
    size_t n = strlen(dir);
    if (!strncmp(target, dir, n) && target[n] == '/')
        return target + n + 1;
    return target;
}

static const char *const safety =
    "These designs are for Class 3B/4 lasers; mid-infrared beams are "
    "invisible. Wear eye and skin protection matched to every wavelength "
    "present (pump, signal, idler and harmonics), dump residual pump and "
    "unused beams, and stay below the crystals' damage thresholds. Local "
    "laser-safety rules (e.g. IEC 60825-1, ANSI Z136.1) and the site's "
    "laser safety officer take precedence over this report.";

static void
write_markdown(FILE *f, const char *path, const char *report,
               const design_file *df, char **crystals, int ncrystals)
{
    fprintf(f, "# %s\n\n", df->title[0] ? df->title : "deltak design "
                                                      "report");
    fprintf(f, "Design file `%s`, carried out by deltak %s. Every number "
               "below comes from the crystal data sets named in each step "
               "(sources at the end). Lines starting with \"assumed:\" are "
               "choices made by default; \"[extrapolated: ...]\" marks "
               "values outside a data set's fitted range.\n\n",
            path, DK_VERSION);
    for (int i = 0; i < df->nsteps; i++) {
        const step *st = &df->steps[i];
        char cmd[RUN_MAX_LINE + 16];
        int nc = snprintf(cmd, sizeof cmd, "deltak %s", st->text);
        fprintf(f, "## Step %d (line %d)\n\n", i + 1, st->line);
        fenced(f, cmd, (size_t)nc < sizeof cmd ? (size_t)nc
                                               : sizeof cmd - 1);
        if (st->nout)
            fenced(f, st->out, st->nout);
        if (st->nerr) {
            fputs("Warnings and notes:\n\n", f);
            fenced(f, st->err, st->nerr);
        }
        if (st->figure[0]) {
            const char *rel = report ? relative_to(report, st->figure)
                                     : st->figure;
            const char *dot = strrchr(st->figure, '.');
            if (dot && (!strcmp(dot, ".png") || !strcmp(dot, ".svg")))
                fprintf(f, "![Figure of step %d](%s)\n\n", i + 1, rel);
            else
                fprintf(f, "Figure: [%s](%s)\n\n", rel, rel);
        }
    }
    fputs("## Files written\n\n", f);
    if (report)
        fprintf(f, "- report: `%s` and `%.*s.json`\n", report,
                (int)(strrchr(report, '.') > strrchr(report, '/')
                          ? strrchr(report, '.') - report
                          : (long)strlen(report)),
                report);
    for (int i = 0; i < df->nsteps; i++)
        if (df->steps[i].figure[0])
            fprintf(f, "- figure of step %d: `%s`\n", i + 1,
                    df->steps[i].figure);
    fputs("\n## Crystal data\n\n", f);
    for (int i = 0; i < ncrystals; i++)
        if (crystals[i])
            fenced(f, crystals[i], strlen(crystals[i]));
    fprintf(f, "## Laser safety\n\n%s\n", safety);
}

static json_object *
report_json(const char *path, const design_file *df)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "title", json_object_new_string(df->title));
    json_object_object_add(o, "design_file", json_object_new_string(path));
    json_object_object_add(o, "deltak_version",
                           json_object_new_string(DK_VERSION));
    json_object *steps = json_object_new_array();
    for (int i = 0; i < df->nsteps; i++) {
        const step *st = &df->steps[i];
        json_object *s = json_object_new_object();
        json_object_object_add(s, "line", json_object_new_int(st->line));
        json_object *args = json_object_new_array();
        for (int k = 1; k < st->argc; k++)
            json_object_array_add(args, json_object_new_string(st->argv[k]));
        json_object_object_add(s, "command", args);
        json_object_object_add(s, "exit", json_object_new_int(st->status));
        json_object_object_add(s, "output",
                               json_object_new_string_len(st->out ? st->out
                                                                  : "",
                                                          (int)st->nout));
        json_object_object_add(s, "warnings",
                               json_object_new_string_len(st->err ? st->err
                                                                  : "",
                                                          (int)st->nerr));
        if (st->figure[0])
            json_object_object_add(s, "figure",
                                   json_object_new_string(st->figure));
        json_object *res = st->json ? json_tokener_parse(st->json) : NULL;
        if (res)
            json_object_object_add(s, "result", res);
        json_object_array_add(steps, s);
    }
    json_object_object_add(o, "steps", steps);
    json_object_object_add(o, "laser_safety", json_object_new_string(safety));
    return o;
}

/* The machine answer of a step: the same command with --json (figures
 * not drawn again). NULL when the command has none. */
static void
step_json(const char *self, step *st)
{
    char *args[RUN_MAX_ARGS + 3];
    int n = 0;
    for (int k = 0; k < st->argc; k++) {
        if (!strcmp(st->argv[k], "--plot") || !strcmp(st->argv[k], "--csv") ||
            !strcmp(st->argv[k], "--json")) {
            if (!strcmp(st->argv[k], "--plot"))
                k++;
            continue;
        }
        if (!strcmp(st->argv[k], "--spectrum") ||
            !strcmp(st->argv[k], "--curve"))
            return;   /* CSV-only modes */
        args[n++] = st->argv[k];
    }
    args[n++] = "--json";
    args[n] = NULL;
    char *err = NULL;
    size_t nerr;
    int status;
    if (run_child(self, args, &st->json, &st->njson, &err, &nerr,
                  &status) ||
        status != 0) {
        free(st->json);
        st->json = NULL;
    }
    free(err);
}

/* The `deltak crystals NAME` text of every crystal the steps name. */
static int
crystal_sources(const char *self, const design_file *df, char **out,
                int max)
{
    int n = 0;
    const char *names[RUN_MAX_STEPS];
    for (int i = 0; i < df->nsteps && n < max; i++) {
        const step *st = &df->steps[i];
        const char *name = NULL;
        for (int k = 2; k + 1 < st->argc; k++)
            if (!strcmp(st->argv[k], "--crystal"))
                name = st->argv[k + 1];
        if (!name)
            continue;
        int seen = 0;
        for (int j = 0; j < n && !seen; j++)
            seen = !strcmp(names[j], name);
        if (seen)
            continue;
        char *args[] = {(char *)self, "crystals", (char *)name, NULL};
        char *txt = NULL, *err = NULL;
        size_t nt, ne;
        int status;
        if (!run_child(self, args, &txt, &nt, &err, &ne, &status) &&
            status == 0) {
            names[n] = name;
            out[n++] = txt;
        } else {
            free(txt);
        }
        free(err);
    }
    return n;
}

/* Write @text (Markdown) or @json to @dest safely. */
static int
write_file(const char *dest, const char *path, const design_file *df,
           char **crys, int nc, int json)
{
    dk_error err = {0};
    dk_safe_file *sf;
    if (dk_safe_write_open(dest, &sf, &err))
        return cli_error("%s", err.msg);
    FILE *f = dk_safe_write_stream(sf);
    if (json) {
        json_object *o = report_json(path, df);
        fputs(json_object_to_json_string_ext(o, JSON_C_TO_STRING_PRETTY |
                                                    JSON_C_TO_STRING_SPACED |
                                                    JSON_C_TO_STRING_NOSLASHESCAPE),
              f);
        fputc('\n', f);
        json_object_put(o);
    } else {
        write_markdown(f, path, dest, df, crys, nc);
    }
    if (dk_safe_write_commit(sf, &err))
        return cli_error("%s", err.msg);
    return 0;
}

int
cmd_run(int argc, char **argv)
{
    enum { O_REPORT = 500, O_CHECK, O_END };
    static const struct option opts[] = {
        {"report", required_argument, NULL, O_REPORT},
        {"check", no_argument, NULL, O_CHECK},
        {"help", no_argument, NULL, 'h'},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_REPORT] = {0};
    cli_slots sl = {O_REPORT, O_END - O_REPORT, v, opts, run_usage};
    const char *pos[1];
    int npos = 1, rc;
    if ((rc = cli_parse_options(argc, argv, opts, run_usage, NULL, NULL, NULL,
                                cli_slot_option, &sl, pos, &npos)))
        return rc == CLI_HELP ? 0 : rc;
    if (npos != 1)
        return cli_usage_error(run_usage, "give one design file");
    const char *depth = getenv("DELTAK_RUN_DEPTH");
    if (depth && atoi(depth) >= RUN_MAX_DEPTH)
        return cli_error("a design file cannot run another design file");
    const char *path = pos[0], *report = v[0];
    char self[PATH_MAX];
    ssize_t n = readlink("/proc/self/exe", self, sizeof self - 1);
    if (n <= 0)
        return cli_error("cannot find the deltak program to run the steps");
    self[n] = '\0';
    design_file df = {0};
    df.steps = calloc(RUN_MAX_STEPS, sizeof *df.steps);
    if (!df.steps)
        return cli_error("out of memory");
    char *crys[RUN_MAX_STEPS] = {0};
    int nc = 0;
    if ((rc = read_design(path, self, &df)))
        goto done;
    if (v[1]) {
        fprintf(cli_stdout(), "'%s': %d step%s, checked; nothing run\n",
                path, df.nsteps, df.nsteps == 1 ? "" : "s");
        goto done;
    }
    char d[16];
    snprintf(d, sizeof d, "%d", depth ? atoi(depth) + 1 : 1);
    setenv("DELTAK_RUN_DEPTH", d, 1);
    signal(SIGINT, forward_signal);
    signal(SIGTERM, forward_signal);
    char dir[PATH_MAX];
    folder_of(path, dir, sizeof dir);
    for (int i = 0; i < df.nsteps && !rc; i++) {
        step *st = &df.steps[i];
        if (st->figure[0])
            make_parents(dir, st->figure);
        if (run_child(self, st->argv, &st->out, &st->nout, &st->err,
                      &st->nerr, &st->status))
            rc = cli_error("cannot run step %d of '%s'", i + 1, path);
        else if (st->status != 0) {
            fprintf(cli_stderr(), "%s", st->err ? st->err : "");
            rc = cli_error("'%s', line %d failed (exit %d): deltak %s; no "
                           "report written",
                           path, st->line, st->status, st->text);
        } else {
            step_json(self, st);
        }
    }
    if (rc)
        goto done;
    nc = crystal_sources(self, &df, crys, RUN_MAX_STEPS);
    const char *dest = report ? report : df.report[0] ? df.report : NULL;
    if (!dest) {
        write_markdown(cli_stdout(), path, NULL, &df, crys, nc);
        goto done;
    }
    if (!report)
        make_parents(dir, dest);
    char jpath[PATH_MAX];
    const char *dot = strrchr(dest, '.'), *slash = strrchr(dest, '/');
    size_t stem = dot && (!slash || dot > slash) ? (size_t)(dot - dest)
                                                 : strlen(dest);
    if (snprintf(jpath, sizeof jpath, "%.*s.json", (int)stem, dest) >=
        (int)sizeof jpath) {
        rc = cli_error("the report path '%s' is too long", dest);
        goto done;
    }
    if (!strcmp(jpath, dest)) {
        rc = cli_error("the report '%s' must not end in .json (the JSON "
                       "report goes beside it)",
                       dest);
        goto done;
    }
    if ((rc = write_file(dest, path, &df, crys, nc, 0)) ||
        (rc = write_file(jpath, path, &df, crys, nc, 1)))
        goto done;
    fprintf(cli_stdout(), "ran %d steps of '%s'; report in %s and %s\n", df.nsteps, path,
           dest, jpath);
done:
    for (int i = 0; i < df.nsteps; i++) {
        free(df.steps[i].out);
        free(df.steps[i].err);
        free(df.steps[i].json);
    }
    for (int i = 0; i < nc; i++)
        free(crys[i]);
    free(df.steps);
    return rc;
}

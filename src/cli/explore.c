/*
 * explore.c - `deltak explore`: serve the local interactive page on
 * 127.0.0.1 until Ctrl-C (the server is src/explore/, see explore.h).
 *
 * Signals: SIGINT, SIGTERM and SIGHUP are blocked before any thread
 * starts, so every thread inherits the mask and only this one takes them,
 * with sigwait(); then the server stops taking connections, answers the
 * requests in progress and the program ends with status 0 (at once, by
 * _exit, when a long computation nobody waits for any more is still
 * running: it cannot be stopped halfway safely).
 */
#include <pthread.h>
#include <signal.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"
#include "commands.h"
#include "explore/explore.h"
#include "options.h"

static const char *const explore_usage[] = {
    "deltak explore [--port <n>] [--workers <n>] [--deadline <s>]",
    "",
    "  --port <n>       port on 127.0.0.1 (default 8737; 0: any free port)",
    "  --workers <n>    commands computed at once (default 2, at most 16)",
    "  --deadline <s>   longest time one answer may take, in seconds "
    "(default 10)",
    "",
    "Serves a page on http://127.0.0.1:<port>/ (this machine only) on which "
    "a design is",
    "explored with sliders; its answers are those of the commands (JSON: "
    "/api/<command>,",
    "figures: /figure/sweep.svg, /figure/tolerance.svg). Ctrl-C stops it.",
    NULL};

int
cmd_explore(int argc, char **argv)
{
    enum { O_PORT = 500, O_WORKERS, O_DEADLINE, O_END };
    static const struct option opts[] = {
        {"port", required_argument, NULL, O_PORT},
        {"workers", required_argument, NULL, O_WORKERS},
        {"deadline", required_argument, NULL, O_DEADLINE},
        {"help", no_argument, NULL, 'h'},
        {NULL, 0, NULL, 0}};
    const char *v[O_END - O_PORT] = {0};
    cli_slots sl = {O_PORT, O_END - O_PORT, v, opts, explore_usage};
    int rc;
    if ((rc = cli_parse_options(argc, argv, opts, explore_usage, NULL, NULL,
                                NULL, cli_slot_option, &sl, NULL, NULL)))
        return rc == CLI_HELP ? 0 : rc;
    int port = 8737, workers = 2;
    double deadline = 10;
    if ((v[0] && cli_int("--port", v[0], 0, 65535, &port, explore_usage)) ||
        (v[1] &&
         cli_int("--workers", v[1], 1, 16, &workers, explore_usage)) ||
        (v[2] && cli_real("--deadline", v[2], 0.01, 600, &deadline,
                          explore_usage)))
        return CLI_USAGE;

    sigset_t stop;
    sigemptyset(&stop);
    sigaddset(&stop, SIGINT);
    sigaddset(&stop, SIGTERM);
    sigaddset(&stop, SIGHUP);
    sigset_t old;
    pthread_sigmask(SIG_BLOCK, &stop, &old);
    /* A client that goes away must not end the program. */
    struct sigaction ign = {0}, old_pipe;
    ign.sa_handler = SIG_IGN;
    sigaction(SIGPIPE, &ign, &old_pipe);

    explore_config cfg = {(unsigned)port, workers, deadline};
    explore_server *srv;
    unsigned bound;
    char msg[256];
    if (explore_server_start(&cfg, &srv, &bound, msg, sizeof msg)) {
        sigaction(SIGPIPE, &old_pipe, NULL);
        pthread_sigmask(SIG_SETMASK, &old, NULL);
        return cli_error("%s", msg);
    }
    FILE *out = cli_stdout();
    fprintf(out, "deltak explore: serving http://127.0.0.1:%u/ on this "
                 "machine only; Ctrl-C stops it\n"
                 "Laser safety: Class 3B/4 beams, invisible in the "
                 "mid-infrared; local rules and your\n"
                 "laser safety officer take precedence over anything this "
                 "page shows.\n",
            bound);
    fflush(out);
    int sig = 0;
    sigwait(&stop, &sig);
    int running = explore_server_stop(srv);
    fprintf(out, "deltak explore: stopped (%s)%s\n",
            sig == SIGINT ? "Ctrl-C" : sig == SIGTERM ? "SIGTERM" : "SIGHUP",
            running ? "; a computation nobody waited for was abandoned" : "");
    fflush(out);
    if (running) {
        /* Exit handlers (fontconfig's, the C library's) must not run
         * under a thread that is still computing. */
        fflush(NULL);
        _exit(0);
    }
    sigaction(SIGPIPE, &old_pipe, NULL);
    pthread_sigmask(SIG_SETMASK, &old, NULL);
    return 0;
}

/*
 * explore.h - the pieces of `deltak explore`, the local page over the
 * same engine: requests turned into command lines (explore_request.c),
 * a pool of workers that runs them with a deadline (explore_pool.c), the
 * embedded page (explore_assets.c, generated from web/ at build time)
 * and the HTTP server on 127.0.0.1 (explore_server.c, libmicrohttpd).
 *
 * One code path: every answer of the API is what dk_command_run()
 * (deltak/command.h) gives for the equivalent command line, so the page,
 * a script and the terminal agree byte for byte; validation is the
 * command's own, and its message is the answer to a bad request. The
 * server adds only its own bounds (request size, points per sweep,
 * compute time), so that one request cannot take the machine.
 */
#ifndef DK_EXPLORE_H
#define DK_EXPLORE_H

#include <stddef.h>

#include "deltak/command.h"

/* ---- Requests (explore_request.c) ---------------------------------- */

#define EXPLORE_MAX_PARAMS 24     /* query parameters per request */
#define EXPLORE_MAX_KEY 32        /* bytes of a parameter name */
#define EXPLORE_MAX_VALUE 256     /* bytes of a parameter value */
#define EXPLORE_MAX_QUERY 2048    /* bytes of all names and values */
#define EXPLORE_MAX_POINTS 2000   /* sweep: points x family members */
#define EXPLORE_MAX_CELLS 160000  /* sweep --map: cells (400 x 400) */
#define EXPLORE_MAX_ARGS (2 * EXPLORE_MAX_PARAMS + 4)

/* What a request asks for. */
typedef enum explore_kind {
    EXPLORE_JSON = 0,     /* /api/<command>: the command's --json answer */
    EXPLORE_FIGURE        /* /figure/<command>.<fmt>: its --plot figure */
} explore_kind;

/* A request as a command line: argv[0] is the command name; every string
 * lives in @store. */
typedef struct explore_call {
    explore_kind kind;
    const char *format;           /* EXPLORE_FIGURE: "svg", "pdf", "png" */
    int argc;
    char *argv[EXPLORE_MAX_ARGS + 1];
    char *key[EXPLORE_MAX_PARAMS];      /* names given, for repeats */
    int nkeys;
    char *flag[EXPLORE_MAX_PARAMS];     /* "--name" options, put last */
    int nflags;
    char *positional;                   /* crystals: the crystal asked for */
    char store[EXPLORE_MAX_QUERY + 64 * EXPLORE_MAX_PARAMS + 256];
    size_t used;
} explore_call;

/*
 * explore_call_begin:
 * Start the command line for the path of a request, "/api/period" or
 * "/figure/sweep.svg". Returns 0; 404 for a path that names no command
 * the page offers (figures: sweep and tolerance only; never run or
 * explore) with @msg filled.
 */
int explore_call_begin(explore_call *c, const char *path, char *msg,
                       size_t nmsg);

/*
 * explore_call_param:
 * Add the query parameter @key = @value (@vlen bytes; @value NULL for a
 * bare "key"): "--key=value", or "--key" alone when the value is empty;
 * for `crystals` the parameter "name" is the crystal asked for. Names are
 * lower-case options of the command, without "--"; what an option means
 * and whether its value is good is left to the command.
 * Returns 0, or 400 with @msg filled: too many or too long parameters,
 * a name that is not an option name, a value with a NUL or control
 * character, a parameter given twice, or one the page sets itself
 * (json, csv, plot, help, and the figure options but size).
 */
int explore_call_param(explore_call *c, const char *key, const char *value,
                       size_t vlen, char *msg, size_t nmsg);

/*
 * explore_call_finish:
 * Close the command line: --json for EXPLORE_JSON, --plot=-.FMT for
 * figures, and check the work it asks for: a sweep may draw at most
 * EXPLORE_MAX_POINTS points (points along --vary times members of
 * --family) and a map at most EXPLORE_MAX_CELLS cells. Texts that do not
 * parse are left for the command to refuse. Returns 0 or 400 with @msg.
 */
int explore_call_finish(explore_call *c, char *msg, size_t nmsg);

/* ---- Workers (explore_pool.c) --------------------------------------- */

typedef struct explore_pool explore_pool;

#define EXPLORE_DONE 0    /* the command ran; its result is filled */
#define EXPLORE_BUSY 1    /* every worker busy and the queue full */
#define EXPLORE_LATE 2    /* not done by the deadline */

/*
 * explore_pool_start:
 * @workers threads (1-64) that run commands, and a queue of at most
 * @queue waiting calls (1-1024). Returns 0, or an errno value.
 */
int explore_pool_start(int workers, int queue, explore_pool **pool);

/*
 * explore_pool_run:
 * Run the command line @argc/@argv (copied) in a worker and wait for it
 * at most @deadline_s seconds (> 0).
 * Returns EXPLORE_DONE with @res filled (release it with
 * dk_command_result_free); EXPLORE_BUSY at once when the queue is full;
 * EXPLORE_LATE when the deadline passed: the call is dropped from the
 * queue if it had not started, else left to finish in its worker (a
 * command cannot be stopped halfway without leaking what it holds; the
 * bounds of explore_call_finish() keep that time short) and its result
 * is thrown away. EXPLORE_BUSY also when out of memory or when the pool
 * closes while the call waits.
 */
int explore_pool_run(explore_pool *pool, int argc, char *const *argv,
                     double deadline_s, dk_command_result *res);

/* Stop taking calls: new and waiting requesters get EXPLORE_BUSY at
 * once (queued calls are dropped, running ones left to finish). NULL
 * does nothing. */
void explore_pool_close(explore_pool *pool);

/*
 * explore_pool_hold:
 * While @hold is non-zero workers take no new call (calls in hand
 * finish); queued calls wait, and meet their deadline in the queue.
 * Lets a test keep a call queued without relying on timing.
 */
void explore_pool_hold(explore_pool *pool, int hold);

/* Close, wait up to 2 s for the workers to finish the calls in hand,
 * join them and free the pool. A worker still busy then (a long call
 * nobody waits for) cannot be stopped safely: it is detached and the
 * pool left to the end of the process. Returns 0 when every worker
 * ended, 1 when one was left running (end the process with _exit then:
 * exit handlers must not run under a computing thread). NULL: 0. */
int explore_pool_stop(explore_pool *pool);

/* ---- The page (explore_assets.c, generated) ------------------------- */

typedef struct explore_asset {
    const char *path;          /* "/index.html", "/explore.js", ... */
    const char *content_type;
    const unsigned char *data;
    size_t size;
} explore_asset;

/* The file served at @path ("/" is "/index.html"), or NULL. */
const explore_asset *explore_asset_find(const char *path);

/* ---- The server (explore_server.c) ---------------------------------- */

typedef struct explore_config {
    unsigned port;        /* 0: any free port */
    int workers;          /* command workers, 1-64 */
    double deadline_s;    /* per request, > 0 */
} explore_config;

typedef struct explore_server explore_server;

/*
 * explore_server_start:
 * Listen on 127.0.0.1:@cfg->port (loopback only, never another
 * interface) and serve the page and the API from a pool of threads.
 * *port_out gets the port bound. Returns 0, or -1 with @msg filled
 * (the port is taken, no permission, out of memory).
 */
int explore_server_start(const explore_config *cfg, explore_server **srv,
                         unsigned *port_out, char *msg, size_t nmsg);

/* Stop listening, answer the requests in progress, stop the workers
 * (explore_pool_stop) and free. Returns what explore_pool_stop returns:
 * 1 when a computation was left running. NULL: 0. */
int explore_server_stop(explore_server *srv);

#endif /* DK_EXPLORE_H */

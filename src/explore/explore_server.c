/*
 * explore_server.c - the HTTP side of `deltak explore`: libmicrohttpd on
 * 127.0.0.1 with its own thread pool; the page from explore_assets.c,
 * /api/<command> and /figure/<command>.<fmt> through explore_request.c
 * and the workers of explore_pool.c (see explore.h).
 *
 * Answers:
 *   200  the command's standard output, unchanged (JSON, or the figure);
 *        for figures the command's notes and warnings ride along in the
 *        header X-Deltak-Notes (percent-encoded UTF-8)
 *   400  the command refused the request or found no answer (exit 1 or
 *        2), or the request broke a bound of the server: a JSON object
 *        {"error": the message, "exit_code", "messages": all it said}
 *   403  a Host header that is not this server (a page elsewhere trying
 *        to reach it through DNS rebinding)
 *   404, 405, and 503 when every worker is busy or the answer is not
 *        ready by the deadline (Retry-After: 1)
 * Nothing is written to disk: figures go to memory (--plot=-.FMT).
 *
 * References: RFC 9110 (HTTP semantics: status codes, Host, Allow,
 * Retry-After); RFC 3986 §2.1 (percent-encoding); libmicrohttpd 0.9
 * manual (thread pool, MHD_OPTION_URI_LOG_CALLBACK, connection memory
 * limit).
 */
#include <arpa/inet.h>
#include <ctype.h>
#include <json-c/json.h>
#include <microhttpd.h>
#include <netinet/in.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/socket.h>

#include "explore.h"

#define MAX_URI 4096          /* bytes of the request target, raw */
#define MAX_NOTES 4000        /* bytes of X-Deltak-Notes, encoded */
#define HTTP_THREADS 8        /* threads serving connections */
#define QUEUE_PER_WORKER 8    /* calls waiting per command worker */

struct explore_server {
    struct MHD_Daemon *daemon;
    explore_pool *pool;
    explore_config cfg;
    unsigned port;
    char host_ip[32], host_name[32];   /* accepted Host headers */
};

/* What the raw request target looked like (before MHD decoded it). */
typedef struct raw_uri {
    int too_long;
    int bad_path;       /* a path character outside [A-Za-z0-9/._-],
                           "..", "//", or no leading '/' */
    int bad_escape;     /* '%' not followed by two hex digits */
    int headers_seen;   /* the handler was called once (headers read) */
} raw_uri;

static void *
log_uri(void *cls, const char *uri, struct MHD_Connection *conn)
{
    (void)cls, (void)conn;
    raw_uri *r = calloc(1, sizeof *r);
    if (!r)
        return NULL;
    size_t n = strlen(uri);
    r->too_long = n > MAX_URI;
    size_t path_end = strcspn(uri, "?");
    for (size_t i = 0; i < path_end && !r->too_long; i++) {
        unsigned char c = (unsigned char)uri[i];
        if (!isalnum(c) && c != '/' && c != '.' && c != '_' && c != '-')
            r->bad_path = 1;
    }
    /* No "..", "//" or path without a leading '/': nothing here is a
     * file, but such a path is not one the page asks for either. */
    const char *dots = strstr(uri, "..");
    if (uri[0] != '/' || (dots && dots < uri + path_end))
        r->bad_path = 1;
    for (size_t i = 0; i + 1 < path_end; i++)
        if (uri[i] == '/' && uri[i + 1] == '/')
            r->bad_path = 1;
    for (size_t i = path_end; i < n && !r->too_long; i++)
        if (uri[i] == '%' &&
            !(isxdigit((unsigned char)uri[i + 1]) &&
              isxdigit((unsigned char)uri[i + 2])))
            r->bad_escape = 1;
    return r;
}

static void
completed(void *cls, struct MHD_Connection *conn, void **con_cls,
          enum MHD_RequestTerminationCode toe)
{
    (void)cls, (void)conn, (void)toe;
    free(*con_cls);
    *con_cls = NULL;
}

/* Headers every answer carries. */
static void
common_headers(struct MHD_Response *r, int cache)
{
    MHD_add_response_header(r, "X-Content-Type-Options", "nosniff");
    MHD_add_response_header(r, "Referrer-Policy", "no-referrer");
    MHD_add_response_header(r, "Cache-Control",
                            cache ? "no-cache" : "no-store");
    MHD_add_response_header(r, "Cross-Origin-Resource-Policy",
                            "same-origin");
}

static enum MHD_Result
send_buffer(struct MHD_Connection *conn, unsigned status, const char *type,
            void *data, size_t n, int owned, int cache, const char *csp)
{
    struct MHD_Response *r =
        owned ? MHD_create_response_from_buffer_with_free_callback(n, data,
                                                                   free)
              : MHD_create_response_from_buffer(n, data,
                                                MHD_RESPMEM_PERSISTENT);
    if (!r) {
        if (owned)
            free(data);
        return MHD_NO;
    }
    common_headers(r, cache);
    MHD_add_response_header(r, "Content-Type", type);
    if (csp)
        MHD_add_response_header(r, "Content-Security-Policy", csp);
    if (status == MHD_HTTP_SERVICE_UNAVAILABLE)
        MHD_add_response_header(r, "Retry-After", "1");
    if (status == MHD_HTTP_METHOD_NOT_ALLOWED)
        MHD_add_response_header(r, "Allow", "GET, HEAD");
    enum MHD_Result ok = MHD_queue_response(conn, status, r);
    MHD_destroy_response(r);
    return ok;
}

/* {"error": @msg[, "exit_code": @code, "messages": @messages]} */
static enum MHD_Result
send_error(struct MHD_Connection *conn, unsigned status, const char *msg,
           int exit_code, const char *messages)
{
    json_object *o = json_object_new_object();
    json_object_object_add(o, "error", json_object_new_string(msg));
    if (exit_code >= 0) {
        json_object_object_add(o, "exit_code",
                               json_object_new_int(exit_code));
        json_object_object_add(o, "messages",
                               json_object_new_string(messages ? messages
                                                               : ""));
    }
    const char *text = json_object_to_json_string_ext(
        o, JSON_C_TO_STRING_PRETTY | JSON_C_TO_STRING_SPACED |
               JSON_C_TO_STRING_NOSLASHESCAPE);
    size_t n = strlen(text);
    char *copy = malloc(n + 2);
    if (copy) {
        memcpy(copy, text, n);
        copy[n] = '\n';
        copy[n + 1] = '\0';
    }
    json_object_put(o);
    if (!copy)
        return MHD_NO;
    return send_buffer(conn, status, "application/json; charset=utf-8", copy,
                       n + 1, 1, 0, NULL);
}

/* The first "error: ..." line of a command's messages, without the
 * prefix, into @buf; else the first line. */
static const char *
first_error(const char *err, char *buf, size_t n)
{
    const char *line = err ? strstr(err, "error: ") : NULL;
    if (line)
        line += 7;
    else
        line = err && *err ? err : "the command gave no answer";
    size_t len = strcspn(line, "\n");
    snprintf(buf, n, "%.*s", (int)(len < n - 1 ? len : n - 1), line);
    return buf;
}

static int
unreserved(unsigned char c)
{
    return isalnum(c) || c == '-' || c == '.' || c == '_' || c == '~';
}

/* @text percent-encoded (RFC 3986: unreserved characters kept) into @out
 * of @n bytes, cut after a whole UTF-8 character when it does not fit. */
static void
percent_encode(const char *text, char *out, size_t n)
{
    static const char hex[] = "0123456789ABCDEF";
    const unsigned char *p = (const unsigned char *)(text ? text : "");
    size_t k = 0;
    while (*p) {
        size_t len = 1, need = 0;
        if (*p >= 0xC0)
            while (len < 4 && p[len] >= 0x80 && p[len] < 0xC0)
                len++;
        for (size_t i = 0; i < len; i++)
            need += unreserved(p[i]) ? 1 : 3;
        if (k + need + 1 > n)
            break;
        for (size_t i = 0; i < len; i++) {
            if (unreserved(p[i])) {
                out[k++] = (char)p[i];
            } else {
                out[k++] = '%';
                out[k++] = hex[p[i] >> 4];
                out[k++] = hex[p[i] & 15];
            }
        }
        p += len;
    }
    out[k] = '\0';
}

static const char *
figure_type(const char *format)
{
    return !strcmp(format, "svg")   ? "image/svg+xml"
           : !strcmp(format, "pdf") ? "application/pdf"
                                    : "image/png";
}

typedef struct param_walk {
    explore_call *call;
    int status;
    char msg[320];
} param_walk;

static enum MHD_Result
take_param(void *cls, enum MHD_ValueKind kind, const char *key,
           size_t key_size, const char *value, size_t value_size)
{
    (void)kind;
    param_walk *w = cls;
    char name[EXPLORE_MAX_KEY + 2];
    if (key_size > EXPLORE_MAX_KEY || strlen(key) != key_size ||
        (value && strlen(value) != value_size)) {
        w->status = 400;
        snprintf(w->msg, sizeof w->msg, "a parameter name is longer than "
                                        "32 bytes, or a name or value "
                                        "holds a NUL byte");
        return MHD_NO;
    }
    memcpy(name, key, key_size + 1);
    w->status = explore_call_param(w->call, name, value, value_size, w->msg,
                                   sizeof w->msg);
    return w->status ? MHD_NO : MHD_YES;
}

static enum MHD_Result
answer_call(explore_server *s, struct MHD_Connection *conn, const char *url)
{
    explore_call *call = malloc(sizeof *call);
    if (!call)
        return send_error(conn, 503, "out of memory", -1, NULL);
    param_walk w = {call, 0, ""};
    int st = explore_call_begin(call, url, w.msg, sizeof w.msg);
    if (!st) {
        MHD_get_connection_values_n(conn, MHD_GET_ARGUMENT_KIND, take_param,
                                    &w);
        st = w.status;
    }
    if (!st)
        st = explore_call_finish(call, w.msg, sizeof w.msg);
    if (st) {
        free(call);
        return send_error(conn, (unsigned)st, w.msg, -1, NULL);
    }
    dk_command_result res;
    int how = explore_pool_run(s->pool, call->argc, call->argv,
                               s->cfg.deadline_s, &res);
    explore_kind kind = call->kind;
    const char *format = call->format;
    free(call);
    if (how == EXPLORE_BUSY)
        return send_error(conn, 503, "every worker is busy (or the server "
                                     "is stopping); try again in a moment",
                          -1, NULL);
    if (how == EXPLORE_LATE) {
        char msg[200];
        snprintf(msg, sizeof msg, "no answer within %g s; ask for less work "
                                  "(fewer points, fewer data sets)",
                 s->cfg.deadline_s);
        return send_error(conn, 503, msg, -1, NULL);
    }
    enum MHD_Result ok;
    if (res.exit_code != 0) {
        char msg[300];
        ok = send_error(conn, 400, first_error(res.err, msg, sizeof msg),
                        res.exit_code, res.err);
        dk_command_result_free(&res);
        return ok;
    }
    struct MHD_Response *r = MHD_create_response_from_buffer_with_free_callback(
        res.nout, res.out, free);
    if (!r) {
        dk_command_result_free(&res);
        return MHD_NO;
    }
    res.out = NULL;
    common_headers(r, 0);
    if (kind == EXPLORE_JSON) {
        MHD_add_response_header(r, "Content-Type",
                                "application/json; charset=utf-8");
    } else {
        MHD_add_response_header(r, "Content-Type", figure_type(format));
        /* Nothing inside a figure may run or load. */
        MHD_add_response_header(r, "Content-Security-Policy",
                                "default-src 'none'; style-src "
                                "'unsafe-inline'; img-src data:");
        char notes[MAX_NOTES];
        percent_encode(res.err, notes, sizeof notes);
        if (notes[0])
            MHD_add_response_header(r, "X-Deltak-Notes", notes);
    }
    ok = MHD_queue_response(conn, MHD_HTTP_OK, r);
    MHD_destroy_response(r);
    dk_command_result_free(&res);
    return ok;
}

static enum MHD_Result
handle(void *cls, struct MHD_Connection *conn, const char *url,
       const char *method, const char *version, const char *upload_data,
       size_t *upload_data_size, void **con_cls)
{
    (void)version, (void)upload_data;
    explore_server *s = cls;
    raw_uri *raw = *con_cls;
    if (raw && !raw->headers_seen) {
        /* Answer once the whole request is in: an answer queued before
         * that makes MHD close the connection instead of keeping it. */
        raw->headers_seen = 1;
        return MHD_YES;
    }
    if (*upload_data_size) {
        /* A body is never wanted: drop it. */
        *upload_data_size = 0;
        return MHD_YES;
    }
    if (strcmp(method, "GET") && strcmp(method, "HEAD"))
        return send_error(conn, 405, "only GET and HEAD are served", -1,
                          NULL);
    const char *host = MHD_lookup_connection_value(conn, MHD_HEADER_KIND,
                                                   "Host");
    if (host && strcmp(host, s->host_ip) && strcmp(host, s->host_name))
        return send_error(conn, 403, "this server answers only requests "
                                     "addressed to itself (Host "
                                     "127.0.0.1:PORT or localhost:PORT)",
                          -1, NULL);
    if (raw && raw->too_long)
        return send_error(conn, 400, "the request is longer than 4096 "
                                     "bytes",
                          -1, NULL);
    if (raw && raw->bad_path)
        return send_error(conn, 400, "malformed path: only letters, "
                                     "digits, '/', '.', '_' and '-' are "
                                     "used here, without '..' or '//'",
                          -1, NULL);
    if (raw && raw->bad_escape)
        return send_error(conn, 400, "malformed query: '%' must be "
                                     "followed by two hexadecimal digits",
                          -1, NULL);
    const explore_asset *a = explore_asset_find(url);
    if (a) {
        int html = !strncmp(a->content_type, "text/html", 9);
        return send_buffer(conn, 200, a->content_type, (void *)a->data,
                           a->size, 0, 1,
                           html ? "default-src 'none'; script-src 'self'; "
                                  "style-src 'self'; img-src 'self' blob: "
                                  "data:; connect-src 'self'; base-uri "
                                  "'none'; form-action 'none'; "
                                  "frame-ancestors 'none'"
                                : NULL);
    }
    return answer_call(s, conn, url);
}

int
explore_server_start(const explore_config *cfg, explore_server **srv,
                     unsigned *port_out, char *msg, size_t nmsg)
{
    *srv = NULL;
    explore_server *s = calloc(1, sizeof *s);
    if (!s) {
        snprintf(msg, nmsg, "out of memory");
        return -1;
    }
    s->cfg = *cfg;
    int e = explore_pool_start(cfg->workers, QUEUE_PER_WORKER * cfg->workers,
                               &s->pool);
    if (e) {
        snprintf(msg, nmsg, "cannot start %d workers: %s", cfg->workers,
                 strerror(e));
        free(s);
        return -1;
    }
    struct sockaddr_in addr;
    memset(&addr, 0, sizeof addr);
    addr.sin_family = AF_INET;
    addr.sin_port = htons((uint16_t)cfg->port);
    addr.sin_addr.s_addr = htonl(INADDR_LOOPBACK);
    s->daemon = MHD_start_daemon(
        MHD_USE_INTERNAL_POLLING_THREAD | MHD_USE_AUTO,
        (uint16_t)cfg->port, NULL, NULL, handle, s,
        MHD_OPTION_SOCK_ADDR, (struct sockaddr *)&addr,
        MHD_OPTION_THREAD_POOL_SIZE, (unsigned)HTTP_THREADS,
        MHD_OPTION_CONNECTION_LIMIT, (unsigned)64,
        MHD_OPTION_CONNECTION_TIMEOUT, (unsigned)30,
        MHD_OPTION_CONNECTION_MEMORY_LIMIT, (size_t)32768,
        MHD_OPTION_URI_LOG_CALLBACK, log_uri, NULL,
        MHD_OPTION_NOTIFY_COMPLETED, completed, NULL, MHD_OPTION_END);
    if (!s->daemon) {
        snprintf(msg, nmsg, "cannot listen on 127.0.0.1:%u (is the port "
                            "taken? pick another with --port, or --port 0 "
                            "for any free one)",
                 cfg->port);
        (void)explore_pool_stop(s->pool);
        free(s);
        return -1;
    }
    const union MHD_DaemonInfo *info =
        MHD_get_daemon_info(s->daemon, MHD_DAEMON_INFO_BIND_PORT);
    s->port = info && info->port ? info->port : cfg->port;
    snprintf(s->host_ip, sizeof s->host_ip, "127.0.0.1:%u", s->port);
    snprintf(s->host_name, sizeof s->host_name, "localhost:%u", s->port);
    *port_out = s->port;
    *srv = s;
    return 0;
}

int
explore_server_stop(explore_server *s)
{
    if (!s)
        return 0;
    /* Waiting requests are answered "busy" at once, so that the
     * daemon's threads end without waiting for their deadlines. */
    explore_pool_close(s->pool);
    MHD_stop_daemon(s->daemon);
    int running = explore_pool_stop(s->pool);
    free(s);
    return running;
}

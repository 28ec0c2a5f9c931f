/*
 * explore_pool.c - a fixed set of worker threads that run commands
 * in-process (dk_command_run) for the server, each call with a deadline
 * (see explore.h).
 *
 * Method: a bounded FIFO queue under one mutex; requesters wait for
 * their call on one condition variable, broadcast when any call is done
 * or the pool closes, with pthread_cond_timedwait (CLOCK_MONOTONIC), and
 * recheck their own call. A call is shared by the
 * requester and the worker and freed by whichever lets go last: a
 * requester that gives up (deadline) marks it abandoned, and the worker
 * frees its result when it is done. The number of workers bounds the
 * commands computing at once, and the queue bounds those waiting, so a
 * flood of slow requests is answered "busy" instead of piling up.
 *
 * The pool holds no state of the commands: each call has its own argv
 * copy and result buffers, and dk_command_run keeps its notes and output
 * streams per thread (deltak/command.h).
 */
#include <errno.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "explore.h"

enum { CALL_QUEUED, CALL_RUNNING, CALL_DONE };

#define STOP_GRACE_S 2.0   /* how long stopping waits for running calls */

typedef struct call {
    int argc;
    char **argv;               /* one block: pointers, then the strings */
    dk_command_result res;
    int state;                 /* CALL_* */
    int abandoned;             /* the requester stopped waiting */
} call;

struct explore_pool {
    pthread_mutex_t lock;
    pthread_cond_t work;       /* a call was queued, or closing */
    pthread_cond_t done;       /* a call is done, a worker ended, or
                                  closing */
    call **queue;              /* ring of @cap */
    int cap, head, count;
    int closing;
    int held;                  /* workers take no new call */
    int nthreads, ended;
    pthread_t *threads;
};

static void
call_free(call *c)
{
    dk_command_result_free(&c->res);
    free(c->argv);
    free(c);
}

static call *
call_new(int argc, char *const *argv)
{
    size_t bytes = ((size_t)argc + 1) * sizeof(char *);
    for (int i = 0; i < argc; i++)
        bytes += strlen(argv[i]) + 1;
    call *c = calloc(1, sizeof *c);
    char **v = malloc(bytes);
    if (!c || !v) {
        free(c);
        free(v);
        return NULL;
    }
    char *text = (char *)(v + argc + 1);
    for (int i = 0; i < argc; i++) {
        size_t n = strlen(argv[i]) + 1;
        memcpy(text, argv[i], n);
        v[i] = text;
        text += n;
    }
    v[argc] = NULL;
    c->argc = argc;
    c->argv = v;
    c->state = CALL_QUEUED;
    return c;
}

static void *
worker(void *arg)
{
    explore_pool *p = arg;
    pthread_mutex_lock(&p->lock);
    for (;;) {
        while ((!p->count || p->held) && !p->closing)
            pthread_cond_wait(&p->work, &p->lock);
        if (p->closing)
            break;   /* queued calls are taken back by their requesters */
        call *c = p->queue[p->head];
        p->head = (p->head + 1) % p->cap;
        p->count--;
        c->state = CALL_RUNNING;
        pthread_mutex_unlock(&p->lock);

        dk_command_result res;
        dk_command_run(c->argc, (const char *const *)c->argv, &res);

        pthread_mutex_lock(&p->lock);
        c->res = res;
        c->state = CALL_DONE;
        if (c->abandoned)
            call_free(c);
        else
            pthread_cond_broadcast(&p->done);
    }
    p->ended++;
    pthread_cond_broadcast(&p->done);
    pthread_mutex_unlock(&p->lock);
    return NULL;
}

static int
cond_init_monotonic(pthread_cond_t *cv)
{
    pthread_condattr_t attr;
    if (pthread_condattr_init(&attr))
        return -1;
    pthread_condattr_setclock(&attr, CLOCK_MONOTONIC);
    int e = pthread_cond_init(cv, &attr);
    pthread_condattr_destroy(&attr);
    return e;
}

/* Now plus @seconds on CLOCK_MONOTONIC. */
static struct timespec
after(double seconds)
{
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    double whole = (double)(long)seconds;
    t.tv_sec += (time_t)whole;
    t.tv_nsec += (long)((seconds - whole) * 1e9);
    if (t.tv_nsec >= 1000000000L) {
        t.tv_sec++;
        t.tv_nsec -= 1000000000L;
    }
    return t;
}

int
explore_pool_start(int workers, int queue, explore_pool **pool)
{
    *pool = NULL;
    if (workers < 1 || workers > 64 || queue < 1 || queue > 1024)
        return EINVAL;
    explore_pool *p = calloc(1, sizeof *p);
    if (!p)
        return ENOMEM;
    p->cap = queue;
    p->queue = calloc((size_t)p->cap, sizeof *p->queue);
    p->threads = calloc((size_t)workers, sizeof *p->threads);
    if (!p->queue || !p->threads) {
        free(p->queue);
        free(p->threads);
        free(p);
        return ENOMEM;
    }
    pthread_mutex_init(&p->lock, NULL);
    pthread_cond_init(&p->work, NULL);
    if (cond_init_monotonic(&p->done)) {
        pthread_mutex_destroy(&p->lock);
        pthread_cond_destroy(&p->work);
        free(p->queue);
        free(p->threads);
        free(p);
        return ENOMEM;
    }
    for (int i = 0; i < workers; i++) {
        int e = pthread_create(&p->threads[i], NULL, worker, p);
        if (e) {
            p->nthreads = i;
            explore_pool_close(p);
            (void)explore_pool_stop(p);
            return e;
        }
    }
    p->nthreads = workers;
    *pool = p;
    return 0;
}

int
explore_pool_run(explore_pool *p, int argc, char *const *argv,
                 double deadline_s, dk_command_result *res)
{
    memset(res, 0, sizeof *res);
    call *c = call_new(argc, argv);
    if (!c)
        return EXPLORE_BUSY;
    struct timespec until = after(deadline_s);
    pthread_mutex_lock(&p->lock);
    if (p->closing || p->count >= p->cap) {
        pthread_mutex_unlock(&p->lock);
        call_free(c);
        return EXPLORE_BUSY;
    }
    p->queue[(p->head + p->count) % p->cap] = c;
    p->count++;
    pthread_cond_signal(&p->work);
    int late = 0;
    while (c->state != CALL_DONE && !late && !p->closing)
        late = pthread_cond_timedwait(&p->done, &p->lock, &until) ==
               ETIMEDOUT;
    if (c->state == CALL_DONE) {
        *res = c->res;
        memset(&c->res, 0, sizeof c->res);
        pthread_mutex_unlock(&p->lock);
        call_free(c);
        return EXPLORE_DONE;
    }
    int how = p->closing ? EXPLORE_BUSY : EXPLORE_LATE;
    if (c->state == CALL_QUEUED) {
        /* Not started: take it out of the queue. */
        for (int i = 0; i < p->count; i++) {
            if (p->queue[(p->head + i) % p->cap] != c)
                continue;
            for (int j = i; j + 1 < p->count; j++)
                p->queue[(p->head + j) % p->cap] =
                    p->queue[(p->head + j + 1) % p->cap];
            p->count--;
            break;
        }
        pthread_mutex_unlock(&p->lock);
        call_free(c);
        return how;
    }
    c->abandoned = 1;   /* the worker frees it */
    pthread_mutex_unlock(&p->lock);
    return how;
}

void
explore_pool_hold(explore_pool *p, int hold)
{
    if (!p)
        return;
    pthread_mutex_lock(&p->lock);
    p->held = hold != 0;
    pthread_cond_broadcast(&p->work);
    pthread_mutex_unlock(&p->lock);
}

void
explore_pool_close(explore_pool *p)
{
    if (!p)
        return;
    pthread_mutex_lock(&p->lock);
    p->closing = 1;
    pthread_cond_broadcast(&p->work);
    pthread_cond_broadcast(&p->done);
    pthread_mutex_unlock(&p->lock);
}

int
explore_pool_stop(explore_pool *p)
{
    if (!p)
        return 0;
    explore_pool_close(p);
    /* Workers end after the call in hand. One still busy after the
     * grace period (a long call whose requester gave up) cannot be
     * stopped safely: it is left to the end of the process, with the
     * pool it uses. */
    struct timespec until = after(STOP_GRACE_S);
    int late = 0;
    pthread_mutex_lock(&p->lock);
    while (p->ended < p->nthreads && !late)
        late = pthread_cond_timedwait(&p->done, &p->lock, &until) ==
               ETIMEDOUT;
    int all = p->ended == p->nthreads;
    pthread_mutex_unlock(&p->lock);
    if (!all) {
        for (int i = 0; i < p->nthreads; i++)
            pthread_detach(p->threads[i]);
        return 1;
    }
    for (int i = 0; i < p->nthreads; i++)
        pthread_join(p->threads[i], NULL);
    pthread_mutex_destroy(&p->lock);
    pthread_cond_destroy(&p->work);
    pthread_cond_destroy(&p->done);
    free(p->queue);
    free(p->threads);
    free(p);
    return 0;
}

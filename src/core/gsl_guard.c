/*
 * gsl_guard.c - GSL's error handler off around the library's GSL calls
 * (see gsl_guard.h).
 */
#include <gsl/gsl_errno.h>
#include <pthread.h>

#include "core/gsl_guard.h"

static pthread_mutex_t lock = PTHREAD_MUTEX_INITIALIZER;
static int depth;
static gsl_error_handler_t *saved;

void
dk_gsl_guard_enter(void)
{
    pthread_mutex_lock(&lock);
    if (depth++ == 0)
        saved = gsl_set_error_handler_off();
    pthread_mutex_unlock(&lock);
}

void
dk_gsl_guard_leave(void)
{
    pthread_mutex_lock(&lock);
    if (depth > 0 && --depth == 0)
        gsl_set_error_handler(saved);
    pthread_mutex_unlock(&lock);
}

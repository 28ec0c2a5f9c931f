/*
 * status.h - status codes and the error record every fallible deltak
 * function fills.
 *
 * The library never prints, exits or aborts. A function that can fail
 * returns a dk_status and, when handed a dk_error, writes a one-line
 * message into it that names the failure first and the subject in quotes,
 * e.g. "cannot read 'crystals/x.yaml': line 12, column 5: expected a number".
 */
#ifndef DK_STATUS_H
#define DK_STATUS_H

#include <stddef.h>

typedef enum dk_status {
    DK_OK = 0,        /* success */
    DK_EINVAL,        /* an argument is invalid (bad unit, bad range, ...) */
    DK_ENOMEM,        /* out of memory */
    DK_EIO,           /* a file could not be read or written */
    DK_EPARSE,        /* a data file is malformed (schema, syntax, type) */
    DK_ENOTFOUND,     /* a named thing (crystal, data set, axis) is unknown */
    DK_ERANGE,        /* a value lies outside where the data are valid */
    DK_ENOROOT,       /* a solver found no solution in the range searched */
    DK_ENOCONV,       /* an iteration did not converge */
    DK_EDOM           /* a result would be non-finite (NaN or infinity) */
} dk_status;

#define DK_ERROR_MSG_MAX 512

/* Where a failing function explains itself; the caller owns it. */
typedef struct dk_error {
    dk_status status;               /* the code also returned */
    char msg[DK_ERROR_MSG_MAX];     /* one line, no trailing period */
} dk_error;

/* A short lowercase name for @s, e.g. "invalid argument"; never NULL. */
const char *dk_status_str(dk_status s);

/*
 * dk_error_set:
 * @err: where to write; may be NULL (then only the code is returned)
 * @s: the status to record
 * @fmt: printf-style message
 *
 * Returns: @s, so that callers can write `return dk_error_set(err, ...)`.
 */
dk_status dk_error_set(dk_error *err, dk_status s, const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 3, 4)))
#endif
    ;

/* Reset @err to DK_OK with an empty message; NULL does nothing. */
void dk_error_clear(dk_error *err);

#endif /* DK_STATUS_H */

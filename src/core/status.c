/*
 * status.c - status names and the error record (see deltak/status.h).
 */
#include <stdarg.h>
#include <stdio.h>

#include "deltak/status.h"

const char *
dk_status_str(dk_status s)
{
    switch (s) {
    case DK_OK: return "success";
    case DK_EINVAL: return "invalid argument";
    case DK_ENOMEM: return "out of memory";
    case DK_EIO: return "input/output error";
    case DK_EPARSE: return "malformed data";
    case DK_ENOTFOUND: return "not found";
    case DK_ERANGE: return "out of range";
    case DK_ENOROOT: return "no solution";
    case DK_ENOCONV: return "no convergence";
    case DK_EDOM: return "non-finite result";
    }
    return "unknown status";
}

dk_status
dk_error_set(dk_error *err, dk_status s, const char *fmt, ...)
{
    if (!err)
        return s;
    err->status = s;
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(err->msg, sizeof err->msg, fmt, ap);
    va_end(ap);
    return s;
}

void
dk_error_clear(dk_error *err)
{
    if (!err)
        return;
    err->status = DK_OK;
    err->msg[0] = '\0';
}

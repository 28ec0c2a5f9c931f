/*
 * safe_write.h - writing an output file (figure, report, table) so that
 * a reader never sees half of it, nothing but the target is ever
 * replaced, and an interrupted program leaves no temporary file behind.
 *
 * What happens to the target, by what the path names when it is opened:
 *
 *   nothing (a new file)       written to a temporary file beside it and
 *                              renamed over it atomically at commit
 *   a regular file             the same; the new file keeps the old one's
 *                              permission bits
 *   a symbolic link to a       the file the link resolves to is replaced
 *   regular file               atomically (temporary file in ITS folder);
 *                              the link itself stays
 *   a device, FIFO or socket,  written directly, in place: never replaced
 *   or a link to one           by a regular file; an abort cannot take
 *   (/dev/null, a named pipe)  back what was written
 *   /dev/stdout, /dev/stderr,  written to a copy of that descriptor, where
 *   /dev/fd/N, /proc/self/fd/N the program's output stands (also when it
 *                              is redirected to a file); flush the
 *                              program's own stdout first
 *   a folder                   refused (DK_EIO)
 *   a link to nothing          refused (DK_EIO): the link would be
 *                              replaced, or a file created elsewhere
 *
 * Temporary files are named ".<name>.<16 random hex digits>.tmp" in the
 * target's folder (same file system, so the rename is atomic), created
 * with O_CREAT | O_EXCL | O_NOFOLLOW: a file or link planted under a
 * predictable name can neither be followed nor overwritten.
 *
 * Signals: the first open installs a handler for SIGINT, SIGTERM and
 * SIGHUP where the program has left their default action; the handler
 * removes every temporary file in progress (async-signal-safe: a fixed
 * table of folder descriptors and names, unlinkat()) and re-raises the
 * signal with its default action, so that the program ends as it would
 * have. A program with its own handlers calls
 * dk_safe_write_remove_temporaries() from them. At most
 * DK_SAFE_WRITE_MAX_OPEN files may be open for writing at once.
 */
#ifndef DK_SAFE_WRITE_H
#define DK_SAFE_WRITE_H

#include <stdio.h>

#include "deltak/status.h"

#define DK_SAFE_WRITE_MAX_OPEN 32

typedef struct dk_safe_file dk_safe_file;

/*
 * dk_safe_write_open:
 * @path: the file to write (see the table above)
 * @out: on success, the open file; finish it with exactly one of
 *       dk_safe_write_commit() or dk_safe_write_abort()
 *
 * Returns: DK_OK; DK_EINVAL (NULL or empty path); DK_EIO with "cannot
 * write 'PATH': reason" (a folder, a dangling link, the folder cannot be
 * written, the device cannot be opened, too many files open for
 * writing); DK_ENOMEM.
 */
dk_status dk_safe_write_open(const char *path, dk_safe_file **out,
                             dk_error *err);

/* The stream to write to (binary); valid until commit or abort. */
FILE *dk_safe_write_stream(dk_safe_file *f);

/* 1 when @f writes in place (a device, FIFO, socket or a numbered
 * descriptor such as /dev/stdout), else 0. */
int dk_safe_write_is_direct(const dk_safe_file *f);

/*
 * dk_safe_write_commit:
 * Flush, sync and close the stream, then rename the temporary file over
 * the target (for a direct target: flush and close). Frees @f in every
 * case; on failure the temporary file is removed and the target is as it
 * was.
 *
 * Returns: DK_OK; DK_EIO with "cannot write 'PATH': reason" (a write
 * error seen by the stream, disk full, the target turned into something
 * that is not a regular file meanwhile, rename failed).
 */
dk_status dk_safe_write_commit(dk_safe_file *f, dk_error *err);

/* Close @f and remove its temporary file; the target is untouched (for a
 * direct target, what was written stays written). NULL does nothing. */
void dk_safe_write_abort(dk_safe_file *f);

/* Remove every temporary file in progress. Async-signal-safe: for
 * signal handlers of the program; the open files then fail at commit. */
void dk_safe_write_remove_temporaries(void);

#endif /* DK_SAFE_WRITE_H */

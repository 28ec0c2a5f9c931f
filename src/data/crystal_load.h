/*
 * crystal_load.h - loading a crystal file from memory and the limits of
 * the loader (internal to the library; the fuzz targets use it too).
 */
#ifndef DK_CRYSTAL_LOAD_H
#define DK_CRYSTAL_LOAD_H

#include <stddef.h>

#include "deltak/crystal.h"

/*
 * Limits of one crystal file. The shipped files are below 10 kB, nest 8
 * levels deep, have fewer than 600 nodes and 6 aliases (2026): the
 * limits leave a wide margin and keep a hostile file from stalling every
 * command (with DK_DB_MAX_FILES files, a folder costs at most a few
 * seconds to load; the name-clash check compares at most
 * (256·33)²/2 names).
 */
#define DK_CRYSTAL_MAX_BYTES (256 * 1024)
#define DK_CRYSTAL_MAX_DEPTH 32
#define DK_CRYSTAL_MAX_NODES 20000
#define DK_CRYSTAL_MAX_ALIASES 32

/*
 * dk_crystal_load_buffer:
 * @path: the name to give in messages and in the crystal's path
 * @data, @size: the file's bytes (not NUL-terminated)
 *
 * Like dk_crystal_load() without the file: the same limits and checks.
 * Returns: DK_OK, DK_EPARSE or DK_ENOMEM.
 */
dk_status dk_crystal_load_buffer(const char *path, const void *data,
                                 size_t size, dk_crystal **out,
                                 dk_error *err);

#endif /* DK_CRYSTAL_LOAD_H */

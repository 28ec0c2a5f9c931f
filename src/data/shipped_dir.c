/*
 * shipped_dir.c - where this build of the library finds the crystal
 * database it ships with (deltak/crystal.h, dk_db_shipped_dir).
 *
 * The folder is compiled in as DK_CRYSTAL_DIR: the source tree's
 * crystals/ for a build in the tree. `make install` compiles this one
 * file again with PREFIX/share/deltak/crystals for the installed
 * library and program, so that nothing else is built twice.
 */
#include "deltak/crystal.h"

#ifndef DK_CRYSTAL_DIR
#error "DK_CRYSTAL_DIR (the shipped crystal folder) must be defined"
#endif

const char *
dk_db_shipped_dir(void)
{
    return DK_CRYSTAL_DIR;
}

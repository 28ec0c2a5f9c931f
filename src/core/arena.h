/*
 * arena.h - a region allocator: many small allocations, one free.
 * Internal to the library. Allocations are zeroed and aligned for any
 * type; dk_arena_free releases all of them at once.
 */
#ifndef DK_ARENA_H
#define DK_ARENA_H

#include <stddef.h>

typedef struct dk_arena dk_arena;

/* Returns: a new empty arena or NULL when out of memory. */
dk_arena *dk_arena_new(void);

/* Returns: @size zeroed bytes, or NULL when out of memory. */
void *dk_arena_alloc(dk_arena *a, size_t size);

/* Returns: a copy of @s in the arena, or NULL (out of memory or s NULL). */
char *dk_arena_strdup(dk_arena *a, const char *s);

/* Free every allocation and the arena; NULL does nothing. */
void dk_arena_free(dk_arena *a);

#endif /* DK_ARENA_H */

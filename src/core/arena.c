/*
 * arena.c - region allocator (see arena.h). Each allocation is its own
 * calloc'd block chained in front of the previous one: simple, and the
 * database is small (a few hundred allocations per crystal).
 */
#include <stdalign.h>
#include <stdlib.h>
#include <string.h>

#include "arena.h"

typedef struct block {
    struct block *next;
    alignas(max_align_t) unsigned char data[];
} block;

struct dk_arena {
    block *head;
};

dk_arena *
dk_arena_new(void)
{
    return calloc(1, sizeof(dk_arena));
}

void *
dk_arena_alloc(dk_arena *a, size_t size)
{
    if (size > (size_t)-1 - sizeof(block))   /* catch size_t overflow */
        return NULL;
    block *b = calloc(1, sizeof(block) + size);
    if (!b)
        return NULL;
    b->next = a->head;
    a->head = b;
    return b->data;
}

char *
dk_arena_strdup(dk_arena *a, const char *s)
{
    if (!s)
        return NULL;
    size_t n = strlen(s) + 1;
    char *p = dk_arena_alloc(a, n);
    if (p)
        memcpy(p, s, n);
    return p;
}

void
dk_arena_free(dk_arena *a)
{
    if (!a)
        return;
    block *b = a->head;
    while (b) {
        block *next = b->next;
        free(b);
        b = next;
    }
    free(a);
}

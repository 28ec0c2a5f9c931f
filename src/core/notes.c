/*
 * notes.c - the list of notes an answer rests on (see deltak/notes.h).
 */
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

#include "deltak/notes.h"

void
dk_notes_clear(dk_notes *notes)
{
    notes->n = 0;
    notes->dropped = 0;
}

static int
present(const dk_notes *notes, const dk_note *nt)
{
    for (int i = 0; i < notes->n; i++)
        if (notes->item[i].kind == nt->kind &&
            strcmp(notes->item[i].code, nt->code) == 0 &&
            strcmp(notes->item[i].text, nt->text) == 0)
            return 1;
    return 0;
}

static void
add(dk_notes *notes, const dk_note *nt)
{
    if (present(notes, nt))
        return;
    if (notes->n >= DK_NOTES_MAX) {
        notes->dropped++;
        return;
    }
    notes->item[notes->n++] = *nt;
}

void
dk_notes_add(dk_notes *notes, dk_note_kind kind, const char *code,
             const char *fmt, ...)
{
    if (!notes)
        return;
    dk_note nt;
    nt.kind = kind;
    snprintf(nt.code, sizeof nt.code, "%s", code ? code : "");
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(nt.text, sizeof nt.text, fmt, ap);
    va_end(ap);
    add(notes, &nt);
}

void
dk_notes_remove(dk_notes *notes, const char *code)
{
    int k = 0;
    for (int i = 0; i < notes->n; i++)
        if (strcmp(notes->item[i].code, code) != 0)
            notes->item[k++] = notes->item[i];
    notes->n = k;
}

void
dk_notes_merge(dk_notes *to, const dk_notes *from)
{
    for (int i = 0; i < from->n; i++)
        add(to, &from->item[i]);
    to->dropped += from->dropped;
}

const char *
dk_note_kind_str(dk_note_kind kind)
{
    switch (kind) {
    case DK_NOTE_DEFAULT: return "default";
    case DK_NOTE_RANGE: return "range";
    case DK_NOTE_MEMORY: return "from memory";
    case DK_NOTE_CAUTION: return "caution";
    case DK_NOTE_WARNING: return "warning";
    }
    return "note";
}

size_t
dk_notes_codes(const dk_notes *notes, unsigned kind_mask, char *buf,
               size_t n)
{
    size_t used = 0;
    if (n == 0)
        return 0;
    buf[0] = '\0';
    for (int i = 0; i < notes->n; i++) {
        const dk_note *nt = &notes->item[i];
        if (!(kind_mask & (1u << nt->kind)) || !nt->code[0])
            continue;
        /* The same code twice (two texts) is listed once. */
        int dup = 0;
        for (int j = 0; j < i && !dup; j++)
            dup = (kind_mask & (1u << notes->item[j].kind)) &&
                  strcmp(notes->item[j].code, nt->code) == 0;
        if (dup)
            continue;
        /* appended by hand: called once per CSV row, snprintf dominated */
        size_t len = strlen(nt->code), sep = used ? 1 : 0;
        if (sep + len >= n - used)
            break;
        if (sep)
            buf[used] = ';';
        memcpy(buf + used + sep, nt->code, len + 1);
        used += sep + len;
    }
    return used;
}

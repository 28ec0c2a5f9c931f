/*
 * notes.h - what an answer rests on, collected by the engine so that every
 * front end (text, JSON, CSV, figures, the Python module) can show it.
 *
 * A note is one line of text with a kind and a short machine code:
 *   DK_NOTE_DEFAULT   a choice made for the user (data set, temperature,
 *                     solution, scheme), with how to change it
 *   DK_NOTE_RANGE     a value outside a data set's fitted range (the wave
 *                     and the range are named)
 *   DK_NOTE_MEMORY    a number typed from memory, not yet checked
 *   DK_NOTE_CAUTION   a practical caution of the crystal at this point
 *   DK_NOTE_WARNING   anything else the user must know
 * Adding a note that is already present does nothing, so loops may add
 * freely. The list is bounded; past DK_NOTES_MAX notes, adds are dropped
 * and `dropped` counts them.
 */
#ifndef DK_NOTES_H
#define DK_NOTES_H

#include <stddef.h>

#define DK_NOTES_MAX 32
#define DK_NOTE_TEXT_MAX 512
#define DK_NOTE_CODE_MAX 40

typedef enum dk_note_kind {
    DK_NOTE_DEFAULT,
    DK_NOTE_RANGE,
    DK_NOTE_MEMORY,
    DK_NOTE_CAUTION,
    DK_NOTE_WARNING
} dk_note_kind;

typedef struct dk_note {
    dk_note_kind kind;
    char code[DK_NOTE_CODE_MAX];   /* e.g. "default-set", "range:idler" */
    char text[DK_NOTE_TEXT_MAX];   /* one line, no trailing period */
} dk_note;

typedef struct dk_notes {
    int n;
    int dropped;
    dk_note item[DK_NOTES_MAX];
} dk_notes;

/* Empty @notes. */
void dk_notes_clear(dk_notes *notes);

/*
 * dk_notes_add:
 * @code: short machine code (copied, truncated to DK_NOTE_CODE_MAX − 1)
 * @fmt: printf-style text
 * Adds the note unless one with the same code and text is present.
 */
void dk_notes_add(dk_notes *notes, dk_note_kind kind, const char *code,
                  const char *fmt, ...)
#if defined(__GNUC__)
    __attribute__((format(printf, 4, 5)))
#endif
    ;

/* Remove every note with code @code. */
void dk_notes_remove(dk_notes *notes, const char *code);

/* Append every note of @from to @to (duplicates dropped). */
void dk_notes_merge(dk_notes *to, const dk_notes *from);

/* "default", "range", "from memory", "caution" or "warning". */
const char *dk_note_kind_str(dk_note_kind kind);

/*
 * dk_notes_codes:
 * Writes the codes of the notes of kinds in @kind_mask (bit 1 << kind)
 * into @buf separated by ';' (the CSV flag column). Returns the length
 * written (truncated to @n − 1).
 */
size_t dk_notes_codes(const dk_notes *notes, unsigned kind_mask, char *buf,
                      size_t n);

#endif /* DK_NOTES_H */

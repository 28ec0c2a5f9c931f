/*
 * design_internal.h - functions shared by the files of the design layer
 * (src/design/design*.c); not part of the public API.
 */
#ifndef DK_DESIGN_INTERNAL_H
#define DK_DESIGN_INTERNAL_H

#include "deltak/design.h"

/* QPM: resolve --pol or a type name to axis letters of signal, idler,
 * pump in @pol ("" when the default, all along the polar axis, applies). */
dk_status dk_design_qpm_modes(dk_design *d, char pol[4], dk_error *err);

/* Birefringent: check --pol letters (o/e or s/f) and the type; fill
 * d->pol ("" for every combination) and d->type. */
dk_status dk_design_angle_modes(dk_design *d, dk_error *err);

/* Notes on where the numbers come from (sets and d typed from memory)
 * and the crystal's cautions at the design's temperature and waves. */
void dk_design_note_provenance(dk_design *d);

#endif /* DK_DESIGN_INTERNAL_H */

/*
 * deltak.h - every public header of libdeltak in one include, for
 * programs that use much of it. Each header also stands alone; include
 * the ones you need to keep builds lean. tests/package/install.sh
 * checks that this list names every installed header and that each
 * compiles alone.
 */
#ifndef DK_DELTAK_H
#define DK_DELTAK_H

#include "deltak/acceptance.h"
#include "deltak/angle.h"
#include "deltak/bandwidth.h"
#include "deltak/broadband.h"
#include "deltak/chip.h"
#include "deltak/command.h"
#include "deltak/constants.h"
#include "deltak/crystal.h"
#include "deltak/design.h"
#include "deltak/design_sim.h"
#include "deltak/dispersion.h"
#include "deltak/gain.h"
#include "deltak/gain_spectrum.h"
#include "deltak/group.h"
#include "deltak/interaction.h"
#include "deltak/material.h"
#include "deltak/modes.h"
#include "deltak/nonlinear.h"
#include "deltak/notes.h"
#include "deltak/plot.h"
#include "deltak/pulse.h"
#include "deltak/qpm.h"
#include "deltak/roots.h"
#include "deltak/safe_write.h"
#include "deltak/simulate.h"
#include "deltak/status.h"
#include "deltak/sweep.h"
#include "deltak/text.h"
#include "deltak/tolerance.h"
#include "deltak/units.h"

#endif /* DK_DELTAK_H */

/*
 * gsl_guard.h - GSL's default error handler aborts the process; a library
 * must not. The library's entry points that call GSL switch the handler
 * off for the duration of the call and restore whatever the host program
 * had installed, so that a third-party program keeps its own GSL
 * behaviour and deltak never aborts it. Calls nest and may come from
 * several threads: a mutex-protected depth counter restores the handler
 * when the last one leaves. (While any deltak call is inside GSL, other
 * threads of the host see GSL's handler off too; documented in
 * DEVELOPERS.md.)
 */
#ifndef DK_GSL_GUARD_H
#define DK_GSL_GUARD_H

void dk_gsl_guard_enter(void);
void dk_gsl_guard_leave(void);

#endif /* DK_GSL_GUARD_H */

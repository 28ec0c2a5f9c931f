/*
 * design.h - one design of a three-wave process in one crystal: every
 * choice a user receives is made here, in one place, and recorded.
 *
 * A request (dk_design_request) says what the user gave: crystal, data set
 * or none, process and waves, temperature, the QPM grating or the
 * birefringent modes, type, angles, plane, noncollinear angle, solution
 * number, crystal length. dk_design_setup() turns it into a design:
 *
 *   data set    the one named; else the crystal's default for the scheme
 *               (a crystal may default to another set for QPM than for
 *               angles; the reason is noted)
 *   scheme      QPM when a period is given, the crystal is named by a
 *               poled alias (PPLN, PPKTP, OP-GaAs, ...), or it is isotropic;
 *               birefringent when an angle option is given or the crystal
 *               cannot be poled; otherwise QPM for poled crystals unless a
 *               type is given (as for KTP type II) — always noted
 *   modes       polarisation letters (QPM: axes x/y/z or o/e; angle: modes
 *               o/e or s/f), or a type name (0, I, II) resolved to the mode
 *               combinations with a nonzero d_eff — an error lists them when
 *               the type name is ambiguous
 *   temperature as given; else 25 °C, or the reference temperature of a
 *               set without temperature dependence (noted)
 *   ranges      every given wave inside the transparency range (else an
 *               error naming the wave); the set has every axis it needs
 *
 * dk_design_solve() then finds every solution of the question asked (the
 * QPM period; the temperatures of a given grating; the signal/idler pairs
 * of a grating and pump; the birefringent directions over the whole range
 * that matters: θ in [0°, 180°] and φ in [0°, 180°), where θ and 180° − θ
 * are different cuts in crystals of low symmetry) and chooses one:
 *   QPM temperature   the root nearest the temperature given, else the lowest
 *   wavelength pairs  the first (shortest signal)
 *   directions        the solution with the largest |d_eff| unless the user
 *                     picked a solution number, a θ (nearest), a φ or a plane
 * Every solution stays listed; the choice and how to change it is noted.
 *
 * Range policy (DESIGN.md §4, one rule for every command): a value outside
 * a data set's fitted wavelength or temperature range is answered and
 * flagged (DK_RANGE_* flags per solution and per sweep point, a note naming
 * the wave and the range); outside the crystal's transparency it is an
 * error (DK_ERANGE).
 */
#ifndef DK_DESIGN_H
#define DK_DESIGN_H

#include "deltak/angle.h"
#include "deltak/crystal.h"
#include "deltak/notes.h"
#include "deltak/qpm.h"

typedef enum dk_scheme {
    DK_SCHEME_AUTO = 0,   /* requests only: let the rule decide */
    DK_SCHEME_QPM,
    DK_SCHEME_ANGLE       /* birefringent (angle or temperature tuned) */
} dk_scheme;

typedef enum dk_process {
    DK_PROCESS_AUTO = 0,  /* requests only: SHG for a fundamental, else OPA */
    DK_PROCESS_SHG,
    DK_PROCESS_SFG,
    DK_PROCESS_DFG,
    DK_PROCESS_OPA,
    DK_PROCESS_OPO
} dk_process;

/* What was solved for. */
typedef enum dk_solved {
    DK_SOLVED_NONE = 0,      /* nothing (an incomplete design for sweeps) */
    DK_SOLVED_PERIOD,        /* QPM period at a given temperature */
    DK_SOLVED_TEMPERATURE,   /* temperatures of a given grating */
    DK_SOLVED_WAVELENGTHS,   /* signal/idler pairs of a grating and pump */
    DK_SOLVED_DIRECTION,     /* birefringent propagation directions */
    DK_SOLVED_NCPM           /* temperatures of noncritical directions */
} dk_solved;

/* Range flags of one evaluation point (per solution, per sweep point). */
#define DK_RANGE_SIGNAL  0x01u  /* signal λ outside the set's fitted range */
#define DK_RANGE_IDLER   0x02u
#define DK_RANGE_PUMP    0x04u
#define DK_RANGE_TEMP    0x08u  /* T outside the set's fitted range */
#define DK_RANGE_NO_TEMP 0x10u  /* the set has no T dependence: T ignored */

#define DK_DESIGN_MAX_SOL 32

/* Temperatures above this are refused: no data set is fitted near it,
 * and formulas extrapolated that far give unphysical indices. */
#define DK_DESIGN_MAX_TEMP_C 1000.0

/* What the user asked for. Initialise with dk_design_request_init(). */
typedef struct dk_design_request {
    const dk_crystal *crystal;
    const char *crystal_name;  /* as typed, for the poled-alias rule; NULL */
    const char *set_name;      /* NULL: the crystal's default */
    dk_process process;
    dk_scheme scheme;
    dk_waves waves;            /* µm; a missing wave is 0 */
    int shg;                   /* 1: signal = idler = fundamental */
    int held;                  /* 1: signal given, 2: idler given, 0: neither */
    double temp_c;             /* NAN: default */
    double temp_range_c[2];    /* where temperatures are sought; NAN: default */
    const char *pol;           /* letters of signal, idler, pump; NULL */
    const char *type;          /* "0", "I", "II"; NULL */
    /* QPM */
    double period_um;          /* > 0: the grating as written is given */
    int order;                 /* QPM order ≥ 1 */
    double duty;               /* duty cycle, (0, 1) */
    double written_temp_c;     /* the period is as written at this T */
    /* birefringent */
    double theta_rad;          /* NAN: free; else the solution nearest */
    double phi_rad;            /* NAN: free; uniaxial: azimuth for d_eff;
                                * biaxial: solve θ at this φ */
    const char *plane;         /* biaxial principal plane "XY", "YZ", "XZ" */
    int solution;              /* 1-based solution number; 0: best |d_eff| */
    double alpha_rad;          /* noncollinear internal pump-signal angle */
    int broadband;             /* 1: α where signal and idler group
                                * velocities match (noncollinear OPA) */
    double length_mm;          /* crystal length; NAN: not given */
} dk_design_request;

/* One solution of the question asked. */
typedef struct dk_solution {
    dk_waves waves;
    double temp_c;
    double period_um;          /* QPM: as written */
    char pol[4];               /* modes (angle) or axes (QPM) s, i, p */
    char type[4];              /* "0", "I", "II" */
    char plane[4];             /* biaxial plane or NCPM axis; else "" */
    double theta_rad, phi_rad; /* pump wave normal (angle) */
    double alpha_rad;          /* noncollinear angle */
    double deff_pm_per_v;      /* |d_eff| (QPM: with the grating factor);
                                * NAN when the crystal has no d data */
    double walkoff_rad[3];     /* signal, idler, pump */
    double n[3];               /* indices of signal, idler, pump */
    unsigned range;            /* DK_RANGE_* flags */
} dk_solution;

/* A design at (or being brought to) its operating point. */
typedef struct dk_design {
    dk_design_request rq;      /* as asked (strings are the caller's) */
    const dk_crystal *crystal;
    const dk_dispersion_set *set;
    dk_scheme scheme;
    dk_process process;
    int shg;
    int held;
    dk_waves waves;            /* at the operating point */
    double temp_c;
    double length_mm;          /* NAN when not given */
    /* QPM */
    dk_qpm qpm;
    double period_um;          /* as written at qpm.written_temp_c */
    /* birefringent */
    dk_angle_problem angle;    /* alpha_rad: the noncollinear angle */
    char pol[4];               /* modes of signal, idler, pump */
    char type[4];
    char plane[4];
    double theta_rad, phi_rad;
    /* what was solved, every solution, the one chosen */
    dk_solved solved;
    int nsol;
    int chosen;                /* index into sol; -1 before solving */
    dk_solution sol[DK_DESIGN_MAX_SOL];
    dk_notes notes;            /* choices, range flags, cautions */
} dk_design;

/* Defaults: no data, order 1, duty 0.5, written at 25 °C, all angles and
 * temperatures NAN, collinear. */
void dk_design_request_init(dk_design_request *rq);

/*
 * dk_design_setup:
 * Make @d from @rq: data set, scheme, modes, temperature, checks (see the
 * top of this file). The waves may be incomplete (sweeps set them later).
 * Returns: DK_OK; DK_EINVAL for an inconsistent request (with the option
 * and the rule named); DK_ENOTFOUND for an unknown set or a set without an
 * axis the design needs; DK_ERANGE for a wave outside the transparency.
 */
dk_status dk_design_setup(const dk_design_request *rq, dk_design *d,
                          dk_error *err);

/*
 * dk_design_solve:
 * Find every solution and choose one (see the top of this file); the
 * design is then at its operating point.
 * Returns: DK_OK; DK_ENOROOT when nothing phase-matches (the message says
 * what was searched); the index errors.
 */
dk_status dk_design_solve(dk_design *d, dk_error *err);

/* dk_design_setup() then dk_design_solve(). */
dk_status dk_design_resolve(const dk_design_request *rq, dk_design *d,
                            dk_error *err);

/*
 * dk_design_choose:
 * Make solution @index (0-based) the operating point.
 * Returns: DK_OK or DK_EINVAL (no such solution).
 */
dk_status dk_design_choose(dk_design *d, int index, dk_error *err);

/*
 * dk_design_ncpm:
 * Noncritical phase matching: every temperature in the request's range
 * (default: the set's) at which a mode combination phase-matches along X,
 * Y or Z; the solutions replace d->sol (plane holds the axis).
 * Returns: DK_OK (d->nsol may be 0); DK_EINVAL for a set without
 * temperature dependence or a QPM design.
 */
dk_status dk_design_ncpm(dk_design *d, dk_error *err);

/*
 * dk_design_range_flags:
 * The DK_RANGE_* flags of evaluating @d's set at waves @w and @temp_c.
 */
unsigned dk_design_range_flags(const dk_design *d, const dk_waves *w,
                               double temp_c);

/*
 * dk_design_note_range:
 * Add to @notes one note per flag in @flags naming the wave, its value and
 * the set's range (e.g. "the second harmonic 0.4 um is outside the fitted
 * range 0.48-3.1 um of data set 'Umemura2007'").
 */
void dk_design_note_range(const dk_design *d, unsigned flags,
                          const dk_waves *w, double temp_c, dk_notes *notes);

/* How far flagged points of many evaluations (a sweep, a chip) went
 * beyond the fitted ranges, so that one note per wave can say it. */
typedef struct dk_range_span {
    unsigned flags;                 /* OR of the flags added */
    double lam_min[3], lam_max[3];  /* signal, idler, pump, µm */
    double t_min, t_max;            /* °C */
} dk_range_span;

void dk_range_span_init(dk_range_span *span);

/* Record one evaluation at waves @w and @temp_c with range @flags. */
void dk_range_span_add(dk_range_span *span, unsigned flags,
                       const dk_waves *w, double temp_c);

/* One note per flagged wave (and the temperature) with the span of its
 * flagged values and the set's range. */
void dk_design_note_span(const dk_design *d, const dk_range_span *span,
                         dk_notes *notes);

/*
 * dk_range_codes:
 * The flags as short codes for a CSV column ("range:idler;range:temp"),
 * empty when none. Returns @buf.
 */
char *dk_range_codes(unsigned flags, int shg, char *buf, size_t n);

/*
 * dk_range_words:
 * The flags in words for people ("idler, temperature"; SHG: "second
 * harmonic"), empty when none. Returns @buf.
 */
char *dk_range_words(unsigned flags, int shg, char *buf, size_t n);

/* The wave names of a design: "signal", "idler", "pump", or for SHG
 * "fundamental" (twice) and "second harmonic". @k: 0, 1, 2. */
const char *dk_design_wave_name(const dk_design *d, int k);

/* "QPM" or "birefringent"; "shg", "sfg", ... for processes. */
const char *dk_scheme_str(dk_scheme s);
const char *dk_process_str(dk_process p);

/*
 * dk_process_parse / dk_scheme_parse:
 * "shg", "sfg", "dfg", "opa", "opo"; "qpm", "birefringent" (or "angle").
 * Returns: DK_OK or DK_EINVAL naming the choices.
 */
dk_status dk_process_parse(const char *text, dk_process *p, dk_error *err);
dk_status dk_scheme_parse(const char *text, dk_scheme *s, dk_error *err);

/*
 * dk_design_deff:
 * |d_eff| in pm/V at the operating point (QPM: with the grating factor;
 * birefringent: from the modes' field vectors), as measured (no Miller
 * scaling). NAN when the crystal has no nonlinear data.
 */
double dk_design_deff(dk_design *d);

/* d_eff scaled to the design's wavelengths by Miller's rule. */
typedef struct dk_deff_scaled {
    double measured_pm_per_v;  /* d_eff from d as measured (= dk_design_deff) */
    double measured_um;        /* the fundamental of the measurement */
    double factor;             /* Miller factor; NAN when it cannot be
                                * computed (then scaled = measured) */
    double scaled_pm_per_v;    /* what efficiencies use */
    char why_not[160];         /* when factor is NAN: why */
} dk_deff_scaled;

/*
 * dk_design_deff_scaled:
 * d_eff at the operating point scaled from the wavelengths where d was
 * measured (SHG of the crystal file's nonlinear wavelength) to the
 * design's, by Miller's rule d ∝ χ(ω3)χ(ω1)χ(ω2), χ = n² − 1, each wave
 * in its own mode and direction (R. C. Miller, Appl. Phys. Lett. 5, 17
 * (1964); Boyd, Nonlinear Optics, 3rd ed., §1.4). When an index at the
 * measurement wavelengths is unavailable (e.g. its second harmonic lies
 * beyond the transparency), d is used as measured and why_not says so.
 * Returns: DK_OK; DK_ENOTFOUND when the crystal has no d data.
 */
dk_status dk_design_deff_scaled(dk_design *d, dk_deff_scaled *out,
                                dk_error *err);

/*
 * dk_design_input_index:
 * The index of the wave that enters the crystal (the fundamental for SHG,
 * else the pump) at the operating point; NAN on error.
 */
double dk_design_input_index(dk_design *d);

/* One data set's answer to a request (dk_design_across_sets). */
typedef struct dk_set_outcome {
    const dk_dispersion_set *set;
    dk_status status;            /* DK_OK, or why this set gave no answer */
    char message[DK_ERROR_MSG_MAX];
    dk_solved solved;
    int nsol;
    dk_solution sol;             /* the solution chosen */
    double value;                /* the compared quantity (below) */
    int in_spread;               /* 0 when left out of the spread */
    dk_notes notes;              /* this set's notes */
} dk_set_outcome;

/* How far the sets disagree. */
typedef struct dk_spread {
    const char *quantity;        /* "period_um", "temperature_C",
                                  * "idler_um", "theta_deg" or "phi_deg" */
    int n;                       /* sets compared */
    double lo, hi, spread;       /* spread = hi − lo (0 when n < 2) */
} dk_spread;

/*
 * dk_design_across_sets:
 * Resolve @rq with every data set of its crystal and compare the solved
 * quantity (QPM period, phase-matching temperature, idler wavelength, or
 * the phase-matching angle of the solution each set chooses). A set left
 * out of the spread says why in its notes: it gave no answer, it has no
 * temperature dependence and would be held at another temperature than
 * the others, or it chose another mode combination or plane than the
 * first set.
 * @out: up to @max outcomes (one per set), @n how many.
 * Returns: DK_OK (even when some sets failed); DK_ENOROOT when none
 * answered (the first set's message); DK_EINVAL for a bad request.
 */
dk_status dk_design_across_sets(const dk_design_request *rq,
                                dk_set_outcome *out, int max, int *n,
                                dk_spread *spread, dk_error *err);

#endif /* DK_DESIGN_H */

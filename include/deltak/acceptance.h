/*
 * acceptance.h - the full width at half maximum of the phase-matching
 * curve sinc²(ΔkL/2) along one parameter, exact and first-order.
 *
 * sinc²(u) = (sin u / u)² falls to ½ at u = 1.39155737825 (the root of
 * sin u / u = 1/√2). With Δk(x) known, the half-maximum points are the
 * roots of |Δk(x)|·L/2 = 1.39156 on either side of the peak, found by
 * stepping outward and refining with Brent's method; this is valid also
 * where dΔk/dx vanishes (noncritical phase matching, group-velocity-
 * matched points, turning points). Beside it:
 *   linear estimate     Δx = 2·2.78311 / (L |Δk'|)
 *   quadratic estimate  Δx = 2·√(2·2.78311 / (L |Δk''|))  (noncritical)
 *
 * Broad and turning-over curves. The outward search runs to the ends of
 * the domain the caller gives (for a design: the transparency, the whole
 * range of angles); a side on which sinc² never falls to ½ before that
 * end is reported "open" with the end as its edge, an answer rather than
 * a failure. dk_acceptance_lobes() then samples the whole domain and
 * finds every interval where sinc² ≥ ½ (a second phase-matching point,
 * a Δk that turns over before it reaches the half level). Intervals
 * separated from the central one by a gap narrower than the band they
 * join form one double-humped band, whose outer FWHM is given beside the
 * central lobe's; farther ones are other phase-matching points (e.g. the
 * signal and idler trading places), listed but not counted in the width.
 * Reference: R. W. Boyd, Nonlinear Optics, 3rd ed. (2008), §2.2–2.3;
 * Dmitriev et al., Handbook of Nonlinear Optical Crystals (1999), §1.3.
 */
#ifndef DK_ACCEPTANCE_H
#define DK_ACCEPTANCE_H

#include "deltak/roots.h"
#include "deltak/status.h"

#define DK_SINC2_HALF_U 1.3915573782515103 /* sinc²(u) = 1/2 */

typedef struct dk_acceptance {
    double peak;           /* x where Δk = 0 (the operating point) */
    double lo, hi;         /* x where sinc² = 1/2 */
    double fwhm;           /* hi − lo (INFINITY when unbounded) */
    double linear_fwhm;    /* first-order estimate; INFINITY if Δk' = 0 */
    double quadratic_fwhm; /* second-order estimate; INFINITY if Δk'' = 0 */
    double slope;          /* dΔk/dx at the peak, rad/µm per unit x */
    int bounded;           /* 1 when both half-maximum points were found */
    int open_lo, open_hi;  /* 1: sinc² stays above ½ to the end of the
                            * domain on that side (lo/hi hold that end;
                            * fwhm is then a lower bound) */
} dk_acceptance;

#define DK_ACCEPTANCE_MAX_LOBES 16

/* Every interval of a domain where sinc²(ΔkL/2) ≥ ½. */
typedef struct dk_acceptance_lobes {
    int n;                               /* intervals found, ≤ MAX_LOBES */
    int central;                         /* index of the one holding the
                                          * operating point; -1: none */
    double lo[DK_ACCEPTANCE_MAX_LOBES];  /* ascending, disjoint */
    double hi[DK_ACCEPTANCE_MAX_LOBES];
    int open_lo, open_hi;                /* the first / last interval
                                          * reaches the domain's end */
    int group_first, group_last;         /* the central interval and the
                                          * neighbours joined to it: each
                                          * gap narrower than the band
                                          * joined so far (a double hump,
                                          * not a distant second phase-
                                          * matching point) */
    double outer_lo, outer_hi;           /* lo[group_first], hi[group_last] */
    double outer_fwhm;                   /* outer_hi − outer_lo: the width
                                          * between the outermost half-
                                          * maximum points of the group */
    int contiguous;                      /* 1: the group is one interval */
    int truncated;                       /* more than MAX_LOBES intervals */
} dk_acceptance_lobes;

/* sinc x = sin x / x, with its limit 1 at x = 0 (series below 1e-4). */
double dk_sinc(double x);

/* sinc²(Δk L / 2) for Δk in rad/µm and L in µm. */
double dk_sinc2(double dk_rad_per_um, double length_um);

/*
 * dk_acceptance_fwhm:
 * @dk: Δk(x) in rad/µm (NAN where undefined)
 * @x0: the operating point; Δk(x0) should be (near) zero: the peak is
 *   first refined to the zero of Δk within ±@step of @x0 when one is there
 * @length_um: crystal length in µm, > 0
 * @step: a small natural step of x for derivatives and the outward search
 * @xmin, @xmax: the search never leaves [xmin, xmax]
 *
 * Returns: DK_OK (out->bounded = 0 and open_lo/open_hi set when sinc²
 * stays above ½ to a search limit, or to where Δk stops being defined;
 * lo/hi then hold that limit); DK_EINVAL for a bad length or step; DK_EDOM when
 * Δk is not finite at x0.
 */
dk_status dk_acceptance_fwhm(dk_scalar_fn dk, void *params, double x0,
                             double length_um, double step, double xmin,
                             double xmax, dk_acceptance *out, dk_error *err);

/*
 * dk_acceptance_per_length:
 * The acceptance as a product with the crystal length, the figure a
 * crystal is quoted by: FWHM × L for a critical width (the first-order
 * estimate holds: width ∝ 1/L), FWHM × √L for a noncritical one (Δk' = 0:
 * width ∝ 1/√L). The exact width counts as critical when its first-order
 * estimate lies within 20 % of it (common practice). @length_cm > 0;
 * *@sqrt_law (may be NULL) is set to 1 for the √L product.
 * Returns: the product (NAN for a bad length or width).
 */
double dk_acceptance_per_length(const dk_acceptance *a, double length_cm,
                                int *sqrt_law);

/*
 * dk_interval_thz:
 * The frequency width in THz of the wavelength interval [@lo_um, @hi_um]
 * (either order): c |1/lo − 1/hi|. NAN unless both are positive.
 */
double dk_interval_thz(double lo_um, double hi_um);

/*
 * dk_acceptance_lobes:
 * Every interval of [@xmin, @xmax] in which sinc²(Δk(x) L/2) ≥ ½: the
 * domain is sampled at @nsamples points (≥ 16), each change of side is
 * refined with Brent's method, each sign change of Δk between two samples
 * that are both outside is refined to its root and the interval around it
 * found (a narrow lobe between samples). Points where Δk is NAN split the
 * domain. @central is the acceptance of dk_acceptance_fwhm() over the
 * same domain (or NULL): its interval replaces the sampled one, so the
 * central lobe is exact however narrow.
 * Returns: DK_OK (out->n may be 0); DK_EINVAL for a bad length, domain or
 * sample count.
 */
dk_status dk_acceptance_lobes_scan(dk_scalar_fn dk, void *params,
                                   double length_um, double xmin, double xmax,
                                   int nsamples, const dk_acceptance *central,
                                   dk_acceptance_lobes *out, dk_error *err);

#endif /* DK_ACCEPTANCE_H */

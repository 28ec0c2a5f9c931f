/*
 * plot_ticks.c - tick positions at 1-2-5 steps and their labels.
 *
 * Method: the candidate steps m·10^k (m = 1, 2, 5) are tried from well
 * below (hi − lo)/max_ticks upwards; the first that puts at most
 * max_ticks multiples of itself into [lo, hi] (ends included within
 * 1e-9 of a step) wins. This is the 1-2-5 family of Heckbert's "nice
 * numbers", chosen by count rather than by rounding the range, so that an
 * axis of fixed range (a tuning curve drawn edge to edge) gets as many
 * ticks as fit. Tick k is computed as (k·m)/10^-k' when the exponent is
 * negative, so that it is the double nearest the decimal value.
 *
 * Labels: as many decimals as the step needs ("0.5", "28", "0.05"), a
 * true minus sign (U+2212), and m×10^k in markup when the step is ≥ 1e5
 * or < 1e-4.
 *
 * Logarithmic axes: ticks at the decades, every first, second, third,
 * fifth or tenth of them so that at most max_ticks fall inside; when
 * fewer than two decades lie inside, at 1, 2 and 5 times the powers of
 * ten (or, failing two of those, at linear 1-2-5 ticks). Labels are plain
 * decimals from 0.001 up to 10^4 and 10^k beyond (common practice).
 *
 * References:
 *   P. S. Heckbert, "Nice numbers for graph labels", in A. S. Glassner
 *   (ed.), Graphics Gems, Academic Press (1990), pp. 61-63.
 */
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "plot_internal.h"

#define EDGE_TOL 1e-9      /* in steps: a tick this close to an end counts */
#define SCI_ABOVE 1e5      /* steps from here on use m×10^k labels */
#define SCI_BELOW 1e-4     /* and below here */

/* 10^e as the exact double for |e| ≤ 22. */
static double
pow10i(int e)
{
    double r = 1;
    for (int i = 0; i < (e < 0 ? -e : e); i++)
        r *= 10;
    return e < 0 ? 1 / r : r;
}

/* Tick k of step m·10^e, as near the decimal value as a double gets. */
static double
tick_value(double k, int m, int e)
{
    return e < 0 ? k * m / pow10i(-e) : k * m * pow10i(e);
}

dk_status
dk_plot_nice_ticks(double lo, double hi, int max_ticks, double *ticks,
                   int *n, double *step, dk_error *err)
{
    if (!(isfinite(lo) && isfinite(hi) && lo < hi))
        return dk_error_set(err, DK_EINVAL,
                            "tick range %g..%g must be finite with low < high",
                            lo, hi);
    if (!(hi - lo > 1e-12 * fmax(fabs(lo), fabs(hi))))
        return dk_error_set(err, DK_EINVAL,
                            "tick range %.17g..%.17g is too narrow for its "
                            "magnitude",
                            lo, hi);
    if (max_ticks < 2 || max_ticks > DK_PLOT_MAX_TICKS)
        return dk_error_set(err, DK_EINVAL, "tick count %d must lie in 2-%d",
                            max_ticks, DK_PLOT_MAX_TICKS);
    static const int mant[3] = {1, 2, 5};
    int e = (int)floor(log10((hi - lo) / max_ticks)) - 1;
    for (;; e++) {
        for (int i = 0; i < 3; i++) {
            double s = mant[i] * pow10i(e);
            double k0 = ceil(lo / s - EDGE_TOL), k1 = floor(hi / s + EDGE_TOL);
            if (k1 - k0 + 1 > max_ticks)
                continue;
            *n = 0;
            for (double k = k0; k <= k1; k++) {
                double t = tick_value(k, mant[i], e);
                ticks[(*n)++] = t == 0 ? 0.0 : t; /* no -0 */
            }
            if (step)
                *step = tick_value(1, mant[i], e);
            return DK_OK;
        }
    }
}

/* Decimals a label needs on an axis of step @step (0 for step ≥ 1). */
static int
decimals_for(double step)
{
    int d = (int)ceil(-log10(step) - 1e-9);
    return d < 0 ? 0 : d;
}

/* Write "−" for negatives (U+2212 MINUS SIGN, common typographic
 * practice) and return the rest of the buffer. */
static size_t
put_sign(double v, char *buf, size_t size)
{
    if (v < 0 && size > 3) {
        memcpy(buf, "\xe2\x88\x92", 3);
        buf[3] = '\0';
        return 3;
    }
    return 0;
}

void
plot_tick_label(double v, double step, char *buf, size_t size)
{
    if (fabs(v) < step * 1e-6) {
        snprintf(buf, size, "0");
        return;
    }
    size_t o = put_sign(v, buf, size);
    double a = fabs(v);
    if (step >= SCI_ABOVE || step < SCI_BELOW) {
        int k = (int)floor(log10(a) + 1e-9);
        double m = a / pow10i(k);
        int d = k - (int)floor(log10(step) + 1e-9);
        if (d < 0)
            d = 0;
        char mbuf[32];
        snprintf(mbuf, sizeof mbuf, "%.*f", d, m);
        const char *ksign = k < 0 ? "\xe2\x88\x92" : "";
        if (strcmp(mbuf, "1") == 0)
            snprintf(buf + o, size - o, "10<sup>%s%d</sup>", ksign, abs(k));
        else
            snprintf(buf + o, size - o, "%s\xc3\x97" "10<sup>%s%d</sup>",
                     mbuf, ksign, abs(k));
        return;
    }
    snprintf(buf + o, size - o, "%.*f", decimals_for(step), a);
}

/* Whole powers of ten k·stride within [a, b] (decade exponents). */
static int
decade_ticks(double a, double b, int stride, double *ticks, int max)
{
    int k0 = (int)ceil(a / stride - 1e-9), k1 = (int)floor(b / stride + 1e-9);
    int n = 0;
    for (int k = k0; k <= k1 && n < max; k++)
        ticks[n++] = pow10i(k * stride);
    return k1 - k0 + 1;
}

int
plot_log_ticks(double lo, double hi, int max, double *ticks, int *n,
               double *step_decades)
{
    double a = log10(lo), b = log10(hi);
    static const int strides[] = {1, 2, 3, 5, 10, 20, 50, 100};
    for (size_t i = 0; i < sizeof strides / sizeof strides[0]; i++) {
        int count = decade_ticks(a, b, strides[i], ticks, DK_PLOT_MAX_TICKS);
        if (count < 2)
            break;
        if (count <= max) {
            *n = count;
            *step_decades = strides[i];
            return 0;
        }
    }
    /* Less than two decades: 1, 2, 5 × 10^k, thinned to 1 and 5, then
     * to the 1s. */
    static const int sets[3][3] = {{1, 2, 5}, {1, 5, 0}, {1, 0, 0}};
    for (int s = 0; s < 3; s++) {
        int cnt = 0;
        for (int k = (int)floor(a) - 1; k <= (int)ceil(b) + 1; k++)
            for (int m = 0; m < 3 && sets[s][m]; m++) {
                double v = sets[s][m] * pow10i(k);
                if (v >= lo * (1 - 1e-9) && v <= hi * (1 + 1e-9) &&
                    cnt < DK_PLOT_MAX_TICKS)
                    ticks[cnt++] = v;
            }
        if (cnt >= 2 && cnt <= max) {
            *n = cnt;
            *step_decades = 0;
            return 0;
        }
    }
    double step;
    dk_error err = {0};
    if (dk_plot_nice_ticks(lo, hi, max, ticks, n, &step, &err))
        return -1;
    *step_decades = -step; /* negative: a linear step */
    return 0;
}

void
plot_log_tick_label(double v, char *buf, size_t size)
{
    if (v >= 1e-3 && v < 1e4) {
        int k = (int)floor(log10(v) + 1e-9);
        int d = k < 0 ? -k : 0;
        double m = v / pow10i(k);
        if (fabs(m - round(m)) > 1e-6) /* e.g. 0.25 on a short axis */
            d++;
        snprintf(buf, size, "%.*f", d, v);
        return;
    }
    int k = (int)floor(log10(v) + 1e-9);
    double m = v / pow10i(k);
    const char *ksign = k < 0 ? "\xe2\x88\x92" : "";
    if (fabs(m - 1) < 1e-6)
        snprintf(buf, size, "10<sup>%s%d</sup>", ksign, abs(k));
    else
        snprintf(buf, size, "%.3g\xc3\x97" "10<sup>%s%d</sup>", m, ksign,
                 abs(k));
}

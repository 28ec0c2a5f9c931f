#!/usr/bin/python3
"""reference.py - the two benchmark jobs of `make bench` done the way a
user would do them with NumPy and SciPy, to compare speeds (never run by
`make check`; it asserts nothing).

Physics (the same model deltak evaluates):
  MgO:LiNbO3, extraordinary index of O. Gayer, Z. Sacks, E. Galun, A. Arie,
  Appl. Phys. B 91, 343-348 (2008), Table 1 (coefficients as printed), for
  all three waves (type 0, zzz);
  QPM mismatch  dk = |2 pi (np/lp - ns/ls - ni/li)| - 2 pi / period(T),
  period(T) = period_25 * e(T)/e(25 C), e(T) = 1 + a (T-25) + b (T-25)^2
  along X (Y. S. Kim, R. T. Smith, J. Appl. Phys. 40, 4637 (1969));
  sinc^2(dk L / 2).

Jobs:
  map    1000 x 1000 cells: pump 1.05-1.08 um x temperature 20-200 C,
         signal 1550 nm held, period 30.5 um, L = 20 mm (NumPy, broadcast)
  curve  idler vs period 28-32 um, 10^4 points, pump 1064 nm, 100 C: one
         scipy.optimize.brentq per point on the signal share (plain loop)

Prints one line per job: "<job> <seconds per run> <checksum>".
"""
import math
import sys
import time

try:
    import numpy as np
    from scipy.optimize import brentq
except ImportError as e:  # the bench says so and goes on
    print("missing %s" % e.name)
    sys.exit(3)

# Gayer et al. 2008, extraordinary index of 5% MgO:CLN
A1, A2, A3, A4, A5, A6 = 5.756, 0.0983, 0.2020, 189.32, 12.52, 1.32e-2
B1, B2, B3, B4 = 2.860e-6, 4.700e-8, 6.113e-8, 1.516e-4
ALPHA, BETA = 1.54e-5, 5.3e-9      # Kim & Smith 1969, X axis


def f_of(t):
    return (t - 24.5) * (t + 570.82)


def n_e(lam, t):
    """n(lam, T); lam and T broadcast (NumPy) or plain floats."""
    f = f_of(t)
    l2 = lam * lam
    n2 = (A1 + B1 * f + (A2 + B2 * f) / (l2 - (A3 + B3 * f) ** 2)
          + (A4 + B4 * f) / (l2 - A5 * A5) - A6 * l2)
    return np.sqrt(n2)


def expansion(t):
    d = t - 25.0
    return 1 + ALPHA * d + BETA * d * d


def job_map(nx=1000, ny=1000):
    pump = np.linspace(1.05, 1.08, nx)[None, :]
    temp = np.linspace(20.0, 200.0, ny)[:, None]
    signal = 1.55
    idler = 1 / (1 / pump - 1 / signal)
    mat = 2 * np.pi * (n_e(pump, temp) / pump - n_e(signal, temp) / signal
                       - n_e(idler, temp) / idler)
    grating = 2 * np.pi / (30.5 * expansion(temp) / expansion(25.0))
    dk = np.abs(mat) - grating
    x = 0.5 * dk * 20e3
    return np.sinc(x / np.pi) ** 2


def n_scalar(lam, t):
    f = f_of(t)
    l2 = lam * lam
    a3 = A3 + B3 * f
    return math.sqrt(A1 + B1 * f + (A2 + B2 * f) / (l2 - a3 * a3)
                     + (A4 + B4 * f) / (l2 - A5 * A5) - A6 * l2)


def job_curve(n=10000, temp=100.0, pump=1.064):
    periods = np.linspace(28.0, 32.0, n)
    npump = n_scalar(pump, temp) / pump
    scale = expansion(temp) / expansion(25.0)
    hi = 1 - pump / 5.0                  # idler at the transparency edge
    out = np.full(n, np.nan)
    for k, period in enumerate(periods):
        kg = 1 / (period * scale)

        def dk(x):
            ls, li = pump / x, pump / (1 - x)
            return abs(npump - n_scalar(ls, temp) / ls
                       - n_scalar(li, temp) / li) - kg
        a, b = 0.5, hi
        if dk(a) * dk(b) < 0:
            x = brentq(dk, a, b, xtol=1e-13)
            out[k] = pump / (1 - x)
    return out


def best(fn, runs):
    t = []
    for _ in range(runs):
        t0 = time.perf_counter()
        r = fn()
        t.append(time.perf_counter() - t0)
    return min(t), r


def main():
    jobs = sys.argv[1:] or ["map", "curve"]
    if "map" in jobs:
        t, z = best(job_map, 5)
        print("map %.6f %.9f" % (t, float(np.nansum(z))))
    if "curve" in jobs:
        t, y = best(job_curve, 3)
        print("curve %.6f %.9f" % (t, float(np.nansum(y))))


if __name__ == "__main__":
    main()

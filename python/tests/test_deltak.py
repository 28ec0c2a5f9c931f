"""Tests of the Python module (python/deltak), run by `make check` with
/usr/bin/python3 against the build tree and against a temporary install.

Environment: DELTAK_PROGRAM, the `deltak` program built from the same
sources (answers must match it byte for byte); DELTAK_EXPECT_LIBRARY,
when set, the library file the module must have loaded (the install
test sets it to PREFIX/lib/libdeltak.so.0).

Checks against the outside world name their source: an independent
implementation, here in plain Python, of the published dispersion
formulas with the coefficients of the public-domain refractiveindex.info
dataset (M. N. Polyanskiy, Sci. Data 11, 94 (2024)), formula 2:
n^2 - 1 = sum_i B_i lambda^2 / (lambda^2 - C_i).
"""
import json
import math
import os
import subprocess
import sys
import unittest

import deltak

PROGRAM = os.environ.get("DELTAK_PROGRAM")

# MgO:LiNbO3 (5 mol.% MgO), D. E. Zelmon, D. L. Small, D. Jundt, J. Opt.
# Soc. Am. B 14, 3319 (1997), 21 C; refractiveindex.info
# MgO-LiNbO3/nk/Zelmon-{o,e}.yml (o and e as that dataset gives them).
ZELMON_MGLN = {
    "o": (2.4272, 0.01478, 1.4617, 0.05612, 9.6536, 371.216),
    "e": (2.2454, 0.01242, 1.3005, 0.05313, 6.8972, 331.33),
}
# beta-BaB2O4, G. Tamosauskas et al., Opt. Mater. Express 8, 1410 (2018),
# room temperature; refractiveindex.info BaB2O4/nk/Tamosauskas-{o,e}.yml.
TAMOSAUSKAS_BBO = {
    "o": (0.90291, 0.003926, 0.83155, 0.018786, 0.76536, 60.01),
    "e": (1.151075, 0.007142, 0.21803, 0.02259, 0.656, 263.0),
}
C_MM_PER_FS = 299792458e3 * 1e-15   # speed of light, mm/fs


def formula2(coef, lam):
    s = 1.0
    for b, c in zip(coef[0::2], coef[1::2]):
        s += b * lam * lam / (lam * lam - c)
    return math.sqrt(s)


def group_index(n_of, lam, h=1e-4):
    """n - lambda dn/dlambda by a central difference."""
    return n_of(lam) - lam * (n_of(lam + h) - n_of(lam - h)) / (2 * h)


def program_json(*argv):
    out = subprocess.run([PROGRAM] + list(argv) + ["--json"],
                         capture_output=True, check=True).stdout
    return json.loads(out)


def tolist(a):
    return a.tolist() if hasattr(a, "tolist") else list(a)


class Library(unittest.TestCase):
    def test_library_found(self):
        self.assertTrue(os.path.exists(deltak.library_path),
                        deltak.library_path)
        expect = os.environ.get("DELTAK_EXPECT_LIBRARY")
        if expect:
            self.assertEqual(os.path.realpath(deltak.library_path),
                             os.path.realpath(expect))

    def test_commands(self):
        names = deltak.command_names()
        for c in ("index", "period", "angle", "tolerance", "pulse", "sweep"):
            self.assertIn(c, names)

    def test_bad_library_path_is_named(self):
        env = dict(os.environ, DELTAK_LIBRARY="/nonexistent/libdeltak.so.0")
        r = subprocess.run([sys.executable, "-c", "import deltak"],
                           env=env, capture_output=True, text=True)
        self.assertNotEqual(r.returncode, 0)
        self.assertIn("/nonexistent/libdeltak.so.0", r.stderr)
        self.assertIn("DELTAK_LIBRARY", r.stderr)

    def test_version_matches_program(self):
        if not PROGRAM:
            self.skipTest("DELTAK_PROGRAM not set")
        out = subprocess.run([PROGRAM, "--version"], capture_output=True,
                             text=True, check=True).stdout
        self.assertEqual(out.strip(), "deltak " + deltak.__version__)


@unittest.skipUnless(PROGRAM, "DELTAK_PROGRAM not set")
class SameAsProgram(unittest.TestCase):
    """The module answers exactly what the program answers."""

    CASES = [
        ("index", dict(crystal="MgO:LN", wavelength="1064nm", temp=40)),
        ("period", dict(crystal="MgO:LN", pump="1064nm", idler="3.4um",
                        temp=40)),
        ("period", dict(crystal="MgO:LN", pump="1064nm", idler="3.4um",
                        period="30.5um")),
        ("angle", dict(crystal="BBO", fundamental="1030nm", type="I")),
        ("tolerance", dict(crystal="MgO:LN", pump="1064nm", idler="3.4um",
                           period="30.5um", length="20mm")),
        ("pulse", dict(crystal="BBO", pump="800nm", signal="1300nm",
                       type="I", duration="30fs")),
        ("gain", dict(crystal="BBO", pump="800nm", signal="1300nm",
                      type="I", length="3mm", intensity="50GW/cm2")),
        ("chip", dict(crystal="MgO:LN", pump="1064nm",
                      idler_range="2.8um:4.2um", oven="30:200")),
    ]

    def test_same_answers(self):
        for command, opts in self.CASES:
            with self.subTest(command=command, **opts):
                argv = [command]
                for k, v in opts.items():
                    argv += ["--" + k.replace("_", "-"), str(v)]
                self.assertEqual(deltak.query(command, **opts),
                                 program_json(*argv))

    def test_same_sweep(self):
        t = deltak.sweep("MgO:LN", pump="1064nm", vary="period=28um:32um:9",
                         solve="idler", temp=40)
        out = subprocess.run([PROGRAM, "sweep", "--crystal", "MgO:LN",
                              "--pump", "1064nm", "--vary",
                              "period=28um:32um:9", "--solve", "idler",
                              "--temp", "40", "--csv"],
                             capture_output=True, text=True,
                             check=True).stdout.splitlines()
        self.assertEqual(t.columns, out[0].split(","))
        idler = [float(line.split(",")[1]) for line in out[1:]]
        self.assertEqual(tolist(t["idler_um"]), idler)


class Errors(unittest.TestCase):
    def test_bare_number_is_bad_input(self):
        with self.assertRaises(deltak.DeltakError) as cm:
            deltak.index("MgO:LN", 1064)
        self.assertEqual(cm.exception.exit_code, 2)
        self.assertIn("has no unit", cm.exception.message)
        self.assertIn("1064nm", cm.exception.message)

    def test_unknown_crystal_suggests(self):
        with self.assertRaises(deltak.DeltakError) as cm:
            deltak.index("MgO:LNN", "1um")
        self.assertEqual(cm.exception.exit_code, 1)
        self.assertIn("did you mean 'MgO:LN'", cm.exception.message)

    def test_no_solution(self):
        with self.assertRaises(deltak.DeltakError) as cm:
            deltak.period("MgO:LN", pump="1064nm", idler="3.4um",
                          period="20um")
        self.assertEqual(cm.exception.exit_code, 1)
        self.assertIn("no phase-matching temperature", cm.exception.message)

    def test_opaque(self):
        with self.assertRaises(deltak.DeltakError) as cm:
            deltak.index("MgO:LN", "8um")
        self.assertEqual(cm.exception.exit_code, 1)
        self.assertIn("transparency", cm.exception.message)

    def test_unknown_option(self):
        with self.assertRaises(deltak.DeltakError) as cm:
            deltak.index("MgO:LN", "1um", tmep=40)
        self.assertEqual(cm.exception.exit_code, 2)
        self.assertIn("did you mean '--temp'", cm.exception.message)

    def test_mismatched_lengths(self):
        with self.assertRaises(ValueError):
            deltak.index("BBO", deltak.nm([800, 900]), temp=[20, 30, 40])

    def test_warnings_kept(self):
        a = deltak.index("MgO:LN", "4.5um", dispersion="Gayer2008")
        self.assertTrue(any("fitted range" in w for w in a.warnings))

    def test_attribute_error_lists_keys(self):
        a = deltak.index("BBO", "1um")
        with self.assertRaises(AttributeError) as cm:
            a.nonsense
        self.assertIn("wavelength_um", str(cm.exception))


class Arrays(unittest.TestCase):
    def test_index_over_wavelengths(self):
        waves = deltak.nm([800, 1064, 1550])
        a = deltak.index("MgO:LN", waves, temp=40)
        self.assertEqual(tolist(a.wavelength_um), [0.8, 1.064, 1.55])
        self.assertEqual(a.crystal, "MgO:LiNbO3")
        for i, w in enumerate(waves):
            one = deltak.index("MgO:LN", w, temp=40)
            for ax, ax1 in zip(a.axes, one.axes):
                self.assertEqual(ax["axis"], ax1["axis"])
                self.assertEqual(tolist(ax["n"])[i], ax1["n"])
                self.assertEqual(tolist(ax["gvd_fs2_per_mm"])[i],
                                 ax1["gvd_fs2_per_mm"])

    def test_period_over_temperatures(self):
        temps = [30, 60, 90]
        p = deltak.period("MgO:LN", pump="1064nm", idler="3.4um", temp=temps)
        self.assertEqual(tolist(p.temperature_C), temps)
        periods = tolist(p.period_um)
        # MgO:LN's indices rise with temperature, so the period for a
        # fixed process falls (Gayer et al., Appl. Phys. B 91, 343 (2008)).
        self.assertTrue(periods[0] > periods[1] > periods[2])

    def test_refractive_index(self):
        n = deltak.refractive_index("BBO", "1064nm", "o", temp=20)
        self.assertIsInstance(n, float)
        ns = deltak.refractive_index("BBO", deltak.um([0.8, 1.064]), "o",
                                     temp=20)
        self.assertEqual(tolist(ns)[1], n)
        with self.assertRaises(deltak.DeltakError):
            deltak.refractive_index("BBO", "1064nm", "X")

    def test_map_grid(self):
        m = deltak.sweep("MgO:LN", signal="1550nm", period="30.5um",
                         vary="pump=1.05um:1.08um:3", map="temp=20:200:4",
                         length="20mm")
        x, y, z = m.grid("sinc2")
        self.assertEqual(len(tolist(x)), 3)
        self.assertEqual(len(tolist(y)), 4)
        self.assertEqual(len(tolist(z)), 4)
        for row in tolist(z):
            for v in row:
                self.assertTrue(0 <= v <= 1)

    def test_units(self):
        self.assertEqual(deltak.nm(1064), "1064nm")
        self.assertEqual(deltak.um(3.4), "3.4um")
        self.assertEqual(deltak.mm([10, 20.5]), ["10mm", "20.5mm"])
        self.assertEqual(deltak.wavenumber(9398), "9398cm-1")

    def test_without_numpy(self):
        code = ("import sys; sys.modules['numpy'] = None\n"
                "import deltak\n"
                "assert not deltak.HAVE_NUMPY\n"
                "a = deltak.index('BBO', deltak.nm([800, 1064]), temp=20)\n"
                "assert isinstance(a.axes[0]['n'], list), a\n"
                "t = deltak.sweep('MgO:LN', pump='1064nm', "
                "vary='period=28um:32um:5', solve='idler', temp=40)\n"
                "assert isinstance(t['idler_um'], list)\n"
                "print('ok')\n")
        r = subprocess.run([sys.executable, "-c", code], capture_output=True,
                           text=True, env=os.environ)
        self.assertEqual(r.returncode, 0, r.stderr)
        self.assertEqual(r.stdout.strip(), "ok")


class Witnesses(unittest.TestCase):
    """Numbers against an independent implementation (see the top)."""

    def test_mgln_zelmon_indices(self):
        # The Zelmon 1997 set holds at 21 C (no temperature dependence).
        for lam in (1.064, 1.55, 3.4):
            a = deltak.index("MgO:LN", deltak.um(lam), temp=21,
                             dispersion="Zelmon1997")
            for ax in a.axes:
                coef = ZELMON_MGLN[ax["axis"]]
                with self.subTest(axis=ax["axis"], lam=lam):
                    self.assertAlmostEqual(ax["n"], formula2(coef, lam),
                                           delta=1e-9)
                    self.assertAlmostEqual(
                        ax["group_index"],
                        group_index(lambda l: formula2(coef, l), lam),
                        delta=1e-7)

    def test_bbo_shg_angle_and_gvm(self):
        # Type-I (o o -> e) SHG of 800 nm in BBO at 20 C: the phase-matching
        # angle from n_e(theta, 400 nm) = n_o(800 nm), and the GVM
        # 1/v_g(800) - 1/v_g(400) from group indices along the wave vector.
        def n_o(l):
            return formula2(TAMOSAUSKAS_BBO["o"], l)

        def n_e(l, th):
            no, ne = n_o(l), formula2(TAMOSAUSKAS_BBO["e"], l)
            return 1 / math.sqrt(math.cos(th) ** 2 / no ** 2 +
                                 math.sin(th) ** 2 / ne ** 2)

        lo, hi = 0.0, math.pi / 2
        for _ in range(100):
            mid = (lo + hi) / 2
            lo, hi = (mid, hi) if n_e(0.4, mid) > n_o(0.8) else (lo, mid)
        theta = (lo + hi) / 2
        gvm = (group_index(n_o, 0.8) -
               group_index(lambda l: n_e(l, theta), 0.4)) / C_MM_PER_FS
        p = deltak.pulse("BBO", fundamental="800nm", type="I", temp=20)
        self.assertAlmostEqual(p.theta_deg, math.degrees(theta), delta=1e-6)
        self.assertAlmostEqual(p.gvm_fs_per_mm.signal_pump, gvm, delta=1e-3)
        a = deltak.angle("BBO", fundamental="800nm", type="I", temp=20)
        self.assertAlmostEqual(a.solutions[0].theta_deg,
                               math.degrees(theta), delta=1e-6)


if __name__ == "__main__":
    unittest.main()

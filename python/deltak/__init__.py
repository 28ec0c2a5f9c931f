"""deltak from Python: phase-matching design for nonlinear frequency
conversion, with the answers, units and errors of the `deltak` program.

Every function runs a deltak command inside this process (through
libdeltak.so and ctypes, no compiled extension) and returns its JSON
answer as Python objects: dicts with the program's stable keys (units in
the key names: wavelengths in um, temperatures in C, GVM in fs/mm), also
readable as attributes. A command that fails raises DeltakError with the
program's message and exit code (1: no solution or a failed computation,
2: bad usage or input).

Inputs are the program's: wavelengths, lengths, periods and durations
carry a unit ("1064nm", "3.4um", "20mm", "30fs"; the helpers nm(), um(),
mm(), fs() write them), temperatures are in C. A bare number where a
unit is needed is an error, as on the command line.

Give a list or array for one argument (or several of equal length) and
the command runs once per value; the answer has the same keys with
arrays at the leaves (NumPy arrays when numpy is importable, else
lists):

    >>> import deltak
    >>> deltak.index("MgO:LN", "1064nm", temp=40).axes[1].n
    >>> deltak.period("MgO:LN", pump="1064nm", idler="3.4um", temp=[30, 60, 90]).period_um
    >>> deltak.pulse("BBO", pump="800nm", signal="1300nm", type="I").gvm_fs_per_mm
    >>> t = deltak.sweep("MgO:LN", pump="1064nm", vary="period=28um:32um", solve="idler", temp=40)
    >>> t["period_um"], t["idler_um"]

Keyword names are the program's options with '_' for '-'
(all_sets=True is --all-sets); True gives a flag, None or False leaves
it out. `deltak --help` and `man deltak` describe every option.

Laser safety: the systems these designs are for are Class 3B/4 lasers;
local laser-safety rules and the site's laser safety officer take
precedence over anything this module returns.
"""
import csv
import io
import json as _json
import os
from concurrent.futures import ThreadPoolExecutor

try:
    import numpy as _np
except ImportError:  # the module works without numpy: arrays are lists
    _np = None

from ._lib import DeltakError, call as _call, command_names, library_path

__version__ = "0.1.0"
HAVE_NUMPY = _np is not None

__all__ = [
    "DeltakError", "Answer", "Table", "run", "query", "crystals", "index",
    "refractive_index", "period", "angle", "tolerance", "pulse", "gain",
    "chip", "sweep", "nm", "um", "mm", "fs", "thz", "wavenumber",
    "command_names", "library_path", "HAVE_NUMPY",
]


# --- answers --------------------------------------------------------------

class Answer(dict):
    """A JSON answer: a dict whose keys also read as attributes
    (ans.period_um is ans["period_um"])."""

    def __getattr__(self, name):
        try:
            return self[name]
        except KeyError:
            raise AttributeError(
                "no '%s' in this answer; its keys are: %s"
                % (name, ", ".join(self.keys()))) from None

    def __dir__(self):
        return list(self.keys()) + list(super().__dir__())


class Table(dict):
    """Columns of a CSV answer (sweep): name (with its unit, as in the
    CSV header) -> array. Text columns (flags) are lists of str.
    `warnings` holds the program's warnings."""

    def __init__(self, columns, order, warnings):
        super().__init__(columns)
        self.columns = order
        self.warnings = warnings

    def __getattr__(self, name):
        try:
            return self[name]
        except KeyError:
            raise AttributeError(
                "no column '%s'; the columns are: %s"
                % (name, ", ".join(self.columns))) from None

    def grid(self, z):
        """A map (sweep with map=...) as (x, y, Z): the distinct values
        of the first two columns and Z[j][i] = z at (x[i], y[j])."""
        xs_name, ys_name = self.columns[0], self.columns[1]
        xs = sorted(set(_tolist(self[xs_name])))
        ys = sorted(set(_tolist(self[ys_name])))
        xi = {v: i for i, v in enumerate(xs)}
        yi = {v: j for j, v in enumerate(ys)}
        zz = [[float("nan")] * len(xs) for _ in ys]
        for x, y, v in zip(_tolist(self[xs_name]), _tolist(self[ys_name]),
                           _tolist(self[z])):
            zz[yi[y]][xi[x]] = v
        return _array(xs), _array(ys), (_np.array(zz) if _np else zz)


def _array(values):
    return _np.array(values, dtype=float) if _np else list(values)


def _tolist(a):
    return a.tolist() if hasattr(a, "tolist") else list(a)


def _stack(items):
    """One answer from several of the same shape: numbers become arrays,
    equal texts stay one text, lists of equal length are stacked
    element by element, dicts key by key (a missing number is NaN)."""
    present = [x for x in items if x is not None]
    if not present:
        return None
    if all(isinstance(x, dict) for x in present):
        keys = []
        for x in present:
            keys += [k for k in x if k not in keys]
        return Answer((k, _stack([x.get(k) if isinstance(x, dict) else None
                                  for x in items])) for k in keys)
    if all(isinstance(x, list) for x in present):
        n = len(present[0])
        if len(present) == len(items) and all(len(x) == n for x in present):
            return [_stack([x[i] for x in items]) for i in range(n)]
        return list(items)
    if all(isinstance(x, (int, float)) and not isinstance(x, bool)
           for x in present):
        return _array([float("nan") if x is None else x for x in items])
    if all(x == present[0] for x in present) and len(present) == len(items):
        return present[0]
    return list(items)


# --- options --------------------------------------------------------------

def _is_sequence(v):
    if isinstance(v, (str, bytes)):
        return False
    if _np is not None and isinstance(v, _np.ndarray):
        return v.ndim > 0
    return isinstance(v, (list, tuple, range))


def _text(v):
    if isinstance(v, str):
        return v
    if isinstance(v, bool):
        raise TypeError("a flag (True) takes no value")
    if isinstance(v, int):
        return str(v)
    try:
        return repr(float(v))
    except (TypeError, ValueError):
        raise TypeError("option value %r is not text or a number" % (v,))


def _argv(command, positional, options):
    argv = [command]
    for key, value in options.items():
        if value is None or value is False:
            continue
        name = "--" + key.rstrip("_").replace("_", "-")
        if value is True:
            argv.append(name)
        else:
            argv += [name, _text(value)]
    argv += [_text(p) for p in positional]
    return argv


def _raise(code, err, argv):
    lines = [l[len("error: "):] for l in err.splitlines()
             if l.startswith("error: ")]
    message = "; ".join(lines) if lines else (err.strip() or
                                               "command failed")
    raise DeltakError(message, code, err, argv)


def run(command, *positional, **options):
    """Run any deltak command; returns (stdout, stderr) as text.

    run("crystals", "BBO") prints nothing and returns what
    `deltak crystals BBO` prints. Raises DeltakError when the command
    fails (exit code 1 or 2).
    """
    argv = _argv(command, positional, options)
    code, out, err = _call(argv)
    if code != 0:
        _raise(code, err, argv)
    return out, err


def _one_json(argv):
    code, out, err = _call(argv)
    if code != 0:
        _raise(code, err, argv)
    try:
        return _json.loads(out, object_hook=Answer)
    except ValueError as e:
        raise DeltakError("the answer is not JSON (%s)" % e, 1, err, argv)


def _workers(n):
    return max(1, min(n, os.cpu_count() or 1, 8))


def query(command, *positional, **options):
    """Run a command with --json; returns its answer (an Answer).

    Arguments given as lists or arrays (all of the same length) are
    varied together: the command runs once per value and the answers
    are stacked (see the module's help).
    """
    varied = {k: list(v) for k, v in options.items() if _is_sequence(v)}
    if not varied:
        return _one_json(_argv(command, positional, dict(options,
                                                         json=True)))
    lengths = {len(v) for v in varied.values()}
    if len(lengths) != 1:
        raise ValueError("the varied arguments (%s) must have the same "
                         "length" % ", ".join(sorted(varied)))
    n = lengths.pop()
    argvs = []
    for i in range(n):
        opts = dict(options, json=True)
        for k, v in varied.items():
            opts[k] = v[i]
        argvs.append(_argv(command, positional, opts))
    with ThreadPoolExecutor(max_workers=_workers(n)) as pool:
        answers = list(pool.map(_one_json, argvs))
    return _stack(answers)


# --- units ----------------------------------------------------------------

def _unit(suffix):
    def write(value):
        if _is_sequence(value):
            return [_text(v) + suffix for v in _tolist(value)]
        return _text(value) + suffix
    write.__name__ = suffix.replace("-", "")
    write.__doc__ = ("%r -> '%s%s' (a list or array gives a list)"
                     % (1, 1, suffix))
    return write


nm = _unit("nm")
um = _unit("um")
mm = _unit("mm")
fs = _unit("fs")
thz = _unit("THz")
wavenumber = _unit("cm-1")


# --- the commands ---------------------------------------------------------

def crystals(name=None):
    """The database: a list of crystals (id, aliases, class, sets, ...),
    or one crystal in full (data sets with citations and ranges, d
    tensor, cautions). `name` may also be a path to a crystal file of
    your own, which is then checked and shown."""
    if name is None:
        return query("crystals")["crystals"]
    return query("crystals", name)


def index(crystal, wavelength, temp=None, **options):
    """n, group index, GVD (fs^2/mm), TOD (fs^3/mm), dn/dT of each axis
    at one wavelength ('1064nm'); keys as `deltak index --json`
    (answer.axes[i].n, .group_index, ...)."""
    return query("index", crystal=crystal, wavelength=wavelength, temp=temp,
                 **options)


def refractive_index(crystal, wavelength, axis, temp=None, **options):
    """n of one axis ('o', 'e', 'X', 'Y', 'Z' or 'n'): a float, or an
    array when wavelength or temp is a list or array."""
    ans = index(crystal, wavelength, temp=temp, **options)
    for a in ans["axes"]:
        if a["axis"] == axis:
            return a["n"]
    raise DeltakError("%s has no axis '%s'; its axes are: %s"
                      % (ans["crystal"], axis,
                         ", ".join(a["axis"] for a in ans["axes"])), 2)


def period(crystal, **options):
    """QPM poling period (period_um) for two of pump/signal/idler or
    fundamental at temp; with period=..., the temperature or the
    wavelengths that phase-match it. Keys as `deltak period --json`."""
    return query("period", crystal=crystal, **options)


def angle(crystal, **options):
    """Birefringent phase-matching directions: answer.solutions, each
    with type, pol, theta_deg, phi_deg, deff_pm_per_V, walkoff_mrad."""
    return query("angle", crystal=crystal, **options)


def tolerance(crystal, length, **options):
    """Acceptance widths (FWHM of sinc^2) for a crystal `length` ('20mm'):
    temperature_fwhm_C, spectral_fwhm_nm, angular_fwhm_mrad, ..."""
    return query("tolerance", crystal=crystal, length=length, **options)


def pulse(crystal, **options):
    """Group indices, GVM (gvm_fs_per_mm: signal_pump, idler_pump,
    signal_idler = 1/v_g(first) - 1/v_g(second)), GVD, TOD, walk-off,
    pulse-splitting and aperture lengths."""
    return query("pulse", crystal=crystal, **options)


def gain(crystal, length, **options):
    """Parametric gain and its bandwidth, or SHG efficiency (plane wave,
    pump depletion, focused Boyd-Kleinman), for a crystal `length`."""
    return query("gain", crystal=crystal, length=length, **options)


def chip(crystal, **options):
    """Multi-grating and fan-out poling layouts covering a target range
    (idler_range='2.8um:4.2um', oven='30:200', fanout_width='10mm')."""
    return query("chip", crystal=crystal, **options)


def sweep(crystal, vary, solve=None, map=None, **options):
    """Tuning curves and phase-matching maps as columns of arrays.

    vary='period=28um:32um' (x), and solve='idler' (a curve; family=
    'temp=30,100,170' adds curves) or map='temp=20:200' with length=
    (a map of sinc^2; Table.grid('sinc2') gives x, y, Z). Column names
    carry their units, as in `deltak sweep --csv`; a curve that turns
    over has a 'branch' column.
    """
    if _is_sequence(vary) or _is_sequence(solve) or _is_sequence(map):
        raise TypeError("sweep varies by itself: give vary='var=lo:hi[:n]'")
    argv = _argv("sweep", (), dict(options, crystal=crystal, vary=vary,
                                   solve=solve, map=map, csv=True))
    code, out, err = _call(argv)
    if code != 0:
        _raise(code, err, argv)
    rows = list(csv.reader(io.StringIO(out)))
    if not rows:
        raise DeltakError("sweep gave no table", 1, err, argv)
    header, body = rows[0], rows[1:]
    columns = {}
    for j, name in enumerate(header):
        cells = [r[j] if j < len(r) else "" for r in body]
        try:
            columns[name] = _array([float(c) if c != "" else float("nan")
                                    for c in cells])
        except ValueError:
            columns[name] = cells
    warnings = [l[len("warning: "):] for l in err.splitlines()
                if l.startswith("warning: ")]
    return Table(columns, header, warnings)

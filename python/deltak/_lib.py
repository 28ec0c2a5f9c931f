"""Finding libdeltak.so and calling its commands (deltak/command.h).

Every answer comes from dk_command_run(): the same option parsing,
checks, messages and bytes as the `deltak` program, written into
buffers instead of the terminal. The call is thread-safe, and ctypes
lets other Python threads run while it computes.

The library is looked for, in order:
  1. $DELTAK_LIBRARY (a path to libdeltak.so.0; only there when set),
  2. next to this module (a copy placed in the package folder),
  3. the prefix `make install` put it in (written to _installed.py),
  4. the source tree this module sits in (python/../build/),
  5. the system's dynamic loader (LD_LIBRARY_PATH, ldconfig's cache).
"""
import ctypes
import os

SONAME = "libdeltak.so.0"


class DeltakError(Exception):
    """A deltak command that did not answer.

    Attributes: message (its error lines, as the program prints them),
    exit_code (1: no solution or a failed computation; 2: bad usage or
    input, as for the program), stderr (everything it wrote there),
    argv (the command and options given).
    """

    def __init__(self, message, exit_code, stderr="", argv=()):
        super().__init__(message)
        self.message = message
        self.exit_code = exit_code
        self.stderr = stderr
        self.argv = list(argv)

    def __str__(self):
        return "%s (exit code %d)" % (self.message, self.exit_code)


class _CommandResult(ctypes.Structure):
    _fields_ = [
        ("exit_code", ctypes.c_int),
        ("out", ctypes.c_void_p),
        ("nout", ctypes.c_size_t),
        ("err", ctypes.c_void_p),
        ("nerr", ctypes.c_size_t),
    ]


def _candidates():
    """(where, path) pairs to try, in order."""
    env = os.environ.get("DELTAK_LIBRARY")
    if env:
        return [("DELTAK_LIBRARY", env)]
    here = os.path.dirname(os.path.abspath(__file__))
    found = [("next to the module", os.path.join(here, SONAME))]
    try:
        from . import _installed
        found.append(("the installed prefix",
                      os.path.join(_installed.LIBDIR, SONAME)))
    except ImportError:
        pass
    found.append(("the source tree",
                  os.path.normpath(os.path.join(here, "..", "..", "build",
                                                SONAME))))
    found.append(("the system loader", SONAME))
    return found


def _load():
    tried = []
    for where, path in _candidates():
        is_file = os.sep in path
        if is_file and not os.path.exists(path):
            tried.append("%s (%s: no such file)" % (path, where))
            continue
        try:
            lib = ctypes.CDLL(path)
            lib.dk_command_run
        except (OSError, AttributeError) as e:
            tried.append("%s (%s: %s)" % (path, where, e))
            if where == "DELTAK_LIBRARY":
                break
            continue
        return lib, (os.path.abspath(path) if is_file else path)
    raise ImportError(
        "deltak: cannot load %s; tried %s. Build it with `make` in the "
        "deltak folder, install it with `make install`, or set "
        "DELTAK_LIBRARY to the file." % (SONAME, "; ".join(tried)))


_lib, library_path = _load()
_lib.dk_command_run.argtypes = [ctypes.c_int, ctypes.POINTER(ctypes.c_char_p),
                                ctypes.POINTER(_CommandResult)]
_lib.dk_command_run.restype = ctypes.c_int
_lib.dk_command_result_free.argtypes = [ctypes.POINTER(_CommandResult)]
_lib.dk_command_result_free.restype = None
_lib.dk_command_names.argtypes = []
_lib.dk_command_names.restype = ctypes.POINTER(ctypes.c_char_p)


def command_names():
    """The commands of this library, as `deltak --help` lists them."""
    names = _lib.dk_command_names()
    out = []
    i = 0
    while names[i] is not None:
        out.append(names[i].decode("utf-8"))
        i += 1
    return out


def call(argv):
    """Run one command in-process: argv[0] is the command name.

    Returns (exit_code, stdout, stderr) as (int, str, str); never
    raises for a failed command (the caller decides).
    """
    args = [a.encode("utf-8", "surrogateescape") for a in argv]
    arr = (ctypes.c_char_p * (len(args) + 1))(*args, None)
    res = _CommandResult()
    code = _lib.dk_command_run(len(args), arr, ctypes.byref(res))
    try:
        out = ctypes.string_at(res.out, res.nout) if res.out else b""
        err = ctypes.string_at(res.err, res.nerr) if res.err else b""
    finally:
        _lib.dk_command_result_free(ctypes.byref(res))
    return (code, out.decode("utf-8", "replace"),
            err.decode("utf-8", "replace"))

#!/usr/bin/env python3
"""api.py - `deltak explore` over real HTTP on loopback.

Starts the program (`deltak explore --port 0`), then checks:
  - the API answers are the bytes the command line prints (--json, and
    --plot -.svg for figures) for a set of commands;
  - bad requests (unknown crystal, bare numbers, huge grids, malformed
    URLs, long query strings, other methods, a foreign Host) get 4xx
    answers with the command's own message, and the server lives on;
  - concurrent requests all get their own right answer;
  - a request past the deadline gets 503 (a second server with
    --deadline 0.01 and a 400 x 400 map computed cell by cell);
  - Ctrl-C (SIGINT) stops the server cleanly (exit 0).
Loopback only; every loop is bounded. Prints "explore: N passed, M failed".
Usage: api.py build/deltak
"""
import http.client
import json
import os
import signal
import socket
import subprocess
import sys
import threading
import urllib.parse

DK = os.path.abspath(sys.argv[1] if len(sys.argv) > 1 else "build/deltak")
passed = failed = 0


def check(name, ok, detail=""):
    global passed, failed
    if ok:
        passed += 1
    else:
        failed += 1
        print("not ok: %s %s" % (name, detail[:600]))


def start(*extra):
    p = subprocess.Popen([DK, "explore", "--port", "0", *extra],
                         stdout=subprocess.PIPE, stderr=subprocess.PIPE,
                         text=True)
    line = p.stdout.readline()
    if "http://127.0.0.1:" not in line:
        p.kill()
        raise SystemExit("explore did not start: %r %s" % (line, p.stderr.read()))
    port = int(line.split("127.0.0.1:")[1].split("/")[0])
    return p, port


def get(port, target, method="GET", headers=None, timeout=60):
    c = http.client.HTTPConnection("127.0.0.1", port, timeout=timeout)
    c.request(method, target, headers=headers or {})
    r = c.getresponse()
    body = r.read()
    out = (r.status, dict(r.getheaders()), body)
    c.close()
    return out


def raw(port, data, timeout=30):
    """Send raw bytes; return the status line (or '' if closed)."""
    s = socket.create_connection(("127.0.0.1", port), timeout=timeout)
    s.sendall(data)
    got = b""
    try:
        while b"\r\n" not in got:
            chunk = s.recv(4096)
            if not chunk:
                break
            got += chunk
    except OSError:
        pass
    s.close()
    return got.split(b"\r\n")[0].decode("latin-1")


def cli(argv):
    r = subprocess.run([DK, *argv], capture_output=True)
    return r.returncode, r.stdout, r.stderr


def query(opts):
    return urllib.parse.urlencode(opts, safe=":=,")


# (command, options as (name, value) pairs); the CLI gets --name value.
SAME = [
    ("period", [("crystal", "MgO:LN"), ("pump", "1064nm"), ("idler", "3.4um"),
                ("temp", "40")]),
    ("period", [("crystal", "MgO:LN"), ("pump", "1064nm"), ("idler", "3.4um"),
                ("temp", "40"), ("all-sets", "")]),
    ("period", [("crystal", "MgO:LN"), ("pump", "1064nm"),
                ("period", "27.5um"), ("temp", "40")]),
    ("period", [("crystal", "ppktp"), ("fundamental", "1064nm"),
                ("temp", "-5")]),
    ("index", [("crystal", "BBO"), ("wavelength", "800nm"), ("temp", "25")]),
    ("angle", [("crystal", "BBO"), ("fundamental", "1030nm"), ("type", "I")]),
    ("angle", [("crystal", "LBO"), ("pump", "532nm"), ("signal", "800nm")]),
    ("tolerance", [("crystal", "MgO:LN"), ("pump", "1064nm"),
                   ("idler", "3.4um"), ("period", "30.5um"),
                   ("length", "20mm")]),
    ("tolerance", [("crystal", "BBO"), ("fundamental", "1030nm"),
                   ("type", "I"), ("length", "2mm")]),
    ("pulse", [("crystal", "BBO"), ("pump", "800nm"), ("signal", "1300nm"),
               ("type", "I"), ("duration", "30fs")]),
    ("gain", [("crystal", "BBO"), ("pump", "800nm"), ("signal", "1300nm"),
              ("type", "I"), ("length", "3mm"), ("intensity", "50GW/cm2")]),
    ("chip", [("crystal", "MgO:LN"), ("pump", "1064nm"),
              ("idler-range", "2.8um:4.2um"), ("oven", "30:200")]),
    ("sweep", [("crystal", "MgO:LN"), ("pump", "1064nm"),
               ("vary", "period=28um:32um:41"), ("solve", "idler"),
               ("family", "temp=30,100")]),
    ("crystals", []),
]

FIGURES = [
    ("sweep", [("crystal", "MgO:LN"), ("pump", "1064nm"),
               ("vary", "period=28um:32um:41"), ("solve", "idler"),
               ("temp", "40")], "svg"),
    ("tolerance", [("crystal", "MgO:LN"), ("pump", "1064nm"),
                   ("idler", "3.4um"), ("period", "30.5um"),
                   ("length", "20mm"), ("curve", "temperature")], "svg"),
    ("sweep", [("crystal", "MgO:LN"), ("signal", "1550nm"),
               ("period", "30.5um"), ("vary", "pump=1.05um:1.08um:41"),
               ("map", "temp=20:200:41"), ("length", "20mm")], "png"),
    ("tolerance", [("crystal", "BBO"), ("fundamental", "1030nm"),
                   ("type", "I"), ("length", "2mm"), ("curve", "theta")],
     "pdf"),
]


def cli_args(command, opts):
    argv = [command]
    for k, v in opts:
        argv += ["--" + k] + ([v] if v != "" else [])
    return argv


def main():
    p, port = start()
    try:
        run_checks(port)
    finally:
        if p.poll() is None:
            p.send_signal(signal.SIGINT)
        try:
            rc = p.wait(timeout=30)
        except subprocess.TimeoutExpired:
            p.kill()
            rc = -1
        rest = p.stdout.read()
        check("sigint-stops-cleanly", rc == 0 and "stopped (Ctrl-C)" in rest,
              "exit %s, %r" % (rc, rest))
    late_deadline()
    print("explore: %d passed, %d failed" % (passed, failed))
    return 1 if failed else 0


def run_checks(port):
    # Listening on loopback only (Linux: /proc/net/tcp, state 0A).
    with open("/proc/net/tcp") as f:
        listen = [l.split()[1] for l in f.readlines()[1:]
                  if l.split()[3] == "0A" and
                  int(l.split()[1].split(":")[1], 16) == port]
    check("loopback-only", listen == ["0100007F:%04X" % port], str(listen))

    # The page itself.
    st, h, body = get(port, "/")
    check("page", st == 200 and b"deltak" in body and
          "default-src 'none'" in h.get("Content-Security-Policy", ""),
          str(st))
    check("page-safety", b"laser safety officer" in body)
    for f in ("/explore.js", "/explore.css"):
        st, h, body = get(port, f)
        check("asset " + f, st == 200 and len(body) > 100, str(st))

    # Same bytes as the command line.
    for command, opts in SAME:
        name = "same-json " + command + " " + query(opts)[:60]
        st, h, body = get(port, "/api/%s?%s" % (command, query(opts)))
        rc, out, err = cli(cli_args(command, opts) + ["--json"])
        check(name, st == 200 and rc == 0 and body == out and
              h.get("Content-Type", "").startswith("application/json"),
              "HTTP %d, cli exit %d, %d vs %d bytes: %s" %
              (st, rc, len(body), len(out), body[:300]))
    for command, opts, fmt in FIGURES:
        name = "same-figure %s.%s" % (command, fmt)
        st, h, body = get(port, "/figure/%s.%s?%s" % (command, fmt,
                                                      query(opts)))
        rc, out, err = cli(cli_args(command, opts) + ["--plot", "-." + fmt])
        check(name, st == 200 and rc == 0 and body == out and len(body) > 1000,
              "HTTP %d, cli exit %d, %d vs %d bytes %s" %
              (st, rc, len(body), len(out), body[:200]))
    # The figure on stdout is the figure of a file.
    with_file = os.path.join(os.environ.get("TMPDIR", "/tmp"),
                             "explore-api-%d.svg" % os.getpid())
    command, opts, fmt = FIGURES[0]
    cli(cli_args(command, opts) + ["--plot", with_file])
    st, h, body = get(port, "/figure/sweep.svg?" + query(opts))
    with open(with_file, "rb") as f:
        check("figure-equals-file", f.read() == body)
    os.unlink(with_file)
    check("figure-notes-header",
          "data%20set" in h.get("X-Deltak-Notes", ""), str(h))

    # Bad requests: 400 with the command's message, never a crash.
    bad = [
        ("unknown-crystal", "/api/period?crystal=unobtainium&pump=1064nm&"
         "idler=3.4um", 400, "unknown crystal 'unobtainium'"),
        ("bare-number", "/api/period?crystal=MgO:LN&pump=1064&idler=3.4um",
         400, "has no unit"),
        ("unknown-option", "/api/period?crystal=MgO:LN&frobnicate=1", 400,
         "unknown option '--frobnicate=1'"),
        ("flag-with-value", "/api/period?crystal=MgO:LN&pump=1064nm&"
         "idler=3.4um&all-sets=yes", 400, "takes no value"),
        ("opaque", "/api/index?crystal=MgO:LN&wavelength=8um", 400,
         "outside the transparency range"),
        ("not-poled", "/api/period?crystal=BBO&fundamental=1064nm", 400,
         "cannot be periodically poled"),
        ("huge-grid", "/api/sweep?crystal=MgO:LN&pump=1064nm&"
         "vary=temp=20:200:100000&solve=idler&period=30.5um", 400,
         "more than the 2000"),
        ("huge-map", "/figure/sweep.png?crystal=MgO:LN&signal=1550nm&"
         "period=30.5um&vary=pump=1.05um:1.08um:2048&map=temp=20:200:2048&"
         "length=20mm", 400, "cells"),
        ("huge-family", "/api/sweep?crystal=MgO:LN&pump=1064nm&"
         "vary=period=28um:32um:1000&solve=idler&family=temp=1,2,3", 400,
         "3000 points"),
        ("plot-refused", "/api/sweep?crystal=MgO:LN&plot=/tmp/x.svg", 400,
         "set by the page"),
        ("bad-escape", "/api/period?crystal=MgO%zzLN", 400, "malformed query"),
        ("nul-in-value", "/api/period?crystal=MgO%00LN&pump=1064nm", 400,
         "NUL"),
        ("control-char", "/api/period?crystal=MgO%0aLN", 400,
         "control character"),
        ("bad-path", "/api/per%25iod", 400, "malformed path"),
        ("dotdot", "/api/../../etc/passwd", 400, "malformed path"),
        ("double-slash", "//api/period", 400, "malformed path"),
        ("bad-key", "/api/period?%3Cscript%3E=1", 400, "not an option name"),
        ("repeat", "/api/period?crystal=BBO&crystal=LBO", 400, "given twice"),
        ("long-query", "/api/period?crystal=" + "x" * 3000, 400,
         "longer than"),
        ("long-value", "/api/period?crystal=" + "x" * 300, 400,
         "longer than 256"),
        ("many-params", "/api/period?" + "&".join("k%d=1" % i
                                                  for i in range(40)), 400,
         "query parameters"),
        ("run-refused", "/api/run?file=x.dk", 404, "no command 'run'"),
        ("explore-refused", "/api/explore", 404, "no command"),
        ("no-such-page", "/secret.txt", 404, "nothing at"),
        ("figure-of-period", "/figure/period.svg?crystal=BBO", 404,
         "no figure"),
    ]
    for name, target, want, text in bad:
        st, h, body = get(port, target)
        try:
            msg = json.loads(body)["error"]
        except (ValueError, KeyError):
            msg = body.decode("utf-8", "replace")
        check("bad " + name, st == want and text in msg,
              "HTTP %d: %s" % (st, msg))
    # The message is the command line's own.
    st, h, body = get(port, "/api/index?crystal=MgO:LN&wavelength=1064")
    rc, out, err = cli(["index", "--crystal", "MgO:LN", "--wavelength=1064",
                        "--json"])
    d = json.loads(body)
    check("message-is-cli", st == 400 and d["exit_code"] == rc == 2 and
          d["messages"] == err.decode(), body[:300])

    st, h, body = get(port, "/api/period", method="POST")
    check("post-405", st == 405 and "GET" in h.get("Allow", ""), str(st))
    st, h, body = get(port, "/api/period?crystal=BBO",
                      headers={"Host": "attacker.example:80"})
    check("foreign-host-403", st == 403, str(st))
    st, h, body = get(port, "/", method="HEAD")
    check("head", st == 200 and body == b"", str(st))
    line = raw(port, b"GET /api/period?" + b"a" * 100000 +
               b" HTTP/1.1\r\nHost: 127.0.0.1\r\n\r\n")
    check("huge-request-line", line == "" or " 4" in line[:13], line)
    line = raw(port, b"\x16\x03\x01garbage\r\n\r\n")
    check("garbage", line == "" or " 400" in line[:13], line)
    line = raw(port, b"GET /api/index?crystal=BBO&wavelength=1um HTTP/1.1\r\n"
               b"Host: 127.0.0.1:%d\r\nX: " % port + b"y" * 60000 + b"\r\n\r\n")
    check("huge-header", line == "" or " 4" in line[:13], line)

    # Still alive after all that.
    st, h, body = get(port, "/api/index?crystal=BBO&wavelength=1um")
    check("alive", st == 200, str(st))

    # Concurrent requests: each gets its own answer.
    jobs = []
    for i in range(48):
        t = 20 + i % 6 * 10
        opts = [("crystal", "MgO:LN"), ("pump", "1064nm"), ("idler", "3.4um"),
                ("temp", str(t))]
        jobs.append(opts)
    expected = {}
    for opts in jobs[:6]:
        rc, out, err = cli(cli_args("period", opts) + ["--json"])
        expected[query(opts)] = out
    results = [None] * len(jobs)

    def worker(k):
        for i in range(k, len(jobs), 8):
            try:
                results[i] = get(port, "/api/period?" + query(jobs[i]))
            except OSError as e:
                results[i] = (0, {}, str(e).encode())

    threads = [threading.Thread(target=worker, args=(k,)) for k in range(8)]
    for t in threads:
        t.start()
    for t in threads:
        t.join(timeout=300)
    ok = all(r is not None and r[0] == 200 and
             r[2] == expected[query(jobs[i])] for i, r in enumerate(results))
    check("concurrent-48", ok,
          str([r[0] if r else None for r in results]))


def late_deadline():
    """--deadline 0.01 and a 400 x 400 map of a birefringent design whose
    angle varies (computed cell by cell: about 0.3 s here, thirty times the
    deadline): 503, then still alive."""
    p, port = start("--deadline", "0.01", "--workers", "1")
    try:
        st, h, body = get(port, "/figure/sweep.svg?crystal=BBO&fundamental=1064nm&"
                          "type=I&length=2mm&vary=theta=20:26:400&"
                          "map=fundamental=1.0um:1.1um:400")
        check("deadline-503", st == 503 and h.get("Retry-After") == "1" and
              b"no answer within" in body, "%d %s" % (st, body[:200]))
        st, h, body = get(port, "/")
        check("alive-after-deadline", st == 200, str(st))
    finally:
        p.send_signal(signal.SIGTERM)
        try:
            rc = p.wait(timeout=60)
        except subprocess.TimeoutExpired:
            p.kill()
            rc = -1
        check("sigterm-stops-cleanly", rc == 0, "exit %s" % rc)


if __name__ == "__main__":
    sys.exit(main())

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""-q prints only errors: no table, no warnings, no progress; requested output files and
'--json -' are still written, and errors and budget breaches still reach stderr. A sweep shows
its progress on stderr only when stderr is a terminal (a pseudo-terminal here), never into a pipe."""
import json
import os
import pty
import select
import shutil
import subprocess
import tempfile
import time

from schrot_check import SCHROT, true, finish

ROOT = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
WARNS = """a photocurrent into a resistor, with a .control block schrot drops (and warns about)
iph 0 a dc 1n
d1 a 0 dm
.model dm d is=1p
r1 a 0 1meg
.control
echo never run
.endc
.noise v(a) iph dec 5 1 1k 1
.end
"""


def run(*args, cwd):
    proc = subprocess.run([SCHROT] + list(args), cwd=cwd, capture_output=True, text=True, timeout=300)
    return proc.returncode, proc.stdout, proc.stderr


def run_on_terminal(*args):
    """Runs schrot with stderr on a pseudo-terminal; returns (rc, stdout, what the terminal got)."""
    master, slave = pty.openpty()
    proc = subprocess.Popen([SCHROT] + list(args), cwd=ROOT, stdout=subprocess.PIPE, stderr=slave)
    os.close(slave)
    seen, deadline = b"", time.time() + 300
    while time.time() < deadline:
        ready, _, _ = select.select([master], [], [], 0.2)
        if ready:
            try:
                chunk = os.read(master, 65536)
            except OSError:  # EIO: the child closed its side
                break
            if not chunk:
                break
            seen += chunk
        elif proc.poll() is not None:
            break
    out = proc.communicate(timeout=300)[0]
    os.close(master)
    return proc.returncode, out.decode("utf-8", "replace"), seen.decode("utf-8", "replace")


work = tempfile.mkdtemp(prefix="schrot-quiet-")
with open(os.path.join(work, "warns.cir"), "w") as f:
    f.write(WARNS)

rc, out, err = run("report", "warns.cir", cwd=work)
true("[Q] without -q the table prints and the dropped .control block warns", rc == 0 and out and "warning:" in err, err)
for args in (["report", "warns.cir", "-q"], ["report", "warns.cir", "--quiet", "--spot", "10"],
             ["carriers", "warns.cir", "-q"], ["sweep", "warns.cir", "--vary", "iph=1n:1u:3", "-q"],
             ["augment", "warns.cir", "-o", "aug.cir", "-q"]):
    rc, out, err = run(*args, cwd=work)
    true("[Q] schrot %s: exit 0, stdout and stderr empty" % " ".join(args), rc == 0 and out == "" and err == "",
         "rc %d, stdout %r, stderr %r" % (rc, out[:200], err[:200]))

rc, out, err = run("report", "warns.cir", "-q", "--json", "q.json", "--csv", "q.csv", cwd=work)
true("[Q] -q still writes the requested files", rc == 0 and out == "" and err == "" and
     all(os.path.getsize(os.path.join(work, f)) > 0 for f in ("q.json", "q.csv")))
rc, out, err = run("report", "warns.cir", "-q", "--json", "-", cwd=work)
true("[Q] -q with --json -: the JSON document is the whole stdout", rc == 0 and err == "" and
     json.loads(out)["schema"] == 1, out[:200] + err)

rc, out, err = run("report", "missing.cir", "-q", cwd=work)
true("[Q] -q: an error still prints (exit 2)", rc == 2 and out == "" and "error:" in err and "missing.cir" in err, err)
rc, out, err = run("report", "warns.cir", "-q", "--budget", "1n", cwd=work)
true("[Q] -q: a budget breach still prints its error (exit 1)", rc == 1 and out == "" and "exceeds the budget" in err
     and "warning" not in err, err)

# Progress of a sweep: never into a pipe; on a terminal unless -q.
SWEEP = ["sweep", "netlists/picoammeter-leakage.cir", "--vary", "ileak=1f:10p:9"]
rc, out, err = run(*SWEEP, cwd=ROOT)
true("[Q] sweep with stderr in a pipe: the table, and nothing on stderr", rc == 0 and "shot-noise-limited" in out
     and err == "", err)
rc, out, term = run_on_terminal(*SWEEP, "-q")
true("[Q] sweep -q with stderr on a terminal: nothing at all", rc == 0 and out == "" and term == "", repr(term))
rc, out, term = run_on_terminal(*SWEEP)
true("[Q] sweep with stderr on a terminal: the table still goes to stdout", rc == 0 and "shot-noise-limited" in out)
true("[Q] sweep on a terminal: progress lines count the points", "sweep 0/9 points done" in term and
     "sweep 8/9 points done" in term, repr(term))
true("[Q] sweep on a terminal: the progress line is erased at the end", term.endswith("\r\x1b[K"), repr(term[-40:]))
shutil.rmtree(work, ignore_errors=True)
finish()

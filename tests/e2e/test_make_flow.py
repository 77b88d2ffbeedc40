#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""docs/Makefile.example: schrot reruns only when the netlist or an include changes; a breached budget fails make."""
import os
import shutil
import subprocess
import tempfile
from schrot_check import SCHROT, true, finish

HERE = os.path.dirname(os.path.abspath(__file__))
MAKEFILE = os.path.join(HERE, "..", "..", "docs", "Makefile.example")

NETLIST = """photocurrent into a load whose source sits in an included file
.include parts/source.inc
rl out 0 1k
.noise v(out) iph dec 10 1 1meg 1
.end
"""
SOURCE = "iph 0 out dc 1u\n"


def make(work, *extra):
    proc = subprocess.run(["make", "SCHROT=" + SCHROT] + list(extra), cwd=work, capture_output=True, text=True,
                          timeout=300, env=dict(os.environ, LC_ALL="C"))
    return proc.returncode, proc.stdout + proc.stderr


def ran_schrot(log):
    return SCHROT + " report" in log


work = tempfile.mkdtemp(prefix="schrot-make-")
os.makedirs(os.path.join(work, "parts"))
shutil.copy(MAKEFILE, os.path.join(work, "Makefile"))
with open(os.path.join(work, "frontend.cir"), "w") as f:
    f.write(NETLIST)
include = os.path.join(work, "parts", "source.inc")
with open(include, "w") as f:
    f.write(SOURCE)
report = os.path.join(work, "frontend.json")

rc, log = make(work)
true("[M] first make runs schrot and succeeds", rc == 0 and ran_schrot(log) and os.path.exists(report), log)
true("[M] the depfile names the included file", os.path.exists(os.path.join(work, "frontend.d")) and
     "parts/source.inc" in open(os.path.join(work, "frontend.d")).read())

first = os.path.getmtime(report) if os.path.exists(report) else 0
rc, log = make(work)
true("[M] second make has nothing to do", rc == 0 and not ran_schrot(log) and "Nothing to be done" in log, log)
true("[M] the report is not rewritten", os.path.exists(report) and os.path.getmtime(report) == first)

# touch the included file into the future of the report (no sleeping on coarse clocks)
os.utime(include, (first + 10, first + 10))
rc, log = make(work)
true("[M] make after touching the included file reruns schrot", rc == 0 and ran_schrot(log), log)

# 1 uA into 1 kOhm over 1 Hz..1 MHz is about 0.57 uV rms: a 1 nV budget is breached
os.utime(include, (first + 20, first + 20))
rc, log = make(work, "BUDGET=1n")
true("[M] a breached budget fails make", rc != 0 and ran_schrot(log) and "exceeds the budget" in log, log)
# a breach writes no output (DESIGN.md section 4), so the report stays older than the include
rc, log = make(work, "BUDGET=1n")
true("[M] the next make checks again and fails again", rc != 0 and ran_schrot(log), log)
rc, log = make(work)
true("[M] make with the default budget reruns and passes again", rc == 0 and ran_schrot(log), log)

shutil.rmtree(work, ignore_errors=True)
finish()

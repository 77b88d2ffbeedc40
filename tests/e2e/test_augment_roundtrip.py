#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot augment round trip: plain 'ngspice -b' on the written deck gives schrot report's total noise."""
import json
import os
import re
import shutil
import subprocess
import tempfile
from schrot_check import SCHROT, close, true, finish

# Two instances of one photodiode cell at different photocurrents, a top-level dark current, into
# a transimpedance stage whose feedback and load resistors are noiseless, so every bit of output
# noise comes from the added generators. The cell lives in an included file one directory down.
CELL = """* photodiode cell: photocurrent and junction capacitance
.subckt pdcell a k params: iphot=1u
iph k a dc {iphot}
cj k a 2p
.ends
"""

NETLIST = """two photodiode cells at different photocurrents into a transimpedance stage
.include models/pdcell.inc
x1 0 sum pdcell iphot=2u
x2 0 sum pdcell iphot=50n
i_dark 0 sum dc 3n
itest 0 sum dc 0
rf sum out 100k noisy=0
eamp out 0 0 sum 1e5
rload out 0 10k noisy=0
.noise v(out) itest dec 20 10 10meg 1
.end
"""


def schrot(*args):
    return subprocess.run([SCHROT] + list(args), capture_output=True, text=True, timeout=300)


def plain_ngspice(deck, cwd):
    """Runs ngspice in batch mode with no help from schrot; returns (onoise_total, stdout+stderr)."""
    proc = subprocess.run(["ngspice", "-b", deck], capture_output=True, text=True, timeout=300, cwd=cwd)
    text = proc.stdout + proc.stderr
    m = re.search(r"onoise_total\s*=\s*([-+0-9.eE]+)", text)
    return (float(m.group(1)) if m and proc.returncode == 0 else None), text


def report_total(netlist, *extra):
    proc = schrot("report", netlist, "--json", "-", *extra)
    if proc.returncode != 0:
        print(proc.stdout, proc.stderr)
        return None
    return json.loads(proc.stdout)["total"]["output_rms_v"]


work = tempfile.mkdtemp(prefix="schrot-aug-")
elsewhere = tempfile.mkdtemp(prefix="schrot-aug-run-")
os.makedirs(os.path.join(work, "models"))
with open(os.path.join(work, "models", "pdcell.inc"), "w") as f:
    f.write(CELL)
netlist = os.path.join(work, "rx.cir")
with open(netlist, "w") as f:
    f.write(NETLIST)

for label, extra in (("every carrier", ()), ("x2.iph ignored", ("--ignore", "x2\\.iph"))):
    deck = os.path.join(work, "aug-%d.cir" % len(extra))
    proc = schrot("augment", netlist, "-o", deck, *extra)
    true("[A] augment exits 0 (%s)" % label, proc.returncode == 0, proc.stderr)
    if proc.returncode != 0:
        continue
    text = open(deck).read()
    true("[A] generators are marked by comments (%s)" % label, "* schrot:" in text)
    true("[A] the include is inlined (%s)" % label, ".include" not in text.lower() and "iph k a" in text)
    true("[A] one alter per instance of the cell and one for the top-level carrier (%s)" % label,
         "@r.x1.rschg" in text and "@r.x2.rschg" in text and re.search(r"alter @rschg\d+\[", text) is not None)
    # run it from another directory, where no include could resolve
    got, log = plain_ngspice(deck, elsewhere)
    true("[A] plain ngspice ran the deck from another directory (%s)" % label, got is not None, log)
    want = report_total(netlist, *extra)
    close("[A] plain ngspice onoise_total = schrot report total output rms (%s)" % label, got, want, 1e-3)

# the second instance really is sized apart from the first: ignoring it must change the total
full = report_total(netlist)
part = report_total(netlist, "--ignore", "x2\\.iph")
true("[A] the two instances carry different generators", full and part and abs(full - part) > 1e-6 * full)

# -o - writes the same deck to the standard output
proc = schrot("augment", netlist, "-o", "-")
true("[A] '-o -' writes the deck to stdout", proc.returncode == 0 and proc.stdout == open(
    os.path.join(work, "aug-0.cir")).read(), proc.stderr)

# over the input, or over a file it includes: exit 2 and both untouched
for victim in (netlist, os.path.join(work, "models", "pdcell.inc")):
    before = open(victim).read()
    proc = schrot("augment", netlist, "-o", victim)
    true("[A] augment over '%s' is exit 2" % os.path.basename(victim),
         proc.returncode == 2 and "refusing" in proc.stderr, proc.stderr)
    true("[A] '%s' is unchanged" % os.path.basename(victim), open(victim).read() == before)

shutil.rmtree(work, ignore_errors=True)
shutil.rmtree(elsewhere, ignore_errors=True)
finish()

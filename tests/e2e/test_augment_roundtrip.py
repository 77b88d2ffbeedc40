#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot augment round trip: plain 'ngspice -b -r out.raw' on the written deck gives schrot report's total noise.

The reference is the simulator itself: the same circuit's noise run, with the carriers' shot noise
2q|I| (W. Schottky, Ann. Phys. 57, 541 (1918); CHECK-VALUES S1) added as generators, must integrate
to the same output rms whether schrot runs it or a user's plain ngspice does.
"""
import json
import os
import re
import shutil
import subprocess
import tempfile
from schrot_check import SCHROT, close, true, finish, read_raw

# Two instances of one photodiode cell at different photocurrents, a top-level dark current, and a
# pair of cells in series inside a second subcircuit (a port node and an internal node, two levels
# down), into a transimpedance stage whose feedback and load resistors are noiseless, so every bit
# of output noise comes from the added generators. The cell lives in an included file one
# directory down.
CELL = """* photodiode cell: photocurrent and junction capacitance
.subckt pdcell a k params: iphot=1u
iph k a dc {iphot}
cj k a 2p
.ends
"""

NETLIST = """two photodiode cells at different photocurrents into a transimpedance stage
.include models/pdcell.inc
.subckt pair a k
xa a mid pdcell iphot=1u
xb mid k pdcell iphot=3u
rmid mid k 1meg noisy=0
.ends
x1 0 sum pdcell iphot=2u
x2 0 sum pdcell iphot=50n
x3 0 sum pair
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
    """A user's flow, no help from schrot: 'ngspice -b -r out.raw deck'. Returns (onoise_total, raw plots, log)."""
    raw = os.path.join(cwd, "out.raw")
    if os.path.exists(raw):
        os.remove(raw)
    proc = subprocess.run(["ngspice", "-b", "-r", raw, deck], capture_output=True, text=True, timeout=300, cwd=cwd)
    text = proc.stdout + proc.stderr
    if proc.returncode != 0 or not os.path.exists(raw):
        return None, [], text
    plots = read_raw(raw)
    totals = [v["v(onoise_total)"][0] for _, v in plots if "v(onoise_total)" in v]
    return (totals[0] if totals else None), plots, text


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
    true("[A] a plain deck: no .control block, no alter (%s)" % label,
         ".control" not in text.lower() and "alter" not in text.lower() and text.rstrip().endswith(".end"))
    true("[A] the netlist's own .noise card is kept (%s)" % label,
         re.search(r"^\.noise v\(out\) itest dec 20 10 10000000 1$", text, re.M) is not None, text)
    # per instance, literal values: the nested cells' generators sit on the flat nodes x3.mid and sum
    true("[A] one generator per carrier instance, a literal resistance, on flat node names (%s)" % label,
         re.search(r"^rschg\d+ nschg\d+ 0 [0-9.e+-]+$", text, re.M) is not None and
         re.search(r"^gschg\d+ x3\.mid 0 nschg\d+ 0 1$", text, re.M) is not None and
         re.search(r"^gschg\d+ sum x3\.mid nschg\d+ 0 1$", text, re.M) is not None, text)
    # run it from another directory, where no include could resolve
    got, plots, log = plain_ngspice(deck, elsewhere)
    true("[A] 'ngspice -b -r out.raw' wrote the noise spectrum and totals (%s)" % label,
         got is not None and any("onoise_spectrum" in v and len(v["onoise_spectrum"]) == 121 for _, v in plots), log)
    want = report_total(netlist, *extra)
    close("[A] plain ngspice onoise_total = schrot report total output rms (%s)" % label, got, want, 1e-6)
    # the user's own .control block, appended to the deck, runs it too
    with open(deck + ".mine.cir", "w") as f:
        f.write(text + ".control\nrun\nsetplot noise2\nprint onoise_total\n.endc\n")
    proc = subprocess.run(["ngspice", "-b", deck + ".mine.cir"], capture_output=True, text=True, timeout=300,
                          cwd=elsewhere)
    m = re.search(r"onoise_total\s*=\s*([-+0-9.eE]+)", proc.stdout)
    close("[A] a .control block appended to the deck prints the same total (%s)" % label,
          float(m.group(1)) if m else None, want, 1e-5)

# A netlist without .noise: --output, --input and --freq become the deck's .noise card.
bare = os.path.join(work, "bare.cir")
with open(bare, "w") as f:
    f.write(NETLIST.replace(".noise v(out) itest dec 20 10 10meg 1\n", ""))
deck = os.path.join(work, "aug-bare.cir")
proc = schrot("augment", bare, "-o", deck, "--output", "v(out)", "--input", "itest", "--freq", "10:10meg:20")
true("[A] augment of a netlist without .noise exits 0", proc.returncode == 0, proc.stderr)
if proc.returncode == 0:
    text = open(deck).read()
    true("[A] --output --input --freq become the deck's .noise card",
         re.search(r"^\.noise v\(out\) itest dec 20 10 10000000 1$", text, re.M) is not None, text)
    got, plots, log = plain_ngspice(deck, elsewhere)
    close("[A] ... and plain ngspice gives the report's total", got, report_total(netlist), 1e-6)

# A code-model (A) device in the noise path: ngspice 39 takes its small-signal state from an AC
# analysis, so the plain deck runs a one-point '.ac' card before its '.noise' (as schrot does);
# plain ngspice then gives the report's total (the simulator is the reference).
CODE_MODEL = """photocurrent through an s-domain low-pass code model
itest 0 l dc 0
ipd 0 l dc 1u
rl l 0 1k
a1 l o filt
.model filt s_xfer(in_offset=0 gain=1 num_coeff=[1] den_coeff=[1e-3 1] int_ic=[0] denormalized_freq=1)
ro o 0 1k
.noise v(o) itest dec 10 10 10k 1
.end
"""
cm = os.path.join(work, "code-model.cir")
with open(cm, "w") as f:
    f.write(CODE_MODEL)
deck = os.path.join(work, "aug-cm.cir")
proc = schrot("augment", cm, "-o", deck)
true("[A] augment of a deck with a code model exits 0 and primes it with '.ac lin 1 1 1'",
     proc.returncode == 0 and ".ac lin 1 1 1\n.noise" in open(deck).read().replace(
         "* schrot: the noise analysis (pts_per_summary 1 keeps each device's spectrum)\n", ""), proc.stderr)
got, plots, log = plain_ngspice(deck, elsewhere)
close("[A] plain ngspice on the code-model deck = schrot report's total", got, report_total(cm), 1e-6)

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

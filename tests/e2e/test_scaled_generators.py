#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot report (unit generators scaled afterwards, data from SendData) equals the straightforward path.

The straightforward path is plain ngspice running `schrot augment`'s plain deck (every instance's
generator a literal resistance sized for 2q|I|) with a .control block of our own appended, and the
simulator's own per-device noise summary (noise2, integrated over the run's range). Each row of the report must equal that summary to 1e-9, once the
report's restatement of the simulator's CODATA 2014 k and q as the exact SI 2019 values is undone
(NGSPICE-NOTES.md section 2 gives the simulator's constants; DESIGN.md section 2 the generators).
"""
import json
import os
import re
import subprocess
import tempfile
from schrot_check import SCHROT, close, true, finish

Q, K = 1.602176634e-19, 1.380649e-23          # SI 2019, exact
Q_SIM, K_SIM = 1.6021766208e-19, 1.38064852e-23  # ngspice 39 const.h (CODATA 2014)

# Three invented light-sensor pixels with different photocurrents on a short RC readout line into a
# transimpedance stage; one pixel's photocurrent is zero (its generator is switched off).
NETLIST = """three pixels on a readout line
.subckt pixel line params: ip=1n
iph 0 k dc {ip}
dpd k 0 dpix
cpd k 0 2p
rsw k line 10k
.ends pixel
.model dpix d is=1f n=1.05 rs=10 cjo=1p
rl1 l0 l1 20
cl1 l1 0 0.2p
rl2 l1 l2 20
cl2 l2 0 0.2p
xp1 l1 pixel ip=0.7n
xp2 l2 pixel ip=1.3n
xp3 l2 pixel ip=0
itest 0 l0 dc 0
rf l0 out 1meg
cf l0 out 1p
eamp out 0 0 l0 1e5
.noise v(out) itest dec 10 1 1meg 1
.end
"""

work = tempfile.mkdtemp(prefix="schrot-scaled-")
net = os.path.join(work, "pixels.cir")
aug = os.path.join(work, "pixels-aug.cir")
with open(net, "w") as f:
    f.write(NETLIST)
proc = subprocess.run([SCHROT, "report", net, "--no-junction-correction", "--json", "-"], capture_output=True,
                      text=True, timeout=300)
true("report exits 0", proc.returncode == 0, proc.stderr)
rep = json.loads(proc.stdout)
proc = subprocess.run([SCHROT, "augment", net, "-o", aug], capture_output=True, text=True, timeout=300)
true("augment exits 0", proc.returncode == 0, proc.stderr)
deck = open(aug).read()
# instance path -> its generator's resistor, from the generator lines ("* schrot: xp1.iph carries ..." + rschgN)
probe_of = dict(re.findall(r"^\* schrot: (\S+) carries .*\n(rschg\d+) ", deck, re.M))
true("one top-level generator per pixel", sorted(probe_of) == ["xp1.iph", "xp2.iph", "xp3.iph"], deck)
deck += ".control\nrun\nset numdgt=15\nsetplot noise2\nprint all\nquit 0\n.endc\n"
with open(aug, "w") as f:
    f.write(deck)
run = subprocess.run(["ngspice", "-b", aug], capture_output=True, text=True, timeout=300, cwd=work)
true("plain ngspice runs the augmented deck", run.returncode == 0, run.stderr[-2000:])
summary = {m[0]: float(m[1]) for m in re.findall(r"^(onoise_total\S*) = (\S+)$", run.stdout, re.M)}
true("the simulator printed its per-device summary", len(summary) > 10, run.stdout[-2000:])


def sim_name(path):
    """x.y.r1 -> r.x.y.r1; r1 -> r1 (NGSPICE-NOTES.md section 1)."""
    return path if "." not in path else path.rsplit(".", 1)[1][0] + "." + path


n_rows, worst = 0, 0.0
for c in rep["contributions"]:
    power = c["output_rms_v"] ** 2
    if c["origin"] == "added" and c["dc_current_a"] == 0:
        continue  # the plain deck's generator is off (checked below), the report's row is exactly zero
    if c["origin"] == "added":
        key = "onoise_total_" + probe_of[c["device"]] + "_thermal"
        want = summary.get(key, 0.0) ** 2
    else:
        key = "onoise_total_" + sim_name(c["device"]) + "_" + c["generator"]
        scale = K / K_SIM if c["mechanism"] == "thermal" else Q / Q_SIM if c["mechanism"] == "shot" else 1.0
        want = summary.get(key, 0.0) ** 2 * scale
    close(f"{c['device']} {c['generator']} ({c['origin']}) band power = the simulator's {key}", power, want, 1e-9)
    worst = max(worst, abs(power - want) / max(power, want))
    n_rows += 1
true("every pixel's photocurrent and resistor is in the table",
     all(any(c["device"] == f"xp{k}.{d}" for c in rep["contributions"]) for k in (1, 2) for d in ("iph", "rsw")))
true("the zero photocurrent adds no noise", all(c["output_rms_v"] == 0 for c in rep["contributions"]
                                               if c["device"] == "xp3.iph" and c["origin"] == "added"))
off = summary.get("onoise_total_" + probe_of["xp3.iph"] + "_thermal", 0.0)
true("its generator in the plain deck is off (below 1e-20 of the total)", off ** 2 < 1e-20 * summary["onoise_total"] ** 2)
true(f"{n_rows} rows compared, worst relative difference {worst:.2e}", n_rows >= 10)
finish()

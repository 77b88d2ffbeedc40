#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot sweep: the shot-noise-limited crossover of a photocurrent into R (CHECK-VALUES row X2)."""
import json
import os
import subprocess
import tempfile
from schrot_check import SCHROT, close, true, finish

NETLIST = """photocurrent into a resistor
iph 0 a dc 10n
r1 a 0 {r}
.temp 26.85
.noise v(a) iph dec 10 1 1k 1
.end
"""

# X2: 2qI = 4kT/R gives I = 2kT/(qR): 51.704000 nA at 1 MOhm, 51.704000 pA at 1 GOhm, 300 K
# (derived; the 2kT/q rule is credited to P. C. D. Hobbs, Building Electro-Optical Systems,
# 2nd ed., Wiley 2009 - from memory). The issue asks for 1 %.
for r, lo, hi, want in (("1meg", "1n", "1u", 51.704e-9), ("1g", "1p", "1n", 51.704e-12)):
    d = tempfile.mkdtemp(prefix="schrot-sweep-")
    path = os.path.join(d, "x2.cir")
    with open(path, "w") as f:
        f.write(NETLIST.format(r=r))
    proc = subprocess.run([SCHROT, "sweep", path, "--vary", f"iph={lo}:{hi}:13", "--json", "-"],
                          capture_output=True, text=True, timeout=300)
    true(f"[X2] sweep exits 0 for R={r}", proc.returncode == 0, proc.stderr)
    if proc.returncode == 0:
        data = json.loads(proc.stdout)
        close(f"[X2] crossover current 2kT/(qR) for R={r}", data["crossover"]["value"], want, 1e-2)
        true(f"[X2] 13 points, logarithmic", len(data["points"]) == 13 and
             abs(data["points"][1]["value"] / data["points"][0]["value"] - 10 ** (3 / 12)) < 1e-9)
        # the points are the same whether one worker or two computed them
        proc1 = subprocess.run([SCHROT, "sweep", path, "--vary", f"iph={lo}:{hi}:13", "--json", "-", "--jobs", "1"],
                               capture_output=True, text=True, timeout=300)
        one = json.loads(proc1.stdout)
        true(f"[X2] one worker and two give the same points for R={r}",
             [p["output_rms_v"] for p in one["points"]] == [p["output_rms_v"] for p in data["points"]])

# No crossover inside the range gives null.
d = tempfile.mkdtemp(prefix="schrot-sweep-")
path = os.path.join(d, "x2.cir")
with open(path, "w") as f:
    f.write(NETLIST.format(r="1meg"))
proc = subprocess.run([SCHROT, "sweep", path, "--vary", "iph=1p:1n:4", "--json", "-"], capture_output=True, text=True)
true("[X2] no crossover below 1 nA into 1 MOhm: null", proc.returncode == 0 and json.loads(proc.stdout)["crossover"]["value"] is None,
     proc.stdout + proc.stderr)
# Verdict: shot/thermal power ratio of a photocurrent into R is 2qI/(4kT/R) = qIR/(2kT) (derived from
# the Schottky and Johnson-Nyquist densities; X1). At I = 4 x 2kT/(qR) it is 4, and the rest is r1.
from schrot_check import run
rc, data, out, err = run(NETLIST.format(r="1meg").replace("dc 10n", "dc %r" % (4 * 51.704e-9)), "report")
if data:
    close("[X1] verdict shot-to-rest power qIR/(2kT)", data["verdict"]["shot_to_rest_power"], 4.0, 1e-6)
    true("[X1] verdict names r1 as the rest and says shot-noise limited",
         data["verdict"]["dominant_other"] == "r1" and data["verdict"]["shot_noise_limited"] is True)
    true("[X1] the table's verdict line", "shot-noise limited by 4 x" in out, out)
rc, data, out, err = run(NETLIST.format(r="1meg").replace("dc 10n", "dc %r" % (51.704e-9 / 4)), "report")
if data:
    close("[X1] verdict below the crossover", data["verdict"]["shot_to_rest_power"], 0.25, 1e-6)
    true("[X1] not shot-noise limited below the crossover", data["verdict"]["shot_noise_limited"] is False
         and "not shot-noise limited: the rest is 4 x" in out, out)
# A .param sweep (alterparam + reset on the loaded circuit): the load at which 50 nA becomes
# shot-noise limited is R = 2kT/(qI) = 1.03408 MOhm at 300 K (X1, derived).
d = tempfile.mkdtemp(prefix="schrot-sweep-")
path = os.path.join(d, "param.cir")
with open(path, "w") as f:
    f.write(""".param sweep of the load
.param rload=1meg
iph 0 a dc 50n
r1 a 0 {rload}
.temp 26.85
.noise v(a) iph dec 10 1 1k 1
.end
""")
proc = subprocess.run([SCHROT, "sweep", path, "--vary", "rload=100k:10meg:9", "--json", "-"], capture_output=True,
                      text=True, timeout=300)
true("[X1] .param sweep exits 0", proc.returncode == 0, proc.stderr)
if proc.returncode == 0:
    close("[X1] crossover load 2kT/(qI)", json.loads(proc.stdout)["crossover"]["value"], 2 * 1.380649e-23 * 300 /
          (1.602176634e-19 * 50e-9), 1e-2)
# A temperature sweep of a fixed current into R: the shot-to-thermal ratio 2qI/(4kT/R) = qIR/(2kT)
# goes as 1/T, so it crosses 1 at T = qIR/(2k) in kelvin (X2 solved for T; derived from the Schottky
# and Johnson-Nyquist densities, CHECK-VALUES S1 and J1). 51.704 nA into 1 MOhm: 300.00 K = 26.85 C.
# Interpolating on log(degrees C) instead put it 2.6 K low; on the kelvin scale the 1/T law is exact.
with open(path, "w") as f:
    f.write(NETLIST.format(r="1meg").replace("dc 10n", "dc 51.704n"))
proc = subprocess.run([SCHROT, "sweep", path, "--vary", "temp=10:60:2", "--json", "-"], capture_output=True,
                      text=True, timeout=300)
true("[X2] temperature sweep exits 0", proc.returncode == 0, proc.stderr)
if proc.returncode == 0:
    t_k = 1.602176634e-19 * 51.704e-9 * 1e6 / (2 * 1.380649e-23)
    close("[X2] temperature crossover qIR/(2k), interpolated in kelvin", json.loads(proc.stdout)["crossover"]["value"]
          + 273.15, t_k, 1e-5)
# The sweep's plot: an SVG and a PNG of the same sweep, written beside its CSV.
for ext, magic in ((".svg", b"<?xml"), (".png", b"\x89PNG")):
    plot = os.path.join(d, "sweep" + ext)
    proc = subprocess.run([SCHROT, "sweep", path, "--vary", "temp=10:60:2", "--plot", plot, "--csv",
                           os.path.join(d, "sweep.csv"), "-q"], capture_output=True, text=True, timeout=300)
    true("[X2] sweep --plot writes a %s file" % ext, proc.returncode == 0 and os.path.exists(plot) and
         open(plot, "rb").read(5)[:len(magic)] == magic, proc.stderr)
proc = subprocess.run([SCHROT, "sweep", path, "--vary", "nosuch=1:2:3"], capture_output=True, text=True)
true("[X1] an unknown sweep name is exit 2", proc.returncode == 2 and "--vary 'nosuch'" in proc.stderr, proc.stderr)
finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot report against closed forms of shot and thermal noise (shared/CHECK-VALUES.md row IDs)."""
import math
from schrot_check import run, close, true, contribution, finish, Q, K


def shot_into_resistor(i):
    return f"""shot noise of a current into a noiseless resistor
iph 0 out dc {i!r}
rl out 0 1k noisy=0
.noise v(out) iph dec 10 1 1meg 1
.end
"""


# S2-S5: Schottky 2qI. W. Schottky, Ann. Phys. 1918, p. 541; formula confirmed in M. Johnson,
# Photodetection and Measurement (McGraw-Hill, 2003), section 3.2.
for i, want in ((1e-3, 1.7900707e-11), (1e-6, 5.6607007e-13), (1e-9, 1.7900707e-14), (1e-12, 5.6607007e-16)):
    rc, data, out, err = run(shot_into_resistor(i), "report", "--spot", "1k")
    if data:
        close(f"[S] input-referred shot density at I={i:g} A (Schottky)", data["spot"][0]["input_per_rthz"], want, 1e-7)
        c = contribution(data, "iph", "added")
        true(f"[S] carrier iph found as added shot row at I={i:g}", c is not None and c["mechanism"] == "shot")
        close(f"[S] output density = R*sqrt(2qI) at I={i:g}", c["spot_v_per_rthz"][0], 1e3 * want, 1e-7)
        close(f"[S] carrier density key at I={i:g}", data["carriers"][0]["density_a_per_rthz"], want, 1e-7)

# S8: rms shot noise in a brick-wall band sqrt(2qIB), I = 1 uA, B = 1 MHz (derived from S3).
rc, data, out, err = run(shot_into_resistor(1e-6).replace("dec 10 1 1meg", "dec 10 1 10meg"), "report",
                         "--band", "1:1000001")
if data:
    close("[S8] brick-wall band input rms sqrt(2qIB)", data["total"]["input_rms"], 566.07007e-12, 1e-7)
    close("[S8] shares sum to 1", sum(c["share"] for c in data["contributions"]), 1.0, 1e-12)

# J1/J5: Johnson-Nyquist 4kTR at 300 K: J. B. Johnson, Phys. Rev. 32, 97 (1928); H. Nyquist,
# Phys. Rev. 32, 110 (1928). 1 kOhm at 300 K: 4.0703548 nV/rtHz.
rc, data, out, err = run("""thermal noise of a resistor at 300 K
itest 0 out dc 0 ac 1
r1 out 0 1k
.temp 26.85
.noise v(out) itest dec 10 1 1meg 1
.end
""", "report", "--spot", "1k")
if data:
    close("[J1] resistor voltage density at 300 K", data["spot"][0]["output_v_per_rthz"], 4.0703548e-9, 1e-7)
    close("[J5] Norton current density at 300 K", data["spot"][0]["input_per_rthz"], 4.0703548e-12, 1e-7)
    close("[J1] temperature_k", data["temperature_k"], 300.0, 1e-12)
    c = contribution(data, "r1")
    true("[J1] the resistor row is thermal, from the simulator", c and c["mechanism"] == "thermal" and c["origin"] == "simulator")

# Temperature other than 27 C: J-row formula at 85 C (358.15 K), 1 MOhm: sqrt(4kTR) (derived).
rc, data, out, err = run("""thermal noise of a resistor at 85 C
itest 0 out dc 0 ac 1
r1 out 0 1meg
.options temp=85
.noise v(out) itest dec 10 1 1k 1
.end
""", "report", "--spot", "10")
if data:
    close("[J] resistor voltage density at 358.15 K", data["spot"][0]["output_v_per_rthz"],
          math.sqrt(4 * K * 358.15 * 1e6), 2e-6)
    close("[J] temperature_k at 85 C", data["temperature_k"], 358.15, 1e-12)

# Shot density at 85 C does not depend on temperature (2qI): the generator sizing must follow .temp.
rc, data, out, err = run(shot_into_resistor(1e-6).replace(".end", ".temp 85\n.end"), "report", "--spot", "1k")
if data:
    close("[S3] shot density unchanged at 85 C", data["spot"][0]["input_per_rthz"], 5.6607007e-13, 1e-7)

# K1/K5: kT/C independent of R. "Electronics" textbook, ch. 7, 7.11.1.2, eq. (7.101); K1: 1 pF at
# 300 K gives 64.357959 uV rms. Checked for R = 1 kOhm and 1 MOhm.
for r, lo, hi in (("1k", 1e3, 1e14), ("1meg", 1, 1e11)):
    rc, data, out, err = run(f"""kT/C: thermal noise of R in parallel with C over all frequency
itest 0 out dc 0 ac 1
r1 out 0 {r}
c1 out 0 1p
.temp 26.85
.noise v(out) itest dec 50 {lo} {hi} 1
.end
""", "report")
    if data:
        close(f"[K1/K5] kT/C rms with R={r}", data["total"]["output_rms_v"], 64.357959e-6, 2e-4)

# K6-K8: shot noise of I into R||C integrated over all frequency = qIR/(2C) (derived from the
# single-pole noise bandwidth, T. J. Sobering, "Equivalent Noise Bandwidth", SDE Technote 1, eqs. 1-3).
for i, r, c, want in ((1e-6, "1meg", "1p", 283.03504e-6), (1e-9, "1g", "10p", 89.503537e-6),
                      (1e-12, "1g", "1p", 8.9503537e-6)):
    rv = {"1meg": 1e6, "1g": 1e9}[r]
    cv = {"1p": 1e-12, "10p": 1e-11}[c]
    fc = 1 / (2 * math.pi * rv * cv)
    rc, data, out, err = run(f"""shot noise of a current into R||C
iph 0 out dc {i!r}
r1 out 0 {r} noisy=0
c1 out 0 {c}
.noise v(out) iph dec 50 {fc / 1e5!r} {fc * 1e6!r} 1
.end
""", "report")
    if data:
        close(f"[K6-K8] qIR/(2C) rms for I={i:g}", data["total"]["output_rms_v"], want, 2e-4)
        # K9: the same run read as a noise bandwidth: power / (2qI R^2) = (pi/2) f_3dB (Sobering,
        # "Equivalent Noise Bandwidth", SDE Consulting Technote 1, eqs. (1)-(3), Table 1)
        enbw = data["total"]["output_rms_v"] ** 2 / (2 * Q * i * rv * rv)
        close(f"[K9] single-pole noise bandwidth (pi/2) f_3dB for R={r}, C={c}", enbw, math.pi / 2 * fc, 2e-4)

# Ideal transimpedance stage: output density Rf*sqrt(2q*sum(I)) with a noiseless feedback resistor
# (closed form from Schottky 2qI; powers of independent sources add).
rc, data, out, err = run("""transimpedance stage with two detector currents
iph1 inv 0 dc 3u
idark inv 0 dc 2n
rf inv out 100k noisy=0
eamp out 0 0 inv 1e9
.noise v(out) iph1 dec 10 1 10k 1
.end
""", "report", "--spot", "100")
if data:
    close("[TIA] output density Rf*sqrt(2q(I1+I2))", data["spot"][0]["output_v_per_rthz"],
          1e5 * math.sqrt(2 * Q * (3e-6 + 2e-9)), 1e-6)
    true("[TIA] both currents are carriers", {c["name"] for c in data["carriers"]} == {"iph1", "idark"})

# Two instances of one subcircuit at different photocurrents: each row is 2q*I_instance (Schottky).
rc, data, out, err = run("""two photodiode instances with different photocurrents
.subckt pdcell a params: ip=1n
iph a 0 dc {ip}
rload a 0 1k noisy=0
.ends
xa na pdcell ip=4u
xb nb pdcell ip=1u
itest 0 na dc 0 ac 1
rsum na nb 1k noisy=0
eo out 0 na 0 1
.noise v(out) itest dec 10 1 1k 1
.end
""", "report", "--spot", "10")
if data:
    cur = {c["name"]: c["dc_current_a"] for c in data["carriers"]}
    close("[S] instance xa.iph current", cur.get("xa.iph"), 4e-6, 1e-9)
    close("[S] instance xb.iph current", cur.get("xb.iph"), 1e-6, 1e-9)
    dens = {c["name"]: c["density_a_per_rthz"] for c in data["carriers"]}
    close("[S] instance xa.iph density 2q*4uA", dens.get("xa.iph"), math.sqrt(2 * Q * 4e-6), 1e-7)
    close("[S] instance xb.iph density 2q*1uA", dens.get("xb.iph"), math.sqrt(2 * Q * 1e-6), 1e-7)
    # at node na: xa.iph sees 1k || (1k + 1k) = 666.67 ohm; xb.iph sees (1k||2k)/2 from its node through the divider
    a = contribution(data, "xa.iph", "added")
    close("[S] xa.iph output density 2q*I*|Z|^2 with Z = 1k||2k", a["spot_v_per_rthz"][0],
          math.sqrt(2 * Q * 4e-6) * (1e3 * 2e3 / 3e3), 1e-6)

# A forward-biased diode fed through a resistor by a bias current source: the simulator's own
# 2q*I_D appears once (origin simulator), the bias source is listed as noiseless, nothing doubled.
rc, data, out, err = run("""forward-biased diode from a bias source
ibias 0 a dc 1m
rser a k 10 noisy=0
d1 k 0 dfwd
.model dfwd d is=1e-14
itest 0 k dc 0 ac 1
.noise v(k) itest dec 10 1 1k 1
.end
""", "report", "--spot", "10", "--no-junction-correction")
if data:
    rows = [c for c in data["contributions"] if c["device"] == "d1"]
    true("[D] one diode row, from the simulator", len(rows) == 1 and rows[0]["origin"] == "simulator"
         and rows[0]["mechanism"] == "shot", repr(rows))
    true("[D] ibias is noiseless; the only carrier is the zero-current test source across d1",
         all(c["dc_current_a"] == 0 for c in data["carriers"]) and
         [s["name"] for s in data["noiseless_sources"]] == ["ibias"], repr(data["carriers"]))
    # tolerance 1e-5: the simulator's operating point meets KCL only to its Newton tolerance
    close("[D] input-referred density is 2qI_D (Schottky; I_D = 1 mA)", data["spot"][0]["input_per_rthz"],
          math.sqrt(2 * Q * 1e-3), 1e-5)
# Controlled sources as carriers: a behavioural G leakage inside a subcircuit and an F mirror named as
# a photocurrent. Their currents are read from the operating point, not from the small-signal
# solution: the density is 2q*sum|I| (Schottky) with I = 20 pA and 2 x 3 nA.
rc, data, out, err = run("""controlled-source carriers
.subckt cell a params: il=1p
gleak a 0 value={il}
.ends
x1 n cell il=20p
vs s 0 dc 0
iref 0 s dc 3n
fphoto 0 n vs 2
r1 n 0 1meg noisy=0
itest 0 n dc 0 ac 1
.noise v(n) itest dec 10 1 1k 1
.end
""", "report", "--spot", "10")
if data:
    cur = {c["name"]: c["dc_current_a"] for c in data["carriers"]}
    close("[S] G carrier current from the operating point", abs(cur.get("x1.gleak", 0)), 20e-12, 1e-6)
    close("[S] F carrier current from the operating point", abs(cur.get("fphoto", 0)), 6e-9, 1e-6)
    close("[S] input density 2q(I_G + I_F)", data["spot"][0]["input_per_rthz"], math.sqrt(2 * Q * (20e-12 + 6e-9)), 1e-6)
    true("[S] the reference source is listed as noiseless", [s["name"] for s in data["noiseless_sources"]] == ["iref"])
finish()

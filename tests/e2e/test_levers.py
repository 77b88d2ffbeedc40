#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""schrot levers against closed forms: a transimpedance stage's input-referred noise as its values
change, and the avalanche gain that maximises a receiver's SNR (shared/CHECK-VALUES.md row IDs)."""
import json
import math
import os
import subprocess
from schrot_check import run, close, true, finish, Q, K, SCHROT

ROOT = os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..")

T = 300.0  # .temp 26.85: 300 K exactly


def mcintyre_f(m, k):
    # A1: R. J. McIntyre, "Multiplication noise in uniform avalanche diodes", IEEE Trans. Electron
    # Devices ED-13(1), 164-168 (1966): F = kM + (1 - k)(2 - 1/M), electron injection.
    return k * m + (1 - k) * (2 - 1 / m)


def lever(data, change):
    for l in data["levers"]:
        if l["change"] == change:
            return l
    return None


# ---------------------------------------------------------------------------------------------
# A transimpedance stage (invented for the test): a 1 nA photocurrent (the input source), a 20 nA
# dark current, a 100 kOhm feedback resistor with 0.1 pF across it (15.9 MHz, far above the
# 10 kHz band), an amplifier of gain 1e6. Every current noise sits at the summing node and
# sees the same transfer, so the input-referred density is flat:
#   i_n^2 = 2q(I_ph + I_dark) + 4kT/R_f
# Kumar & Deen, Fiber Optic Communications: Fundamentals and Applications (Wiley, 2014), section
# 5.5, eq. (5.72) sigma^2 = 2q(I_PC + I_d)B_e and eq. (5.76) sigma^2 = 4k_B T B_e / R_L (rows S10, J5).
TIA = """transimpedance stage whose feedback resistor leads the noise (invented for the test)
iph 0 inv dc 1n
idark 0 inv dc 20n
rf inv out 100k
cf inv out 0.1p
eamp out 0 0 inv 1e6
.temp 26.85
.noise v(out) iph dec 10 1 100k 1
.end
"""
F1, F2 = 10.0, 10e3


def tia_in2(i_ph, i_dark, rf, t=T):
    return 2 * Q * (i_ph + i_dark) + 4 * K * t / rf


base = tia_in2(1e-9, 20e-9, 100e3)
rc, data, out, err = run(TIA, "levers", "--band", "10:10k", "--signal", "1n")
if data:
    close("[S10,J5] unchanged input-referred rms sqrt((2qI + 4kT/Rf) B)", data["unchanged"]["input_rms"],
          math.sqrt(base * (F2 - F1)), 1e-4)
    first = data["levers"][0]
    true("[S10,J5] the feedback resistor doubled ranks first", first["change"] == "rf 100k -> 200k", repr(first["change"]))
    close("[S10,J5] rf x2: input_rms_ratio against the hand calculation (1 %)", first["input_rms_ratio"],
          math.sqrt(tia_in2(1e-9, 20e-9, 200e3) / base), 0.01)
    close("[S10,J5] rf x2: the same ratio to 1e-4", first["input_rms_ratio"],
          math.sqrt(tia_in2(1e-9, 20e-9, 200e3) / base), 1e-4)
    close("[S10,J5] rf x2: SNR change in dB = -20 log10(ratio)", first["snr_change_db"],
          -10 * math.log10(tia_in2(1e-9, 20e-9, 200e3) / base), 1e-3)
    true("[S10,J5] rf x2: rf still leads", first["leader"] == "rf")
    l = lever(data, "rf 100k -> 50k")
    close("[S10,J5] rf /2: ratio", l and l["input_rms_ratio"], math.sqrt(tia_in2(1e-9, 20e-9, 50e3) / base), 1e-4)
    l = lever(data, "idark 20n -> 10n")
    close("[S10] idark /2: ratio", l and l["input_rms_ratio"], math.sqrt(tia_in2(1e-9, 10e-9, 100e3) / base), 1e-4)
    l = lever(data, "temp 300 K -> 290 K")
    close("[J5] temperature -10 K: ratio (the resistor's 4kT/R at 290 K)", l and l["input_rms_ratio"],
          math.sqrt(tia_in2(1e-9, 20e-9, 100e3, 290.0) / base), 1e-4)
    true("[levers] the input source is never a lever", all(l["device"] != "iph" for l in data["levers"]))
    true("[levers] best first", all(a["input_rms_ratio"] <= b["input_rms_ratio"]
                                    for a, b in zip(data["levers"], data["levers"][1:])))
    true("[levers] no bandwidth warning with the edge far above the band",
         not any(l["bandwidth_warning"] for l in data["levers"]))
    true("[levers] one run per lever", data["runs"] == len(data["levers"]))

# The same stage with 100 pF across the feedback resistor: 1/(2 pi Rf Cf) = 15.9 kHz, so doubling
# Rf puts the -3 dB edge at 7.96 kHz, below the band's 10 kHz top, and the tool must say so.
# Single-pole edge 1/(2 pi R C): common practice, no source.
rc, data, out, err = run(TIA.replace("cf inv out 0.1p", "cf inv out 100p"), "levers", "--band", "10:10k")
if data:
    l = lever(data, "rf 100k -> 200k")
    true("[RC edge] rf x2 with 100 pF: bandwidth warning", l and l["bandwidth_warning"])
    close("[RC edge] rf x2: the new -3 dB edge 1/(2 pi 200k 100p)", l and l["f_high_hz"],
          1 / (2 * math.pi * 200e3 * 100e-12), 0.03)
    l = lever(data, "rf 100k -> 50k")
    true("[RC edge] rf /2: no warning (the edge moves up)", l and not l["bandwidth_warning"])
    l = lever(data, "cf 100p -> 200p")
    true("[RC edge] cf x2 is a capacitor lever across rf, with a warning", l and l["kind"] == "capacitance"
         and l["bandwidth_warning"])

# ---------------------------------------------------------------------------------------------
# The avalanche gain that maximises SNR (rows A7, A8): primary photocurrent I_p = 10 nA at the
# rule's gain M = 100 (terminal current 1 uA), k = 0.02, into R_L = 10 kOhm at 300 K, band 1 MHz.
#   SNR(M) = (M I_p)^2 / (2q I_p M^2 F(M) B + 4kT B / R_L)
# Kumar & Deen (Wiley, 2014) eq. (5.73) sigma^2 = 2q M^2 F (RP + I_d) B_e with eq. (5.76) for the
# load; the optimum is where d/dM of M^2 / (2q I_p M^2 F(M) B + sigma^2) is zero, found here
# numerically from the closed form.
APD = """avalanche photodiode into a load resistor (invented; the rows A7 and A8 of the check values)
iapd 0 out dc 1u
rl out 0 10k
.temp 26.85
.noise v(out) iapd dec 10 1 10meg 1
.end
"""
IP, RL, B, KR, M0 = 10e-9, 10e3, 1e6, 0.02, 100.0


def snr_cf(m):
    return (m * IP) ** 2 / (2 * Q * IP * m * m * mcintyre_f(m, KR) * B + 4 * K * T * B / RL)


def golden_max(f, lo, hi):
    a, b = math.log(lo), math.log(hi)
    for _ in range(200):
        x1, x2 = b - 0.6180339887 * (b - a), a + 0.6180339887 * (b - a)
        if f(math.exp(x1)) < f(math.exp(x2)):
            a = x1
        else:
            b = x2
    return math.exp((a + b) / 2)


m_opt = golden_max(snr_cf, 1.0, 1e4)
rc, data, out, err = run(APD, "levers", "--band", "1:1000001", "--avalanche", "iapd=100:0.02", "--signal", "1u")
if data:
    close("[A8] SNR at the rule's gain M = 100: 7798.17", data["unchanged"]["snr"], 7798.17, 1e-5)
    g = data["gain_optimum"][0] if data["gain_optimum"] else None
    true("[A8] one gain curve, for iapd", g is not None and g["carrier"] == "iapd")
    close("[A8] the gain that maximises SNR against the closed form's numerical optimum (3 %)",
          g and g["gain_best"], m_opt, 0.03)
    close("[A8] SNR at the best gain against the closed form", g and g["snr_at_best"], snr_cf(m_opt), 0.01)
    close("[A8] SNR gain at the best gain, dB", g and g["snr_change_db_at_best"],
          10 * math.log10(snr_cf(m_opt) / snr_cf(M0)), 0.01)
    pts = g["curve"] if g else []
    mid = pts[len(pts) // 3] if pts else None
    close("[A8] a point of the SNR(M) curve", mid and mid["snr_change_db"],
          mid and 10 * math.log10(snr_cf(mid["gain"]) / snr_cf(M0)), 1e-3)
    # the gain levers are full runs (the terminal current changed, the generator at the new M)
    l = lever(data, "iapd gain 100 -> 50")
    close("[A8] gain lever M 100 -> 50: SNR change from full runs", l and l["snr_change_db"],
          10 * math.log10(snr_cf(50) / snr_cf(100)), 1e-3)
    l = lever(data, "iapd gain 100 -> 200")
    close("[A8] gain lever M 100 -> 200: SNR change from full runs", l and l["snr_change_db"],
          10 * math.log10(snr_cf(200) / snr_cf(100)), 1e-3)

# A10 sanity of the closed form itself: with F = M^x the optimum is (4kT/(x e R_L R P))^(1/(x+2))
# (Ghatak & Thyagarajan, Introduction to Fiber Optics, CUP 1999, Example 13.8: M_opt = 41.6413).
close("[A10] numerical optimiser on the F = M^x form", golden_max(
    lambda m: m * m / (2 * 1.6e-19 * 0.65 * 100e-9 * m ** 2.3 + 4 * 1.38e-23 * 300 / 1e3), 1, 1e4), 41.6413, 1e-4)

# A transistor has no value of its own: the current source at its emitter, its bias, is the lever
# (the hydrophone demo, invented). Checked as behaviour, no closed form: common practice, no source.
proc = subprocess.run([SCHROT, "levers", "netlists/hydrophone-preamp.cir", "--json", "-"], cwd=ROOT,
                      capture_output=True, text=True, timeout=300)
hyd = json.loads(proc.stdout) if proc.returncode == 0 else None
true("[levers] hydrophone: q1's bias source ibias is a current lever, both ways",
     hyd is not None and {l["change"] for l in hyd["levers"] if l["device"] == "ibias"} ==
     {"ibias 2m -> 1m", "ibias 2m -> 4m"}, proc.stderr)

# Safety (DESIGN.md section 6): a name that is not safe never reaches a simulator command.
rc, data, out, err = run("""a resistor whose name would run a command (invented)
iph 0 inv dc 1n
rf`touch_levers_pwn` inv out 100k
eamp out 0 0 inv 1e6
.noise v(out) iph dec 10 1 100k 1
.end
""", "levers", "--band", "10:10k")
if data:
    true("[safety] the unsafe name is passed over with a note",
         any("cannot be passed to the simulator safely" in n for n in data["notes"]))
    true("[safety] no lever for it", all(l["kind"] != "resistance" for l in data["levers"]))

finish()

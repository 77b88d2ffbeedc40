#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Avalanche gain, Fano factor, junction correction, NEP and SNR against published values
(shared/CHECK-VALUES.md row IDs in brackets)."""
import math
from schrot_check import run, close, true, contribution, finish, Q, K


def current_into_load(name, i):
    return f"""a detector current into a noiseless load
{name} 0 out dc {i!r}
rl out 0 1k noisy=0
.noise v(out) {name} dec 10 1 1meg 1
.end
"""


# A3/A7: McIntyre, IEEE Trans. Electron Devices ED-13(1), 164 (1966); Kumar & Deen, Fiber Optic
# Communications (Wiley, 2014), eq. (5.73). I_p = 10 nA, M = 100, k = 0.02: terminal current 1 uA,
# density 2q*I*M*F = 1.2657836e-22 A^2/Hz = (11.250705 pA/rtHz)^2.
rc, data, out, err = run(current_into_load("iapd", 1e-6), "report", "--avalanche", "iapd=100:0.02", "--spot", "1k")
if data:
    close("[A7] APD output-referred density 11.250705 pA/rtHz", data["spot"][0]["input_per_rthz"], 11.250705e-12, 1e-7)
    c = data["carriers"][0]
    close("[A3] excess factor F(100, 0.02) = 3.9502", c["excess_factor"], 3.9502, 1e-12)
    close("[A7] gain reported", c["gain"], 100, 0)
for m, k, f in ((10, 0.0, 1.9), (10, 0.5, 5.95), (100, 0.5, 50.995)):
    rc, data, out, err = run(current_into_load("iapd", 1e-6), "report", "--avalanche", f"iapd={m}:{k}", "--spot", "1k")
    if data:
        close(f"[A2/A4] F({m},{k})", data["carriers"][0]["excess_factor"], f, 1e-12)
        close(f"[A2/A4] density 2qIMF at M={m} k={k}", data["spot"][0]["input_per_rthz"],
              math.sqrt(2 * Q * 1e-6 * m * f), 1e-7)
# M < 1 and k outside [0, 1] are bad input (exit 2).
run(current_into_load("iapd", 1e-6), "report", "--avalanche", "iapd=0.5:0.02", expect_rc=2)
run(current_into_load("iapd", 1e-6), "report", "--avalanche", "iapd=10:1.5", expect_rc=2)

# F1-F3: Fano factors 1/3, 1/2, 1/4 at 1 uA: de Jong & Beenakker, "Shot noise in mesoscopic
# systems", NATO ASI Series E 345 (Kluwer, 1997).
for fano, want in (("0.333333333333333", 0.32682071e-12), ("0.5", 0.40027199e-12), ("0.25", 0.28303504e-12)):
    rc, data, out, err = run(current_into_load("itunnel", 1e-6), "report", "--fano", f"itunnel={fano}", "--spot", "1k")
    if data:
        close(f"[F] Fano {fano} density", data["spot"][0]["input_per_rthz"], want, 1e-6)
        true(f"[F] --fano names a carrier ({fano})", data["carriers"][0]["name"] == "itunnel")
run(current_into_load("itunnel", 1e-6), "report", "--fano", "itunnel=-0.1", expect_rc=2)

# P2: dark-limited photodiode, I_d = 1 nA, R_sh = 100 MOhm, 300 K, responsivity 0.5 A/W:
# i_n = 2.2047975e-14 A/rtHz, NEP = 4.4095950e-14 W/rtHz (Kumar & Deen eqs. (5.72), (5.76)).
rc, data, out, err = run("""dark-limited photodiode: dark current and shunt resistance
idark 0 a dc 1n
rsh a 0 100meg
.temp 26.85
.noise v(a) idark dec 10 1 1k 1
.end
""", "report", "--responsivity", "0.5", "--spot", "10")
if data:
    close("[P2] input noise current", data["spot"][0]["input_per_rthz"], 2.2047975e-14, 2e-6)
    close("[P2] NEP", data["spot"][0]["nep_w_per_rthz"], 4.4095950e-14, 2e-6)

# P3: thermal-limited NEP sqrt(4kT/R_L)/R = 4.5226164e-12 W/rtHz (R = 0.90 A/W, R_L = 1 kOhm, 300 K;
# Keiser, Fiber Optic Communications (Springer, 2021), Example 5.9, eq. (5.17), attribution from memory).
rc, data, out, err = run("""thermal-limited receiver: a dark photodiode into 1 kOhm
iph 0 a dc 0
rl a 0 1k
.temp 26.85
.noise v(a) iph dec 10 1 1k 1
.end
""", "report", "--responsivity", "0.9", "--spot", "10")
if data:
    close("[P3] thermal-limited NEP", data["spot"][0]["nep_w_per_rthz"], 4.5226164e-12, 2e-6)

# P6: shot-noise-limited SNR = I/(2qB) = 3.1207545e6 for I = 1 uA, B = 1 MHz (derived, K12).
rc, data, out, err = run(current_into_load("iph", 1e-6).replace("dec 10 1 1meg", "dec 10 1 10meg"), "report",
                         "--signal", "1u", "--band", "1:1000001")
if data:
    close("[P6] SNR ratio", data["snr"]["ratio"], 3.1207545e6, 1e-7)
    close("[P6] SNR dB", data["snr"]["db"], 64.9426, 1e-5)

# P8/P9: an unbiased dark junction across a noiseless load shows the thermal noise of its
# R0 = nkT/(qI_s): I_s = 1 pA, n = 1, 300 K: 4kT/R0 = 4qI_s = 6.4087065e-31 A^2/Hz (van der Ziel,
# Proc. IEEE 58(8), 1178 (1970), section II; the identity is derived).
# tnom = 26.85 C makes I_s = 1 pA hold at the 300 K of the check (the model scales I_s with temperature).
zero_bias = """an unbiased dark junction across a noiseless load
itest 0 a dc 0 ac 1
d1 a 0 dj
.model dj d is=1p n=1 tnom=26.85
rl a 0 1g noisy=0
.temp 26.85
.noise v(a) itest dec 10 1 1k 1
.end
"""
rc, data, out, err = run(zero_bias, "report", "--spot", "10")
if data:
    close("[P8/P9] zero-bias junction noise = 4kT/R0", data["spot"][0]["input_per_rthz"] ** 2, 6.4087065e-31, 1e-6)
    c = contribution(data, "d1", "correction")
    true("[P8] the correction row exists with origin correction", c is not None and c["share"] > 0.99)
rc, data, out, err = run(zero_bias, "report", "--spot", "10", "--no-junction-correction")
if data:
    true("[P8] without the correction the simulator shows no junction noise at zero bias",
         data["total"]["output_rms_v"] == 0 or contribution(data, "d1", "correction") is None)

# P8, V = -1 V and beyond: a reverse-biased dark junction carries 2q*I_s. I_s = 10 fA, 5 V reverse:
# the simulator alone reports 2q*(I_s + 5 V * GMIN) = 2q*5.01 pA (NGSPICE-NOTES section 3); the
# correction brings it back to 2q*I_s (van der Ziel 1970, section II).
rc, data, out, err = run("""a reverse-biased dark junction read by an ideal transimpedance stage
vrev k 0 dc 5
d1 inv k dj
.model dj d is=10f
itest 0 inv dc 0 ac 1
rf inv out 1g noisy=0
eamp out 0 0 inv 1e9
.noise v(out) itest dec 10 1 1k 1
.end
""", "report", "--spot", "10")
if data:
    close("[P8] reverse-biased junction density 2q*I_s", data["spot"][0]["input_per_rthz"] ** 2, 2 * Q * 10e-15, 1e-4)
    c = contribution(data, "d1", "correction")
    true("[P8] the correction lowers the simulator's GMIN-inflated noise (negative share)", c is not None and c["share"] < 0)

# Far forward bias: the correction leaves the simulator's 2q*I_D within 0.1 % (coth -> 1).
forward = """far forward bias
ib 0 a dc 1m
rs a k 1 noisy=0
d1 k 0 dj
.model dj d is=1e-14
itest 0 k dc 0 ac 1
.noise v(k) itest dec 10 1 1k 1
.end
"""
rc1, data1, _, _ = run(forward, "report", "--spot", "10")
rc2, data2, _, _ = run(forward, "report", "--spot", "10", "--no-junction-correction")
if data1 and data2:
    close("[P8] far forward bias: corrected equals the simulator alone within 0.1 %",
          data1["total"]["output_rms_v"], data2["total"]["output_rms_v"], 1e-3)
# Bipolar collector shot noise at picoamp bias, V_BE forced to 0.3 V: the physical collector current
# is the transport current I_S*exp(V_BE/V_T) (+ I_S/B_R for V_BC << 0), Ebers-Moll form (J. J. Ebers &
# J. L. Moll, Proc. IRE 42, 1761 (1954) - from memory; Gummel-Poon reduces to it at low injection),
# its density 2q*I_C (Rogers & Plett, Radio Frequency Integrated Circuit Design, 2nd ed., eq. (4.23)).
# The simulator alone adds GMIN*|V_BC| = 5 pA to the 10.9 pA it counts as shot noise.
bjt = """collector shot noise at a few picoamps, V_BE forced
vb b 0 dc 0.3
q1 c b 0 qm
rl c vcc 1k noisy=0
vcc vcc 0 dc 5
itest 0 c dc 0 ac 1
.model qm npn is=1e-16 bf=100 br=1
.noise v(c) itest dec 10 1 1k 1
.end
"""
vt = K * 300.15 / Q
rc, data, out, err = run(bjt, "report", "--spot", "10")
if data:
    # I_C = I_S(e^(V_BE/V_T) - 1) - I_BC(1 + 1/B_R) with I_BC = -I_S deep in reverse: I_S*e^(V_BE/V_T) + I_S
    close("[B2] collector shot noise of the junction current at picoamp bias", data["spot"][0]["input_per_rthz"],
          math.sqrt(2 * Q * (1e-16 * math.exp(0.3 / vt) + 1e-16)), 1e-4)
    c = contribution(data, "q1", "correction", "collector")
    true("[B2] the collector correction row lowers the simulator's GMIN-inflated 2q|I_C|", c is not None and c["share"] < 0)
rc, data, out, err = run(bjt, "report", "--spot", "10", "--no-junction-correction")
if data:
    true("[B2] without the correction the simulator's density is about 20 % high (GMIN current)",
         data["spot"][0]["input_per_rthz"] > 1.15 * math.sqrt(2 * Q * 1e-16 * math.exp(0.3 / vt)))
finish()

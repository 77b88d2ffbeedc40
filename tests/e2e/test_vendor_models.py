#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Vendor-style macro-models end to end (issue 12): the invented LUMA-PD3 photodiode model, whose
photocurrent is a G TABLE of its light pin (a code model in the simulator), and the invented
QA-271 op-amp model, whose bias, offset and clamp sources across diodes are not carriers.
Row IDs refer to shared/CHECK-VALUES.md."""
import math
import os
from schrot_check import run, close, true, contribution, finish, Q, K

MODELS = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "models"))
RESP = 0.52      # A/W: the LUMA-PD3 table's slope below 1 mW (0 -> 0, 1 mW -> 0.52 mA)
P_LIGHT = 0.5e-3  # W, mid-segment: the table's smoothing near breakpoints does not reach it
IPH = RESP * P_LIGHT
IS_DARK = 45e-12  # A: the model's diode IS; at 4.7 V reverse the junction carries -IS


def bench(light=P_LIGHT):
    return f"""reverse-biased LUMA-PD3 into a noiseless 1 kOhm load
.include {MODELS}/lumapd3.lib
vbias k 0 dc 5
vlight light 0 dc {light!r}
xpd out k light lumapd3
rl out 0 1k noisy=0
.noise v(out) vlight dec 10 10 100k 1
.end
"""


rc, data, out, err = run(bench(), "report", "--spot", "1k", "--spot", "50k")
if data:
    car = [c for c in data["carriers"] if c["name"] == "xpd.g1"]
    true("[table] the photodiode model's G TABLE generator is a carrier", len(car) == 1, str(data["carriers"]))
    if car:
        # the model's own table, linear between (0, 0) and (1 mW, 0.52 mA): derived
        close("[table] photocurrent at 0.5 mW from the light pin", car[0]["dc_current_a"], IPH, 1e-9)
        true("[table] chosen as the generator across the model's junction", "across diode xpd.d1" in car[0]["reason"],
             car[0]["reason"])
        # S1 (Schottky 2qI): W. Schottky, Ann. Phys. 1918, p. 541; formula confirmed in M. Johnson,
        # Photodetection and Measurement (McGraw-Hill, 2003), section 3.2
        close("[S1] carrier density sqrt(2qI) at 0.26 mA", car[0]["density_a_per_rthz"], math.sqrt(2 * Q * IPH), 1e-9)
    c = contribution(data, "xpd.g1", "added")
    true("[S1] the photocurrent's shot noise is an added shot row", c is not None and c["mechanism"] == "shot")
    if c:
        # into 1 kOhm (12 pF across it: (2 pi f R C)^2 / 2 = 3e-9 at 1 kHz)
        close("[S1] output density R*sqrt(2qI) at 1 kHz", c["spot_v_per_rthz"][0], 1e3 * math.sqrt(2 * Q * IPH), 1e-7)
    true("[P1] the input is the light pin's voltage source", data["input"] == "vlight" and data["input_unit"] == "V")
    # P1: i_n^2 = 2q(I_ph + I_d) (no shunt resistor here), NEP = i_n / R. Kumar & Deen eq. (5.72);
    # G. Keiser, Fiber Optic Communications (2021), section 5.3, eqs. (5.16)-(5.17) (attribution as in P1)
    nep = math.sqrt(2 * Q * (IPH + IS_DARK)) / RESP
    close("[P1] input-referred density through the light pin = shot-limited NEP", data["spot"][0]["input_per_rthz"],
          nep, 1e-6)
    # the transfer through the light pin is flat: the TABLE's slope, not the simulator's code-model
    # gain taken at the AC solution (which fell from 520 to 460 V/V above 10 kHz)
    close("[P1] the same NEP at 50 kHz (flat transfer through the TABLE)", data["spot"][1]["input_per_rthz"],
          nep, 1e-6)
    true("[P1] the note says the input-referred figures are already NEP",
         any("already NEP" in n for n in data.get("notes", [])) or "already NEP" in out, str(data.get("notes")))

# Twice the light, twice the photocurrent: S1 scales as sqrt(I) (derived)
rc, data2, out, err = run(bench(2 * P_LIGHT * 0.9), "report", "--spot", "1k")
if data2:
    car = [c for c in data2["carriers"] if c["name"] == "xpd.g1"]
    if car:
        close("[table] photocurrent at 0.9 mW", car[0]["dc_current_a"], RESP * 0.9e-3, 1e-9)
        close("[S1] carrier density at 0.9 mW", car[0]["density_a_per_rthz"], math.sqrt(2 * Q * RESP * 0.9e-3), 1e-9)

# The op-amp macro-model: its internal sources across diodes are not carriers (the amplifier-shape
# rule, common practice, no source); the photodiode model's generator still is.
rc, data, out, err = run(f"""canopy probe: LUMA-PD3 into a QA-271 transimpedance stage (invented values)
.include {MODELS}/qa271.lib
.include {MODELS}/lumapd3.lib
vcc vcc 0 dc 5
vee vee 0 dc -5
vlight light 0 dc 0.5m
xpd 0 inn light lumapd3
xop 0 inn vcc vee out qa271
rf out inn 100k
cf out inn 1p
.noise v(out) vlight dec 10 10 1meg 1
.end
""", "carriers")
if data:
    names = [c["name"] for c in data["carriers"]]
    true("[rule] only the photodiode's generator is a carrier", names == ["xpd.g1"], str(names))
    quiet = {s["name"]: s.get("reason", "") for s in data["noiseless_sources"]}
    for n in ("xop.ios", "xop.iref", "xop.ilim1", "xop.ilim2"):
        true(f"[rule] {n} is a construct of the amplifier-shaped model", "amplifier-shaped 'qa271'" in quiet.get(n, ""),
             str(quiet))
# A code-model (A) device in the noise path: an s_xfer single pole, tau = 1 ms, after a resistor's
# thermal noise. J rows: Johnson-Nyquist 4kT/R (J. B. Johnson, Phys. Rev. 32, 97 (1928); H. Nyquist,
# Phys. Rev. 32, 110 (1928)); |H| = 1/sqrt(1 + (2 pi f tau)^2), the single-pole response (derived).
# Without the AC analysis schrot runs first, ngspice 39 gave a density rising with frequency.
rc, data, out, err = run("""s-domain low-pass code model after a 1 kOhm source resistance
iin 0 l dc 0
rl l 0 1k
a1 l o filt
.model filt s_xfer(in_offset=0 gain=1 num_coeff=[1] den_coeff=[1e-3 1] int_ic=[0] denormalized_freq=1)
ro o 0 1k
.noise v(o) iin dec 10 10 10k 1
.end
""", "report", "--spot", "100", "--spot", "1k", "--spot", "10k")
if data:
    for s, f in zip(data["spot"], (100.0, 1e3, 1e4)):
        want = math.sqrt(4 * K * 300.15 / 1e3) * 1e3 / math.sqrt(1 + (2 * math.pi * f * 1e-3) ** 2)
        close(f"[J] thermal noise through the s_xfer pole at {f:g} Hz", s["output_v_per_rthz"], want, 1e-5)
    true("[A] the note says a one-point AC analysis ran first",
         any("one-point AC analysis" in n for n in data.get("notes", [])), str(data.get("notes")))
finish()

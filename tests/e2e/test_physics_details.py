#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Physics details of issue 13 item 6: the zero-bias junction's Nyquist noise, sources without DC
current, the junction note's count, the Fano factor's frequency limit, pulsed carriers sized at
their operating point, and the arrivals run's resolution warnings (CHECK-VALUES row IDs in brackets)."""
import json
import math
import os
import subprocess
import tempfile
from schrot_check import SCHROT, run, close, true, contribution, finish, Q, K

# [P9] A junction at zero bias: 4kT/R0 with R0 = kT/(qI_s) for n = 1, i.e. 4qI_s = 6.4087065e-31 A^2/Hz
# at I_s = 1 pA, 300 K (derived; A. van der Ziel, Proc. IEEE 58(8), 1178 (1970), section II, from
# memory for the equation). Here at the model's nominal 27 C (300.15 K), where I_s is the model's own
# (away from it I_s moves by about 15 %/K). The diode sits alone across a noiseless 1 kOhm load; the
# AC test source across it has no DC current and is no carrier.
ZERO_BIAS = """a photodiode at zero bias (photovoltaic mode, dark) into a noiseless load
d1 a 0 dpv
.model dpv d is=1p n=1
rl a 0 1k noisy=0
itest 0 a ac 1
.noise v(a) itest dec 10 1 1k 1
.end
"""
rc, data, out, err = run(ZERO_BIAS, "report", "--spot", "100", "--show-corrections")
if data:
    rows = [c for c in data["contributions"] if c["device"] == "d1" and c["origin"] == "correction"]
    true("[P9] the zero-bias junction's row is thermal noise of its conductance, with no DC current beside it",
         len(rows) == 1 and rows[0]["mechanism"] == "thermal" and rows[0]["dc_current_a"] is None, data["contributions"])
    r0 = K * 300.15 / (Q * 1e-12)                  # 2.5865e10 Ohm
    z = 1e3 * r0 / (1e3 + r0)                      # the load in parallel with R0 (the junction's own conductance)
    close("[P9] output density = sqrt(4kT/R0) x |Z| at zero bias", data["spot"][0]["output_v_per_rthz"],
          math.sqrt(4 * K * 300.15 / r0) * z, 1e-6)
    true("[P9] an AC test source across the diode is not a carrier", data["carriers"] == [], data["carriers"])
    true("[P9] the table says thermal for d1 junction", any("junction" in l and "thermal" in l for l in out.splitlines()), out)

# A forward junction's correction 4qI_s next to 2qI (P8: S = 2q(I + 2I_s)) is far below 1e-9 of the
# output noise at 1 mA and 10 fA: the table leaves its row out and the note says so.
FORWARD = """a forward-biased diode and a zero-bias one off the output
ib 0 a dc 1m
d1 a 0 dmod
d2 b 0 dmod
rb b 0 1meg
.model dmod d is=10f
.noise v(a) ib dec 10 1 1meg 1
.end
"""
rc, data, out, err = run(FORWARD, "report")
if data:
    listed = [c for c in data["contributions"] if c["origin"] == "correction"]
    note = [n for n in data.get("notes", []) if n.startswith("junction correction")]
    true("[P8] no junction correction row listed", listed == [], listed)
    true("[P8] the junction note counts the rows left out", len(note) == 1 and
         "2 of these rows are below 1e-9 of the output noise power, left out of the table" in note[0], note)

# [F2] A Fano factor describes windows holding many electrons: 2qIF holds well below the electron
# rate I/q (de Jong & Beenakker, NATO ASI Series E 345 (1997); "a decade below" is common practice,
# no source). 10 fA is 62.4 kHz of electrons: a band to 1 MHz reaches it.
FANO = """a tunnel-barrier current into a load
ibar 0 a dc 10f
rl a 0 1g
.noise v(a) ibar dec 10 1 1meg 1
.end
"""
rc, data, out, err = run(FANO, "report", "--fano", "ibar=0.5")
true("[F2] the Fano carrier's note gives its electron rate I/q = 62.4 kHz",
     "ibar: 2q|I|F with F = 0.5 holds for frequencies well below its electron rate |I|/q = 62.4 kHz" in out, out)
true("[F2] a band reaching within a decade of I/q is warned about", "warning: the band reaches 1.00 MHz" in err, err)
rc, data, out, err = run(FANO, "report", "--fano", "ibar=0.5", "--band", "1:1k")
true("[F2] a band well below I/q draws no warning", "warning" not in err, err)

# A pulsed carrier is sized from its DC operating point: PULSE(0 ...) starts at 0 A, so its shot
# noise is zero (and said so); SIN(100n ...) starts at its 100 nA offset: 2q x 100 nA (S1:
# W. Schottky, Ann. Phys. 57, 541 (1918)) into 100 kOhm.
PULSED = """a pulsed and a modulated photocurrent into a noiseless load
iph 0 a pulse(0 1u 1u 1n 1n 5u 10u)
iled 0 a sin(100n 50n 1k)
rl a 0 100k noisy=0
itest 0 a ac 1
.noise v(a) itest dec 10 1 1k 1
.end
"""
rc, data, out, err = run(PULSED, "report", "--carrier", "iph|iled", "--spot", "100")
true("[S1] the PULSE carrier's note names the operating-point current used",
     "iph is a PULSE source: its shot noise is sized from its DC operating-point current 0 A" in out, out)
true("[S1] ... and a zero current is warned about", "warning: carrier iph is a PULSE source with no current" in err, err)
if data:
    reasons = {c["name"]: c["reason"] for c in data["carriers"]}
    true("[S1] the carrier list says each time-function carrier is sized at its DC operating point",
         reasons.get("iph", "").endswith("PULSE source, sized at its DC operating point") and
         reasons.get("iled", "").endswith("SIN source, sized at its DC operating point"), reasons)
    close("[S1] the SIN carrier is sized from its 100 nA offset", data["spot"][0]["output_v_per_rthz"],
          math.sqrt(2 * Q * 100e-9) * 1e5, 1e-6)

# arrivals: shot noise into R||C is a filtered Poisson process whose output forgets its past as
# e^(-t/RC) (Campbell's theorem and the RC impulse response; the Ornstein-Uhlenbeck autocorrelation,
# C. W. Gardiner, Handbook of Stochastic Methods, 3rd ed., Springer 2004, section 3.8.4, from memory).
# Windows of one RC = 1 ms are correlated e^-1 = 0.368 from one to the next: warned about.
RC = """a leakage current into R parallel C
ileak 0 a dc 1p
r1 a 0 1g
c1 a 0 1p
.noise v(a) ileak dec 10 1 1k 1
.end
"""
rc, data, out, err = run(RC, "arrivals", "--window", "1m", "--windows", "4000", "--settle", "10m")
if data:
    close("[N] lag-1 correlation of windows one RC long is e^-1", data["output_lag1_correlation"], math.exp(-1), 0.15)
    close("[N] the shortest RC estimated from the deck", data["shortest_rc_s"], 1e-3, 1e-12)
true("[N] correlated windows are warned about", "warning: successive windows' outputs are correlated" in err, err)
rc, data, out, err = run(RC, "arrivals", "--window", "10m", "--windows", "300", "--settle", "10m")
true("[N] a step of a fifth of RC is coarse: warned", "warning: the step 200 µs is coarse against the circuit's "
     "shortest time constant, about 1.00 ms (c1 with r1)" in err, err)
rc, data, out, err = run(RC, "arrivals", "--window", "20m", "--windows", "300", "--step", "10u", "--settle", "10m")
true("[N] windows of 20 RC with a fine step: no warning", "warning" not in err, err)
if data:
    true("[N] ... and their lag-1 correlation is small (e^-20)", abs(data["output_lag1_correlation"]) < 0.2,
         data["output_lag1_correlation"])
finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""A noise analysis stated inside .control (read as data, never run) reports exactly as the same deck
with a .noise card; a single-frequency run is a spot analysis checked against closed forms."""
import math
from schrot_check import run, close, true, contribution, finish, read_raw, Q, K, SCHROT as SCHROT_BIN

CIRCUIT = """range-finder receiver front end (invented values)
iph 0 pd dc 2u
dpd pd 0 dapd
.model dapd d is=5p n=1.1 cjo=3p
rf pd out 20k
ro out 0 1meg
cf pd out 0.5p
"""

CARD_FORM = CIRCUIT + """.temp 45
.noise v(out) iph dec 10 10 10meg 1
.end
"""

# the way most public decks state it: upper case, a continuation, op and a temperature before it,
# output commands after it
CONTROL_FORM = CIRCUIT + """.control
Set Temp = 45
OP
NOISE V(OUT) IPH
+ DEC 10 10 10MEG 1
print onoise_total inoise_total
setplot noise1
plot onoise_spectrum
.endc
.end
"""


def strip_origin(data):
    """The JSON without what names the file or the notes (the .control form has two notes more)."""
    d = dict(data)
    for key in ("netlist", "notes"):
        d.pop(key, None)
    return d


rc, card, card_out, _ = run(CARD_FORM, "report", "--spot", "1k", "--spot", "1meg", name="card.cir")
rc, ctl, ctl_out, ctl_err = run(CONTROL_FORM, "report", "--spot", "1k", "--spot", "1meg", name="card.cir")
if card and ctl:
    true("[C1] the .control form's JSON equals the .noise card form's (notes aside)",
         strip_origin(card) == strip_origin(ctl))
    true("[C1] same temperature from 'set temp' as from '.temp' (318.15 K)", ctl["temperature_k"] == card["temperature_k"]
         and abs(ctl["temperature_k"] - 318.15) < 1e-9)
    # the tables differ only in the notes: every line above them is the same
    head = lambda s: s.split("assumptions and corrections")[0].split("\n", 1)[1]  # below the file name
    true("[C1] the .control form's table equals the .noise card form's above the notes",
         head(card_out) == head(ctl_out), "\n" + card_out + "\n" + ctl_out)
    true("[C1] the notes say where the noise analysis came from",
         any("read from the '.control' block at" in n and "card.cir:11" in n for n in ctl["notes"]))
    true("[C1] the notes list the output commands as not honoured",
         any("after the noise command: 'print' (line 13), 'setplot' (line 14), 'plot' (line 15)" in n
             for n in ctl["notes"]))


# Spot run: a photocurrent into a resistor at 300 K, one frequency.
# Schottky 2qI (W. Schottky, Ann. Phys. 1918, p. 541; shared/CHECK-VALUES.md S rows) and
# Johnson-Nyquist 4kTR (J. B. Johnson, Phys. Rev. 32, 97 (1928); H. Nyquist, Phys. Rev. 32, 110 (1928)).
I, R, T = 50e-9, 200e3, 300.0
SPOT = f"""turbidity sensor channel, one spot frequency (invented values)
iph 0 a dc {I!r}
rsense a 0 {R!r}
.control
set temp = {T - 273.15!r}
noise v(a) iph dec 1 1k 1k
.endc
.end
"""
rc, data, out, err = run(SPOT, "report")
if data:
    shot = math.sqrt(2 * Q * I) * R
    thermal = math.sqrt(4 * K * T * R)
    true("[C2] a single-frequency run is a spot run", data.get("spot_run") is True)
    true("[C2] one spot, at the run's frequency", len(data["spot"]) == 1 and data["spot"][0]["frequency_hz"] == 1000.0)
    close("[C2] spot output density sqrt(2qI R^2 + 4kTR) (Schottky, Johnson-Nyquist)",
          data["spot"][0]["output_v_per_rthz"], math.hypot(shot, thermal), 2e-6)
    close("[C2] spot input density sqrt(2qI + 4kT/R)", data["spot"][0]["input_per_rthz"],
          math.sqrt(2 * Q * I + 4 * K * T / R), 2e-6)
    c = contribution(data, "iph", "added")
    close("[C2] carrier row at the spot: R sqrt(2qI) (Schottky)", c and c["spot_v_per_rthz"][0], shot, 1e-7)
    close("[C2] carrier share of the density at the spot", c and c["share"], shot ** 2 / (shot ** 2 + thermal ** 2), 2e-6)
    close("[C2] shares sum to 1", sum(x["share"] for x in data["contributions"]), 1.0, 1e-12)
    band = [data["total"][k] for k in ("output_rms_v", "input_rms", "output_power_v2", "nep_band_w_per_rthz")]
    true("[C2] band figures are absent (null), never 0/0", band == [None] * 4, repr(band))
    true("[C2] no row has a band rms", all(x["output_rms_v"] is None and x["band_power_v2"] is None
                                           for x in data["contributions"]))
    true("[C2] the table says it is a spot run", "1.00 kHz only (a single-frequency run" in out)
    true("[C2] no nan or inf anywhere in the table", "nan" not in out.lower() and "inf " not in out.lower())

# The same circuit swept over a band: its interpolated spot at 1 kHz is the spot run's value.
rc, swept, out, err = run(SPOT.replace("dec 1 1k 1k", "dec 10 10 100k"), "report", "--spot", "1k")
if data and swept:
    close("[C3] the spot run equals the swept run's spot at 1 kHz", data["spot"][0]["output_v_per_rthz"],
          swept["spot"][0]["output_v_per_rthz"], 1e-6)

# The augmented deck of a spot run: plain 'ngspice -b -r' runs it (exit 0, no noise2 totals needed) and
# the one density in its raw file equals schrot's spot (the same generators, sized from the same
# operating point).
if data:
    import os, subprocess, tempfile
    d = tempfile.mkdtemp(prefix="schrot-e2e-")
    src, aug, raw = os.path.join(d, "spot.cir"), os.path.join(d, "spot.aug.cir"), os.path.join(d, "spot.raw")
    with open(src, "w") as f:
        f.write(SPOT)
    subprocess.run([SCHROT_BIN, "augment", src, "-o", aug], capture_output=True, timeout=300)
    proc = subprocess.run(["ngspice", "-b", "-r", raw, aug], capture_output=True, text=True, timeout=300, cwd=d)
    dens = [v["onoise_spectrum"] for _, v in (read_raw(raw) if os.path.exists(raw) else []) if "onoise_spectrum" in v]
    true("[C4] plain ngspice runs the augmented spot deck, exits 0 and writes its one density",
         proc.returncode == 0 and len(dens) == 1 and len(dens[0]) == 1, proc.stdout[-2000:] + proc.stderr[-2000:])
    if dens:
        close("[C4] plain ngspice's density of the augmented spot deck = schrot's spot", dens[0][0],
              data["spot"][0]["output_v_per_rthz"], 1e-5)

finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""report --lump REGEX: matching resistors as one row, from two runs (DESIGN.md section 7, issue 7).

The lump's row is the circuit's own noise (a run with every resistor noisy and schrot's generators
quiet) less the simulator's rows of the per-device run, where the lumped resistors were quiet.
Checks:
  - Thermal noise of resistors in series: the open-circuit noise density of a chain is
    4kT(R1 + R2 + ...): 4kTR per resistor (CHECK-VALUES J1: J. B. Johnson, "Thermal agitation of
    electricity in conductors", Phys. Rev. 32, 97 (1928); H. Nyquist, "Thermal agitation of
    electric charge in conductors", Phys. Rev. 32, 110 (1928)), and independent resistors add
    their noise powers (derived).
  - Against the straightforward path (every resistor its own row): the same total to 1e-9, the lump
    equal to the sum of the rows it replaces to 1e-9, every other row unchanged to 1e-9.
  - Bad uses exit 2 with a message: no match, a subcircuit resistor matched in only some instances,
    a bad regex, --lump outside 'report'.
"""
from schrot_check import K, run, close, true, contribution, finish

T = 300.15  # K: the simulator's default temperature, 27 degrees C

# Invented: a strain-gauge bridge arm read as a chain of ten 100-ohm film segments to ground; the
# test current source only defines the noise input.
CHAIN = """gauge arm as ten film segments
itest 0 a dc 0 ac 1
r1 a n1 100
r2 n1 n2 100
r3 n2 n3 100
r4 n3 n4 100
r5 n4 n5 100
r6 n5 n6 100
r7 n6 n7 100
r8 n7 n8 100
r9 n8 n9 100
r10 n9 0 100
.noise v(a) itest dec 10 1 1k 1
.end
"""

rc, data, out, err = run(CHAIN, "report", "--lump", "r[0-9]+")
lump = [c for c in data["contributions"] if c["device_count"] > 1] if data else []
true("chain: one lumped row", len(lump) == 1 and lump[0]["device_count"] == 10, str(lump))
if lump:
    # Nyquist 1928: density 4kT*R_total, flat, over 1 Hz..1 kHz
    close("chain: lump band power = 4kT*(10*100 ohm)*(1k-1) Hz (J1, Johnson 1928; Nyquist 1928)", lump[0]["band_power_v2"],
          4 * K * T * 1000.0 * 999.0, 1e-9)
    close("chain: lump share = 1", lump[0]["share"], 1.0, 1e-12)
    true("chain: lump row says thermal, simulator", lump[0]["mechanism"] == "thermal" and
         lump[0]["origin"] == "simulator" and lump[0]["dc_current_a"] is None)

# Invented: two light-sensor pixels on a short readout line into a transimpedance stage, the line
# segments named rl*, as an extractor would.
PIXELS = """two pixels on a readout line
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
rl3 l2 l3 20
cl3 l3 0 0.2p
xp1 l1 pixel ip=0.7n
xp2 l3 pixel ip=1.3n
itest 0 l0 dc 0
rf l0 out 1meg
cf l0 out 1p
eamp out 0 0 l0 1e5
.noise v(out) itest dec 10 1 1meg 1
.end
"""

rc, plain, _, _ = run(PIXELS, "report", "--spot", "1k", "--spot", "100k")
rc, lumped, _, _ = run(PIXELS, "report", "--lump", "rl.*|x.*\\.rsw", "--spot", "1k", "--spot", "100k")
if plain and lumped:
    close("pixels: total output rms, lumped vs one row per device", lumped["total"]["output_rms_v"],
          plain["total"]["output_rms_v"], 1e-9)
    for j in range(2):
        close("pixels: total spot %d" % j, lumped["spot"][j]["output_v_per_rthz"],
              plain["spot"][j]["output_v_per_rthz"], 1e-9)
    names = {"rl1", "rl2", "rl3", "xp1.rsw", "xp2.rsw"}
    replaced = [c for c in plain["contributions"] if c["device"] in names]
    lump = [c for c in lumped["contributions"] if c["device_count"] > 1]
    true("pixels: five resistors in one row", len(lump) == 1 and lump[0]["device_count"] == 5 and
         len(replaced) == 5, str([c["device"] for c in replaced]))
    if lump and replaced:
        close("pixels: lump band power = sum of the rows it replaces", lump[0]["band_power_v2"],
              sum(c["band_power_v2"] for c in replaced), 1e-9)
        for j in range(2):
            close("pixels: lump spot %d = rss of the rows it replaces" % j, lump[0]["spot_v_per_rthz"][j],
                  sum(c["spot_v_per_rthz"][j] ** 2 for c in replaced) ** 0.5, 1e-9)
    others = [c for c in plain["contributions"] if c["device"] not in names]
    worst = 0.0
    missing = []
    for c in others:
        m = contribution(lumped, c["device"], c["origin"], c["generator"])
        if m is None:
            missing.append(c["device"] + "/" + c["generator"])
            continue
        if c["band_power_v2"] != 0:
            worst = max(worst, abs(m["band_power_v2"] / c["band_power_v2"] - 1))
    true("pixels: every other row kept (%d rows)" % len(others), not missing, str(missing))
    true("pixels: every other row unchanged to 1e-9 (worst %.2g)" % worst, worst <= 1e-9)
    close("pixels: carrier shot power unchanged", lumped["total"]["carrier_shot_power_v2"],
          plain["total"]["carrier_shot_power_v2"], 1e-12)

# Many resistors without --lump: the notes say that it exists (2000 or more resistor instances).
MANY = "many film segments\nitest 0 n0 dc 0 ac 1\n" + "".join(
    "r%d n%d n%d 1\n" % (i, i, i + 1) for i in range(2000)) + "r2000 n2000 0 1\n.noise v(n0) itest dec 1 1 10 1\n.end\n"
rc, many, _, _ = run(MANY, "report")
true("2001 resistors: a note names --lump", many is not None and any("--lump" in n for n in many.get("notes", [])))
rc, many, _, _ = run(MANY, "report", "--lump", "r[0-9]+")
if many:
    close("2001 one-ohm segments: lump = 4kT*2001 ohm*9 Hz (J1, Johnson 1928; Nyquist 1928)", many["contributions"][0]["band_power_v2"],
          4 * K * T * 2001.0 * 9.0, 1e-9)

# Bad uses: exit 2 and a message.
rc, _, _, err = run(PIXELS, "report", "--lump", "nosuch.*", expect_rc=2)
true("no match: message", "matches no resistor" in err, err)
rc, _, _, err = run(PIXELS, "report", "--lump", "xp1\\.rsw", expect_rc=2)
true("one instance of a subcircuit resistor: message", "some instances" in err and "rsw" in err, err)
rc, _, _, err = run(PIXELS, "report", "--lump", "(", expect_rc=2)
true("bad regex: message", "--lump" in err, err)
rc, _, _, err = run(PIXELS, "sweep", "--lump", "rl.*", "--vary", "itest=0:1n:3", expect_rc=2)
true("sweep --lump: message", "report" in err, err)
rc, _, _, err = run(PIXELS, "report", "--lump", "rl.*", "--lump", "rf", expect_rc=2)
true("--lump twice: message", "twice" in err, err)

finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Every demo netlist in netlists/ reports (exit 0, a consistent ranked table and JSON) and its
carriers are the ones the scenario describes. Where a demo's flat low-frequency gain is its
feedback resistor, the carrier's row is compared with the closed form (CHECK-VALUES S1, J1, A1)."""
import json
import math
import os
import subprocess

from schrot_check import Q, K, SCHROT, close, true, finish

ROOT = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))

# name: (report options, expected carriers, expected noiseless sources, the largest contributor)
DEMOS = {
    "canopy-probe": ([], ["iph"], [], ("iph", "shot")),
    "rangefinder-apd": (["--avalanche", "iapd=50:0.02", "--responsivity", "0.5"], ["iapd"], [], ("iapd", "shot")),
    "turbidity-2ch": ([], ["xdirect.iph", "xscatter.iph"], [], ("xdirect.iph", "shot")),
    "picoammeter-leakage": ([], ["ileak"], [], ("rf", "thermal")),
    "hydrophone-preamp": ([], [], ["ibias"], ("q1", "ib")),
    "paddock-gate-beam": ([], ["iph", "idark"], [], ("rf", "thermal")),
}


def carrier_options(opts):
    """The carrier rules among a demo's report options: 'schrot carriers' refuses the others (exit 2)."""
    kept = []
    for k in range(0, len(opts), 2):
        if opts[k] in ("--carrier", "--ignore", "--avalanche", "--fano"):
            kept += opts[k:k + 2]
    return kept


def schrot(*args):
    proc = subprocess.run([SCHROT] + list(args), cwd=ROOT, capture_output=True, text=True, timeout=300)
    return proc.returncode, proc.stdout, proc.stderr


def table_names(text, header):
    """First-column names of the table under the header line that starts with header."""
    lines = text.splitlines()
    for i, line in enumerate(lines):
        if line.strip().startswith(header) and i + 1 < len(lines) and lines[i + 1].strip().startswith("─"):
            names = []
            for row in lines[i + 2:]:
                if not row.strip():
                    break
                names.append(row.split()[0])
            return names
    return []


on_disk = sorted(f[:-4] for f in os.listdir(os.path.join(ROOT, "netlists")) if f.endswith(".cir"))
true("[D] the test covers every demo netlist in netlists/", on_disk == sorted(DEMOS), repr(on_disk))

for name, (opts, carriers, noiseless, largest) in DEMOS.items():
    netlist = "netlists/%s.cir" % name

    rc, out, err = schrot("report", netlist, *opts)
    # the only message allowed: the demos' .noise ranges run past their stages' bandwidth (issue 13)
    others = [l for l in err.splitlines() if "the transfer's -3 dB point" not in l]
    true("[D] %s: report exits 0 with nothing on stderr but the band warning" % name, rc == 0 and not others, err)
    true("[D] %s: the table heads the report and names the simulator" % name,
         out.startswith("schrot noise report: " + netlist) and "simulator: ngspice-" in out, out[:200])
    true("[D] %s: the table ranks the contributions" % name, "largest share of the band's output noise power first"
         in out and table_names(out, "#  device")[:1] == ["1"])

    rc, out, err = schrot("report", netlist, *opts, "--json", "-")
    data = json.loads(out) if rc == 0 else None
    true("[D] %s: report --json - exits 0" % name, data is not None, err)
    if data is None:
        continue
    total = data["total"]
    true("[D] %s: positive, finite output and input-referred noise" % name,
         all(math.isfinite(v) and v > 0 for v in (total["output_rms_v"], total["input_rms"])), repr(total))
    true("[D] %s: the band lies inside the .noise range and is ordered" % name,
         0 < data["band_hz"][0] < data["band_hz"][1])
    close("[D] %s: shares sum to 1 (DESIGN.md section 5)" % name, sum(c["share"] for c in data["contributions"]), 1.0, 1e-9)
    close("[D] %s: band powers sum to the total" % name, sum(c["band_power_v2"] for c in data["contributions"]),
          total["output_power_v2"], 1e-9)
    shares = [c["share"] for c in data["contributions"]]
    true("[D] %s: rows ranked by share, largest first" % name, shares == sorted(shares, reverse=True) or
         [s for s in shares if s >= 0] == sorted([s for s in shares if s >= 0], reverse=True), repr(shares))
    top = data["contributions"][0]
    true("[D] %s: the largest contributor is %s %s" % (name, *largest), (top["device"], top["generator"]) == largest,
         "%s %s" % (top["device"], top["generator"]))
    true("[D] %s: report carriers %r" % (name, carriers), [c["name"] for c in data["carriers"]] == carriers)
    true("[D] %s: every carrier has an added shot row" % name,
         all(any(c["device"] == n and c["origin"] == "added" for c in data["contributions"]) for n in carriers))

    rc, out, err = schrot("carriers", netlist, *carrier_options(opts))
    true("[D] %s: carriers exits 0" % name, rc == 0, err)
    listed = table_names(out, "carrier ")
    true("[D] %s: carriers lists %r" % (name, carriers), listed == carriers, out)
    if not carriers:
        true("[D] %s: carriers says none were found" % name, "no shot-noise carriers found" in out, out)
    true("[D] %s: noiseless DC sources %r" % (name, noiseless), table_names(out, "source ") == noiseless, out)
    rc, out, err = schrot("carriers", netlist, *carrier_options(opts), "--json", "-")
    cj = json.loads(out) if rc == 0 else {"carriers": [], "noiseless_sources": []}
    true("[D] %s: carriers --json agrees" % name, [c["name"] for c in cj["carriers"]] == carriers and
         [s["name"] for s in cj["noiseless_sources"]] == noiseless, out)
    true("[D] %s: every carrier says why it was chosen" % name, all(c["reason"] for c in cj["carriers"]))

    if name == "hydrophone-preamp":
        ibias = cj["noiseless_sources"][0] if cj["noiseless_sources"] else {}
        close("[D] hydrophone: ibias is listed noiseless with its 2 mA", ibias.get("dc_current_a"), 2e-3, 1e-6)
        true("[D] hydrophone: no shot noise was added", total["carrier_shot_share"] == 0 and
             not any(c["origin"] == "added" for c in data["contributions"]))
        true("[D] hydrophone: the report notes ibias as noiseless",
             any("noiseless" in n and "ibias" in n for n in data["notes"]), repr(data["notes"]))

# Closed forms at a spot where the transimpedance is flat (|Z| = Rf within 0.01 %: the stage's
# pole and the amplifier's finite gain are far away): the carrier's output density is
# sqrt(2 q I G) * Rf (S1: W. Schottky, Ann. Phys. 1918, p. 541; G = M*F(M), A1: R. J. McIntyre,
# IEEE Trans. Electron Devices ED-13(1), 164 (1966)), and the feedback resistor's is sqrt(4 k T Rf)
# (J1: J. B. Johnson, Phys. Rev. 32, 97 (1928); H. Nyquist, Phys. Rev. 32, 110 (1928)).
T = 300.15
for name, opts, spot, carrier, current, gain, rf in (
        ("canopy-probe", [], "1", "iph", 2e-9, 1.0, 100e6),
        ("picoammeter-leakage", [], "10m", "ileak", 50e-15, 1.0, 10e9),
        ("paddock-gate-beam", [], "100", "iph", 10e-9, 1.0, 1e6),
        ("rangefinder-apd", ["--avalanche", "iapd=50:0.02"], "10k", "iapd", 1.005e-6,
         50 * (0.02 * 50 + 0.98 * (2 - 1 / 50)), 10e3)):
    rc, out, err = schrot("report", "netlists/%s.cir" % name, *opts, "--spot", spot, "--json", "-")
    if rc != 0:
        true("[D] %s: report --spot %s exits 0" % (name, spot), False, err)
        continue
    data = json.loads(out)
    rows = {(c["device"], c["generator"]): c for c in data["contributions"]}
    shot, thermal = rows.get((carrier, "shot")), rows.get(("rf", "thermal"))
    close("[D] %s: %s shot density at %s Hz = sqrt(2qIG) Rf [S1, A1]" % (name, carrier, spot),
          shot and shot["spot_v_per_rthz"][0], math.sqrt(2 * Q * current * gain) * rf, 1e-4)
    close("[D] %s: rf thermal density at %s Hz = sqrt(4kT Rf) [J1]" % (name, spot),
          thermal and thermal["spot_v_per_rthz"][0], math.sqrt(4 * K * T * rf), 1e-4)
    if name == "rangefinder-apd":
        c = data["carriers"][0]
        close("[D] APD: gain M = 50", c["gain"], 50, 1e-12)
        close("[D] APD: excess noise F(50) for k = 0.02 = 2.9404 [A1]", c["excess_factor"], 2.9404, 1e-9)
finish()

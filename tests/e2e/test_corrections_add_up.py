#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""A correction that removes noise keeps its sign in every output, and the spectrum file's columns
rebuild the total at every frequency (issue 13 item 5). The circuit: a 10 fA dark junction
reverse-biased at 5 V into a 1 GOhm transimpedance stage, where the simulator gives the junction the
shot noise of its GMIN current (5 pA) and the junction correction takes it back out. The sum rule
checked is that powers of uncorrelated sources add (Johnson/Schottky superposition; common practice,
no source)."""
import csv
import os
import tempfile
from schrot_check import run, close, true, finish

DARK = """reverse-biased dark junction into a transimpedance stage
vb bias 0 dc -5
idark 0 a dc 10f
d1 bias a dmod
.model dmod d is=10f
rf a out 1g
e1 out 0 0 a 1e6
.noise v(out) idark dec 10 1 1k 1
.end
"""
d = tempfile.mkdtemp(prefix="schrot-corr-")
spec = os.path.join(d, "spec.csv")
rc, data, out, err = run(DARK, "report", "--spot", "10", "--spectrum", spec, "--top", "2")
if data:
    corr = [c for c in data["contributions"] if c["origin"] == "correction"]
    true("a correction row that removes noise", corr and corr[0]["band_power_v2"] < 0, repr(corr))
    if corr:
        c = corr[0]
        true("its JSON rms is negative", c["output_rms_v"] < 0, repr(c["output_rms_v"]))
        true("its JSON spot density is negative", c["spot_v_per_rthz"][0] < 0, repr(c["spot_v_per_rthz"]))
        true("its share is negative", c["share"] < 0)
        close("signed rms squared is its band power", -c["output_rms_v"] ** 2, c["band_power_v2"], 1e-12)
    close("the rows' signed powers add to the total", sum(c["band_power_v2"] for c in data["contributions"]),
          data["total"]["output_power_v2"], 1e-9)
    # the table folds the correction into the row it corrects: one row for d1, the junction's own
    # 10 fA of shot noise (the same as idark's), and the split one option away
    d1 = [l for l in out.splitlines() if l.split()[1:2] == ["d1"]]
    true("the table folds d1's correction into one 'corrected' row", len(d1) == 1 and "corrected" in d1[0], out)
    true("the folded row carries the junction's own shot noise (as idark's 1.79 uV)", d1 and "1.79 µV" in d1[0], out)
    rc, data2, out2, err2 = run(DARK, "report", "--spot", "10", "--show-corrections")
    true("--show-corrections shows the correction with its negative rms", "-40.0 µV" in out2 and "-9.7 %" in out2, out2)
    with open(spec) as f:
        rows = list(csv.reader(f))
    head, body = rows[0], rows[1:]
    true("the spectrum file ends with rest and transfer", head[-2].startswith("rest") and head[-1].startswith("transfer"))
    worst = 0.0
    for r in body:
        v = [float(x) for x in r[1:-1]]
        total = v[0] ** 2
        parts = sum(x * abs(x) for x in v[1:])
        worst = max(worst, abs(parts - total) / total)
    true("signed squares of the device and rest columns rebuild the total at every frequency (1e-9)",
         worst < 1e-9, "worst %g" % worst)

# A correction far below the display's last digit says which side of zero it lies (never "-0.000 %").
with open(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", "..", "netlists", "rangefinder-apd.cir")) as f:
    apd = f.read()
rc, data, out, err = run(apd, "report", "--avalanche", "iapd=50:0.02", "--show-corrections")
true("no '-0.000 %' in the table; a tiny negative share reads '> -0.001 %'", "-0.000 %" not in out and "> -0.001 %" in out, out)
finish()

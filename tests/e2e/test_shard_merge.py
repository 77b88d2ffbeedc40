#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""sweep --shard K/N and merge: the joined partials are exactly the sweep of one run (crossover included).

No outside source: a merge must reproduce the unsharded run bit for bit (docs/performance.md).
"""
import filecmp
import json
import os
import subprocess
import tempfile
from schrot_check import SCHROT, true, finish

# A pixel whose photocurrent is swept across the level where its shot noise equals the thermal
# noise of its load (about 2kT/(qR) = 52 nA into 1 MOhm); a diode makes the operating point
# nonlinear, so any dependence on which worker ran which point would show. Invented values.
NETLIST = """light sensor pixel into a load resistor
.subckt pixel out
iph 0 out dc 1n
dpix out 0 dsens
.ends
.model dsens d is=1f n=1.1 rs=20
xp a pixel
iprobe 0 a dc 0
r1 a 0 1meg
.noise v(a) iprobe dec 10 1 10k 1
.end
"""

work = tempfile.mkdtemp(prefix="schrot-shard-")
net = os.path.join(work, "pixel.cir")
with open(net, "w") as f:
    f.write(NETLIST)
VARY = ["--vary", "xp.iph=1n:1u:13"]


def schrot(*args):
    return subprocess.run([SCHROT, *args], capture_output=True, text=True, timeout=300, cwd=work)


full = os.path.join(work, "full.json")
proc = schrot("sweep", "pixel.cir", *VARY, "--json", full)
true("unsharded sweep exits 0", proc.returncode == 0, proc.stderr)
whole = json.load(open(full))
true("the sweep crosses over inside the range", whole["crossover"]["value"] is not None, json.dumps(whole["crossover"]))

for n_shards, order in ((3, (3, 1, 2)), (13, tuple(range(13, 0, -1))), (2, (1, 2))):
    parts = []
    for k in range(1, n_shards + 1):
        part = os.path.join(work, f"part-{k}-of-{n_shards}.json")
        proc = schrot("sweep", "pixel.cir", *VARY, "--shard", f"{k}/{n_shards}", "--json", part)
        true(f"shard {k}/{n_shards} exits 0", proc.returncode == 0, proc.stderr)
        parts.append(part)
    sizes = [len(json.load(open(p))["points"]) for p in parts]
    true(f"{n_shards} shards hold every point once", sum(sizes) == 13 and min(sizes) >= 1, str(sizes))
    merged = os.path.join(work, f"merged-{n_shards}.json")
    proc = schrot("merge", *[parts[k - 1] for k in order], "--json", merged)
    true(f"merge of {n_shards} shards exits 0", proc.returncode == 0, proc.stderr)
    true(f"merged JSON of {n_shards} shards is byte for byte the unsharded one", filecmp.cmp(merged, full, shallow=False),
         open(merged).read() if os.path.exists(merged) else proc.stderr)
    proc_table = schrot("merge", *parts)
    proc_whole = schrot("sweep", "pixel.cir", *VARY)
    true(f"merge of {n_shards} shards prints the table of the unsharded run", proc_table.returncode == 0 and
         proc_table.stdout == proc_whole.stdout, proc_table.stdout + proc_table.stderr)

# mistakes are exit 2 and write nothing
p3 = [os.path.join(work, f"part-{k}-of-3.json") for k in (1, 2, 3)]
out = os.path.join(work, "bad.json")
for what, args in (("a missing shard", p3[:2]), ("a shard given twice", [p3[0], p3[1], p3[1], p3[2]]),
                   ("shards of different splits", [p3[0], p3[1], os.path.join(work, "part-13-of-13.json")]),
                   ("the unsharded JSON", [full]), ("no files", [])):
    proc = schrot("merge", *args, "--json", out)
    true(f"merge with {what} is exit 2", proc.returncode == 2, proc.stdout + proc.stderr)
    true(f"merge with {what} writes no file", not os.path.exists(out))
proc = schrot("sweep", "pixel.cir", *VARY, "--shard", "1/3")
true("--shard without --json is exit 2", proc.returncode == 2 and "--json" in proc.stderr, proc.stderr)
for bad in ("0/3", "4/3", "1/0", "x/3", "1/3x", "1/14"):
    proc = schrot("sweep", "pixel.cir", *VARY, "--shard", bad, "--json", out)
    true(f"--shard {bad} is exit 2", proc.returncode == 2, proc.stderr)
finish()

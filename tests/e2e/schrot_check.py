# SPDX-License-Identifier: BSD-3-Clause
"""Shared helpers of the end-to-end checks: run schrot on a netlist text, compare with closed forms."""
import json
import math
import os
import struct
import subprocess
import sys
import tempfile

Q = 1.602176634e-19  # C, exact (BIPM, The International System of Units, 9th ed., 2019)
K = 1.380649e-23     # J/K, exact (same)

SCHROT = os.path.abspath(sys.argv[1]) if len(sys.argv) > 1 else "schrot"
_failures = []
_count = [0]


def run(netlist_text, *args, expect_rc=0, name="case.cir"):
    """Writes the netlist to a fresh directory, runs schrot, returns (rc, json or None, stdout, stderr)."""
    d = tempfile.mkdtemp(prefix="schrot-e2e-")
    path = os.path.join(d, name)
    with open(path, "w") as f:
        f.write(netlist_text)
    cmd = [SCHROT] + list(args[:1]) + [path] + list(args[1:])
    if "--json" not in args:
        cmd += ["--json", os.path.join(d, "out.json")]
    proc = subprocess.run(cmd, capture_output=True, text=True, timeout=300)
    data = None
    jp = os.path.join(d, "out.json")
    if os.path.exists(jp):
        with open(jp) as f:
            data = json.load(f)
    if proc.returncode != expect_rc:
        fail("%s: exit %d, expected %d\n%s%s" % (" ".join(cmd), proc.returncode, expect_rc, proc.stdout, proc.stderr))
    return proc.returncode, data, proc.stdout, proc.stderr


def fail(msg):
    _failures.append(msg)
    print("FAIL " + msg)


def close(what, got, want, rel):
    """Relative comparison; what names the check and its outside source."""
    _count[0] += 1
    if got is None or want is None or not (abs(got - want) <= rel * max(abs(got), abs(want))):
        fail("%s: got %r, want %r (rel tol %g)" % (what, got, want, rel))
    else:
        print("ok   %s: %.9g (want %.9g)" % (what, got, want))


def true(what, cond, detail=""):
    _count[0] += 1
    if not cond:
        fail("%s %s" % (what, detail))
    else:
        print("ok   %s" % what)


def contribution(data, device, origin=None, generator=None):
    for c in data["contributions"]:
        if c["device"] == device and (origin is None or c["origin"] == origin) and \
                (generator is None or c["generator"] == generator):
            return c
    return None


def finish():
    print("%d passed, %d failed" % (_count[0] - len(_failures), len(_failures)))
    sys.exit(1 if _failures or not _count[0] else 0)


def read_raw(path):
    """The plots of an ngspice binary raw file: [(plotname, {vector: [values]})] (real or complex)."""
    data = open(path, "rb").read()
    plots, pos = [], 0
    while pos < len(data):
        head, names = {}, []
        while True:
            end = data.index(b"\n", pos)
            line = data[pos:end].decode("latin-1")
            pos = end + 1
            if line.startswith("Binary:"):
                break
            if line.startswith("\t") and "Variables" in head:
                names.append(line.split("\t")[2])
                continue
            key, _, value = line.partition(":")
            head[key.strip()] = value.strip()
        cplx = "complex" in head.get("Flags", "")
        vals = {n: [] for n in names}
        for _ in range(int(head["No. Points"])):
            for n in names:
                if cplx:
                    vals[n].append(complex(*struct.unpack_from("<dd", data, pos)))
                    pos += 16
                else:
                    vals[n].append(struct.unpack_from("<d", data, pos)[0])
                    pos += 8
        plots.append((head.get("Plotname", ""), vals))
    return plots

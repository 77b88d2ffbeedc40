#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Atomic outputs: a good report writes --json/--csv/--spectrum/--plot/--html/--depfile; then runs that
fail (bad netlist, exit 2; simulator failure, exit 3; budget breach, exit 1; a usage error found after
the simulation, exit 2; a later output that cannot be created, exit 2) with the same output paths leave
every file byte-identical, and no temporary file is left anywhere. The contract is DESIGN.md section 4 ("a failed run writes no output file and
leaves existing ones untouched"); no outside source."""
import os
import shutil
import stat
import subprocess
import tempfile

from schrot_check import SCHROT, true, finish

# A light probe of our own invention: a photodiode current into a transimpedance resistor.
GOOD = """atomic outputs: light probe
iph 0 a dc 2n ac 1
d1 a 0 dpd
.model dpd d is=10f
rf a out 1meg
rl out 0 100meg
.noise v(out) iph dec 10 1 100k
.end
"""

BAD_NETLIST = GOOD.replace("rf a out 1meg", "rf a out 1.2.3meg")
# two supplies fighting over the output node: no operating point
SIM_FAILS = GOOD.replace("rl out 0 100meg", "v1 out 0 dc 1\nv2 out 0 dc 2")

work = tempfile.mkdtemp(prefix="schrot-atomic-")
outdir = os.path.join(work, "out")
os.makedirs(outdir)
for name, text in (("good.cir", GOOD), ("bad.cir", BAD_NETLIST), ("simfail.cir", SIM_FAILS)):
    with open(os.path.join(work, name), "w") as f:
        f.write(text)

OUTPUTS = {
    "--json": "report.json",
    "--csv": "report.csv",
    "--spectrum": "spectrum.csv",
    "--plot": "noise.svg",
    "--html": "report.html",
    "--depfile": "report.d",
}


def output_args():
    args = []
    for opt, name in OUTPUTS.items():
        args += [opt, os.path.join(outdir, name)]
    return args


def run(netlist, *extra):
    proc = subprocess.run([SCHROT, "report", os.path.join(work, netlist), "-q"] + output_args() + list(extra),
                          cwd=work, capture_output=True, text=True, timeout=300)
    return proc.returncode, proc.stderr


def snapshot():
    files = {}
    for name in OUTPUTS.values():
        path = os.path.join(outdir, name)
        with open(path, "rb") as f:
            files[name] = (f.read(), os.stat(path).st_mtime_ns, stat.S_IMODE(os.stat(path).st_mode))
    return files


def strays():
    """Files in the work tree that are neither inputs nor the outputs: temporary files left behind."""
    known = set(OUTPUTS.values()) | {"good.cir", "bad.cir", "simfail.cir", "out"}
    found = []
    for base, dirs, files in os.walk(work):
        found += [os.path.join(base, n) for n in files + dirs if n not in known]
    return found


rc, err = run("good.cir")
true("[O] the good report exits 0 and writes all six files", rc == 0 and all(
    os.path.getsize(os.path.join(outdir, n)) > 0 for n in OUTPUTS.values()), err)
true("[O] no temporary file after the good report", not strays(), str(strays()))
before = snapshot()
true("[O] outputs get the mode a plain open would give them, not mkstemp's 0600",
     all(mode & 0o044 for _, _, mode in before.values()), str({n: oct(m) for n, (_, _, m) in before.items()}))

failing = (
    ("a bad netlist", "bad.cir", (), 2),
    ("a simulator failure", "simfail.cir", (), 3),
    ("a budget breach", "good.cir", ("--budget", "1p"), 1),
    ("a spot frequency outside the run, found after the simulation", "good.cir", ("--spot", "10meg"), 2),
)
for label, netlist, extra, want_rc in failing:
    rc, err = run(netlist, *extra)
    true("[O] %s exits %d with one line on stderr" % (label, want_rc), rc == want_rc and len(err.splitlines()) == 1,
         "rc %d, stderr %r" % (rc, err))
    after = snapshot()
    for name in OUTPUTS.values():
        true("[O] %s leaves %s byte-identical and unrewritten" % (label, name),
             after[name][0] == before[name][0] and after[name][1] == before[name][1])
    true("[O] %s leaves no temporary file" % label, not strays(), str(strays()))

# A later output that cannot be created fails the run: the earlier ones must not have been replaced.
proc = subprocess.run([SCHROT, "report", os.path.join(work, "good.cir"), "-q", "--signal", "1n", "--json",
                       os.path.join(outdir, "report.json"), "--csv", os.path.join(work, "no-such-dir", "r.csv")],
                      capture_output=True, text=True, timeout=300)
true("[O] a CSV in a missing directory fails the run (exit 2, one line)",
     proc.returncode == 2 and len(proc.stderr.splitlines()) == 1, proc.stderr)
true("[O] ... and report.json, written before it, is untouched", snapshot()["report.json"] == before["report.json"])
true("[O] ... and no temporary file is left", not strays(), str(strays()))

# The same for the carriers command's JSON, and for a JSON target that is itself a directory.
rc, _ = subprocess.run([SCHROT, "carriers", os.path.join(work, "bad.cir"), "--json",
                        os.path.join(outdir, "report.json")], capture_output=True, timeout=300).returncode, None
true("[O] carriers on a bad netlist exits 2 and leaves report.json alone",
     rc == 2 and snapshot()["report.json"][0] == before["report.json"][0])
os.makedirs(os.path.join(work, "out", "adir"))
proc = subprocess.run([SCHROT, "report", os.path.join(work, "good.cir"), "-q", "--json", os.path.join(outdir, "adir")],
                      capture_output=True, text=True, timeout=300)
true("[O] a JSON target that is a directory is an error, the directory is untouched",
     proc.returncode != 0 and os.path.isdir(os.path.join(outdir, "adir")) and not os.listdir(
         os.path.join(outdir, "adir")), proc.stderr)
os.rmdir(os.path.join(outdir, "adir"))
true("[O] ... and leaves no temporary file", not strays(), str(strays()))

# A good run over the same paths replaces the files completely (no stale tail from a longer file).
with open(os.path.join(outdir, "report.csv"), "ab") as f:
    f.write(b"x" * 100000)
rc, err = run("good.cir")
true("[O] a second good run replaces every file whole", rc == 0 and snapshot()["report.csv"][0] == before["report.csv"][0],
     err)

# augment: the written deck and its other outputs are one set as well.
deck_path = os.path.join(outdir, "augmented.cir")
proc = subprocess.run([SCHROT, "augment", os.path.join(work, "good.cir"), "-o", deck_path],
                      capture_output=True, text=True, timeout=300)
true("[O] augment -o writes the deck", proc.returncode == 0 and os.path.getsize(deck_path) > 0, proc.stderr)
with open(deck_path, "rb") as f:
    deck_before = f.read()
os.utime(deck_path, ns=(1, 1))
proc = subprocess.run([SCHROT, "augment", os.path.join(work, "good.cir"), "-q", "-o", deck_path, "--json",
                       os.path.join(work, "no-such-dir", "a.json")], capture_output=True, text=True, timeout=300)
with open(deck_path, "rb") as f:
    deck_after = f.read()
true("[O] augment with a JSON in a missing directory fails and keeps the old deck unrewritten",
     proc.returncode == 2 and deck_after == deck_before and os.stat(deck_path).st_mtime_ns == 1, proc.stderr)
os.remove(deck_path)
true("[O] ... and leaves no temporary file", not strays(), str(strays()))

# Outputs to a device are written in place: renaming over /dev/null would replace it (as root) with a file.
if os.path.exists("/dev/null") and stat.S_ISCHR(os.stat("/dev/null").st_mode):
    proc = subprocess.run([SCHROT, "report", os.path.join(work, "good.cir"), "-q", "--json", "/dev/null", "--csv",
                           "/dev/null"], capture_output=True, text=True, timeout=300)
    true("[O] --json /dev/null --csv /dev/null exits 0 and /dev/null stays a character device",
         proc.returncode == 0 and stat.S_ISCHR(os.stat("/dev/null").st_mode), proc.stderr)

shutil.rmtree(work, ignore_errors=True)
finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Runs schrot over the regression corpus (tests/corpus/) and checks each deck against the manifest.

The corpus holds public decks from the simulator's own source tree (tests/corpus/ngspice/, with
their licence notice) and minimal decks of our own for each construct of issue 12
(tests/corpus/own/). tests/corpus/manifest.json records, per deck:
  ngspice_reads   whether plain ngspice (the `ngspice` program, batch mode) reads the deck and finds
                  its operating point: measured with --record on a sanitised copy (below)
  has_noise       the deck states a noise analysis: a `.noise` card, or a `noise` command inside
                  its .control block
  expected        what schrot must do with it:
                    reads            `schrot carriers DECK` exits 0
                    reports          as `reads`, and `schrot report DECK` exits 0 too
                    refused: WHY     schrot refuses it (exit 2 or 3); with "message", stderr holds it
                    pending: ITEM    waits for another part of issue 12; counted apart, never fails;
                                     "target" says what is expected once ITEM is done
Normal run (ctest): schrot over every deck, figures printed, exit 1 when any deck's outcome differs
from `expected`. --record (by hand): re-measures ngspice_reads and has_noise and writes the
manifest back, keeping every hand-written field.

Safety of the ngspice measurement: ngspice runs only on a copy of the corpus in a scratch directory,
where every file has its .control ... .endc blocks, `*#` lines and `*ng_script` title lines removed
(the three ways deck text runs commands), the deck's analysis cards replaced by one `.op`, with
`-n` (no .spiceinit) and a time limit. A compatibility mode that a deck's own .spiceinit sets is
passed on as the single line `set ngbehavior=MODE`, MODE checked against a fixed list; nothing
else from that file is used. A deck's control block is never run.
"""
import argparse
import concurrent.futures
import json
import os
import re
import shutil
import subprocess
import sys
import tempfile

HERE = os.path.dirname(os.path.abspath(__file__))
MANIFEST = os.path.join(HERE, "manifest.json")
DECK_SUFFIXES = (".cir", ".sp", ".deck", ".net")
# the simulator's own compatibility-mode names (ngspice 39 manual, "Compatibility")
COMPAT_MODES = {"all", "ps", "psa", "lt", "lta", "ltps", "ltpsa", "ki", "hs", "hsa", "spe", "a",
                "eg", "ll", "s3", "nospiceinit"}
ANALYSIS_CARDS = ("tran", "ac", "dc", "noise", "op", "pz", "sens", "tf", "disto", "pss", "sp",
                  "four", "fourier", "meas", "measure", "print", "plot", "hb", "wrdata")
NGSPICE_TIMEOUT = 30
SCHROT_TIMEOUT = 120


def discover():
    """Every deck of the corpus: relative paths, sorted (included files are not decks)."""
    decks = []
    for top in ("ngspice", "own"):
        for root, dirs, files in os.walk(os.path.join(HERE, top)):
            dirs.sort()
            if os.path.basename(root) == "lib":
                continue
            for f in sorted(files):
                if f.lower().endswith(DECK_SUFFIXES):
                    decks.append(os.path.relpath(os.path.join(root, f), HERE))
    return decks


def read_text(path):
    return open(path, "rb").read().decode("latin-1")


def control_lines(text):
    """(outside, inside): the deck's lines outside and inside .control blocks."""
    outside, inside, in_control = [], [], False
    for line in text.splitlines():
        s = line.strip().lower()
        if s.startswith(".control"):
            in_control = True
            continue
        if s.startswith(".endc"):
            in_control = False
            continue
        (inside if in_control else outside).append(line)
    return outside, inside


def noise_of(text):
    """'card', 'control' or None: where the deck states a noise analysis."""
    outside, inside = control_lines(text)
    if any(re.match(r"\s*\.noise\s", l, re.I) for l in outside[1:]):
        return "card"
    if any(re.match(r"\s*noise\s", l, re.I) for l in inside):
        return "control"
    return None


def sanitise(text, is_deck):
    """The text with everything that could run a command removed; a deck also gets one .op."""
    out, in_control, skipping_card = [], False, False
    lines = text.splitlines()
    for i, line in enumerate(lines):
        s = line.strip().lower()
        if s.startswith(".control"):
            in_control = True
            continue
        if in_control:
            if s.startswith(".endc"):
                in_control = False
            continue
        if s.startswith("*#") or s.startswith("*ng_script"):
            out.append("* (removed)" if i == 0 else "*")
            continue
        if is_deck and i > 0:
            if s.startswith("+") and skipping_card:
                continue
            skipping_card = False
            m = re.match(r"\.(\w+)", s)
            if m and m.group(1) in ANALYSIS_CARDS:
                skipping_card = True
                continue
            if re.match(r"\.end\s*$", s):
                out.append(".op")
                out.append(line)
                out.extend(lines[i + 1:])
                return "\n".join(out) + "\n"
        out.append(line)
    if is_deck:
        out.append(".op")
        out.append(".end")
    return "\n".join(out) + "\n"


def compat_mode(deck_dir):
    """The compatibility mode a .spiceinit beside the deck sets, if it is one we know; else None."""
    path = os.path.join(deck_dir, ".spiceinit")
    if not os.path.isfile(path):
        return None
    for line in read_text(path).splitlines():
        m = re.match(r"\s*set\s+ngbehavior\s*=\s*(\w+)\s*$", line, re.I)
        if m and m.group(1).lower() in COMPAT_MODES:
            return m.group(1).lower()
    return None


def scratch_copy(scratch):
    """Copies the corpus into scratch, every file sanitised; .spiceinit files are never copied."""
    decks = set(discover())
    for root, dirs, files in os.walk(HERE):
        rel_root = os.path.relpath(root, HERE)
        os.makedirs(os.path.join(scratch, rel_root), exist_ok=True)
        for f in files:
            if f == ".spiceinit" or f.endswith((".py", ".json")):
                continue
            rel = os.path.normpath(os.path.join(rel_root, f))
            data = open(os.path.join(root, f), "rb").read()
            if b"\0" not in data:
                data = sanitise(data.decode("latin-1"), rel in decks).encode("latin-1")
            open(os.path.join(scratch, rel), "wb").write(data)


def measure_ngspice(scratch, deck):
    """(reads, first error line) for plain ngspice on the sanitised copy of deck."""
    deck_dir = os.path.join(scratch, os.path.dirname(deck))
    original = [l for l in read_text(os.path.join(HERE, deck)).splitlines() if l.strip()]
    if original and original[0].strip().lower().startswith("*ng_script"):
        return False, "a '*ng_script' title: ngspice runs the file as a script, not as a circuit"
    mode = compat_mode(os.path.join(HERE, os.path.dirname(deck)))
    args = ["ngspice", "-b", "-r", os.path.join(scratch, "raw-" + deck.replace("/", "_"))]
    if mode:
        with open(os.path.join(deck_dir, ".spiceinit"), "w") as f:
            f.write("set ngbehavior=%s\n" % mode)
    else:
        args.insert(1, "-n")
    args.append(os.path.basename(deck))
    try:
        proc = subprocess.run(args, cwd=deck_dir, capture_output=True, timeout=NGSPICE_TIMEOUT,
                              stdin=subprocess.DEVNULL)
    except subprocess.TimeoutExpired:
        return False, "no answer within %d s" % NGSPICE_TIMEOUT
    text = (proc.stdout + proc.stderr).decode("latin-1")
    first = next((l.strip() for l in text.splitlines()
                  if re.search(r"error|abort|cannot|can't|unknown", l, re.I)), "")
    return proc.returncode == 0, first


def all_files():
    return {os.path.relpath(os.path.join(root, f), HERE)
            for root, _, files in os.walk(HERE) for f in files}


def run_schrot(schrot, command, deck):
    path = os.path.join(HERE, deck)
    try:
        proc = subprocess.run([schrot, command, os.path.basename(path)], cwd=os.path.dirname(path),
                              capture_output=True, timeout=SCHROT_TIMEOUT, stdin=subprocess.DEVNULL)
    except subprocess.TimeoutExpired:
        return -1, "no answer within %d s" % SCHROT_TIMEOUT, ""
    err = proc.stderr.decode("utf-8", "replace")
    lines = [l for l in err.splitlines() if l.strip()]
    first = next((l for l in lines if "error" in l), lines[0] if lines else "")
    if proc.returncode < 0:
        first = "killed by signal %d%s" % (-proc.returncode, ("; " + first) if first else "")
    return proc.returncode, first.strip(), err


def run_deck(schrot, deck, entry):
    rc, first, err = run_schrot(schrot, "carriers", deck)
    result = {"carriers_rc": rc, "carriers_first": first, "carriers_err": err}
    if entry.get("has_noise"):
        rc2, first2, err2 = run_schrot(schrot, "report", deck)
        result.update(report_rc=rc2, report_first=first2, report_err=err2)
    return result


def sanitizer_report(r):
    return any(w in r.get(k, "") for k in ("carriers_err", "report_err")
               for w in ("Sanitizer", "runtime error:"))


def outcome(entry, r):
    """'reads', 'reports', 'refused' (exit 2 or 3) or 'failed' (signal, time-out, other code, or a
    sanitizer's report in a sanitizer build)."""
    if sanitizer_report(r):
        return "failed"
    if r["carriers_rc"] == 0:
        if entry.get("has_noise"):
            return "reports" if r["report_rc"] == 0 else "reads"
        return "reads"
    return "refused" if r["carriers_rc"] in (2, 3) else "failed"


def meets(expected, entry, r):
    got = outcome(entry, r)
    if expected in ("reads", "reports"):
        return got == expected
    if expected.startswith("refused"):
        msg = entry.get("message")
        return got == "refused" and (not msg or msg in r["carriers_err"])
    return False


def first_message(entry, r):
    if r["carriers_rc"] != 0:
        return "carriers exit %d: %s" % (r["carriers_rc"], r["carriers_first"])
    if "report_rc" not in r:
        return "carriers exit 0"
    return "report exit %d: %s" % (r["report_rc"], r["report_first"])


def pct(a, b):
    return "%d/%d = %.1f %%" % (a, b, 100.0 * a / b) if b else "0/0"


def main():
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("schrot", help="the schrot binary")
    ap.add_argument("--record", action="store_true",
                    help="re-measure ngspice_reads and has_noise, write the manifest back")
    ap.add_argument("--jobs", type=int, default=2)
    ap.add_argument("--only", help="regex: run only the decks whose path matches")
    ap.add_argument("--figures-only", action="store_true",
                    help="print the figures, never fail (for measuring a build)")
    args = ap.parse_args()
    args.schrot = os.path.abspath(args.schrot)

    manifest = json.load(open(MANIFEST)) if os.path.exists(MANIFEST) else {"decks": {}}
    decks = manifest["decks"]
    if args.record:
        scratch = tempfile.mkdtemp(prefix="schrot-corpus-")
        try:
            scratch_copy(scratch)
            found = discover()
            for gone in [d for d in decks if d not in found]:
                del decks[gone]
            with concurrent.futures.ThreadPoolExecutor(args.jobs) as pool:
                measured = dict(zip(found, pool.map(lambda d: measure_ngspice(scratch, d), found)))
        finally:
            shutil.rmtree(scratch, ignore_errors=True)
        for d in found:
            e = decks.setdefault(d, {})
            e["ngspice_reads"], e["ngspice_message"] = measured[d]
            if not e["ngspice_message"]:
                del e["ngspice_message"]
            where = noise_of(read_text(os.path.join(HERE, d)))
            e["has_noise"] = where is not None
            if where:
                e["noise_in"] = where
            else:
                e.pop("noise_in", None)
            if "expected" not in e:
                e["expected"] = (("reports" if e["has_noise"] else "reads") if e["ngspice_reads"]
                                 else "refused: plain ngspice does not read it either")
        manifest["decks"] = dict(sorted(decks.items()))
        with open(MANIFEST, "w") as f:
            json.dump(manifest, f, indent=1, ensure_ascii=False)
            f.write("\n")

    names = [d for d in sorted(decks) if not args.only or re.search(args.only, d)]
    before = all_files()
    with concurrent.futures.ThreadPoolExecutor(args.jobs) as pool:
        results = dict(zip(names, pool.map(lambda d: run_deck(args.schrot, d, decks[d]), names)))
    written = sorted(all_files() - before)
    for f in written:
        os.remove(os.path.join(HERE, f))

    readable = [d for d in names if decks[d]["ngspice_reads"]]
    read_ok = [d for d in readable if results[d]["carriers_rc"] == 0]
    noisy = [d for d in readable if decks[d]["has_noise"]]
    report_ok = [d for d in noisy if results[d].get("report_rc") == 0]
    print("corpus: %d decks (%d from ngspice's source tree, %d of our own); plain ngspice reads %d"
          % (len(names), sum(d.startswith("ngspice/") for d in names),
             sum(d.startswith("own/") for d in names), len(readable)))
    for label, part in (("public decks (ngspice's tree)", "ngspice/"), ("our own decks", "own/"),
                        ("all decks", "")):
        r = [d for d in readable if d.startswith(part)]
        n = [d for d in noisy if d.startswith(part)]
        print("%-30s schrot reads %s of those ngspice reads; with a noise analysis, %s report"
              % (label + ":", pct(sum(d in read_ok for d in r), len(r)),
                 pct(sum(d in report_ok for d in n), len(n))))
    refusals = [d for d in readable if decks[d].get("expected", "").startswith("refused")]
    if refusals:
        public = [d for d in readable if d.startswith("ngspice/") and d not in refusals]
        print("deliberate refusals among the decks ngspice reads (counted above as not read): %d; "
              "public decks without them: schrot reads %s"
              % (len(refusals), pct(sum(d in read_ok for d in public), len(public))))
    failures = [d for d in readable if d not in read_ok or (d in noisy and d not in report_ok)]
    if failures:
        print("not read or not reported, though plain ngspice reads them:")
        for d in failures:
            print("  %s: %s" % (d, first_message(decks[d], results[d])))

    unlisted = [d for d in discover() if d not in decks]
    if unlisted:
        print("decks not in the manifest (run --record): %s" % ", ".join(unlisted))
    mismatches, pending, pending_now_ok = [], [], []
    for d in names:
        e, r = decks[d], results[d]
        exp = e.get("expected", "")
        if exp.startswith("pending"):
            pending.append(d)
            if e.get("target") and meets(e["target"], e, r):
                pending_now_ok.append(d)
            continue
        if outcome(e, r) == "failed" or not meets(exp, e, r):
            mismatches.append(d)
    print("pending on other parts of issue 12: %d deck(s)%s" % (
        len(pending), (" (%d already meet their target: %s)" % (len(pending_now_ok),
                                                               ", ".join(pending_now_ok)))
        if pending_now_ok else ""))
    for d in pending:
        print("  %s: %s" % (d, decks[d]["expected"]))
    if written:
        # DESIGN.md section 6: netlist text must never make the simulator write files
        print("files the simulator wrote beside the decks (removed again): %s" % ", ".join(written))
    if mismatches:
        print("outcome differs from the manifest:")
        for d in mismatches:
            e, r = decks[d], results[d]
            print("  %s: expected %r, got %s (%s)" % (d, e.get("expected"), outcome(e, r),
                                                     first_message(e, r) if outcome(e, r) != "reports"
                                                     else "report exit 0"))
    else:
        print("every deck's outcome matches the manifest")
    return 0 if args.figures_only or not (mismatches or unlisted) else 1


if __name__ == "__main__":
    sys.exit(main())

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""The docs in step with the program: every shown example reruns to its shown output (issue 13 item 9).

This checks the documentation against the program itself, not physics against an outside source;
the physics behind each figure is checked by the other e2e tests.

Example blocks. In README.md and docs/guide.md, a ``` fence whose first line starts with "$ " and
that holds at least one "$ schrot" line is an example: every line starting with "$ " is a command,
the lines up to the next command (or the fence's end) are what it prints, stdout and stderr in the
order a terminal shows them (stdout line-buffered with stdbuf -oL; schrot's progress lines, drawn
only when stderr is a terminal, are not drawn). Conventions:
  - A line that is "..." alone (indentation allowed) stands for any run of lines, none included:
    the mark of an excerpt. Nothing else is elided; every other line must match exactly.
  - Commands run with bash, in order, in one scratch directory per document (so a file one block
    writes, another may read), with `schrot` on PATH as the binary under test and `netlists`
    linked to the repository's netlists/: paths print as they do from the repository root, and no
    output file lands in the worktree. `echo $?` prints the previous command's exit status.
  - Masked as volatile: the scratch directory's absolute path (shown as the relative path).
    Nothing else (no numbers, no version) is masked: the docs say which ngspice made them.
Also checked:
  - Every netlist in netlists/examples/ (the small invented netlists of the guide's examples) is run
    by an example, and one the guide shows in full (a fence opening with its title line) is
    shown exactly.
  - The help blocks ("$ schrot --help", "$ schrot CMD --help") are examples like the rest, without
    "..."; the guide must show `schrot --help`.
  - Every option that `schrot --help` and `schrot CMD --help` list is in the man page and the guide.
  - Every command of the man page's EXAMPLES section runs (exit 0, or 1 for a broken budget).
  - Every JSON key written by report, carriers, sweep, arrivals and levers with --json on the demo
    netlists (collected recursively) is named in the guide as `key`, `key[]` or "key".
  - README.md's apt-get lines name every package of .ci/run's apt-get line.
"""
import json
import os
import re
import shutil
import subprocess
import tempfile

# The wrapper runs schrot under stdbuf, which preloads a library: a sanitizer build must not take
# that preload for a wrong link order (the only effect of this setting).
ASAN = ":".join(x for x in (os.environ.get("ASAN_OPTIONS", ""), "verify_asan_link_order=0") if x)

from schrot_check import SCHROT, fail, true, finish

ROOT = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
DOCS = ["README.md", "docs/guide.md"]
MARK = "\x1e-schrot-docs-mark-\x1e"


def read(rel):
    with open(os.path.join(ROOT, rel), encoding="utf-8") as f:
        return f.read()


def fences(text):
    """(line number, [lines]) of every ``` fence."""
    out, cur, start = [], None, 0
    for i, line in enumerate(text.split("\n"), 1):
        if line.startswith("```"):
            if cur is None:
                cur, start = [], i
            else:
                out.append((start, cur))
                cur = None
        elif cur is not None:
            cur.append(line)
    return out


def examples(text):
    """(line, [(command, [expected lines])]) for every example block."""
    out = []
    for start, lines in fences(text):
        if not lines or not lines[0].startswith("$ ") or not any(l.startswith("$ schrot") for l in lines):
            continue
        steps = []
        for line in lines:
            if line.startswith("$ "):
                steps.append((line[2:], []))
            else:
                steps[-1][1].append(line)
        out.append((start, steps))
    return out


def matches(want, got):
    """want's lines against got's, "..." alone on a line matching any run of lines."""
    want = [None if w.strip() == "..." else w for w in want]
    memo = {}

    def m(i, j):
        if (i, j) in memo:
            return memo[(i, j)]
        if i == len(want):
            r = j == len(got)
        elif want[i] is None:
            r = any(m(i + 1, k) for k in range(j, len(got) + 1))
        else:
            r = j < len(got) and want[i] == got[j] and m(i + 1, j + 1)
        memo[(i, j)] = r
        return r
    return m(0, 0)


def scratch():
    d = tempfile.mkdtemp(prefix="schrot-docs-")
    os.symlink(os.path.join(ROOT, "netlists"), os.path.join(d, "netlists"))
    b = os.path.join(d, ".bin")
    os.mkdir(b)
    w = os.path.join(b, "schrot")
    with open(w, "w") as f:  # stdout line-buffered as on a terminal, so stderr interleaves as a user sees it
        f.write("#!/bin/sh\nexec stdbuf -oL '%s' \"$@\"\n" % SCHROT.replace("'", "'\\''"))
    os.chmod(w, 0o755)
    return d, b


def run_block(d, b, steps):
    """Runs a block's commands in one shell; returns each command's output lines."""
    script = ["exec 2>&1", "cd %s" % d]
    for cmd, _ in steps:
        script.append(cmd)
        script.append("__rc=$?; printf '%s\\n'; (exit $__rc)" % MARK)
    env = dict(os.environ, PATH=b + os.pathsep + os.environ.get("PATH", ""), LC_ALL="C.UTF-8", ASAN_OPTIONS=ASAN)
    proc = subprocess.run(["bash", "-c", "\n".join(script)], capture_output=True, text=True,
                          timeout=600, env=env)
    text = proc.stdout.replace(os.path.realpath(d) + "/", "").replace(d + "/", "")
    parts = text.split(MARK + "\n")
    outs = []
    for p in parts[:len(steps)]:
        lines = p.split("\n")
        if lines and lines[-1] == "":
            lines.pop()
        outs.append(lines)
    while len(outs) < len(steps):
        outs.append(["<no output: the block stopped>"])
    return outs


def check_doc(rel):
    d, b = scratch()
    n = 0
    for start, steps in examples(read(rel)):
        outs = run_block(d, b, steps)
        for (cmd, want), got in zip(steps, outs):
            n += 1
            if matches(want, got):
                true("%s:%d: $ %s" % (rel, start, cmd), True)
            else:
                fail("%s:%d: $ %s\n--- shown\n%s\n--- printed\n%s\n---" %
                     (rel, start, cmd, "\n".join(want), "\n".join(got)))
    shutil.rmtree(d, ignore_errors=True)
    return n


def check_help_blocks():
    helps = [(cmd, want) for _, steps in examples(read("docs/guide.md")) for cmd, want in steps
             if re.fullmatch(r"schrot( [a-z]+)? --help", cmd)]
    true("guide shows `schrot --help`", any(c == "schrot --help" for c, _ in helps))
    for cmd, want in helps:
        true("guide's `%s` has no elided lines" % cmd, not any(w.strip() == "..." for w in want))


def check_options_documented():
    """Every option that `schrot --help` or `schrot CMD --help` lists is in the man page and the guide."""
    opts = set()
    for cmd in ["", "report", "carriers", "augment", "sweep", "arrivals", "levers", "merge"]:
        p = subprocess.run([SCHROT] + cmd.split() + ["--help"], capture_output=True, text=True, timeout=60)
        true("schrot %s --help exits 0" % cmd, p.returncode == 0, p.stderr)
        opts |= set(re.findall(r"(?<![\w-])--[a-z][a-z-]*", p.stdout))
    man, guide = read("docs/schrot.1"), read("docs/guide.md")
    true("options listed by --help (%d)" % len(opts), len(opts) > 20)
    true("every --help option is in schrot.1", all(o.replace("-", "\\-") in man for o in opts),
         str(sorted(o for o in opts if o.replace("-", "\\-") not in man)))
    true("every --help option is in the guide as `--opt...`", all("`" + o in guide for o in opts),
         str(sorted(o for o in opts if "`" + o not in guide)))


def check_example_netlists():
    """Each netlists/examples/ file is run by an example, and one the guide shows in full is shown as it is."""
    guide = read("docs/guide.md")
    shown = {lines[0]: lines for _, lines in fences(guide) if lines}
    d = os.path.join(ROOT, "netlists", "examples")
    for name in sorted(os.listdir(d)):
        rel = "netlists/examples/" + name
        true("%s is run by an example" % rel, any(rel in cmd for doc in DOCS for _, steps in examples(read(doc))
                                                   for cmd, _ in steps))
        lines = read(rel).rstrip("\n").split("\n")
        if lines[0] in shown:
            true("%s as the guide shows it" % rel, shown[lines[0]] == lines)


def man_examples():
    text = read("docs/schrot.1")
    sect = text.split(".SH EXAMPLES", 1)[1].split("\n.SH ", 1)[0]
    cmds = []
    for line in sect.split("\n"):
        if line.startswith(".B schrot "):
            cmds.append(line[3:].replace("\\-", "-").replace("\\e", "\\"))
    true("man page has examples", len(cmds) > 0)
    d, b = scratch()
    env = dict(os.environ, PATH=b + os.pathsep + os.environ.get("PATH", ""), ASAN_OPTIONS=ASAN)
    for cmd in cmds:
        p = subprocess.run(["bash", "-c", cmd], cwd=d, capture_output=True, text=True, timeout=600, env=env)
        true("schrot.1 example runs: %s" % cmd, p.returncode in (0, 1), "exit %d\n%s" % (p.returncode, p.stderr))
    shutil.rmtree(d, ignore_errors=True)


def keys(obj, acc):
    if isinstance(obj, dict):
        for k, v in obj.items():
            acc.add(k)
            keys(v, acc)
    elif isinstance(obj, list):
        for v in obj:
            keys(v, acc)


JSON_RUNS = [
    ["report", "netlists/canopy-probe.cir", "--spot", "100", "--responsivity", "0.45", "--signal", "2n"],
    ["report", "netlists/rangefinder-apd.cir", "--avalanche", "iapd=50:0.02", "--responsivity", "0.5",
     "--spot", "1meg", "--signal", "20n"],
    ["report", "netlists/turbidity-2ch.cir", "--fano", r"xscatter\..*=0.5", "--lump", ".*rfb"],
    ["report", "netlists/picoammeter-leakage.cir", "--signal", "50f", "--budget", "1"],
    ["report", "netlists/hydrophone-preamp.cir"],
    ["report", "netlists/paddock-gate-beam.cir", "--spot", "100"],
    ["carriers", "netlists/turbidity-2ch.cir", "--fano", r"xscatter\..*=0.5"],
    ["carriers", "netlists/rangefinder-apd.cir", "--avalanche", "iapd=50:0.02"],
    ["carriers", "netlists/hydrophone-preamp.cir"],
    ["sweep", "netlists/picoammeter-leakage.cir", "--vary", "ileak=1f:10p:5", "--budget", "1"],
    ["sweep", "netlists/canopy-probe.cir", "--vary", "temp=-20:60:3"],
    ["sweep", "netlists/picoammeter-leakage.cir", "--vary", "ileak=1f:10p:9", "--shard", "2/3"],
    ["arrivals", "netlists/picoammeter-leakage.cir", "--window", "10u", "--windows", "200"],
    ["levers", "netlists/paddock-gate-beam.cir", "--band", "10:5k", "--signal", "10n"],
    ["levers", "netlists/rangefinder-apd.cir", "--avalanche", "iapd=50:0.02", "--signal", "20n",
     "--band", "1k:20meg"],
]


def check_json_keys():
    guide = read("docs/guide.md")
    seen = set()
    for args in JSON_RUNS:
        p = subprocess.run([SCHROT] + args + ["--json", "-", "-q"], cwd=ROOT, capture_output=True,
                           text=True, timeout=600)
        try:
            keys(json.loads(p.stdout), seen)
        except ValueError:
            fail("no JSON from %s (exit %d): %s" % (" ".join(args), p.returncode, p.stderr))
    true("JSON keys collected", len(seen) > 20, str(len(seen)))
    missing = sorted(k for k in seen if not any(f % k in guide for f in ("`%s`", "`%s[]`", '"%s"')))
    true("every JSON key (%d) is named in the guide" % len(seen), not missing, "missing: %s" % missing)


def check_install_line():
    ci = read(".ci/run")
    m = re.search(r"apt-get install((?:.*\\\n)*.*)", ci)
    pkgs = [w for w in m.group(1).replace("\\\n", " ").split() if not w.startswith("-") and not w.startswith(">")]
    readme = " ".join(l for l in read("README.md").split("\n") if "apt-get install" in l)
    words = set(readme.split())
    missing = [p for p in pkgs if p not in words]
    true("README's install lines name every package of .ci/run (%d)" % len(pkgs), not missing and pkgs,
         "missing: %s" % missing)


total = sum(check_doc(rel) for rel in DOCS)
true("examples found (%d)" % total, total > 40)
check_help_blocks()
check_options_documented()
check_example_netlists()
man_examples()
check_json_keys()
check_install_line()
finish()

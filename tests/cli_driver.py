#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Runs the command-line cases in a directory of NNNN-slug/ cases (tests/cli/, tests/bad/).

Each case directory holds:
  name             one line saying what the case checks
  cmd              the arguments after 'schrot', one shell-style line; run in the case directory
  expected.rc      the exit code
  expected.stdout  optional: every non-empty line must occur in stdout (substring)
  expected.stderr  optional: every non-empty line must occur in stderr (substring)
  expected.stderr.lines  optional: the number of lines stderr must have (1: one message, nothing else)
  unexpected.stdout  optional: no non-empty line of it may occur in stdout (substring)
  absent           optional: files (relative to the case) that must not exist afterwards
  setup            optional: shell commands run first in the case directory
  env              optional: KEY=VALUE lines added to schrot's environment; KEY+=VALUE appends
                   ":VALUE" to an existing value (e.g. ASAN_OPTIONS+=handle_segv=0, so that a
                   simulator crash stays a crash in a sanitizer build)
  generated        optional: files the setup writes, removed before and after the run (big inputs
                   are made by setup, never committed)
Every case fails when schrot dies of a signal, runs out of time, or a sanitizer reports a problem.
"""
import os
import shlex
import subprocess
import sys


def run_case(schrot, case):
    def read(name):
        p = os.path.join(case, name)
        return open(p, encoding="utf-8").read() if os.path.exists(p) else None

    def remove_all(names):
        for f in names:
            if os.path.lexists(os.path.join(case, f)):
                os.remove(os.path.join(case, f))

    problems = []
    absent = [l.strip() for l in (read("absent") or "").splitlines() if l.strip()]
    generated = [l.strip() for l in (read("generated") or "").splitlines() if l.strip()]
    remove_all(absent + generated)
    setup = read("setup")
    if setup:
        subprocess.run(setup, shell=True, cwd=case, check=True)
    args = shlex.split(read("cmd").strip())
    env = dict(os.environ)
    for line in (read("env") or "").splitlines():
        key, sep, value = line.strip().partition("=")
        if not sep:
            continue
        if key.endswith("+"):
            key = key[:-1]
            value = env[key] + ":" + value if env.get(key) else value
        env[key] = value
    try:
        proc = subprocess.run([schrot] + args, cwd=case, capture_output=True, timeout=300, env=env,
                              stdin=subprocess.DEVNULL)
    except subprocess.TimeoutExpired:
        remove_all(generated)
        return ["no answer within 300 s"]
    remove_all(generated)
    out = proc.stdout.decode("utf-8", "replace")
    err = proc.stderr.decode("utf-8", "replace")
    want_rc = int(read("expected.rc").strip())
    if proc.returncode < 0:
        problems.append("killed by signal %d" % -proc.returncode)
    elif proc.returncode != want_rc:
        problems.append("exit code %d, expected %d" % (proc.returncode, want_rc))
    if "Sanitizer" in err or "runtime error:" in err:
        problems.append("a sanitizer reported a problem")
    want_lines = read("expected.stderr.lines")
    if want_lines is not None and len(err.splitlines()) != int(want_lines.strip()):
        problems.append("stderr has %d lines, expected %s" % (len(err.splitlines()), want_lines.strip()))
    for stream, text in (("stdout", out), ("stderr", err)):
        exp = read("expected." + stream)
        if exp is None:
            continue
        for line in exp.splitlines():
            if line.strip() and line.strip() not in text:
                problems.append("%s lacks %r" % (stream, line.strip()))
    for line in (read("unexpected.stdout") or "").splitlines():
        if line.strip() and line.strip() in out:
            problems.append("stdout holds %r" % line.strip())
    for f in absent:
        if os.path.exists(os.path.join(case, f)):
            problems.append("file %s exists" % f)
            os.remove(os.path.join(case, f))
    if problems:
        problems.append("stdout was:\n" + out[:4000] + "\nstderr was:\n" + err[:4000])
    return problems


def main():
    schrot, root = os.path.abspath(sys.argv[1]), sys.argv[2]
    passed = failed = 0
    for name in sorted(os.listdir(root)):
        case = os.path.join(root, name)
        if not os.path.isdir(case) or not os.path.exists(os.path.join(case, "cmd")):
            continue
        problems = run_case(schrot, case)
        title = (open(os.path.join(case, "name")).read().strip()
                 if os.path.exists(os.path.join(case, "name")) else name)
        if problems:
            failed += 1
            print("FAIL %s: %s" % (name, title))
            for p in problems:
                print("     " + p)
        else:
            passed += 1
            print("ok   %s: %s" % (name, title))
    print("%d passed, %d failed" % (passed, failed))
    return 1 if failed or not passed else 0


if __name__ == "__main__":
    sys.exit(main())

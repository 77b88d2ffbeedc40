#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Benchmarks schrot against plain ngspice on generated netlists; prints medians and ratios, asserts nothing.

For every case it writes the netlist (bench/gen_netlists.py), writes the equivalent augmented deck
with `schrot augment` (per-instance sized generators and the simulator's own per-device noise
summary, pts_per_summary 1), then alternates `schrot report NETLIST` and `ngspice -b AUGMENTED`,
REPS times each, and reports the median wall time and the median peak memory of each side.

Peak memory of a run is the sum, over every process of its tree, of that process's high-water
resident set (VmHWM, sampled every 10 ms from /proc; for a single process, the kernel's own
figure when it is reaped). A sum of per-process peaks never undercounts what was live at once.
"""
import argparse
import os
import re
import statistics
import subprocess
import sys
import tempfile
import threading
import time

HERE = os.path.dirname(os.path.abspath(__file__))
GEN = os.path.join(HERE, "gen_netlists.py")


def proc_tree(pid):
    out, todo = [], [pid]
    while todo:
        p = todo.pop()
        out.append(p)
        try:
            for t in os.listdir(f"/proc/{p}/task"):
                with open(f"/proc/{p}/task/{t}/children") as f:
                    todo.extend(int(c) for c in f.read().split())
        except OSError:
            pass
    return out


def hwm_kb(pid):
    try:
        with open(f"/proc/{pid}/status") as f:
            for line in f:
                if line.startswith("VmHWM:"):
                    return int(line.split()[1])
    except OSError:
        pass
    return 0


def measure(argv, cwd=None):
    """(wall seconds, peak KB, exit code, CPU seconds) of one run; stdout and stderr are discarded."""
    peaks = {}
    done = threading.Event()
    t0 = time.perf_counter()
    proc = subprocess.Popen(argv, cwd=cwd, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)

    def sample():
        while not done.is_set():
            for p in proc_tree(proc.pid):
                k = hwm_kb(p)
                if k > peaks.get(p, 0):
                    peaks[p] = k
            time.sleep(0.01)

    th = threading.Thread(target=sample, daemon=True)
    th.start()
    _, status, ru = os.wait4(proc.pid, 0)
    wall = time.perf_counter() - t0
    done.set()
    th.join()
    proc.returncode = os.waitstatus_to_exitcode(status)
    # the kernel's figure for the reaped top process is the largest of it and its reaped children,
    # so it stands for the top process only when it had none
    if len(peaks) <= 1 or proc.pid not in peaks:
        peaks[proc.pid] = max(peaks.get(proc.pid, 0), ru.ru_maxrss)
    if os.environ.get("SCH_BENCH_VERBOSE"):
        print(f"    {argv[0]} {argv[1]}: {wall:.3f} s, per-process peaks {sorted(peaks.values(), reverse=True)} KB",
              file=sys.stderr)
    return wall, sum(peaks.values()), proc.returncode, ru.ru_utime + ru.ru_stime


def gen(kind, size, path, extra=()):
    subprocess.run([sys.executable, GEN, kind, str(size), "-o", path, *extra], check=True)


def fmt_mb(kb):
    return f"{kb / 1024:.0f} MB"


def compare(label, a_argv, b_argv, reps, a_name="schrot report", b_name="ngspice -b augmented", cwd=None,
            memory=True):
    """Alternating runs; returns (median time a, b, median memory a, b)."""
    ta, tb, ma, mb, ca, cb = [], [], [], [], [], []
    for r in range(reps):
        order = [(a_argv, ta, ma, ca), (b_argv, tb, mb, cb)]
        if r % 2:
            order.reverse()  # alternate which side runs first
        for argv, ts, ms, cs in order:
            wall, kb, rc, cpu = measure(argv, cwd)
            if rc != 0:
                print(f"  {label}: '{' '.join(argv)}' exited {rc}", file=sys.stderr)
            ts.append(wall)
            ms.append(kb)
            cs.append(cpu)
    row = (statistics.median(ta), statistics.median(tb), statistics.median(ma), statistics.median(mb),
           statistics.median(ca), statistics.median(cb))
    cpu = f"   cpu {row[4]:.2f} s / {row[5]:.2f} s = {row[4] / row[5]:.2f}x"
    if memory:
        print(f"{label:<26} {a_name}: {row[0]:7.3f} s {fmt_mb(row[2]):>8}   {b_name}: {row[1]:7.3f} s "
              f"{fmt_mb(row[3]):>8}   time ratio {row[0] / row[1]:5.2f}x   memory ratio {row[2] / row[3]:6.3f}x{cpu}",
              flush=True)
    else:  # a sequence of processes: the sum of their peaks says nothing
        print(f"{label:<26} {a_name}: {row[0]:7.3f} s   {b_name}: {row[1]:7.3f} s   time ratio {row[0] / row[1]:5.3f}x "
              f"({row[1] / row[0]:.1f} times faster){cpu}", flush=True)
    return row


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("--schrot", required=True)
    ap.add_argument("--ngspice", default="ngspice")
    ap.add_argument("--reps", type=int, default=5)
    ap.add_argument("--pixels", default="500,2000,8000", help="pixel-array sizes (comma list; empty: none)")
    ap.add_argument("--extracted", type=int, default=200, help="extracted case channels (0: skip)")
    ap.add_argument("--sweep", default="20,500", help="pixels in the sweep cases (comma list; empty: none)")
    ap.add_argument("--sweep-points", type=int, default=50)
    ap.add_argument("--levers", default="500", help="pixels in the levers cases (comma list; empty: none)")
    ap.add_argument("--work", default=None, help="directory for the generated files (default: a temporary one)")
    args = ap.parse_args()
    work = args.work or tempfile.mkdtemp(prefix="schrot-bench-")
    os.makedirs(work, exist_ok=True)
    S, NG = os.path.abspath(args.schrot), args.ngspice
    print(f"schrot bench: {args.reps} alternating runs per side, medians; work directory {work}")
    print(f"cpus: {os.cpu_count()}, load average {os.getloadavg()[0]:.1f}; time is wall-clock of the whole process, "
          "memory the sum of per-process peaks, cpu the user+system time of the process tree")

    cases = []
    for n in [int(x) for x in args.pixels.split(",") if x.strip()]:
        cases.append((f"pixels {n}", "pixels", n, ()))
    if args.extracted:
        cases.append((f"extracted {args.extracted}ch", "extracted", args.extracted, ()))
    for label, kind, size, extra in cases:
        net = os.path.join(work, f"{kind}{size}.cir")
        aug = os.path.join(work, f"{kind}{size}-aug.cir")
        gen(kind, size, net, extra)
        subprocess.run([S, "augment", net, "-o", aug, "-q"], check=True)
        compare(label, [S, "report", net], [NG, "-b", aug], args.reps)
        if kind == "extracted":
            # DESIGN.md section 7: the extracted case against the simulator's bare noise run
            bare = os.path.join(work, f"{kind}{size}-bare.cir")
            with open(net) as f, open(bare, "w") as g:
                for line in f:
                    if line.startswith(".noise"):
                        continue
                    if line.startswith(".end"):
                        g.write(".control\nnoise v(out) itest dec 10 1 1meg\nprint onoise_total\nquit 0\n.endc\n")
                    g.write(line.replace("itest 0 bus dc 0", "itest 0 bus dc 0 ac 1"))
            compare(label + " (bare)", [S, "report", net], [NG, "-b", bare], args.reps,
                    b_name="ngspice -b bare noise")
            # the 50,000 trace resistors rp* as one row (report --lump): the per-device run leaves
            # them quiet, a second worker runs the circuit's own noise at the same time
            compare(label + " --lump", [S, "report", net, "--lump", "rp.*"], [NG, "-b", bare], args.reps,
                    a_name="schrot report --lump 'rp.*'", b_name="ngspice -b bare noise")

    for n in [int(x) for x in args.sweep.split(",") if x.strip()]:
        k = args.sweep_points
        net = os.path.join(work, f"sweep{n}.cir")
        gen("pixels", n, net)
        lo, hi = 0.1e-9, 100e-9
        values = [lo * (hi / lo) ** (i / (k - 1)) for i in range(k)]
        singles = []
        text = open(net).read()
        for i, v in enumerate(values):
            p = os.path.join(work, f"sweep{n}-{i:03d}.cir")
            with open(p, "w") as f:
                f.write(re.sub(r"^xp1 l1 pixel ip=\S+$", f"xp1 l1 pixel ip={v!r}", text, count=1, flags=re.M))
            singles.append(p)
        script = os.path.join(work, f"singles{n}.sh")
        with open(script, "w") as f:
            f.write("set -e\n" + "".join(f"'{S}' report '{p}' -q > /dev/null\n" for p in singles))
        compare(f"sweep {k} pts, {n} pixels", [S, "sweep", net, "--vary", f"xp1.iph={lo}:{hi}:{k}", "-q"],
                ["sh", script], args.reps, a_name="schrot sweep", b_name=f"{k} x schrot report",
                memory=False)

    # issue 15: levers (the unchanged run, then up to 26 changed runs on two workers) against one report
    for n in [int(x) for x in args.levers.split(",") if x.strip()]:
        net = os.path.join(work, f"levers{n}.cir")
        gen("pixels", n, net)
        compare(f"levers, {n} pixels", [S, "levers", net, "-q"], [S, "report", net, "-q"], args.reps,
                a_name="schrot levers", b_name="schrot report", memory=False)


if __name__ == "__main__":
    main()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""Writes the benchmark netlists: invented scenarios, sized by the caller (bench/README in docs/performance.md).

pixels N     a pixel array of N light-sensor subcircuit instances read out over a 50-section RC line
             into a transimpedance stage; every pixel has its own photocurrent (params:)
extracted C  a flat, extracted-style netlist of a C-channel photodiode array (C photodiodes and their
             photocurrents) whose traces are modelled by parasitic R and C (100k of them for C=200)
bigdeck MB   about MB megabytes of netlist text (many pixel instances, long comments): reader throughput
"""
import argparse
import sys

LINE_SECTIONS = 50


# The two generators schrot's report adds to each pixel (across iph and across dpd), written out
# in the netlist so that plain ngspice can time them: "g" is the current form (1 ohm on its own
# node, unity VCCS), "f" the first one (1 ohm shorted by a 0 V source, copied by a unity CCCS).
PROBES = {
    "g": ("rschg0 nschg0 0 1\ngschg0 0 k nschg0 0 1\nrschg1 nschg1 0 1\ngschg1 k 0 nschg1 0 1\n"),
    "f": ("vschg0 nschg0 0 dc 0\nrschg0 nschg0 0 1\nfschg0 0 k vschg0 1\n"
          "vschg1 nschg1 0 dc 0\nrschg1 nschg1 0 1\nfschg1 k 0 vschg1 1\n"),
}


def pixels(n, out, noise="dec 10 1 1meg 1", probes=None):
    w = out.write
    w(f"Pixel array readout: {n} light-sensor pixels on a {LINE_SECTIONS}-section RC readout line\n")
    w("* Benchmark netlist written by bench/gen_netlists.py. Every value is invented.\n")
    w(".subckt pixel line params: ip=1n\n")
    w("iph 0 k dc {ip}\n")
    w("dpd k 0 dpix\n")
    w("cpd k 0 2p\n")
    w("rsw k line 10k\n")
    if probes:
        w(PROBES[probes])
    w(".ends pixel\n")
    w(".model dpix d is=1f n=1.05 rs=10 cjo=1p\n")
    # the readout line: l0 is held at virtual ground by the transimpedance stage
    for s in range(LINE_SECTIONS):
        w(f"rl{s + 1} l{s} l{s + 1} 20\n")
        w(f"cl{s + 1} l{s + 1} 0 0.2p\n")
    for k in range(n):
        node = 1 + k % LINE_SECTIONS
        ip = 0.5 + (k * 37 % 100) / 100.0  # 0.5 .. 1.49 nA, a fixed invented pattern
        w(f"xp{k + 1} l{node} pixel ip={ip:.2f}n\n")
    w("itest 0 l0 dc 0\n")
    w("rf l0 out 1meg\n")
    w("cf l0 out 1p\n")
    w("eamp out 0 0 l0 1e5\n")
    w(f".noise v(out) itest {noise}\n")
    w(".end\n")


def extracted(channels, out, sections=250, noise="dec 10 1 1meg 1"):
    """Each channel: a photodiode and its photocurrent, then a trace of `sections` R-C segments
    to the shared readout bus. channels*sections parasitic R and as many C."""
    w = out.write
    w(f"Extracted photodiode array: {channels} channels, {channels * sections} parasitic R and "
      f"{channels * sections} parasitic C\n")
    w("* Benchmark netlist written by bench/gen_netlists.py in the flat style of an extraction. "
      "Every value is invented.\n")
    w(".model dpd d is=2f n=1.02 cjo=0.5p\n")
    for c in range(channels):
        ip = 1.0 + (c * 53 % 100) / 50.0
        w(f"iph{c} 0 p{c}_0 dc {ip:.3f}n\n")
        w(f"dpd{c} p{c}_0 0 dpd\n")
        for s in range(sections):
            a = f"p{c}_{s}"
            b = "bus" if s == sections - 1 else f"p{c}_{s + 1}"
            w(f"rp{c}_{s} {a} {b} 2.5\n")
            w(f"cp{c}_{s} {b} 0 0.04f\n")
    w("itest 0 bus dc 0\n")
    w("rf bus out 1meg\n")
    w("cf bus out 0.5p\n")
    w("eamp out 0 0 bus 1e5\n")
    w(f".noise v(out) itest {noise}\n")
    w(".end\n")


def bigdeck(megabytes, out):
    """Reader throughput: pixel instances and the comments and continuation lines real decks carry."""
    w = out.write
    target = int(megabytes * 1e6)
    written = 0
    head = ("Reader throughput deck: pixel instances with comments and continuations\n"
            "* Benchmark netlist written by bench/gen_netlists.py. Every value is invented.\n"
            ".subckt pixel line params: ip=1n\n"
            "iph 0 k dc {ip}\n"
            "dpd k 0 dpix ; the photodiode\n"
            "cpd k 0 2p $ its capacitance\n"
            "rsw k line\n+ 10k\n"
            ".ends pixel\n"
            ".model dpix d (is=1f n=1.05 rs=10\n+ cjo=1p)\n")
    w(head)
    written += len(head)
    k = 0
    while written < target:
        k += 1
        chunk = (f"* pixel {k}: row {k // 1000}, column {k % 1000}, invented photocurrent below\n"
                 f"xp{k} l{k % 50} pixel ip={0.5 + (k * 37 % 100) / 100.0:.2f}n\n"
                 f"rtrace{k} l{k % 50} l{(k + 1) % 50} 1.25 ; trace segment\n"
                 f"ctrace{k} l{k % 50} 0\n+ 0.08f\n")
        w(chunk)
        written += len(chunk)
    tail = "itest 0 l0 dc 0\nrf l0 out 1meg\n.noise v(out) itest dec 10 1 1meg 1\n.end\n"
    w(tail)


def main():
    ap = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    ap.add_argument("kind", choices=["pixels", "extracted", "bigdeck"])
    ap.add_argument("size", type=float, help="instances (pixels), channels (extracted) or megabytes (bigdeck)")
    ap.add_argument("-o", "--out", default="-")
    ap.add_argument("--sections", type=int, default=250, help="extracted: R-C segments per channel")
    ap.add_argument("--noise", default="dec 10 1 1meg 1", help="the .noise sweep after 'v(out) itest'")
    ap.add_argument("--probes", choices=["f", "g"], help="pixels: write schrot's two generators into the cell")
    ap.add_argument("--control", help="replace the .noise line by a .control block running these commands "
                    "(';' separates them), e.g. 'op'")
    args = ap.parse_args()
    out = sys.stdout if args.out == "-" else open(args.out, "w")
    if args.kind == "pixels":
        pixels(int(args.size), out, args.noise, args.probes)
    elif args.kind == "extracted":
        extracted(int(args.size), out, args.sections, args.noise)
    else:
        bigdeck(args.size, out)
    if out is not sys.stdout:
        out.close()
        if args.control:
            text = open(args.out).read().replace("itest 0 l0 dc 0\n", "itest 0 l0 dc 0 ac 1\n")
            lines = [l for l in text.splitlines() if not l.startswith(".noise") and l != ".end"]
            lines += [".control"] + [c.strip() for c in args.control.split(";")] + ["quit 0", ".endc", ".end"]
            with open(args.out, "w") as f:
                f.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()

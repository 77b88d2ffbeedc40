#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""--html FILE in a real browser: headless Chromium renders the design-review page of the canopy
probe to a PNG and dumps its DOM, which must hold the headline figures (the same numbers as the
JSON of the same run), the ranked rows, the inline SVG plot and every assumption.

Skips (exit 0) when chromium is not installed (Debian packages chromium and chromium-driver)."""
import json
import os
import shutil
import struct
import subprocess
import sys
import tempfile
import zlib
from html.parser import HTMLParser

from schrot_check import SCHROT, close, true, finish

ROOT = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
NETLIST = "netlists/canopy-probe.cir"
CHROMIUM = shutil.which("chromium") or shutil.which("chromium-browser")
SI = {"a": 1e-18, "f": 1e-15, "p": 1e-12, "n": 1e-9, "µ": 1e-6, "m": 1e-3, "": 1.0, "k": 1e3, "M": 1e6, "G": 1e9}

if not CHROMIUM:
    print("skip: chromium is not installed (apt-get install chromium chromium-driver)")
    print("0 passed, 0 failed, 1 skipped (no browser)")
    sys.exit(0)


def chromium(*args):
    """Runs headless Chromium with a fresh profile; returns (rc, stdout)."""
    profile = tempfile.mkdtemp(prefix="schrot-chromium-")
    try:
        proc = subprocess.run([CHROMIUM, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic",
                               "--no-first-run", "--disable-background-networking", "--disable-component-update",
                               "--disable-sync", "--user-data-dir=" + profile] + list(args),
                              capture_output=True, text=True, timeout=180)
        return proc.returncode, proc.stdout
    finally:
        shutil.rmtree(profile, ignore_errors=True)


def si_value(text):
    """'142 µV rms' -> 1.42e-4 (the number and an SI prefix in front of the unit)."""
    number, unit = text.split()[:2]
    prefix = unit[0] if len(unit) > 1 and unit[0] in SI and unit[1:2] in ("V", "A", "W") else ""
    return float(number) * SI[prefix]


def png_rows(data):
    """Width, height and the inflated scanlines of a PNG (raises on a malformed file)."""
    width, height = struct.unpack(">II", data[16:24])
    idat, pos = b"", 8
    while pos < len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        if kind == b"IDAT":
            idat += data[pos + 8:pos + 8 + length]
        pos += 12 + length
    return width, height, zlib.decompress(idat)


class Page(HTMLParser):
    """Collects what the checks read: figures, table rows (with their section), list items, svg elements."""

    def __init__(self):
        super().__init__()
        self.stack, self.figures, self.rows, self.items, self.paragraphs = [], [], [], [], []
        self.svg_in_figure, self.svg_paths, self.h2 = False, 0, []
        self._text = None

    def handle_starttag(self, tag, attrs):
        cls = dict(attrs).get("class", "")
        if tag == "svg" and "figure" in [t for t, _ in self.stack]:
            self.svg_in_figure = True
        if tag in ("path", "use") and any(t == "svg" for t, _ in self.stack):
            self.svg_paths += 1
        if tag in ("tr", "li", "h2", "p") or (tag == "div" and cls == "fig"):
            self._text = [tag if tag != "div" else "fig", []]
        self.stack.append((tag, cls))

    def handle_endtag(self, tag):
        while self.stack:
            t, cls = self.stack.pop()
            if t == tag:
                break
        if self._text and (tag == self._text[0] or (tag == "div" and self._text[0] == "fig")):
            kind, parts = self._text
            text = " ".join(" ".join(parts).split())
            if kind == "tr":
                self.rows.append((self.h2[-1] if self.h2 else "", text))
            else:
                {"li": self.items, "h2": self.h2, "fig": self.figures, "p": self.paragraphs}[kind].append(text)
            self._text = None

    def handle_data(self, data):
        if self._text:
            self._text[1].append(data)


work = tempfile.mkdtemp(prefix="schrot-html-")
html = os.path.join(work, "canopy review.html")  # a space: the file URL must be quoted
shot = os.path.join(work, "canopy.png")
js = os.path.join(work, "canopy.json")
proc = subprocess.run([SCHROT, "report", NETLIST, "--html", html, "--spot", "100", "--responsivity", "0.45",
                       "--json", js], cwd=ROOT, capture_output=True, text=True, timeout=300)
true("[H] schrot report --html exits 0", proc.returncode == 0, proc.stderr)
true("[H] the HTML file exists", os.path.exists(html))
if proc.returncode != 0 or not os.path.exists(html):
    finish()
data = json.load(open(js))
url = "file://" + html.replace(" ", "%20")

rc, _ = chromium("--screenshot=" + shot, "--window-size=1280,2000", url)
true("[H] chromium --screenshot exits 0", rc == 0)
png = open(shot, "rb").read() if os.path.exists(shot) else b""
true("[H] the screenshot is a PNG (signature)", png[:8] == b"\x89PNG\r\n\x1a\n")
true("[H] the screenshot is non-trivial (over 30 kB)", len(png) > 30000, "%d bytes" % len(png))
if png[:8] == b"\x89PNG\r\n\x1a\n":
    w, h, raw = png_rows(png)
    true("[H] the screenshot is 1280 x 2000", (w, h) == (1280, 2000), "%d x %d" % (w, h))
    # a blank or single-colour page inflates to a handful of byte values
    true("[H] the screenshot shows more than a blank page", len(set(raw)) > 64, "%d byte values" % len(set(raw)))

rc, dom = chromium("--dump-dom", url)
true("[H] chromium --dump-dom exits 0 with a document", rc == 0 and "</html>" in dom)
page = Page()
page.feed(dom)

# headline figures: the same numbers as the JSON of the same run, at 3 significant digits
true("[H] seven headline figures (the transfer's value and bandwidths too)", len(page.figures) == 7, repr(page.figures))
out = [f for f in page.figures if f.endswith("output noise in the band")]
inp = [f for f in page.figures if f.endswith("input-referred noise")]
spot = [f for f in page.figures if "input-referred at 100 Hz; NEP " in f]
band_nep = [f for f in page.figures if "band-average NEP at 0.45 A/W" in f]
shr = [f for f in page.figures if f.endswith("share of added shot noise")]
true("[H] headline: output noise, input-referred noise, NEP over the band, the 100 Hz spot, added shot share",
     len(out) == len(inp) == len(spot) == len(band_nep) == len(shr) == 1, repr(page.figures))
if out and inp and spot and band_nep and shr:
    close("[H] headline output noise equals the JSON total", si_value(out[0]), data["total"]["output_rms_v"], 5e-3)
    close("[H] headline input-referred noise equals the JSON total", si_value(inp[0]), data["total"]["input_rms"], 5e-3)
    close("[H] headline spot density equals the JSON spot", si_value(spot[0]), data["spot"][0]["input_per_rthz"], 5e-3)
    close("[H] headline spot NEP equals the JSON spot NEP", si_value(spot[0].split("; NEP ")[1]),
          data["spot"][0]["nep_w_per_rthz"], 5e-3)
    close("[H] headline band NEP equals the JSON band NEP", si_value(band_nep[0]), data["total"]["nep_band_w_per_rthz"],
          5e-3)
    close("[H] headline shot share equals the JSON share", float(shr[0].split()[0]) / 100,
          data["total"]["carrier_shot_share"], 1e-3)

verdict = [p for p in page.paragraphs if p.startswith("Verdict:")]
true("[H] the verdict sentence is the JSON's", len(verdict) == 1 and verdict[0] == "Verdict: " + data["verdict"]["text"],
     repr(verdict))

# the ranked contribution rows, in the JSON's order
ranked = [r for h, r in page.rows if h.startswith("Contributions") and r.split(" ", 1)[0].isdigit()]
want = [(c["device"], c["generator"]) for c in data["contributions"]]
got = [tuple(r.split()[1:3]) for r in ranked]
true("[H] ranked rows iph, rf, dpin in the JSON's order", got == want and [d for d, _ in got[:3]] == ["iph", "rf", "dpin"],
     "%r vs %r" % (got, want))
true("[H] the first row is the photocurrent's added shot noise at 78.8 %",
     bool(ranked) and "added" in ranked[0] and "78.8 %" in ranked[0], ranked[:1])

# the plot is inline SVG inside the page, with drawn curves
true("[H] the plot is an inline <svg> inside a <figure>", page.svg_in_figure)
true("[H] the inline SVG draws (over 20 path/glyph elements)", page.svg_paths > 20, "%d" % page.svg_paths)
true("[H] the page loads nothing from elsewhere (self-contained)",
     all(s not in dom for s in ("src=\"http", "href=\"http", "<script", "<link")))

# assumptions: temperature, band, carriers with reasons, simulator version
items = page.items
true("[H] assumption: circuit temperature 300.15 K (27.00 °C)", any("300.15 K (27.00 °C)" in i for i in items), items)
true("[H] assumption: the band 100 mHz to 100 kHz", any(i.startswith("band 100 mHz to 100 kHz") for i in items), items)
true("[H] assumption: carrier iph with its current and reason",
     any(i.startswith("carrier iph (2.00 nA)") and "across diode dpin" in i for i in items), items)
true("[H] assumption: the junction correction", any(i.startswith("junction correction applied") for i in items), items)
true("[H] assumption: the simulator and its version",
     any(i == "simulator: " + data["simulator"] and data["simulator"].startswith("ngspice-") for i in items), items)
true("[H] sections: contributions, plot, carriers, assumptions",
     all(any(h.startswith(s) for h in page.h2) for s in ("Contributions", "Output noise density", "Shot-noise carriers",
                                                          "Assumptions")), page.h2)
shutil.rmtree(work, ignore_errors=True)
finish()

#!/usr/bin/env python3
# SPDX-License-Identifier: BSD-3-Clause
"""--plot FILE writes a valid PNG (signature, IHDR, CRCs, inflatable and not blank) and a valid SVG
(well-formed XML with drawn paths) for a demo netlist; other extensions are refused with exit 2."""
import os
import shutil
import struct
import subprocess
import tempfile
import xml.etree.ElementTree as ET
import zlib

from schrot_check import SCHROT, true, finish

ROOT = os.path.abspath(os.path.join(os.path.dirname(os.path.abspath(__file__)), "..", ".."))
SVG_NS = "{http://www.w3.org/2000/svg}"


def report(netlist, *args):
    proc = subprocess.run([SCHROT, "report", netlist, "-q"] + list(args), cwd=ROOT, capture_output=True, text=True,
                          timeout=300)
    return proc.returncode, proc.stderr


def png_chunks(data):
    """[(kind, payload, crc_ok)] of a PNG file (PNG specification, 2nd ed., W3C 2003, section 5.3)."""
    chunks, pos = [], 8
    while pos + 12 <= len(data):
        length, kind = struct.unpack(">I4s", data[pos:pos + 8])
        payload = data[pos + 8:pos + 8 + length]
        crc = struct.unpack(">I", data[pos + 8 + length:pos + 12 + length])[0]
        chunks.append((kind, payload, zlib.crc32(kind + payload) & 0xffffffff == crc))
        pos += 12 + length
    return chunks


work = tempfile.mkdtemp(prefix="schrot-plot-")
for name, args in (("canopy-probe", ["--band", "1:10k"]),
                   ("rangefinder-apd", ["--avalanche", "iapd=50:0.02"])):
    netlist = "netlists/%s.cir" % name
    png = os.path.join(work, name + ".png")
    svg = os.path.join(work, name + ".svg")

    rc, err = report(netlist, *args, "--plot", png)
    true("[P] %s: --plot .png exits 0" % name, rc == 0, err)
    data = open(png, "rb").read() if os.path.exists(png) else b""
    true("[P] %s: PNG signature" % name, data[:8] == b"\x89PNG\r\n\x1a\n")
    chunks = png_chunks(data) if data[:8] == b"\x89PNG\r\n\x1a\n" else []
    true("[P] %s: IHDR first, IEND last, every CRC right" % name,
         bool(chunks) and chunks[0][0] == b"IHDR" and chunks[-1][0] == b"IEND" and all(ok for _, _, ok in chunks))
    if chunks and chunks[0][0] == b"IHDR":
        w, h, depth, colour = struct.unpack(">IIBB", chunks[0][1][:10])
        true("[P] %s: 960 x 762 pixels (noise and transfer panels), 8-bit colour" % name, (w, h, depth) == (960, 762, 8) and colour in (2, 6),
             "%d x %d, depth %d, colour type %d" % (w, h, depth, colour))
        raw = zlib.decompress(b"".join(p for k, p, _ in chunks if k == b"IDAT"))
        bpp = 4 if colour == 6 else 3
        true("[P] %s: image data inflates to height x (1 + width x %d) bytes" % (name, bpp),
             len(raw) == h * (1 + w * bpp), "%d bytes" % len(raw))
        true("[P] %s: not a blank image" % name, len(set(raw)) > 64, "%d byte values" % len(set(raw)))

    rc, err = report(netlist, *args, "--plot", svg)
    true("[P] %s: --plot .svg exits 0" % name, rc == 0, err)
    try:
        root = ET.parse(svg).getroot()
    except (ET.ParseError, OSError) as e:
        root = None
        true("[P] %s: SVG is well-formed XML" % name, False, str(e))
    if root is not None:
        true("[P] %s: SVG root is <svg> 960 x 762" % name, root.tag == SVG_NS + "svg" and
             root.get("width", "").startswith("960") and root.get("height", "").startswith("762"),
             "%s %s x %s" % (root.tag, root.get("width"), root.get("height")))
        paths = root.findall(".//" + SVG_NS + "path")
        texts = root.findall(".//" + SVG_NS + "text")
        true("[P] %s: SVG draws curves and grid (over 15 paths) and text (over 20 labels)" % name,
             len(paths) > 15 and len(texts) > 20, "%d paths, %d texts" % (len(paths), len(texts)))
        # words stay text, searchable and editable, not glyph outlines (issue 13 item 7)
        words = ["".join(t.itertext()) for t in root.iter(SVG_NS + "text")]
        true("[P] %s: SVG labels are <text> elements with units (frequency, 1 kHz, V/√Hz)" % name,
             "frequency" in words and "1 kHz" in words and any(w.endswith("V/√Hz") for w in words), repr(words[:12]))
        true("[P] %s: no glyph outlines in the SVG" % name, not root.findall(".//" + SVG_NS + "symbol"))

bad = os.path.join(work, "canopy.jpg")
rc, err = report("netlists/canopy-probe.cir", "--plot", bad)
true("[P] --plot with another extension exits 2 and names the rule", rc == 2 and "must end in .svg or .png" in err, err)
true("[P] ... and writes no file", not os.path.exists(bad))
shutil.rmtree(work, ignore_errors=True)
finish()

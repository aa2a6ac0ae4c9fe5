"""Checks the batch sheet as Chromium printed it (text from pdftotext) and as it drew it (PNG),
against the numbers saltwise-cli gives for the same recipe on the command line.

Usage: check_sheet.py OUT_DIR BATCH   (OUT_DIR holds sheet.pdf, sheet.png and the CLI's JSON)
"""

import json
import re
import struct
import subprocess
import sys
import zlib
from pathlib import Path

out = Path(sys.argv[1])
batch_text = sys.argv[2]
problems = []


def check(ok, what):
    if not ok:
        problems.append(what)


def load(name):
    return json.loads((out / name).read_text())


# Plain (not layout) text keeps sentences on one line for phrase checks; words are joined by
# single spaces so a line break inside a sentence does not matter.
text = subprocess.run(
    ["pdftotext", str(out / "sheet.pdf"), "-"], check=True, capture_output=True, text=True
).stdout
flat = " ".join(text.split())
numbers = [float(n.replace(",", "")) for n in re.findall(r"(?<![\w.])-?\d[\d,]*\.?\d*", flat)]


def shows_number(value, rel):
    """Whether the page shows `value` within a relative rounding tolerance."""
    return any(abs(n - value) <= rel * abs(value) + 1e-12 for n in numbers)


ph = load("ph.json")
titrate = load("titrate.json")
dose = load("dose.json")

m = re.fullmatch(r"([0-9.]+)\s*(g|kg)", batch_text)
check(m is not None, f"batch '{batch_text}' is not NUMBERg or NUMBERkg")
unit_g = 1000.0 if m and m.group(2) == "kg" else 1.0
batch_g = float(m.group(1)) * unit_g if m else 0.0
factor = batch_g / ph["batch_mass_g"]

# The predicted pH as ph --json gives it, to two decimals as the sheet prints it.
check(f"{ph['ph']:.2f}" in flat, f"predicted pH {ph['ph']:.2f} not on the page")

# Every weighed line scaled to the batch, in the unit typed (4 significant figures: half a unit
# in the 4th figure is at most 5e-4 relative).
for ing in ph["ingredients"]:
    expected = ing["mass_g"] * factor / unit_g
    check(shows_number(expected, 5.1e-4), f"{ing['id']}: scaled mass {expected:.6g} not on the page")
check(shows_number(batch_g / unit_g, 5.1e-4), "the batch size is not on the page")

# The dose to target for this batch: the dose for the recipe's own batch, scaled.
dose_here = dose["amount_g"] * factor / unit_g
check(shows_number(dose_here, 5.1e-4), f"dose {dose_here:.6g} not on the page")

# The QC end points as titrate --json gives them, in mL to two decimals.
for e in titrate["endpoints"]:
    check(f"{e['ml']:.2f}" in flat, f"QC end point pH {e['ph']}: {e['ml']:.2f} mL not on the page")

# Every caution by its title, the first one in full, and the closing deferral word for word.
cautions = ph["cautions"]
check(len(cautions) >= 2, "the demo should raise cautions")
for c in cautions:
    check(c["title"] in flat, f"caution '{c['title']}' not on the page")
if cautions:
    check(cautions[0]["text"] in flat, f"caution text '{cautions[0]['text']}' not on the page")
    deferral = cautions[-1]["text"]
    check("safety data sheet" in deferral, "the last caution is not the deferral")
    check(deferral in flat, "the deferral to safety data sheets and local rules is not on the page")

# The PNG: a real picture of the page, not an empty one.
png = (out / "sheet.png").read_bytes()
check(png[:8] == b"\x89PNG\r\n\x1a\n", "sheet.png is not a PNG")
if png[:8] == b"\x89PNG\r\n\x1a\n":
    width, height = struct.unpack(">II", png[16:24])
    check(width >= 800 and height >= 1000, f"sheet.png is only {width}x{height}")
    check(len(png) > 40_000, f"sheet.png is only {len(png)} bytes")
    idat = b""
    at = 8
    while at < len(png):
        length, kind = struct.unpack(">I4s", png[at : at + 8])
        if kind == b"IDAT":
            idat += png[at + 8 : at + 8 + length]
        at += 12 + length
    raw = zlib.decompress(idat)
    # A blank page decodes to runs of one grey; a drawn page to many distinct values.
    check(len(set(raw)) > 64, "sheet.png looks blank")

if problems:
    print("tests/browser: the batch sheet does not show what it should:", file=sys.stderr)
    for p in problems:
        print(f"  - {p}", file=sys.stderr)
    print(f"  (text of the page: {out / 'sheet.txt'})", file=sys.stderr)
    sys.exit(1)

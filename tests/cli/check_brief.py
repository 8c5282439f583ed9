#!/usr/bin/env python3
"""End-to-end check of `curvebench brief` (the morning brief PDF), run by ctest in the GUI build.

Makes the sample store, writes the brief as of 2026-10-31 to a path with a space and a non-ASCII
character, and checks with Debian's poppler-utils (pdfinfo, pdftotext, pdftoppm) and nothing but
the Python standard library that:
  - the PDF has exactly one page;
  - its text holds the reading date, the advisory caution and, on the table's line of the first
    night, that night's OTB as `curvebench outlook` prints it (computed independently of the
    brief's code: the outlook verb is core only);
  - the first page, rendered at 50 dpi (PPM, pdftoppm's default output), is not blank: many distinct colours and a fair share of
    non-white pixels.

Usage: check_brief.py PATH/TO/curvebench [PNG_OUT]   (PNG_OUT: also keep a 110 dpi PNG)
"""
import csv
import datetime
import io
import os
import subprocess
import sys
import tempfile
import unicodedata

AS_OF = "2026-10-31"


def run(args, **kw):
    env = dict(os.environ, LC_ALL="C.UTF-8", LANG="C.UTF-8", QT_QPA_PLATFORM="offscreen")
    r = subprocess.run(args, capture_output=True, text=True, env=env, **kw)
    if r.returncode != 0:
        sys.exit(f"FAIL: {' '.join(args)} exited {r.returncode}\n{r.stdout}\n{r.stderr}")
    return r.stdout


def read_ppm(path):
    """Width, height and pixel bytes of a binary PPM (P6, maxval 255) as pdftoppm writes it."""
    data = open(path, "rb").read()
    fields, pos = [], 0
    while len(fields) < 4:
        while data[pos:pos + 1].isspace():
            pos += 1
        if data[pos:pos + 1] == b"#":
            pos = data.index(b"\n", pos) + 1
            continue
        end = pos
        while not data[end:end + 1].isspace():
            end += 1
        fields.append(data[pos:end])
        pos = end
    pos += 1  # the single whitespace after maxval
    assert fields[0] == b"P6" and fields[3] == b"255", fields
    w, h = int(fields[1]), int(fields[2])
    return w, h, data[pos:pos + 3 * w * h]


def main():
    if len(sys.argv) < 2:
        sys.exit(__doc__)
    cli = sys.argv[1]
    with tempfile.TemporaryDirectory() as tmp:
        store = os.path.join(tmp, "s.curvebench")
        run([cli, "sample", os.path.join(tmp, "files"), "--store", store])
        pdf = os.path.join(tmp, "brief März.pdf")
        out = run([cli, "brief", store, "--as-of", AS_OF, "--out", pdf])
        assert "Advisory only" in out, out

        info = run(["pdfinfo", pdf])
        pages = [l for l in info.splitlines() if l.startswith("Pages:")]
        assert pages and pages[0].split()[1] == "1", info

        # NFKC: the PDF's fonts set "fi" as a ligature, which pdftotext returns as one character.
        text = unicodedata.normalize("NFKC", run(["pdftotext", "-layout", pdf, "-"]))
        assert AS_OF in text, "the reading date is missing"
        assert "Advisory only: these figures support a decision" in text, "caution missing"

        # The first night's OTB, from the outlook verb (core), in the table's row of that night.
        rows = list(csv.DictReader(io.StringIO(
            run([cli, "outlook", store, "--as-of", AS_OF, "--days", "14"]))))
        first = rows[0]
        night = datetime.date.fromisoformat(first["night"])
        label = f"{night:%a} {night.day} {night:%b}"  # "Sun 1 Nov", as the brief writes it
        otb = int(first["otb"])
        lines = [l for l in text.splitlines() if l.strip().startswith(label)]
        assert lines, f"no table line for {label}"
        found = False
        for line in lines:
            rest = line.strip()[len(label):]
            if first["event"]:
                rest = rest.replace(first["event"], " ")
            tokens = [t.replace(",", "") for t in rest.split()]
            numbers = [t for t in tokens if t.lstrip("+-").isdigit()]
            if numbers and int(numbers[0]) == otb:
                found = True
        assert found, f"OTB {otb} not first on the line of {label}: {lines}"

        # Not blank: render page 1 at 50 dpi and look at its colours.
        prefix = os.path.join(tmp, "page")
        run(["pdftoppm", "-r", "50", "-f", "1", "-l", "1", pdf, prefix])
        ppm = [f for f in os.listdir(tmp) if f.startswith("page") and f.endswith(".ppm")][0]
        w, h, px = read_ppm(os.path.join(tmp, ppm))
        colours = {px[i:i + 3] for i in range(0, len(px), 3)}
        ink = sum(1 for i in range(0, len(px), 3) if px[i:i + 3] != b"\xff\xff\xff")
        share = ink / (w * h)
        assert w > h, f"landscape expected, got {w}x{h}"
        assert len(colours) >= 20, f"only {len(colours)} colours"
        assert share > 0.03, f"only {share:.1%} of the page is not white"
        print(f"ok: 1 page, {w}x{h} at 50 dpi, {len(colours)} colours, {share:.1%} ink; "
              f"{label} OTB {otb}")
        if len(sys.argv) > 2:
            run(["pdftoppm", "-r", "110", "-png", "-singlefile", pdf,
                 os.path.splitext(sys.argv[2])[0]])


if __name__ == "__main__":
    main()

"""pdf_runs.py PDF OUT — the pages, fonts and text runs of a report, for the
bare libharu program (pdf_floor.c) to write again.

OUT gets one line per fact:
    F <n> <font file>                  font n (a DejaVu file the report embeds)
    P <width> <height>                 a new page, in points
    T <n> <size> <x> <y> <text>        a text run (UTF-8) at its start point
The report's fonts are libharu's Type 0 fonts with two-byte Unicode codes,
so a shown string is UTF-16BE text. Read with pikepdf (Debian's
python3-pikepdf, on QPDF)."""
import sys

import pikepdf

FONT_DIR = "/usr/share/fonts/truetype/dejavu"


def main(src, out):
    pdf = pikepdf.open(src)
    fonts = {}  # BaseFont -> index
    lines = []
    for page in pdf.pages:
        box = [float(v) for v in page.mediabox]
        lines.append(f"P {box[2] - box[0]:g} {box[3] - box[1]:g}")
        res = page.resources.get("/Font", {})
        names = {}
        for key, obj in res.items():
            base = str(obj.get("/BaseFont", "")).lstrip("/")
            base = base.split("+", 1)[-1].split(",", 1)[0]
            if base not in fonts:
                fonts[base] = len(fonts)
            names[key] = fonts[base]
        font, size, x, y = 0, 0.0, 0.0, 0.0
        for operands, op in pikepdf.parse_content_stream(page):
            o = str(op)
            if o == "Tf":
                font, size = names.get(str(operands[0]), 0), float(operands[1])
            elif o == "Td":
                x, y = float(operands[0]), float(operands[1])
            elif o == "Tm":
                x, y = float(operands[4]), float(operands[5])
            elif o == "Tj":
                text = bytes(operands[0]).decode("utf-16-be", errors="replace")
                text = text.replace("\n", " ")
                lines.append(f"T {font} {size:g} {x:g} {y:g} {text}")
    head = [f"F {n} {FONT_DIR}/{base}.ttf" for base, n in sorted(fonts.items(), key=lambda kv: kv[1])]
    with open(out, "w", encoding="utf-8") as f:
        f.write("\n".join(head + lines) + "\n")


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])

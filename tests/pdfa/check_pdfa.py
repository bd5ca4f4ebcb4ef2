"""check_pdfa.py — the PDF/A-3b requirements headroom's reports must meet,
checked one by one on a built report with pikepdf (Debian python3-pikepdf).

    /usr/bin/python3 check_pdfa.py REPORT.pdf SOURCE.calc.md

Each requirement is named after the clause of ISO 19005-3:2012 (PDF/A-3)
it comes from; the file is read as a reader would (pikepdf over qpdf), so
nothing here trusts the writer. Prints `ok NAME` or `FAIL NAME: why` a line
and exits 1 on any failure. No PDF/A validator is packaged in Debian 12
(veraPDF is not), so this checker is what `make check` runs.
"""

import hashlib
import os
import re
import sys
import xml.etree.ElementTree as ET

import pikepdf

ICC = "/usr/share/color/icc/sRGB.icc"
NS = {
    "x": "adobe:ns:meta/",
    "rdf": "http://www.w3.org/1999/02/22-rdf-syntax-ns#",
    "pdfaid": "http://www.aiim.org/pdfa/ns/id/",
    "dc": "http://purl.org/dc/elements/1.1/",
    "xmp": "http://ns.adobe.com/xap/1.0/",
    "pdf": "http://ns.adobe.com/pdf/1.3/",
}

results = []


def req(name, cond, why=""):
    results.append((name, bool(cond), why))


def text(v):
    return str(v) if v is not None else None


def pdf_date_to_xmp(d):
    m = re.fullmatch(r"D:(\d{4})(\d{2})(\d{2})(\d{2})(\d{2})(\d{2})([+-])(\d{2})'(\d{2})'", d)
    if not m:
        return None
    y, mo, da, h, mi, s, sign, oh, om = m.groups()
    return "%s-%s-%sT%s:%s:%s%s%s:%s" % (y, mo, da, h, mi, s, sign, oh, om)


def main(pdf_path, src_path):
    raw = open(pdf_path, "rb").read()
    # A package (src_path its folder) attaches every part's source; its /ID is
    # the SHA-256 of the sources' hex digests in attachment order.
    package = os.path.isdir(src_path)
    if package:
        sources = [open(os.path.join(src_path, f), "rb").read()
                   for f in sorted(os.listdir(src_path)) if f.endswith(".calc.md")]
        src = None
        digest = None   # from the attachments, below
    else:
        src = open(src_path, "rb").read()
        digest = hashlib.sha256(src).digest()

    # 6.1.2 file header: %PDF-1.n, then a comment of four bytes >= 128
    req("6.1.2 header", re.match(rb"%PDF-1\.[0-7]\r?\n%[\x80-\xff]{4}", raw), raw[:16])
    # 6.1.3 trailer: an ID, no encryption
    pdf = pikepdf.open(pdf_path)
    tr = pdf.trailer
    ids = tr.get("/ID")
    req("6.1.3 trailer /ID", ids is not None and len(ids) == 2, ids)
    if package:
        attached = [spec.get("/EF").get("/F").read_bytes() for spec in (pdf.Root.get("/AF") or [])
                    if spec.get("/EF") is not None and spec.get("/EF").get("/F") is not None]
        req("6.8 every part's source attached", sorted(attached) == sorted(sources),
            "%d attached, %d sources" % (len(attached), len(sources)))
        joined = "".join(hashlib.sha256(b).hexdigest() for b in attached).encode()
        digest = hashlib.sha256(joined).digest()
    if ids is not None and len(ids) == 2:
        req("6.1.3 /ID is the source digest", bytes(ids[0]) == digest[:16] and bytes(ids[1]) == digest[:16],
            bytes(ids[0]).hex())
    req("6.1.3 no encryption", "/Encrypt" not in tr)

    root = pdf.Root
    # 6.6.2 metadata: an XMP stream, unfiltered, matching the Info dictionary
    md = root.get("/Metadata")
    req("6.6.2 catalog /Metadata", md is not None)
    if md is not None:
        req("6.6.2 metadata type", md.get("/Type") == "/Metadata" and md.get("/Subtype") == "/XML")
        req("6.6.2 metadata unfiltered", "/Filter" not in md)
        xmp = md.read_bytes()
        try:
            tree = ET.fromstring(xmp[xmp.index(b"<x:xmpmeta"):xmp.rindex(b"</x:xmpmeta>") + 12])
            ok_xml = True
        except (ValueError, ET.ParseError) as e:
            ok_xml, tree = False, None
            req("6.6.2 XMP is well-formed XML", False, e)
        if ok_xml:
            req("6.6.2 XMP is well-formed XML", True)
            desc = tree.find(".//rdf:Description", NS)

            def one(tag):
                e = desc.find(tag, NS)
                if e is None:
                    return None
                li = e.find(".//rdf:li", NS)
                return (li if li is not None else e).text

            req("6.6.4 pdfaid:part 3", one("pdfaid:part") == "3", one("pdfaid:part"))
            req("6.6.4 pdfaid:conformance B", one("pdfaid:conformance") == "B")
            info = pdf.trailer.get("/Info") or {}
            pairs = (("/Title", "dc:title"), ("/Author", "dc:creator"), ("/Subject", "dc:description"),
                     ("/Keywords", "pdf:Keywords"), ("/Producer", "pdf:Producer"),
                     ("/Creator", "xmp:CreatorTool"))
            for key, tag in pairs:
                iv, xv = text(info.get(key)), one(tag)
                req("6.6.3 Info %s equals XMP %s" % (key, tag), iv == xv, "%r vs %r" % (iv, xv))
            for key, tag in (("/CreationDate", "xmp:CreateDate"), ("/ModDate", "xmp:ModifyDate")):
                iv, xv = text(info.get(key)), one(tag)
                if iv is None:
                    req("6.6.3 %s absent in both" % key, xv is None, xv)
                else:
                    req("6.6.3 Info %s is a valid date equal to XMP" % key,
                        pdf_date_to_xmp(iv) == xv, "%r vs %r" % (iv, xv))

    # 6.2.3 output intent: GTS_PDFA1 with the sRGB profile embedded
    ois = root.get("/OutputIntents")
    req("6.2.3 /OutputIntents", ois is not None and len(ois) >= 1)
    if ois is not None and len(ois) >= 1:
        oi = ois[0]
        req("6.2.3 /S /GTS_PDFA1", oi.get("/S") == "/GTS_PDFA1")
        req("6.2.3 /OutputConditionIdentifier", "/OutputConditionIdentifier" in oi)
        prof = oi.get("/DestOutputProfile")
        req("6.2.3 /DestOutputProfile", prof is not None)
        if prof is not None:
            data = prof.read_bytes()
            req("6.2.3 profile has /N 3 and is RGB", prof.get("/N") == 3 and data[16:20] == b"RGB "
                and data[36:40] == b"acsp")
            req("6.2.3 profile is Debian's sRGB.icc", data == open(ICC, "rb").read())

    # 6.2.11 fonts: embedded, Type 0 with a ToUnicode map that is a CMap of
    # bfchar/bfrange entries, a CIDToGIDMap for CIDFontType2
    fonts = {}
    for page in pdf.pages:
        res = page.get("/Resources") or {}
        for name, f in (res.get("/Font") or {}).items():
            fonts[f.objgen] = f
    req("6.2.11 fonts found", len(fonts) > 0)
    for og, f in fonts.items():
        base = str(f.get("/BaseFont"))
        if f.get("/Subtype") == "/Type0":
            cid = f.DescendantFonts[0]
            fd = cid.get("/FontDescriptor")
        else:
            cid, fd = None, f.get("/FontDescriptor")
        embedded = fd is not None and any(k in fd for k in ("/FontFile", "/FontFile2", "/FontFile3"))
        req("6.2.11.4 %s embedded" % base, embedded)
        if cid is not None and cid.get("/Subtype") == "/CIDFontType2":
            req("6.2.11.3 %s has /CIDToGIDMap" % base, "/CIDToGIDMap" in cid)
        tu = f.get("/ToUnicode")
        req("6.2.11.7 %s has /ToUnicode" % base, tu is not None)
        if tu is not None:
            cm = tu.read_bytes().decode("latin-1")
            good = ("begincidrange" not in cm and "begincodespacerange" in cm
                    and ("beginbfrange" in cm or "beginbfchar" in cm) and "endcmap" in cm)
            for m in re.finditer(r"(\d+) beginbfrange\n(.*?)endbfrange", cm, re.S):
                rows = re.findall(r"<([0-9A-Fa-f]+)> <([0-9A-Fa-f]+)> <([0-9A-Fa-f]+)>", m.group(2))
                good = good and len(rows) == int(m.group(1)) <= 100
                for lo, hi, dst in rows:
                    good = good and lo[:-2] == hi[:-2] and int(lo, 16) <= int(hi, 16)
            req("6.2.11.7 %s ToUnicode is a valid CMap" % base, good)

    # 6.3.2 annotations: the Print flag set, none hidden
    n_annots, bad_annots = 0, 0
    for page in pdf.pages:
        for a in page.get("/Annots") or []:
            n_annots += 1
            flags = int(a.get("/F", 0))
            if not (flags & 4) or flags & (1 | 2 | 32):
                bad_annots += 1
    req("6.3.2 every annotation prints (%d)" % n_annots, bad_annots == 0, "%d bad" % bad_annots)

    # 6.8 embedded files: the source as associated file, relationship Source
    af = root.get("/AF")
    req("6.8 catalog /AF", af is not None and len(af) >= 1)
    if af is not None and len(af) >= 1:
        spec = af[0]
        req("6.8 /AFRelationship /Source", spec.get("/AFRelationship") == "/Source")
        req("6.8 file specification has /F and /UF", "/F" in spec and "/UF" in spec)
        ef = spec.get("/EF")
        stream = ef.get("/F") if ef is not None else None
        req("6.8 embedded file stream", stream is not None)
        if stream is not None:
            req("6.8 embedded file has a MIME /Subtype", "/Subtype" in stream)
            if not package:
                req("6.8 embedded file is the source bytes", stream.read_bytes() == src)
        names = root.get("/Names")
        efs = names.get("/EmbeddedFiles") if names is not None else None
        listed = efs is not None and any(v.objgen == spec.objgen for v in list(efs.get("/Names"))[1::2])
        req("6.8 the associated file is in the EmbeddedFiles name tree", listed)

    # 6.1.x actions: no JavaScript, no additional actions
    req("6.6.1 no JavaScript", "/JavaScript" not in (root.get("/Names") or {}) and "/AA" not in root
        and "/OpenAction" not in root)

    failed = 0
    for name, good, why in results:
        if good:
            print("ok %s" % name)
        else:
            failed += 1
            print("FAIL %s: %s" % (name, why))
    return 1 if failed else 0


if __name__ == "__main__":
    sys.exit(main(sys.argv[1], sys.argv[2]))

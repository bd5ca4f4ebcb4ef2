/* draw_archive.c — what makes a report an archival PDF/A-3b file.
 *
 * ISO 19005-3 (PDF/A-3) level B asks for a few objects libharu 2.3 does not
 * write, and for some it writes differently: an XMP metadata stream whose
 * entries match the document information (and name the part and level), an
 * sRGB output intent with an embedded ICC profile, fonts whose ToUnicode maps
 * are valid CMaps, the calc source as an associated file (/AF, with
 * /AFRelationship /Source), link annotations that print, dates in the form
 * the standard accepts, and a file identifier in the trailer. libharu stays
 * the writer: everything here is made from its object layer just before the
 * file is saved, so the bytes stay a function of the source alone (the
 * identifier is the source digest, never a clock).
 *
 * This is the drawing layer's second file (see draw.h): it works on
 * libharu's object layer, which nothing above the layer sees.
 *
 * The ICC profile is Debian's icc-profiles-free sRGB.icc (the Makefile
 * installs the package), read at build time like the fonts. */
#include "report/draw_lib.h"

#include <hpdf_catalog.h>
#include <hpdf_namedict.h>

#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#ifndef HEADROOM_VERSION
#define HEADROOM_VERSION "0.0.0"
#endif

const char *const DRAW_ICC_PROFILE = "/usr/share/color/icc/sRGB.icc";
static const char ICC_CONDITION[] = "sRGB IEC61966-2.1";
static const char PRODUCER[] = "headroom " HEADROOM_VERSION " with libharu " HPDF_VERSION_TEXT;

/* ---- ToUnicode ------------------------------------------------------------ */

/* With its UTF-8 encoder libharu shows text in Type 0 fonts whose character
 * codes are two-byte Unicode code points (Identity-H, the code is the CID,
 * and CIDToGIDMap picks the glyph), but the ToUnicode stream it writes is an
 * encoding CMap with a `begincidrange` that no reader accepts. The right map
 * is the identity on the Basic Multilingual Plane: a bfrange per high byte
 * (a range may not cross a change of the high byte), surrogates left out,
 * at most 100 ranges a block (ISO 32000-1, 9.10.3 and 5014 CMap spec). */
static void write_tounicode(HPDF_Stream s)
{
    HPDF_Stream_WriteStr(s, "/CIDInit /ProcSet findresource begin\n"
                            "12 dict begin\n"
                            "begincmap\n"
                            "/CIDSystemInfo << /Registry (Adobe) /Ordering (UCS) /Supplement 0 >> def\n"
                            "/CMapName /Adobe-Identity-UCS def\n"
                            "/CMapType 2 def\n"
                            "1 begincodespacerange\n<0000> <FFFF>\nendcodespacerange\n");
    int highs[256], n = 0;
    for (int h = 0; h < 256; h++)
        if (h < 0xD8 || h > 0xDF)
            highs[n++] = h;
    for (int i = 0; i < n; i += 100) {
        int k = n - i < 100 ? n - i : 100;
        char line[64];
        snprintf(line, sizeof line, "%d beginbfrange\n", k);
        HPDF_Stream_WriteStr(s, line);
        for (int j = i; j < i + k; j++) {
            snprintf(line, sizeof line, "<%02X00> <%02XFF> <%02X00>\n", highs[j], highs[j], highs[j]);
            HPDF_Stream_WriteStr(s, line);
        }
        HPDF_Stream_WriteStr(s, "endbfrange\n");
    }
    HPDF_Stream_WriteStr(s, "endcmap\n"
                            "CMapName currentdict /CMap defineresource pop\n"
                            "end\n"
                            "end\n");
}

static void fix_tounicode(Draw *D)
{
    for (int f = 0; f < DRAW_FONTS; f++) {
        if (!D->font[f])
            continue;
        HPDF_Dict font = (HPDF_Dict)D->font[f];
        HPDF_Dict cmap = HPDF_Dict_GetItem(font, "ToUnicode", HPDF_OCLASS_DICT);
        if (!cmap || !cmap->stream)
            continue;
        HPDF_MemStream_FreeData(cmap->stream);
        /* a ToUnicode stream is not an encoding CMap: no CMap keys */
        HPDF_Dict_RemoveElement(cmap, "Type");
        HPDF_Dict_RemoveElement(cmap, "CMapName");
        HPDF_Dict_RemoveElement(cmap, "CIDSystemInfo");
        HPDF_Dict_RemoveElement(cmap, "WMode");
        cmap->filter = HPDF_STREAM_FILTER_FLATE_DECODE;
        write_tounicode(cmap->stream);
    }
}

/* ---- dates ---------------------------------------------------------------- */

/* The report date ("YYYY-MM-DD", from the front matter or SOURCE_DATE_EPOCH)
 * as the information dictionary writes it (ISO 32000-1, 7.9.4) and as XMP
 * writes it (ISO 8601); libharu's own date writer puts an offset after 'Z'. */
static void date_forms(const char *day, char *pdf, size_t np, char *xmp, size_t nx)
{
    snprintf(pdf, np, "D:%.4s%.2s%.2s000000+00'00'", day, day + 5, day + 8);
    snprintf(xmp, nx, "%.10sT00:00:00+00:00", day);
}

/* ---- XMP -------------------------------------------------------------------- */

static void xml_text(HPDF_Stream s, const char *t)
{
    char one[2] = {0, 0};
    for (const unsigned char *c = (const unsigned char *)t; *c; c++) {
        switch (*c) {
        case '&': HPDF_Stream_WriteStr(s, "&amp;"); break;
        case '<': HPDF_Stream_WriteStr(s, "&lt;"); break;
        case '>': HPDF_Stream_WriteStr(s, "&gt;"); break;
        case '"': HPDF_Stream_WriteStr(s, "&quot;"); break;
        default:
            if (*c < 0x20 && *c != '\t' && *c != '\n')
                break; /* not allowed in XML 1.0 */
            one[0] = (char)*c;
            HPDF_Stream_WriteStr(s, one);
        }
    }
}

static void xmp_simple(HPDF_Stream s, const char *tag, const char *v)
{
    if (!v || !*v)
        return;
    HPDF_Stream_WriteStr(s, "   <");
    HPDF_Stream_WriteStr(s, tag);
    HPDF_Stream_WriteStr(s, ">");
    xml_text(s, v);
    HPDF_Stream_WriteStr(s, "</");
    HPDF_Stream_WriteStr(s, tag);
    HPDF_Stream_WriteStr(s, ">\n");
}

/* dc:title and dc:description are language alternatives, dc:creator a sequence. */
static void xmp_list(HPDF_Stream s, const char *tag, const char *kind, const char *item,
                     const char *v)
{
    if (!v || !*v)
        return;
    char open[128];
    snprintf(open, sizeof open, "   <%s><rdf:%s><rdf:li%s>", tag, kind, item);
    HPDF_Stream_WriteStr(s, open);
    xml_text(s, v);
    snprintf(open, sizeof open, "</rdf:li></rdf:%s></%s>\n", kind, tag);
    HPDF_Stream_WriteStr(s, open);
}

static HPDF_Dict make_xmp(Draw *D, const DrawInfo *info, const char *xmp_date)
{
    HPDF_Doc pdf = D->doc;
    HPDF_Dict md = HPDF_DictStream_New(pdf->mmgr, pdf->xref);
    if (!md)
        return NULL;
    md->filter = HPDF_STREAM_FILTER_NONE; /* readable without a PDF reader */
    HPDF_Dict_AddName(md, "Type", "Metadata");
    HPDF_Dict_AddName(md, "Subtype", "XML");
    HPDF_Stream s = md->stream;
    HPDF_Stream_WriteStr(s, "<?xpacket begin=\"\xEF\xBB\xBF\" id=\"W5M0MpCehiHzreSzNTczkc9d\"?>\n"
                            "<x:xmpmeta xmlns:x=\"adobe:ns:meta/\">\n"
                            " <rdf:RDF xmlns:rdf=\"http://www.w3.org/1999/02/22-rdf-syntax-ns#\">\n"
                            "  <rdf:Description rdf:about=\"\"\n"
                            "    xmlns:pdfaid=\"http://www.aiim.org/pdfa/ns/id/\"\n"
                            "    xmlns:dc=\"http://purl.org/dc/elements/1.1/\"\n"
                            "    xmlns:xmp=\"http://ns.adobe.com/xap/1.0/\"\n"
                            "    xmlns:pdf=\"http://ns.adobe.com/pdf/1.3/\">\n"
                            "   <pdfaid:part>3</pdfaid:part>\n"
                            "   <pdfaid:conformance>B</pdfaid:conformance>\n"
                            "   <dc:format>application/pdf</dc:format>\n");
    xmp_list(s, "dc:title", "Alt", " xml:lang=\"x-default\"", info->title);
    xmp_list(s, "dc:creator", "Seq", "", info->author);
    xmp_list(s, "dc:description", "Alt", " xml:lang=\"x-default\"", info->subject);
    xmp_simple(s, "pdf:Keywords", info->keywords);
    xmp_simple(s, "pdf:Producer", PRODUCER);
    xmp_simple(s, "xmp:CreatorTool", info->creator);
    if (xmp_date) {
        xmp_simple(s, "xmp:CreateDate", xmp_date);
        xmp_simple(s, "xmp:ModifyDate", xmp_date);
        xmp_simple(s, "xmp:MetadataDate", xmp_date);
    }
    HPDF_Stream_WriteStr(s, "  </rdf:Description>\n"
                            " </rdf:RDF>\n"
                            "</x:xmpmeta>\n"
                            "<?xpacket end=\"r\"?>\n");
    return md;
}

/* ---- output intent ---------------------------------------------------------- */

static bool add_output_intent(Draw *D)
{
    HPDF_Doc pdf = D->doc;
    FILE *f = fopen(DRAW_ICC_PROFILE, "rb");
    if (!f) {
        diag_error(D->diags, ((Pos){NULL, 0, 0}),
                   "cannot read the sRGB colour profile '%s' (Debian package icc-profiles-free)",
                   DRAW_ICC_PROFILE);
        return false;
    }
    HPDF_Dict icc = HPDF_DictStream_New(pdf->mmgr, pdf->xref);
    if (!icc) {
        fclose(f);
        return false;
    }
    icc->filter = HPDF_STREAM_FILTER_FLATE_DECODE;
    HPDF_Dict_AddNumber(icc, "N", 3);
    unsigned char buf[4096];
    size_t got;
    while ((got = fread(buf, 1, sizeof buf, f)) > 0)
        HPDF_Stream_Write(icc->stream, buf, (HPDF_UINT)got);
    bool read_ok = !ferror(f);
    fclose(f);
    if (!read_ok) {
        diag_error(D->diags, ((Pos){NULL, 0, 0}), "cannot read the sRGB colour profile '%s'",
                   DRAW_ICC_PROFILE);
        return false;
    }
    HPDF_Dict oi = HPDF_Dict_New(pdf->mmgr);
    HPDF_Array intents = HPDF_Array_New(pdf->mmgr);
    if (!oi || !intents)
        return false;
    HPDF_Dict_AddName(oi, "Type", "OutputIntent");
    HPDF_Dict_AddName(oi, "S", "GTS_PDFA1");
    HPDF_Dict_Add(oi, "OutputConditionIdentifier", HPDF_String_New(pdf->mmgr, ICC_CONDITION, NULL));
    HPDF_Dict_Add(oi, "Info", HPDF_String_New(pdf->mmgr, ICC_CONDITION, NULL));
    HPDF_Dict_Add(oi, "RegistryName", HPDF_String_New(pdf->mmgr, "http://www.color.org", NULL));
    HPDF_Dict_Add(oi, "DestOutputProfile", icc);
    HPDF_Array_Add(intents, oi);
    return HPDF_Dict_Add(pdf->catalog, "OutputIntents", intents) == HPDF_OK;
}

/* ---- attachments -------------------------------------------------------------- */

/* libharu's HPDF_AttachFile reads a file and files it under the path it
 * was given (without /Type /Filespec), so the embedded-file stream, its
 * file specification and the name-tree entry are made here from libharu's
 * object layer, straight from the bytes in memory. */
DrawFile *draw_attach(Draw *D, const char *base, const char *desc, const char *bytes, size_t len,
                      bool sorted)
{
    HPDF_Doc pdf = D->doc;
    HPDF_MMgr mm = pdf->mmgr;
    HPDF_Xref xref = pdf->xref;
    HPDF_NameDict names = HPDF_Catalog_GetNames(pdf->catalog);
    if (!names) {
        names = HPDF_NameDict_New(mm, xref);
        if (!names || HPDF_Catalog_SetNames(pdf->catalog, names) != HPDF_OK)
            return NULL;
    }
    HPDF_NameTree tree = HPDF_NameDict_GetNameTree(names, HPDF_NAME_EMBEDDED_FILES);
    if (!tree) {
        tree = HPDF_NameTree_New(mm, xref);
        if (!tree || HPDF_NameDict_SetNameTree(names, HPDF_NAME_EMBEDDED_FILES, tree) != HPDF_OK)
            return NULL;
    }
    HPDF_Dict file = HPDF_DictStream_New(mm, xref);
    HPDF_Dict params = HPDF_Dict_New(mm);
    HPDF_Dict spec = HPDF_Dict_New(mm);
    HPDF_Dict ef = HPDF_Dict_New(mm);
    if (!file || !params || !spec || !ef || HPDF_Xref_Add(xref, spec) != HPDF_OK)
        return NULL;
    file->filter = HPDF_STREAM_FILTER_FLATE_DECODE;
    HPDF_Dict_AddName(file, "Type", "EmbeddedFile");
    HPDF_Dict_AddName(file, "Subtype", "text/markdown");
    HPDF_Dict_AddNumber(params, "Size", (HPDF_INT32)len);
    HPDF_Dict_Add(file, "Params", params);
    HPDF_Stream_Write(file->stream, (const HPDF_BYTE *)bytes, (HPDF_UINT)len);

    /* an ASCII file name, anything else replaced */
    char name[256];
    size_t n = 0;
    for (const char *c = base; *c && n + 1 < sizeof name; c++)
        name[n++] = ((unsigned char)*c < 0x80 && (unsigned char)*c >= 0x20) ? *c : '_';
    name[n] = '\0';
    HPDF_Dict_AddName(spec, "Type", "Filespec");
    HPDF_Dict_Add(spec, "F", HPDF_String_New(mm, name, NULL));
    HPDF_Dict_Add(spec, "UF", HPDF_String_New(mm, name, NULL));
    HPDF_Dict_Add(spec, "Desc", HPDF_String_New(mm, desc, NULL));
    HPDF_Dict_Add(ef, "F", file);
    HPDF_Dict_Add(spec, "EF", ef);
    if (!sorted) {
        HPDF_NameTree_Add(tree, HPDF_String_New(mm, name, NULL), spec);
        return (DrawFile *)spec;
    }
    /* files added in sorted order: each entry is appended to the tree's
     * Names array directly, key then value */
    HPDF_Array items = HPDF_Dict_GetItem(tree, "Names", HPDF_OCLASS_ARRAY);
    if (items) {
        HPDF_Array_Add(items, HPDF_String_New(mm, name, NULL));
        HPDF_Array_Add(items, spec);
    }
    return (DrawFile *)spec;
}

/* ---- the whole ---------------------------------------------------------------- */

bool draw_archive_prepare(Draw *D, const DrawInfo *info, const char *day, const char *digest,
                          DrawFile *const *files, size_t nspecs)
{
    HPDF_Doc pdf = D->doc;
    HPDF_MMgr mm = pdf->mmgr;
    pdf->pdf_version = HPDF_VER_17; /* PDF/A-3 is based on ISO 32000-1 */

    fix_tounicode(D);

    /* information dictionary: producer and dates as XMP repeats them */
    HPDF_SetInfoAttr(pdf, HPDF_INFO_PRODUCER, PRODUCER);
    char pdf_date[40], xmp_date[40];
    bool dated = day && day[0] != '\0';
    if (dated) {
        date_forms(day, pdf_date, sizeof pdf_date, xmp_date, sizeof xmp_date);
        HPDF_Dict infodict = pdf->info;
        if (infodict) {
            HPDF_Dict_Add(infodict, "CreationDate", HPDF_String_New(mm, pdf_date, NULL));
            HPDF_Dict_Add(infodict, "ModDate", HPDF_String_New(mm, pdf_date, NULL));
        }
    }

    HPDF_Dict md = make_xmp(D, info, dated ? xmp_date : NULL);
    if (!md || HPDF_Dict_Add(pdf->catalog, "Metadata", md) != HPDF_OK)
        return false;
    if (!add_output_intent(D))
        return false;

    /* the sources as the associated files the report was made from (a
     * package's: the index, every part and the files they use) */
    HPDF_Array af = nspecs ? HPDF_Array_New(mm) : NULL;
    if (nspecs && !af)
        return false;
    for (size_t i = 0; i < nspecs; i++) {
        HPDF_Dict source_spec = (HPDF_Dict)files[i];
        if (!source_spec)
            continue;
        HPDF_Dict_AddName(source_spec, "AFRelationship", "Source");
        HPDF_Array_Add(af, source_spec);
        HPDF_Dict ef = HPDF_Dict_GetItem(source_spec, "EF", HPDF_OCLASS_DICT);
        HPDF_Dict file = ef ? HPDF_Dict_GetItem(ef, "F", HPDF_OCLASS_DICT) : NULL;
        HPDF_Dict params = file ? HPDF_Dict_GetItem(file, "Params", HPDF_OCLASS_DICT) : NULL;
        if (params && dated)
            HPDF_Dict_Add(params, "ModDate", HPDF_String_New(mm, pdf_date, NULL));
    }
    if (af)
        HPDF_Dict_Add(pdf->catalog, "AF", af);

    /* the file identifier: the first 16 bytes of the source's SHA-256 (a
     * package's: of all its sources' digests), so the same source gives the
     * same file and a changed one a new ID */
    HPDF_BYTE id[16];
    for (int i = 0; i < 16; i++) {
        unsigned v = 0;
        sscanf(digest + 2 * i, "%2x", &v);
        id[i] = (HPDF_BYTE)v;
    }
    HPDF_Array ids = HPDF_Array_New(mm);
    if (!ids)
        return false;
    HPDF_Array_Add(ids, HPDF_Binary_New(mm, id, 16));
    HPDF_Array_Add(ids, HPDF_Binary_New(mm, id, 16));
    return HPDF_Dict_Add(pdf->trailer, "ID", ids) == HPDF_OK && !D->error;
}

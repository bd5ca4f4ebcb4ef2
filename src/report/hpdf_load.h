/* hpdf_load.h — libharu, loaded at the first PDF build (see dynload.h).
 *
 * The drawing layer (draw.c, draw_archive.c) includes this through
 * draw_lib.h instead of <hpdf.h> alone: every libharu function they call is
 * listed in hpdf_fns.def, and a macro below turns each call into a call
 * through the table hpdf_fns, which hpdf_load() fills from the shared library. A call
 * to a function missing from the list fails to link (headroom is not linked
 * against libharu), so add a new one to both lists. */
#ifndef HEADROOM_HPDF_LOAD_H
#define HEADROOM_HPDF_LOAD_H

#include <hpdf.h>
#include <hpdf_catalog.h>
#include <hpdf_namedict.h>
#include <stdbool.h>

typedef struct HpdfFns {
#define HPDF_FN(name) __typeof__(name) *name;
#include "hpdf_fns.def"
#undef HPDF_FN
} HpdfFns;

extern HpdfFns hpdf_fns;

/* Load libharu once; false with the reason in why (one line). */
bool hpdf_load(const char **why);

/* The calls, redirected (hpdf_load.c / cholmod_load.c, which fill the table, go without). */
#ifndef HPDF_LOAD_NO_REDIRECT
#define HPDF_AddPage (*hpdf_fns.HPDF_AddPage)
#define HPDF_AddPageLabel (*hpdf_fns.HPDF_AddPageLabel)
#define HPDF_Array_Add (*hpdf_fns.HPDF_Array_Add)
#define HPDF_Array_New (*hpdf_fns.HPDF_Array_New)
#define HPDF_Binary_New (*hpdf_fns.HPDF_Binary_New)
#define HPDF_Catalog_GetNames (*hpdf_fns.HPDF_Catalog_GetNames)
#define HPDF_Catalog_SetNames (*hpdf_fns.HPDF_Catalog_SetNames)
#define HPDF_CreateOutline (*hpdf_fns.HPDF_CreateOutline)
#define HPDF_Destination_SetFitH (*hpdf_fns.HPDF_Destination_SetFitH)
#define HPDF_DictStream_New (*hpdf_fns.HPDF_DictStream_New)
#define HPDF_Dict_Add (*hpdf_fns.HPDF_Dict_Add)
#define HPDF_Dict_AddName (*hpdf_fns.HPDF_Dict_AddName)
#define HPDF_Dict_AddNumber (*hpdf_fns.HPDF_Dict_AddNumber)
#define HPDF_Dict_GetItem (*hpdf_fns.HPDF_Dict_GetItem)
#define HPDF_Dict_New (*hpdf_fns.HPDF_Dict_New)
#define HPDF_Dict_RemoveElement (*hpdf_fns.HPDF_Dict_RemoveElement)
#define HPDF_Font_TextWidth (*hpdf_fns.HPDF_Font_TextWidth)
#define HPDF_Free (*hpdf_fns.HPDF_Free)
#define HPDF_GetEncoder (*hpdf_fns.HPDF_GetEncoder)
#define HPDF_GetFont (*hpdf_fns.HPDF_GetFont)
#define HPDF_LinkAnnot_SetBorderStyle (*hpdf_fns.HPDF_LinkAnnot_SetBorderStyle)
#define HPDF_LinkAnnot_SetHighlightMode (*hpdf_fns.HPDF_LinkAnnot_SetHighlightMode)
#define HPDF_LoadTTFontFromFile (*hpdf_fns.HPDF_LoadTTFontFromFile)
#define HPDF_MemStream_FreeData (*hpdf_fns.HPDF_MemStream_FreeData)
#define HPDF_NameDict_GetNameTree (*hpdf_fns.HPDF_NameDict_GetNameTree)
#define HPDF_NameDict_New (*hpdf_fns.HPDF_NameDict_New)
#define HPDF_NameDict_SetNameTree (*hpdf_fns.HPDF_NameDict_SetNameTree)
#define HPDF_NameTree_Add (*hpdf_fns.HPDF_NameTree_Add)
#define HPDF_NameTree_New (*hpdf_fns.HPDF_NameTree_New)
#define HPDF_New (*hpdf_fns.HPDF_New)
#define HPDF_Outline_SetDestination (*hpdf_fns.HPDF_Outline_SetDestination)
#define HPDF_Outline_SetOpened (*hpdf_fns.HPDF_Outline_SetOpened)
#define HPDF_Page_BeginText (*hpdf_fns.HPDF_Page_BeginText)
#define HPDF_Page_Circle (*hpdf_fns.HPDF_Page_Circle)
#define HPDF_Page_Clip (*hpdf_fns.HPDF_Page_Clip)
#define HPDF_Page_ClosePath (*hpdf_fns.HPDF_Page_ClosePath)
#define HPDF_Page_ClosePathStroke (*hpdf_fns.HPDF_Page_ClosePathStroke)
#define HPDF_Page_CreateDestination (*hpdf_fns.HPDF_Page_CreateDestination)
#define HPDF_Page_CreateLinkAnnot (*hpdf_fns.HPDF_Page_CreateLinkAnnot)
#define HPDF_Page_CreateURILinkAnnot (*hpdf_fns.HPDF_Page_CreateURILinkAnnot)
#define HPDF_Page_CurveTo (*hpdf_fns.HPDF_Page_CurveTo)
#define HPDF_Page_EndPath (*hpdf_fns.HPDF_Page_EndPath)
#define HPDF_Page_EndText (*hpdf_fns.HPDF_Page_EndText)
#define HPDF_Page_Fill (*hpdf_fns.HPDF_Page_Fill)
#define HPDF_Page_FillStroke (*hpdf_fns.HPDF_Page_FillStroke)
#define HPDF_Page_GRestore (*hpdf_fns.HPDF_Page_GRestore)
#define HPDF_Page_GSave (*hpdf_fns.HPDF_Page_GSave)
#define HPDF_Page_LineTo (*hpdf_fns.HPDF_Page_LineTo)
#define HPDF_Page_MoveTo (*hpdf_fns.HPDF_Page_MoveTo)
#define HPDF_Page_Rectangle (*hpdf_fns.HPDF_Page_Rectangle)
#define HPDF_Page_SetDash (*hpdf_fns.HPDF_Page_SetDash)
#define HPDF_Page_SetFontAndSize (*hpdf_fns.HPDF_Page_SetFontAndSize)
#define HPDF_Page_SetLineCap (*hpdf_fns.HPDF_Page_SetLineCap)
#define HPDF_Page_SetLineJoin (*hpdf_fns.HPDF_Page_SetLineJoin)
#define HPDF_Page_SetLineWidth (*hpdf_fns.HPDF_Page_SetLineWidth)
#define HPDF_Page_SetRGBFill (*hpdf_fns.HPDF_Page_SetRGBFill)
#define HPDF_Page_SetRGBStroke (*hpdf_fns.HPDF_Page_SetRGBStroke)
#define HPDF_Page_SetSize (*hpdf_fns.HPDF_Page_SetSize)
#define HPDF_Page_SetTextMatrix (*hpdf_fns.HPDF_Page_SetTextMatrix)
#define HPDF_Page_ShowText (*hpdf_fns.HPDF_Page_ShowText)
#define HPDF_Page_Stroke (*hpdf_fns.HPDF_Page_Stroke)
#define HPDF_Page_TextOut (*hpdf_fns.HPDF_Page_TextOut)
#define HPDF_SaveToFile (*hpdf_fns.HPDF_SaveToFile)
#define HPDF_SetCompressionMode (*hpdf_fns.HPDF_SetCompressionMode)
#define HPDF_SetCurrentEncoder (*hpdf_fns.HPDF_SetCurrentEncoder)
#define HPDF_SetInfoAttr (*hpdf_fns.HPDF_SetInfoAttr)
#define HPDF_SetPageMode (*hpdf_fns.HPDF_SetPageMode)
#define HPDF_Stream_Write (*hpdf_fns.HPDF_Stream_Write)
#define HPDF_Stream_WriteStr (*hpdf_fns.HPDF_Stream_WriteStr)
#define HPDF_String_New (*hpdf_fns.HPDF_String_New)
#define HPDF_UseUTFEncodings (*hpdf_fns.HPDF_UseUTFEncodings)
#define HPDF_Xref_Add (*hpdf_fns.HPDF_Xref_Add)
#endif

#endif

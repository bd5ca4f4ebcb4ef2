/* glue.h — what the calc functions of the methods share (src/methods/glue.c).
 *
 * Each method's glue (water_lib.c, friction_lib.c, ratings_lib.c,
 * surge_lib.c, pumps_lib.c, ...) checks its arguments, calls the method's
 * numeric core, cites it (call_use_method) and words its errors and
 * warnings; these are the pieces of that wording more than one of them
 * uses. */
#ifndef HEADROOM_METHODS_GLUE_H
#define HEADROOM_METHODS_GLUE_H

#include "library.h"

/* A quantity as messages show it: 4 significant figures in the document's
 * unit system ("101.3 kPa", "68.00 degF"). */
const char *glue_show(CallCtx *cx, double si, Dim d, TempKind temp, char *buf, size_t n);
/* An absolute temperature in K, shown so. */
const char *glue_show_temp(CallCtx *cx, double K, char *buf, size_t n);
/* A pure number to 4 significant figures. */
const char *glue_show_num(double x, char *buf, size_t n);
/* An absolute temperature argument (a difference is refused). */
bool glue_arg_temperature(CallCtx *cx, const CallArgs *a, size_t i, double *T);
/* A number field of a record with the expected dimension; reports at the
 * argument that passed the record. */
bool glue_field_number(CallCtx *cx, const CallArgs *a, size_t i, const Record *r, const char *field, Dim want,
                       double *si);
/* A string field of a record, or NULL. */
const char *glue_field_string(const Record *r, const char *field);
/* An optional keyword number of a given dimension; *si keeps its default
 * when the keyword is absent. */
bool glue_kw_number(CallCtx *cx, const CallArgs *a, const char *name, Dim want, double *si, bool *given,
                    Pos *where);
/* A pressure value shown in psi or kPa. */
Value glue_pressure_value(double p);

#endif

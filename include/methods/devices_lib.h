/* devices_lib.h — devices and curves as calc values, for the path and
 * network stages.
 *
 * A calc makes a device with prv(), cv(), kv() or check_valve(): a record
 * of type "device" whose native data is a Device (methods/devices.h). A
 * ```curve block makes a record of type "curve" whose native data is a
 * CurveData; it is called as NAME(x). A pump record (pump_curve) carries
 * its PumpCurve. device_from_value accepts any of the three where a device
 * is expected, and device_step applies one with the methods, warnings and
 * wording every caller shares. Records live in the document's Arena. */
#ifndef HEADROOM_METHODS_DEVICES_LIB_H
#define HEADROOM_METHODS_DEVICES_LIB_H

#include "library.h"
#include "methods/curves.h"
#include "methods/devices.h"

/* A curve as the calc knows it: the table in SI, its name and the
 * dimensions of its two columns. */
typedef struct CurveData {
    const char *name;
    Curve curve;
    Dim x_dim, y_dim;
    TempKind x_temp, y_temp;
} CurveData;

/* The record a ```curve NAME block binds: fields x_min, x_max, points;
 * callable as NAME(x). `cd` must live as long as the record. */
Record *curve_record_new(Arena *arena, const CurveData *cd);
/* The CurveData of a curve record, or NULL. */
const CurveData *curve_of(const Value *v);
/* The method a curve's interpolation applies. */
const Method *curve_method(CurveInterp interp);

/* The largest flow Q >= 0 where pump curve c (head in m against m^3/s)
 * meets H = hs + k*Q^2, and how many crossings there are (0: none). */
int curve_pump_crossing(const Curve *c, double hs, double k, double *q);

/* operating_point(CURVE, H_static, k) for a tabulated pump curve: the
 * largest flow where curve(Q) = H_static + k*Q^2, a record Q H. */
bool curve_operating_point(CallCtx *cx, const CallArgs *a, const CurveData *cd, double hs, double k, Value *out);

/* A device record, curve record (flow against pressure drop or head) or
 * pump record as a Device; reports at `at` ("WHAT must be ...") and returns
 * false for anything else. */
bool device_from_value(CallCtx *cx, const Value *v, Pos at, const char *what, Device *d);

/* Apply device d at flow Q (m^3/s) with the static pressure p_in (Pa) before
 * it and density rho: *p_out after it. Names the method used, and warns at
 * `at` when a PRV is not regulating, a check valve is closed, or a curve or
 * pump curve is read outside its points. False (after an error at `at`)
 * when the result is not finite. */
bool device_step(CallCtx *cx, const Device *d, Pos at, double Q, double p_in, double rho, double *p_out,
                 DeviceStatus *status);

#endif

/* network_lib.c — the calc functions that only networks use: devices that
 * are link elements of a ```network block (DESIGN 2.12). */
#include "builtin_fns.h"

/* check_valve(): a link element that passes flow only from the link's
 * `from` node to its `to` node and closes against reverse flow. Its open
 * loss is given as a fitting ("swing check") or in the K column. */
bool fn_check_valve(CallCtx *cx, const CallArgs *a, Value *out)
{
    (void)a;
    Record *r = record_new(cx->arena, "check_valve", 1);
    record_set(r, 0, "device", value_string("check valve"));
    *out = (Value){.kind = VAL_RECORD, .rec = r};
    return true;
}

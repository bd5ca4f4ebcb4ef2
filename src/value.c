/* value.c — constructors for the values expressions evaluate to. */
#include "value.h"

#include <string.h>

Value value_hinted(Quantity q, const char *hint_us, const char *hint_si)
{
    Value v = value_number(q);
    v.hint[UNITS_US] = hint_us;
    v.hint[UNITS_SI] = hint_si;
    return v;
}

Value value_string(const char *s)
{
    Value v = {0};
    v.kind = VAL_STRING;
    v.str = s;
    return v;
}

const Value *record_get(const Record *r, const char *name)
{
    for (size_t i = 0; i < r->nfields; i++)
        if (strcmp(r->fields[i].name, name) == 0)
            return &r->fields[i].value;
    return NULL;
}

Record *record_new(Arena *arena, const char *type, size_t n)
{
    Record *r = arena_alloc(arena, sizeof *r);
    r->type = type;
    r->fields = arena_alloc(arena, (n ? n : 1) * sizeof *r->fields);
    r->nfields = n;
    return r;
}

void record_set(Record *r, size_t i, const char *name, Value v)
{
    if (i < r->nfields) {
        r->fields[i].name = name;
        r->fields[i].value = v;
    }
}

/* value.h — what an expression evaluates to.
 *
 * A Value is a number (a Quantity), a string or a record of named fields. It
 * is a small struct passed by value; strings and records point into the
 * document's Arena and are never freed on their own. A number may carry a
 * display hint (the unit a library prefers for it in each unit system, such
 * as "in" / "mm" for a pipe bore); `as` in the calc always wins over a hint. */
#ifndef HEADROOM_VALUE_H
#define HEADROOM_VALUE_H

#include "arena.h"
#include "units.h"

typedef enum ValueKind {
    VAL_NONE = 0,   /* not evaluated (an error upstream) */
    VAL_NUMBER,
    VAL_STRING,
    VAL_RECORD
} ValueKind;

typedef struct Record Record;

typedef struct Value {
    ValueKind kind;
    Quantity q;              /* VAL_NUMBER */
    const char *str;         /* VAL_STRING */
    Record *rec;             /* VAL_RECORD */
    const char *hint[2];     /* display unit per UnitSystem (UNITS_US, UNITS_SI), or NULL */
} Value;

/* A record: an ordered list of named fields. `type` names what made it
 * ("water", "pipe", "pump", ...). `native` carries data a library function
 * needs when the record is passed back to it (pump coefficients, say). A
 * record whose `call` is set can be called like a function: pump(Q). */
typedef struct RecordField {
    const char *name;
    Value value;
} RecordField;

struct CallCtx;
struct CallArgs;

struct Record {
    const char *type;
    RecordField *fields;
    size_t nfields;
    const void *native;
    bool (*call)(struct CallCtx *cx, const Record *self, const struct CallArgs *args, Value *out);
};

static inline Value value_number(Quantity q) { return (Value){.kind = VAL_NUMBER, .q = q}; }
Value value_hinted(Quantity q, const char *hint_us, const char *hint_si);
Value value_string(const char *s);
const Value *record_get(const Record *r, const char *name);
/* A record with room for n fields, filled with record_set in order. */
Record *record_new(struct Arena *arena, const char *type, size_t n);
void record_set(Record *r, size_t i, const char *name, Value v);

#endif

/* diff.h — what changed in meaning between two evaluated revisions.
 *
 * diff_compute() matches the statements of OLD and NEW by name (checks by
 * label), finds renames (a name gone and a name new with the same formula,
 * compared as trees with renamed names taken as equal), and compares values
 * in SI within a relative tolerance, so reordering lines or changing a
 * display unit is no change. It classifies everything a reviewer asks
 * about: front matter, inputs, results (with the changed inputs each one
 * depends on, through Stmt.deps), check verdicts and utilisations, added,
 * removed and renamed statements, citations and prose sections. It also
 * marks every statement and prose block of NEW as unchanged, changed or
 * added, for revision marks in a report. Nothing in diff.c prints; the two
 * renderers declared at the end (src/report/diff_text.c, diff_json.c) read a
 * Diff and never compute.
 *
 * A Diff borrows both Evaluated documents (which must outlive it) and owns
 * everything else in its own Arena; diff_free() releases it. */
#ifndef HEADROOM_DIFF_H
#define HEADROOM_DIFF_H

#include <stdbool.h>
#include <stddef.h>
#include <stdio.h>

#include "arena.h"
#include "eval.h"

typedef struct DiffOptions {
    double rel_tol;          /* relative tolerance on SI values (default 1e-9) */
    double abs_floor;        /* differences below this, in SI, are noise (default 1e-15) */
} DiffOptions;

DiffOptions diff_options_default(void);

/* Whether two numbers differ beyond the tolerance: |a - b| above both
 * rel_tol * max(|a|, |b|) and abs_floor. Two NaNs are equal. */
bool diff_numbers_differ(double a, double b, const DiffOptions *opt);

/* One front matter field. Display-only settings (units, paper, digits) are
 * listed but are not a change in meaning. Texts are "" when absent. */
typedef struct MetaChange {
    const char *key;
    const char *old_text, *new_text;
    bool display_only;
} MetaChange;

/* A value that changed: an input, a result, or a numeric field of a record
 * or path result ("w.rho", "riser.S_1.p_out"). Slots index the statements
 * of each side (-1: none). Units are the ones each side shows the value in. */
typedef struct ValueChange {
    const char *name;        /* as in NEW */
    const char *record;      /* a field of a nested record ("riser.S_1"), else NULL */
    const char *field;       /* then its field name ("p_out") */
    int old_slot, new_slot;
    Value old_value, new_value;
    Unit old_unit, new_unit;
    double rel;              /* (new - old)/|old|; NAN: not numbers, old zero, or dimension changed */
    bool dim_changed;        /* the dimension or the kind of value changed */
    bool formula_changed;    /* results: the formula differs, not only the value */
    const size_t *inputs;    /* results: indices into Diff.inputs it depends on */
    size_t ninputs;
} ValueChange;

typedef enum CheckChangeKind {
    CHECK_NOW_FAILS,         /* held in OLD, fails in NEW */
    CHECK_NOW_HOLDS,         /* failed in OLD, holds in NEW */
    CHECK_UTILISATION,       /* same verdict, utilisation changed */
    CHECK_CONDITION          /* same verdict and utilisation, the condition was rewritten */
} CheckChangeKind;

typedef struct CheckChange {
    CheckChangeKind kind;
    int old_slot, new_slot;
    double old_util, new_util;
    bool condition_changed;
} CheckChange;

typedef enum StmtChangeKind { STMT_ADDED, STMT_REMOVED, STMT_RENAMED } StmtChangeKind;

/* A named statement or a check (by label) added, removed or renamed. */
typedef struct StmtChange {
    StmtChangeKind kind;
    int old_slot, new_slot;  /* -1 on the side where it is absent */
} StmtChange;

typedef enum CiteChangeKind {
    CITE_SOURCE_CHANGED,     /* a key of the sources block has new text */
    CITE_SOURCE_ADDED,
    CITE_SOURCE_REMOVED,
    CITE_STMT_CITES          /* a statement or check cites other keys */
} CiteChangeKind;

typedef struct CiteChange {
    CiteChangeKind kind;
    int old_source, new_source;  /* indices into Document.sources, -1: none */
    int old_slot, new_slot;      /* CITE_STMT_CITES */
} CiteChange;

typedef enum ProseChangeKind { PROSE_CHANGED, PROSE_ADDED, PROSE_REMOVED } ProseChangeKind;

/* A section of prose (the blocks under one heading, and the calc notes in
 * it) that differs. Paragraphs are counted, not diffed line by line.
 * Sections match by heading text, then a reworded heading by its number. */
typedef struct ProseChange {
    ProseChangeKind kind;
    const char *number;      /* "2.1", "" before the first heading */
    const char *heading;     /* plain text; NULL before the first heading */
    const char *old_heading; /* PROSE_CHANGED: the heading as OLD had it, when reworded */
    int line;                /* in NEW (in OLD when removed) */
    size_t changed, added, removed;  /* paragraphs */
} ProseChange;

/* Revision marks for NEW. */
typedef enum DiffMark { MARK_SAME = 0, MARK_CHANGED, MARK_ADDED } DiffMark;

typedef struct BlockMark {
    const Block *block;
    DiffMark mark;
} BlockMark;

/* A used calc file whose bytes differ (or that only one side uses), matched
 * by its path relative to the using calc. `moved` lists the results (indices
 * into Diff.results) that read it, directly or through another used file. */
typedef enum UseChangeKind { USE_CHANGED, USE_ADDED, USE_REMOVED } UseChangeKind;

typedef struct UseChange {
    UseChangeKind kind;
    const char *name;        /* relative to the using calc: "basis.calc.md" */
    const char *old_digest, *new_digest;   /* NULL on the side that lacks it */
    size_t *moved;
    size_t nmoved;
} UseChange;

typedef struct Diff {
    Arena arena;
    const Evaluated *old_ev, *new_ev;
    DiffOptions opt;
    MetaChange *meta;       size_t nmeta;
    ValueChange *inputs;    size_t ninputs;    /* source order of NEW */
    ValueChange *results;   size_t nresults;   /* source order of NEW */
    CheckChange *checks;    size_t nchecks;    /* now fails, now holds, then the rest; source order */
    CheckChange *findings;  size_t nfindings;  /* `finding` lines whose answer or condition changed:
                                                  NOW_FAILS is yes -> no, NOW_HOLDS no -> yes */
    StmtChange *stmts;      size_t nstmts;     /* renamed, added (order of NEW), removed (order of OLD) */
    CiteChange *cites;      size_t ncites;
    ProseChange *prose;     size_t nprose;
    UseChange *uses;        size_t nuses;      /* used files whose digest changed, order of NEW */
    DiffMark *stmt_marks;   /* one per statement of NEW */
    BlockMark *block_marks; /* prose blocks of NEW (top level), sorted by address */
    size_t nblock_marks;
    int *old_to_new;        /* matched slots, -1 where none (renames included) */
    int *new_to_old;
    bool changed;           /* anything above that is not display-only */
} Diff;

/* One part of two package revisions, matched by its entry of `parts:`. */
typedef struct PartDiff {
    const char *file;        /* as listed in parts: */
    const Diff *diff;        /* NULL when the part is only on one side */
    bool added, removed;
} PartDiff;

/* Compare two evaluated documents that had no errors. */
Diff *diff_compute(const Evaluated *old_ev, const Evaluated *new_ev, const DiffOptions *opt);
void diff_free(Diff *d);

/* Revision marks: has statement `slot` (a prose block) of NEW changed in
 * meaning since OLD? Blocks not known to the diff are MARK_SAME. */
DiffMark diff_stmt_mark(const Diff *d, size_t slot);
DiffMark diff_block_mark(const Diff *d, const Block *b);

/* The diff as grouped plain text, and as JSON (shape in diff_json.c and the
 * README). False on a write error. */
bool render_diff_text(const Diff *d, FILE *out);
bool render_diff_json(const Diff *d, FILE *out);
/* `diff` of two package indexes: the index's own changes, then every part
 * under a line "== part.calc.md" (JSON: {old, new, changed, index, parts:
 * [{file, change, diff}]}, change one of same, changed, added, removed). */
bool render_package_diff_text(const Diff *index, const PartDiff *parts, size_t n, FILE *out);
bool render_package_diff_json(const Diff *index, const PartDiff *parts, size_t n, FILE *out);

#endif

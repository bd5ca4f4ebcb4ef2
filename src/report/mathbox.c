/* mathbox.c — equation layout: expression trees to measured boxes.
 *
 * Each constructor measures its box and places its children at once, so a
 * finished box is immutable and a renderer only walks it. The proportions
 * (script scale, gaps around fraction bars, radical and fence shapes) are
 * fractions of the font size, in the spirit of the usual rules of
 * mathematical typesetting but kept deliberately simple: one text style for
 * every level, scripts at 70 %, fractions at full size. Nothing here knows
 * the PDF library; text is measured through MathMetrics and drawn through
 * MathPainter. */
#include "mathbox.h"
#include "report_model.h"
#include "uses.h"

#include <math.h>
#include <stdio.h>
#include <string.h>

#include "numfmt.h"
#include "render.h"

static MathBox *box_new(const MathEnv *env, BoxKind kind, double size)
{
    MathBox *b = arena_alloc(env->arena, sizeof *b);
    b->kind = kind;
    b->size = size;
    return b;
}

static double rule_of(double size)
{
    double t = 0.055 * size;
    return t < 0.4 ? 0.4 : t;
}

MathBox *mbox_text(const MathEnv *env, FontRole font, double size, const char *utf8)
{
    MathBox *b = box_new(env, BOX_TEXT, size);
    b->text = arena_strdup(env->arena, utf8);
    b->font = font;
    b->w = env->m->width(env->m->ctx, font, size, utf8);
    b->h = env->m->ascent * size;
    b->d = env->m->descent * size;
    return b;
}

MathBox *mbox_space(const MathEnv *env, double width)
{
    MathBox *b = box_new(env, BOX_SPACE, 0);
    b->w = width;
    return b;
}

MathBox *mbox_hlist(const MathEnv *env, MathBox *const *kids, size_t n)
{
    MathBox *b = box_new(env, BOX_HLIST, n ? kids[0]->size : 0);
    b->kids = arena_alloc(env->arena, (n ? n : 1) * sizeof *b->kids);
    double x = 0;
    for (size_t i = 0; i < n; i++) {
        MathBox *k = kids[i];
        b->kids[i] = k;
        k->x = x;
        k->y = 0;
        x += k->w;
        if (k->h > b->h)
            b->h = k->h;
        if (k->d > b->d)
            b->d = k->d;
    }
    b->nkids = n;
    b->w = x;
    return b;
}

/* The bar sits on the math axis; numerator and denominator clear it by a
 * gap and are centred over the wider of the two. */
MathBox *mbox_frac(const MathEnv *env, MathBox *num, MathBox *den, double size)
{
    MathBox *b = box_new(env, BOX_FRAC, size);
    double t = rule_of(size), gap = 0.14 * size, pad = 0.12 * size;
    double axis = env->m->axis * size;
    double inner = num->w > den->w ? num->w : den->w;
    b->w = inner + 2 * pad;
    b->rule = t;
    num->x = pad + (inner - num->w) / 2;
    num->y = axis + t / 2 + gap + num->d;
    den->x = pad + (inner - den->w) / 2;
    den->y = axis - t / 2 - gap - den->h;
    b->h = num->y + num->h;
    b->d = -den->y + den->d;
    b->a = num;
    b->b = den;
    return b;
}

/* Superscripts ride higher over tall bases (a fenced fraction squared);
 * subscripts hang below the base's depth. */
MathBox *mbox_script(const MathEnv *env, MathBox *base, MathBox *sup, MathBox *sub, double size)
{
    MathBox *b = box_new(env, BOX_SCRIPT, size);
    double kern = 0.04 * size, sw = 0;
    base->x = 0;
    base->y = 0;
    b->h = base->h;
    b->d = base->d;
    if (sup) {
        double up = base->h - 0.55 * sup->h;
        if (up < 0.40 * size)
            up = 0.40 * size;
        sup->x = base->w + kern;
        sup->y = up;
        if (up + sup->h > b->h)
            b->h = up + sup->h;
        sw = sup->w;
    }
    if (sub) {
        double down = base->d - 0.3 * sub->h;
        if (down < 0.20 * size)
            down = 0.20 * size;
        sub->x = base->w + (base->kind == BOX_TEXT ? 0.01 * size : kern);
        sub->y = -down;
        if (down + sub->d > b->d)
            b->d = down + sub->d;
        if (sub->w > sw)
            sw = sub->w;
    }
    b->w = base->w + kern + sw;
    b->a = base;
    b->b = sup;
    b->c = sub;
    return b;
}

/* The radical: a short rising tick, a heavy down stroke to the bottom, a
 * long rising stroke to the vinculum, which spans the radicand. */
MathBox *mbox_root(const MathEnv *env, MathBox *inner, double size)
{
    MathBox *b = box_new(env, BOX_ROOT, size);
    double t = rule_of(size), gap = 0.12 * size;
    double sign = 0.5 * size + 0.08 * (inner->h + inner->d);
    inner->x = sign + 0.06 * size;
    inner->y = 0;
    b->rule = t;
    b->h = inner->h + gap + t + 0.04 * size;
    b->d = inner->d + 0.06 * size;
    b->w = inner->x + inner->w + 0.08 * size;
    b->a = inner;
    return b;
}

/* Glyph parentheses while the content is no taller than a line of text;
 * drawn strokes that grow with it beyond that. */
MathBox *mbox_fence(const MathEnv *env, MathBox *inner, double size, const char *open,
                    const char *close)
{
    MathBox *b = box_new(env, BOX_FENCE, size);
    double line = (env->m->ascent + env->m->descent) * size;
    double ht = inner->h + inner->d;
    b->open = open;
    b->close = close;
    b->a = inner;
    if (ht <= line * 1.3) {
        MathBox *o = mbox_text(env, FONT_SERIF, size, open);
        MathBox *c = mbox_text(env, FONT_SERIF, size, close);
        b->kids = arena_alloc(env->arena, 2 * sizeof *b->kids);
        b->kids[0] = o;
        b->kids[1] = c;
        b->nkids = 2;
        o->x = 0;
        inner->x = o->w;
        c->x = o->w + inner->w;
        b->w = c->x + c->w;
        b->h = inner->h > o->h ? inner->h : o->h;
        b->d = inner->d > o->d ? inner->d : o->d;
        return b;
    }
    double pw = 0.22 * size + 0.04 * ht;
    if (pw > 0.55 * size)
        pw = 0.55 * size;
    b->drawn_fence = true;
    b->rule = 0.07 * size;
    inner->x = pw;
    inner->y = 0;
    b->w = 2 * pw + inner->w;
    b->h = inner->h + 0.08 * size;
    b->d = inner->d + 0.08 * size;
    return b;
}

/* ---- drawing ------------------------------------------------------------ */

static void draw_fence_side(const MathBox *b, const MathPainter *p, double x, double y, bool left)
{
    const char *g = left ? b->open : b->close;
    double pw = b->a->x, top = y + b->h - 0.02 * b->size, bot = y - b->d + 0.02 * b->size;
    double x0 = left ? x : x + b->w - pw;
    if (g[0] == '|') {
        double xm = x0 + pw / 2;
        p->line(p->ctx, xm, bot, xm, top, b->rule * 0.8);
        return;
    }
    /* a bow from top to bottom, bulging away from the content */
    double xo = left ? x0 + pw * 0.8 : x0 + pw * 0.2;   /* ends */
    double xi = left ? x0 + pw * 0.05 : x0 + pw * 0.95; /* belly */
    double k = (top - bot) * 0.25;
    p->curve(p->ctx, xo, top, xi, top - k, xi, bot + k, xo, bot, b->rule);
}

void mbox_draw(const MathBox *b, const MathPainter *p, double x, double y)
{
    switch (b->kind) {
    case BOX_TEXT:
        if (b->text[0])
            p->text(p->ctx, b->font, b->size, x, y, b->text);
        break;
    case BOX_SPACE:
        break;
    case BOX_HLIST:
        for (size_t i = 0; i < b->nkids; i++)
            mbox_draw(b->kids[i], p, x + b->kids[i]->x, y + b->kids[i]->y);
        break;
    case BOX_FRAC: {
        double axis = b->a->y - b->a->d - 0.14 * b->size - b->rule / 2;
        p->line(p->ctx, x + 0.04 * b->size, y + axis, x + b->w - 0.04 * b->size, y + axis, b->rule);
        mbox_draw(b->a, p, x + b->a->x, y + b->a->y);
        mbox_draw(b->b, p, x + b->b->x, y + b->b->y);
        break;
    }
    case BOX_SCRIPT:
        mbox_draw(b->a, p, x + b->a->x, y + b->a->y);
        if (b->b)
            mbox_draw(b->b, p, x + b->b->x, y + b->b->y);
        if (b->c)
            mbox_draw(b->c, p, x + b->c->x, y + b->c->y);
        break;
    case BOX_ROOT: {
        double s = b->size, t = b->rule;
        double top = y + b->h - 0.04 * s - t / 2, bot = y - b->d + 0.03 * s;
        double sign = b->a->x - 0.06 * s;
        double x1 = x + 0.10 * s, y1 = y + 0.34 * s;
        double x2 = x + sign * 0.45, x3 = x + sign;
        p->line(p->ctx, x, y + 0.26 * s, x1, y1, t);
        p->line(p->ctx, x1, y1, x2, bot, t * 1.9);
        p->line(p->ctx, x2, bot, x3, top, t);
        p->line(p->ctx, x3, top, x + b->w, top, t);
        mbox_draw(b->a, p, x + b->a->x, y + b->a->y);
        break;
    }
    case BOX_FENCE:
        if (b->drawn_fence) {
            draw_fence_side(b, p, x, y, true);
            draw_fence_side(b, p, x, y, false);
        } else {
            mbox_draw(b->kids[0], p, x + b->kids[0]->x, y);
            mbox_draw(b->kids[1], p, x + b->kids[1]->x, y);
        }
        mbox_draw(b->a, p, x + b->a->x, y + b->a->y);
        break;
    }
}

/* ---- units and numbers as print ----------------------------------------- */

static void put(char *buf, size_t n, size_t *at, const char *s)
{
    size_t l = strlen(s);
    if (*at + l + 1 > n)
        return;
    memcpy(buf + *at, s, l);
    *at += l;
    buf[*at] = '\0';
}

/* Spellings of single unit names for print; everything else is kept. */
static const struct {
    const char *name, *print;
} UNIT_PRINT[] = {
    {"degF", "°F"},          {"degC", "°C"},          {"degR", "°R"},  {"deg", "°"},
    {"delta_degF", "Δ°F"},   {"delta_degC", "Δ°C"},   {"percent", "%"}, {"ftH2O", "ftH₂O"},
    {"inH2O", "inH₂O"},      {"mH2O", "mH₂O"},        {"ohm", "Ω"},
};

void mbox_unit_text(const char *unit, char *buf, size_t n)
{
    size_t at = 0;
    if (!n)
        return;
    buf[0] = '\0';
    if (!unit || strcmp(unit, "1") == 0)
        return;
    const char *s = unit;
    while (*s) {
        if (*s == '*') {
            put(buf, n, &at, "·");
            s++;
        } else if (*s == '^') {
            const char *e = s + 1;
            const char *q = e;
            if (*q == '-' || *q == '+')
                q++;
            while (*q >= '0' && *q <= '9')
                q++;
            if (*q == '.' || q == e) { /* a fractional power stays as written */
                char tmp[2] = {*s, 0};
                put(buf, n, &at, tmp);
                s++;
                continue;
            }
            char sup[64];
            num_superscript(e, (size_t)(q - e), sup, sizeof sup);
            put(buf, n, &at, sup);
            s = q;
        } else if ((*s >= 'a' && *s <= 'z') || (*s >= 'A' && *s <= 'Z') || *s == '_') {
            const char *q = s;
            while ((*q >= 'a' && *q <= 'z') || (*q >= 'A' && *q <= 'Z') || *q == '_' ||
                   (*q >= '0' && *q <= '9' && q > s && (q[-1] == 'H')))
                q++;
            size_t l = (size_t)(q - s);
            const char *print = NULL;
            for (size_t i = 0; i < sizeof UNIT_PRINT / sizeof UNIT_PRINT[0]; i++)
                if (strlen(UNIT_PRINT[i].name) == l && strncmp(UNIT_PRINT[i].name, s, l) == 0)
                    print = UNIT_PRINT[i].print;
            if (print) {
                put(buf, n, &at, print);
            } else {
                char tmp[64];
                if (l >= sizeof tmp)
                    l = sizeof tmp - 1;
                memcpy(tmp, s, l);
                tmp[l] = '\0';
                put(buf, n, &at, tmp);
            }
            s = q;
        } else {
            /* copy one UTF-8 character */
            size_t l = 1;
            while (s[l] && ((unsigned char)s[l] & 0xC0) == 0x80)
                l++;
            char tmp[8] = {0};
            memcpy(tmp, s, l < 7 ? l : 7);
            put(buf, n, &at, tmp);
            s += l;
        }
    }
}

/* "-1.5" -> "−1.5" (a true minus sign). */
static void minus_sign(const char *in, char *out, size_t n)
{
    size_t at = 0;
    out[0] = '\0';
    for (const char *s = in; *s; s++) {
        if (*s == '-') {
            put(out, n, &at, "−");
        } else {
            char tmp[2] = {*s, 0};
            put(out, n, &at, tmp);
        }
    }
}

/* mantissa and a power of ten as "m × 10^e", or the mantissa alone */
static MathBox *sci_box(const MathEnv *env, const char *mantissa, int exp10, double size,
                        FontRole font)
{
    char m[64], e[32], eu[48];
    minus_sign(mantissa, m, sizeof m);
    if (exp10 == 0)
        return mbox_text(env, font, size, m);
    char head[96];
    snprintf(head, sizeof head, "%s×10", m);
    snprintf(e, sizeof e, "%d", exp10);
    minus_sign(e, eu, sizeof eu);
    MathBox *base = mbox_text(env, font, size, head);
    MathBox *sup = mbox_text(env, font, size * MATH_SCRIPT_SCALE, eu);
    return mbox_script(env, base, sup, NULL, size);
}

MathBox *mbox_number(const MathEnv *env, double x, double size, FontRole font)
{
    if (!isfinite(x))
        return mbox_text(env, font, size, isnan(x) ? "NaN" : x > 0 ? "∞" : "−∞");
    NumParts p = num_parts(x, env->digits > 0 ? env->digits : 4);
    return sci_box(env, p.mantissa, p.exp10, size, font);
}

/* A literal as the author wrote it: "2.34e-5" becomes 2.34×10⁻⁵. */
static MathBox *literal_box(const MathEnv *env, const char *text, double size)
{
    const char *e = strpbrk(text, "eE");
    if (!e)
        return sci_box(env, text, 0, size, FONT_SERIF);
    char m[40];
    size_t l = (size_t)(e - text);
    if (l >= sizeof m)
        l = sizeof m - 1;
    memcpy(m, text, l);
    m[l] = '\0';
    int ex = 0;
    sscanf(e + 1, "%d", &ex);
    if (strcmp(m, "1") == 0 && ex != 0) {
        char eb[32], eu[48];
        snprintf(eb, sizeof eb, "%d", ex);
        minus_sign(eb, eu, sizeof eu);
        return mbox_script(env, mbox_text(env, FONT_SERIF, size, "10"),
                           mbox_text(env, FONT_SERIF, size * MATH_SCRIPT_SCALE, eu), NULL, size);
    }
    return sci_box(env, m, ex, size, FONT_SERIF);
}

static MathBox *hl2(const MathEnv *env, MathBox *a, MathBox *b)
{
    MathBox *k[2] = {a, b};
    return mbox_hlist(env, k, 2);
}

static MathBox *hl3(const MathEnv *env, MathBox *a, MathBox *b, MathBox *c)
{
    MathBox *k[3] = {a, b, c};
    return mbox_hlist(env, k, 3);
}

static MathBox *with_unit(const MathEnv *env, MathBox *num, const char *unit_text, double size,
                          bool bold)
{
    char u[96];
    mbox_unit_text(unit_text, u, sizeof u);
    if (!u[0])
        return num;
    return hl3(env, num, mbox_space(env, 0.22 * size),
               mbox_text(env, bold ? FONT_SERIF_BOLD : FONT_SERIF, size, u));
}

MathBox *mbox_quantity(const MathEnv *env, const Value *v, const Unit *unit, double size, bool bold)
{
    FontRole f = bold ? FONT_SERIF_BOLD : FONT_SERIF;
    switch (v->kind) {
    case VAL_NUMBER: {
        bool diff = v->q.temp == TEMP_NONE;
        double x = unit ? unit_from_si(v->q.si, unit, diff) : v->q.si;
        return with_unit(env, mbox_number(env, x, size, f), unit ? unit->text : NULL, size, bold);
    }
    case VAL_STRING: {
        char *s = arena_printf(env->arena, "“%s”", v->str ? v->str : "");
        return mbox_text(env, f, size, s);
    }
    case VAL_RECORD:
        return mbox_text(env, FONT_SERIF_ITALIC, size,
                         arena_printf(env->arena, "(%s)", v->rec && v->rec->type ? v->rec->type
                                                                                 : "record"));
    case VAL_NONE:
    default:
        return mbox_text(env, f, size, "—");
    }
}

/* ---- symbols ------------------------------------------------------------- */

static bool one_char(const char *s)
{
    if (!s[0])
        return false;
    size_t l = 1;
    while (s[l] && ((unsigned char)s[l] & 0xC0) == 0x80)
        l++;
    return s[l] == '\0';
}

MathBox *mbox_symbol(const MathEnv *env, const char *name, double size)
{
    Symbol sy = symbol_of(name);
    MathBox *base;
    /* capital Delta as the difference operator stays upright */
    if (strncmp(sy.base, "Δ", strlen("Δ")) == 0 && sy.base[strlen("Δ")]) {
        base = hl2(env, mbox_text(env, FONT_SERIF, size, "Δ"),
                   mbox_text(env, FONT_SERIF_ITALIC, size, sy.base + strlen("Δ")));
    } else {
        base = mbox_text(env, FONT_SERIF_ITALIC, size, sy.base);
    }
    if (!sy.sub[0])
        return base;
    FontRole f = one_char(sy.sub) ? FONT_SERIF_ITALIC : FONT_SERIF;
    return mbox_script(env, base, NULL, mbox_text(env, f, size * MATH_SCRIPT_SCALE, sy.sub), size);
}

/* ---- expressions ---------------------------------------------------------- */

static const Expr *strip(const Expr *e)
{
    while (e && e->kind == EXPR_PAREN && e->lhs)
        e = e->lhs;
    return e;
}

static MathBox *op_box(const MathEnv *env, const char *op, double size, double pad)
{
    return hl3(env, mbox_space(env, pad * size), mbox_text(env, FONT_SERIF, size, op),
               mbox_space(env, pad * size));
}

static MathBox *paren(const MathEnv *env, MathBox *inner, double size)
{
    return mbox_fence(env, inner, size, "(", ")");
}

/* The value a name or field stands for, and the unit to show it in. */
static const Value *subst_value(const MathEnv *env, const Expr *e, Unit *unit)
{
    if (!env->ev || (e->kind != EXPR_NAME && e->kind != EXPR_FIELD))
        return NULL;
    if (env->use && e->kind == EXPR_NAME && e->slot == SLOT_UNRESOLVED) {
        /* a method's formula: its symbols are the values the call used */
        for (size_t i = 0; i < env->use->ninputs; i++)
            if (strcmp(env->use->inputs[i].name, e->text) == 0) {
                *unit = eval_display_unit(env->ev, &env->use->inputs[i].value, NULL);
                return &env->use->inputs[i].value;
            }
        return NULL;
    }
    return eval_named_value_at(env->ev, env->row, e, unit); /* x, basis.p_city, basis.w.rho */
}

typedef enum Ctx { CTX_TOP, CTX_ADD_RIGHT, CTX_FACTOR, CTX_POW_BASE } Ctx;

static MathBox *expr_box(const MathEnv *env, const Expr *e, double size, bool sub, Ctx ctx);

static const char *FUNC_PRINT[][2] = {
    {"log10", "log"}, {"ln", "ln"}, {"exp", "exp"}, {"sin", "sin"}, {"cos", "cos"},
    {"tan", "tan"},   {"atan", "arctan"}, {"min", "min"}, {"max", "max"},
};

static MathBox *call_box(const MathEnv *env, const Expr *e, double size, bool sub)
{
    const char *name = e->text ? e->text : "?";
    if (strcmp(name, "sqrt") == 0 && e->call->nargs == 1)
        return mbox_root(env, expr_box(env, strip(e->call->args[0]), size, sub, CTX_TOP), size);
    if (strcmp(name, "abs") == 0 && e->call->nargs == 1) {
        MathBox *in = expr_box(env, strip(e->call->args[0]), size, sub, CTX_TOP);
        return mbox_fence(env, in, size, "|", "|");
    }
    MathBox *head;
    if (e->call->callee_slot >= 0) {
        head = mbox_symbol(env, name, size);
    } else {
        const char *print = NULL;
        for (size_t i = 0; i < sizeof FUNC_PRINT / sizeof FUNC_PRINT[0]; i++)
            if (strcmp(FUNC_PRINT[i][0], name) == 0)
                print = FUNC_PRINT[i][1];
        if (print && strcmp(name, "log10") == 0)
            head = mbox_script(env, mbox_text(env, FONT_SERIF, size, "log"), NULL,
                               mbox_text(env, FONT_SERIF, size * MATH_SCRIPT_SCALE, "10"), size);
        else
            head = mbox_text(env, FONT_SERIF, size, print ? print : name);
    }
    size_t n = e->call->nargs + e->call->nkw;
    MathBox **k = arena_alloc(env->arena, (2 * n + 1) * sizeof *k);
    size_t m = 0;
    for (size_t i = 0; i < e->call->nargs; i++) {
        if (m)
            k[m++] = mbox_text(env, FONT_SERIF, size, ", ");
        k[m++] = expr_box(env, e->call->args[i], size, sub, CTX_TOP);
    }
    for (size_t i = 0; i < e->call->nkw; i++) {
        if (m)
            k[m++] = mbox_text(env, FONT_SERIF, size, ", ");
        k[m++] = hl3(env, mbox_text(env, FONT_SERIF, size, e->call->kw_names[i]),
                     mbox_text(env, FONT_SERIF, size, " = "),
                     expr_box(env, e->call->kw[i], size, sub, CTX_TOP));
    }
    MathBox *args = m ? mbox_hlist(env, k, m) : mbox_space(env, 0.1 * size);
    return hl3(env, head, mbox_space(env, 0.05 * size), paren(env, args, size));
}

static MathBox *value_box(const MathEnv *env, const Value *v, const Unit *u, double size, Ctx ctx)
{
    MathBox *b = mbox_quantity(env, v, u, size, false);
    if (v->kind != VAL_NUMBER)
        return b;
    char ut[96];
    mbox_unit_text(u->text, ut, sizeof ut);
    bool neg = unit_from_si(v->q.si, u, v->q.temp == TEMP_NONE) < 0;
    bool has_unit = ut[0] != '\0';
    if ((neg && ctx != CTX_TOP) || (has_unit && ctx == CTX_POW_BASE))
        return paren(env, b, size);
    return b;
}

static MathBox *expr_box(const MathEnv *env, const Expr *e, double size, bool sub, Ctx ctx)
{
    if (!e)
        return mbox_text(env, FONT_SERIF, size, "?");
    switch (e->kind) {
    case EXPR_NUMBER: {
        /* the literal as written: the number, then the unit as spelled */
        const char *t = e->text ? e->text : "0";
        double ignored;
        size_t nlen = num_parse(t, strlen(t), &ignored);
        if (nlen == 0)
            nlen = strlen(t);
        MathBox *b = literal_box(env, arena_strndup(env->arena, t, nlen), size);
        if (e->has_unit) {
            const char *u = t + nlen;
            while (*u == ' ')
                u++;
            b = with_unit(env, b, *u ? u : e->unit->text, size, false);
            if (ctx == CTX_POW_BASE)
                b = paren(env, b, size);
        }
        return b;
    }
    case EXPR_STRING:
        return mbox_text(env, FONT_SERIF, size, arena_printf(env->arena, "“%s”", e->text));
    case EXPR_NAME:
        if (e->slot == SLOT_PI)
            return mbox_text(env, FONT_SERIF, size, "π");
        if (sub && env->ev && (e->slot == SLOT_G || (env->use && e->slot == SLOT_UNRESOLVED &&
                                                   strcmp(e->text, "g") == 0))) {
            Value g;
            eval_constant(SLOT_G, &g);
            Unit u = eval_display_unit(env->ev, &g, NULL);
            return value_box(env, &g, &u, size, ctx);
        }
        if (sub) {
            Unit u;
            const Value *v = subst_value(env, e, &u);
            if (v && v->kind != VAL_RECORD)
                return value_box(env, v, &u, size, ctx);
        }
        return mbox_symbol(env, e->text ? e->text : "?", size);
    case EXPR_FIELD: {
        if (sub) {
            Unit u;
            const Value *v = subst_value(env, e, &u);
            if (v && v->kind != VAL_RECORD)
                return value_box(env, v, &u, size, ctx);
        }
        MathBox *base = expr_box(env, e->lhs, size, false, CTX_FACTOR);
        return hl3(env, base, mbox_text(env, FONT_SERIF_ITALIC, size, "."),
                   mbox_symbol(env, e->text ? e->text : "?", size));
    }
    case EXPR_NEG: {
        MathBox *b = hl2(env, mbox_text(env, FONT_SERIF, size, "−"),
                         expr_box(env, e->lhs, size, sub, CTX_FACTOR));
        return ctx == CTX_TOP ? b : paren(env, b, size);
    }
    case EXPR_PAREN:
        return paren(env, expr_box(env, e->lhs, size, sub, CTX_TOP), size);
    case EXPR_CALL:
        return call_box(env, e, size, sub);
    case EXPR_BINARY:
        switch (e->op) {
        case OP_ADD:
        case OP_SUB: {
            Ctx left = ctx == CTX_TOP ? CTX_TOP : CTX_ADD_RIGHT;
            MathBox *l = expr_box(env, e->lhs, size, sub, left);
            MathBox *r = expr_box(env, e->rhs, size, sub, CTX_ADD_RIGHT);
            return hl3(env, l, op_box(env, e->op == OP_ADD ? "+" : "−", size, 0.2), r);
        }
        case OP_MUL: {
            /* the leading factor of a product needs no parentheses for its sign */
            MathBox *l = expr_box(env, e->lhs, size, sub, ctx == CTX_TOP ? CTX_TOP : CTX_FACTOR);
            MathBox *r = expr_box(env, e->rhs, size, sub, CTX_FACTOR);
            bool cross = sub && !e->middle_dot;
            return hl3(env, l, op_box(env, cross ? "×" : "·", size, cross ? 0.15 : 0.08), r);
        }
        case OP_DIV: {
            MathBox *n = expr_box(env, strip(e->lhs), size, sub, CTX_TOP);
            MathBox *d = expr_box(env, strip(e->rhs), size, sub, CTX_TOP);
            return mbox_frac(env, n, d, size);
        }
        case OP_POW: {
            const Expr *be = e->lhs;
            MathBox *base;
            if (be && be->kind == EXPR_PAREN)
                base = paren(env, expr_box(env, be->lhs, size, sub, CTX_TOP), size);
            else
                base = expr_box(env, be, size, sub, CTX_POW_BASE);
            MathBox *sup = expr_box(env, strip(e->rhs), size * MATH_SCRIPT_SCALE, sub, CTX_TOP);
            /* x_1 squared: one script box with both indices */
            if (base->kind == BOX_SCRIPT && !base->b && base->c)
                return mbox_script(env, base->a, sup, base->c, size);
            return mbox_script(env, base, sup, NULL, size);
        }
        }
        break;
    }
    return mbox_text(env, FONT_SERIF, size, "?");
}

MathBox *mbox_expr(const MathEnv *env, const Expr *e, double size, bool substitute)
{
    return expr_box(env, e, size, substitute, CTX_TOP);
}

/* ---- rows ----------------------------------------------------------------- */

static void row_add(MathRow *row, MathBox *b, bool start)
{
    if (row->n >= MATHROW_MAX)
        return;
    row->piece[row->n] = b;
    row->chain_start[row->n] = start;
    row->n++;
}

static MathBox *rel(const MathEnv *env, const char *r, MathBox *b, double size)
{
    return hl2(env, op_box(env, r, size, 0.28), b);
}

/* "= a + b − c" as pieces "= a", "+ b", "− c", so a long sum breaks
 * before a term rather than running past the line (or being set small):
 * the top level of a sum only, in its own left-to-right order. */
static void sum_pieces(const MathEnv *env, MathRow *row, const char *relation, const Expr *e,
                       double size, bool sub)
{
    const Expr *terms[MATHROW_MAX];
    const char *ops[MATHROW_MAX];
    size_t n = 0;
    const Expr *x = e;
    /* a + b - c is ((a + b) - c): walk down the left spine */
    while (x && x->kind == EXPR_BINARY && (x->op == OP_ADD || x->op == OP_SUB) && n + 2 < MATHROW_MAX / 2) {
        terms[n] = x->rhs;
        ops[n] = x->op == OP_ADD ? "+" : "−";
        n++;
        x = x->lhs;
    }
    if (n == 0 || row->n + n + 1 > MATHROW_MAX) {
        row_add(row, rel(env, relation, mbox_expr(env, e, size, sub), size), false);
        return;
    }
    row_add(row, rel(env, relation, expr_box(env, x, size, sub, CTX_TOP), size), false);
    for (size_t i = n; i-- > 0;)
        row_add(row, hl2(env, op_box(env, ops[i], size, 0.2), expr_box(env, terms[i], size, sub, CTX_ADD_RIGHT)),
                false);
}

static void record_fields(const MathEnv *env, const Value *v, double size, MathRow *row)
{
    const Record *r = v->rec;
    for (size_t i = 0; r && i < r->nfields; i++) {
        const Value *fv = &r->fields[i].value;
        Unit u = eval_display_unit(env->ev, fv, NULL);
        MathBox *val = fv->kind == VAL_RECORD ? mbox_text(env, FONT_SERIF_ITALIC, size, "(record)")
                                              : mbox_quantity(env, fv, &u, size, true);
        MathBox *k[4] = {mbox_symbol(env, r->fields[i].name, size),
                         op_box(env, "=", size, 0.2), val,
                         mbox_text(env, FONT_SERIF, size, i + 1 < r->nfields ? ",  " : "")};
        row_add(row, mbox_hlist(env, k, 4), i == 0);
    }
}

void mbox_stmt_row(const MathEnv *env, const Stmt *st, const ModelRow *mr, double size, MathRow *row)
{
    row->n = 0;
    if (st->parse_failed || st->kind == STMT_NOTE)
        return;
    const StmtResult *r = env->ev ? &env->ev->results[st->index] : NULL;
    bool ok = r && r->state == RES_OK;
    switch (st->kind) {
    case STMT_DEF: {
        MathBox *sym = mbox_symbol(env, st->name, size);
        row_add(row, sym, true);
        sum_pieces(env, row, "=", st->expr, size, false);
        if (!ok) {
            row_add(row, rel(env, "=", mbox_text(env, FONT_SERIF_BOLD, size, "not evaluated"), size),
                    false);
            return;
        }
        const UsedFile *used = r->value.kind == VAL_RECORD ? use_of_record(r->value.rec) : NULL;
        if (used) {
            char *t = arena_printf(env->arena, "the values of %s (SHA-256 %.12s)",
                                   doc_stmt_use(st) ? doc_stmt_use(st) : used->file,
                                   used->doc->digest);
            row_add(row, rel(env, "=", mbox_text(env, FONT_SERIF_ITALIC, size, t), size), false);
            return;
        }
        if (r->value.kind == VAL_RECORD) {
            if (mr->show_substituted)
                row_add(row, rel(env, "=", mbox_expr(env, st->expr, size, true), size), false);
            record_fields(env, &r->value, size, row);
            return;
        }
        /* the model says which lines the row has: the substituted form
         * unless it only repeats the formula, the result unless an input
         * shown as written is its own result */
        if (mr->show_substituted)
            sum_pieces(env, row, "=", st->expr, size, true);
        if (mr->show_result)
            row_add(row, rel(env, "=", mbox_quantity(env, &r->value, r->shown, size, true), size),
                    false);
        break;
    }
    case STMT_SOLVE: {
        row_add(row, mbox_expr(env, st->lhs, size, false), true);
        row_add(row, rel(env, "=", mbox_expr(env, st->rhs, size, false), size), false);
        if (!ok)
            return;
        /* substituted at the root (unless both sides are a name or a
         * literal, which the line of values shows), then both sides' values */
        MathEnv at = *env;
        at.row = r;
        if (mr->show_substituted) {
            row_add(row, mbox_expr(&at, st->lhs, size, true), true);
            row_add(row, rel(env, "=", mbox_expr(&at, st->rhs, size, true), size), false);
        }
        row_add(row, mbox_quantity(env, &r->sides->lhs, &r->sides->lhs_shown, size, true), true);
        row_add(row, rel(env, "=", mbox_quantity(env, &r->sides->rhs, &r->sides->lhs_shown, size, true), size),
                false);
        row_add(row, mbox_symbol(env, st->name, size), true);
        row_add(row, rel(env, "=", mbox_quantity(env, &r->value, r->shown, size, true), size),
                false);
        break;
    }
    case STMT_CHECK: {
        const char *op = cmp_op_text(st->cmp, true);
        row_add(row, mbox_expr(env, st->lhs, size, false), true);
        row_add(row, rel(env, op, mbox_expr(env, st->rhs, size, false), size), false);
        if (!ok)
            return;
        /* a name or a literal substitutes to its value: no middle line needed */
        if (mr->show_substituted) {
            row_add(row, mbox_expr(env, st->lhs, size, true), true);
            row_add(row, rel(env, op, mbox_expr(env, st->rhs, size, true), size), false);
        }
        row_add(row, mbox_quantity(env, &r->sides->lhs, &r->sides->lhs_shown, size, true), true);
        row_add(row, rel(env, op, mbox_quantity(env, &r->sides->rhs, &r->sides->rhs_shown, size, true), size),
                false);
        break;
    }
    case STMT_NOTE:
    case STMT_PATH:   /* a path's segment table is typeset by the renderer, not as a row */
    case STMT_NETWORK:
    case STMT_CURVE:  /* so is a curve's table */
    case STMT_FIGURE:
        break;
    }
}

size_t mbox_break(const double *w, const bool *newline, size_t n, double avail, double indent,
                  size_t *line_of)
{
    size_t line = 0;
    double x = 0;
    for (size_t i = 0; i < n; i++) {
        bool fresh = i == 0;
        if (!fresh && newline && newline[i]) {
            line++;
            x = 0; /* a new chain starts at the margin */
        } else if (!fresh && x + w[i] > avail + 1e-9) {
            line++;
            x = indent;
        }
        line_of[i] = line;
        x += w[i];
    }
    return n ? line + 1 : 0;
}

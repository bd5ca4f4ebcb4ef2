/* symbol.c — how names are shown: Greek letters and subscripts.
 *
 * A leading Greek word becomes its letter (rho -> ρ, Delta -> Δ) and the
 * part after the first '_' becomes a subscript; further '_' in a subscript
 * read as commas (h_f_total -> h with subscript "f,total"). Delta is the
 * difference operator, so it binds to the next part instead: Delta_z -> Δz,
 * Delta_p_f -> Δp with subscript f. Every renderer shows names this way. */
#include <stdio.h>
#include <string.h>

#include "render.h"

static const struct {
    const char *word;
    const char *letter;
} greek[] = {
    {"alpha", "α"}, {"beta", "β"}, {"gamma", "γ"}, {"delta", "δ"}, {"epsilon", "ε"},
    {"zeta", "ζ"}, {"eta", "η"}, {"theta", "θ"}, {"iota", "ι"}, {"kappa", "κ"},
    {"lambda", "λ"}, {"mu", "μ"}, {"nu", "ν"}, {"xi", "ξ"}, {"pi", "π"},
    {"rho", "ρ"}, {"sigma", "σ"}, {"tau", "τ"}, {"upsilon", "υ"}, {"phi", "φ"},
    {"chi", "χ"}, {"psi", "ψ"}, {"omega", "ω"}, {"Gamma", "Γ"}, {"Delta", "Δ"},
    {"Theta", "Θ"}, {"Lambda", "Λ"}, {"Xi", "Ξ"}, {"Pi", "Π"}, {"Sigma", "Σ"},
    {"Phi", "Φ"}, {"Psi", "Ψ"}, {"Omega", "Ω"},
};

/* The letter for a whole Greek word of length n, or NULL. */
static const char *greek_letter(const char *s, size_t n)
{
    for (size_t i = 0; i < sizeof greek / sizeof greek[0]; i++)
        if (strlen(greek[i].word) == n && memcmp(greek[i].word, s, n) == 0)
            return greek[i].letter;
    return NULL;
}

/* Append part s[0..n) to buf, a Greek word replaced by its letter. */
static void put_part(char *buf, size_t cap, const char *s, size_t n)
{
    size_t len = strlen(buf);
    const char *g = greek_letter(s, n);
    if (g)
        snprintf(buf + len, cap - len, "%s", g);
    else
        snprintf(buf + len, cap - len, "%.*s", (int)n, s);
}

Symbol symbol_of(const char *name)
{
    Symbol sym;
    sym.base[0] = sym.sub[0] = '\0';
    const char *us = strchr(name, '_');
    size_t n = us ? (size_t)(us - name) : strlen(name);
    put_part(sym.base, sizeof sym.base, name, n);
    if (!us)
        return sym;
    const char *rest = us + 1;
    if (n == 5 && memcmp(name, "Delta", 5) == 0 && *rest) {
        const char *us2 = strchr(rest, '_');
        size_t m = us2 ? (size_t)(us2 - rest) : strlen(rest);
        put_part(sym.base, sizeof sym.base, rest, m);
        if (!us2)
            return sym;
        rest = us2 + 1;
    }
    while (*rest) {
        const char *next = strchr(rest, '_');
        size_t m = next ? (size_t)(next - rest) : strlen(rest);
        if (sym.sub[0]) {
            size_t len = strlen(sym.sub);
            snprintf(sym.sub + len, sizeof sym.sub - len, ",");
        }
        put_part(sym.sub, sizeof sym.sub, rest, m);
        if (!next)
            break;
        rest = next + 1;
    }
    return sym;
}

/* json_text.h — a JSON string from any C string, for every jansson user
 * (build and diff JSON, SARIF, the language server).
 *
 * JSON text is Unicode, but a file name or a source line may hold bytes that
 * are not UTF-8; jansson refuses those, so they become '?' rather than an
 * empty or missing member. The returned value is a new reference. */
#ifndef HEADROOM_JSON_TEXT_H
#define HEADROOM_JSON_TEXT_H

#include <jansson.h>

json_t *json_text(const char *s);

#endif

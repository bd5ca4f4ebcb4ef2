#!/bin/sh
# gen-texts.sh — turn the report's fixed texts (templates/*.md) into C string
# literals, so the installed program needs no data files. Run by the Makefile;
# its output, src/report/pdf_texts.inc, is committed.
set -e
cd "$(dirname "$0")"
esc() { sed -e 's/\\/\\\\/g' -e 's/"/\\"/g' -e 's/^/    "/' -e 's/$/\\n"/' "$1"; }
echo "/* pdf_texts.inc — generated from the templates/ texts by templates/gen-texts.sh; edit those. */"
echo "static const char TEXT_CAUTIONS[] ="
esc cautions.md
echo "    ;"

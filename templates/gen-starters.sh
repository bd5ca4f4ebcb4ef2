#!/bin/sh
# gen-starters.sh — turn the starter calcs (templates/starters/*.calc.md) and
# the starter package (templates/starters/package/: a basis, one part and the
# index) into C string literals for `headroom new`, so the installed program
# needs no data files. Run by the Makefile; its output, src/starters.inc, is
# committed.
set -e
cd "$(dirname "$0")/starters"
esc() { sed -e 's/\\/\\\\/g' -e 's/"/\\"/g' -e 's/^/    "/' -e 's/$/\\n"/' "$1"; }
echo "/* starters.inc — generated from templates/starters/ by templates/gen-starters.sh; edit those. */"
for f in *.calc.md; do
    kind=${f%.calc.md}
    echo "STARTER(\"$kind\","
    esc "$f"
    echo ")"
done
for f in package/*.calc.md; do
    echo "PACKAGE_FILE(\"package\", \"${f#package/}\","
    esc "$f"
    echo ")"
done

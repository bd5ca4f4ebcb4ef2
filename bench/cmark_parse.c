/* cmark_parse.c — bench floor: read a calc file and parse it with
 * libcmark-gfm exactly as headroom's Markdown reader does (source
 * positions, the table and strikethrough extensions), then free the tree.
 * `headroom check` is measured as a ratio to this program in one run. */
#include <cmark-gfm-core-extensions.h>
#include <cmark-gfm.h>
#include <stdio.h>
#include <stdlib.h>

int main(int argc, char **argv)
{
    if (argc != 2) {
        fputs("usage: cmark_parse FILE\n", stderr);
        return 2;
    }
    FILE *f = fopen(argv[1], "rb");
    if (!f) {
        perror(argv[1]);
        return 2;
    }
    char buf[65536];
    cmark_gfm_core_extensions_ensure_registered();
    cmark_parser *parser = cmark_parser_new(CMARK_OPT_SOURCEPOS);
    cmark_parser_attach_syntax_extension(parser, cmark_find_syntax_extension("table"));
    cmark_parser_attach_syntax_extension(parser, cmark_find_syntax_extension("strikethrough"));
    size_t n;
    while ((n = fread(buf, 1, sizeof buf, f)) > 0)
        cmark_parser_feed(parser, buf, n);
    fclose(f);
    cmark_node *root = cmark_parser_finish(parser);
    int blocks = 0;
    for (cmark_node *c = cmark_node_first_child(root); c; c = cmark_node_next(c))
        blocks++;
    cmark_node_free(root);
    cmark_parser_free(parser);
    printf("%d blocks\n", blocks);
    return 0;
}

/* lsp.h — `headroom lsp`: a Language Server Protocol server.
 *
 * JSON-RPC 2.0 messages framed by Content-Length headers, read from one file
 * descriptor and written to a stream. Each open calc is kept as the text the
 * client sent (full or incremental sync) and evaluated anew on every change;
 * the server answers from that Document and its Evaluated results: the
 * diagnostics, hover, inlay hints, definition and completion. The server owns
 * everything it allocates and frees it before returning. */
#ifndef HEADROOM_LSP_H
#define HEADROOM_LSP_H

#include <stdio.h>

/* Serve until `exit` or the end of input. Returns the process exit status:
 * 0 after shutdown then exit (or end of input after shutdown), 1 otherwise,
 * as the protocol asks. */
int lsp_serve(int in_fd, FILE *out);

#endif

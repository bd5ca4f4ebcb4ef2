#!/usr/bin/python3
"""tests/lsp/rpc.py — drive `headroom lsp` over its standard input and output
with raw JSON-RPC messages, as an editor would, and check every answer.
Prints one line per failed check and a count; exit status 1 on a failure.
Usage: rpc.py HEADROOM CALC"""
import json, os, subprocess, sys, time

H, CALC = sys.argv[1], os.path.abspath(sys.argv[2])
URI = "file://" + CALC.replace(" ", "%20")
TEXT = open(CALC, encoding="utf-8").read()
passed = failed = 0


def check(cond, what):
    global passed, failed
    if cond:
        passed += 1
    else:
        failed += 1
        print("FAIL:", what)


class Server:
    def __init__(self):
        self.p = subprocess.Popen([H, "lsp"], stdin=subprocess.PIPE, stdout=subprocess.PIPE, stderr=subprocess.PIPE)
        self.next_id = 0
        self.pending = []

    def raw(self, data):
        self.p.stdin.write(data)
        self.p.stdin.flush()

    def send(self, obj):
        body = json.dumps(obj).encode()
        self.raw(b"Content-Length: %d\r\n\r\n" % len(body) + body)

    def read(self):
        length = None
        while True:
            line = self.p.stdout.readline()
            if not line:
                return None
            line = line.strip()
            if not line:
                break
            k, _, v = line.partition(b":")
            if k.lower() == b"content-length":
                length = int(v)
        return json.loads(self.p.stdout.read(length))

    def request(self, method, params=None):
        self.next_id += 1
        msg = {"jsonrpc": "2.0", "id": self.next_id, "method": method}
        if params is not None:
            msg["params"] = params
        self.send(msg)
        return self.wait_id(self.next_id)

    def wait_id(self, i):
        while True:
            m = self.read()
            if m is None:
                return None
            if m.get("id") == i and "method" not in m:
                return m
            self.pending.append(m)

    def notify(self, method, params):
        self.send({"jsonrpc": "2.0", "method": method, "params": params})

    def diagnostics(self):
        for k, m in enumerate(self.pending):
            if m.get("method") == "textDocument/publishDiagnostics":
                del self.pending[k]
                return m["params"]
        while True:
            m = self.read()
            if m is None:
                return None
            if m.get("method") == "textDocument/publishDiagnostics":
                return m["params"]
            self.pending.append(m)

    def close(self):
        self.p.stdin.close()
        rc = self.p.wait(timeout=20)
        err = self.p.stderr.read().decode(errors="replace")
        check("Sanitizer" not in err and "runtime error" not in err, "sanitizer report: " + err[:2000])
        return rc


def pos(line, ch):
    return {"textDocument": {"uri": URI}, "position": {"line": line, "character": ch}}


def hover_text(r):
    res = r and r.get("result")
    return res["contents"]["value"] if res else ""


# ---- a session in UTF-16 -------------------------------------------------------
s = Server()
r = s.request("textDocument/hover", pos(0, 0))
check(r and r["error"]["code"] == -32002, "a request before initialize: ServerNotInitialized")
r = s.request("initialize", {"processId": None, "rootUri": None, "capabilities": {}})
caps = r["result"]["capabilities"]
check(caps["positionEncoding"] == "utf-16", "no encodings offered: utf-16")
check(caps["textDocumentSync"]["change"] == 1 and caps["textDocumentSync"]["openClose"], "full sync")
check(caps["hoverProvider"] and caps["definitionProvider"] and caps["inlayHintProvider"] and "completionProvider" in caps,
      "capabilities")
check(r["result"]["serverInfo"]["name"] == "headroom", "serverInfo")
s.notify("initialized", {})
s.notify("textDocument/didOpen", {"textDocument": {"uri": URI, "languageId": "markdown", "version": 1, "text": TEXT}})
d = s.diagnostics()
check(d["uri"] == URI, "diagnostics for the document")
diags = d["diagnostics"]
check(len(diags) == 1, "one diagnostic: %r" % diags)
w = diags[0]
check(w["severity"] == 2 and w["source"] == "headroom" and "swamee_jain" in w["message"], "the warning: %r" % w)
check(w["range"] == {"start": {"line": 15, "character": 4}, "end": {"line": 15, "character": 15}},
      "the warning's range covers swamee_jain: %r" % w["range"])

# hover: value, unit, formula, substituted formula, source and method
t = hover_text(s.request("textDocument/hover", pos(10, 0)))
check("V = 5.714 ft/s" in t, "hover V: value and unit: %r" % t)
check("V = Q/tube.area as ft/s" in t, "hover V: formula")
check("(85.00 gal/min)/(4.772 in^2)" in t, "hover V: substituted formula")
check("mean velocity" in t and "Defined at line 11." in t, "hover V: description and line")
t = hover_text(s.request("textDocument/hover", pos(8, 1)))
check("Source [ipc]: International Plumbing Code (2021), section 604" in t, "hover Q: its source: %r" % t)
t = hover_text(s.request("textDocument/hover", pos(9, 2)))
check("Method: ASTM B88 copper water tube dimensions" in t and "tube.id = 2.465 in" in t, "hover tube: method and fields: %r" % t)
t = hover_text(s.request("textDocument/hover", pos(13, 8)))
check("check riser velocity: V <= 8 ft/s: 5.714 ft/s <= 8.000 ft/s holds, utilisation 0.714" in t, "hover check: %r" % t)
check("Source [cda]: Copper Development Association" in t, "hover check: its source")
t = hover_text(s.request("textDocument/hover", pos(15, 6)))
check("swamee_jain(2 arguments)" in t and "Swamee-Jain" in t, "hover function: signature: %r" % t)
t = hover_text(s.request("textDocument/hover", pos(10, 14)))
check("tube.area = 4.772 in^2" in t, "hover field: %r" % t)
# "h = ρ_w*V^2": V is UTF-16 character 8 (byte 9)
t = hover_text(s.request("textDocument/hover", pos(12, 8)))
check(t.startswith("V = 5.714 ft/s"), "hover in UTF-16 after a non-ASCII name: %r" % t[:40])
r = s.request("textDocument/hover", pos(12, 4))
check("ρ_w = 62.30 lbf/ft^3" in hover_text(r), "hover a non-ASCII name: %r" % hover_text(r)[:40])
check(r["result"]["range"] == {"start": {"line": 12, "character": 4}, "end": {"line": 12, "character": 7}},
      "hover range in UTF-16: %r" % r["result"].get("range"))
check(s.request("textDocument/hover", pos(5, 3))["result"] is None, "hover on prose: null")

# inlay hints: each statement's value at the end of its line
r = s.request("textDocument/inlayHint", {"textDocument": {"uri": URI},
              "range": {"start": {"line": 0, "character": 0}, "end": {"line": 30, "character": 0}}})
hints = {h["position"]["line"]: h for h in r["result"]}
check(sorted(hints) == [8, 9, 10, 11, 12, 13, 14, 15], "one hint per statement: %r" % sorted(hints))
check(hints[10]["label"] == "= 5.714 ft/s" and hints[10]["position"]["character"] == len(TEXT.splitlines()[10]),
      "hint for V at the end of its line: %r" % hints.get(10))
line12 = TEXT.splitlines()[12]
check(hints[12]["label"] == "= 0.2196 psi" and hints[12]["position"]["character"] == len(line12.encode("utf-16-le")) // 2,
      "hint for h at the UTF-16 end of its line: %r" % hints.get(12))
check(hints[13]["label"] == "holds, utilisation 0.714" and hints[14]["label"] == "FAILS, utilisation 1.05",
      "hints for checks: %r %r" % (hints[13]["label"], hints[14]["label"]))
r = s.request("textDocument/inlayHint", {"textDocument": {"uri": URI},
              "range": {"start": {"line": 12, "character": 0}, "end": {"line": 12, "character": 0}}})
check(len(r["result"]) == 1, "hints limited to the range")

# definition
r = s.request("textDocument/definition", pos(12, 8))
check(r["result"] == {"uri": URI, "range": {"start": {"line": 10, "character": 0}, "end": {"line": 10, "character": 1}}},
      "definition of V: %r" % r["result"])
r = s.request("textDocument/definition", pos(13, 68))
check(r["result"] and r["result"]["range"]["start"]["line"] == 20, "definition of a citation: %r" % r["result"])
check(s.request("textDocument/definition", pos(15, 6))["result"] is None, "definition of a function: null")

# completion: names, units, functions with signatures, fitting kinds, pipe sizes
def complete(text, line=15):
    """Change line `line` to `text`, complete at its end, restore."""
    lines = TEXT.split("\n")
    lines[line] = text
    s.notify("textDocument/didChange", {"textDocument": {"uri": URI, "version": 2},
             "contentChanges": [{"text": "\n".join(lines)}]})
    s.diagnostics()
    r = s.request("textDocument/completion", pos(line, len(text.encode("utf-16-le")) // 2))
    return r["result"]


items = complete("x = ")
labels = {i["label"]: i for i in items}
check({"Q", "tube", "V", "ρ_w", "h", "pi", "g"} <= set(labels), "names: %r" % sorted(labels)[:20])
check(labels.get("k_fitting", {}).get("detail") == "k_fitting(3 arguments; method=, D2=, r=)", "function signature: %r" % labels.get("k_fitting"))
check(labels.get("water", {}).get("detail") == "water(1 to 2 arguments)", "water signature")
check(labels.get("V", {}).get("detail") == "5.714 ft/s", "a name's value as its detail")
labels = {i["label"] for i in complete("x = sw")}
check("swamee_jain" in labels and "V" not in labels, "completion by prefix: %r" % labels)
labels = {i["label"] for i in complete("x = 38 gal")}
check("gal/min" in labels and "gal" in labels and "psi" not in labels, "units after a number: %r" % labels)
labels = {i["label"] for i in complete("x = V as ft")}
check("ft/s" in labels and "ft" in labels, "units after as: %r" % labels)
labels = {i["label"] for i in complete('x = k_fitting("elb')}
check({"elbow 90 std", "elbow 45 long"} <= labels and "gate" not in labels, "fitting kinds: %r" % labels)
labels = [i["label"] for i in complete('x = pipe("ASTM B88", "')]
check("2-1/2" in labels and "1/2" in labels and len(labels) == len(set(labels)), "pipe sizes: %r" % labels)
labels = {i["label"] for i in complete('x = pipe("ASTM B88", "1", "')}
check(labels == {"K", "L", "M"}, "copper classes: %r" % labels)
labels = {i["label"] for i in complete('x = pipe("')}
check("ASTM B88" in labels and "ASME B36.10M" in labels, "pipe standards: %r" % labels)
labels = {i["label"] for i in complete("x = tube.")}
check({"id", "od", "area", "wall"} <= labels, "record fields: %r" % labels)

# changes re-evaluate; errors carry their range
lines = TEXT.split("\n")
lines[15] = "f = Q + V"
s.notify("textDocument/didChange", {"textDocument": {"uri": URI, "version": 3}, "contentChanges": [{"text": "\n".join(lines)}]})
d = s.diagnostics()["diagnostics"]
check(len(d) == 1 and d[0]["severity"] == 1 and "cannot add" in d[0]["message"] and d[0]["range"]["start"] == {"line": 15, "character": 6},
      "an error after a change: %r" % d)
# an incremental change (a range) is applied too
s.notify("textDocument/didChange", {"textDocument": {"uri": URI, "version": 4}, "contentChanges": [
    {"range": {"start": {"line": 15, "character": 4}, "end": {"line": 15, "character": 9}}, "text": "2*V"}]})
d = s.diagnostics()["diagnostics"]
check(d == [], "the edited line is fixed: %r" % d)
t = hover_text(s.request("textDocument/hover", pos(15, 0)))
check(t.startswith("f = 11.43 ft/s"), "the edit took effect: %r" % t[:30])

# malformed input: errors, never a crash
s.raw(b"Content-Length: 9\r\n\r\n{not json")
m = s.read()
check(m["id"] is None and m["error"]["code"] == -32700, "bad JSON: parse error: %r" % m)
s.raw(b"Content-Length: 2\r\n\r\n[]")
check(s.read()["error"]["code"] == -32600, "not an object: invalid request")
s.raw(b"Content-Type: x\r\n\r\n")
check(s.read()["error"]["code"] == -32700, "no Content-Length: an error")
s.raw(b"Content-Length: " + b"9" * 3000 + b"\r\n" + b"X-Long: " + b"a" * 5000 + b"\r\n\r\n")
check(s.read()["error"]["code"] == -32700, "a header line over the limit: an error")
s.send({"jsonrpc": "2.0", "id": 7, "method": 5})
check(s.read()["error"]["code"] == -32600, "method not a string")
check(s.request("no/such/method", {})["error"]["code"] == -32601, "unknown method")
check(s.request("textDocument/hover")["error"]["code"] == -32602, "hover without params")
check(s.request("textDocument/hover", {"textDocument": {"uri": "file:///nope"}, "position": {"line": 0, "character": 0}})["error"]["code"] == -32602,
      "hover of a document not open")
check(s.request("textDocument/hover", {"textDocument": {"uri": URI}, "position": {"line": "x", "character": -1}})["result"] is None,
      "a bad position: null")
check(s.request("textDocument/hover", {"textDocument": {"uri": URI}, "position": {"line": 10 ** 9, "character": 10 ** 9}})["result"] is None,
      "a position past the end: null")
s.notify("textDocument/didChange", {"textDocument": {"uri": URI}, "contentChanges": [{"range": {"start": {"line": 99, "character": 0}, "end": {"line": 0, "character": 0}}, "text": "x"}]})
check(s.diagnostics() is not None, "a reversed range is refused, the server goes on")
s.send({"jsonrpc": "2.0", "method": "textDocument/didOpen", "params": {"textDocument": {"uri": 3}}})
s.send({"jsonrpc": "2.0", "method": "textDocument/didChange", "params": None})
s.send({"jsonrpc": "2.0", "id": {"a": 1}, "method": "shutdown"})
check(s.read()["error"]["code"] == -32600, "an id that is an object")
r = s.request("initialize", {})
check(r["error"]["code"] == -32600, "a second initialize")
s.notify("textDocument/didClose", {"textDocument": {"uri": URI}})
d = s.diagnostics()
check(d["diagnostics"] == [], "close clears the diagnostics")
r = s.request("shutdown")
check("result" in r and r["result"] is None, "shutdown")
check(s.request("textDocument/hover", pos(0, 0))["error"]["code"] == -32600, "requests after shutdown")
s.notify("exit", None)
rc = s.p.wait(timeout=20)
check(rc == 0, "exit after shutdown: status 0, got %r" % rc)
s.close()

# ---- UTF-8 when the client offers it ---------------------------------------------
s = Server()
r = s.request("initialize", {"capabilities": {"general": {"positionEncodings": ["utf-8", "utf-16"]}}})
check(r["result"]["capabilities"]["positionEncoding"] == "utf-8", "utf-8 when offered")
s.notify("textDocument/didOpen", {"textDocument": {"uri": URI, "languageId": "markdown", "version": 1, "text": TEXT}})
s.diagnostics()
t = hover_text(s.request("textDocument/hover", pos(12, 9)))
check(t.startswith("V = 5.714 ft/s"), "hover in UTF-8 bytes: %r" % t[:30])
r = s.request("textDocument/inlayHint", {"textDocument": {"uri": URI},
              "range": {"start": {"line": 12, "character": 0}, "end": {"line": 12, "character": 0}}})
check(r["result"][0]["position"]["character"] == len(line12.encode()), "hint at the UTF-8 end of the line")
s.notify("exit", None)
check(s.p.wait(timeout=20) == 1, "exit without shutdown: status 1")
s.close()

# ---- a huge Content-Length is refused, not allocated --------------------------------
s = Server()
s.raw(b"Content-Length: 99999999999999999999\r\n\r\n")
m = s.read()
check(m and m["error"]["code"] == -32600 and "limit" in m["error"]["message"], "huge Content-Length: %r" % m)
rc = s.close()
check(rc == 1, "end of input without shutdown: status 1")
# a body cut short by the end of input
s = Server()
s.raw(b"Content-Length: 100\r\n\r\n{\"jsonrpc\"")
check(s.close() == 1, "a truncated body ends the server")

print("lsp-rpc: %d passed, %d failed" % (passed, failed))
sys.exit(1 if failed else 0)

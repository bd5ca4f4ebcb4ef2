-- tests/lsp/client.lua — neovim's own LSP client against `headroom lsp`.
-- Run headless: nvim --headless --clean -u NONE -c 'luafile tests/lsp/client.lua'
-- with HEADROOM (the program) and CALC (a calc file) in the environment.
-- Opens the calc, waits for the diagnostics, asks hover, definition,
-- completion and inlay hints, and asserts on the answers. Prints one line
-- per failure and "lsp-nvim: N passed, M failed", then quits with status 1
-- on a failure. Written for neovim 0.7 (Debian 12), whose client has no
-- inlay-hint support of its own: that request is sent by name.
local headroom = os.getenv("HEADROOM")
local calc = os.getenv("CALC")
local encoding = os.getenv("ENCODING") or "utf-16"
local passed, failed = 0, 0
local function check(cond, what)
  if cond then passed = passed + 1 else failed = failed + 1; io.stdout:write("FAIL: " .. what .. "\n") end
end
local function finish()
  io.stdout:write(string.format("lsp-nvim (%s): %d passed, %d failed\n", encoding, passed, failed))
  vim.cmd(failed == 0 and "qall!" or "cquit!")
end

vim.cmd("edit " .. vim.fn.fnameescape(calc))
local buf = vim.api.nvim_get_current_buf()
local got_diags = false
local caps = vim.lsp.protocol.make_client_capabilities()
caps.general = { positionEncodings = encoding == "utf-8" and { "utf-8", "utf-16" } or { "utf-16" } }
local id = vim.lsp.start_client({
  name = "headroom",
  cmd = { headroom, "lsp" },
  capabilities = caps,
  offset_encoding = encoding,
  flags = { debounce_text_changes = 0 },
  handlers = {
    ["textDocument/publishDiagnostics"] = function(err, result, ctx, config)
      vim.lsp.diagnostic.on_publish_diagnostics(err, result, ctx, config)
      got_diags = true
    end,
  },
})
check(id ~= nil, "the client starts")
vim.lsp.buf_attach_client(buf, id)
check(vim.wait(20000, function() return got_diags end, 20), "diagnostics arrive")
local client = vim.lsp.get_client_by_id(id)
check(client and client.server_capabilities and client.server_capabilities.positionEncoding == encoding,
  "the server uses " .. encoding)

local d = vim.diagnostic.get(buf)
check(#d == 1, "one diagnostic, got " .. #d)
if d[1] then
  check(d[1].severity == vim.diagnostic.severity.WARN and d[1].lnum == 15 and d[1].col == 4,
    "the warning on line 16 at swamee_jain: " .. vim.inspect(d[1]))
end

local function at(line, col_bytes)
  -- a byte column of the buffer line, in the negotiated encoding (the
  -- cursor cannot stand past the last character, so it is not used)
  local text = vim.api.nvim_buf_get_lines(buf, line, line + 1, false)[1]
  local ch = encoding == "utf-8" and col_bytes or vim.str_utfindex(text, col_bytes)
  return { textDocument = { uri = vim.uri_from_bufnr(buf) }, position = { line = line, character = ch } }
end
local function ask(method, params)
  local res = vim.lsp.buf_request_sync(buf, method, params, 20000)
  if not res or not res[id] then return nil end
  return res[id].result, res[id].err
end

-- hover on V in "h = ρ_w*V^2" (byte 9): the value, formula and substitution
local h = ask("textDocument/hover", at(12, 9))
local text = h and h.contents and h.contents.value or ""
check(text:find("V = 5.714 ft/s", 1, true) ~= nil, "hover: value and unit: " .. text)
check(text:find("V = Q/tube.area as ft/s", 1, true) ~= nil, "hover: formula")
check(text:find("(85.00 gal/min)/(4.772 in^2)", 1, true) ~= nil, "hover: substituted formula")
h = ask("textDocument/hover", at(9, 0))
text = h and h.contents and h.contents.value or ""
check(text:find("Method: ASTM B88 copper water tube dimensions", 1, true) ~= nil, "hover: method reference")
h = ask("textDocument/hover", at(8, 0))
text = h and h.contents and h.contents.value or ""
check(text:find("Source [ipc]: International Plumbing Code", 1, true) ~= nil, "hover: source")

-- definition of V from line 13 goes to line 11
local def = ask("textDocument/definition", at(12, 9))
check(def and def.range and def.range.start.line == 10 and def.range.start.character == 0,
  "definition of V: " .. vim.inspect(def))

-- edit a line and wait until the server has checked the new text
local function edit(first, last, text)
  got_diags = false
  vim.api.nvim_buf_set_lines(buf, first, last, false, { text })
  check(vim.wait(20000, function() return got_diags end, 10), "diagnostics after the edit " .. text)
end

-- completion of names and function signatures, then units
local comp = ask("textDocument/completion", at(10, 4))
local items = comp and (comp.items or comp) or {}
local labels = {}
for _, it in ipairs(items) do labels[it.label] = it end
check(labels.Q ~= nil and labels.tube ~= nil and labels["ρ_w"] ~= nil, "completion: names")
check(labels.pipe ~= nil and labels.pipe.detail == "pipe(3 arguments)", "completion: a function's signature")
edit(16, 16, 'x = pipe("ASTM D1785", "')
local cur = vim.api.nvim_buf_get_lines(buf, 16, 17, false)[1]
comp = ask("textDocument/completion", at(16, #cur))
labels = {}
for _, it in ipairs(comp and (comp.items or comp) or {}) do labels[it.label] = true end
check(labels["1-1/2"] and labels["3/4"], "completion: pipe sizes of a standard")
edit(16, 17, 'x = k_fitting("')
comp = ask("textDocument/completion", at(16, 15))
labels = {}
for _, it in ipairs(comp and (comp.items or comp) or {}) do labels[it.label] = true end
check(labels["elbow 90 long"] and labels["gate"] and labels["swing check"], "completion: fitting kinds")
edit(16, 17, "x = 3 kP")
comp = ask("textDocument/completion", at(16, 8))
labels = {}
for _, it in ipairs(comp and (comp.items or comp) or {}) do labels[it.label] = true end
check(labels["kPa"], "completion: units after a number")

-- the edits above reached the server: the new line has an error now
edit(16, 17, "x = Q + V")
check(vim.wait(20000, function()
  for _, dg in ipairs(vim.diagnostic.get(buf)) do
    if dg.lnum == 16 and dg.severity == vim.diagnostic.severity.ERROR then return true end
  end
  return false
end, 20), "a change is checked: an error on the new line")

-- inlay hints, by name (the 0.7 client has no support of its own)
local hints = ask("textDocument/inlayHint", {
  textDocument = { uri = vim.uri_from_bufnr(buf) },
  range = { start = { line = 0, character = 0 }, ["end"] = { line = 16, character = 0 } },
})
local by_line = {}
for _, hint in ipairs(hints or {}) do by_line[hint.position.line] = hint end
check(by_line[10] and by_line[10].label == "= 5.714 ft/s", "inlay hint for V: " .. vim.inspect(by_line[10]))
check(by_line[14] and by_line[14].label == "FAILS, utilisation 1.05", "inlay hint for a failing check")
local l12 = vim.api.nvim_buf_get_lines(buf, 12, 13, false)[1]
local want = encoding == "utf-8" and #l12 or vim.str_utfindex(l12)
check(by_line[12] and by_line[12].position.character == want, "inlay hint at the end of the line in " .. encoding)

vim.lsp.stop_client(id)
vim.wait(5000, function() return vim.lsp.client_is_stopped(id) end, 20)
finish()

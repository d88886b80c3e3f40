-- Neovim (0.7+) headless end-to-end check of the Cellrun language server.
-- Usage: CELLRUN_SERVER=dist/server.js CELLRUN_FILE=x.cellrun nvim --headless -u NONE -c 'luafile test/editors/nvim-e2e.lua'
-- Prints one result per line: DIAG line:col code | HINT line:col label | COMPLETION n first | FORMAT n | DONE
local file = vim.env.CELLRUN_FILE
local server = vim.env.CELLRUN_SERVER
vim.cmd('edit ' .. file)
local buf = vim.api.nvim_get_current_buf()
local id = vim.lsp.start_client({ name = 'cellrun', cmd = { 'node', server, '--stdio' }, root_dir = vim.fn.getcwd() })
vim.lsp.buf_attach_client(buf, id)
local client = vim.lsp.get_client_by_id(id)
vim.wait(10000, function() return #vim.diagnostic.get(buf) > 0 end, 50)
local out = {}
local function emit(s) table.insert(out, s) end
for _, d in ipairs(vim.diagnostic.get(buf)) do
  emit(string.format('DIAG %d:%d %s', d.lnum + 1, d.col + 1, d.code or ''))
end
local uri = vim.uri_from_bufnr(buf)
local hints = client.request_sync('textDocument/inlayHint', { textDocument = { uri = uri }, range = { start = { line = 0, character = 0 }, ['end'] = { line = vim.api.nvim_buf_line_count(buf), character = 0 } } }, 10000, buf)
for _, h in ipairs((hints and hints.result) or {}) do
  local label = type(h.label) == 'string' and h.label or ''
  emit(string.format('HINT %d:%d %s', h.position.line + 1, h.position.character, label))
end
-- Completion at the start of an empty last line: statement keywords.
vim.api.nvim_buf_set_lines(buf, -1, -1, false, { '' })
local last = vim.api.nvim_buf_line_count(buf) - 1
vim.lsp.util.buf_versions[buf] = (vim.lsp.util.buf_versions[buf] or 0)
vim.wait(300)
local comp = client.request_sync('textDocument/completion', { textDocument = { uri = uri }, position = { line = last, character = 0 } }, 10000, buf)
local items = comp and comp.result and (comp.result.items or comp.result) or {}
emit(string.format('COMPLETION %d %s', #items, (items[1] and items[1].label) or ''))
local fmt = client.request_sync('textDocument/formatting', { textDocument = { uri = uri }, options = { tabSize = 2, insertSpaces = true } }, 10000, buf)
emit(string.format('FORMAT %d', (fmt and fmt.result and #fmt.result) or -1))
emit('DONE')
io.stdout:write(table.concat(out, '\n') .. '\n')
vim.cmd('qa!')

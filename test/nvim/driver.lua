-- Drives the language server from inside headless Neovim, with Neovim's own LSP client, and
-- writes what it saw as JSON for test/nvim/neovim.test.ts to assert on.
-- Run as: nvim --headless -u NONE -i NONE -n -c 'lua dofile(vim.env.DRIVER)'
-- with SLOPECHECK_NVIM_PLAN naming a JSON plan (see neovim.test.ts for its fields).
-- Written for Neovim 0.7.2: results carry `error` (newer releases say `err`).

local loaded, plan = pcall(function()
  return vim.fn.json_decode(table.concat(vim.fn.readfile(vim.env.SLOPECHECK_NVIM_PLAN), '\n'))
end)
if not loaded then
  io.stderr:write('cannot read the plan: ' .. tostring(plan) .. '\n')
  vim.cmd('cquit 2')
end
local out = { ok = false, published = {}, serverRequests = {}, documents = {}, hovers = {}, lenses = {} }

local function fail(message)
  error(message, 0)
end

local function wait_for(what, condition)
  if not vim.wait(plan.waitMs, condition, 20) then fail('timed out waiting for ' .. what) end
end

-- Records a server→client message, then lets Neovim's default handler do its usual work.
local function recording(method, record)
  return function(err, result, ctx, config)
    record(result, ctx)
    return vim.lsp.handlers[method](err, result, ctx, config)
  end
end

local function server_request(method)
  return recording(method, function() table.insert(out.serverRequests, method) end)
end

local function start_client()
  local id = vim.lsp.start_client({
    name = 'slopecheck',
    cmd = plan.cmd,
    root_dir = plan.root,
    -- Without this, didChange reaches the server 150 ms late.
    flags = { debounce_text_changes = 0 },
    handlers = {
      -- The raw LSP ranges: vim.diagnostic only keeps byte columns.
      ['textDocument/publishDiagnostics'] = recording('textDocument/publishDiagnostics', function(result)
        table.insert(out.published, { uri = result.uri, version = result.version, diagnostics = result.diagnostics })
      end),
      ['workspace/configuration'] = server_request('workspace/configuration'),
      ['window/workDoneProgress/create'] = server_request('window/workDoneProgress/create'),
      ['client/registerCapability'] = server_request('client/registerCapability'),
    },
  })
  if not id then fail('vim.lsp.start_client returned nil') end
  local client = vim.lsp.get_client_by_id(id)
  -- Requests sent before `initialized` time out silently.
  wait_for('the server to initialize', function() return client.initialized end)
  out.clientCapabilities = vim.lsp.protocol.make_client_capabilities()
  out.serverCapabilities = client.server_capabilities
  out.offsetEncoding = client.offset_encoding
  return client
end

--- The newest publish for `uri` (optionally of one document version), or nil.
local function latest_publish(uri, version)
  for i = #out.published, 1, -1 do
    local p = out.published[i]
    if p.uri == uri and (version == nil or p.version == version) then return p end
  end
  return nil
end

local function open(client, file)
  vim.cmd('edit ' .. vim.fn.fnameescape(file))
  local bufnr = vim.api.nvim_get_current_buf()
  -- -u NONE detects no filetype, and the filetype becomes the languageId.
  vim.bo[bufnr].filetype = 'typescript'
  if not vim.lsp.buf_attach_client(bufnr, client.id) then fail('could not attach to ' .. file) end
  local uri = vim.uri_from_bufnr(bufnr)
  wait_for('diagnostics of ' .. file, function() return latest_publish(uri) ~= nil end)
  return { file = file, uri = uri, bufnr = bufnr }
end

local function request(client, bufnr, method, params)
  if not client.supports_method(method) then fail(method .. ' is not supported by the server') end
  local responses, err = vim.lsp.buf_request_sync(bufnr, method, params, plan.waitMs)
  if not responses then fail(method .. ': ' .. tostring(err)) end
  local response = responses[client.id]
  if not response then fail(method .. ': no response from the server') end
  if response.error then fail(method .. ': ' .. vim.inspect(response.error)) end
  return response.result
end

-- What Neovim itself shows: byte columns, as vim.diagnostic keeps them.
local function shown(bufnr)
  return vim.tbl_map(function(d)
    return { lnum = d.lnum, col = d.col, end_lnum = d.end_lnum, end_col = d.end_col, code = d.code, severity = d.severity }
  end, vim.diagnostic.get(bufnr))
end

local function buffer_text(bufnr)
  return table.concat(vim.api.nvim_buf_get_lines(bufnr, 0, -1, false), '\n') .. '\n'
end

-- The quick fix as `vim.lsp.buf.code_action()` asks for it (the line's diagnostics, as Neovim
-- stored them), applied by Neovim's own edit code, then saved so the server checks again.
local function quick_fix(client, doc, fix)
  local bufnr = doc.bufnr
  vim.api.nvim_set_current_buf(bufnr)
  local line_diagnostics = vim.lsp.diagnostic.get_line_diagnostics(bufnr, fix.line)
  local sent = vim.tbl_filter(function(d) return d.code == fix.code end, line_diagnostics)
  if #sent == 0 then fail('no ' .. fix.code .. ' diagnostic on line ' .. fix.line) end
  local actions = request(client, bufnr, 'textDocument/codeAction', {
    textDocument = { uri = doc.uri },
    range = sent[1].range,
    context = { diagnostics = sent },
  })
  local result = { sent = sent, titles = vim.tbl_map(function(a) return a.title end, actions) }
  local chosen = nil
  for _, action in ipairs(actions) do
    if vim.startswith(action.title, fix.titlePrefix) then chosen = action end
  end
  if not chosen then fail('no action titled ' .. fix.titlePrefix .. '…; got ' .. vim.inspect(result.titles)) end
  result.chosen = chosen
  vim.lsp.util.apply_workspace_edit(chosen.edit, client.offset_encoding)
  vim.cmd('write')
  -- Neovim sends the buffer's changedtick as the version; the server publishes with it.
  local version = vim.lsp.util.buf_versions[bufnr]
  wait_for('diagnostics after the fix', function() return latest_publish(doc.uri, version) ~= nil end)
  result.version = version
  result.after = latest_publish(doc.uri, version)
  result.shownAfter = shown(bufnr)
  result.bufferText = buffer_text(bufnr)
  result.diskText = table.concat(vim.fn.readfile(doc.file), '\n') .. '\n'
  return result
end

local function run()
  local client = start_client()
  local docs = {}
  for _, file in ipairs(plan.open) do
    local doc = open(client, file)
    docs[file] = doc
    table.insert(out.documents, { file = file, uri = doc.uri, shown = shown(doc.bufnr) })
  end
  for _, at in ipairs(plan.hovers) do
    local doc = docs[at.file]
    local result = request(client, doc.bufnr, 'textDocument/hover', {
      textDocument = { uri = doc.uri },
      position = { line = at.line, character = at.character },
    })
    table.insert(out.hovers, { file = at.file, result = result })
  end
  for _, file in ipairs(plan.lenses) do
    local doc = docs[file]
    local result = request(client, doc.bufnr, 'textDocument/codeLens', { textDocument = { uri = doc.uri } })
    table.insert(out.lenses, { file = file, result = result })
  end
  out.fix = quick_fix(client, docs[plan.fix.file], plan.fix)
  client.stop()
  wait_for('the server to stop', function() return client.is_stopped() end)
  out.ok = true
end

local succeeded, message = xpcall(run, debug.traceback)
if not succeeded then out.error = tostring(message) end
local written = pcall(function() vim.fn.writefile({ vim.fn.json_encode(out) }, plan.output) end)
-- An uncaught error would leave headless Neovim running, or exiting 0 behind `qa!`.
if succeeded and written then vim.cmd('qall!') else vim.cmd('cquit 1') end

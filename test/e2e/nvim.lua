-- Drives the Eigenspan language server from headless Neovim with the built-in LSP client only, set up
-- by the README's recipe (loaded before this file): this script only opens files and watches.
-- Inputs come from the environment; results go to a JSON file that nvim.mjs reads and prints.
local out_path = os.getenv('EIGENSPAN_OUT')
local example = os.getenv('EIGENSPAN_EXAMPLE')
local broken = os.getenv('EIGENSPAN_BROKEN')
local report = { nvim = tostring(vim.version().major) .. '.' .. tostring(vim.version().minor) .. '.' .. tostring(vim.version().patch), steps = {} }

local function save()
  local f = io.open(out_path, 'w')
  f:write(vim.fn.json_encode(report))
  f:close()
end

-- The report is saved after every step, so a run that stalls still says how far it got.
local function step(name, ok, detail)
  table.insert(report.steps, { name = name, ok = ok, detail = detail })
  save()
end

local function finish()
  -- Stop the servers politely (shutdown, exit) and wait for them before leaving.
  local all = vim.lsp.get_clients or vim.lsp.get_active_clients
  for _, c in ipairs(all()) do c.stop() end
  report.servers_stopped = vim.wait(5000, function() return #all() == 0 end, 20)
  report.finished = true
  save()
  vim.cmd('qa!')
end

local function code_of(d)
  if d.code ~= nil then return tostring(d.code) end
  if d.user_data and d.user_data.lsp and d.user_data.lsp.code ~= nil then return tostring(d.user_data.lsp.code) end
  return '?'
end

-- The clients attached to a buffer, on 0.7 (buf_get_clients) and later (get_clients).
local function clients_of(buf)
  local list = {}
  local found = vim.lsp.get_clients and vim.lsp.get_clients({ bufnr = buf }) or vim.lsp.buf_get_clients(buf)
  for _, c in pairs(found) do table.insert(list, c) end
  return list
end

-- Opens a file as a user does; the recipe's autocommand must set the file type and attach the server.
local function open(path)
  vim.cmd('edit ' .. vim.fn.fnameescape(path))
  local buf = vim.api.nvim_get_current_buf()
  step('recipe sets the qstate file type on ' .. vim.fn.fnamemodify(path, ':t'), vim.bo[buf].filetype == 'qstate', vim.bo[buf].filetype)
  local id = nil
  local attached = vim.wait(15000, function()
    local cs = clients_of(buf)
    if #cs > 0 and cs[1].name == 'eigenspan' then id = cs[1].id return true end
    return false
  end, 20)
  step('recipe attaches the eigenspan server', attached, 'client ' .. tostring(id))
  return buf, id
end

local function diagnostics(buf)
  local list = {}
  for _, d in ipairs(vim.diagnostic.get(buf)) do
    table.insert(list, { line = d.lnum, col = d.col, severity = d.severity, code = code_of(d), message = d.message })
  end
  return list
end

local function ready(id)
  return vim.wait(15000, function()
    local c = vim.lsp.get_client_by_id(id)
    return c ~= nil and c.server_capabilities ~= nil and c.server_capabilities.hoverProvider ~= nil
  end, 20)
end

local function hover_text(buf, id, line)
  local c = vim.lsp.get_client_by_id(id)
  if not c then return nil end
  local params = { textDocument = { uri = vim.uri_from_bufnr(buf) }, position = { line = line, character = 2 } }
  local answer = c.request_sync('textDocument/hover', params, 10000, buf)
  if answer and answer.result and answer.result.contents then
    local contents = answer.result.contents
    if type(contents) == 'table' and contents.value then return contents.value end
    if type(contents) == 'string' then return contents end
  end
  return nil
end

local ok_run, err = pcall(function()
  -- 1. The broken file: the static checks publish a syntax error at once.
  local b = open(broken)
  local got = vim.wait(20000, function()
    for _, d in ipairs(vim.diagnostic.get(b)) do if code_of(d) == 'syntax' then return true end end
    return false
  end, 20)
  report.broken = diagnostics(b)
  step('syntax diagnostic on the broken file', got, #report.broken .. ' diagnostics')

  -- 2. The example: wait for the full analysis through the hover on its state line.
  local e, id = open(example)
  step('client initialized', ready(id), 'client ' .. tostring(id))
  local state_line = -1
  for i, l in ipairs(vim.api.nvim_buf_get_lines(e, 0, -1, false)) do
    if l:match('^state') then state_line = i - 1 break end
  end
  step('example has a state line', state_line >= 0, 'line ' .. state_line)
  local text = nil
  local analysed = vim.wait(30000, function()
    text = hover_text(e, id, state_line)
    return text ~= nil and text:find('captured', 1, true) ~= nil
  end, 100)
  report.hover = text
  step('hover on the state line shows the expansion', analysed, text and #text .. ' characters' or 'no hover')
  report.example = diagnostics(e)
  step('diagnostics listed for the example', true, #report.example .. ' diagnostics')
end)
if not ok_run then step('lua script', false, tostring(err)) end
finish()

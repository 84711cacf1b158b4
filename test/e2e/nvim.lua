-- Drives the Eigenspan language server from headless Neovim with the built-in LSP client only.
-- Inputs come from the environment; results go to a JSON file that nvim.mjs reads and prints.
local server = os.getenv('EIGENSPAN_SERVER')
local out_path = os.getenv('EIGENSPAN_OUT')
local example = os.getenv('EIGENSPAN_EXAMPLE')
local broken = os.getenv('EIGENSPAN_BROKEN')
local report = { nvim = tostring(vim.version().major) .. '.' .. tostring(vim.version().minor) .. '.' .. tostring(vim.version().patch), steps = {} }

local function step(name, ok, detail)
  table.insert(report.steps, { name = name, ok = ok, detail = detail })
end

local function finish()
  local f = io.open(out_path, 'w')
  f:write(vim.fn.json_encode(report))
  f:close()
  vim.cmd('qa!')
end

local function code_of(d)
  if d.code ~= nil then return tostring(d.code) end
  if d.user_data and d.user_data.lsp and d.user_data.lsp.code ~= nil then return tostring(d.user_data.lsp.code) end
  return '?'
end

local function open(path)
  vim.cmd('edit ' .. vim.fn.fnameescape(path))
  local buf = vim.api.nvim_get_current_buf()
  vim.bo[buf].filetype = 'qstate'
  local config = { name = 'eigenspan', cmd = { 'node', server, '--stdio' }, root_dir = vim.fn.fnamemodify(path, ':h') }
  local id
  if vim.lsp.start then
    id = vim.lsp.start(config)
  else
    -- Neovim before 0.8 has no vim.lsp.start: start the client and attach it to the buffer.
    id = vim.lsp.start_client(config)
    vim.lsp.buf_attach_client(buf, id)
  end
  return buf, id
end

local function diagnostics(buf)
  local list = {}
  for _, d in ipairs(vim.diagnostic.get(buf)) do
    table.insert(list, { line = d.lnum, col = d.col, severity = d.severity, code = code_of(d), message = d.message })
  end
  return list
end

local function hover_text(buf, line)
  local params = { textDocument = { uri = vim.uri_from_bufnr(buf) }, position = { line = line, character = 2 } }
  local answers = vim.lsp.buf_request_sync(buf, 'textDocument/hover', params, 10000) or {}
  for _, a in pairs(answers) do
    if a.result and a.result.contents then
      local c = a.result.contents
      if type(c) == 'table' and c.value then return c.value end
      if type(c) == 'string' then return c end
    end
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
  local e = open(example)
  local state_line = -1
  for i, l in ipairs(vim.api.nvim_buf_get_lines(e, 0, -1, false)) do
    if l:match('^state') then state_line = i - 1 break end
  end
  step('example has a state line', state_line >= 0, 'line ' .. state_line)
  local text = nil
  local analysed = vim.wait(30000, function()
    text = hover_text(e, state_line)
    return text ~= nil and text:find('captured', 1, true) ~= nil
  end, 100)
  report.hover = text
  step('hover on the state line shows the expansion', analysed, text and #text .. ' characters' or 'no hover')
  report.example = diagnostics(e)
  step('diagnostics listed for the example', true, #report.example .. ' diagnostics')
end)
if not ok_run then step('lua script', false, tostring(err)) end
finish()

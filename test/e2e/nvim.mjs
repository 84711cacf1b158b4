// End-to-end check in headless Neovim (Debian `neovim`, `nvim --headless --clean`, built-in LSP client,
// no plugins): load the README's Neovim recipe as a user would, open a broken file and an example, wait
// for the recipe to set the file type and attach the server, then for diagnostics and a hover.
// Exits 0 when every step passed, 1 otherwise (including when nvim is missing).
import { spawn, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, copyFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { readmeRecipe } from './recipe.mjs';

const here = dirname(fileURLToPath(import.meta.url));
const root = resolve(here, '..', '..');
const server = resolve(process.env.EIGENSPAN_SERVER ?? join(root, 'dist', 'server.js'));

function fail(message) {
  console.error(`nvim e2e: ${message}`);
  process.exit(1);
}

if (spawnSync('nvim', ['--version'], { encoding: 'utf8' }).status !== 0) fail('nvim is not installed (Debian package neovim)');
if (!existsSync(server)) fail(`${server} is missing; run npm run build`);

const work = mkdtempSync(join(tmpdir(), 'eigenspan-nvim-'));
try {
  // The example: a shipped one when there is any, else a small scenario of our own.
  const examples = existsSync(join(root, 'examples')) ? readdirSync(join(root, 'examples')).filter((f) => f.endsWith('.qstate')).sort() : [];
  const example = join(work, examples[0] ?? 'half-box.qstate');
  if (examples[0]) copyFileSync(join(root, 'examples', examples[0]), example);
  else writeFileSync(example, '# A state filling the left half of a box.\nsystem box(0, 2)\nstate psi(x) = x < 1 ? 1 : 0\n');
  const broken = join(work, 'broken.qstate');
  writeFileSync(broken, 'system box(0, 1\nstate psi(x) = x\n');
  const out = join(work, 'report.json');
  const recipe = join(work, 'recipe.lua');
  writeFileSync(recipe, readmeRecipe(join(root, 'README.md'), server));

  const child = spawn('nvim', ['--headless', '--clean', '-c', `luafile ${recipe}`, '-c', `luafile ${join(here, 'nvim.lua')}`], {
    cwd: work,
    env: { ...process.env, EIGENSPAN_OUT: out, EIGENSPAN_EXAMPLE: example, EIGENSPAN_BROKEN: broken },
    stdio: ['ignore', 'pipe', 'pipe'],
  });
  let stderr = '';
  child.stderr.on('data', (d) => (stderr += d));
  // Headless Neovim wants a live stdout (it stalled with /dev/null here); its screen output is not needed.
  child.stdout.resume();
  const guard = setTimeout(() => child.kill('SIGKILL'), 75_000);
  const code = await new Promise((r) => child.once('exit', (c) => r(c)));
  clearTimeout(guard);
  if (!existsSync(out)) fail(`nvim exited (${code}) without a report${stderr ? `: ${stderr.trim()}` : ''}`);
  const report = JSON.parse(readFileSync(out, 'utf8'));

  console.log(`Neovim ${report.nvim}, server ${server}`);
  console.log(`example: ${examples[0] ?? '(temporary file)'}`);
  const rows = report.steps.map((s) => [s.ok ? 'ok' : 'FAIL', s.name, s.detail ?? '']);
  const w = [0, 1].map((k) => Math.max(...rows.map((r) => r[k].length)));
  for (const r of rows) console.log(`${r[0].padEnd(w[0])}  ${r[1].padEnd(w[1])}  ${r[2]}`);
  for (const [name, list] of [['broken.qstate', report.broken], ['example', report.example]]) {
    for (const d of list ?? []) console.log(`  ${name}:${d.line + 1}:${d.col + 1}: [${d.code}] ${d.message}`);
  }
  if (report.hover) console.log(`hover:\n${report.hover.replace(/^/gm, '  | ')}`);
  if (!report.finished) console.log(`nvim did not finish (exit ${code})${stderr ? `: ${stderr.trim()}` : ''}`);
  const ok = report.finished === true && report.steps.length > 0 && report.steps.every((s) => s.ok);
  console.log(ok ? 'nvim e2e: passed' : 'nvim e2e: FAILED');
  process.exitCode = ok ? 0 : 1;
} finally {
  rmSync(work, { recursive: true, force: true });
}

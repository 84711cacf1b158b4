// Runs the headless Neovim check (test/e2e/nvim.mjs). It fails, never skips, when nvim is missing.
import { describe, it, expect } from 'vitest';
import { spawnSync } from 'node:child_process';

describe('neovim', () => {
  it('gets diagnostics and a hover from the built server in headless Neovim', () => {
    const r = spawnSync(process.execPath, ['test/e2e/nvim.mjs'], { encoding: 'utf8', timeout: 120_000 });
    if (r.status !== 0) console.error(r.stdout, r.stderr);
    expect(r.stdout).toMatch(/nvim e2e: passed/);
    expect(r.status).toBe(0);
  }, 130_000);
});

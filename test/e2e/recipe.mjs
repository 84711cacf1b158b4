// The README's Neovim recipe: the first ```lua block of the "Neovim" section, with the server path
// filled in. The end-to-end test runs it as it stands, so the README and the test cannot drift apart.
import { readFileSync } from 'node:fs';

/** The placeholder path the README tells the user to replace. */
export const PLACEHOLDER = '/path/to/eigenspan/dist/server.js';

/** The recipe's Lua text from README.md, with `server` in place of the placeholder; throws when it is missing. */
export function readmeRecipe(readmePath, server) {
  const text = readFileSync(readmePath, 'utf8');
  const at = text.search(/^###? .*Neovim/m);
  if (at < 0) throw new Error('README.md has no Neovim section');
  const m = /```lua\n([\s\S]*?)```/.exec(text.slice(at));
  if (!m) throw new Error('the Neovim section of README.md has no ```lua block');
  if (!m[1].includes(PLACEHOLDER)) throw new Error(`the README's Neovim recipe does not name ${PLACEHOLDER}`);
  // A Lua string literal of the path (backslashes and quotes escaped).
  return m[1].split(`'${PLACEHOLDER}'`).join(`'${server.replace(/\\/g, '\\\\').replace(/'/g, "\\'")}'`);
}

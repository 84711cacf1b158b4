// Writes dist/cli-main.ID.cache (ID: the build id at the end of dist/cli-main.js), the V8 code cache of the command line's bundle (server/src/cli/loader.ts
// reads it): compiles dist/cli-main.js as the loader does, runs `expand --json` and the table on a few
// examples (a box, an oscillator, a finite well, a numerical potential) with the output dropped, and
// saves the code compiled so far. Run by scripts/build.mjs after bundling.
const { readFileSync, writeFileSync } = require('node:fs');
const { wrap } = require('node:module');
const { join } = require('node:path');
const { Script } = require('node:vm');

const dist = join(__dirname, '..', 'dist');
const file = join(dist, 'cli-main.js');
const source = readFileSync(file, 'utf8');
const id = /\/\/ eigenspan-build ([0-9a-f]+)\s*$/.exec(source.slice(-64))?.[1];
if (!id) throw new Error('dist/cli-main.js has no build id (scripts/build.mjs appends it)');
const script = new Script(wrap(source), { filename: file });
const m = { exports: {} };
script.runInThisContext().call(m.exports, m.exports, require, m, join(dist, 'cli.js'), dist);
const io = { out: () => {}, err: () => {}, isTTY: false };
for (const name of ['plucked-box', 'ion-trap-kick', 'gaas-well-packet', 'double-well-tunnelling']) {
  const path = join(__dirname, '..', 'examples', `${name}.qstate`);
  m.exports.run(['expand', path, '--json'], io);
  m.exports.run(['expand', path], io);
}
writeFileSync(join(dist, `cli-main.${id}.cache`), script.createCachedData());

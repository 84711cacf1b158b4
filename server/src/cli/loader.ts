/**
 * dist/cli.js, the command line's bin: loads the command line's bundle (dist/cli-main.js) through V8's
 * code cache. The build runs the bundle once on a few examples and saves the compiled code
 * (dist/cli-main.ID.cache, scripts/train-cli-cache.cjs), so a fresh process skips compiling the bundle
 * and the functions an analysis runs (docs/performance.md, start-up). V8 checks the cache against its
 * own version and flags and the source's length; the build id below pairs it with its own bundle. A
 * cache V8 rejects, or none, means an ordinary compile.
 * The bundle runs as this module, so `require.main === module` and `__filename` (the script a sweep's
 * worker threads start from) are this file's, as before.
 */
import { readFileSync } from 'node:fs';
import { wrap } from 'node:module';
import { join } from 'node:path';
import { Script } from 'node:vm';

const file = join(__dirname, 'cli-main.js');
const source = readFileSync(file, 'utf8');
/* V8 checks a cache against the source's length only, so the build ends the bundle with an id (a hash of
   its text) and names the cache by it: a bundle is never paired with another build's cache. */
const id = /\/\/ eigenspan-build ([0-9a-f]+)\s*$/.exec(source.slice(-64))?.[1];
let cachedData: Buffer | undefined;
try {
  cachedData = id === undefined ? undefined : readFileSync(join(__dirname, `cli-main.${id}.cache`));
} catch {
  cachedData = undefined; // no cache beside the bundle: compile as usual
}
const script = new Script(wrap(source), { filename: file, cachedData });
(script.runInThisContext() as (...args: unknown[]) => void).call(module.exports, module.exports, require, module, __filename, __dirname);

/**
 * dist/cli.js, the command line's bin: loads the command line's bundle (dist/cli-main.js) through V8's
 * code cache. The build runs the bundle once on a few examples and saves the compiled code
 * (dist/cli-main.cache, scripts/train-cli-cache.cjs), so a fresh process skips compiling the bundle
 * and the functions an analysis runs (docs/performance.md, start-up). Node checks the cache against
 * the source and its own version and flags; a cache it rejects, or none, means an ordinary compile.
 * The bundle runs as this module, so `require.main === module` and `__filename` (the script a sweep's
 * worker threads start from) are this file's, as before.
 */
import { readFileSync } from 'node:fs';
import { wrap } from 'node:module';
import { join } from 'node:path';
import { Script } from 'node:vm';

const file = join(__dirname, 'cli-main.js');
let cachedData: Buffer | undefined;
try {
  cachedData = readFileSync(join(__dirname, 'cli-main.cache'));
} catch {
  cachedData = undefined; // no cache beside the bundle: compile as usual
}
const script = new Script(wrap(readFileSync(file, 'utf8')), { filename: file, cachedData });
(script.runInThisContext() as (...args: unknown[]) => void).call(module.exports, module.exports, require, module, __filename, __dirname);

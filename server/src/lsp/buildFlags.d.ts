/**
 * Set by scripts/build.mjs (esbuild `define`): true only in the test build (dist/test/), whose worker
 * carries the test hooks (testHooks.ts); false in dist/ and in the packaged extension, where the
 * hooks and everything they run are removed as dead code.
 */
declare const EIGENSPAN_TEST_BUILD: boolean;

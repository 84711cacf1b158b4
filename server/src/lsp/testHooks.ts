/**
 * Test-only behaviour, compiled only into the test build (EIGENSPAN_TEST_BUILD, scripts/build.mjs) and
 * honoured there only when the environment variable `EIGENSPAN_TEST_HOOKS` is `1`. A file containing
 * the comment `# eigenspan-test: hang`, `# eigenspan-test: crash`, `# eigenspan-test: throw`,
 * `# eigenspan-test: oom` or `# eigenspan-test: slow MS` makes the worker loop forever, exit, throw
 * out of its job, allocate until its heap limit kills it, or spin for MS milliseconds while polling
 * its cancellation flag. This lets tests exercise the time budget, crash recovery and cooperative
 * cancellation without depending on how fast the engine happens to be.
 */

/** What a test hook asks for. */
export type TestHook = { kind: 'hang' } | { kind: 'crash' } | { kind: 'throw' } | { kind: 'oom' } | { kind: 'slow'; ms: number };

/** The exit code of a worker that crashes on purpose. */
const CRASH_EXIT_CODE = 3;

/** The hook requested by `text`, or null (always null unless the environment enables hooks). */
export function testHook(text: string): TestHook | null {
  if (process.env.EIGENSPAN_TEST_HOOKS !== '1') return null;
  const m = /#\s*eigenspan-test:\s*(hang|crash|throw|oom|slow\s+(\d+))/.exec(text);
  if (!m) return null;
  if (m[1] === 'hang') return { kind: 'hang' };
  if (m[1] === 'crash') return { kind: 'crash' };
  if (m[1] === 'throw') return { kind: 'throw' };
  if (m[1] === 'oom') return { kind: 'oom' };
  return { kind: 'slow', ms: Number(m[2]) };
}

/**
 * Runs the hook `text` asks for, in the worker, before job `id` is analysed. Returns true when the job
 * is over (a slow job that saw its cancellation flag); a hang never returns, a crash exits, a throw
 * throws and an out-of-memory never returns.
 */
export function runTestHook(text: string, id: number, cancelled: () => boolean): boolean {
  const hook = testHook(text);
  if (!hook) return false;
  // Printed on purpose: the server forwards worker output to its log, and tests wait for this line.
  console.log(`test hook ${hook.kind} for job ${id}`);
  if (hook.kind === 'crash') process.exit(CRASH_EXIT_CODE);
  if (hook.kind === 'throw') throw new Error('test hook: the engine threw');
  if (hook.kind === 'oom') {
    // Keep everything reachable until the worker's heap limit ends it.
    const hoard: number[][] = [];
    for (;;) hoard.push(new Array<number>(1 << 20).fill(hoard.length));
  }
  const until = performance.now() + (hook.kind === 'hang' ? Infinity : hook.ms);
  // A hang ignores the cancellation flag on purpose (a runaway); a slow job polls it.
  while (performance.now() < until) if (hook.kind === 'slow' && cancelled()) return true;
  return false;
}

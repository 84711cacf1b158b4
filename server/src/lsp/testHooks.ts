/**
 * Test-only behaviour, honoured only when the environment variable `EIGENSPAN_TEST_HOOKS` is `1`.
 * A file containing the comment `# eigenspan-test: hang`, `# eigenspan-test: crash`,
 * `# eigenspan-test: throw`, `# eigenspan-test: oom` or `# eigenspan-test: slow MS` makes the worker
 * loop forever, exit, throw out of its job, allocate until its heap limit kills it, or spin for MS
 * milliseconds while polling its cancellation flag. This lets tests exercise the time budget, crash recovery and
 * cooperative cancellation without depending on how fast the engine happens to be.
 */

/** What a test hook asks for. */
export type TestHook = { kind: 'hang' } | { kind: 'crash' } | { kind: 'throw' } | { kind: 'oom' } | { kind: 'slow'; ms: number };

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

/**
 * Reading one file named on the command line under the file rules (files.ts); refusals are usage errors.
 */
import { DEFAULT_LIMITS } from '../analysis/index';
import { escapeText } from './escape';
import { readBounded } from './files';
import { UsageError } from './options';

/** The text of `path`; a file over `maxFileBytes` bytes reaches the engine, which refuses it with its size (front.ts). */
export function readText(path: string, maxFileBytes = DEFAULT_LIMITS.maxFileBytes): string {
  // The read stops at four times the cap: a file somewhat over it gets the engine's finding with its size, a far larger one a usage error without reading it all.
  const read = readBounded(path, { maxBytes: maxFileBytes * 4 });
  if (!read.ok) throw new UsageError(`cannot read '${escapeText(path)}': ${read.refusal.message}`);
  return read.data.toString('utf8');
}

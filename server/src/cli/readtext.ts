/**
 * Reading one file named on the command line under the file rules (files.ts); refusals are usage errors.
 */
import { DEFAULT_LIMITS } from '../analysis/index';
import { escapeText } from './escape';
import { readBounded } from './files';
import { UsageError } from './options';

/** The text of `path`, at most `maxFileBytes` characters' worth of UTF-8. */
export function readText(path: string, maxFileBytes = DEFAULT_LIMITS.maxFileBytes): string {
  // Bytes, not characters: a UTF-8 file of maxFileBytes characters has at most four bytes a character.
  const read = readBounded(path, { maxBytes: maxFileBytes * 4 });
  if (!read.ok) throw new UsageError(`cannot read '${escapeText(path)}': ${read.refusal.message}`);
  return read.data.toString('utf8');
}

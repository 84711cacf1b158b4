/**
 * Writing a command's output to a file named by an option (`--out`, `--sarif`, `--junit`): an existing
 * file is never replaced unless `--force` is given, and even then only a regular file is (writing to a
 * FIFO would block, to a device would stream). Refusals are usage errors.
 */
import { existsSync, statSync, writeFileSync } from 'node:fs';
import { escapeText } from './escape';
import { UsageError } from './options';

/** Reads the path after an output option, refusing a missing one or another option in its place. */
export function outPathOption(option: string, value: string | undefined): string {
  if (value === undefined || value.startsWith('-')) throw new UsageError(`${option} needs a file path`);
  return value;
}

/** Refuses, before any work is done, an output path that may not be written. */
export function assertWritable(path: string, force: boolean): void {
  if (!force && existsSync(path)) throw new UsageError(`'${escapeText(path)}' exists; add --force to overwrite it`);
  if (existsSync(path) && !statSync(path).isFile()) throw new UsageError(`'${escapeText(path)}' is not a regular file`);
}

/** Writes `text` (or bytes) to `path` (text already escaped by the caller); a file that appeared meanwhile is not replaced without `force`. */
export function writeOutput(path: string, text: string | Uint8Array, force: boolean): void {
  try {
    writeFileSync(path, text, { flag: force ? 'w' : 'wx' });
  } catch (e) {
    const code = (e as NodeJS.ErrnoException).code;
    const where = escapeText(path);
    throw new UsageError(code === 'EEXIST' ? `'${where}' exists; add --force to overwrite it` : `cannot write '${where}': ${code ?? 'error'}`);
  }
}

/**
 * The front of both pipelines: the file's size in bytes against its cap, the parse, and the cap on
 * the number of statements. Cheap and pure; never throws.
 */
import { diagnostic, type EngineDiagnostic } from '../language/catalogue';
import type { QFile } from '../language/ast';
import { parse } from '../language/parser';
import type { Limits } from './options';
import { raiseHint } from '../shared/limits';

/**
 * Bytes of the UTF-8 encoding of `text`: 1 to 3 per UTF-16 code unit, 4 per surrogate pair (a lone
 * surrogate is written as U+FFFD, 3 bytes), as the Encoding Standard's UTF-8 encoder does.
 */
function utf8Length(text: string): number {
  let bytes = 0;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c < 0x80) bytes += 1;
    else if (c < 0x800) bytes += 2;
    else if (c >= 0xd800 && c <= 0xdbff && i + 1 < text.length && (text.charCodeAt(i + 1) & 0xfc00) === 0xdc00) {
      bytes += 4;
      i++;
    } else bytes += 3;
  }
  return bytes;
}

/** A parsed file within its caps, with the findings of the parse and the caps. */
export interface ReadFile {
  file: QFile;
  diagnostics: EngineDiagnostic[];
  /** False when the file is over its byte cap and was not parsed. */
  parsed: boolean;
}

/** Checks the byte cap, parses, and keeps the first `maxStatements` statements. */
export function readFile(text: string, limits: Limits): ReadFile {
  const diagnostics: EngineDiagnostic[] = [];
  const bytes = utf8Length(text);
  if (bytes > limits.maxFileBytes) {
    diagnostics.push(diagnostic('limits', 0, Math.min(text.length, 1), `The file is ${bytes} bytes long, above the limit of ${limits.maxFileBytes} bytes; it is not analysed.${raiseHint('maxFileBytes')}`));
    return { file: { text, statements: [] }, diagnostics, parsed: false };
  }
  const parsed = parse(text);
  diagnostics.push(...parsed.diagnostics);
  let file = parsed.file;
  if (file.statements.length > limits.maxStatements) {
    const s = file.statements[limits.maxStatements]!;
    diagnostics.push(diagnostic('limits', s.span.start, s.span.end, `The file has ${file.statements.length} statements, above the limit of ${limits.maxStatements}; the rest are ignored.${raiseHint('maxStatements')}`));
    file = { ...file, statements: file.statements.slice(0, limits.maxStatements) };
  }
  return { file, diagnostics, parsed: true };
}

/** Diagnostics in document order (a stable sort: findings on one range keep the order they were made in). */
export function sortDiagnostics(d: EngineDiagnostic[]): EngineDiagnostic[] {
  return d.sort((a, b) => a.start - b.start || a.end - b.end);
}

/** The finding for an error the engine did not expect (a bug), on the file's first character. */
export function internalError(err: unknown, text: string): EngineDiagnostic {
  const msg = err instanceof Error ? err.message : String(err);
  return diagnostic('evaluation', 0, Math.min(1, text.length), `The analysis stopped on an internal error (${msg}); please report this file.`);
}

/**
 * Safe file access for files from untrusted repositories: one home for the rules, shared by the command
 * line, the language server and the data files a `.qstate` file names.
 *
 * The rules (docs/format.md, "Files and folders"):
 * - Only regular files are read. Devices, FIFOs and sockets are refused before they are opened, and the
 *   opened file is checked again (fstat), so nothing blocks and nothing streams forever.
 * - Reads are capped by the bytes actually read, never by what `stat` says (a device says 0).
 * - Walking a folder, symbolic links are followed only when their real path lies inside the real path of
 *   the folder given; each real path (folder or file) is visited once, so links back up the tree never
 *   loop and never check a file twice. Links out of the tree, dangling links and entries that cannot be
 *   examined are refused.
 * - A path named inside a tree (a data file) must be relative, must stay inside the tree after `..` and
 *   links are resolved.
 * - Everything refused is returned as a `Refusal` (data, never thrown); the caller reports each as one
 *   warning and carries on.
 */
import { closeSync, constants, fstatSync, lstatSync, openSync, readdirSync, readSync, realpathSync, statSync, type Stats } from 'node:fs';
import { isAbsolute, join, relative, resolve, sep } from 'node:path';

/** Why a path was refused. */
export type RefusalReason =
  | 'missing'
  | 'not-regular'
  | 'outside'
  | 'dangling'
  | 'unlistable'
  | 'unexaminable'
  | 'unreadable'
  | 'too-large'
  | 'folder'
  | 'absolute';

/** A path the rules refused, with a sentence saying why (no trailing period; the caller words the line). */
export interface Refusal {
  path: string;
  reason: RefusalReason;
  message: string;
  /** The size in bytes, when known (`too-large` after fstat; absent when only the bytes read told). */
  size?: number;
  /** The system error code (`unreadable`), such as EACCES. */
  errno?: string;
}

/** Options of `walkTree`. */
export interface WalkOptions {
  /** Which file names are wanted (for example names ending in `.qstate`). */
  wanted: (name: string) => boolean;
  /** Folder or file names never entered nor reported (default: names starting with `.` and `node_modules`). */
  skip?: (name: string) => boolean;
}

/** What `walkTree` found. */
export interface WalkResult {
  /** Wanted regular files, in walk order (sorted names, depth first), as paths under the root given. */
  files: string[];
  /** Entries refused under the rules. */
  refused: Refusal[];
}

const defaultSkip = (name: string): boolean => name === 'node_modules' || name.startsWith('.');

/** True when `inner` is `outer` or lies below it (both real, absolute paths). */
export function isInside(outer: string, inner: string): boolean {
  if (inner === outer) return true;
  const base = outer.endsWith(sep) ? outer : outer + sep;
  return inner.startsWith(base);
}

/** The real path of `p`, or null when it cannot be resolved (missing, dangling, a loop of links). */
function realOrNull(p: string): string | null {
  try {
    return realpathSync.native(p);
  } catch {
    return null;
  }
}

function kindOf(st: Stats): string {
  if (st.isFIFO()) return 'a FIFO';
  if (st.isCharacterDevice() || st.isBlockDevice()) return 'a device';
  if (st.isSocket()) return 'a socket';
  return 'not a regular file';
}

/**
 * Walks `root` (a folder or a single file) under the rules above. A root that is a file (or a link to
 * one) is taken as given when it is a regular file; a folder root is walked with links confined to it.
 */
export function walkTree(root: string, options: WalkOptions): WalkResult {
  const skip = options.skip ?? defaultSkip;
  const out: WalkResult = { files: [], refused: [] };
  let st: Stats;
  try {
    st = statSync(root);
  } catch {
    const dangling = lstatOrNull(root)?.isSymbolicLink() === true;
    out.refused.push({ path: root, reason: dangling ? 'dangling' : 'missing', message: dangling ? 'a broken link' : 'no such file or folder' });
    return out;
  }
  if (!st.isDirectory()) {
    if (st.isFile()) out.files.push(root);
    else out.refused.push({ path: root, reason: 'not-regular', message: `${kindOf(st)}, not a regular file; it is not read` });
    return out;
  }
  const realRoot = realOrNull(root) ?? resolve(root);
  const seen = new Set<string>([identity(st)]);
  // An explicit stack of folders being listed instead of recursion: a deep tree cannot overflow the
  // call stack. Entries are taken in name order and folders entered where they come (depth first).
  const stack: { dir: string; names: string[]; next: number }[] = [];
  const enter = (dir: string): void => {
    try {
      stack.push({ dir, names: readdirSync(dir).sort(), next: 0 });
    } catch {
      out.refused.push({ path: dir, reason: 'unlistable', message: 'the folder cannot be listed' });
    }
  };
  enter(root);
  while (stack.length > 0) {
    const top = stack[stack.length - 1]!;
    if (top.next >= top.names.length) {
      stack.pop();
      continue;
    }
    const name = top.names[top.next++]!;
    if (skip(name)) continue;
    const p = join(top.dir, name);
    const entry = visitEntry(p, name, realRoot, seen, options.wanted);
    if (entry === 'folder') enter(p);
    else if (entry === 'file') out.files.push(p);
    else if (entry !== null) out.refused.push(entry);
  }
  return out;
}

/** Device and inode: one key per real folder or file, whatever path (link, bind mount, hard link) reaches it. */
function identity(st: Stats): string {
  return `${st.dev}:${st.ino}`;
}

function lstatOrNull(p: string): Stats | null {
  try {
    return lstatSync(p);
  } catch {
    return null;
  }
}

/** Classifies one folder entry: a folder to enter, a wanted file, a refusal, or null (ignored). */
function visitEntry(p: string, name: string, realRoot: string, seen: Set<string>, wanted: (name: string) => boolean): 'folder' | 'file' | Refusal | null {
  const l = lstatOrNull(p);
  if (l === null) return wanted(name) ? { path: p, reason: 'unexaminable', message: 'an entry that cannot be examined' } : null;
  let st: Stats = l;
  if (l.isSymbolicLink()) {
    const real = realOrNull(p);
    if (real === null) return wanted(name) ? { path: p, reason: 'dangling', message: 'a broken link' } : null;
    let target: Stats;
    try {
      target = statSync(real);
    } catch {
      return wanted(name) ? { path: p, reason: 'unexaminable', message: 'a link whose target cannot be examined' } : null;
    }
    if (!target.isDirectory() && !wanted(name)) return null;
    if (!isInside(realRoot, real)) {
      const what = target.isDirectory() ? 'folder' : 'file';
      return { path: p, reason: 'outside', message: `a link to a ${what} outside the folder being checked; it is not followed` };
    }
    st = target;
  }
  if (!st.isDirectory() && !wanted(name)) return null;
  // A folder or file already visited (a link back up the tree, a second link to one file) is skipped.
  if (st.isDirectory() || st.isFile()) {
    const key = identity(st);
    if (seen.has(key)) return null;
    seen.add(key);
  }
  if (st.isDirectory()) return 'folder';
  if (!st.isFile()) return { path: p, reason: 'not-regular', message: `${kindOf(st)}, not a regular file; it is not read` };
  return 'file';
}

/** Options of `readBounded`. */
export interface ReadOptions {
  /** The most bytes accepted; a file with more is refused as `too-large` after reading at most one byte more. */
  maxBytes: number;
  /** When given, the file's real path must lie inside this folder's real path. */
  inside?: string;
}

/** What `readBounded` returns: the bytes, or why not. */
export type ReadOutcome = { ok: true; data: Buffer } | { ok: false; refusal: Refusal };

/**
 * Reads a regular file, never more than `maxBytes + 1` bytes, without blocking: the type is checked
 * before opening (so a FIFO or a device is never opened), the file is opened non-blocking, and the open
 * file is checked again, so a path swapped in between is still refused.
 */
export function readBounded(path: string, options: ReadOptions): ReadOutcome {
  const refuse = (reason: RefusalReason, message: string, extra: Partial<Refusal> = {}): ReadOutcome => ({ ok: false, refusal: { path, reason, message, ...extra } });
  const real = realOrNull(path);
  if (real === null) return lstatOrNull(path)?.isSymbolicLink() === true ? refuse('dangling', 'a broken link') : refuse('missing', 'no such file');
  if (options.inside !== undefined && !isInside(realOrNull(options.inside) ?? resolve(options.inside), real)) {
    return refuse('outside', 'outside the folder it may be read from');
  }
  let st: Stats;
  try {
    st = statSync(real);
  } catch (e) {
    return refuse('unreadable', `it cannot be examined (${errCode(e)})`, { errno: errCode(e) });
  }
  if (st.isDirectory()) return refuse('folder', 'a folder, not a file');
  if (!st.isFile()) return refuse('not-regular', `${kindOf(st)}, not a regular file; it is not read`);
  let fd: number;
  try {
    fd = openSync(real, constants.O_RDONLY | constants.O_NONBLOCK | (constants.O_NOFOLLOW ?? 0));
  } catch (e) {
    return refuse('unreadable', `it cannot be read (${errCode(e)})`, { errno: errCode(e) });
  }
  try {
    const opened = fstatSync(fd);
    if (!opened.isFile()) return refuse('not-regular', `${kindOf(opened)}, not a regular file; it is not read`);
    if (opened.size > options.maxBytes) return refuse('too-large', `it is ${opened.size} bytes, above the limit of ${options.maxBytes}`, { size: opened.size });
    return readCapped(fd, options.maxBytes, refuse);
  } catch (e) {
    return refuse('unreadable', `it cannot be read (${errCode(e)})`, { errno: errCode(e) });
  } finally {
    closeSync(fd);
  }
}

/** Reads from `fd` until end of file or one byte past `maxBytes`. */
function readCapped(fd: number, maxBytes: number, refuse: (r: RefusalReason, m: string) => ReadOutcome): ReadOutcome {
  const buf = Buffer.alloc(Math.min(maxBytes + 1, 1 << 16));
  const chunks: Buffer[] = [];
  let total = 0;
  for (;;) {
    const want = Math.min(buf.length, maxBytes + 1 - total);
    const n = readSync(fd, buf, 0, want, null);
    if (n === 0) break;
    chunks.push(Buffer.from(buf.subarray(0, n)));
    total += n;
    if (total > maxBytes) return refuse('too-large', `it has more than ${maxBytes} bytes`);
  }
  return { ok: true, data: Buffer.concat(chunks, total) };
}

/**
 * Resolves `name`, a path written inside a file of folder `root`, under the tree rules: it must be
 * relative and stay inside `root` once `..` and links are resolved. Returns the path or the refusal.
 * `base`, the folder the path is relative to, is `root` unless given (the editor resolves a data path
 * from the document's folder and confines it to the workspace folder).
 */
export function resolveInTree(root: string, name: string, base: string = root): { ok: true; path: string } | { ok: false; refusal: Refusal } {
  if (isAbsolute(name)) return { ok: false, refusal: { path: name, reason: 'absolute', message: 'an absolute path; only paths relative to the folder are read' } };
  const joined = resolve(base, name);
  const rel = relative(resolve(root), joined);
  if (rel === '..' || rel.startsWith('..' + sep) || isAbsolute(rel)) return { ok: false, refusal: { path: name, reason: 'outside', message: 'a path out of the folder' } };
  const realRoot = realOrNull(root) ?? resolve(root);
  const real = realOrNull(joined);
  if (real !== null && !isInside(realRoot, real)) return { ok: false, refusal: { path: name, reason: 'outside', message: 'a link out of the folder' } };
  return { ok: true, path: joined };
}

function errCode(e: unknown): string {
  return (e as NodeJS.ErrnoException).code ?? 'error';
}

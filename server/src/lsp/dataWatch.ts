/**
 * The data files of open documents in the editor (`state samples("PATH")`): read on the main thread
 * when an analysis starts, under the tree rules of cli/files.ts with the document's workspace folder
 * as the tree (the document's own folder when it lies in none), only in a trusted workspace; and
 * watched through the client (`workspace/didChangeWatchedFiles`, registered dynamically), so a data
 * file that changes, appears or goes away analyses the documents that use it again.
 */
import { dirname, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { DidChangeWatchedFilesNotification, type Connection, type DidChangeWatchedFilesParams, type Disposable, type FileSystemWatcher, type InitializeParams } from 'vscode-languageserver';
import type { DataFile } from '../analysis/options';
import { DATA_MAX_BYTES, dataPathsOf } from '../analysis/samples';
import { isInside, readBounded, resolveInTree } from '../cli/files';
import type { Session } from './session';

/** Options of `DataFiles`. */
export interface DataFilesOptions {
  connection: Connection;
  session: Session;
  /** Documents whose data files changed, to be analysed again. */
  changed: (uris: string[]) => void;
  logError: (message: string) => void;
}

/** Glob characters, escaped one by one so a file name is matched literally. */
function literalGlob(text: string): string {
  return text.replace(/[*?[\]{}]/g, (c) => `[${c}]`);
}

/** Reads, remembers and watches the data files of the open documents. */
export class DataFiles {
  private roots: string[] = [];
  /** Per document: the resolved paths of the data files it named in its last analysis. */
  private readonly used = new Map<string, Set<string>>();
  private registered = '';
  private registration: Promise<Disposable | null> = Promise.resolve(null);

  constructor(private readonly o: DataFilesOptions) {}

  /** Takes the workspace folders of `initialize`. */
  initialize(params: InitializeParams): void {
    const uris = params.workspaceFolders?.map((f) => f.uri) ?? (params.rootUri ? [params.rootUri] : []);
    this.roots = uris.flatMap((u) => {
      try {
        return [resolve(fileURLToPath(u))];
      } catch {
        return [];
      }
    });
  }

  /** The data files `text` (document `uri`) names, as the engine takes them. */
  read(uri: string, text: string): [string, DataFile][] {
    const names = [...new Set(dataPathsOf(text).map((p) => p.path))];
    const out: [string, DataFile][] = [];
    const paths = new Set<string>();
    let doc: string | null = null;
    try {
      doc = uri.startsWith('file:') ? fileURLToPath(uri) : null;
    } catch {
      doc = null;
    }
    for (const name of names) {
      if (!this.o.session.evaluate) out.push([name, { refused: 'data files are read only in a trusted workspace' }]);
      else if (doc === null) out.push([name, { refused: 'the document is not a file on disk, so it has no folder to read from' }]);
      else out.push([name, this.readSafely(doc, name, paths)]);
    }
    this.remember(uri, paths);
    return out;
  }

  /** `readOne`, with anything unexpected turned into a refusal: the scheduler calls this and must not throw. */
  private readSafely(doc: string, name: string, paths: Set<string>): DataFile {
    try {
      return this.readOne(doc, name, paths);
    } catch (e) {
      this.o.logError(`reading the data file ${name} failed: ${String(e)}`);
      return { refused: 'it could not be read' };
    }
  }

  private readOne(doc: string, name: string, paths: Set<string>): DataFile {
    const base = dirname(doc);
    const root = this.roots.filter((r) => isInside(r, base)).sort((a, b) => b.length - a.length)[0] ?? base;
    const where = resolveInTree(root, name, base);
    if (!where.ok) return { refused: `${where.refusal.message}; data files are read only from the workspace folder` };
    // Watched even when missing, so creating it analyses the document again.
    paths.add(where.path);
    const read = readBounded(where.path, { maxBytes: DATA_MAX_BYTES, inside: root });
    return read.ok ? { text: read.data.toString('utf8') } : { refused: read.refusal.message };
  }

  /** The document was closed. */
  forget(uri: string): void {
    if (this.used.delete(uri)) this.watch();
  }

  /** Files changed on disk: the documents using them are analysed again. */
  onChange(params: DidChangeWatchedFilesParams): void {
    const hit = new Set<string>();
    for (const c of params.changes ?? []) {
      let p: string;
      try {
        p = resolve(fileURLToPath(c.uri));
      } catch {
        continue;
      }
      for (const [uri, set] of this.used) if (set.has(p)) hit.add(uri);
    }
    if (hit.size > 0) this.o.changed([...hit]);
  }

  private remember(uri: string, paths: Set<string>): void {
    if (paths.size === 0) this.used.delete(uri);
    else this.used.set(uri, paths);
    this.watch();
  }

  /** Registers one watcher per data file in use (replacing the previous registration) when the set changed. */
  private watch(): void {
    const caps = this.o.session.caps.workspace?.didChangeWatchedFiles;
    if (!caps?.dynamicRegistration) return;
    const all = [...new Set([...this.used.values()].flatMap((s) => [...s]))].sort();
    const key = JSON.stringify(all);
    if (key === this.registered) return;
    this.registered = key;
    const relative = caps.relativePatternSupport === true;
    const watchers: FileSystemWatcher[] = all.map((p) => ({
      globPattern: relative ? { baseUri: pathToFileURL(dirname(p)).href, pattern: literalGlob(p.slice(dirname(p).length + 1)) } : literalGlob(p.split('\\').join('/')),
    }));
    const { connection, logError } = this.o;
    // One registration at a time: the previous one is disposed before the next is made.
    this.registration = this.registration.then(async (previous) => {
      try {
        previous?.dispose();
        return watchers.length === 0 ? null : await connection.client.register(DidChangeWatchedFilesNotification.type, { watchers });
      } catch (e) {
        logError(`watching data files failed: ${String(e)}`);
        return null;
      }
    });
  }
}

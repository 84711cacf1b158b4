/**
 * The latest analysis of each open document, as pushed by the server with `eigenspan/result`.
 * The latest document version wins: an older version arriving late is ignored.
 */
import type { ResultParams } from '../../server/src/protocol';
import { isPanelResult, type PanelResult } from './messages';

/** One stored result. */
export interface StoredResult {
  uri: string;
  version: number;
  result: PanelResult;
}

/** Holds results by document URI (as text) and tells listeners when one changes. */
export class ResultStore {
  private readonly byUri = new Map<string, StoredResult>();
  private readonly listeners = new Set<(uri: string) => void>();

  /** Stores a notification's payload; returns false (and stores nothing) when it is malformed or stale. */
  set(params: unknown): boolean {
    if (typeof params !== 'object' || params === null) return false;
    const p = params as Partial<ResultParams>;
    if (typeof p.uri !== 'string' || typeof p.version !== 'number' || !isPanelResult(p.result)) return false;
    const old = this.byUri.get(p.uri);
    if (old && old.version > p.version) return false;
    this.byUri.set(p.uri, { uri: p.uri, version: p.version, result: p.result });
    for (const l of this.listeners) l(p.uri);
    return true;
  }

  get(uri: string): StoredResult | undefined {
    return this.byUri.get(uri);
  }

  delete(uri: string): void {
    this.byUri.delete(uri);
  }

  /** Registers a listener; returns a function that removes it. */
  onChange(listener: (uri: string) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }
}

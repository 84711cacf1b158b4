/**
 * The sweeps of the open documents on the extension side, from the server's `eigenspan/sweepPoint`
 * and `eigenspan/sweepResult` notifications (server/src/lsp/sweepMessages.ts): each point is kept
 * (so a panel opened part way gets the points so far) and forwarded to listeners as the panel's
 * message. A newer version of a document starts its sweep afresh; an older one arriving late is ignored.
 */
import type { SweepResult } from '../../server/src/analysis/sweep/types';
import { addPoint, isSweepPoint, isSweepResult, liveResult, startLive, type LiveSweep, type SweepFrame } from './liveSweep';
import type { SweepHostMessage } from './messages';

interface Held {
  version: number;
  live: LiveSweep | null;
  final: SweepResult | null;
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null;

/** Holds the latest sweep of each document and tells listeners what to forward to the panel. */
export class SweepStore {
  private readonly byUri = new Map<string, Held>();
  private readonly listeners = new Set<(uri: string, msg: SweepHostMessage) => void>();

  /** Takes an `eigenspan/sweepPoint` payload; `frame` reads the document's sweep lines. False when malformed or stale. */
  point(params: unknown, frame: (uri: string) => SweepFrame): boolean {
    if (!isObj(params) || typeof params.uri !== 'string' || typeof params.version !== 'number' || !isSweepPoint(params.point)) return false;
    const { uri, version, point } = params as { uri: string; version: number; point: Parameters<typeof addPoint>[1] };
    const finished = typeof params.finished === 'number' ? params.finished : 0;
    const total = typeof params.total === 'number' && params.total >= 1 ? params.total : 1;
    const held = this.byUri.get(uri);
    if (held && held.version > version) return false;
    let h = held;
    if (!h || h.version < version || !h.live) {
      h = { version, live: startLive(frame(uri), total), final: h && h.version === version ? h.final : null };
      this.byUri.set(uri, h);
    }
    addPoint(h.live!, point, finished, total);
    this.emit(uri, { type: 'sweepPoint', uri, version, finished, total, point, frame: h.live!.frame });
    return true;
  }

  /** Takes an `eigenspan/sweepResult` payload (`sweep` null: the document has no valid sweep). */
  result(params: unknown): boolean {
    if (!isObj(params) || typeof params.uri !== 'string' || typeof params.version !== 'number') return false;
    if (!(params.sweep === null || isSweepResult(params.sweep))) return false;
    const { uri, version } = params as { uri: string; version: number };
    const held = this.byUri.get(uri);
    if (held && held.version > version) return false;
    const sweep = params.sweep as SweepResult | null;
    this.byUri.set(uri, { version, live: null, final: sweep });
    this.emit(uri, { type: 'sweep', uri, version, sweep });
    return true;
  }

  /** The panel's message for the document's sweep as it stands (the points so far while it runs), or null without one. */
  snapshot(uri: string): Extract<SweepHostMessage, { type: 'sweep' }> | null {
    const h = this.byUri.get(uri);
    if (!h) return null;
    const sweep = h.live ? (liveResult(h.live) ?? h.final) : h.final;
    return { type: 'sweep', uri, version: h.version, sweep };
  }

  delete(uri: string): void {
    this.byUri.delete(uri);
  }

  /** Registers a listener; returns a function that removes it. */
  onMessage(listener: (uri: string, msg: SweepHostMessage) => void): () => void {
    this.listeners.add(listener);
    return () => this.listeners.delete(listener);
  }

  private emit(uri: string, msg: SweepHostMessage): void {
    for (const l of this.listeners) l(uri, msg);
  }
}

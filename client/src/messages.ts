/**
 * Run-time checks for every message that crosses the webview boundary, in both directions.
 * Data from the other side is untrusted: a message that does not have exactly the expected shape is
 * dropped (the checks return null) rather than half-used. Pure; shared by the extension and the panel.
 */
import type { HostToPanel, PanelSettingsMessage, PanelToHost } from '../../server/src/protocol';
import type { SweepPoint, SweepResult } from '../../server/src/analysis/sweep/types';
import { isSweepFrame, isSweepPoint, isSweepResult, type SweepFrame } from './liveSweep';

/** The result payload the panel draws (the analysis without its syntax tree). */
export type PanelResult = Extract<HostToPanel, { type: 'result' }>['result'];

/** Host to panel: the `eigenspan.plotScale` setting, or 'auto' when the user has not set it (the protocol's message). */
export type PanelSettings = PanelSettingsMessage;

/**
 * Host to panel, for the sweep view: a document's sweep (running, finished or gone: null), one point
 * as it arrives (with the frame of its sweep, read off the document), and one point's full result
 * for the state view (null with the reason when it could not be had).
 */
export type SweepHostMessage =
  | { type: 'sweep'; uri: string; version: number; sweep: SweepResult | null }
  | { type: 'sweepPoint'; uri: string; version: number; finished: number; total: number; point: SweepPoint; frame: SweepFrame }
  | { type: 'pointResult'; uri: string; at: number[]; result: PanelResult | null; reason: string | null };

/** Every message the host may send to the panel. */
export type HostMessage = HostToPanel | PanelSettings | SweepHostMessage;

/** Every message the panel may send to the host: the protocol's, and the pick of a sweep point for the state view. */
export type PanelMessage = PanelToHost | { type: 'pickPoint'; at: number[] };

type Obj = Record<string, unknown>;

const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const isStr = (v: unknown): v is string => typeof v === 'string';
/** JSON turns NaN and infinities into null, so a number slot may hold null. */
const isNum = (v: unknown): v is number | null => v === null || (typeof v === 'number' && !Number.isNaN(v));
const isNumArr = (v: unknown, max = 1 << 20): v is (number | null)[] =>
  Array.isArray(v) && v.length <= max && v.every(isNum);
const isOptNum = (v: unknown): boolean => v === undefined || isNum(v);
const isStrOrNull = (v: unknown): boolean => v === null || isStr(v);

const SEVERITIES = new Set(['error', 'warning', 'info']);
const KINDS = new Set(['box', 'well', 'oscillator', 'potential']);
const PARITIES = new Set(['even', 'odd', 'mixed']);
const DECAY = new Set(['jump', 'kink', 'smooth', 'algebraic', 'unknown']);
const THEMES = new Set(['light', 'dark', 'high-contrast', 'high-contrast-light']);

function isLevel(v: unknown): boolean {
  return isObj(v) && isNum(v.n) && isNum(v.energy) && isNum(v.re) && isNum(v.im) && isNum(v.weight) && isOptNum(v.uncertainty);
}

function isDiagnostic(v: unknown): boolean {
  return isObj(v) && isNum(v.start) && isNum(v.end) && isStr(v.severity) && SEVERITIES.has(v.severity) && isStr(v.code) && isStr(v.message);
}

function isMatrix(v: unknown, rows: number, cols: number): boolean {
  return Array.isArray(v) && v.length <= rows && v.every((r) => isNumArr(r, cols));
}

function isSamples(v: unknown): boolean {
  if (v === null) return true;
  if (!isObj(v)) return false;
  const n = Array.isArray(v.x) ? v.x.length : -1;
  const same = (a: unknown) => isNumArr(a) && a.length === n;
  const walls = v.walls === null || (Array.isArray(v.walls) && v.walls.length === 2 && v.walls.every(isNum));
  const phi = isMatrix(v.phi, 10_000, n) && (v.phi as unknown[][]).every((r) => r.length === n);
  return isNumArr(v.x) && same(v.re) && same(v.im) && same(v.potential) && phi && walls && isDataPoints(v.data);
}

/** The samples of a sampled state, when present: three number arrays of one length. */
function isDataPoints(v: unknown): boolean {
  if (v === undefined) return true;
  if (!isObj(v) || !Array.isArray(v.x)) return false;
  const n = v.x.length;
  return isNumArr(v.x) && isNumArr(v.re) && v.re.length === n && isNumArr(v.im) && v.im.length === n;
}

function isEvolution(v: unknown): boolean {
  if (v === null) return true;
  if (!isObj(v)) return false;
  const n = Array.isArray(v.times) ? v.times.length : -1;
  const same = (a: unknown) => isNumArr(a) && a.length === n;
  const density = v.density === undefined || (isMatrix(v.density, 100_000, 1 << 20) && (v.density as unknown[]).length === n);
  // The survival on its own fine grid (`survivalTimes`), either as `survivalFine` or with `survival` itself on that grid.
  const fine = v.survivalTimes === undefined || (isNumArr(v.survivalTimes) && (v.survivalFine === undefined || (isNumArr(v.survivalFine) && v.survivalFine.length === v.survivalTimes.length)));
  const m = Array.isArray(v.survivalTimes) ? v.survivalTimes.length : -2;
  const survival = isNumArr(v.survival) && (v.survival.length === n || v.survival.length === m);
  return isNumArr(v.times) && same(v.meanX) && same(v.meanP) && survival && fine && isNum(v.revival) && density;
}

/** True when `v` has the shape of an analysis result as sent to the panel. */
export function isPanelResult(v: unknown): v is PanelResult {
  if (!isObj(v)) return false;
  if (!Array.isArray(v.levels) || !v.levels.every(isLevel)) return false;
  if (!Array.isArray(v.diagnostics) || !v.diagnostics.every(isDiagnostic)) return false;
  const u = v.units;
  if (!isObj(u) || !isStrOrNull(u.length) || !isStrOrNull(u.energy) || !isStrOrNull(u.time)) return false;
  const s = v.system;
  if (s !== null && !(isObj(s) && isStr(s.kind) && KINDS.has(s.kind) && isNumArr(s.energies) && isNum(s.center))) return false;
  if (!isNum(v.norm) || !isNum(v.captured) || !isNum(v.levelsFor999)) return false;
  const e = v.energy;
  if (e !== null && !(isObj(e) && isNum(e.mean) && isNum(e.spread))) return false;
  if (v.parity !== null && !(isStr(v.parity) && PARITIES.has(v.parity))) return false;
  if (!isOptNum(v.continuum) || !isOptNum(v.meanQuantumNumber)) return false;
  const d = v.decay;
  if (d !== null && !(isObj(d) && isNum(d.exponent) && isStr(d.classification) && DECAY.has(d.classification) && isNum(d.at))) return false;
  return isEvolution(v.evolution) && isSamples(v.samples) && (v.sweep === undefined || isSweepResult(v.sweep));
}

/**
 * Checks a message arriving in the panel. Returns it typed, or null when it must be ignored.
 */
export function parseHostMessage(v: unknown): HostMessage | null {
  if (!isObj(v) || !isStr(v.type)) return null;
  switch (v.type) {
    case 'result':
      if (!isStr(v.uri) || typeof v.version !== 'number' || !isStr(v.fileName) || !isPanelResult(v.result)) return null;
      if (v.diagnosticLines !== undefined && !(isNumArr(v.diagnosticLines) && v.diagnosticLines.length === v.result.diagnostics.length)) return null;
      return {
        type: 'result',
        uri: v.uri,
        version: v.version,
        fileName: v.fileName,
        result: v.result,
        ...(v.diagnosticLines !== undefined ? { diagnosticLines: v.diagnosticLines as number[] } : {}),
      };
    case 'theme':
      return isStr(v.kind) && THEMES.has(v.kind) ? { type: 'theme', kind: v.kind as 'light' } : null;
    case 'empty':
      return isStr(v.reason) ? { type: 'empty', reason: v.reason } : null;
    case 'settings':
      return v.plotScale === 'linear' || v.plotScale === 'log' || v.plotScale === 'auto' ? { type: 'settings', plotScale: v.plotScale } : null;
    default:
      return parseSweepMessage(v);
  }
}

/** The sweep messages of `SweepHostMessage`, checked like the others. */
function parseSweepMessage(v: Obj): SweepHostMessage | null {
  if (!isStr(v.uri)) return null;
  const version = typeof v.version === 'number' && Number.isInteger(v.version) ? v.version : null;
  switch (v.type) {
    case 'sweep':
      return version !== null && (v.sweep === null || isSweepResult(v.sweep)) ? { type: 'sweep', uri: v.uri, version, sweep: v.sweep } : null;
    case 'sweepPoint': {
      const counts = typeof v.finished === 'number' && typeof v.total === 'number' && v.finished >= 0 && v.total >= 1;
      if (version === null || !counts || !isSweepPoint(v.point) || !isSweepFrame(v.frame)) return null;
      return { type: 'sweepPoint', uri: v.uri, version, finished: v.finished as number, total: v.total as number, point: v.point, frame: v.frame };
    }
    case 'pointResult': {
      const at = Array.isArray(v.at) && v.at.length <= 2 && v.at.every((x) => typeof x === 'number' && Number.isFinite(x));
      if (!at || !(v.result === null || isPanelResult(v.result)) || !(v.reason === null || isStr(v.reason))) return null;
      return { type: 'pointResult', uri: v.uri, at: v.at as number[], result: v.result as PanelResult | null, reason: v.reason };
    }
    default:
      return null;
  }
}

/** Largest export the host accepts from the panel (a PNG data URL of a large plot fits well within). */
export const MAX_EXPORT_CHARS = 32 * 1024 * 1024;

/**
 * Checks a message arriving in the extension host from the panel. Returns it typed, or null.
 */
export function parsePanelMessage(v: unknown): PanelMessage | null {
  if (!isObj(v) || !isStr(v.type)) return null;
  switch (v.type) {
    case 'ready':
      return { type: 'ready' };
    case 'export': {
      if (v.format !== 'png' && v.format !== 'svg') return null;
      if (!isStr(v.view) || !/^[a-z]{1,20}$/.test(v.view) || !isStr(v.data) || v.data.length > MAX_EXPORT_CHARS) return null;
      if (v.format === 'png' && !v.data.startsWith('data:image/png;base64,')) return null;
      if (v.format === 'svg' && !v.data.trimStart().startsWith('<svg')) return null;
      return { type: 'export', format: v.format, view: v.view, data: v.data };
    }
    case 'reveal':
      return typeof v.line === 'number' && Number.isInteger(v.line) && v.line >= 0 ? { type: 'reveal', line: v.line } : null;
    case 'pickPoint':
      return Array.isArray(v.at) && v.at.length >= 1 && v.at.length <= 2 && v.at.every((x) => typeof x === 'number' && Number.isFinite(x)) ? { type: 'pickPoint', at: v.at as number[] } : null;
    default:
      return null;
  }
}

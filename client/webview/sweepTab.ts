/**
 * The panel's sweep view and its link to the state view: the document's sweep as the host forwards
 * it (a running sweep grows point by point; a finished one replaces it), the quantity chooser, the
 * status line, and the sweep point picked for the state view (asked of the host, shown with a banner
 * that names the point and offers the way back to the file's own value). Text only via textContent.
 */
import type { SweepPoint, SweepResult } from '../../server/src/analysis/sweep/types';
import type { PanelResult, SweepHostMessage } from '../src/messages';
import { addPoint, liveResult, startLive, type LiveSweep } from '../src/liveSweep';
import { availableQuantities, quantityLabel, type SweepQuantity } from './charts/sweepQuantity';
import { valueText } from './charts/sweepQuantity';

/** The point shown in the state view instead of the file's own values. */
export interface PickedPoint {
  uri: string;
  at: number[];
  result: PanelResult;
  /** `width = 6 nm, depth = 100 meV`. */
  label: string;
}

/** A running sweep as a live point set, from a snapshot of one. */
function liveOf(s: SweepResult): LiveSweep {
  const live = startLive({ axes: s.axes.map((a) => ({ name: a.name, unit: a.unit, steps: a.steps, spacing: a.spacing })), expects: s.expects }, s.total);
  for (const p of s.points) if (p) addPoint(live, p, s.finished, s.total);
  return live;
}

/** Holds the sweep of the panel's document and the picked point. */
export class SweepTab {
  uri: string | null = null;
  version = -1;
  private live: LiveSweep | null = null;
  private final: SweepResult | null = null;
  /** The sweep as last built: the finished one, or the running one's provisional result. */
  private drawn: SweepResult | null = null;
  /** Points arrived since `drawn` was built (it is rebuilt when next asked for, once per draw however many arrived). */
  private dirty = false;
  picked: PickedPoint | null = null;
  /** The values asked of the host and not yet answered. */
  pending: number[] | null = null;
  /** Why the last pick gave no result. */
  failed: string | null = null;

  /** The sweep to draw for document `uri`, or null. */
  sweepFor(uri: string | null): SweepResult | null {
    if (uri === null || uri !== this.uri) return null;
    if (this.dirty && this.live) ((this.drawn = liveResult(this.live)), (this.dirty = false));
    return this.drawn;
  }

  /** Forgets everything (another document, or none). */
  reset(uri: string | null): void {
    this.uri = uri;
    this.version = -1;
    this.live = this.final = this.drawn = null;
    this.dirty = false;
    this.picked = null;
    this.pending = null;
    this.failed = null;
  }

  /** Takes one sweep message; returns whether the view changed. */
  handle(msg: SweepHostMessage): boolean {
    if (msg.uri !== this.uri) {
      if (msg.type === 'pointResult') return false;
      this.reset(msg.uri);
    }
    switch (msg.type) {
      case 'sweep':
        if (msg.version < this.version) return false;
        this.version = msg.version;
        if (msg.sweep && msg.sweep.stopped === null && msg.sweep.finished < msg.sweep.total) ((this.live = liveOf(msg.sweep)), (this.final = null));
        else ((this.live = null), (this.final = msg.sweep));
        this.drawn = this.live ? liveResult(this.live) : this.final;
        this.dirty = false;
        return true;
      case 'sweepPoint':
        if (msg.version < this.version) return false;
        if (msg.version > this.version || !this.live) ((this.version = msg.version), (this.live = startLive(msg.frame, msg.total)), (this.final = null));
        addPoint(this.live, msg.point, msg.finished, msg.total);
        this.dirty = true;
        return true;
      case 'pointResult':
        if (!this.pending || msg.at.some((v, k) => v !== this.pending![k])) return false;
        this.pending = null;
        this.failed = msg.result ? null : msg.reason;
        if (msg.result) this.picked = { uri: msg.uri, at: msg.at, result: msg.result, label: this.label(msg.at) };
        return true;
    }
  }

  /** The point at index `k` of the drawn sweep, when it is a valid point. */
  pointAt(k: number): SweepPoint | null {
    const p = this.sweepFor(this.uri)?.points[k];
    return p && p.valid ? p : null;
  }

  /** `width = 6 nm` for the values of the drawn sweep's axes. */
  label(at: number[]): string {
    const axes = this.sweepFor(this.uri)?.axes ?? [];
    return at.map((v, k) => `${axes[k]?.name ?? `axis ${k + 1}`} = ${valueText(v, axes[k]?.unit ?? null)}`).join(', ');
  }
}

/** Fills the quantity chooser with the quantities the sweep has numbers for; returns the one shown. */
export function syncQuantities(select: HTMLSelectElement, sweep: SweepResult | null, chosen: SweepQuantity): SweepQuantity {
  const have: SweepQuantity[] = sweep ? availableQuantities(sweep) : ['overview'];
  const dims = sweep?.axes.length ?? 1;
  const labels = have.map((q) => quantityLabel(q, dims));
  if (Array.from(select.options, (o) => o.textContent).join('|') !== labels.join('|')) {
    select.replaceChildren(...have.map((q, k) => Object.assign(document.createElement('option'), { value: q, textContent: labels[k] })));
  }
  // A map has no overview: it shows the captured weight instead (the overview's first line).
  const shown = have.includes(chosen) ? chosen : chosen === 'overview' && have.includes('captured') ? 'captured' : have[0]!;
  select.value = shown;
  return shown;
}

/** The status line of the sweep view: how far it is, and what a click does. */
export function sweepStatus(tab: SweepTab, sweep: SweepResult | null, resultVersion: number | null): string {
  if (!sweep) return '';
  const parts: string[] = [];
  if (sweep.stopped === null && sweep.finished < sweep.total) parts.push(`running: ${sweep.finished} of ${sweep.total} points`);
  else parts.push(`${sweep.finished} of ${sweep.total} points`);
  if (resultVersion !== null && tab.version >= 0 && tab.version < resultVersion) parts.push('of an earlier version of the file');
  if (tab.pending) parts.push(`analysing ${tab.label(tab.pending)} for the state view…`);
  else if (tab.failed) parts.push(`that point gave no result: ${tab.failed}`);
  else parts.push('click a point to see its state');
  return parts.join(' · ');
}

/** The state view's banner text for a picked point: which point, and the file's own value beside it. */
export function pickedText(picked: PickedPoint, own: PanelResult | null): string {
  const names = picked.label.split(', ').map((s) => s.split(' = ')[0]!);
  const file = names
    .map((n) => own?.values?.find((v) => v.name === n))
    .filter((v): v is NonNullable<typeof v> => v !== undefined)
    .map((v) => `${v.name} = ${valueText(v.re, v.unit)}`);
  return `Showing the sweep point ${picked.label}${file.length > 0 ? ` (the file has ${file.join(', ')}; the figures above are the file's)` : ''}.`;
}

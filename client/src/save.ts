/**
 * Saving a file the user names, never replacing an existing one without asking.
 */
import type * as vscode from 'vscode';
import type { VscodeApi } from './host';

/** Inputs of `saveWithDialog`. */
export interface SaveRequest {
  /** Where the dialog starts (a suggested file next to the source). */
  defaultUri: vscode.Uri;
  /** Dialog filters, e.g. { CSV: ['csv'] }. */
  filters: Record<string, string[]>;
  /** The bytes to write. */
  data: Uint8Array;
  /** Label of the dialog's button (default "Save"). */
  saveLabel?: string;
}

/** What happened. */
export type SaveOutcome = { kind: 'saved'; uri: vscode.Uri } | { kind: 'cancelled' } | { kind: 'failed'; message: string };

/**
 * Shows a save dialog, asks before replacing a file that already exists (a modal question; replacing
 * needs an explicit "Replace"), then writes. Never throws: failures come back as an outcome.
 */
export async function saveWithDialog(api: VscodeApi, req: SaveRequest): Promise<SaveOutcome> {
  try {
    const target = await api.window.showSaveDialog({ defaultUri: req.defaultUri, filters: req.filters, saveLabel: req.saveLabel ?? 'Save' });
    if (!target) return { kind: 'cancelled' };
    let exists = false;
    try {
      await api.workspace.fs.stat(target);
      exists = true;
    } catch {
      exists = false;
    }
    if (exists) {
      const answer = await api.window.showWarningMessage(`${target.path.slice(target.path.lastIndexOf('/') + 1)} already exists. Replace it?`, { modal: true }, 'Replace');
      if (answer !== 'Replace') return { kind: 'cancelled' };
    }
    await api.workspace.fs.writeFile(target, req.data);
    return { kind: 'saved', uri: target };
  } catch (e) {
    return { kind: 'failed', message: e instanceof Error ? e.message : String(e) };
  }
}

/** Decodes a `data:image/png;base64,` URL into bytes (RFC 2397). */
export function dataUrlBytes(url: string): Uint8Array {
  const comma = url.indexOf(',');
  const b64 = comma >= 0 ? url.slice(comma + 1) : '';
  const bin = atob(b64);
  const out = new Uint8Array(bin.length);
  for (let i = 0; i < bin.length; i++) out[i] = bin.charCodeAt(i);
  return out;
}

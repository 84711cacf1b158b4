/**
 * The `eigenspan.*` commands, as plain functions over the API subset so they can be tested.
 */
import type * as vscode from 'vscode';
import { levelsToCsv, levelsToJson, levelsToMarkdown } from './format';
import { baseName, LANGUAGE_ID, stem, type VscodeApi } from './host';
import type { ResultStore, StoredResult } from './results';
import { saveWithDialog, type SaveOutcome } from './save';

/** Command ids (also listed in package.json). */
export const COMMANDS = {
  showPanel: 'eigenspan.showPanel',
  exportCoefficients: 'eigenspan.exportCoefficients',
  copyLevels: 'eigenspan.copyLevels',
  normaliseState: 'eigenspan.normaliseState',
} as const;

/** The active `.qstate` editor's document and its latest result, or a message saying what is missing. */
function activeResult(api: VscodeApi, store: ResultStore): { doc: vscode.TextDocument; stored: StoredResult } | string {
  const ed = api.window.activeTextEditor;
  if (!ed || ed.document.languageId !== LANGUAGE_ID) return 'Open a .qstate file first.';
  const stored = store.get(ed.document.uri.toString());
  if (!stored) return `${baseName(ed.document.uri)} has not been analysed yet.`;
  if (stored.result.levels.length === 0) return `${baseName(ed.document.uri)} has no expansion (see its problems).`;
  return { doc: ed.document, stored };
}

/** Asks CSV or JSON, then saves the coefficients through a save dialog (never replacing silently). */
export async function exportCoefficients(api: VscodeApi, store: ResultStore): Promise<SaveOutcome> {
  const got = activeResult(api, store);
  if (typeof got === 'string') {
    void api.window.showInformationMessage(got);
    return { kind: 'cancelled' };
  }
  const pick = await api.window.showQuickPick(
    [
      { label: 'CSV', description: 'one row per level, for spreadsheets', format: 'csv' as const },
      { label: 'JSON', description: 'levels with the summary figures', format: 'json' as const },
    ],
    { placeHolder: 'Format of the coefficient file' },
  );
  if (!pick) return { kind: 'cancelled' };
  const { doc, stored } = got;
  const text = pick.format === 'csv' ? levelsToCsv(stored.result) : levelsToJson(stored.result, { fileName: baseName(doc.uri) });
  const name = `${stem(doc.uri)}-coefficients.${pick.format}`;
  const outcome = await saveWithDialog(api, {
    defaultUri: api.Uri.joinPath(doc.uri, '..', name),
    filters: pick.format === 'csv' ? { CSV: ['csv'] } : { JSON: ['json'] },
    data: new TextEncoder().encode(text),
    saveLabel: 'Save coefficients',
  });
  if (outcome.kind === 'saved') void api.window.showInformationMessage(`Saved ${stored.result.levels.length} coefficients to ${baseName(outcome.uri)}.`);
  if (outcome.kind === 'failed') void api.window.showErrorMessage(`Could not save the coefficients: ${outcome.message}`);
  return outcome;
}

/** Copies the level table as Markdown to the clipboard; returns the text copied (or null). */
export async function copyLevels(api: VscodeApi, store: ResultStore): Promise<string | null> {
  const got = activeResult(api, store);
  if (typeof got === 'string') {
    void api.window.showInformationMessage(got);
    return null;
  }
  const md = levelsToMarkdown(got.stored.result);
  await api.env.clipboard.writeText(md);
  void api.window.showInformationMessage(`Copied a table of ${got.stored.result.levels.length} levels.`);
  return md;
}

/** The code of a diagnostic as text (VS Code allows a string, a number or { value, target }). */
function codeOf(d: vscode.Diagnostic): string {
  const c = d.code;
  return typeof c === 'object' && c !== null ? String(c.value) : String(c ?? '');
}

/**
 * Applies the server's quick fix for the `norm` diagnostic of the active file (it rescales the state).
 * Returns true when an edit was applied.
 */
export async function normaliseState(api: VscodeApi): Promise<boolean> {
  const ed = api.window.activeTextEditor;
  if (!ed || ed.document.languageId !== LANGUAGE_ID) {
    void api.window.showInformationMessage('Open a .qstate file first.');
    return false;
  }
  const uri = ed.document.uri;
  const diag = api.languages.getDiagnostics(uri).find((d) => codeOf(d) === 'norm');
  if (!diag) {
    void api.window.showInformationMessage('The state is already normalised (no norm finding).');
    return false;
  }
  const actions = (await api.commands.executeCommand<(vscode.CodeAction | vscode.Command)[]>('vscode.executeCodeActionProvider', uri, diag.range, 'quickfix')) ?? [];
  const fix = actions.find(
    (a): a is vscode.CodeAction => 'title' in a && ((a as vscode.CodeAction).diagnostics?.some((d) => codeOf(d) === 'norm') ?? false) && ('edit' in a || 'command' in a),
  );
  if (!fix) {
    void api.window.showWarningMessage('The language server offered no fix for the norm of this state.');
    return false;
  }
  let applied = false;
  if (fix.edit) applied = await api.workspace.applyEdit(fix.edit);
  if (fix.command) {
    await api.commands.executeCommand(fix.command.command, ...(fix.command.arguments ?? []));
    applied = true;
  }
  return applied;
}

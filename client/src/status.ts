/**
 * The status bar item for the active `.qstate` file: energy mean and captured weight; a click opens
 * the panel.
 */
import type * as vscode from 'vscode';
import { formatNumber } from './format';
import { LANGUAGE_ID, type VscodeApi } from './host';
import type { PanelResult } from './messages';
import type { ResultStore } from './results';

/** The item's text and tooltip for a result (pure). */
export function statusText(result: PanelResult): { text: string; tooltip: string } {
  const unit = result.units.energy ? ` ${result.units.energy}` : '';
  const errors = result.diagnostics.filter((d) => d.severity === 'error').length;
  if (errors > 0) return { text: `$(error) qstate: ${errors} error${errors > 1 ? 's' : ''}`, tooltip: 'The file has errors; open the spectrum panel for a summary.' };
  const mean = result.energy?.mean;
  const e = mean === null || mean === undefined ? '⟨E⟩ ∞/n.a.' : `⟨E⟩ ${formatNumber(mean, 4)}${unit}`;
  const c = result.captured === null ? '' : ` · ${formatNumber(100 * result.captured, 4)} %`;
  return {
    text: `$(graph) ${e}${c}`,
    tooltip: `Energy mean of the normalised state${result.captured === null ? '' : ` and the weight captured by ${result.levels.length} levels`}. Click to open the spectrum panel.`,
  };
}

/** Keeps one status bar item in step with the active editor and its results. */
export class StatusController {
  private readonly item: vscode.StatusBarItem;
  private readonly off: () => void;

  constructor(private readonly api: VscodeApi, private readonly store: ResultStore, command: string) {
    this.item = api.window.createStatusBarItem('eigenspan.status', api.StatusBarAlignment.Right, 100);
    this.item.name = 'Eigenspan expansion';
    this.item.command = command;
    this.off = store.onChange((uri) => uri === this.activeUri() && this.update());
    this.update();
  }

  private activeUri(): string | undefined {
    const ed = this.api.window.activeTextEditor;
    return ed && ed.document.languageId === LANGUAGE_ID ? ed.document.uri.toString() : undefined;
  }

  /** Refreshes the item for the active editor (hidden when it is not a `.qstate` file). */
  update(): void {
    const uri = this.activeUri();
    if (!uri) return this.item.hide();
    const stored = this.store.get(uri);
    if (!this.api.workspace.isTrusted) {
      this.item.text = '$(shield) qstate: checks only';
      this.item.tooltip = 'This workspace is not trusted: syntax, name and unit checks run, nothing is evaluated. Trust the workspace to expand the state.';
    } else if (!stored) {
      this.item.text = '$(loading~spin) qstate';
      this.item.tooltip = 'Waiting for the analysis.';
    } else {
      const s = statusText(stored.result);
      this.item.text = s.text;
      this.item.tooltip = s.tooltip;
    }
    this.item.show();
  }

  get text(): string {
    return this.item.text;
  }

  dispose(): void {
    this.off();
    this.item.dispose();
  }
}

/**
 * Colours and line widths for the plots, taken from the editor theme's `--vscode-*` CSS variables
 * (the documented webview theming mechanism), with neutral fallbacks outside the editor.
 */

/** The theme kinds VS Code marks on the webview's body element. */
export type ThemeKind = 'light' | 'dark' | 'high-contrast' | 'high-contrast-light';

/** Everything the chart builders need to know about the theme. */
export interface Palette {
  kind: ThemeKind;
  foreground: string;
  background: string;
  muted: string;
  grid: string;
  even: string;
  odd: string;
  cumulative: string;
  real: string;
  imag: string;
  density: string;
  partial: string;
  potential: string;
  accent: string;
  fontFamily: string;
  fontSize: number;
  /** Line width for data lines (thicker in high contrast). */
  lineWidth: number;
}

/** The theme kind from the body's classes, or from an explicit override sent by the host. */
export function themeKind(body: { classList: { contains(c: string): boolean } }, override: ThemeKind | null): ThemeKind {
  if (override) return override;
  if (body.classList.contains('vscode-high-contrast-light')) return 'high-contrast-light';
  if (body.classList.contains('vscode-high-contrast')) return 'high-contrast';
  if (body.classList.contains('vscode-light')) return 'light';
  return 'dark';
}

const FALLBACK: Record<'light' | 'dark', Record<string, string>> = {
  light: { fg: '#1f1f1f', bg: '#ffffff', muted: '#6b6b6b', grid: '#d4d4d4', blue: '#1a73c8', orange: '#c4641a', green: '#2f8f46', purple: '#8b46b8', red: '#c23b3b', yellow: '#9c7a00' },
  dark: { fg: '#d6d6d6', bg: '#1e1e1e', muted: '#9a9a9a', grid: '#3c3c3c', blue: '#4fa3e8', orange: '#e89a4f', green: '#6cc07f', purple: '#b887e0', red: '#f07070', yellow: '#e3c65b' },
};

/** Reads the palette from computed CSS variables of `el`. */
export function readPalette(get: (name: string) => string, kind: ThemeKind): Palette {
  const fb = FALLBACK[kind === 'light' || kind === 'high-contrast-light' ? 'light' : 'dark'];
  const v = (name: string, fallback: string) => get(name).trim() || fallback;
  const high = kind === 'high-contrast' || kind === 'high-contrast-light';
  const fg = v('--vscode-editor-foreground', v('--vscode-foreground', fb.fg!));
  const size = parseFloat(v('--vscode-font-size', '13'));
  return {
    kind,
    foreground: fg,
    background: v('--vscode-editor-background', fb.bg!),
    muted: high ? fg : v('--vscode-descriptionForeground', fb.muted!),
    grid: high ? v('--vscode-contrastBorder', fg) : v('--vscode-editorWidget-border', v('--vscode-panel-border', fb.grid!)),
    even: v('--vscode-charts-blue', fb.blue!),
    odd: v('--vscode-charts-orange', fb.orange!),
    cumulative: v('--vscode-charts-green', fb.green!),
    real: v('--vscode-charts-blue', fb.blue!),
    imag: v('--vscode-charts-purple', fb.purple!),
    density: v('--vscode-charts-red', fb.red!),
    partial: v('--vscode-charts-yellow', fb.yellow!),
    potential: v('--vscode-descriptionForeground', fb.muted!),
    accent: v('--vscode-focusBorder', fb.blue!),
    fontFamily: v('--vscode-font-family', 'system-ui, sans-serif'),
    fontSize: Number.isFinite(size) ? size : 13,
    lineWidth: high ? 2.5 : 1.5,
  };
}

/**
 * The custom messages between the language server and the VS Code client (and its panel).
 * This is the only file both sides import; keep it free of runtime dependencies.
 */
import type { AnalysisResult } from './analysis/types';

/** Server to client: the full analysis of a document version, for the panel and the status bar. */
export const RESULT_NOTIFICATION = 'eigenspan/result';

/** The payload of `eigenspan/result`. */
export interface ResultParams {
  uri: string;
  version: number;
  /** The analysis without the syntax tree (not serialisable cheaply and not needed by the panel). */
  result: Omit<AnalysisResult, 'file'>;
}

/** Messages from the extension host to the panel (webview). */
export type HostToPanel =
  | {
      type: 'result';
      uri: string;
      version: number;
      fileName: string;
      result: Omit<AnalysisResult, 'file'>;
      /** Optional: the 0-based line of each diagnostic's start, in order, so the panel can offer to reveal it. */
      diagnosticLines?: number[];
    }
  | { type: 'theme'; kind: 'light' | 'dark' | 'high-contrast' | 'high-contrast-light' }
  | { type: 'empty'; reason: string };

/** Messages from the panel to the extension host. */
export type PanelToHost =
  | { type: 'ready' }
  | { type: 'export'; format: 'png' | 'svg'; view: string; data: string }
  | { type: 'reveal'; line: number };

/** Client to server: the workspace became trusted, so expressions may now be evaluated (no reload). */
export const SET_TRUST_NOTIFICATION = 'eigenspan/setTrust';

/** The payload of `eigenspan/setTrust`. */
export interface SetTrustParams {
  trusted: boolean;
}

/** Host to panel: display preferences taken from the `eigenspan.*` settings. */
export interface PanelSettingsMessage {
  type: 'settings';
  /**
   * Initial scale of the spectrum view when the panel has no saved choice of its own; 'auto' (the user
   * has not set `eigenspan.plotScale`) lets the panel take each spectrum's natural scale.
   */
  plotScale: 'linear' | 'log' | 'auto';
}

/** `initializationOptions` the language server understands (all optional). */
export interface ServerInitializationOptions {
  /** False in untrusted workspaces: only static checks until `eigenspan/setTrust` with `trusted: true` turns evaluation on. Default true. */
  evaluate?: boolean;
  /** True when the client can show the spectrum panel (command `eigenspan.showPanel`); enables the "Show spectrum" lens. Default false. */
  panel?: boolean;
  /** Send `eigenspan/result` after every full analysis (default: the value of `panel`). */
  results?: boolean;
  /** Include plot samples in `eigenspan/result` (default: the value of `panel`); they make results megabytes large. */
  samples?: boolean;
  /** `push`, `pull` or `auto` (pull when the client supports pull diagnostics with refresh). Default `auto`. */
  diagnostics?: 'push' | 'pull' | 'auto';
}

/**
 * The part of the VS Code API the client modules use. The extension passes the real `vscode` module;
 * tests pass a small stand-in. Keeping this list short keeps the glue honest and testable.
 */
import type * as vscode from 'vscode';

/** A subset of `typeof import('vscode')`. */
export interface VscodeApi {
  window: Pick<
    typeof vscode.window,
    | 'createWebviewPanel'
    | 'showSaveDialog'
    | 'showQuickPick'
    | 'showWarningMessage'
    | 'showInformationMessage'
    | 'showErrorMessage'
    | 'createStatusBarItem'
    | 'activeTextEditor'
    | 'onDidChangeActiveTextEditor'
    | 'showTextDocument'
    | 'activeColorTheme'
    | 'onDidChangeActiveColorTheme'
    | 'registerWebviewPanelSerializer'
  >;
  workspace: Pick<typeof vscode.workspace, 'isTrusted' | 'onDidGrantWorkspaceTrust' | 'getConfiguration' | 'onDidChangeConfiguration' | 'fs' | 'applyEdit' | 'textDocuments'>;
  commands: Pick<typeof vscode.commands, 'executeCommand' | 'registerCommand'>;
  env: Pick<typeof vscode.env, 'clipboard'>;
  languages: Pick<typeof vscode.languages, 'getDiagnostics'>;
  Uri: Pick<typeof vscode.Uri, 'joinPath' | 'file' | 'parse'>;
  Range: typeof vscode.Range;
  Selection: typeof vscode.Selection;
  ViewColumn: typeof vscode.ViewColumn;
  StatusBarAlignment: typeof vscode.StatusBarAlignment;
  ColorThemeKind: typeof vscode.ColorThemeKind;
  TextEditorRevealType: typeof vscode.TextEditorRevealType;
}

/** The language id of `.qstate` files. */
export const LANGUAGE_ID = 'qstate';

/** The last path segment of a URI's path (the file's name). */
export function baseName(uri: { path: string }): string {
  const p = uri.path.replace(/\/+$/, '');
  return p.slice(p.lastIndexOf('/') + 1) || p;
}

/** The file's name without its extension. */
export function stem(uri: { path: string }): string {
  const b = baseName(uri);
  const dot = b.lastIndexOf('.');
  return dot > 0 ? b.slice(0, dot) : b;
}

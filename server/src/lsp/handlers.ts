/**
 * The request handlers: each looks its document up in the store, answers from the document's current
 * snapshot (hover and lenses wait, bounded, for a full analysis on its way), logs a failure with the
 * document's URI and answers a fallback, and honours cancellation.
 */
import {
  DocumentDiagnosticReportKind,
  ErrorCodes,
  LSPErrorCodes,
  ResponseError,
  type CancellationToken,
  type Connection,
  type DocumentDiagnosticReport,
} from 'vscode-languageserver';
import { offsetAt } from './positions';
import type { DocState, DocumentStore } from './documents';
import type { Session } from './session';
import { hoverAt } from './hover';
import { completeAt } from './completion';
import { signatureAt } from './signature';
import { quickFixes } from './actions';
import { lensesFor, letHints } from './lens';
import { definitionAt, documentSymbols, prepareRenameAt, referencesAt, renameAt } from './symbols';

type Handler<P, R> = (params: P, token: CancellationToken) => Promise<R | ResponseError<void>>;

/** Builds the wrapper of every handler over `store`. */
function wrapper(store: DocumentStore, logError: (message: string) => void) {
  return function handle<P extends { textDocument: { uri: string } }, R>(
    name: string,
    fallback: R,
    fn: (st: DocState, params: P, token: CancellationToken) => R | Promise<R>,
  ): Handler<P, R> {
    const cancelled = (): ResponseError<void> => new ResponseError(LSPErrorCodes.RequestCancelled, `${name} cancelled`);
    return async (params, token) => {
      const uri = params?.textDocument?.uri ?? '(no uri)';
      try {
        const st = store.get(uri);
        if (!st) return fallback;
        if (token.isCancellationRequested) return cancelled();
        const r = await fn(st, params, token);
        if (token.isCancellationRequested) return cancelled();
        return r;
      } catch (e) {
        // A deliberate protocol error (for example an invalid new name) goes to the client as is.
        if (e instanceof ResponseError) return e as ResponseError<void>;
        logError(`${name} failed for ${uri}: ${e instanceof Error ? (e.stack ?? e.message) : String(e)}`);
        return fallback;
      }
    };
  };
}

/** Registers every request handler on `connection`. */
export function registerHandlers(connection: Connection, store: DocumentStore, session: Session, logError: (message: string) => void): void {
  const handle = wrapper(store, logError);
  /** The current snapshot after waiting for the full analysis (the document may have closed meanwhile). */
  const settledView = async (st: DocState, token: CancellationToken) => {
    await store.settled(st, token);
    const cur = store.get(st.uri);
    return cur ? { cur, view: store.view(cur) } : null;
  };

  connection.onHover(
    handle('hover', null, async (st, p, token) => {
      const s = await settledView(st, token);
      return s ? hoverAt(s.view, offsetAt(s.cur.lines, p.position)) : null;
    }),
  );
  connection.onCompletion(
    handle('completion', [], (st, p) => {
      const snippets = !!session.caps.textDocument?.completion?.completionItem?.snippetSupport;
      return completeAt(store.view(st), offsetAt(st.lines, p.position), { snippets, trigger: p.context?.triggerCharacter });
    }),
  );
  connection.onSignatureHelp(handle('signatureHelp', null, (st, p) => signatureAt(st.text, offsetAt(st.lines, p.position))));
  connection.onCodeAction(handle('codeAction', [], (st, p) => quickFixes(store.view(st), p.context.diagnostics)));
  connection.onCodeLens(
    handle('codeLens', [], async (st, _p, token) => {
      const s = await settledView(st, token);
      return s ? lensesFor(s.view, session.init.panel === true) : [];
    }),
  );
  connection.languages.inlayHint.on(handle('inlayHint', [], (st, p) => letHints(store.view(st), offsetAt(st.lines, p.range.start), offsetAt(st.lines, p.range.end))));
  connection.onDocumentSymbol(handle('documentSymbol', [], (st) => documentSymbols(store.view(st))));
  connection.onDefinition(handle('definition', null, (st, p) => definitionAt(store.view(st), offsetAt(st.lines, p.position))));
  connection.onReferences(handle('references', [], (st, p) => referencesAt(store.view(st), offsetAt(st.lines, p.position), p.context.includeDeclaration)));
  connection.onPrepareRename(handle('prepareRename', null, (st, p) => prepareRenameAt(store.view(st), offsetAt(st.lines, p.position))));
  connection.onRenameRequest(
    handle('rename', null, (st, p) => {
      const r = renameAt(store.view(st), offsetAt(st.lines, p.position), p.newName);
      if (r && 'error' in r) throw new ResponseError(ErrorCodes.InvalidParams, r.error);
      return r;
    }),
  );

  // Pull answers at once with the best findings so far; a refresh follows when the full analysis lands.
  const empty: DocumentDiagnosticReport = { kind: DocumentDiagnosticReportKind.Full, items: [] };
  const pull = handle('diagnostic', empty, (st): DocumentDiagnosticReport => ({ kind: DocumentDiagnosticReportKind.Full, items: store.lspDiagnostics(st) }));
  connection.languages.diagnostics.on(async (p, token) => {
    const r = await pull(p, token);
    if (r instanceof ResponseError) throw r;
    return r;
  });
}

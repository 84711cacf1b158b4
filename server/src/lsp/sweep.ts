/**
 * The `eigenspan/sweep` request (sweepMessages.ts): the document's run of its current revision
 * (sweepRuns.ts: started now, or the background run going or done), with LSP work-done progress from
 * its point reports, and cancellation through the run's shared flag, from either the request's
 * `$/cancelRequest` or the progress's `window/workDoneProgress/cancel`.
 */
import { ErrorCodes, LSPErrorCodes, ResponseError, type CancellationToken, type Connection } from 'vscode-languageserver';
import { mergeSweepFindings, SWEEP_MILLIS_RANGE } from '../analysis/sweep/index';
import type { DocumentStore } from './documents';
import type { Session } from './session';
import { toLspDiagnostics } from './diagnostics';
import { SWEEP_REQUEST, type SweepParams } from './sweepMessages';
import type { SweepRuns } from './sweepRuns';

/** Registers the request on the document runs `runs`. */
export function registerSweep(connection: Connection, store: DocumentStore, session: Session, runs: SweepRuns): void {
  connection.onRequest(SWEEP_REQUEST, async (params: SweepParams, token: CancellationToken) => {
    const uri = params?.textDocument?.uri;
    if (typeof uri !== 'string' || !store.get(uri)) throw new ResponseError(ErrorCodes.InvalidParams, `eigenspan/sweep: the document ${String(uri)} is not open`);
    if (!session.evaluate) throw new ResponseError(LSPErrorCodes.RequestFailed, 'eigenspan/sweep: the workspace is not trusted, so nothing is evaluated');
    // The sweep's time limit and caps come from the settings: wait until they have been read.
    await session.settingsLoaded;
    const doc = store.get(uri);
    if (!doc) throw new ResponseError(ErrorCodes.InvalidParams, `eigenspan/sweep: the document ${uri} was closed`);
    const [lo, hi] = SWEEP_MILLIS_RANGE;
    const asked = params.timeLimitMs;
    const maxMillis = typeof asked === 'number' && Number.isInteger(asked) && asked >= lo && asked <= hi ? asked : session.settings.sweepTimeLimitMs;
    const { version, lines } = doc;
    const run = runs.ensure(doc, maxMillis);
    const sub = token.onCancellationRequested(() => run.stop());
    const end = await run.ended;
    sub.dispose();
    if (end.failed !== null) throw new ResponseError(ErrorCodes.InternalError, `eigenspan/sweep failed: ${end.failed}`);
    if (end.outcome === null) return { uri, version, sweep: null, diagnostics: [] };
    // The sweep's own limits findings as one, as they are published.
    return { uri, version, sweep: end.outcome.result, diagnostics: toLspDiagnostics(lines, version, mergeSweepFindings([], end.outcome.diagnostics)) };
  });
}

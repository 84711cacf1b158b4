/**
 * Workspace trust: evaluation of states and potentials only in trusted workspaces, switched on live
 * when the user grants trust (no reload).
 */
import { SET_TRUST_NOTIFICATION, type SetTrustParams } from '../../server/src/protocol';
import type { VscodeApi } from './host';

/** The language server's initialization options for this workspace. */
export function initializationOptions(api: VscodeApi): { evaluate: boolean; panel: true } {
  return { evaluate: api.workspace.isTrusted, panel: true };
}

/** Forwards a trust grant to the server as `eigenspan/setTrust`; returns the subscription. */
export function forwardTrust(api: VscodeApi, send: (method: string, params: SetTrustParams) => unknown, onGranted?: () => void): { dispose(): unknown } {
  return api.workspace.onDidGrantWorkspaceTrust(() => {
    void send(SET_TRUST_NOTIFICATION, { trusted: true });
    onGranted?.();
  });
}

/**
 * Signature help inside `box(`, `well(`, `oscillator(`, `gaussian(` and `eigen(`.
 */
import type { SignatureHelp, SignatureInformation, ParameterInformation } from 'vscode-languageserver';
import { CONSTRUCTORS } from './vocabulary';
import { openCallAt } from './calls';

/** The signature of the constructor call around `offset`, or null outside one. */
export function signatureAt(text: string, offset: number): SignatureHelp | null {
  const call = openCallAt(text, offset);
  if (!call) return null;
  const ctor = CONSTRUCTORS.find((c) => c.name === call.name && c.parameters.length > 0);
  if (!ctor) return null;
  let label = `${ctor.name}(`;
  const parameters: ParameterInformation[] = [];
  ctor.parameters.forEach((p, k) => {
    if (k > 0) label += ', ';
    const part = p.positional ? p.name : `${p.name} = …`;
    const from = label.length;
    label += p.optional ? `[${part}]` : part;
    parameters.push({ label: [from, label.length], documentation: p.doc });
  });
  label += ')';
  const sig: SignatureInformation = { label, documentation: ctor.doc, parameters };
  // A named argument selects its parameter; a bare one counts by position.
  const m = /^\s*([A-Za-z_][A-Za-z0-9_]*)\s*=(?!=)/.exec(call.current);
  let active = m ? ctor.parameters.findIndex((p) => p.name === m[1]) : -1;
  if (active < 0) {
    const free = ctor.parameters.map((p, k) => ({ p, k })).filter(({ p }) => p.positional || !call.named.includes(p.name));
    active = ctor.parameters.every((p) => p.positional) ? Math.min(call.index, ctor.parameters.length - 1) : (free[0]?.k ?? 0);
  }
  sig.activeParameter = active;
  return { signatures: [sig], activeSignature: 0, activeParameter: active };
}

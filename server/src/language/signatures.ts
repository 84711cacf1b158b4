/**
 * The parameters of the system and state constructors, and the binding of written arguments to them.
 * The parser uses this to check argument names; the language server uses it for completion and
 * signature help; the model and the untrusted pipeline take each argument's dimension (`kind`) and the
 * words its findings name it with (`what`) from here.
 */
import type { Arg, Span } from './ast';
import { diagnostic, type EngineDiagnostic } from './catalogue';
import { suggest } from './suggest';

/** The physical kind of a parameter's value (what the unit checker expects in physical mode; a kind of analysis/dimensions.ts). */
export type ParamKind = 'length' | 'energy' | 'angularFrequency' | 'frequency' | 'wavenumber' | 'dimensionless' | 'mass' | 'temperature';

/** One parameter of a constructor. */
export interface ParamSpec {
  name: string;
  /** True when the parameter must be given (members of a `oneOf` group are not individually required). */
  required: boolean;
  kind: ParamKind;
  /** How findings about the value name it, as in "the box's left end". */
  what: string;
  /** The value used when the parameter is left out, as written in a file (absent when there is none). */
  defaultText?: string;
  /** One sentence for hovers and signature help. */
  doc: string;
}

/** The constructors that take an argument list. */
export type ConstructorName = 'box' | 'well' | 'oscillator' | 'gaussian' | 'thermal';

/** A constructor's signature. */
export interface Signature {
  name: ConstructorName;
  /** Where it may be written: after `system` (and `state eigen(N) of`), or after `state`. */
  context: 'system' | 'state';
  /** True when arguments may be given by position (in `params` order) as well as by name. */
  positional: boolean;
  params: ParamSpec[];
  /** Groups of parameter names of which exactly one must be given. */
  oneOf: string[][];
  /** One sentence for hovers. */
  doc: string;
}

/** Every constructor with an argument list, by name. */
export const SIGNATURES: Readonly<Record<ConstructorName, Signature>> = {
  box: {
    name: 'box',
    context: 'system',
    positional: true,
    params: [
      { name: 'left', required: true, kind: 'length', what: "the box's left end", doc: 'Position of the left hard wall.' },
      { name: 'right', required: true, kind: 'length', what: "the box's right end", doc: 'Position of the right hard wall; must exceed the left one.' },
    ],
    oneOf: [],
    doc: 'Infinite square well between two hard walls; levels n = 1, 2, ...',
  },
  well: {
    name: 'well',
    context: 'system',
    positional: false,
    params: [
      { name: 'depth', required: true, kind: 'energy', what: "the well's depth", doc: 'Height D of the potential outside the well (V = 0 inside, D outside).' },
      { name: 'width', required: true, kind: 'length', what: "the well's width", doc: 'Full width W of the region where the potential is zero.' },
      { name: 'center', required: false, kind: 'length', what: "the well's centre", defaultText: '0', doc: 'Position of the middle of the well.' },
      {
        name: 'barrier_mass',
        required: false,
        kind: 'mass',
        what: 'the barrier mass',
        doc: "The particle's mass outside the well (the file's mass holds inside); psi and psi'/m are continuous at the edges.",
      },
    ],
    oneOf: [],
    doc: 'Finite square well; levels n = 1 up to the number of bound states.',
  },
  oscillator: {
    name: 'oscillator',
    context: 'system',
    positional: false,
    params: [
      { name: 'omega', required: false, kind: 'angularFrequency', what: 'the angular frequency', doc: 'Angular frequency W of V = m W^2 (x - C)^2 / 2.' },
      { name: 'frequency', required: false, kind: 'frequency', what: 'the frequency', doc: 'Ordinary frequency F, so that W = 2 pi F.' },
      { name: 'quantum', required: false, kind: 'energy', what: 'the oscillator quantum', doc: 'Level spacing Q = hbar W.' },
      { name: 'center', required: false, kind: 'length', what: "the oscillator's centre", defaultText: '0', doc: 'Position C of the minimum of the potential.' },
    ],
    oneOf: [['omega', 'frequency', 'quantum']],
    doc: 'Harmonic oscillator; levels n = 0, 1, ...; give exactly one of omega, frequency or quantum.',
  },
  gaussian: {
    name: 'gaussian',
    context: 'state',
    positional: false,
    params: [
      { name: 'center', required: true, kind: 'length', what: "the packet's centre", doc: 'Mean position X0 of the packet.' },
      { name: 'width', required: true, kind: 'length', what: "the packet's width", doc: 'Position spread S (standard deviation of |psi|^2).' },
      { name: 'momentum', required: false, kind: 'wavenumber', what: "the packet's momentum", defaultText: '0', doc: 'Mean wave number K (momentum over hbar).' },
    ],
    oneOf: [],
    doc: 'Normalised Gaussian packet exp(-(x - X0)^2 / (4 S^2) + i K x).',
  },
  thermal: {
    name: 'thermal',
    context: 'state',
    positional: false,
    params: [
      { name: 'nbar', required: false, kind: 'dimensionless', what: 'the mean occupation', doc: 'Mean occupation number of an oscillator: p_k = nbar^k / (nbar + 1)^(k + 1).' },
      { name: 'temperature', required: false, kind: 'temperature', what: 'the temperature', doc: 'Temperature T of the Boltzmann weights exp(-E_k / (k_B T)) (in kelvin; k_B T in energy units in a file without units).' },
    ],
    oneOf: [['nbar', 'temperature']],
    doc: 'Thermal (Gibbs) mixture of the levels of the system after `of`, written like a `system` line; it assumes that system was in equilibrium.',
  },
};

/** Parameter `name` of constructor `c`; undefined for a name it does not take. */
export function paramOf(c: ConstructorName, name: string): ParamSpec | undefined {
  return SIGNATURES[c].params.find((p) => p.name === name);
}

/** The result of `bindArguments`. */
export interface Binding {
  /** Each given parameter's argument, by parameter name. */
  values: Map<string, Arg>;
  diagnostics: EngineDiagnostic[];
}

/**
 * Binds written arguments to a signature's parameters and checks them:
 * unknown or repeated names (`name`, with a suggestion), positional arguments where only names are
 * allowed, too many arguments, missing required parameters and `oneOf` groups (`syntax`).
 * Missing-parameter checks are skipped once another problem was reported, so one typo gives one
 * diagnostic. `call` is the span of the whole call (constructor name to closing parenthesis).
 */
export function bindArguments(sig: Signature, args: readonly Arg[], call: Span): Binding {
  const values = new Map<string, Arg>();
  const diagnostics: EngineDiagnostic[] = [];
  const names = sig.params.map((p) => p.name);
  let position = 0;
  let seenNamed = false;
  for (const arg of args) {
    if (arg.name !== null) {
      seenNamed = true;
      const span = arg.nameSpan ?? arg;
      if (!names.includes(arg.name)) {
        const s = suggest(arg.name, names);
        diagnostics.push(
          diagnostic(
            'name',
            span.start,
            span.end,
            `'${arg.name}' is not a parameter of ${sig.name}; it takes ${names.join(', ')}.${s ? ` Did you mean '${s}'?` : ''}`,
            s ? { fixes: [{ kind: 'replace', title: `Change to '${s}'`, start: span.start, end: span.end, text: s }] } : {},
          ),
        );
      } else if (values.has(arg.name)) {
        diagnostics.push(diagnostic('name', span.start, span.end, `'${arg.name}' is given twice.`));
      } else {
        values.set(arg.name, arg);
      }
      continue;
    }
    if (!sig.positional) {
      // One report for the whole list: the fix (naming the arguments) is the same for all of them.
      if (diagnostics.some((d) => d.code === 'syntax')) continue;
      diagnostics.push(
        diagnostic('syntax', arg.start, arg.end, `'${sig.name}' takes named arguments, for example ${sig.name}(${names[0]} = ...).`),
      );
    } else if (seenNamed) {
      diagnostics.push(diagnostic('syntax', arg.start, arg.end, 'A positional argument cannot follow a named one.'));
    } else if (position >= sig.params.length) {
      diagnostics.push(diagnostic('syntax', arg.start, arg.end, `'${sig.name}' takes ${sig.params.length} arguments.`));
    } else {
      values.set(sig.params[position]!.name, arg);
      position++;
    }
  }
  if (diagnostics.length > 0) return { values, diagnostics };
  const missing = sig.params.filter((p) => p.required && !values.has(p.name)).map((p) => p.name);
  if (missing.length > 0) {
    const list = missing.map((m) => `'${m}'`).join(' and ');
    diagnostics.push(diagnostic('syntax', call.start, call.end, `'${sig.name}' needs ${list}.`));
  }
  for (const group of sig.oneOf) {
    const given = args.filter((a) => a.name !== null && group.includes(a.name));
    if (given.length === 0) {
      diagnostics.push(diagnostic('syntax', call.start, call.end, `'${sig.name}' needs one of ${group.join(', ')}.`));
    } else if (given.length > 1) {
      const extra = given[1]!.nameSpan ?? given[1]!;
      diagnostics.push(diagnostic('syntax', extra.start, extra.end, `Give only one of ${group.join(', ')}.`));
    }
  }
  return { values, diagnostics };
}

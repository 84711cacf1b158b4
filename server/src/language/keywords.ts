/**
 * The statement keywords and the words that follow them, with one-line docs and snippets for
 * completion. Snippets use the LSP snippet syntax (`${1:placeholder}`).
 */

/** A statement keyword. */
export type Keyword = 'units' | 'mass' | 'let' | 'system' | 'state' | 'basis' | 'expect' | 'evolve' | 'sweep';

/** One way of writing a statement, ready to be offered as a completion. */
export interface StatementForm {
  /** What the completion list shows. */
  label: string;
  /** The text inserted, in LSP snippet syntax. */
  snippet: string;
  doc: string;
}

/** A keyword with its documentation and forms. */
export interface KeywordInfo {
  keyword: Keyword;
  doc: string;
  /** True when a file may hold at most one statement with this keyword. */
  once: boolean;
  forms: StatementForm[];
}

/** Every statement keyword, in the order they usually appear in a file. */
export const KEYWORDS: readonly KeywordInfo[] = [
  {
    keyword: 'units',
    doc: 'Switches to physical units and names the length, energy and (optionally) time units results are shown in.',
    once: true,
    forms: [{ label: 'units nm, meV, ps', snippet: 'units ${1:nm}, ${2:meV}, ${3:ps}', doc: 'Physical units: a length, an energy and optionally a time.' }],
  },
  {
    keyword: 'mass',
    doc: 'The particle mass (natural units: default 1; physical units: default 1 m_e).',
    once: true,
    forms: [{ label: 'mass 1 m_e', snippet: 'mass ${1:1} ${2:m_e}', doc: 'Mass in electron masses (m_e), proton masses (m_p) or atomic mass units (u).' }],
  },
  {
    keyword: 'let',
    doc: 'Defines a named value that later statements may use.',
    once: false,
    forms: [{ label: 'let name = value', snippet: 'let ${1:name} = ${2:value}', doc: 'A named value; may use earlier names and units.' }],
  },
  {
    keyword: 'system',
    doc: 'The system whose energy eigenbasis the state is expanded in.',
    once: true,
    forms: [
      { label: 'system box(A, B)', snippet: 'system box(${1:0}, ${2:1})', doc: 'Infinite square well with hard walls at A and B.' },
      {
        label: 'system well(depth = D, width = W)',
        snippet: 'system well(depth = ${1:D}, width = ${2:W})',
        doc: 'Finite square well of depth D and full width W, centred at 0 unless center is given.',
      },
      {
        label: 'system oscillator(omega = W)',
        snippet: 'system oscillator(${1|omega,frequency,quantum|} = ${2:1})',
        doc: 'Harmonic oscillator given by its angular frequency, frequency or level spacing.',
      },
      {
        label: 'system V(x) = ... over [A, B]',
        snippet: 'system V(x) = ${1:x^2 / 2} over [${2:-5}, ${3:5}]',
        doc: 'Any potential, solved numerically between hard walls at A and B.',
      },
    ],
  },
  {
    keyword: 'state',
    doc: 'The state to expand.',
    once: true,
    forms: [
      { label: 'state psi(x) = ...', snippet: 'state psi(x) = ${1:x * (1 - x)}', doc: 'A formula in x; may be complex and need not be normalised.' },
      {
        label: 'state gaussian(center = X0, width = S)',
        snippet: 'state gaussian(center = ${1:0}, width = ${2:1}, momentum = ${3:0})',
        doc: 'A normalised Gaussian packet with mean position, position spread and mean wave number.',
      },
      {
        label: 'state eigen(N) of SYSTEM',
        snippet: 'state eigen(${1:1}) of ${2:box(0, 1)}',
        doc: 'Level N of another system: the state left behind when the potential changes suddenly.',
      },
      {
        label: 'state samples("PATH")',
        snippet: 'state samples("${1:data/psi.csv}")',
        doc: 'Samples of psi in a data file beside this one (columns x, re, im or x, abs, phase), interpolated by a cubic spline.',
      },
      {
        label: 'state thermal(nbar = NBAR) of SYSTEM',
        snippet: 'state thermal(${1:nbar = 0.3}) of ${2:oscillator(omega = 1)}',
        doc: 'A thermal mixture of the levels of another system (nbar for an oscillator, or temperature = T).',
      },
      {
        label: 'state mixture(P1: STATE, P2: STATE)',
        snippet: 'state mixture(${1:0.5}: ${2:eigen(1) of box(0, 1)}, ${3:0.5}: ${4:eigen(2) of box(0, 1)})',
        doc: 'A mixed state: pure states with probabilities that add up to 1.',
      },
    ],
  },
  {
    keyword: 'basis',
    doc: 'How many levels to project on (default 40).',
    once: true,
    forms: [{ label: 'basis N', snippet: 'basis ${1:40}', doc: 'Number of levels; capped at the number of bound states of a finite well.' }],
  },
  {
    keyword: 'expect',
    doc: 'An assertion checked live and by the command line.',
    once: false,
    forms: [
      { label: 'expect norm 1 +- T', snippet: 'expect norm 1 +- ${1:1e-6}', doc: 'The integral of |psi|^2 as written.' },
      { label: 'expect parity even', snippet: 'expect parity ${1|even,odd,mixed|}', doc: 'Symmetry of the state about the centre of a symmetric system.' },
      {
        label: 'expect weight A..B >= P',
        snippet: 'expect weight ${1:1}..${2:20} >= ${3:0.999}',
        doc: 'Sum of |c_n|^2 over one level or a range of levels.',
      },
      { label: 'expect energy E +- T', snippet: 'expect energy ${1:E} +- ${2:T}', doc: 'The energy mean <H> of the normalised state.' },
      { label: 'expect spread E +- T', snippet: 'expect spread ${1:E} +- ${2:T}', doc: 'The energy spread Delta H of the normalised state.' },
      { label: 'expect window covers A..B', snippet: 'expect window covers ${1:A}..${2:B}', doc: 'In a file with a sweep: every other expect holds for every swept value from A to B.' },
      { label: 'expect level N energy E +- T', snippet: 'expect level ${1:1} energy ${2:E} +- ${3:T}', doc: "One level's energy E_N." },
      { label: 'expect continuum <= W', snippet: 'expect continuum <= ${1:1e-3}', doc: "A finite well's weight outside its bound states." },
      { label: 'expect revival T +- D', snippet: 'expect revival ${1:T} +- ${2:D}', doc: 'The revival time of the state.' },
      { label: 'expect mean x(T) X +- D', snippet: 'expect mean ${1|x,p|}(${2:T}) ${3:X} +- ${4:D}', doc: 'The mean position <x>(t) or wave number <p>(t)/hbar at time T.' },
    ],
  },
  {
    keyword: 'evolve',
    doc: 'Follows the state in time, from 0 up to time T in K steps.',
    once: true,
    forms: [{ label: 'evolve to T steps K', snippet: 'evolve to ${1:T} steps ${2:200}', doc: 'Time evolution up to T; steps defaults to the analysis default.' }],
  },
  {
    keyword: 'sweep',
    doc: 'Varies a `let` value over a range and reports the expansion and every `expect` at each point (at most two sweeps: a map).',
    once: false,
    forms: [
      { label: 'sweep name from A to B steps K', snippet: 'sweep ${1:name} from ${2:A} to ${3:B} steps ${4:20}', doc: 'K equal steps (K + 1 points) from A to B.' },
      { label: 'sweep name from A to B steps K log', snippet: 'sweep ${1:name} from ${2:A} to ${3:B} steps ${4:20} log', doc: 'K steps evenly spaced in the logarithm (A and B of one sign).' },
    ],
  },
];

/** Just the keyword names. */
export const KEYWORD_NAMES: readonly Keyword[] = KEYWORDS.map((k) => k.keyword);

/** What may follow `expect`. */
export const EXPECT_KINDS = ['norm', 'parity', 'weight', 'energy', 'spread', 'level', 'continuum', 'revival', 'mean', 'window'] as const;

/** The kinds of wall of a `V(x) ... over [A, B] walls ...` interval. */
export const WALL_KINDS = ['hard', 'open'] as const;

/** The parity values of `expect parity`. */
export const PARITY_VALUES = ['even', 'odd', 'mixed'] as const;

/** The system kinds after `system` (`V` starts `V(x) = ... over [A, B]`). */
export const SYSTEM_KINDS = ['box', 'well', 'oscillator', 'V'] as const;

/** The state kinds after `state`. */
export const STATE_KINDS = ['psi', 'eigen', 'gaussian', 'samples', 'thermal', 'mixture'] as const;

/** Words with a fixed meaning inside statements (they split statements, so they cannot be `let` names). */
export const INNER_WORDS = ['over', 'of', 'to', 'steps'] as const;

/** Names the expression layer gives a meaning to: position, imaginary unit, constants, eigenfunctions, the state. */
export const RESERVED_NAMES = ['x', 'i', 'pi', 'e', 'phi', 'psi'] as const;

/** Operator words of the expression syntax. */
export const OPERATOR_WORDS = ['and', 'or', 'not', 'xor', 'mod', 'in'] as const;

/** True when `word` is a statement keyword. */
export function isKeyword(word: string): word is Keyword {
  return (KEYWORD_NAMES as readonly string[]).includes(word);
}

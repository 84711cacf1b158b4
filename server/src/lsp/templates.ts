/**
 * The text completion inserts for a statement form, in the file's own units: a file with a `units`
 * line gets values with its length, energy and time units, a file in natural units bare numbers, so an
 * accepted template never creates a `units` error. Placeholders hold values, never names, so leaving
 * one as it is creates no unknown name. Snippet syntax (LSP); `snippetToPlain` turns a snippet into
 * the text a client without snippet support inserts.
 */
import type { QFile } from '../language/ast';
import { UNITS } from '../expr/constants';
import { reciprocalTime } from '../expr/units';

/** The units a file's values carry, or null in natural units. */
export interface FileUnits {
  length: string;
  energy: string;
  /** The `units` line's time unit, or `ps` when it names none (a time must still carry a unit). */
  time: string;
  /** One energy unit as a formula writes it: `1 meV`, or `h * 1 MHz` (a formula's frequency is not converted to an energy). */
  formulaEnergy: string;
}

/**
 * The file's units: its `units` statement's names by kind (a line the parser rejected is read from the
 * text), with `nm`, `meV` and `ps` for any kind it does not name; null without a `units` line.
 */
export function fileUnits(file: QFile, text: string): FileUnits | null {
  const st = file.statements.find((s) => s.kind === 'units');
  let names: string[];
  if (st && st.kind === 'units') names = st.units.map((u) => u.name);
  else if ((file.rejected ?? []).some((r) => r.keyword === 'units')) names = (/^units\b([^\n#]*)/m.exec(text)?.[1] ?? '').split(/[\s,]+/);
  else return null;
  const of = (kind: string, fallback: string): string => names.find((n) => UNITS.get(n)?.kind === kind) ?? fallback;
  // A frequency on the units line is the energy unit (E = h f); times then default to its reciprocal (MHz: us).
  const hz = names.find((n) => UNITS.get(n)?.kind === 'frequency');
  const energy = hz ?? of('energy', 'meV');
  const time = of('time', (hz && reciprocalTime(UNITS.get(hz)!.si)?.name) || 'ps');
  return { length: of('length', 'nm'), energy, time, formulaEnergy: hz ? `h * 1 ${hz}` : `1 ${energy}` };
}

type Template = (u: FileUnits | null) => string;

/** A value of one length, energy or time unit (`1 nm`), or the bare number in natural units. */
const len = (u: FileUnits | null, v: string) => (u ? `${v} ${u.length}` : v);
const en = (u: FileUnits | null, v: string) => (u ? `${v} ${u.energy}` : v);

/** Whole statements of the keywords with one form. */
const KEYWORD_TEMPLATES: Record<string, Template> = {
  units: () => 'units ${1:nm}, ${2:meV}, ${3:ps}',
  mass: (u) => (u ? 'mass ${1:1} ${2:m_e}' : 'mass ${1:1}'),
  let: () => 'let ${1:name} = ${2:1}',
  basis: () => 'basis ${1:40}',
  evolve: (u) => `evolve ${EVOLVE_REST(u)}`,
};

/** What follows `evolve `. */
const EVOLVE_REST: Template = (u) => `to \${1:${u ? `1 ${u.time}` : '10'}} steps \${2:200}`;

/** The constructors after `system` (and `of`) and `state`, by name. */
const CONSTRUCTOR_TEMPLATES: Record<string, Template> = {
  box: (u) => `box(\${1:${len(u, '0')}}, \${2:${len(u, '1')}})`,
  well: (u) => `well(depth = \${1:${en(u, u ? '1' : '10')}}, width = \${2:${len(u, u ? '1' : '2')}})`,
  // In physical units the three ways of giving the oscillator take different dimensions: the level spacing fits the file's energy unit.
  oscillator: (u) => (u ? `oscillator(quantum = \${1:1 ${u.energy}})` : 'oscillator(${1|omega,frequency,quantum|} = ${2:1})'),
  V: (u) => (u ? `V(x) = \${1:${u.formulaEnergy} * (x / ${u.length})^2} over [\${2:-5 ${u.length}}, \${3:5 ${u.length}}]` : 'V(x) = ${1:x^2 / 2} over [${2:-5}, ${3:5}]'),
  psi: (u) => `psi(x) = \${1:x * (${len(u, '1')} - x)}`,
  thermal: (u) => (u ? `thermal(temperature = \${1:300 K}) of \${2:oscillator(quantum = 1 ${u.energy})}` : 'thermal(nbar = ${1:0.3}) of ${2:oscillator(omega = 1)}'),
  mixture: (u) => `mixture(\${1:0.5}: \${2:eigen(1) of box(${len(u, '0')}, ${len(u, '1')})}, \${3:0.5}: \${4:eigen(2) of box(${len(u, '0')}, ${len(u, '1')})})`,
  gaussian: (u) => `gaussian(center = \${1:${len(u, '0')}}, width = \${2:${len(u, '1')}}, momentum = \${3:${u ? `0 / ${u.length}` : '0'}})`,
  eigen: (u) => `eigen(\${1:1}) of \${2:box(${len(u, '0')}, ${len(u, '1')})}`,
};

/** The rest of an `expect` line, by kind. */
const EXPECT_TEMPLATES: Record<string, Template> = {
  norm: () => 'norm 1 +- ${1:1e-6}',
  parity: () => 'parity ${1|even,odd,mixed|}',
  weight: () => 'weight ${1:1}..${2:20} >= ${3:0.999}',
  energy: (u) => `energy \${1:${en(u, '1')}} +- \${2:${en(u, '0.01')}}`,
  spread: (u) => `spread \${1:${en(u, '1')}} +- \${2:${en(u, '0.01')}}`,
  level: (u) => `level \${1:1} energy \${2:${en(u, '1')}} +- \${3:${en(u, '0.01')}}`,
  continuum: () => 'continuum <= ${1:1e-3}',
  revival: (u) => `revival \${1:${u ? `1 ${u.time}` : '1'}} +- \${2:${u ? `0.1 ${u.time}` : '0.1'}}`,
  mean: (u) => `mean x(\${1:${u ? `0 ${u.time}` : '0'}}) \${2:${len(u, '0')}} +- \${3:${len(u, '0.1')}}`,
  window: (u) => `window covers \${1:${len(u, '1')}}..\${2:${len(u, '2')}}`,
};

const TABLES = { keyword: KEYWORD_TEMPLATES, constructor: CONSTRUCTOR_TEMPLATES, expect: EXPECT_TEMPLATES } as const;

/**
 * The template of a form in the file's units, or `fallback` (the keyword table's own snippet) for a
 * form this module does not know.
 */
export function templateFor(table: keyof typeof TABLES, name: string, units: FileUnits | null, fallback: string): string {
  const t = (TABLES[table] as Record<string, Template | undefined>)[name];
  return t ? t(units) : fallback;
}

/** The rest of an `evolve` line after `evolve `, in the file's units. */
export const evolveRest = (units: FileUnits | null): string => EVOLVE_REST(units);

/**
 * The text a snippet inserts with every placeholder left as it is: `${1:text}` gives text, a choice
 * `${1|a,b|}` its first option, a bare tab stop (`$1`, `${1}`, `$0`) nothing, and the escapes `\$`,
 * `\}` and `\\` their character (LSP snippet grammar).
 */
export function snippetToPlain(snippet: string): string {
  let out = '';
  let i = 0;
  let depth = 0;
  while (i < snippet.length) {
    const ch = snippet[i]!;
    if (ch === '\\' && i + 1 < snippet.length && '$}\\,|'.includes(snippet[i + 1]!)) {
      out += snippet[i + 1];
      i += 2;
      continue;
    }
    const tab = /^\$(\d+)|^\$\{(\d+)\}/.exec(snippet.slice(i));
    if (tab) {
      i += tab[0].length;
      continue;
    }
    const choice = /^\$\{\d+\|((?:[^,|\\]|\\.)*)(?:,(?:[^|\\]|\\.)*)?\|\}/.exec(snippet.slice(i));
    if (choice) {
      out += choice[1]!.replace(/\\(.)/g, '$1');
      i += choice[0].length;
      continue;
    }
    const open = /^\$\{\d+:/.exec(snippet.slice(i));
    if (open) {
      depth += 1;
      i += open[0].length;
      continue;
    }
    if (ch === '}' && depth > 0) {
      depth -= 1;
      i += 1;
      continue;
    }
    out += ch;
    i += 1;
  }
  return out;
}

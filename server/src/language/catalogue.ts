/**
 * The one catalogue of diagnostic codes.
 * Codes are stable identifiers relied on by editors, the command line and tests; wording may change.
 */

/** How serious a finding is. */
export type Severity = 'error' | 'warning' | 'info';

/** Every diagnostic code the engine can emit, with its default severity and what it is about. */
export const CATALOGUE = {
  syntax: { severity: 'error', about: 'The text does not follow the file format.' },
  name: { severity: 'error', about: 'An unknown, duplicated or misplaced name.' },
  units: { severity: 'error', about: 'A value of the wrong physical dimension, or a missing or stray unit.' },
  evaluation: { severity: 'error', about: 'NaN, infinity or a math error at some point.' },
  forbidden: { severity: 'error', about: 'A construct the expression sandbox refuses.' },
  limits: { severity: 'error', about: 'A size or time cap was hit.' },
  norm: { severity: 'warning', about: 'The integral of |psi|^2 is not 1 within tolerance.' },
  boundary: { severity: 'warning', about: 'The state is nonzero at a hard wall or has weight outside it.' },
  convergence: { severity: 'warning', about: 'Slowly decaying coefficients; energy mean infinite or ill-converged.' },
  basis: { severity: 'warning', about: 'The levels asked for do not capture the state.' },
  continuum: { severity: 'warning', about: 'Weight outside the bound states of a finite well.' },
  parity: { severity: 'info', about: 'Symmetry facts and mismatches.' },
  expect: { severity: 'error', about: 'A failed expect line.' },
  data: { severity: 'error', about: 'A data file of samples that is refused, unreadable or has bad rows, or samples that do not fit the system.' },
} as const satisfies Record<string, { severity: Severity; about: string }>;

/** A stable diagnostic code. */
export type Code = keyof typeof CATALOGUE;

/**
 * Data a front end needs to offer a quick fix for a diagnostic.
 * Edits are described by document offsets; front ends turn them into their own edits.
 */
export type FixData = (
  | { kind: 'replace'; title: string; start: number; end: number; text: string }
  | { kind: 'insert'; title: string; at: number; text: string }
) & {
  /**
   * Whether editors should prefer this fix (apply it on "fix all" or a single key). Default: the only
   * fix of its finding is preferred. A fix that makes the check agree with what was measured is never
   * preferred over one that repairs the file.
   */
  preferred?: boolean;
};

/** A finding, located by document offsets (UTF-16 code units, half-open [start, end)). */
export interface EngineDiagnostic {
  start: number;
  end: number;
  severity: Severity;
  code: Code;
  message: string;
  /** Quick fixes that resolve this finding, if any. */
  fixes?: FixData[];
}

/** Builds a diagnostic with the catalogue's default severity unless one is given. */
export function diagnostic(
  code: Code,
  start: number,
  end: number,
  message: string,
  options: { severity?: Severity; fixes?: FixData[] } = {},
): EngineDiagnostic {
  const d: EngineDiagnostic = {
    start,
    end: Math.max(start, end),
    severity: options.severity ?? CATALOGUE[code].severity,
    code,
    message,
  };
  if (options.fixes && options.fixes.length > 0) d.fixes = options.fixes;
  return d;
}

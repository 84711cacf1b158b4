/**
 * Oscillator energies in their natural unit, the quantum hbar omega: a display choice of the front
 * ends (hovers, the command line's table, the panel), while results keep energies in the file's energy
 * unit. Also the mean quantum number <n> of an oscillator state. Pure; no dependencies but the number
 * formatter, so the browser bundle can import it too.
 */
import { formatNumber } from './numbers';

/** The system facts these functions read (a subset of `AnalysisResult['system']`). */
interface SystemFacts {
  kind: string;
  energies: number[];
}

/**
 * hbar omega of an oscillator, E_1 - E_0 of its levels E_n = (n + 1/2) hbar omega (common practice),
 * in the unit of its energies; null for other systems or fewer than two levels.
 */
export function oscillatorQuantum(system: SystemFacts | null | undefined): number | null {
  if (!system || system.kind !== 'oscillator' || system.energies.length < 2) return null;
  const q = system.energies[1]! - system.energies[0]!;
  return q > 0 && Number.isFinite(q) ? q : null;
}

/**
 * The mean quantum number <n> = (<E> - E_0) / (hbar omega) of an oscillator state, which is
 * sum_n n |c_n|^2 for the normalised state because E_n - E_0 = n hbar omega; null when the system is no
 * oscillator or the energy mean is not finite.
 */
export function meanQuantumNumber(system: SystemFacts | null | undefined, mean: number | null | undefined): number | null {
  const q = oscillatorQuantum(system);
  if (q === null || mean === null || mean === undefined || !Number.isFinite(mean)) return null;
  return (mean - system!.energies[0]!) / q;
}

/** An energy (or spread) in units of hbar omega as text, `2.5 ħω` (or `2.5 hbar omega` with `ascii`). */
export function quantaText(e: number, quantum: number, ascii = false): string {
  return `${formatNumber(e / quantum)} ${ascii ? 'hbar omega' : 'ħω'}`;
}

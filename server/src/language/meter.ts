/**
 * The work meter and the suggestion allowance of the quick stage (scanner, parser, suggestions and
 * the checks that call them).
 *
 * The quick stage runs on every keystroke and outside the time limit, so its cost must grow about
 * linearly with the file. Tests prove it by counting operations, never by timing them: each part adds
 * its steps to the meter that is active while it runs. A `Budget` (server/src/physics/budget.ts) is a
 * meter, so the analysis can pass its own.
 *
 * The context is ambient (installed by `withQuickStage` for one synchronous call) so a caller deep
 * inside the expression checker counts without every signature carrying it; the quick stage is
 * synchronous, and the previous context is restored even when the call throws.
 */

/** Something that counts operations; `Budget` satisfies it. */
export interface WorkMeter {
  count(ops: number): void;
}

/** Options of `withQuickStage`. */
export interface QuickStageOptions {
  /** Counts the work (default: nothing counts). */
  meter?: WorkMeter;
  /**
   * Length of the text being analysed: it sets the "did you mean" allowance of the whole stage to
   * `SUGGESTION_CELLS_PER_CHAR` table cells per character plus `SUGGESTION_BASE_CELLS`, after which
   * unknown names get no suggestion. Without it only the per-call caps of `suggest.ts` apply.
   */
  textLength?: number;
}

/** Edit-distance cells the suggestions of one analysis may use per character of its text. */
export const SUGGESTION_CELLS_PER_CHAR = 32;
/** Edit-distance cells every analysis may use, however short its text. */
export const SUGGESTION_BASE_CELLS = 200_000;

interface Context {
  meter: WorkMeter | null;
  suggestionCells: number;
}

let active: Context | null = null;

/** Runs `fn` inside a quick-stage context (meter and suggestion allowance), then restores the previous one. */
export function withQuickStage<T>(options: QuickStageOptions, fn: () => T): T {
  const previous = active;
  const cells = options.textLength === undefined ? Infinity : SUGGESTION_BASE_CELLS + SUGGESTION_CELLS_PER_CHAR * options.textLength;
  active = { meter: options.meter ?? null, suggestionCells: cells };
  try {
    return fn();
  } finally {
    active = previous;
  }
}

/**
 * Runs `fn` in a quick-stage context with the suggestion allowance of a text of `textLength`
 * characters, unless a context is already active (a caller's meter or allowance then stays in force).
 * Every entry of the analysis runs its static stage through this, so no front end can forget it.
 */
export function inQuickStage<T>(textLength: number, fn: () => T): T {
  return active !== null ? fn() : withQuickStage({ textLength }, fn);
}

/** Runs `fn` with `meter` counting the quick stage's work (no suggestion allowance). */
export function withWorkMeter<T>(meter: WorkMeter, fn: () => T): T {
  return withQuickStage({ meter }, fn);
}

/** Adds `ops` to the active meter (nothing when none is active). */
export function countWork(ops: number): void {
  if (active !== null && active.meter !== null && ops > 0) active.meter.count(ops);
}

/** Edit-distance cells the suggestions may still use in this context (Infinity outside one). */
export function suggestionCellsLeft(): number {
  return active === null ? Infinity : active.suggestionCells;
}

/** Takes `cells` from the suggestion allowance of the active context. */
export function spendSuggestionCells(cells: number): void {
  if (active !== null) active.suggestionCells -= cells;
}

/** A plain counter, for tests and callers without a budget. */
export function workCounter(): WorkMeter & { readonly ops: number } {
  let ops = 0;
  return {
    count(n: number): void {
      ops += n;
    },
    get ops(): number {
      return ops;
    },
  };
}

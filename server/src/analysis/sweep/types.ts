/**
 * The result of a design sweep. Its one home is the shipped declarations (types/engine.d.ts, `EngineSweep`
 * and its parts, documented there and in docs/format.md, "Sweeps"); the engine uses them under these names.
 */
export type {
  EngineSweep as SweepResult,
  EngineSweepAxis as SweepAxis,
  EngineSweepExpect as SweepExpect,
  EngineSweepLocated as SweepLocated,
  EngineSweepPoint as SweepPoint,
  EngineSweepWindow as SweepWindow,
} from '../../../../types/engine';

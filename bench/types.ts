/** One figure printed by `npm run bench`: a measurement beside its target and its same-run baseline. */
export interface BenchFigure {
  /** What was measured, e.g. "melt-pool solves per second (surface)". */
  name: string;
  value: number;
  unit: string;
  /** Human-readable target, e.g. ">= 20000" or "<= 5 s". */
  target: string;
  /** Whether `value` meets the target. */
  pass: boolean;
  /** The baseline measured in the same run, if any. */
  baseline?: { name: string; value: number; unit: string };
  /** value / baseline.value (or the issue's own ratio definition), with its target. */
  ratio?: { value: number; target?: string; pass?: boolean };
  notes?: string;
}

/** A benchmark suite: runs its measurements and returns figures. */
export type BenchSuite = () => Promise<BenchFigure[]>;

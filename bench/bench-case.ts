/** One benchmark case: a module under bench/cases/ whose default export is a BenchCase. */
export interface BenchContext {
  baseFile: string;
  roverFile: string;
  outDir: string;
}

export interface BenchCase {
  name: string;
  /** Untimed set-up in the same process just before `run` (e.g. remove a previous run's output). */
  prepare?(ctx: BenchContext): Promise<void> | void;
  /** The timed work. Return the row count, or leave it to `rows`. */
  run(ctx: BenchContext): Promise<{ rows: number } | void>;
  /** Row count measured after timing and after peak memory is read (so it costs neither). */
  rows?(ctx: BenchContext): Promise<number>;
}

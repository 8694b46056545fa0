export interface SamplerSettings {
  chains: number;
  warmup: number;
  draws: number;
  seed: number;
  /** Maximum number of trajectory doublings; 10 by default. */
  maxTreeDepth: number;
  /** Target mean acceptance statistic for step-size adaptation; 0.8 by default. */
  targetAcceptance: number;
  /** Keep every thin-th post-warm-up draw; 1 by default. */
  thin?: number;
  /** Random starting points are uniform(−initRadius, initRadius) on the unconstrained scale; 2 by default. */
  initRadius?: number;
  /**
   * Diagnostics only: keep where each divergent transition started and where its energy
   * error blew up (ChainResult.divergences), up to 1000 per chain. Off by default.
   */
  recordDivergences?: boolean;
}

export const defaultSamplerSettings: Readonly<SamplerSettings> = Object.freeze({
  chains: 4,
  warmup: 1000,
  draws: 1000,
  seed: 1,
  maxTreeDepth: 10,
  targetAcceptance: 0.8,
  thin: 1,
  initRadius: 2,
  recordDivergences: false,
});

export interface ChainProgress {
  chain: number;
  iteration: number;
  total: number;
  phase: "warmup" | "sampling";
  /** Divergent transitions so far in the current phase. */
  divergences: number;
}

/** One divergent transition, kept when `recordDivergences` is on. */
export interface DivergenceRecord {
  /** 0-based iteration of the chain (warm-up included). */
  iteration: number;
  phase: "warmup" | "sampling";
  stepSize: number;
  /** Unconstrained position the trajectory started from. */
  start: Float64Array;
  /** Constrained quantities at the start, in the order of `names`. */
  startConstrained: Float64Array;
  /** Unconstrained position of the leapfrog point whose energy error exceeded the limit. */
  end: Float64Array;
}

/** Most divergences kept per chain when recording. */
export const MAX_DIVERGENCE_RECORDS = 1000;

export interface ChainResult {
  chain: number;
  names: readonly string[];
  /** Rows = kept draws, columns = names, row-major. */
  draws: Float64Array;
  treeDepth: Uint8Array;
  leapfrogSteps: Uint16Array | Int32Array;
  divergent: Uint8Array;
  energy: Float64Array;
  acceptStat: Float64Array;
  /** Log density (up to a constant, Jacobian included) of each kept draw. */
  logDensity?: Float64Array;
  stepSize: number;
  inverseMetric: Float64Array;
  /** Gradient evaluations of the whole chain, warm-up and initialisation included. */
  gradientEvaluations: number;
  /** Divergent transitions during warm-up (not part of the trust rule). */
  warmupDivergences?: number;
  /** Maximum tree depth the chain ran with, so depth hits can be counted (10 if absent). */
  maxTreeDepth?: number;
  seconds: number;
  cancelled: boolean;
  /** Divergent transitions with their positions, when `recordDivergences` was on. */
  divergences?: DivergenceRecord[];
}

export interface SamplerHooks {
  onProgress?(progress: ChainProgress): void;
  shouldStop?(): boolean;
}

/** Checks settings and fills optional fields; throws one clear message listing every problem. */
export function resolveSamplerSettings(settings: SamplerSettings): Required<SamplerSettings> {
  const problems: string[] = [];
  const s = settings as Partial<SamplerSettings> | null | undefined;
  if (s === null || typeof s !== "object") throw new Error("sampler settings must be an object");
  const integer = (name: keyof SamplerSettings, min: number, max: number): void => {
    const v = s[name];
    if (typeof v !== "number" || !Number.isInteger(v) || v < min || v > max) {
      problems.push(`${name} must be an integer from ${min} to ${max}, got ${String(v)}`);
    }
  };
  integer("chains", 1, 256);
  integer("warmup", 0, 10_000_000);
  integer("draws", 1, 10_000_000);
  integer("seed", 0, 0xffffffff);
  integer("maxTreeDepth", 1, 15);
  const target = s.targetAcceptance;
  if (typeof target !== "number" || !(target > 0 && target < 1)) {
    problems.push(`targetAcceptance must be a number strictly between 0 and 1, got ${String(target)}`);
  }
  if (s.thin !== undefined) integer("thin", 1, 1_000_000);
  if (s.recordDivergences !== undefined && typeof s.recordDivergences !== "boolean") {
    problems.push(`recordDivergences must be true or false, got ${String(s.recordDivergences)}`);
  }
  const radius = s.initRadius;
  if (radius !== undefined && (typeof radius !== "number" || !(radius > 0) || !Number.isFinite(radius))) {
    problems.push(`initRadius must be a positive finite number, got ${String(radius)}`);
  }
  if (problems.length > 0) throw new Error(`Invalid sampler settings: ${problems.join("; ")}`);
  return {
    chains: settings.chains,
    warmup: settings.warmup,
    draws: settings.draws,
    seed: settings.seed,
    maxTreeDepth: settings.maxTreeDepth,
    targetAcceptance: settings.targetAcceptance,
    thin: settings.thin ?? 1,
    initRadius: settings.initRadius ?? 2,
    recordDivergences: settings.recordDivergences ?? false,
  };
}

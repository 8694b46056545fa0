// Turns the sampler's progress reports into what the Runs screen shows: per chain the
// iteration, phase, divergences and an ETA from the chain's own speed, and for the whole
// fit a share done and an ETA. Pure apart from the clock, which is injected.
import type { FitProgress } from "@tributary/stats";
import type { RunChainProgress } from "@tributary/contracts";

export type FitStage = "preparing" | "pooled" | "unpooled" | "summarising";

export interface FitPlan {
  readonly chains: number;
  /** Warm-up plus draws of one chain of one model. */
  readonly iterationsPerRun: number;
  readonly unpooled: boolean;
  readonly cellCount: number;
}

export interface FitProgressSnapshot {
  readonly stage: FitStage;
  readonly chains: RunChainProgress[];
  readonly fraction: number;
  readonly elapsedSeconds: number;
  readonly etaSeconds: number | null;
}

interface ChainClock {
  latest: FitProgress;
  /** Time and iteration when this chain's current attempt was first seen. */
  firstAt: number;
  firstIteration: number;
  /** Time of the latest report. */
  lastAt: number;
}

/** Shortest observation, in seconds, before a speed is trusted for an ETA. */
const MIN_SECONDS_FOR_RATE = 0.5;

export class FitProgressTracker {
  private stageNow: FitStage = "preparing";
  private readonly clocks = new Map<string, ChainClock>();
  private readonly startedAt: number;
  private samplingStartedAt: number | null = null;

  constructor(
    private readonly plan: FitPlan,
    private readonly now: () => number = () => performance.now() / 1000,
  ) {
    this.startedAt = now();
  }

  setStage(stage: FitStage): void {
    this.stageNow = stage;
  }

  get stage(): FitStage {
    return this.stageNow;
  }

  update(progress: FitProgress): void {
    const at = this.now();
    this.samplingStartedAt ??= at;
    if (progress.model !== this.stageNow && (progress.model === "pooled" || progress.model === "unpooled")) this.stageNow = progress.model;
    const key = `${progress.model}:${progress.chain}`;
    const clock = this.clocks.get(key);
    if (!clock || clock.latest.attempt !== progress.attempt || progress.iteration < clock.latest.iteration) {
      this.clocks.set(key, { latest: progress, firstAt: at, firstIteration: progress.iteration, lastAt: at });
    } else {
      clock.latest = progress;
      clock.lastAt = at;
    }
  }

  private modelFraction(model: "pooled" | "unpooled"): number {
    let sum = 0;
    for (let chain = 0; chain < this.plan.chains; chain++) {
      const latest = this.clocks.get(`${model}:${chain}`)?.latest;
      if (latest && latest.total > 0) sum += Math.min(1, latest.iteration / latest.total);
    }
    return sum / this.plan.chains;
  }

  snapshot(): FitProgressSnapshot {
    const at = this.now();
    const model: "pooled" | "unpooled" = this.stageNow === "unpooled" ? "unpooled" : "pooled";
    const past = this.stageNow === "summarising";
    const pooledShare = past || model === "unpooled" ? 1 : this.modelFraction("pooled");
    const unpooledShare = past ? 1 : model === "unpooled" ? this.modelFraction("unpooled") : 0;
    // The comparison fits every cell alone; together those cost roughly what the pooled model costs.
    const fraction = this.plan.unpooled ? 0.5 * pooledShare + 0.5 * unpooledShare : pooledShare;

    const totalFor = model === "pooled" ? this.plan.iterationsPerRun : this.plan.iterationsPerRun * this.plan.cellCount;
    const chains: RunChainProgress[] = [];
    for (let chain = 0; chain < this.plan.chains; chain++) {
      const clock = this.clocks.get(`${model}:${chain}`);
      if (!clock) {
        chains.push({ model, chain, iteration: 0, total: totalFor, phase: "warmup", divergences: 0, attempt: 1, cell: null, cellCount: null, etaSeconds: null });
        continue;
      }
      const p = clock.latest;
      const seconds = clock.lastAt - clock.firstAt;
      const done = p.iteration - clock.firstIteration;
      const remaining = Math.max(0, p.total - p.iteration);
      const eta = remaining === 0 ? 0 : seconds >= MIN_SECONDS_FOR_RATE && done > 0 ? (remaining * seconds) / done - (at - clock.lastAt) : null;
      chains.push({
        model: p.model,
        chain: p.chain,
        iteration: p.iteration,
        total: p.total,
        phase: p.phase,
        divergences: p.divergences,
        attempt: p.attempt,
        cell: p.cell ?? null,
        cellCount: p.cellCount ?? null,
        etaSeconds: eta === null ? null : Math.max(0, eta),
      });
    }
    const elapsed = at - this.startedAt;
    const sampling = this.samplingStartedAt === null ? 0 : at - this.samplingStartedAt;
    const eta = fraction >= 1 ? 0 : fraction >= 0.01 && sampling >= MIN_SECONDS_FOR_RATE ? (sampling * (1 - fraction)) / fraction : null;
    return { stage: this.stageNow, chains, fraction, elapsedSeconds: elapsed, etaSeconds: eta };
  }
}

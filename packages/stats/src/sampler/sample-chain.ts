import { dualAveraging } from "../adaptation/dual-averaging";
import { initialStepSize } from "../adaptation/initial-step-size";
import { diagonalMassMatrix } from "../adaptation/mass-matrix";
import { warmupSchedule } from "../adaptation/window-schedule";
import type { DensityModel } from "../model/density-model";
import { createNutsInfo, createNutsState, NutsWorkspace, nutsTransition, type NutsSettings } from "../nuts/nuts-transition";
import { createPhasePoint } from "../nuts/phase-point";
import { createRandomSource } from "../rng/create-random-source";
import { findInitialPoint } from "./initial-point";
import {
  MAX_DIVERGENCE_RECORDS,
  resolveSamplerSettings,
  type ChainProgress,
  type ChainResult,
  type DivergenceRecord,
  type SamplerHooks,
  type SamplerSettings,
} from "./sampler-settings";

/**
 * Runs one chain: initialisation, windowed warm-up (dual-averaging step size and diagonal
 * metric), then post-warm-up draws. Synchronous and free of I/O, so it runs the same in
 * the main thread, a Node worker or a browser Web Worker. Chain k of a run draws from
 * stream k of the run's seed, so its draws do not depend on where it runs.
 */
export function sampleChain(model: DensityModel, settings: SamplerSettings, chainIndex: number, hooks: SamplerHooks = {}): ChainResult {
  const s = resolveSamplerSettings(settings);
  if (!Number.isInteger(chainIndex) || chainIndex < 0) throw new Error(`chain index must be a non-negative integer, got ${String(chainIndex)}`);
  checkModel(model);
  const started = now();
  const n = model.dimension;
  const names = model.constrainedNames;
  const width = names.length;
  const rng = createRandomSource(s.seed, chainIndex);

  let state = createNutsState(n);
  let next = createNutsState(n);
  let gradientEvaluations = findInitialPoint(model, rng, s.initRadius, state);

  const workspace = new NutsWorkspace(model, s.maxTreeDepth);
  const info = createNutsInfo();
  const inverseMetric = new Float64Array(n).fill(1);
  const scratch = createPhasePoint(n);
  const nuts: NutsSettings = { stepSize: 1, inverseMetric, maxTreeDepth: s.maxTreeDepth };
  const tuned = initialStepSize(model, state, inverseMetric, 1, rng, scratch);
  nuts.stepSize = tuned.stepSize;
  gradientEvaluations += tuned.gradientEvaluations;

  const schedule = warmupSchedule(s.warmup);
  const adaptStepSize = s.warmup > 0;
  let stepState = dualAveraging.init(nuts.stepSize);
  const metricState = diagonalMassMatrix.init(n);
  let windowIndex = 0;

  const kept = Math.ceil(s.draws / s.thin);
  const draws = new Float64Array(kept * width);
  const treeDepth = new Uint8Array(kept);
  const leapfrogSteps = new Int32Array(kept);
  const divergent = new Uint8Array(kept);
  const energy = new Float64Array(kept);
  const acceptStat = new Float64Array(kept);
  const logDensity = new Float64Array(kept);
  const constrained = new Float64Array(width);

  const total = s.warmup + s.draws;
  const progressEvery = Math.max(1, Math.floor(total / 200));
  let row = 0;
  let warmupDivergences = 0;
  let samplingDivergences = 0;
  let cancelled = false;
  const divergences: DivergenceRecord[] | undefined = s.recordDivergences ? [] : undefined;
  const start = new Float64Array(n);

  for (let iteration = 0; iteration < total; iteration++) {
    if (hooks.shouldStop?.() === true) {
      cancelled = true;
      break;
    }
    const warming = iteration < s.warmup;
    if (divergences !== undefined) start.set(state.position);
    const stepSize = nuts.stepSize;
    nutsTransition(workspace, state, rng, nuts, next, info);
    gradientEvaluations += info.leapfrogSteps;
    const swap = state;
    state = next;
    next = swap;
    if (divergences !== undefined && info.divergent && divergences.length < MAX_DIVERGENCE_RECORDS) {
      const startConstrained = new Float64Array(width);
      model.constrain(start, startConstrained);
      divergences.push({ iteration, phase: warming ? "warmup" : "sampling", stepSize, start: start.slice(), startConstrained, end: workspace.builder.divergencePoint.slice() });
    }

    if (warming) {
      if (info.divergent) warmupDivergences++;
      if (adaptStepSize) {
        stepState = dualAveraging.update(stepState, info.acceptStat, s);
        nuts.stepSize = stepState.stepSize;
      }
      const window = schedule.windows[windowIndex];
      if (window !== undefined && iteration >= window.start && iteration <= window.end) {
        diagonalMassMatrix.update(metricState, state.position);
        if (iteration === window.end) {
          diagonalMassMatrix.final(metricState, inverseMetric);
          windowIndex++;
          const retuned = initialStepSize(model, state, inverseMetric, nuts.stepSize, rng, scratch);
          nuts.stepSize = retuned.stepSize;
          gradientEvaluations += retuned.gradientEvaluations;
          stepState = dualAveraging.init(nuts.stepSize);
        }
      }
      if (iteration === s.warmup - 1) nuts.stepSize = dualAveraging.final(stepState);
    } else {
      if (info.divergent) samplingDivergences++;
      const sampleIndex = iteration - s.warmup;
      if (sampleIndex % s.thin === 0) {
        model.constrain(state.position, constrained);
        draws.set(constrained, row * width);
        treeDepth[row] = info.treeDepth;
        leapfrogSteps[row] = info.leapfrogSteps;
        divergent[row] = info.divergent ? 1 : 0;
        energy[row] = info.energy;
        acceptStat[row] = info.acceptStat;
        logDensity[row] = state.logDensity;
        row++;
      }
    }

    if (hooks.onProgress && ((iteration + 1) % progressEvery === 0 || iteration + 1 === total || iteration + 1 === s.warmup)) {
      const progress: ChainProgress = {
        chain: chainIndex,
        iteration: iteration + 1,
        total,
        phase: warming ? "warmup" : "sampling",
        divergences: warming ? warmupDivergences : samplingDivergences,
      };
      hooks.onProgress(progress);
    }
  }

  const trim = <T extends Float64Array | Uint8Array | Int32Array>(a: T, rowWidth: number): T => (row === kept ? a : (a.slice(0, row * rowWidth) as T));
  return {
    chain: chainIndex,
    names: [...names],
    draws: trim(draws, width),
    treeDepth: trim(treeDepth, 1),
    leapfrogSteps: trim(leapfrogSteps, 1),
    divergent: trim(divergent, 1),
    energy: trim(energy, 1),
    acceptStat: trim(acceptStat, 1),
    logDensity: trim(logDensity, 1),
    stepSize: nuts.stepSize,
    inverseMetric,
    gradientEvaluations,
    warmupDivergences,
    maxTreeDepth: s.maxTreeDepth,
    seconds: (now() - started) / 1000,
    cancelled,
    ...(divergences === undefined ? {} : { divergences }),
  };
}

function checkModel(model: DensityModel): void {
  if (model === null || typeof model !== "object") throw new Error("model must be an object");
  if (!Number.isInteger(model.dimension) || model.dimension < 1) throw new Error(`model dimension must be a positive integer, got ${String(model.dimension)}`);
  if (model.constrainedNames === null || typeof model.constrainedNames !== "object" || typeof model.constrainedNames.length !== "number") {
    throw new Error("model constrainedNames must be an array of strings");
  }
  if (typeof model.logDensityGradient !== "function" || typeof model.constrain !== "function") {
    throw new Error("model must provide logDensityGradient and constrain");
  }
}

function now(): number {
  return globalThis.performance.now();
}

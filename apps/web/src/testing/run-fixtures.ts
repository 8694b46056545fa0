// Invented runs and a run report for the Runs tests.
import type { Run, RunProgress, RunReport } from "@tributary/contracts";

const settings = {
  datasetVersionId: "dv-1",
  cacRanges: [{ channel: "search", lo: 20, hi: 400 }],
  maxLag: 8,
  saturation: "exponential" as const,
  likelihood: "normal" as const,
  seasonalityOrder: 2,
  pooling: "crossed" as const,
  holdoutWeeks: 4,
  chains: 2,
  warmup: 100,
  draws: 100,
  seed: 7,
  unpooledComparison: true,
};

export const testProgress: RunProgress = {
  stage: "pooled",
  queuePosition: null,
  chains: [
    { model: "pooled", chain: 1, iteration: 40, total: 200, phase: "warmup", divergences: 0, attempt: 1, cell: null, cellCount: null, etaSeconds: 95 },
    { model: "pooled", chain: 0, iteration: 150, total: 200, phase: "sampling", divergences: 2, attempt: 1, cell: null, cellCount: null, etaSeconds: 20 },
  ],
  fraction: 0.35,
  elapsedSeconds: 62,
  etaSeconds: 125,
  updatedAt: "2025-02-03T10:01:02.000Z",
};

export function testRun(overrides: Partial<Run> = {}): Run {
  return {
    id: "run-1",
    status: "succeeded",
    datasetVersionId: "dv-1",
    datasetVersionNumber: 3,
    modelSettingsId: "ms-1",
    settings,
    seed: 7,
    createdAt: "2025-02-03T10:00:00.000Z",
    createdBy: { id: "u-n", name: "Nell Ostrand" },
    startedAt: "2025-02-03T10:00:01.000Z",
    finishedAt: "2025-02-03T10:04:31.000Z",
    failureReason: null,
    restartedFromRunId: null,
    restartedByRunId: null,
    progress: null,
    trust: { trustworthy: true, reasons: [], warnings: [] },
    publication: null,
    current: false,
    ...overrides,
  };
}

export const untrustworthyTrust = {
  trustworthy: false,
  reasons: ["R-hat is above 1.01 for 3 parameters (worst: mu[search] at 1.042): the chains have not converged to the same distribution; run longer or reparameterise."],
  warnings: ["E-BFMI of chain 2 is 0.21: the sampler may explore the tails slowly."],
};

const model = {
  maxRhat: 1.042,
  minEssBulk: 88,
  minEssTail: 120,
  divergences: 0,
  treeDepthHits: 3,
  ebfmi: [0.61, 0.21],
  gradientEvaluations: 120_000,
  trustworthy: false,
  reasons: untrustworthyTrust.reasons,
  warnings: untrustworthyTrust.warnings,
  targetAcceptance: 0.8,
  attempts: 1,
};

export function testReport(run: Run): RunReport {
  const weeks = Array.from({ length: 12 }, (_, t) => new Date(Date.UTC(2024, 0, 1 + 7 * t)).toISOString().slice(0, 10));
  return {
    run,
    diagnostics: { ...model, pooled: model, unpooled: { ...model, maxRhat: 1.003, minEssBulk: 640, trustworthy: true, reasons: [], warnings: [] } },
    parameters: [
      { name: "mu[search]", label: "Portfolio effect, search", mean: -4.1, sd: 0.3, q05: -4.6, q50: -4.1, q95: -3.6, rhat: 1.042, essBulk: 88, essTail: 120, mcseMean: 0.03 },
      { name: "alpha[search]", label: "Carry-over, search", mean: 0.42, sd: 0.1, q05: 0.26, q50: 0.42, q95: 0.58, rhat: 1.002, essBulk: 900, essTail: 700, mcseMean: 0.003 },
      { name: "sigma[0]", label: "Noise, Fennick in Ardeval", mean: 21, sd: 2, q05: 18, q50: 21, q95: 24.5, rhat: null, essBulk: null, essTail: null, mcseMean: null },
    ],
    traces: [
      {
        name: "mu[search]",
        label: "Portfolio effect, search",
        rhat: 1.042,
        essBulk: 88,
        why: "highest R-hat",
        chains: [
          { chain: 0, iterations: [0, 1, 2, 3], values: [-4.1, -4.0, -4.2, -4.1] },
          { chain: 1, iterations: [0, 1, 2, 3], values: [-3.7, -3.8, -3.6, -3.7] },
        ],
        rankBins: 4,
        rankCounts: [
          { chain: 0, counts: [3, 2, 2, 1] },
          { chain: 1, counts: [1, 2, 2, 3] },
        ],
      },
    ],
    predictiveCheck: [
      {
        cellId: "c1",
        brand: "Fennick",
        market: "Ardeval",
        weeks,
        observed: weeks.map((_, t) => 400 + t),
        q05: weeks.map(() => 350),
        q25: weeks.map(() => 380),
        q50: weeks.map(() => 400),
        q75: weeks.map(() => 420),
        q95: weeks.map(() => 450),
        holdoutFrom: weeks[8]!,
        coverage90: 0.875,
      },
    ],
    holdout: {
      weeks: 4,
      crps: 12.5,
      mape: 4.2,
      coverage90: 0.75,
      cells: [{ cellId: "c1", brand: "Fennick", market: "Ardeval", crps: 12.5, mape: 4.2, coverage90: 0.75 }],
    },
    timing: { samplingSeconds: 250, pooledSeconds: 200, unpooledSeconds: 50, totalSeconds: 270 },
  };
}

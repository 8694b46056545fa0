// What a fit job needs, gathered from the database: the dataset version as the model's
// data, its lift tests, and the model settings translated into the fit's options.
import { eq } from "drizzle-orm";
import type { ModelSettings } from "@tributary/contracts";
import type { FitOptions, PortfolioData } from "@tributary/stats";
import type { Queryable } from "../db/client";
import { channels, liftTests } from "../db/schema";
import { loadPortfolioData, type PortfolioCellRef } from "../datasets/dataset-queries";

/** Lift tests as the model takes them (cells named as in the data). */
export type ModelLiftTest = NonNullable<NonNullable<FitOptions["model"]>["liftTests"]>[number];

export interface FitInput {
  readonly datasetVersionId: string;
  readonly datasetVersionNumber: number;
  readonly data: PortfolioData;
  /** Workspace ids of data.cells, in the same order. */
  readonly cells: readonly PortfolioCellRef[];
  readonly liftTests: readonly ModelLiftTest[];
}

export async function loadFitInput(db: Queryable, datasetVersionId: string): Promise<FitInput> {
  const stored = await loadPortfolioData(db, datasetVersionId);
  const rows = await db
    .select({
      cellId: liftTests.cellId,
      channel: channels.code,
      firstWeek: liftTests.firstWeek,
      lastWeek: liftTests.lastWeek,
      spend: liftTests.spend,
      incrementalOutcome: liftTests.measuredLift,
      standardError: liftTests.standardError,
    })
    .from(liftTests)
    .innerJoin(channels, eq(channels.id, liftTests.channelId))
    .where(eq(liftTests.datasetVersionId, datasetVersionId));
  const cellIndex = new Map(stored.cells.map((cell, g) => [cell.cellId, g] as const));
  const tests: ModelLiftTest[] = rows.flatMap((row) => {
    const g = cellIndex.get(row.cellId);
    if (g === undefined) return [];
    const cell = stored.data.cells[g]!;
    return [{ brand: cell.brand, market: cell.market, channel: row.channel, firstWeek: row.firstWeek, lastWeek: row.lastWeek, spend: row.spend, incrementalOutcome: row.incrementalOutcome, standardError: row.standardError }];
  });
  return { datasetVersionId, datasetVersionNumber: stored.versionNumber, data: stored.data, cells: stored.cells, liftTests: tests };
}

/** The fit's options from the model settings (the seed is the run's). */
export function fitOptionsOf(settings: ModelSettings, seed: number, tests: readonly ModelLiftTest[]): FitOptions {
  return {
    chains: settings.chains,
    warmup: settings.warmup,
    draws: settings.draws,
    seed,
    unpooled: settings.unpooledComparison,
    model: {
      maxLag: settings.maxLag,
      saturation: settings.saturation,
      likelihood: settings.likelihood,
      seasonalityOrder: settings.seasonalityOrder,
      pooling: settings.pooling,
      holdoutWeeks: settings.holdoutWeeks,
      cacRange: Object.fromEntries(settings.cacRanges.map((r) => [r.channel, [r.lo, r.hi] as const])),
      liftTests: tests,
    },
  };
}

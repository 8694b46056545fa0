import { z } from "zod";
import { MAX_CHANNEL_NAME_LENGTH } from "./intake";

// The settings of a fit, chosen on the Model setup screen and checked by the server with
// the same schema. Every field but the dataset version has a default.

/** Plausible low-spend cost per new customer when the analyst gives none (read as a 90 % interval). */
export const DEFAULT_CAC_RANGE = { lo: 5, hi: 2000 } as const;

export const saturationForms = ["exponential", "hill"] as const;
export const likelihoodKinds = ["normal", "student-t"] as const;
/** Which pooling levels are on; the cell's own deviation is always there. */
export const poolingStructures = ["crossed", "brand", "market", "cell-only"] as const;

export const saturationFormLabels: Record<(typeof saturationForms)[number], string> = {
  exponential: "Exponential",
  hill: "Hill (S-shaped)",
};
export const likelihoodLabels: Record<(typeof likelihoodKinds)[number], string> = {
  normal: "Normal",
  "student-t": "Student-t (robust to outlying weeks)",
};
export const poolingStructureLabels: Record<(typeof poolingStructures)[number], string> = {
  crossed: "Brand and market (crossed)",
  brand: "Brand only",
  market: "Market only",
  "cell-only": "None beyond the cell",
};

/** Bounds and defaults of the numeric settings, for forms and checks alike. */
export const modelSettingsBounds = {
  maxLag: { min: 1, max: 16, default: 8 },
  seasonalityOrder: { min: 0, max: 4, default: 2 },
  holdoutWeeks: { min: 0, max: 26, default: 0 },
  chains: { min: 1, max: 8, default: 4 },
  warmup: { min: 50, max: 5000, default: 1000 },
  draws: { min: 50, max: 5000, default: 1000 },
  seed: { min: 0, max: 4_294_967_295 },
  cac: { min: 0.01, max: 1e9 },
} as const;

const integerIn = (name: string, bounds: { min: number; max: number }) =>
  z
    .number(`Enter the ${name} as a whole number`)
    .int(`The ${name} must be a whole number`)
    .min(bounds.min, `The ${name} must be at least ${bounds.min}`)
    .max(bounds.max, `The ${name} must be at most ${bounds.max}`);

/** One channel's plausible low-spend cost per new customer, read as a 90 % interval. */
export const cacRangeSchema = z
  .object({
    channel: z.string().trim().min(1, "Choose the channel").max(MAX_CHANNEL_NAME_LENGTH),
    lo: z
      .number("Enter the lowest plausible cost per customer as a number")
      .min(modelSettingsBounds.cac.min, "The lowest plausible cost per customer must be greater than 0")
      .max(modelSettingsBounds.cac.max),
    hi: z.number("Enter the highest plausible cost per customer as a number").max(modelSettingsBounds.cac.max),
  })
  .refine((range) => range.hi > range.lo, {
    message: "The highest plausible cost per customer must be above the lowest",
    path: ["hi"],
  });
export type CacRange = z.infer<typeof cacRangeSchema>;

export const modelSettingsSchema = z.object({
  datasetVersionId: z.string().trim().min(1, "Choose a dataset version"),
  /** Channels left out use DEFAULT_CAC_RANGE. */
  cacRanges: z
    .array(cacRangeSchema)
    .max(50)
    .default([])
    .refine((ranges) => new Set(ranges.map((r) => r.channel)).size === ranges.length, "Give each channel at most one range"),
  /** Longest carry-over, in weeks (adstock maximum lag). */
  maxLag: integerIn("carry-over length", modelSettingsBounds.maxLag).default(modelSettingsBounds.maxLag.default),
  saturation: z.enum(saturationForms).default("exponential"),
  likelihood: z.enum(likelihoodKinds).default("normal"),
  /** Number of yearly sine/cosine pairs. */
  seasonalityOrder: integerIn("seasonality order", modelSettingsBounds.seasonalityOrder).default(
    modelSettingsBounds.seasonalityOrder.default,
  ),
  pooling: z.enum(poolingStructures).default("crossed"),
  /** The last weeks of every cell, left out of the fit to measure forecast accuracy. */
  holdoutWeeks: integerIn("number of holdout weeks", modelSettingsBounds.holdoutWeeks).default(
    modelSettingsBounds.holdoutWeeks.default,
  ),
  chains: integerIn("number of chains", modelSettingsBounds.chains).default(modelSettingsBounds.chains.default),
  warmup: integerIn("number of warm-up iterations", modelSettingsBounds.warmup).default(modelSettingsBounds.warmup.default),
  draws: integerIn("number of draws per chain", modelSettingsBounds.draws).default(modelSettingsBounds.draws.default),
  /** Fixes the random numbers, so the same settings give the same draws; a new one is chosen when left out. */
  seed: integerIn("seed", modelSettingsBounds.seed).optional(),
  /** Also fit every cell on its own, to show how far pooling moved it. */
  unpooledComparison: z.boolean().default(true),
});
/** What a form or a client sends (defaults may be left out). */
export type ModelSettingsInput = z.input<typeof modelSettingsSchema>;
/** The complete settings, defaults filled in. */
export type ModelSettings = z.output<typeof modelSettingsSchema>;

/** The default settings for a dataset version. */
export function defaultModelSettings(datasetVersionId: string): ModelSettings {
  return modelSettingsSchema.parse({ datasetVersionId });
}

/** The plausible CAC range of a channel under these settings. */
export function cacRangeOf(settings: Pick<ModelSettings, "cacRanges">, channel: string): { lo: number; hi: number } {
  const range = settings.cacRanges.find((r) => r.channel === channel);
  return range ? { lo: range.lo, hi: range.hi } : { ...DEFAULT_CAC_RANGE };
}

/** A stored set of model settings (POST /api/model-settings, GET /api/model-settings/:id). */
export const modelSettingsRecordSchema = z.object({
  id: z.string(),
  datasetVersionId: z.string(),
  datasetVersionNumber: z.number().int(),
  settings: modelSettingsSchema,
  createdAt: z.string(),
  createdBy: z.object({ id: z.string(), name: z.string() }).nullable(),
});
export type ModelSettingsRecord = z.infer<typeof modelSettingsRecordSchema>;

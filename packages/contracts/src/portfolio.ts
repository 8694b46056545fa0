import { z } from "zod";

export const brandSchema = z.object({
  id: z.string(),
  code: z.string(),
  name: z.string(),
  /** What a new customer is worth to the brand, in the reporting currency. */
  customerValue: z.number().nullable(),
});
export const marketSchema = z.object({ id: z.string(), code: z.string(), name: z.string() });
export const channelSchema = z.object({ id: z.string(), code: z.string(), name: z.string() });

/** A brand × market pair and how much weekly data the current dataset holds for it. */
export const cellSchema = z.object({
  id: z.string(),
  brandId: z.string(),
  marketId: z.string(),
  weeks: z.number().int(),
  firstWeek: z.string().nullable(),
  lastWeek: z.string().nullable(),
});

export const portfolioSchema = z.object({
  company: z.string(),
  currency: z.string(),
  brands: z.array(brandSchema),
  markets: z.array(marketSchema),
  channels: z.array(channelSchema),
  cells: z.array(cellSchema),
  /** The dataset version the cell lengths come from, or null before any upload. */
  datasetVersionId: z.string().nullable(),
});
export type Brand = z.infer<typeof brandSchema>;
export type Market = z.infer<typeof marketSchema>;
export type Channel = z.infer<typeof channelSchema>;
export type Cell = z.infer<typeof cellSchema>;
export type Portfolio = z.infer<typeof portfolioSchema>;

/** GET /api/markets/:marketId: one market and its cells (brand × market) in the current dataset. */
export const marketDetailSchema = z.object({
  market: marketSchema,
  brands: z.array(brandSchema),
  cells: z.array(cellSchema),
  datasetVersionId: z.string().nullable(),
});
export type MarketDetail = z.infer<typeof marketDetailSchema>;

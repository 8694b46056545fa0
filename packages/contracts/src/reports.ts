import { z } from "zod";

// GET /api/reports/run.pdf?brand=<brandId> or ?market=<marketId>: a PDF report of the
// current published run for one brand (its cells in the viewer's markets) or one market
// (a market manager: only their own). Every role may ask.
export const runReportQuery = z
  .object({
    brand: z.string().trim().min(1).optional(),
    market: z.string().trim().min(1).optional(),
  })
  .refine((q) => (q.brand === undefined) !== (q.market === undefined), "Ask for a report of one brand (?brand=…) or one market (?market=…)");
export type RunReportQuery = z.infer<typeof runReportQuery>;

/** Plan tables as CSV: GET /api/plans/:planId/allocation.csv and /api/plans/:planId/forecast.csv. */
export const planCsvTables = ["allocation", "forecast"] as const;

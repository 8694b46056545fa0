// GET /api/portfolio: the workspace at a glance, limited to the user's markets.
import type { Portfolio } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { workspaceSettings } from "../db/schema";
import { NotFound } from "../http/errors";
import { allChannels, latestDatasetVersionId, scopedBrands, scopedCells, scopedMarkets } from "../queries/portfolio-queries";

export const portfolioRoutes = [
  defineRoute({
    method: "get",
    path: "/api/portfolio",
    access: signedIn(markets.filtered),
    handler: async ({ db, scope }): Promise<Portfolio> => {
      const [settings] = await db.select().from(workspaceSettings).limit(1);
      if (!settings) throw new NotFound("The workspace has no settings yet");
      const datasetVersionId = await latestDatasetVersionId(db);
      const [brands, marketList, channels, cells] = await Promise.all([
        scopedBrands(db, scope),
        scopedMarkets(db, scope),
        allChannels(db),
        scopedCells(db, scope, datasetVersionId),
      ]);
      return {
        company: settings.companyName,
        currency: settings.currency,
        brands,
        markets: marketList,
        channels,
        cells,
        datasetVersionId,
      };
    },
  }),
];

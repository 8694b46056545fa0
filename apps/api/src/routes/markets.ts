// GET /api/markets (the user's markets) and GET /api/markets/:marketId (one market's cells).
import type { Market, MarketDetail } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { NotFound } from "../http/errors";
import { latestDatasetVersionId, scopedBrands, scopedCells, scopedMarkets } from "../queries/portfolio-queries";

export const marketRoutes = [
  defineRoute({
    method: "get",
    path: "/api/markets",
    access: signedIn(markets.filtered),
    handler: ({ db, scope }): Promise<Market[]> => scopedMarkets(db, scope),
  }),
  defineRoute({
    method: "get",
    path: "/api/markets/:marketId",
    access: signedIn(markets.fromParam("marketId")),
    handler: async ({ db, scope }): Promise<MarketDetail> => {
      const [market] = await scopedMarkets(db, scope);
      if (!market) throw new NotFound("No such market");
      const datasetVersionId = await latestDatasetVersionId(db);
      const [brands, cells] = await Promise.all([scopedBrands(db, scope), scopedCells(db, scope, datasetVersionId)]);
      return { market, brands, cells, datasetVersionId };
    },
  }),
];

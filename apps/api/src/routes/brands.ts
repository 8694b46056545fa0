// GET /api/brands: market managers see the brands present in their markets.
import type { Brand } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { scopedBrands } from "../queries/portfolio-queries";

export const brandRoutes = [
  defineRoute({
    method: "get",
    path: "/api/brands",
    access: signedIn(markets.filtered),
    handler: ({ db, scope }): Promise<Brand[]> => scopedBrands(db, scope),
  }),
];

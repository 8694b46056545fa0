// GET /api/health: for load balancers and the start script.
import { sql } from "drizzle-orm";
import type { Health } from "@tributary/contracts";
import { anyone, defineRoute } from "../access/route-table";

export const healthRoutes = [
  defineRoute({
    method: "get",
    path: "/api/health",
    access: anyone,
    handler: async ({ db, config, res }): Promise<Health> => {
      try {
        await db.execute(sql`select 1`);
        return { ok: true, version: config.version, database: "up" };
      } catch {
        res.status(503);
        return { ok: false, version: config.version, database: "down" };
      }
    },
  }),
];

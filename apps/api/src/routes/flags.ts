// Flags on cell × channel estimates: raised and cleared by analysts and admins, listed
// (with their history) for every role within their markets, and exported as CSV.
import { clearFlagInput, createFlagInput, flagStatuses, type Flag } from "@tributary/contracts";
import { defineRoute, markets, signedIn, type SignedInContext } from "../access/route-table";
import { flagsTable, sendCsv } from "../dashboards/csv-export";
import { clearFlag, flagMarkets, listFlags, raiseFlag } from "../dashboards/flags";
import { Invalid } from "../http/errors";

const flagRoles = ["analyst", "admin"] as const;

function single(raw: unknown, name: string): string | undefined {
  if (raw === undefined || raw === "") return undefined;
  if (typeof raw !== "string") throw new Invalid(`Give one ${name}`, [{ path: name, message: `Give one ${name}` }]);
  return raw;
}

function flagsOf({ req, db, scope }: SignedInContext): Promise<Flag[]> {
  const status = single(req.query.status, "status") ?? "all";
  if (!(flagStatuses as readonly string[]).includes(status)) {
    throw new Invalid(`Unknown flag status "${status}"; use ${flagStatuses.join(", ")}`, [{ path: "status", message: `Use ${flagStatuses.join(", ")}` }]);
  }
  const cell = single(req.query.cell, "cell");
  return listFlags(db, scope, { status: status as (typeof flagStatuses)[number], cellIds: cell ? [cell] : undefined, channel: single(req.query.channel, "channel") });
}

export const flagRoutes = [
  defineRoute({
    method: "get",
    path: "/api/flags",
    access: signedIn(markets.fromQuery("market")),
    handler: flagsOf,
  }),
  defineRoute({
    method: "get",
    path: "/api/flags/export.csv",
    access: signedIn(markets.fromQuery("market")),
    handler: async (ctx) => {
      sendCsv(ctx.res, "flags.csv", flagsTable(await flagsOf(ctx)));
    },
  }),
  // Analysts and admins see every market, so the flagged cell needs no market rule.
  defineRoute({
    method: "post",
    path: "/api/flags",
    access: signedIn(markets.unscoped, flagRoles),
    handler: async ({ req, res, db, user }): Promise<Flag> => {
      const input = createFlagInput.parse(req.body ?? {});
      const flag = await raiseFlag(db, input, user.id);
      res.status(201);
      return flag;
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/flags/:flagId/clear",
    access: signedIn(markets.resolvedBy((req, db) => flagMarkets(db, String(req.params.flagId))), flagRoles),
    handler: ({ req, db, user }): Promise<Flag> => clearFlag(db, String(req.params.flagId), clearFlagInput.parse(req.body ?? {}), user.id),
  }),
];

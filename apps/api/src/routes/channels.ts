// GET /api/channels: the portfolio's channel list, in display order.
import type { Channel } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { allChannels } from "../queries/portfolio-queries";

export const channelRoutes = [
  defineRoute({
    method: "get",
    path: "/api/channels",
    access: signedIn(markets.unscoped),
    handler: ({ db }): Promise<Channel[]> => allChannels(db),
  }),
];

// The Outbox screen (admins): every e-mail the product sent, to list and read.
import { outboxQuery, type OutboxMessage, type OutboxPage } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { outboxMessage, outboxPage } from "../mail/outbox-queries";

export const outboxRoutes = [
  defineRoute({
    method: "get",
    path: "/api/outbox",
    access: signedIn(markets.unscoped, ["admin"]),
    handler: ({ req, db }): Promise<OutboxPage> => outboxPage(db, outboxQuery.parse(req.query)),
  }),
  defineRoute({
    method: "get",
    path: "/api/outbox/:messageId",
    access: signedIn(markets.unscoped, ["admin"]),
    handler: ({ req, db }): Promise<OutboxMessage> => outboxMessage(db, String(req.params.messageId)),
  }),
];

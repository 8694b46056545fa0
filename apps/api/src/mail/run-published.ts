// "A new fit is published": each market manager gets their own markets' headline
// numbers. The estimates come through runResultsFor with the manager's scope, the same
// central filter the API uses, so no other market's cell can reach the e-mail; the
// subject and text name only the manager's markets.
import { and, asc, eq, inArray, isNotNull } from "drizzle-orm";
import type { Logger } from "pino";
import type { Database } from "../db/client";
import { safeErrorForLog } from "../http/error-handler";
import { markets, userMarkets, users } from "../db/schema";
import { channelNames } from "../queries/channel-names";
import { runRecord } from "../runs/run-queries";
import { runResultsFor } from "../runs/run-results";
import type { Mailer, MailMessage } from "./mailer";
import { runPublishedMessage, type PublishedHeadline } from "./messages";

/** The e-mails for a published run, one per enabled market manager with an account. */
export async function runPublishedMessages(db: Database, runId: string, baseUrl: string): Promise<MailMessage[]> {
  const managers = await db
    .select({ id: users.id, email: users.email, name: users.name })
    .from(users)
    .where(and(eq(users.role, "market_manager"), eq(users.disabled, false), isNotNull(users.passwordHash)))
    .orderBy(asc(users.email));
  if (managers.length === 0) return [];
  const scoped = await db
    .select({ userId: userMarkets.userId, marketId: markets.id, name: markets.name })
    .from(userMarkets)
    .innerJoin(markets, eq(markets.id, userMarkets.marketId))
    .where(inArray(userMarkets.userId, managers.map((m) => m.id)))
    .orderBy(asc(markets.name));
  const run = await runRecord(db, runId);
  const channelName = await channelNames(db);
  const messages: MailMessage[] = [];
  for (const manager of managers) {
    const own = scoped.filter((row) => row.userId === manager.id);
    if (own.length === 0) continue;
    const results = await runResultsFor(db, run, { marketIds: own.map((m) => m.marketId), allMarkets: false });
    const headlines: PublishedHeadline[] = results.cells
      .filter((cell) => cell.hasSpend)
      .map((cell) => ({ brand: cell.brand, market: cell.market, channelName: channelName(cell.channel), cacMedian: cell.cac0.q50, cacLow: cell.cac0.q05, cacHigh: cell.cac0.q95 }))
      .sort((a, b) => a.market.localeCompare(b.market) || a.brand.localeCompare(b.brand) || a.channelName.localeCompare(b.channelName));
    messages.push(
      runPublishedMessage({
        to: manager.email,
        toUserId: manager.id,
        recipientName: manager.name,
        marketNames: own.map((m) => m.name),
        currency: results.currency,
        trustworthy: run.trust.trustworthy,
        hasPublishReason: (run.publication?.reason ?? null) !== null,
        headlines,
        deskUrl: `${baseUrl}/market-desk`,
      }),
    );
  }
  return messages;
}

/**
 * Sends the publish e-mails. Called after the publication is stored: a failure is
 * logged and does not undo the publication (every message built before it is in the outbox).
 */
export async function notifyRunPublished(db: Database, mailer: Mailer, runId: string, baseUrl: string, log?: Logger): Promise<void> {
  try {
    for (const message of await runPublishedMessages(db, runId, baseUrl)) await mailer.send(message);
  } catch (error) {
    // The error's kind and first line only: a failed insert would quote the message (with its numbers).
    log?.error({ err: safeErrorForLog(error), runId }, "the e-mails about a published run could not all be sent");
  }
}

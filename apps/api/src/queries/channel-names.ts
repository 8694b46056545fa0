// Channel codes ("online_video") are what the runs, plans and API fields carry; people
// read the display names an admin keeps in the channels table ("Online video").
import type { Queryable } from "../db/client";
import { channels } from "../db/schema";

/** A channel's display name from its code. */
export type ChannelName = (code: string) => string;

/** The workspace's channel names by code; a code without a name reads as itself. */
export async function channelNames(db: Queryable): Promise<ChannelName> {
  const rows = await db.select({ code: channels.code, name: channels.name }).from(channels);
  const byCode = new Map(rows.map((row) => [row.code, row.name.trim()] as const));
  return (code) => byCode.get(code) || code;
}

// The column-mapping step works on one role per CSV column; the server wants a
// ColumnMappingDraft. These functions turn one into the other and check the choice.
import { sanitiseChannelName, type ColumnMappingDraft } from "@tributary/contracts";
import { z } from "zod";

export const columnRoles = ["week", "brand", "market", "outcome", "channel", "control", "ignore"] as const;
export type ColumnRole = (typeof columnRoles)[number];

/** Roles only one column can have. */
export const singleRoles = ["week", "brand", "market", "outcome"] as const;
export type SingleRole = (typeof singleRoles)[number];

export const columnRoleLabels: Record<ColumnRole, string> = {
  week: "Week (Monday's date)",
  brand: "Brand",
  market: "Market",
  outcome: "Outcome (e.g. new customers)",
  channel: "Spend on a channel",
  control: "Control",
  ignore: "Ignore",
};

export type ColumnChoice = { header: string; role: ColumnRole; channel: string };
export type MappingForm = { columns: ColumnChoice[] };

/** The role each header gets from a draft mapping (e.g. the server's guess); unnamed headers are ignored. */
export function choicesFromDraft(header: readonly string[], draft: ColumnMappingDraft): ColumnChoice[] {
  return header.map((column) => {
    for (const role of singleRoles) if (draft[role] === column) return { header: column, role, channel: "" };
    const channel = draft.channels.find((c) => c.column === column);
    if (channel) return { header: column, role: "channel", channel: channel.channel };
    if (draft.controls.includes(column)) return { header: column, role: "control", channel: "" };
    return { header: column, role: "ignore", channel: "" };
  });
}

/** A channel name proposed for a spend column: "spend_paid_social" → "paid_social". */
export function proposedChannelName(header: string): string {
  const clean = sanitiseChannelName(header);
  return clean.replace(/^(spend|cost|media)_+/, "") || clean;
}

/** The draft mapping the server checks, in the CSV's column order. */
export function draftFromChoices(columns: readonly ColumnChoice[]): ColumnMappingDraft {
  const single = (role: SingleRole) => columns.find((c) => c.role === role)?.header ?? null;
  return {
    week: single("week"),
    brand: single("brand"),
    market: single("market"),
    outcome: single("outcome"),
    channels: columns.filter((c) => c.role === "channel").map((c) => ({ column: c.header, channel: c.channel.trim() })),
    controls: columns.filter((c) => c.role === "control").map((c) => c.header),
    ignored: columns.filter((c) => c.role === "ignore").map((c) => c.header),
  };
}

const missingMessages: Record<SingleRole, string> = {
  week: "Choose the column that holds the week",
  brand: "Choose the column that holds the brand",
  market: "Choose the column that holds the market",
  outcome: "Choose the column that holds the outcome",
};

/** What the mapping step checks before asking the server: each single role once, at least one channel, clean unique names. */
export const mappingFormSchema = z
  .object({
    columns: z.array(z.object({ header: z.string(), role: z.enum(columnRoles), channel: z.string() })),
  })
  .superRefine(({ columns }, ctx) => {
    for (const role of singleRoles) {
      const holders = columns.filter((c) => c.role === role);
      if (holders.length === 0) ctx.addIssue({ code: "custom", path: ["roles", role], message: missingMessages[role] });
      if (holders.length > 1) {
        ctx.addIssue({ code: "custom", path: ["roles", role], message: `Only one column can be the ${role}; ${holders.length} are` });
      }
    }
    const channels = columns.map((c, i) => ({ ...c, index: i })).filter((c) => c.role === "channel");
    if (channels.length === 0) ctx.addIssue({ code: "custom", path: ["roles", "channel"], message: "Map at least one spend column to a channel" });
    const seen = new Map<string, string>();
    for (const c of channels) {
      const clean = sanitiseChannelName(c.channel);
      if (c.channel.trim() === "") {
        ctx.addIssue({ code: "custom", path: ["columns", c.index, "channel"], message: "Give the channel a name" });
      } else if (clean === "") {
        ctx.addIssue({ code: "custom", path: ["columns", c.index, "channel"], message: "Use letters or digits in the channel name" });
      } else if (seen.has(clean)) {
        ctx.addIssue({
          code: "custom",
          path: ["columns", c.index, "channel"],
          message: `"${seen.get(clean)}" already uses the channel name ${clean}`,
        });
      } else {
        seen.set(clean, c.header);
      }
    }
  });

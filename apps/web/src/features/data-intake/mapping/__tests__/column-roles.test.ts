import { describe, expect, it } from "vitest";
import { testUpload } from "../../../../testing/intake-fixtures";
import { choicesFromDraft, draftFromChoices, mappingFormSchema, proposedChannelName } from "../column-roles";

describe("column roles", () => {
  it("reads the server's guess as one role per column and turns it back into the same mapping", () => {
    const choices = choicesFromDraft(testUpload.header, testUpload.guess);
    expect(choices.map((c) => c.role)).toEqual(["week", "brand", "market", "outcome", "channel", "channel", "control", "ignore"]);
    expect(choices[5]).toEqual({ header: "spend_radio", role: "channel", channel: "radio" });
    const { notes: _notes, ...guess } = testUpload.guess;
    expect(draftFromChoices(choices)).toEqual(guess);
  });

  it("proposes a channel name from a spend column's header", () => {
    expect(proposedChannelName("spend_Paid Social")).toBe("paid_social");
    expect(proposedChannelName("TV")).toBe("tv");
    expect(proposedChannelName("spend")).toBe("spend");
  });

  it("names every missing role, a second outcome and clashing channel names", () => {
    const choices = choicesFromDraft(testUpload.header, testUpload.guess).map((c) =>
      c.header === "week_start" ? { ...c, role: "ignore" as const } : c.header === "price_index" ? { ...c, role: "outcome" as const } : c.header === "spend_radio" ? { ...c, channel: "Search!" } : c,
    );
    const result = mappingFormSchema.safeParse({ columns: choices });
    expect(result.success).toBe(false);
    const messages = result.error!.issues.map((issue) => `${issue.path.join(".")}: ${issue.message}`);
    expect(messages).toEqual([
      "roles.week: Choose the column that holds the week",
      "roles.outcome: Only one column can be the outcome; 2 are",
      'columns.5.channel: "spend_search" already uses the channel name search',
    ]);
  });
});

import { columnMappingDraftSchema, columnMappingSchema, sanitiseChannelName, type ColumnMapping } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { guessColumnMapping, validateMapping, type MappingResult } from "./column-mapping";

function valid(result: MappingResult): ColumnMapping {
  if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
  return result.mapping;
}

function invalid(result: MappingResult) {
  if (result.ok) throw new Error("expected the mapping to be rejected");
  return result.report;
}

const header = ["week", "brand", "market", "new_customers", "spend_tv", "spend_search", "notes"];
const mapping: ColumnMapping = {
  week: "week",
  brand: "brand",
  market: "market",
  outcome: "new_customers",
  channels: [
    { column: "spend_tv", channel: "tv" },
    { column: "spend_search", channel: "search" },
  ],
  controls: [],
  ignored: ["notes"],
};

describe("guessColumnMapping", () => {
  it("maps the command-line convention: week, brand, market, spend_<channel>, the one other numeric column as outcome", () => {
    const rows = [["2024-01-01", "Quillon", "Varnland", "310", "1800", "640", "promo"]];
    const guess = guessColumnMapping(header, rows);
    expect(guess).toEqual({ ...mapping, notes: [] });
    expect(columnMappingDraftSchema.safeParse(guess).success).toBe(true);
  });

  it("is case-insensitive and knows the other spellings of week, market and spend", () => {
    const guess = guessColumnMapping(["Week Start", "BRAND", "Country", "Customers", "TV_Spend", "Search-Cost", "Spend Paid Social", "Control_Price"]);
    expect(guess.week).toBe("Week Start");
    expect(guess.brand).toBe("BRAND");
    expect(guess.market).toBe("Country");
    expect(guess.channels).toEqual([
      { column: "TV_Spend", channel: "tv" },
      { column: "Search-Cost", channel: "search" },
      { column: "Spend Paid Social", channel: "paid_social" },
    ]);
    expect(guess.controls).toEqual(["Control_Price"]);
    expect(guess.outcome).toBe("Customers");
    expect(guess.ignored).toEqual([]);
    expect(guessColumnMapping(["date", "brand", "market", "y", "spend_tv"]).week).toBe("date");
  });

  it("prefers a column named week over one named date", () => {
    const guess = guessColumnMapping(["date", "week", "brand", "market", "y", "spend_tv"]);
    expect(guess.week).toBe("week");
    expect(guess.ignored).toContain("date");
  });

  it("asks for the outcome when several numeric columns are left, unless one is named like an outcome", () => {
    const h = ["week", "brand", "market", "visits", "orders_value", "spend_tv"];
    const rows = [["2024-01-01", "Quillon", "Varnland", "12", "34", "5"]];
    const guess = guessColumnMapping(h, rows);
    expect(guess.outcome).toBeNull();
    expect(guess.ignored).toEqual(["visits", "orders_value"]);
    expect(guess.notes).toEqual([{ role: "outcome", message: 'Several columns could be the outcome ("visits" and "orders_value"); choose one, or name it "outcome".' }]);

    const named = guessColumnMapping(["week", "brand", "market", "visits", "new_customers", "spend_tv"], rows);
    expect(named.outcome).toBe("new_customers");
    expect(named.ignored).toEqual(["visits"]);
  });

  it("leaves text columns out of the outcome choice when rows are given", () => {
    const h = ["week", "brand", "market", "comment", "signups", "spend_tv"];
    const rows = [
      ["2024-01-01", "Quillon", "Varnland", "launch week", "41", "5"],
      ["2024-01-08", "Quillon", "Varnland", "", "38", "5"],
    ];
    expect(guessColumnMapping(h, rows).outcome).toBe("signups");
    // Without rows, both are candidates, and "signups" is named like an outcome.
    expect(guessColumnMapping(h).outcome).toBe("signups");
  });

  it("notes every role it could not find", () => {
    const guess = guessColumnMapping(["a", "b"]);
    expect(guess.week).toBeNull();
    expect(guess.brand).toBeNull();
    expect(guess.market).toBeNull();
    expect(guess.channels).toEqual([]);
    expect(guess.notes.map((n) => n.role).sort()).toEqual(["brand", "channels", "market", "outcome", "week"]);
  });

  it("keeps the first of two columns naming the same channel and says so", () => {
    const guess = guessColumnMapping(["week", "brand", "market", "outcome", "spend_tv", "tv_spend"]);
    expect(guess.channels).toEqual([{ column: "spend_tv", channel: "tv" }]);
    expect(guess.ignored).toEqual(["tv_spend"]);
    expect(guess.notes).toEqual([{ role: "ignored", message: 'Columns "spend_tv" and "tv_spend" both look like spend on tv; "tv_spend" is ignored.' }]);
  });
});

describe("sanitiseChannelName", () => {
  it.each([
    ["TV", "tv"],
    ["Paid Social!", "paid_social"],
    ["  Télé—Radio  ", "tele_radio"],
    ["__search__", "search"],
    ["东方", ""],
    ["a".repeat(80), "a".repeat(64)],
  ])("%j → %j", (raw, expected) => {
    expect(sanitiseChannelName(raw)).toBe(expected);
  });
});

describe("validateMapping", () => {
  it("accepts a complete mapping and fills in the ignored columns from the header", () => {
    const result = valid(validateMapping({ ...mapping, ignored: [] }, header));
    expect(result).toEqual(mapping);
  });

  it("sanitises channel names to [a-z0-9_]", () => {
    const result = valid(validateMapping({ ...mapping, channels: [{ column: "spend_tv", channel: "Linear TV" }] }, header));
    expect(result.channels).toEqual([{ column: "spend_tv", channel: "linear_tv" }]);
    expect(result.ignored).toEqual(["spend_search", "notes"]);
  });

  it("requires the week, brand, market and outcome", () => {
    const report = invalid(validateMapping({ ...mapping, week: null, outcome: "" }, header));
    expect(report.errors.map((e) => [e.code, e.message])).toEqual([
      ["mapping_incomplete", "Choose the week column."],
      ["mapping_incomplete", "Choose the outcome column."],
    ]);
  });

  it("requires at least one channel", () => {
    const report = invalid(validateMapping({ ...mapping, channels: [] }, header));
    expect(report.errors[0]?.message).toBe("Column mapping (channels): Map at least one spend column to a channel");
  });

  it("rejects columns that are not in the header", () => {
    const report = invalid(validateMapping({ ...mapping, controls: ["price_index"] }, header));
    expect(report.errors).toEqual([
      { severity: "error", code: "column_unknown", row: null, column: "price_index", message: 'The control column "price_index" is not in the file\'s header.' },
    ]);
  });

  it("uses every column once", () => {
    const report = invalid(
      validateMapping({ ...mapping, outcome: "spend_tv", controls: ["week"], ignored: ["brand"] }, header),
    );
    expect(report.errors.map((e) => e.message)).toEqual([
      'The column "spend_tv" is mapped twice (as outcome and as spend); use each column once.',
      'The column "week" is mapped twice (as week and as control); use each column once.',
      'The column "brand" is both mapped as brand and ignored.',
    ]);
  });

  it("rejects channel names that sanitise to nothing or to the same name", () => {
    const report = invalid(
      validateMapping(
        {
          ...mapping,
          channels: [
            { column: "spend_tv", channel: "TV" },
            { column: "spend_search", channel: "tv!" },
            { column: "notes", channel: "—" },
          ],
          ignored: [],
        },
        header,
      ),
    );
    expect(report.errors.map((e) => e.code)).toEqual(["channel_name_duplicate", "channel_name_invalid"]);
    expect(report.errors[0]?.message).toBe('Columns "spend_tv" and "spend_search" are both named channel "tv"; give each channel its own name.');
  });

  it("rejects anything that is not a mapping, without throwing", () => {
    for (const input of [null, undefined, 42, "week", [], { week: 1 }]) {
      const report = invalid(validateMapping(input, header));
      expect(report.errorCount).toBeGreaterThan(0);
    }
  });

  it("agrees with the shared zod schema on the shape", () => {
    expect(columnMappingSchema.safeParse(mapping).success).toBe(true);
    expect(columnMappingSchema.safeParse({ ...mapping, channels: [] }).success).toBe(false);
  });
});

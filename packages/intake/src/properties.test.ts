import {
  channelNamePattern,
  dayNumberToIsoDate,
  isoDateToDayNumber,
  liftTestInputSchema,
  sanitiseChannelName,
  validationReportSchema,
  type ColumnMapping,
  type ValidationReport,
} from "@tributary/contracts";
import type { CellSeries, PortfolioData } from "@tributary/stats";
import fc from "fast-check";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { displayName, nameKey, nameProblem } from "./entity-names";
import { readFixture } from "./fixtures/load-fixture";
import { TABLE_HEADER, TABLE_MAPPING } from "./fixtures/tidy-table";
import { parseLiftTestsCsv, validateLiftTest } from "./lift-tests";
import { readTidyCsv, type TidyCsvResult } from "./tidy-csv";
import { validateTidyRows } from "./tidy-rows";

// Fixed seeds keep every run the same; the run counts keep the suite quick.
const seed = 20240101;

/** Either data that satisfy the model's expectations, or a report holding at least one error. */
function expectDataOrError(result: TidyCsvResult): void {
  expect(validationReportSchema.safeParse(result.report).success).toBe(true);
  if (!result.ok) {
    expect(result.report.ok).toBe(false);
    expect(result.report.errorCount).toBeGreaterThan(0);
    expect(result.report.errors.length).toBeGreaterThan(0);
    return;
  }
  expect(result.report.errorCount).toBe(0);
  expectModelReady(result.data);
}

function expectModelReady(data: PortfolioData): void {
  expect(data.cells.length).toBeGreaterThan(0);
  for (const channel of data.channels) expect(channel).toMatch(channelNamePattern);
  const keys = data.cells.map((c) => `${nameKey(c.brand)}\u0000${nameKey(c.market)}`);
  expect(new Set(keys).size).toBe(keys.length);
  for (const cell of data.cells) {
    const first = isoDateToDayNumber(cell.firstWeek);
    expect(first).not.toBeNull();
    expect(((first as number) - 4) % 7).toBe(0);
    const T = cell.outcome.length;
    expect(T).toBeGreaterThanOrEqual(8);
    expect(cell.spend).toHaveLength(data.channels.length);
    expect(cell.controls).toHaveLength(data.controls.length);
    for (const y of cell.outcome) expect(Number.isFinite(y) && y >= 0).toBe(true);
    for (const series of cell.spend) {
      expect(series).toHaveLength(T);
      for (const x of series) expect(Number.isFinite(x) && x >= 0).toBe(true);
    }
    for (const series of cell.controls) {
      expect(series).toHaveLength(T);
      for (const z of series) expect(Number.isFinite(z)).toBe(true);
    }
  }
}

// ---------------------------------------------------------------------------------
// Random and malicious text
// ---------------------------------------------------------------------------------

const nastyTokens = [
  "",
  ",",
  '"',
  '""',
  "\n",
  "\r\n",
  "\r",
  "\u0000",
  "\ufeff",
  "\ufffd",
  "=1+1",
  "+cmd",
  "-1",
  "@SUM(A1)",
  "NaN",
  "Infinity",
  "-Infinity",
  "1e400",
  "1e12",
  "1e13",
  "0x1F",
  "1,5",
  " 12 ",
  "2024-01-01",
  "2024-01-03",
  "2024-02-30",
  "01/02/2024",
  "week",
  "brand",
  "market",
  "outcome",
  "spend_tv",
  "spend_",
  "Quillon",
  "QUILLON",
  "Zoe\u0308",
  "東灯",
  "%PDF-",
  "PK\u0003\u0004",
  ";",
  "\t",
  "x".repeat(300),
  "9".repeat(400),
];
const tokenArb = fc.oneof(fc.constantFrom(...nastyTokens), fc.string({ unit: "binary", maxLength: 6 }));
const csvishArb = fc
  .tuple(
    fc.boolean(),
    fc.array(fc.array(tokenArb, { maxLength: 9 }), { maxLength: 25 }),
    fc.constantFrom("\n", "\r\n", "\r"),
  )
  .map(([withHeader, rows, newline]) => {
    const lines = rows.map((row) => row.join(","));
    if (withHeader) lines.unshift("week,brand,market,outcome,spend_tv,spend_search");
    return lines.join(newline);
  });

/** The valid fixture with random edits: characters inserted, deleted or replaced. */
const validText = readFixture("valid-small.csv");
const mutatedArb = fc
  .array(fc.tuple(fc.nat({ max: validText.length }), fc.nat({ max: 12 }), tokenArb), { minLength: 1, maxLength: 6 })
  .map((edits) => {
    let text = validText;
    for (const [at, remove, insert] of edits) {
      const position = Math.min(at, text.length);
      text = text.slice(0, position) + insert + text.slice(position + remove);
    }
    return text;
  });

/** The valid fixture with random values replaced, written back as well-formed CSV (so the row checks are reached). */
const validTable = Papa.parse<string[]>(validText.trim(), { skipEmptyLines: true }).data;
const cellEditedArb = fc
  .array(
    fc.tuple(
      fc.nat({ max: validTable.length - 1 }),
      fc.nat({ max: 8 }),
      fc.oneof(tokenArb, fc.constantFrom("2024-01-03", "2024-01-07", "2024-01-08", "2024-03-25", "1e400", "-3", "0")),
    ),
    { minLength: 1, maxLength: 4 },
  )
  .map((edits) => {
    const rows = validTable.map((row) => [...row]);
    for (const [r, c, value] of edits) (rows[r] as string[])[c] = value;
    return Papa.unparse(rows);
  });

describe("property: any text gives data or a report with an error, and never throws", () => {
  it("random Unicode and binary strings", () => {
    fc.assert(
      fc.property(fc.oneof(fc.string({ unit: "binary", maxLength: 400 }), fc.string({ unit: "grapheme", maxLength: 400 })), (text) => {
        expectDataOrError(readTidyCsv(text));
      }),
      { seed, numRuns: 300 },
    );
  });

  it("random bytes decoded as UTF-8, as an upload would be", () => {
    const decoder = new TextDecoder("utf-8");
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 600 }), (bytes) => {
        expectDataOrError(readTidyCsv(decoder.decode(bytes)));
      }),
      { seed, numRuns: 300 },
    );
  });

  it("CSV-like text built from malicious tokens", () => {
    fc.assert(
      fc.property(csvishArb, (text) => {
        expectDataOrError(readTidyCsv(text));
      }),
      { seed, numRuns: 400 },
    );
  });

  it("the valid fixture with random edits", () => {
    fc.assert(
      fc.property(mutatedArb, (text) => {
        expectDataOrError(readTidyCsv(text));
      }),
      { seed, numRuns: 400 },
    );
  });

  it("the valid fixture with random values replaced", () => {
    const seen = new Set<string>();
    fc.assert(
      fc.property(cellEditedArb, (text) => {
        const result = readTidyCsv(text);
        expectDataOrError(result);
        for (const issue of result.report.errors) seen.add(issue.code);
      }),
      { seed, numRuns: 400 },
    );
    // The edits reach the row checks, not only the file checks.
    for (const code of ["not_a_number", "formula", "not_finite", "negative_spend", "date_invalid", "date_not_monday", "duplicate_row", "week_gap"]) {
      expect(seen, code).toContain(code);
    }
  });

  it("random rows and any mapping at all", () => {
    const header = [...TABLE_HEADER];
    const mappingArb = fc.oneof(
      fc.constant(TABLE_MAPPING as unknown),
      fc.anything(),
      fc.record({
        week: fc.constantFrom(...header, "nope"),
        brand: fc.constantFrom(...header),
        market: fc.constantFrom(...header),
        outcome: fc.constantFrom(...header),
        channels: fc.array(fc.record({ column: fc.constantFrom(...header), channel: fc.string({ maxLength: 8 }) }), { maxLength: 3 }),
        controls: fc.array(fc.constantFrom(...header), { maxLength: 2 }),
        ignored: fc.array(fc.string({ maxLength: 5 }), { maxLength: 2 }),
      }),
    );
    fc.assert(
      fc.property(fc.array(fc.array(tokenArb, { minLength: 5, maxLength: 7 }), { maxLength: 30 }), mappingArb, (rows, mapping) => {
        const report: ValidationReport = validateTidyRows(header, rows, mapping as ColumnMapping);
        expect(validationReportSchema.safeParse(report).success).toBe(true);
        expect(report.ok).toBe(report.errorCount === 0);
        if (!report.ok) expect(report.errors.length).toBeGreaterThan(0);
      }),
      { seed, numRuns: 300 },
    );
  });

  it("lift tests: any input is either a valid test or rejected with errors", () => {
    const data = readTidyCsv(validText);
    if (!data.ok) throw new Error("fixture unreadable");
    const fieldArb = fc.oneof(fc.anything(), fc.constantFrom(...nastyTokens), fc.double(), fc.constantFrom("2024-02-05", "2024-02-26", "Fernhollow", "Varnland", "tv"));
    const inputArb = fc.oneof(
      fc.anything(),
      fc.record(
        {
          brand: fieldArb,
          market: fieldArb,
          channel: fieldArb,
          firstWeek: fieldArb,
          lastWeek: fieldArb,
          spend: fieldArb,
          incrementalOutcome: fieldArb,
          standardError: fieldArb,
          note: fieldArb,
        },
        { requiredKeys: [] },
      ),
    );
    fc.assert(
      fc.property(inputArb, (input) => {
        const result = validateLiftTest(input, data.data);
        expect(result.report.ok).toBe(result.ok);
        if (result.ok) expect(liftTestInputSchema.safeParse(result.test).success).toBe(true);
        else expect(result.report.errors.length).toBeGreaterThan(0);
      }),
      { seed, numRuns: 500 },
    );
    fc.assert(
      fc.property(csvishArb, (text) => {
        const result = parseLiftTestsCsv(text, data.data);
        expect(result.report.ok).toBe(result.ok);
        if (!result.ok) expect(result.report.errors.length).toBeGreaterThan(0);
      }),
      { seed, numRuns: 200 },
    );
  });
});

// ---------------------------------------------------------------------------------
// Valid generated tables round-trip through CSV text
// ---------------------------------------------------------------------------------

interface GeneratedTable {
  readonly mapping: ColumnMapping;
  readonly header: string[];
  /** The cells the rows were made from, in generation order. */
  readonly cells: CellSeries[];
  readonly rows: string[][];
}

const EARLIEST_MONDAY = isoDateToDayNumber("2015-01-05") as number;

const entityNameArb = fc
  .string({ unit: "grapheme", minLength: 1, maxLength: 14 })
  .map(displayName)
  .filter((name) => name !== "" && nameProblem(name) === null && !name.includes("\ufffd"));

const channelArb = fc.stringMatching(/^[a-z][a-z0-9_]{0,9}$/).filter((name) => sanitiseChannelName(name) === name);

const amountArb = fc.oneof(fc.integer({ min: 0, max: 50_000 }), fc.double({ min: 0, max: 1e12, noNaN: true }));
const controlValueArb = fc.oneof(fc.integer({ min: -100, max: 100 }), fc.double({ min: -1e12, max: 1e12, noNaN: true }));

const zeroless = (x: number) => (x === 0 ? 0 : x);

const tableArb: fc.Arbitrary<GeneratedTable> = fc
  .record({
    brands: fc.uniqueArray(entityNameArb, { minLength: 1, maxLength: 3, selector: nameKey }),
    markets: fc.uniqueArray(entityNameArb, { minLength: 1, maxLength: 3, selector: nameKey }),
    channels: fc.uniqueArray(channelArb, { minLength: 1, maxLength: 4 }),
    controlCount: fc.integer({ min: 0, max: 2 }),
  })
  .chain(({ brands, markets, channels, controlCount }) => {
    const pairs = brands.flatMap((brand) => markets.map((market) => [brand, market] as const));
    const controls = Array.from({ length: controlCount }, (_, k) => `control_${k + 1}`);
    const cellArb = (brand: string, market: string) =>
      fc
        .record({ startWeek: fc.integer({ min: 0, max: 300 }), weeks: fc.integer({ min: 8, max: 40 }) })
        .chain(({ startWeek, weeks }) =>
          fc
            .record({
              outcome: fc.array(amountArb, { minLength: weeks, maxLength: weeks }),
              spend: fc.array(fc.array(amountArb, { minLength: weeks, maxLength: weeks }), { minLength: channels.length, maxLength: channels.length }),
              controls: fc.array(fc.array(controlValueArb, { minLength: weeks, maxLength: weeks }), { minLength: controlCount, maxLength: controlCount }),
            })
            .map(
              (values): CellSeries => ({
                brand,
                market,
                firstWeek: dayNumberToIsoDate(EARLIEST_MONDAY + 7 * startWeek),
                outcome: Float64Array.from(values.outcome, zeroless),
                spend: values.spend.map((s) => Float64Array.from(s, zeroless)),
                controls: values.controls.map((s) => Float64Array.from(s, zeroless)),
              }),
            ),
        );
    return fc
      .subarray(pairs, { minLength: 1 })
      .chain((chosen) => fc.tuple(...chosen.map(([brand, market]) => cellArb(brand, market))))
      .chain((cells) => {
        const header = ["week", "brand", "market", "outcome", ...channels.map((c) => `spend_${c}`), ...controls];
        const rows = cells.flatMap((cell) => {
          const first = isoDateToDayNumber(cell.firstWeek) as number;
          return Array.from(cell.outcome, (y, t) => [
            dayNumberToIsoDate(first + 7 * t),
            cell.brand,
            cell.market,
            String(y),
            ...cell.spend.map((s) => String(s[t])),
            ...cell.controls.map((s) => String(s[t])),
          ]);
        });
        const mapping: ColumnMapping = {
          week: "week",
          brand: "brand",
          market: "market",
          outcome: "outcome",
          channels: channels.map((channel) => ({ column: `spend_${channel}`, channel })),
          controls,
          ignored: [],
        };
        return fc.shuffledSubarray(rows, { minLength: rows.length, maxLength: rows.length }).map((shuffled) => ({ mapping, header, cells, rows: shuffled }));
      });
  });

/** The data a table should come back as: cells sorted by brand, then market (case-insensitive, then exact). */
function expectedData(table: GeneratedTable): PortfolioData {
  const order = (a: string, b: string) => {
    const [la, lb] = [a.toLowerCase(), b.toLowerCase()];
    return la < lb ? -1 : la > lb ? 1 : a < b ? -1 : a > b ? 1 : 0;
  };
  return {
    channels: table.mapping.channels.map((c) => c.channel),
    controls: [...table.mapping.controls],
    cells: [...table.cells].sort((a, b) => order(a.brand, b.brand) || order(a.market, b.market)),
  };
}

function toCsvText(table: GeneratedTable, newline: string, bom: boolean): string {
  return (bom ? "\ufeff" : "") + Papa.unparse({ fields: table.header, data: table.rows }, { newline });
}

describe("property: a valid table round-trips through CSV text to the same PortfolioData", () => {
  it("with the mapping given", () => {
    fc.assert(
      fc.property(tableArb, fc.constantFrom("\n", "\r\n"), fc.boolean(), (table, newline, bom) => {
        const result = readTidyCsv(toCsvText(table, newline, bom), { mapping: table.mapping });
        if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
        expect(result.data).toEqual(expectedData(table));
        expectModelReady(result.data);
      }),
      { seed, numRuns: 150 },
    );
  });

  it("with the mapping guessed from the header (the fit command's path)", () => {
    fc.assert(
      fc.property(tableArb, (table) => {
        const result = readTidyCsv(Papa.unparse({ fields: table.header, data: table.rows }));
        if (!result.ok) throw new Error(result.report.errors.map((e) => e.message).join(" | "));
        expect(result.mapping).toEqual(table.mapping);
        expect(result.data).toEqual(expectedData(table));
      }),
      { seed, numRuns: 60 },
    );
  });
});

describe("property: one broken row is found and named", () => {
  it("a dropped inner week is a gap naming that Monday", () => {
    fc.assert(
      fc.property(tableArb, fc.nat(), (table, pick) => {
        const cell = table.cells[pick % table.cells.length] as CellSeries;
        const first = isoDateToDayNumber(cell.firstWeek) as number;
        const dropped = dayNumberToIsoDate(first + 7 * (1 + (pick % (cell.outcome.length - 2))));
        const rows = table.rows.filter((row) => !(row[0] === dropped && row[1] === cell.brand && row[2] === cell.market));
        const result = readTidyCsv(Papa.unparse({ fields: table.header, data: rows }), { mapping: table.mapping });
        expect(result.ok).toBe(false);
        const gaps = result.report.errors.filter((e) => e.code === "week_gap");
        expect(gaps).toHaveLength(1);
        expect(gaps[0]?.message).toContain(`${cell.brand} × ${cell.market}`);
        expect(gaps[0]?.message).toContain(`first and last week: ${dropped}.`);
      }),
      { seed, numRuns: 80 },
    );
  });

  it("a repeated row is a duplicate naming both rows", () => {
    fc.assert(
      fc.property(tableArb, fc.nat(), (table, pick) => {
        const index = pick % table.rows.length;
        const rows = [...table.rows, table.rows[index] as string[]];
        const result = readTidyCsv(Papa.unparse({ fields: table.header, data: rows }), { mapping: table.mapping });
        expect(result.ok).toBe(false);
        expect(result.report.errors.map((e) => [e.code, e.row])).toEqual([["duplicate_row", rows.length + 1]]);
        expect(result.report.errors[0]?.message).toContain(`(first given in row ${index + 2})`);
      }),
      { seed, numRuns: 80 },
    );
  });

  it("a negative spend is named by row and column", () => {
    fc.assert(
      fc.property(tableArb, fc.nat(), fc.nat(), (table, pickRow, pickChannel) => {
        const index = pickRow % table.rows.length;
        const channel = pickChannel % table.mapping.channels.length;
        const rows = table.rows.map((row) => [...row]);
        (rows[index] as string[])[4 + channel] = "-0.5";
        const result = readTidyCsv(Papa.unparse({ fields: table.header, data: rows }), { mapping: table.mapping });
        expect(result.ok).toBe(false);
        expect(result.report.errors.map((e) => [e.code, e.row, e.column])).toEqual([["negative_spend", index + 2, table.mapping.channels[channel]?.column]]);
      }),
      { seed, numRuns: 80 },
    );
  });
});

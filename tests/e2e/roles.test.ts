// Signing in as each demo role against the real server: what each one sees.
import { afterAll, describe, expect, inject, it } from "vitest";
import { demoMarkets } from "../../apps/api/src/demo/demo-design";
import { headingText, navigationLabels, portfolioGridMarkets, signIn } from "./support/app";
import { openBrowser, type BrowserSession } from "./support/browser";
import { demoUsers } from "./support/users";

const everyScreen = [
  "Portfolio map",
  "Brand comparison",
  "Market desk",
  "Channel sheet",
  "Data intake",
  "Model setup",
  "Runs",
  "Pooling review",
  "Spend planner",
  "Budget split",
  "People & access",
  "Portfolio settings",
  "Outbox",
];

function marketNames(codes: readonly string[]): string[] {
  return codes.map((code) => demoMarkets.find((market) => market.code === code)?.name ?? code);
}

// The shared server started once by support/global-setup.ts.
const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];

async function browser(): Promise<BrowserSession> {
  const session = await openBrowser();
  sessions.push(session);
  return session;
}

afterAll(async () => {
  for (const session of sessions) await session.close();
});

describe("market manager", () => {
  it("lands on the Market desk, sees only their market on the Portfolio map and no admin screens", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "veltriaManager");
    expect(new URL(page.url()).pathname).toBe("/market-desk");
    expect(await headingText(page)).toBe("Market desk");

    expect(await navigationLabels(page)).toEqual(["Market desk", "Portfolio map", "Brand comparison", "Channel sheet", "Spend planner"]);

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Portfolio map" }).click();
    expect(await portfolioGridMarkets(page)).toEqual(marketNames(demoUsers.veltriaManager.markets));

    // The server scopes the data too, not just the screen.
    const apiMarkets = await page.evaluate(async () => {
      const response = await fetch("/api/portfolio");
      const body = (await response.json()) as { markets: { name: string }[] };
      return body.markets.map((market) => market.name);
    });
    expect(apiMarkets).toEqual(["Veltria"]);

    for (const path of ["/people-access", "/portfolio-settings", "/outbox", "/data-intake", "/budget-split"]) {
      await page.goto(`${server.baseUrl}${path}`);
      await page.getByRole("heading", { name: /is not available for your role/ }).waitFor();
    }
    expect(problems).toEqual([]);
  });

  it("with two markets sees exactly those two", async () => {
    const { page } = await browser();
    await signIn(page, server.baseUrl, "southManager");
    await page.goto(`${server.baseUrl}/portfolio-map`);
    expect((await portfolioGridMarkets(page)).sort()).toEqual(marketNames(demoUsers.southManager.markets).sort());
    await page.goto(`${server.baseUrl}/market-desk`);
    const picker = page.getByRole("combobox", { name: "Market" });
    await picker.waitFor();
    // Each of their markets, after the choice of both together.
    const options = await picker.locator("option:not([value=all])").allTextContents();
    expect(options.sort()).toEqual(marketNames(demoUsers.southManager.markets).sort());
    expect(await picker.inputValue()).toBe("all");
  });
});

describe("admin", () => {
  it("sees every market and every screen", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "admin");
    expect(await headingText(page)).toBe("Portfolio map");
    expect(await navigationLabels(page)).toEqual(everyScreen);
    expect((await portfolioGridMarkets(page)).sort()).toEqual(demoMarkets.map((market) => market.name).sort());
    for (const label of ["People & access", "Portfolio settings", "Outbox"]) {
      await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: label }).click();
      await page.getByRole("heading", { level: 1, name: label }).waitFor();
    }
    expect(problems).toEqual([]);
  });
});

describe("every role signs in", () => {
  const expected = {
    admin: { home: "Portfolio map", screens: everyScreen.length },
    portfolioLead: { home: "Portfolio map", screens: 6 },
    analyst: { home: "Portfolio map", screens: 10 },
    veltriaManager: { home: "Market desk", screens: 5 },
    southManager: { home: "Market desk", screens: 5 },
  } as const;

  for (const [who, { home, screens }] of Object.entries(expected) as [keyof typeof expected, (typeof expected)[keyof typeof expected]][]) {
    it(`${demoUsers[who].name} (${demoUsers[who].role}) lands on ${home} with ${screens} screens`, async () => {
      const { page, problems } = await browser();
      await signIn(page, server.baseUrl, who);
      expect(await headingText(page)).toBe(home);
      expect(await navigationLabels(page)).toHaveLength(screens);
      await page.getByRole("region", { name: "Your account" }).getByText(demoUsers[who].name).waitFor();
      expect(problems).toEqual([]);
    });
  }
});

describe("sign-in and sign-out", () => {
  it("a wrong password gets a clear message and no session", async () => {
    const { page } = await browser();
    await page.goto(`${server.baseUrl}/portfolio-map`);
    await page.waitForURL((url) => url.pathname === "/sign-in");
    expect(new URL(page.url()).searchParams.get("redirectTo")).toBe("/portfolio-map");
    await page.getByLabel("E-mail").fill(demoUsers.analyst.email);
    await page.getByLabel("Password").fill("not-the-password");
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("alert").getByText(/do not match an account/).waitFor();
    expect(new URL(page.url()).pathname).toBe("/sign-in");
  });

  it("returns to the screen asked for, and signing out ends the session", async () => {
    const { page } = await browser();
    await page.goto(`${server.baseUrl}/spend-planner`);
    await page.waitForURL((url) => url.pathname === "/sign-in");
    await page.getByLabel("E-mail").fill(demoUsers.portfolioLead.email);
    await page.getByLabel("Password").fill(demoUsers.portfolioLead.password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Spend planner" }).waitFor();

    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    await page.getByRole("heading", { name: "Sign in to Tributary" }).waitFor();
    const status = await page.evaluate(async () => (await fetch("/api/auth/me")).status);
    expect(status).toBe(401);
    await page.goto(`${server.baseUrl}/portfolio-map`);
    await page.waitForURL((url) => url.pathname === "/sign-in");
  });
});

// The strict Content-Security-Policy against the real app in Chromium: every response
// carries it, and no screen of any role makes the browser report a violation — charts
// (Observable Plot), React style props, the planning and prior-check workers, the
// Outbox's sandboxed message frame included. Violations are caught with the
// `securitypolicyviolation` event (from the first script of every page) and as console
// errors; a deliberate violation first shows that the watch works. The Outbox frame
// (srcdoc, so it inherits the policy) may use exactly the e-mails' style attributes.
import type { Page } from "playwright-core";
import type { DashboardStatus, PortfolioMap } from "@tributary/contracts";
import { afterAll, describe, expect, inject, it } from "vitest";
import { fetchFromPage, signIn } from "./support/app";
import { openBrowser, type BrowserSession } from "./support/browser";
import { demoUsers, type DemoUserKey } from "./support/users";

const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];
afterAll(async () => {
  for (const session of sessions) await session.close();
});

declare global {
  interface Window {
    __cspViolations?: string[];
  }
}

async function watchedBrowser(): Promise<BrowserSession> {
  const session = await openBrowser();
  sessions.push(session);
  await session.context.addInitScript(() => {
    const seen: string[] = [];
    window.__cspViolations = seen;
    document.addEventListener("securitypolicyviolation", (event) => {
      seen.push(`${event.effectiveDirective} refused ${event.blockedURI || "inline"} (${event.sourceFile}:${event.lineNumber}) ${event.sample}`);
    });
  });
  return session;
}

/** Violations reported on the current page since the last call, each with where it happened. */
async function takeViolations(page: Page, where: string): Promise<string[]> {
  const list = await page.evaluate(() => (window.__cspViolations ?? []).splice(0));
  return list.map((violation) => `${where}: ${violation}`);
}

/** Waits for the screen to settle (data loaded, charts drawn). */
async function settle(page: Page): Promise<void> {
  await page.waitForLoadState("networkidle");
  await page.waitForTimeout(300);
}

const forbiddenSources = ["'unsafe-inline'", "'unsafe-eval'", "'unsafe-hashes'", "'strict-dynamic'", "*", "http:", "https:"];

describe("the Content-Security-Policy header", () => {
  it("is strict on the app's page, its scripts and the API", async () => {
    for (const path of ["/", "/sign-in", "/portfolio-map", "/api/health"]) {
      const response = await fetch(`${server.baseUrl}${path}`);
      const policy = response.headers.get("content-security-policy") ?? "";
      const directives = new Map(
        policy
          .split(";")
          .map((part) => part.trim().split(/\s+/))
          .filter((parts) => parts[0])
          .map(([name, ...values]) => [name!, values] as const),
      );
      expect(directives.get("script-src"), path).toEqual(["'self'"]);
      expect(directives.get("style-src"), path).toEqual(["'self'"]);
      expect(directives.get("object-src"), path).toEqual(["'none'"]);
      expect(directives.get("base-uri"), path).toEqual(["'none'"]);
      expect(directives.get("frame-ancestors"), path).toEqual(["'none'"]);
      expect(directives.get("connect-src"), path).toEqual(["'self'"]);
      expect(directives.get("img-src"), path).toEqual(["'self'", "data:"]);
      expect(directives.get("default-src"), path).toEqual(["'self'"]);
      // The Outbox's srcdoc frame inherits the policy: the e-mails' own style attributes are allowed by hash, nothing else.
      const attributeStyles = directives.get("style-src-attr") ?? [];
      expect(attributeStyles[0], path).toBe("'unsafe-hashes'");
      expect(attributeStyles.slice(1).every((value) => /^'sha256-[A-Za-z0-9+/]+=*'$/.test(value)), path).toBe(true);
      for (const [name, values] of directives) {
        for (const value of name === "style-src-attr" ? values.slice(1) : values) expect(forbiddenSources, `${path}: ${name} allows ${value}`).not.toContain(value);
      }
    }
  });

  it("the built page has no inline script or style for the policy to refuse", async () => {
    const html = await (await fetch(`${server.baseUrl}/`)).text();
    expect(html).not.toMatch(/<script(?![^>]*\bsrc=)[^>]*>/i);
    expect(html).not.toMatch(/<style[\s>]/i);
    expect(html).not.toMatch(/\sstyle=/i);
    expect(html).not.toMatch(/\son[a-z]+=/i);
  });
});

describe("no screen breaks the policy", () => {
  it("the watch sees a deliberate violation (an inline <style> added by script)", async () => {
    const { page } = await watchedBrowser();
    await page.goto(`${server.baseUrl}/sign-in`);
    await page.getByRole("heading", { name: "Sign in to Tributary" }).waitFor();
    const applied = await page.evaluate(() => {
      const style = document.createElement("style");
      style.textContent = "body { outline: 7px solid rgb(1, 2, 3); }";
      document.head.append(style);
      return getComputedStyle(document.body).outlineWidth;
    });
    await page.waitForTimeout(200);
    const violations = await takeViolations(page, "sign-in");
    expect(violations.some((v) => v.includes("style-src-elem refused inline"))).toBe(true);
    expect(applied).not.toBe("7px");
  });

  it("signed out: the sign-in page and the invitation page", async () => {
    const { page, problems } = await watchedBrowser();
    const violations: string[] = [];
    await page.goto(`${server.baseUrl}/sign-in`);
    await page.getByRole("heading", { name: "Sign in to Tributary" }).waitFor();
    await settle(page);
    violations.push(...(await takeViolations(page, "/sign-in")));
    await page.goto(`${server.baseUrl}/invite/not-a-real-invitation-token-0000000000`);
    await page.getByRole("heading", { level: 1 }).waitFor();
    await settle(page);
    violations.push(...(await takeViolations(page, "/invite")));
    expect(violations).toEqual([]);
    // The invitation page's lookup answers 404 for a made-up token: an expected answer.
    expect(problems.filter((p) => !p.includes("404"))).toEqual([]);
  });

  const roles: DemoUserKey[] = ["admin", "analyst", "portfolioLead", "veltriaManager"];
  for (const who of roles) {
    it(`${demoUsers[who].name} (${demoUsers[who].role}): every screen of the navigation, a Channel sheet${who === "admin" ? ", a run's report and an Outbox message" : ""}`, async () => {
      const { page, problems } = await watchedBrowser();
      const violations: string[] = [];
      await signIn(page, server.baseUrl, who);
      violations.push(...(await takeViolations(page, "sign-in")));

      const nav = page.getByRole("navigation", { name: "Main" });
      const labels = (await nav.getByRole("link").allTextContents()).map((text) => text.trim());
      expect(labels.length).toBeGreaterThan(0);
      for (const label of labels) {
        await nav.getByRole("link", { name: label }).click();
        await page.getByRole("heading", { level: 1, name: label }).waitFor();
        await settle(page);
        violations.push(...(await takeViolations(page, label)));
      }

      // A Channel sheet of a cell the user sees: posterior histograms, response curve, carry-over, contribution.
      const map = await fetchFromPage<PortfolioMap>(page, "/api/dashboards/portfolio-map");
      const cell = map.cells.find((c) => c.hasSpend)!;
      const channel = map.channels[0]!.code;
      await page.goto(`${server.baseUrl}/channel-sheet?cell=${cell.cellId}&channel=${channel}`);
      await page.getByRole("heading", { level: 1, name: "Channel sheet" }).waitFor();
      await page.locator(".plot-holder svg").first().waitFor();
      await settle(page);
      violations.push(...(await takeViolations(page, "Channel sheet")));

      if (who === "admin") {
        // The current run's report: trace and rank plots, the predictive check.
        const status = await fetchFromPage<DashboardStatus>(page, "/api/dashboards/status");
        await page.goto(`${server.baseUrl}/runs/${status.current!.runId}`);
        await page.getByRole("heading", { level: 1 }).waitFor();
        await page.locator(".plot-holder svg").first().waitFor();
        await settle(page);
        violations.push(...(await takeViolations(page, "run report")));

        // An e-mail in the Outbox, shown in its sandboxed frame: made here (an invitation, sent with the page's CSRF token).
        const sent = await page.evaluate(async () => {
          const token = /(?:^|;\s*)tributary_csrf=([^;]+)/.exec(document.cookie)?.[1] ?? "";
          const response = await fetch("/api/invitations", {
            method: "POST",
            headers: { "Content-Type": "application/json", "X-CSRF-Token": decodeURIComponent(token) },
            body: JSON.stringify({ email: "csp.check@quillfern.example", role: "analyst" }),
          });
          return response.status;
        });
        expect(sent).toBe(201);
        await page.goto(`${server.baseUrl}/outbox`);
        await page.getByRole("heading", { level: 1, name: "Outbox" }).waitFor();
        await page.getByRole("button", { name: /^Read “.*” to csp\.check@quillfern\.example$/ }).click();
        const message = page.frameLocator("iframe[title^='Message as sent']");
        await message.locator("body").waitFor();
        await settle(page);
        // The e-mail's own inline styles still apply inside the frame.
        expect(await message.locator("h1").evaluate((h1) => getComputedStyle(h1).fontSize)).toBe("18px");
        violations.push(...(await takeViolations(page, "Outbox message")));
      }

      expect(violations).toEqual([]);
      expect(problems).toEqual([]);
    });
  }
});

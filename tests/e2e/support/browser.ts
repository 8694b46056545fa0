// Debian's chromium driven by playwright-core, with a throwaway profile per session.
import { mkdirSync, mkdtempSync, rmSync } from "node:fs";
import { tmpdir } from "node:os";
import { dirname, join } from "node:path";
import { chromium, type BrowserContext, type Page } from "playwright-core";
import { repoRoot } from "./server";

const chromiumFlags = [
  "--headless",
  "--no-sandbox",
  "--disable-gpu",
  "--disable-quic",
  "--no-first-run",
  "--disable-background-networking",
  "--disable-component-update",
  "--disable-sync",
];

const unpublishedDashboard = /^\/api\/dashboards\/(portfolio-map|brand-comparison|market-desk|pooling-review)$/;

export type BrowserSession = {
  context: BrowserContext;
  page: Page;
  /** Uncaught errors and console errors seen so far on the page. */
  problems: string[];
  close: () => Promise<void>;
};

export async function openBrowser(viewport: { width: number; height: number } = { width: 1366, height: 900 }): Promise<BrowserSession> {
  const profileDir = mkdtempSync(join(tmpdir(), "tributary-chromium-"));
  const context = await chromium.launchPersistentContext(profileDir, {
    executablePath: "/usr/bin/chromium",
    args: chromiumFlags,
    viewport,
  });
  const page = context.pages()[0] ?? (await context.newPage());
  const problems: string[] = [];
  page.on("pageerror", (error) => problems.push(`page error: ${error.message}`));
  page.on("console", (message) => {
    if (message.type() !== "error") return;
    // A 401 from /api/auth/me before signing in is the expected answer, not a problem.
    if (message.text().includes("401")) return;
    // So is a dashboard's 404 before any run is published: the screen says so honestly.
    if (message.text().includes("404") && unpublishedDashboard.test(new URL(message.location().url || "http://x/").pathname)) return;
    problems.push(`console: ${message.text()}`);
  });
  return {
    context,
    page,
    problems,
    close: async () => {
      await context.close();
      rmSync(profileDir, { recursive: true, force: true });
    },
  };
}

/** Saves a full-page screenshot under test-results/screenshots/ (ignored by git). */
export async function saveScreenshot(page: Page, ...nameParts: string[]): Promise<string> {
  const file = join(repoRoot, "test-results", "screenshots", ...nameParts) + ".png";
  mkdirSync(dirname(file), { recursive: true });
  // Park the pointer off the navigation so no link shows its hover state.
  await page.mouse.move(page.viewportSize()?.width ?? 1366, 0);
  await page.screenshot({ path: file, fullPage: true, animations: "disabled" });
  return file;
}

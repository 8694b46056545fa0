// Every screen each demo role can open, with a screenshot of each under
// test-results/screenshots/<role>/ for people to look at.
import { describe, expect, inject, it } from "vitest";
import { headingText, signIn } from "./support/app";
import { openBrowser, saveScreenshot } from "./support/browser";
import { demoUserKeys, demoUsers } from "./support/users";

// The shared server started once by support/global-setup.ts.
const server = { baseUrl: inject("baseUrl") };

function slug(text: string): string {
  return text.toLowerCase().replace(/&/g, "and").replace(/[^a-z0-9]+/g, "-").replace(/^-|-$/g, "");
}

describe("screens by role", () => {
  it("shows the sign-in page", async () => {
    const { page, problems, close } = await openBrowser();
    try {
      await page.goto(`${server.baseUrl}/sign-in`);
      await page.getByRole("heading", { name: "Sign in to Tributary" }).waitFor();
      await page.evaluate(() => document.fonts.ready);
      expect(await page.evaluate(() => document.fonts.check('16px "Work Sans"'))).toBe(true);
      await saveScreenshot(page, "sign-in");
      expect(problems).toEqual([]);
    } finally {
      await close();
    }
  });

  for (const who of demoUserKeys) {
    it(`opens every screen in ${demoUsers[who].name}'s navigation (${demoUsers[who].role})`, async () => {
      const { page, problems, close } = await openBrowser();
      try {
        await signIn(page, server.baseUrl, who);
        const nav = page.getByRole("navigation", { name: "Main" });
        const links = await nav.getByRole("link").all();
        const targets: { label: string; href: string }[] = [];
        for (const link of links) {
          targets.push({ label: ((await link.textContent()) ?? "").trim(), href: (await link.getAttribute("href")) ?? "" });
        }
        expect(targets.length).toBeGreaterThan(0);
        for (const [index, target] of targets.entries()) {
          await nav.getByRole("link", { name: target.label }).click();
          await page.waitForURL((url) => url.pathname === target.href);
          await page.getByRole("heading", { level: 1, name: target.label }).waitFor();
          expect(await page.title()).toBe(`${target.label} · Tributary`);
          await page.waitForLoadState("networkidle");
          await saveScreenshot(page, who, `${String(index + 1).padStart(2, "0")}-${slug(target.label)}`);
        }
        if (demoUsers[who].role !== "admin") {
          await page.goto(`${server.baseUrl}/people-access`);
          expect(await headingText(page)).toBe("People & access is not available for your role");
          await saveScreenshot(page, who, "99-not-available");
        }
        expect(problems).toEqual([]);
      } finally {
        await close();
      }
    });
  }
});

// Steps a person takes in the app, written once for every browser test.
import type { Page } from "playwright-core";
import { demoUsers, type DemoUserKey } from "./users";

export async function signIn(page: Page, baseUrl: string, who: DemoUserKey): Promise<void> {
  const user = demoUsers[who];
  await page.goto(`${baseUrl}/sign-in`);
  await page.getByLabel("E-mail").fill(user.email);
  await page.getByLabel("Password").fill(user.password);
  await page.getByRole("button", { name: "Sign in" }).click();
  await page.waitForURL((url) => url.pathname !== "/sign-in" && url.pathname !== "/");
  await page.getByRole("heading", { level: 1 }).waitFor();
}

export async function navigationLabels(page: Page): Promise<string[]> {
  const links = page.getByRole("navigation", { name: "Main" }).getByRole("link");
  return (await links.allTextContents()).map((text) => text.trim());
}

/** Market names in the column headers of the Portfolio map's brands × markets grid. */
export async function portfolioGridMarkets(page: Page): Promise<string[]> {
  const grid = page.getByRole("table", { name: /Brands × markets/ });
  await grid.waitFor();
  const headers = (await grid.getByRole("columnheader").allTextContents()).map((text) => text.trim());
  return headers.slice(1);
}

export async function headingText(page: Page): Promise<string> {
  return (await page.getByRole("heading", { level: 1 }).first().textContent())?.trim() ?? "";
}

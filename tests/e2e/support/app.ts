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

/** GET a JSON route of the API from inside the page, with the page's session (what the screen itself may read). */
export async function fetchFromPage<T>(page: Page, url: string): Promise<T> {
  const result = await page.evaluate(async (target) => {
    const response = await fetch(target, { headers: { Accept: "application/json" } });
    return { status: response.status, body: (await response.text()) as string };
  }, url);
  if (result.status !== 200) throw new Error(`GET ${url} answered ${result.status}: ${result.body.slice(0, 300)}`);
  return JSON.parse(result.body) as T;
}

/** GET a text route (a CSV export) from inside the page; returns status and body. */
export async function fetchTextFromPage(page: Page, url: string): Promise<{ status: number; body: string }> {
  return page.evaluate(async (target) => {
    const response = await fetch(target);
    return { status: response.status, body: await response.text() };
  }, url);
}

/** Every piece of text the page holds, including screen-reader tables, options and titles. */
export async function allPageText(page: Page): Promise<string> {
  return page.evaluate(() => {
    const titles = [...document.querySelectorAll("[title],[aria-label]")].map((node) => `${node.getAttribute("title") ?? ""} ${node.getAttribute("aria-label") ?? ""}`);
    return `${document.title}\n${document.body.textContent ?? ""}\n${titles.join("\n")}`;
  });
}

// The invitation flow end to end in the browser: the admin invites a market manager, reads
// the e-mail in the Outbox, and the invited person follows its link in a browser of their
// own, sets a password, lands in the app and can sign in again. Screenshots land in
// test-results/screenshots/invitation/.
import { afterAll, describe, expect, inject, it } from "vitest";
import { navigationLabels, signIn } from "./support/app";
import { openBrowser, saveScreenshot, type BrowserSession } from "./support/browser";

const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];
const email = `maren.oakby.${Date.now().toString(36)}@quillfern.example`;
const password = "tidewater lantern 42";

afterAll(async () => {
  for (const session of sessions) await session.close();
});

async function browser(): Promise<BrowserSession> {
  const session = await openBrowser({ width: 1366, height: 900 });
  sessions.push(session);
  return session;
}

describe("inviting someone", () => {
  let link = "";

  it("the admin invites a market manager and finds the e-mail in the Outbox", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "admin");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "People & access" }).click();
    await page.getByRole("heading", { level: 1, name: "People & access" }).waitFor();
    await page.getByRole("table", { name: "People" }).getByRole("row", { name: /Ilse Varnholt/ }).waitFor();

    const form = page.getByRole("form", { name: "Invite someone" });
    await form.getByLabel("E-mail address").fill(email);
    await form.getByLabel("Role").selectOption("market_manager");
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByText("Choose at least one market for a market manager").waitFor();
    await form.getByRole("checkbox", { name: "Solvera" }).check();
    await form.getByRole("button", { name: "Send invitation" }).click();
    await form.getByRole("status").getByText(`Invitation sent to ${email} as Market manager for Solvera. The e-mail is in the Outbox.`).waitFor();
    const invitations = page.getByRole("table", { name: "Invitations" });
    await invitations.getByRole("row", { name: new RegExp(email.replace(/\./g, "\\.")) }).getByText("Waiting", { exact: true }).waitFor();
    await saveScreenshot(page, "invitation", "01-people-and-access");

    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Outbox" }).click();
    await page.getByRole("heading", { level: 1, name: "Outbox" }).waitFor();
    await page.getByLabel("Recipient contains").fill(email);
    await page.getByRole("button", { name: "Filter" }).click();
    const read = page.getByRole("button", { name: new RegExp(`^Read “.*” to ${email.replace(/\./g, "\\.")}$`) });
    await read.waitFor();
    await read.click();
    const reader = page.getByRole("article");
    await reader.waitFor();
    const frame = reader.locator("iframe");
    expect(await frame.getAttribute("sandbox")).toBe("");
    // The message renders inside the locked frame, and nothing of it runs in the app.
    const inside = page.frameLocator("iframe[title^='Message as sent']");
    await inside.locator("body").waitFor();
    expect(await inside.locator("a[href*='/invite/']").count()).toBeGreaterThan(0);
    await saveScreenshot(page, "invitation", "02-outbox-message");

    await reader.getByRole("button", { name: "Plain text" }).click();
    const text = reader.getByLabel("Plain-text version");
    link = (await text.getByRole("link", { name: /\/invite\// }).getAttribute("href")) ?? "";
    expect(link).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/invite\/[A-Za-z0-9_-]{20,}$/);
    await saveScreenshot(page, "invitation", "03-outbox-plain-text");
    expect(problems).toEqual([]);
  });

  it("the invited person follows the link in a fresh browser, sets a password and is signed in", async () => {
    expect(link).not.toBe("");
    const { page, problems } = await browser();
    await page.goto(link);
    await page.getByRole("heading", { level: 1, name: "Accept your invitation" }).waitFor();
    const form = page.getByRole("form", { name: "Accept the invitation" });
    await form.getByText(new RegExp(`as Market manager, with the e-mail address ${email.replace(/\./g, "\\.")}`)).waitFor();
    await form.getByLabel("Your name").fill("Maren Oakby");
    await form.getByLabel("Choose a password").fill("short");
    await form.getByLabel("Repeat the password").fill("short");
    await form.getByRole("button", { name: "Create my account" }).click();
    await form.getByText("Use at least 12 characters").waitFor();
    await saveScreenshot(page, "invitation", "04-accept-with-errors");

    await form.getByLabel("Choose a password").fill(password);
    await form.getByLabel("Repeat the password").fill(password);
    await form.getByRole("button", { name: "Create my account" }).click();
    await page.getByRole("heading", { level: 1, name: "Market desk" }).waitFor({ timeout: 30_000 });
    expect(await navigationLabels(page)).toEqual(["Market desk", "Portfolio map", "Brand comparison", "Channel sheet", "Spend planner"]);
    await saveScreenshot(page, "invitation", "05-signed-in");

    await page.getByRole("button", { name: "Sign out", exact: true }).click();
    await page.getByRole("heading", { name: "Sign in to Tributary" }).waitFor();
    await page.getByLabel("E-mail").fill(email);
    await page.getByLabel("Password").fill(password);
    await page.getByRole("button", { name: "Sign in" }).click();
    await page.getByRole("heading", { level: 1, name: "Market desk" }).waitFor();
    const me = await page.evaluate(async () => (await fetch("/api/auth/me")).json());
    expect(me).toMatchObject({ email, name: "Maren Oakby", role: "market_manager" });

    // The link worked once.
    await page.goto(link);
    await page.getByRole("heading", { level: 1, name: "This invitation link does not work" }).waitFor();
    await page.getByRole("alert").getByText(/used already or withdrawn/).waitFor();
    await saveScreenshot(page, "invitation", "06-link-used");
    expect(problems.filter((problem) => !/status of 404/.test(problem))).toEqual([]);
  });

  it("the admin sees the invitation accepted and the new person in the list", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "admin");
    await page.goto(`${server.baseUrl}/people-access`);
    const invitations = page.getByRole("table", { name: "Invitations" });
    await invitations.getByRole("row", { name: new RegExp(email.replace(/\./g, "\\.")) }).getByText("Accepted", { exact: true }).waitFor();
    await page.getByRole("table", { name: "People" }).getByRole("row", { name: /Maren Oakby/ }).getByText("Solvera").waitFor();
    await saveScreenshot(page, "invitation", "07-accepted");
    expect(problems).toEqual([]);
  });
});

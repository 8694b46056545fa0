// Planning against the real server and the demo's published fit: a market manager builds
// and saves a spend scenario for their market; a portfolio lead splits a budget, saves
// and submits it (an admin rejects it with a comment), downloads a PDF report; an
// analyst's split is approved by the portfolio lead (nobody decides on their own plan).
// Screenshots land in test-results/screenshots/planning/.
import { readFileSync } from "node:fs";
import { afterAll, describe, expect, inject, it } from "vitest";
import { signIn } from "./support/app";
import { openBrowser, saveScreenshot, type BrowserSession } from "./support/browser";

const server = { baseUrl: inject("baseUrl") };
const sessions: BrowserSession[] = [];
const stamp = Date.now().toString(36);

afterAll(async () => {
  for (const session of sessions) await session.close();
});

async function browser(): Promise<BrowserSession> {
  const session = await openBrowser({ width: 1366, height: 900 });
  sessions.push(session);
  return session;
}

describe("planning", () => {
  it("a market manager builds a scenario for their own market, compares it with the current plan and saves it", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "veltriaManager");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Spend planner" }).click();
    await page.getByRole("heading", { level: 1, name: "Spend planner" }).waitFor();
    const current = page.getByRole("table", { name: "Current plan per line" });
    await current.waitFor({ timeout: 60_000 });

    // Only the manager's market is offered and planned.
    const setup = page.getByRole("region", { name: "What to plan" });
    const cellLabels = (await setup.getByRole("checkbox").evaluateAll((boxes) => boxes.map((box) => box.parentElement?.textContent?.trim() ?? ""))).filter(Boolean);
    expect(cellLabels.length).toBeGreaterThan(0);
    for (const label of cellLabels) expect(label).toMatch(/ in Veltria$/);
    for (const row of await current.getByRole("row").allTextContents()) if (!row.startsWith("Cell")) expect(row).toMatch(/in Veltria/);
    // Channels read by their display names; the codes stay the values.
    await current.getByRole("cell", { name: "Online video", exact: true }).first().waitFor();
    expect(await current.getByRole("cell", { name: "online_video", exact: true }).count()).toBe(0);
    await current.getByRole("textbox", { name: /^Planned weekly spend, Online video in \w+ Veltria$/ }).first().waitFor();

    const scenario = page.getByRole("region", { name: /^Scenario / }).first();
    await scenario.getByLabel("Scenario name").fill(`Veltria: more search, audio paused ${stamp}`);
    const name = `Veltria: more search, audio paused ${stamp}`;
    const first = `change 1 of ${name}`;
    const channels = await scenario.getByRole("combobox", { name: `Channel of ${first}` }).evaluate((select) => [...(select as HTMLSelectElement).options].map((o) => ({ value: o.value, label: o.textContent ?? "" })));
    expect(channels).toContainEqual({ value: "online_video", label: "Online video" });
    const search = channels.find((option) => /search/i.test(option.value))?.value;
    const audio = channels.find((option) => /audio/i.test(option.value))?.value;
    expect(search && audio).toBeTruthy();
    await scenario.getByRole("combobox", { name: `Channel of ${first}` }).selectOption(search!);
    await scenario.getByRole("textbox", { name: `Factor, ${first}` }).fill("1.4");
    await scenario.getByRole("button", { name: "Add a change" }).click();
    const second = `change 2 of ${name}`;
    await scenario.getByRole("combobox", { name: `Kind of ${second}` }).selectOption("zero");
    await scenario.getByRole("combobox", { name: `Channel of ${second}` }).selectOption(audio!);
    await scenario.getByRole("textbox", { name: `First week, ${second}` }).fill("1");
    await scenario.getByRole("textbox", { name: `Last week, ${second}` }).fill("6");

    const comparison = page.getByRole("table", { name: "Scenarios against the current plan" });
    const row = comparison.getByRole("row", { name: new RegExp(name.replace(/[.*+?^${}()|[\]\\]/g, "\\$&")) });
    await row.waitFor({ timeout: 60_000 });
    await page.locator('[data-planner-status="done"]').waitFor({ timeout: 60_000 });
    const rowText = (await row.textContent()) ?? "";
    // A cost per extra customer in money, or "Not defined" in words; never a bare silly number.
    expect(rowText).toMatch(/€[\d,]+ per extra customer|Not defined|Saves €|More customers for no extra spend|Fewer customers for no saving/);
    console.log(`spend planner in Chromium: ${await page.locator("[data-planner-status]").textContent()}`);
    await page.getByRole("figure", { name: "New customers per week: current plan and scenarios" }).locator("svg").first().waitFor();
    await saveScreenshot(page, "planning", "01-spend-planner-scenario");

    const save = page.getByRole("form", { name: `Save ${name}` });
    expect(await save.getByLabel("Save as").inputValue()).toBe(name);
    await save.getByRole("button", { name: "Save scenario" }).click();
    await save.getByRole("status").getByText(`Saved as “${name}”. People who can see Veltria can open it.`).waitFor({ timeout: 30_000 });
    const saved = page.getByRole("table", { name: "Saved scenarios" });
    await saved.getByRole("row", { name: new RegExp(`Veltria: more search, audio paused ${stamp}`) }).waitFor();
    await saveScreenshot(page, "planning", "02-spend-planner-saved");
    expect(problems).toEqual([]);
  });

  it("a portfolio lead splits a budget, saves and submits it, and downloads a report", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "portfolioLead");
    await page.getByRole("navigation", { name: "Main" }).getByRole("link", { name: "Budget split" }).click();
    await page.getByRole("heading", { level: 1, name: "Budget split" }).waitFor();
    const form = page.getByRole("form", { name: "Budget split inputs" });
    await form.waitFor({ timeout: 60_000 });
    // Keep some TV in every cell: a lower bound per line, over the 13 weeks.
    await form.getByRole("textbox", { name: "Lower bound, TV", exact: true }).fill("50000");
    await form.getByRole("button", { name: "Split the budget" }).click();

    const check = page.getByRole("region", { name: "Check: equal return at the margin" }).first();
    await check.waitFor({ timeout: 120_000 });
    expect(await check.getAttribute("data-marginal-equal")).toBe("true");
    expect(await check.textContent()).toMatch(/per 1,000 EUR/);
    const atBounds = page.getByRole("region", { name: "Lines at a bound" }).first();
    expect(await atBounds.textContent()).toMatch(/TV in \w+ \w+: at its lower bound \(€50,000\)/);
    const allocationCells = await page.getByRole("table", { name: "Allocation per line" }).first().getByRole("cell").allTextContents();
    expect(allocationCells.filter((text) => ["Search", "Social", "Online video", "TV", "Audio"].includes(text)).length).toBeGreaterThan(0);
    expect(allocationCells.filter((text) => ["search", "social", "online_video", "tv", "audio"].includes(text))).toEqual([]);
    await page.getByRole("figure", { name: /How the new customers could turn out/ }).locator("svg").first().waitFor();
    await page.getByRole("figure", { name: /The split against the current spend/ }).locator("svg").first().waitFor();
    expect(await page.getByRole("complementary", { name: "Caution about estimates" }).count()).toBeGreaterThanOrEqual(2);
    console.log(`budget split in Chromium: ${await page.locator("[data-split-status]").textContent()}`);
    await saveScreenshot(page, "planning", "03-budget-split-result");

    const saveForm = page.getByRole("form", { name: "Save the split as a plan" });
    await saveForm.getByLabel("Plan name").fill(`Q4 split, TV kept on ${stamp}`);
    await saveForm.getByLabel("Note for the approver (optional)").fill("TV kept on in every cell while the new creative is tested.");
    await saveForm.getByRole("button", { name: "Save plan" }).click();
    const plan = page.getByRole("region", { name: `Plan Q4 split, TV kept on ${stamp}` });
    await plan.waitFor({ timeout: 60_000 });
    await plan.getByText("Draft", { exact: true }).waitFor();

    await plan.getByRole("button", { name: "Submit for approval" }).click();
    await plan.getByText("Waiting for approval", { exact: true }).first().waitFor();
    // Nobody decides on their own plan: another portfolio lead or an admin does.
    await plan.getByText(/nobody decides on their own plan/).waitFor();
    expect(await plan.getByRole("form", { name: "Decide on this plan" }).count()).toBe(0);
    await saveScreenshot(page, "planning", "04-budget-split-submitted");

    // The PDF report of one market, from the Reports control on the same screen.
    const reports = page.getByRole("region", { name: "Reports" });
    await reports.getByLabel("Report for").selectOption({ label: "Market Veltria" });
    const [download] = await Promise.all([page.waitForEvent("download", { timeout: 120_000 }), reports.getByRole("button", { name: "Download PDF for Veltria" }).click()]);
    expect(download.suggestedFilename()).toMatch(/\.pdf$/);
    const file = await download.path();
    expect(readFileSync(file).subarray(0, 5).toString("latin1")).toBe("%PDF-");
    expect(problems).toEqual([]);
  });

  it("an admin rejects the lead's split with a comment", async () => {
    const { page, problems } = await browser();
    await signIn(page, server.baseUrl, "admin");
    await page.goto(`${server.baseUrl}/budget-split`);
    const list = page.getByRole("table", { name: "Saved budget splits" });
    await list.waitFor({ timeout: 60_000 });
    await list.getByRole("button", { name: `Open Q4 split, TV kept on ${stamp}` }).click();
    const plan = page.getByRole("region", { name: `Plan Q4 split, TV kept on ${stamp}` });
    const decision = plan.getByRole("form", { name: "Decide on this plan" });
    await decision.getByRole("button", { name: "Reject" }).click();
    await decision.getByRole("alert").getByText("Say why the plan is rejected (at least 5 characters)").waitFor();
    await decision.getByLabel("Comment (required to reject)").fill("Keep TV only where it ran before; split again.");
    await decision.getByRole("button", { name: "Reject" }).click();
    await plan.getByRole("status").getByText(/^Rejected .* by Wren Castellane: “Keep TV only where it ran before; split again.”/).waitFor();
    await list.getByRole("row", { name: new RegExp(`Q4 split, TV kept on ${stamp}.*Rejected`) }).waitFor();
    await saveScreenshot(page, "planning", "06-budget-split-rejected");
    expect(problems).toEqual([]);
  });

  it("an analyst's split for profit with a cautious risk attitude is approved by the portfolio lead", async () => {
    const analyst = await browser();
    await signIn(analyst.page, server.baseUrl, "analyst");
    await analyst.page.goto(`${server.baseUrl}/budget-split`);
    const form = analyst.page.getByRole("form", { name: "Budget split inputs" });
    await form.waitFor({ timeout: 60_000 });
    await form.getByLabel(/Most expected profit/).check();
    await form.getByLabel(/Best outcome in a bad case/).check();
    await form.getByLabel("Quantile (%)").fill("10");
    await form.getByRole("button", { name: "Split the budget" }).click();
    const check = analyst.page.getByRole("region", { name: "Check: equal return at the margin" }).first();
    await check.waitFor({ timeout: 180_000 });
    expect(await check.textContent()).toMatch(/EUR per EUR/);
    await analyst.page.getByText(/^Risk criterion \(10 % quantile of the profit/).waitFor();
    await saveScreenshot(analyst.page, "planning", "07-budget-split-profit-cautious");
    const saveForm = analyst.page.getByRole("form", { name: "Save the split as a plan" });
    await saveForm.getByLabel("Plan name").fill(`Profit split, cautious ${stamp}`);
    await saveForm.getByRole("button", { name: "Save plan" }).click();
    const plan = analyst.page.getByRole("region", { name: `Plan Profit split, cautious ${stamp}` });
    await plan.waitFor({ timeout: 120_000 });
    await plan.getByRole("button", { name: "Submit for approval" }).click();
    await plan.getByText("Waiting for a portfolio lead to approve or reject it.").waitFor();
    expect(analyst.problems).toEqual([]);

    const lead = await browser();
    await signIn(lead.page, server.baseUrl, "portfolioLead");
    await lead.page.goto(`${server.baseUrl}/budget-split`);
    const list = lead.page.getByRole("table", { name: "Saved budget splits" });
    await list.waitFor({ timeout: 60_000 });
    await list.getByRole("button", { name: `Open Profit split, cautious ${stamp}` }).click();
    const opened = lead.page.getByRole("region", { name: `Plan Profit split, cautious ${stamp}` });
    const decision = opened.getByRole("form", { name: "Decide on this plan" });
    await decision.getByLabel("Comment (required to reject)").fill("Approved; confirm the social increase with a lift test first.");
    await decision.getByRole("button", { name: "Approve" }).click();
    await opened.getByRole("status").getByText(/^Approved .* by Odile Marchetti-Vance: “Approved; confirm the social increase with a lift test first.”/).waitFor();
    await list.getByRole("row", { name: new RegExp(`Profit split, cautious ${stamp}.*Approved`) }).waitFor();
    await saveScreenshot(lead.page, "planning", "08-budget-split-approved");
    expect(lead.problems).toEqual([]);
  });
});

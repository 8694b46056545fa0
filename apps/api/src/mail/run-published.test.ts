// The e-mail to market managers when a run is published: each gets their own markets'
// headline numbers, and no other market is named anywhere in it (subject, text, HTML),
// not even through the analyst's publish reason.
import { and, eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { portfolioSchema, runResultsSchema } from "@tributary/contracts";
import { hashPassword } from "../auth/password";
import { closeDatabase } from "../db/client";
import { markets, outbox, userMarkets, users } from "../db/schema";
import { demoUsers } from "../demo/users";
import { fittedDatabase } from "../testing/fitted-snapshot";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

let t: TestApp;
let secondRunId: string;
let marketNames: string[];
const solveraManager = { email: "solvera.manager@quillfern.example", password: "amber-orchard-window-3", name: "Teodor Blaskett" };

beforeAll(async () => {
  const fitted = await fittedDatabase();
  secondRunId = fitted.secondRunId;
  t = await demoTestApp({ publicUrl: "https://tributary.quillfern.example" }, fitted.db);
  marketNames = (await t.db.select({ name: markets.name }).from(markets)).map((m) => m.name);
  const [solvera] = await t.db.select().from(markets).where(eq(markets.code, "solvera"));
  const [user] = await t.db
    .insert(users)
    .values({ email: solveraManager.email, name: solveraManager.name, role: "market_manager", passwordHash: await hashPassword(solveraManager.password) })
    .returning();
  await t.db.insert(userMarkets).values({ userId: user!.id, marketId: solvera!.id });
  // A manager who never accepted an invitation (no password) gets nothing.
  await t.db.insert(users).values({ email: "pending.manager@quillfern.example", name: "Pending", role: "market_manager" });
  const analyst = await signedInAgent(t.app, demoUsers.analyst);
  await analyst
    .post(`/api/runs/${secondRunId}/publish`)
    .send({ reason: "Solvera and Veltria both had a short promotion; the quick fit is enough for the weekly review." })
    .expect(200);
});
afterAll(async () => {
  await t.close();
  await closeDatabase(t.db);
});

async function mailTo(email: string) {
  const rows = await t.db.select().from(outbox).where(and(eq(outbox.kind, "run_published"), eq(outbox.to, email)));
  expect(rows).toHaveLength(1);
  return rows[0]!;
}

describe("the publish e-mail", () => {
  it("names only the manager's own markets, in the subject, the text and the HTML", async () => {
    const cases = [
      { email: demoUsers.veltriaManager.email, own: ["Veltria"] },
      { email: solveraManager.email, own: ["Solvera"] },
      { email: demoUsers.southManager.email, own: ["Lunesse", "Marendi"] },
    ];
    for (const { email, own } of cases) {
      const mail = await mailTo(email);
      for (const name of own) expect(mail.subject).toContain(name);
      for (const other of marketNames.filter((n) => !own.includes(n))) {
        for (const part of [mail.subject, mail.text, mail.html ?? ""]) expect(part.toLowerCase()).not.toContain(other.toLowerCase());
      }
      expect(mail.html).not.toBeNull();
    }
  });

  it("lists the manager's cells with the published numbers, and the caution", async () => {
    const lead = await signedInAgent(t.app, demoUsers.portfolioLead);
    const results = runResultsSchema.parse((await lead.get("/api/runs/current").expect(200)).body);
    expect(results.run.id).toBe(secondRunId);
    const mail = await mailTo(demoUsers.veltriaManager.email);
    const veltria = results.cells.filter((c) => c.market === "Veltria" && c.hasSpend);
    expect(veltria).toHaveLength(4);
    const lines = mail.text.split("\n").filter((line) => line.includes(" | Veltria | "));
    expect(lines).toHaveLength(4);
    // Channels by their display names ("Online video"), not their codes.
    const portfolio = portfolioSchema.parse((await lead.get("/api/portfolio").expect(200)).body);
    const channelName = new Map(portfolio.channels.map((c) => [c.code, c.name] as const));
    for (const cell of veltria) {
      const name = channelName.get(cell.channel)!;
      expect(name).not.toBe(cell.channel);
      const line = lines.find((l) => l.startsWith(`${cell.brand} | Veltria | ${name} |`));
      expect(line).toBeDefined();
      // Rounded to 3 significant figures or so (0 decimals from 100, 1 from 10, else 2).
      const median = Number(line!.split(" | ")[3]!.replace(/[^0-9.]/g, ""));
      expect(Math.abs(median - cell.cac0.q50)).toBeLessThanOrEqual(0.005 * cell.cac0.q50 + 0.005);
    }
    expect(mail.text).toContain("lift test");
    expect(mail.text).toContain("https://tributary.quillfern.example/market-desk");
    expect(mail.text).toContain("did not pass every convergence check");
    expect(mail.text).not.toContain("short promotion");
    // The south manager's markets have no cells in this fit.
    expect((await mailTo(demoUsers.southManager.email)).text).toContain("no estimates for Lunesse, Marendi");
  });

  it("goes to market managers with an account only", async () => {
    const all = await t.db.select({ to: outbox.to }).from(outbox).where(eq(outbox.kind, "run_published"));
    expect(all.map((r) => r.to).sort()).toEqual([demoUsers.southManager.email, solveraManager.email, demoUsers.veltriaManager.email].sort());
  });
});

// A test workspace with something of every kind, for tests that walk the whole API (the
// access matrix, hostile input): a fresh copy of the fitted snapshot (the demo workspace,
// the tiny dataset and its published fit), the app over it with a job runner that runs
// nothing, every demo user signed in, and factories for fresh resources (runs in any
// state, plans, lift tests, flags, invitations, uploads) so a test that changes or
// deletes one never disturbs another.
import { and, asc, desc, eq, isNotNull } from "drizzle-orm";
import type { Express } from "express";
import type { Logger } from "pino";
import request from "supertest";
import {
  decodeDrawSet,
  drawSetWireSchema,
  type BudgetSplitPlanInput,
  type ScenarioPlanInput,
} from "@tributary/contracts";
import { budgetSplit } from "@tributary/stats";
import { createApp, shutdownApp } from "../app";
import { closeDatabase, type Database } from "../db/client";
import { brands, cells, channels, datasetRows, datasetVersions, liftTests, markets, plans, runDraws, runResults, runs, users } from "../db/schema";
import { raiseFlag } from "../dashboards/flags";
import { demoUsers } from "../demo/users";
import type { FitJobInput, FitJobOutput, FitJobProgress } from "../jobs/fit-job";
import { fittedDatabase } from "./fitted-snapshot";
import { ManualJobRunner } from "./manual-job-runner";
import { signedInAgent } from "./test-app";
import { tinyCsv } from "./fit-fixtures";
import type { AppConfig } from "../config";

export type Agent = Awaited<ReturnType<typeof signedInAgent>>;
export type DemoUserKey = keyof typeof demoUsers;

export interface World {
  readonly app: Express;
  readonly db: Database;
  readonly runner: ManualJobRunner<FitJobInput, FitJobProgress, FitJobOutput>;
  readonly publishedRunId: string;
  readonly secondRunId: string;
  /** The tiny dataset (Kestrova × Veltria, Kestrova × Solvera, Plumrise × Veltria; search, social): the latest version. */
  readonly tinyVersionId: string;
  /** The demo dataset (every cell of the six markets). */
  readonly demoVersionId: string;
  /** Ids by name: markets ("Veltria"), brands ("Kestrova"), cells ("Kestrova × Veltria"). */
  readonly marketId: ReadonlyMap<string, string>;
  readonly brandId: ReadonlyMap<string, string>;
  readonly cellId: ReadonlyMap<string, string>;
  readonly userId: Readonly<Record<DemoUserKey, string>>;
  /** Signed-in agents; a test that ends a user's sessions puts a new one here (see renewAgent). */
  readonly agents: Record<DemoUserKey, Agent>;
  close(): Promise<void>;
}

export async function fittedWorld(options: { logger?: Logger; config?: Partial<AppConfig> } = {}): Promise<World> {
  const fitted = await fittedDatabase();
  const db = fitted.db;
  const runner = new ManualJobRunner<FitJobInput, FitJobProgress, FitJobOutput>();
  const app = createApp({ db, jobRunner: runner, logger: options.logger, config: { logLevel: "silent", ...options.config } });

  const marketRows = await db.select({ id: markets.id, name: markets.name }).from(markets);
  const brandRows = await db.select({ id: brands.id, name: brands.name }).from(brands);
  const marketId = new Map(marketRows.map((m) => [m.name, m.id] as const));
  const brandId = new Map(brandRows.map((b) => [b.name, b.id] as const));
  const marketName = new Map(marketRows.map((m) => [m.id, m.name] as const));
  const brandName = new Map(brandRows.map((b) => [b.id, b.name] as const));
  const cellId = new Map((await db.select().from(cells)).map((c) => [`${brandName.get(c.brandId)} × ${marketName.get(c.marketId)}`, c.id] as const));
  const versions = await db.select({ id: datasetVersions.id }).from(datasetVersions).orderBy(asc(datasetVersions.number));
  const userRows = await db.select({ id: users.id, email: users.email }).from(users);
  const userId = Object.fromEntries(
    Object.entries(demoUsers).map(([key, user]) => [key, userRows.find((u) => u.email === user.email)!.id]),
  ) as Record<DemoUserKey, string>;
  const keys = Object.keys(demoUsers) as DemoUserKey[];
  const signed = await Promise.all(keys.map((key) => signedInAgent(app, demoUsers[key])));
  const agents = Object.fromEntries(keys.map((key, k) => [key, signed[k]!])) as Record<DemoUserKey, Agent>;

  return {
    app,
    db,
    runner,
    publishedRunId: fitted.publishedRunId,
    secondRunId: fitted.secondRunId,
    demoVersionId: versions[0]!.id,
    tinyVersionId: versions.at(-1)!.id,
    marketId,
    brandId,
    cellId,
    userId,
    agents,
    close: async () => {
      await shutdownApp(app);
      await closeDatabase(db);
    },
  };
}

/** Signs the user in again (after a test ended their sessions) and keeps the new agent in the world. */
export async function renewAgent(world: World, key: DemoUserKey): Promise<Agent> {
  world.agents[key] = await signedInAgent(world.app, demoUsers[key]);
  return world.agents[key];
}

/** A copy of a run in the given state; a succeeded copy carries the source's results and draws (so it can be published). */
export async function copyRun(world: World, sourceRunId: string, status: "queued" | "running" | "succeeded" | "failed" | "cancelled" | "interrupted"): Promise<string> {
  const [source] = await world.db.select().from(runs).where(eq(runs.id, sourceRunId));
  if (!source) throw new Error(`no run ${sourceRunId}`);
  const { id: _id, createdAt: _created, publishedAt: _pa, publishedBy: _pb, publishReason: _pr, restartedFromRunId: _rf, ...rest } = source;
  const ended = status !== "queued" && status !== "running";
  const [row] = await world.db
    .insert(runs)
    .values({ ...rest, status, finishedAt: ended ? new Date() : null, failureReason: status === "failed" ? "a copy made to fail" : null })
    .returning({ id: runs.id });
  const id = row!.id;
  if (status === "succeeded") {
    const results = await world.db.select().from(runResults).where(eq(runResults.runId, sourceRunId));
    if (results.length > 0) await world.db.insert(runResults).values(results.map(({ id: _r, createdAt: _c, ...r }) => ({ ...r, runId: id })));
    const draws = await world.db.select().from(runDraws).where(eq(runDraws.runId, sourceRunId));
    if (draws.length > 0) await world.db.insert(runDraws).values(draws.map(({ id: _d, ...d }) => ({ ...d, runId: id })));
  }
  return id;
}

/** A copy of a plan row (same inputs and numbers) with some fields changed. */
export async function copyPlan(world: World, planId: string, changes: Partial<typeof plans.$inferInsert> = {}): Promise<string> {
  const [source] = await world.db.select().from(plans).where(eq(plans.id, planId));
  if (!source) throw new Error(`no plan ${planId}`);
  const { id: _id, createdAt: _c, updatedAt: _u, ...rest } = source;
  const [row] = await world.db.insert(plans).values({ ...rest, ...changes }).returning({ id: plans.id });
  return row!.id;
}

/** The current (latest published) run's id. */
export async function currentRun(world: World): Promise<string> {
  const [row] = await world.db.select({ id: runs.id }).from(runs).where(isNotNull(runs.publishedAt)).orderBy(desc(runs.publishedAt)).limit(1);
  return row?.id ?? world.publishedRunId;
}

/** A scenario on the current run, as a client sends it. */
export async function scenarioInput(world: World, cellIds: string[], name = "Social up a fifth"): Promise<ScenarioPlanInput> {
  return {
    name,
    runId: await currentRun(world),
    cellIds,
    horizon: 8,
    recentWeeks: 6,
    operations: [{ kind: "scale", target: { channels: ["social"] }, factor: 1.2 }],
  };
}

/** A budget split on the current run with the allocation the browser would compute. */
export async function splitInput(world: World, cellIds: string[], name = "Veltria split"): Promise<BudgetSplitPlanInput> {
  const wire = drawSetWireSchema.parse((await world.agents.portfolioLead.get("/api/runs/current/draw-set").expect(200)).body);
  const set = decodeDrawSet(wire);
  const refs = cellIds.map((id) => set.cells.find((c) => c.cellId === id)!);
  const inputs = { totalBudget: 200_000, horizon: 8, recentWeeks: 8, bounds: [], objective: { kind: "customers" as const } };
  const result = budgetSplit(set, { ...inputs, cells: refs.map((c) => ({ brand: c.brand, market: c.market })) });
  return {
    name,
    runId: wire.runId,
    cellIds,
    ...inputs,
    allocation: result.lines.map((line) => ({
      cellId: refs.find((c) => c.brand === line.brand && c.market === line.market)!.cellId,
      channel: line.channel,
      amount: line.allocation,
    })),
  };
}

let liftWeekOffset = 0;

/** A new lift test on a cell of the tiny dataset (each call a different window, so none repeats another). */
export async function insertLiftTest(world: World, cellName = "Kestrova × Veltria", channel = "search"): Promise<string> {
  const cellIdValue = world.cellId.get(cellName)!;
  const weeks = await world.db
    .select({ week: datasetRows.week })
    .from(datasetRows)
    .where(and(eq(datasetRows.cellId, cellIdValue), eq(datasetRows.datasetVersionId, world.tinyVersionId)))
    .orderBy(asc(datasetRows.week));
  const mine = weeks.map((w) => w.week);
  const start = liftWeekOffset++ % Math.max(1, mine.length - 4);
  const [channelRow] = await world.db.select({ id: channels.id }).from(channels).where(eq(channels.code, channel));
  const [row] = await world.db
    .insert(liftTests)
    .values({
      datasetVersionId: world.tinyVersionId,
      cellId: cellIdValue,
      channelId: channelRow!.id,
      firstWeek: mine[start]!,
      lastWeek: mine[start + 3]!,
      spend: 20_000,
      measuredLift: 300,
      standardError: 80,
      note: "made for a test",
      createdBy: world.userId.analyst,
    })
    .returning({ id: liftTests.id });
  return row!.id;
}

/** A new active flag on a cell × channel (as the analyst). */
export async function newFlag(world: World, cellName = "Kestrova × Veltria", channel = "search", note = "Spend looks doubled in spring"): Promise<string> {
  const flag = await raiseFlag(world.db, { cellId: world.cellId.get(cellName)!, channel, kind: "data_problem", note }, world.userId.analyst);
  return flag.id;
}

let invitationCount = 0;

/** A new pending invitation (sent by the admin): its id and the token from its e-mail. */
export async function newInvitation(world: World, role: "analyst" | "market_manager" = "analyst"): Promise<{ id: string; token: string; email: string }> {
  const email = `invited.${++invitationCount}.${Date.now().toString(36)}@quillfern.example`;
  const marketIds = role === "market_manager" ? [world.marketId.get("Veltria")!] : [];
  const created = await world.agents.admin.post("/api/invitations").send({ email, role, marketIds }).expect(201);
  const page = await world.agents.admin.get(`/api/outbox?kind=invitation&to=${encodeURIComponent(email)}`).expect(200);
  const message = await world.agents.admin.get(`/api/outbox/${page.body.messages[0].id}`).expect(200);
  const token = /\/invite\/([A-Za-z0-9_-]+)/.exec(message.body.text)![1]!;
  return { id: created.body.id, token, email };
}

/** Uploads the tiny dataset's CSV as this agent; returns the upload id. */
export async function uploadTiny(agent: Agent): Promise<string> {
  const response = await agent.post("/api/uploads").attach("file", Buffer.from(tinyCsv()), "tiny.csv").expect(201);
  return response.body.uploadId as string;
}

/** The column mapping of the tiny dataset's CSV. */
export const tinyMapping = {
  week: "week",
  brand: "brand",
  market: "market",
  outcome: "new_customers",
  channels: [
    { column: "spend_search", channel: "search" },
    { column: "spend_social", channel: "social" },
  ],
  controls: [],
  ignored: [],
};

/** A request that is not signed in. */
export function anonymous(world: World) {
  return request(world.app);
}

// The access matrix: every route of the route table, called by every kind of caller —
// signed out, admin, portfolio lead, analyst, the market manager of the resource's market
// (Veltria) and a market manager of other markets (Marendi and Lunesse) — with real ids,
// against the status this table expects. The cases are generated from the route table
// itself: a route added without an entry here fails the first test, naming it.
//
// Besides the status: every error is the one JSON error shape with the request id; a
// market manager's answer (JSON, CSV, event stream) never names a market that is not
// theirs; writes that succeed get fresh resources of their own, so no case depends on
// another. Routes that end sessions sign their caller in afresh; publishing (which changes
// the current run) runs last.
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, planSchema } from "@tributary/contracts";
import { and, asc, eq } from "drizzle-orm";
import request from "supertest";
import { routeTable } from "../routes";
import { channels, datasetRows, modelSettings, users, outbox } from "../db/schema";
import { demoUsers } from "../demo/users";
import { signedInAgent } from "../testing/test-app";
import {
  copyPlan,
  copyRun,
  fittedWorld,
  insertLiftTest,
  newFlag,
  newInvitation,
  renewAgent,
  scenarioInput,
  splitInput,
  tinyMapping,
  uploadTiny,
  type Agent,
  type DemoUserKey,
  type World,
} from "../testing/fitted-world";
import { tinyCsv } from "../testing/fit-fixtures";

type Who = "signedOut" | "admin" | "lead" | "analyst" | "managerOwn" | "managerOther";
const callers: readonly Who[] = ["signedOut", "admin", "lead", "analyst", "managerOwn", "managerOther"];
const userOf: Record<Exclude<Who, "signedOut">, DemoUserKey> = {
  admin: "admin",
  lead: "portfolioLead",
  analyst: "analyst",
  managerOwn: "veltriaManager",
  managerOther: "southManager",
};

type Expected = Record<Who, number>;
const statuses = (signedOut: number, admin: number, lead: number, analyst: number, managerOwn: number, managerOther: number): Expected => ({
  signedOut,
  admin,
  lead,
  analyst,
  managerOwn,
  managerOther,
});
/** Public: the same answer for everyone. */
const open = (status: number) => statuses(status, status, status, status, status, status);
/** Every signed-in role, not scoped to one market (lists are narrowed instead). */
const everyRole = (ok: number) => statuses(401, ok, ok, ok, ok, ok);
/** Every role, for a resource in Veltria: the other markets' manager gets `other`. */
const veltriaResource = (ok: number, other: 403 | 404) => statuses(401, ok, ok, ok, ok, other);
/** Analysts and admins (data, fits, flags). */
const fitRoles = (ok: number) => statuses(401, ok, 403, ok, 403, 403);
const adminsOnly = (ok: number) => statuses(401, ok, 403, 403, 403, 403);

interface Parts {
  readonly params?: Record<string, string>;
  readonly query?: Record<string, string>;
  readonly body?: unknown;
  readonly file?: { readonly name: string; readonly content: string };
}

interface Entry {
  readonly expect: Expected;
  /** Path parameters, query and body; may create a fresh resource for the caller. */
  readonly request?: (who: Who) => Parts | Promise<Parts>;
  /** The route ends the caller's session(s): it runs with a session of its own, and the shared one is renewed after. */
  readonly endsSessions?: boolean;
  /** Changes the current run: runs after every other case. */
  readonly last?: boolean;
}

let w: World;
const ids = {} as {
  veltria: string;
  kv: string;
  pv: string;
  settingsId: string;
  veltriaPlan: string;
  veltriaSplit: string;
  invitationToken: string;
  outboxMessage: string;
  extraUser: string;
  liftWeeks: string[];
};
let liftWindow = 0;

const table: Record<string, Entry> = {
  "GET /api/health": { expect: open(200) },
  "POST /api/auth/sign-in": { expect: open(401), request: () => ({ body: { email: "nobody@quillfern.example", password: "not-the-password" } }) },
  "POST /api/auth/sign-out": { expect: open(204), endsSessions: true },
  "POST /api/auth/sign-out-all": { expect: everyRole(204), endsSessions: true },
  "GET /api/auth/me": { expect: everyRole(200) },
  "GET /api/portfolio": { expect: everyRole(200) },
  "GET /api/brands": { expect: everyRole(200) },
  "GET /api/markets": { expect: everyRole(200) },
  "GET /api/markets/:marketId": { expect: veltriaResource(200, 403), request: () => ({ params: { marketId: ids.veltria } }) },
  "GET /api/channels": { expect: everyRole(200) },

  "POST /api/uploads": { expect: fitRoles(201), request: () => ({ file: { name: "tiny.csv", content: tinyCsv() } }) },
  "POST /api/uploads/:uploadId/validate": {
    expect: fitRoles(200),
    request: async (who) => ({ params: { uploadId: who === "admin" || who === "analyst" ? await uploadTiny(agentOf(who)) : "no-such-upload" }, body: { mapping: tinyMapping } }),
  },
  "POST /api/uploads/:uploadId/save": {
    expect: fitRoles(201),
    request: async (who) => ({
      params: { uploadId: who === "admin" || who === "analyst" ? await uploadTiny(agentOf(who)) : "no-such-upload" },
      body: { mapping: tinyMapping, note: "the same data again" },
    }),
  },
  "GET /api/datasets": { expect: everyRole(200) },
  "GET /api/datasets/example.csv": { expect: everyRole(200) },
  "GET /api/datasets/:datasetId": { expect: everyRole(200), request: () => ({ params: { datasetId: w.tinyVersionId } }) },
  "GET /api/datasets/:datasetId/series": { expect: veltriaResource(200, 404), request: () => ({ params: { datasetId: w.tinyVersionId }, query: { cell: ids.kv } }) },
  "GET /api/datasets/:datasetId/lift-tests": { expect: everyRole(200), request: () => ({ params: { datasetId: w.tinyVersionId } }) },
  "POST /api/datasets/:datasetId/lift-tests": {
    expect: fitRoles(201),
    request: () => {
      const k = (liftWindow++ * 5) % (ids.liftWeeks.length - 4);
      return {
        params: { datasetId: w.tinyVersionId },
        body: { brand: "Kestrova", market: "Veltria", channel: "social", firstWeek: ids.liftWeeks[k], lastWeek: ids.liftWeeks[k + 3], spend: 30000, incrementalOutcome: 400, standardError: 90 },
      };
    },
  },
  "DELETE /api/datasets/:datasetId/lift-tests/:liftTestId": {
    expect: fitRoles(204),
    request: async () => ({ params: { datasetId: w.tinyVersionId, liftTestId: await insertLiftTest(w) } }),
  },
  "POST /api/model-settings": { expect: fitRoles(201), request: () => ({ body: { datasetVersionId: w.tinyVersionId, chains: 2, warmup: 100, draws: 100, seed: 11 } }) },
  "GET /api/model-settings": { expect: fitRoles(200) },
  "GET /api/model-settings/:settingsId": { expect: fitRoles(200), request: () => ({ params: { settingsId: ids.settingsId } }) },

  "POST /api/runs": { expect: fitRoles(201), request: () => ({ body: { modelSettingsId: ids.settingsId } }) },
  "GET /api/runs": { expect: fitRoles(200) },
  "GET /api/runs/current": { expect: everyRole(200) },
  "GET /api/runs/:runId": { expect: fitRoles(200), request: () => ({ params: { runId: w.publishedRunId } }) },
  "GET /api/runs/:runId/results": { expect: fitRoles(200), request: () => ({ params: { runId: w.publishedRunId } }) },
  "GET /api/runs/:runId/report": { expect: fitRoles(200), request: () => ({ params: { runId: w.publishedRunId } }) },
  "GET /api/runs/:runId/events": { expect: fitRoles(200), request: () => ({ params: { runId: w.publishedRunId } }) },
  "POST /api/runs/:runId/cancel": { expect: fitRoles(200), request: async () => ({ params: { runId: await copyRun(w, w.secondRunId, "queued") } }) },
  "POST /api/runs/:runId/restart": { expect: fitRoles(201), request: async () => ({ params: { runId: await copyRun(w, w.secondRunId, "cancelled") } }) },
  "POST /api/runs/:runId/publish": {
    expect: fitRoles(200),
    last: true,
    request: async () => ({ params: { runId: await copyRun(w, w.secondRunId, "succeeded") }, body: { reason: "Published by the access matrix test, quick fit only." } }),
  },

  "GET /api/dashboards/status": { expect: everyRole(200) },
  "GET /api/dashboards/portfolio-map": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/dashboards/portfolio-map/export.csv": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/dashboards/brand-comparison": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/dashboards/brand-comparison/export.csv": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/dashboards/market-desk": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/dashboards/market-desk/export.csv": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria, table: "plans" } }) },
  "GET /api/dashboards/channel-sheet/:cellId/:channel": { expect: veltriaResource(200, 404), request: () => ({ params: { cellId: ids.kv, channel: "search" } }) },
  "GET /api/dashboards/channel-sheet/:cellId/:channel/export.csv": {
    expect: veltriaResource(200, 404),
    request: () => ({ params: { cellId: ids.kv, channel: "search" }, query: { table: "response-curve" } }),
  },
  "GET /api/dashboards/pooling-review": { expect: fitRoles(200) },
  "GET /api/dashboards/pooling-review/export.csv": { expect: fitRoles(200), request: () => ({ query: { table: "pooling-factors" } }) },

  "GET /api/flags": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "GET /api/flags/export.csv": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
  "POST /api/flags": { expect: fitRoles(201), request: () => ({ body: { cellId: ids.kv, channel: "social", kind: "needs_lift_test", note: "Worth a lift test before moving money" } }) },
  "POST /api/flags/:flagId/clear": { expect: fitRoles(200), request: async () => ({ params: { flagId: await newFlag(w) }, body: { note: "checked" } }) },

  "GET /api/runs/current/draw-set": { expect: veltriaResource(200, 404), request: () => ({ query: { cells: ids.kv } }) },
  "GET /api/plans": { expect: everyRole(200) },
  "POST /api/plans/scenarios": { expect: statuses(401, 201, 201, 201, 201, 403), request: async () => ({ body: await scenarioInput(w, [ids.kv, ids.pv]) }) },
  "POST /api/plans/budget-splits": { expect: statuses(401, 201, 201, 201, 403, 403), request: async () => ({ body: await splitInput(w, [ids.kv, ids.pv]) }) },
  "GET /api/plans/:planId": { expect: veltriaResource(200, 404), request: () => ({ params: { planId: ids.veltriaPlan } }) },
  // The Veltria manager's own scenario: its author and admins may change it.
  "PUT /api/plans/:planId": {
    expect: statuses(401, 200, 403, 403, 200, 404),
    request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaPlan) }, body: await scenarioInput(w, [ids.kv], "Changed") }),
  },
  "PATCH /api/plans/:planId": { expect: statuses(401, 200, 403, 403, 200, 404), request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaPlan) }, body: { name: "Renamed" } }) },
  "DELETE /api/plans/:planId": { expect: statuses(401, 204, 403, 403, 204, 404), request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaPlan) } }) },
  // The analyst's budget split on Veltria: author or admin submits and withdraws; leads and admins decide.
  "POST /api/plans/:planId/submit": { expect: statuses(401, 200, 403, 200, 403, 403), request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaSplit) } }) },
  "POST /api/plans/:planId/withdraw": {
    expect: statuses(401, 200, 403, 200, 403, 403),
    request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaSplit, { status: "submitted" }) } }),
  },
  "POST /api/plans/:planId/decision": {
    expect: statuses(401, 200, 200, 403, 403, 403),
    request: async () => ({ params: { planId: await copyPlan(w, ids.veltriaSplit, { status: "submitted" }) }, body: { decision: "approve" } }),
  },
  "GET /api/plans/:planId/allocation.csv": { expect: veltriaResource(200, 404), request: () => ({ params: { planId: ids.veltriaPlan } }) },
  "GET /api/plans/:planId/forecast.csv": { expect: veltriaResource(200, 404), request: () => ({ params: { planId: ids.veltriaSplit } }) },

  "GET /api/people": { expect: adminsOnly(200) },
  "PATCH /api/people/:userId": { expect: adminsOnly(200), request: () => ({ params: { userId: ids.extraUser }, body: { disabled: false } }) },
  "GET /api/invitations": { expect: adminsOnly(200) },
  "POST /api/invitations": { expect: adminsOnly(201), request: (who) => ({ body: { email: `matrix.${who}@quillfern.example`, role: "market_manager", marketIds: [ids.veltria] } }) },
  "POST /api/invitations/:invitationId/resend": { expect: adminsOnly(200), request: async () => ({ params: { invitationId: (await newInvitation(w)).id } }) },
  "POST /api/invitations/:invitationId/revoke": { expect: adminsOnly(200), request: async () => ({ params: { invitationId: (await newInvitation(w)).id } }) },
  "GET /api/invitations/:token": { expect: open(200), request: () => ({ params: { token: ids.invitationToken } }) },
  "POST /api/invitations/:token/accept": {
    expect: open(201),
    endsSessions: true,
    request: async () => ({ params: { token: (await newInvitation(w)).token }, body: { name: "Nell Arbuckle", password: "lantern-orchard-quietly-9" } }),
  },
  "GET /api/portfolio-settings": { expect: adminsOnly(200) },
  "PATCH /api/portfolio-settings/company": { expect: adminsOnly(200), request: () => ({ body: { companyName: "Quillfern Household Group" } }) },
  "PUT /api/portfolio-settings/customer-values": { expect: adminsOnly(200), request: () => ({ body: { brands: [{ id: w.brandId.get("Kestrova")!, customerValue: 61 }] } }) },
  "PUT /api/portfolio-settings/channels": {
    expect: adminsOnly(200),
    request: async () => ({ body: { channels: (await w.db.select({ id: channels.id, name: channels.name }).from(channels).orderBy(asc(channels.position))).map((c) => ({ id: c.id, name: c.name })) } }),
  },
  // The names they have: the answer is the same, and no other case sees a renamed brand or market.
  "PUT /api/portfolio-settings/brand-names": { expect: adminsOnly(200), request: () => ({ body: { brands: [{ id: w.brandId.get("Kestrova")!, name: "Kestrova" }] } }) },
  "PUT /api/portfolio-settings/market-names": { expect: adminsOnly(200), request: () => ({ body: { markets: [{ id: ids.veltria, name: "Veltria" }] } }) },
  "GET /api/audit-log": { expect: adminsOnly(200) },
  "GET /api/outbox": { expect: adminsOnly(200) },
  "GET /api/outbox/:messageId": { expect: adminsOnly(200), request: () => ({ params: { messageId: ids.outboxMessage } }) },
  "GET /api/reports/run.pdf": { expect: veltriaResource(200, 403), request: () => ({ query: { market: ids.veltria } }) },
};

const agentOf = (who: Exclude<Who, "signedOut">): Agent => w.agents[userOf[who]];

/** Names of the markets a caller must never see (market managers only). */
let foreignMarkets: Map<Who, string[]>;

beforeAll(async () => {
  w = await fittedWorld();
  ids.veltria = w.marketId.get("Veltria")!;
  ids.kv = w.cellId.get("Kestrova × Veltria")!;
  ids.pv = w.cellId.get("Plumrise × Veltria")!;
  ids.settingsId = (await w.db.select({ id: modelSettings.id }).from(modelSettings))[0]!.id;
  ids.veltriaPlan = planSchema.parse((await w.agents.veltriaManager.post("/api/plans/scenarios").send(await scenarioInput(w, [ids.kv, ids.pv], "Veltria social")).expect(201)).body).id;
  ids.veltriaSplit = planSchema.parse((await w.agents.analyst.post("/api/plans/budget-splits").send(await splitInput(w, [ids.kv, ids.pv])).expect(201)).body).id;
  await newFlag(w);
  const invitation = await newInvitation(w);
  ids.invitationToken = invitation.token;
  ids.outboxMessage = (await w.db.select({ id: outbox.id }).from(outbox).where(eq(outbox.to, invitation.email)))[0]!.id;
  const [extra] = await w.db.insert(users).values({ email: "extra.analyst@quillfern.example", name: "Extra Analyst", role: "analyst" }).returning({ id: users.id });
  ids.extraUser = extra!.id;
  await insertLiftTest(w);
  ids.liftWeeks = (
    await w.db
      .select({ week: datasetRows.week })
      .from(datasetRows)
      .where(and(eq(datasetRows.cellId, ids.kv), eq(datasetRows.datasetVersionId, w.tinyVersionId)))
      .orderBy(asc(datasetRows.week))
  ).map((r) => r.week);
  const allMarkets = [...w.marketId.keys()];
  const mine = (key: DemoUserKey) => new Set(demoUsers[key].markets.map((code) => code.toLowerCase()));
  foreignMarkets = new Map([
    ["managerOwn", allMarkets.filter((name) => !mine("veltriaManager").has(name.toLowerCase()))],
    ["managerOther", allMarkets.filter((name) => !mine("southManager").has(name.toLowerCase()))],
  ]);
});
afterAll(() => w.close());

function pathOf(template: string, params: Record<string, string> = {}): string {
  return template.replace(/:(\w+)/g, (_, name: string) => {
    const value = params[name];
    if (value === undefined) throw new Error(`${template}: no value for :${name}`);
    return encodeURIComponent(value);
  });
}

interface Answer {
  readonly status: number;
  readonly type: string;
  readonly text: string;
  readonly requestId: string;
}

async function call(method: string, template: string, who: Who, entry: Entry): Promise<Answer> {
  const parts = (await entry.request?.(who)) ?? {};
  let agent: Agent | ReturnType<typeof request> = request(w.app);
  if (who !== "signedOut") agent = entry.endsSessions ? await signedInAgent(w.app, demoUsers[userOf[who]]) : agentOf(who);
  const url = pathOf(template, parts.params);
  let req = (agent as Agent)[method.toLowerCase() as "get"](url);
  if (parts.query) req = req.query(parts.query);
  if (parts.file) req = req.attach("file", Buffer.from(parts.file.content), parts.file.name);
  else if (parts.body !== undefined) req = req.send(parts.body as object);
  const response = await req.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on("data", (chunk: Buffer) => chunks.push(chunk));
    res.on("end", () => done(null, Buffer.concat(chunks)));
  });
  if (entry.endsSessions && who !== "signedOut") await renewAgent(w, userOf[who]);
  const body = response.body as Buffer;
  return {
    status: response.status,
    type: String(response.headers["content-type"] ?? ""),
    text: Buffer.isBuffer(body) ? body.toString("utf8") : "",
    requestId: String(response.headers["x-request-id"] ?? ""),
  };
}

const routeKey = (route: { method: string; path: string }) => `${route.method.toUpperCase()} ${route.path}`;

describe("the access matrix", () => {
  it("has an expected status for every route of the route table, and no entry for a route that is gone", () => {
    const declared = routeTable.map(routeKey);
    const missing = declared.filter((key) => !(key in table));
    expect(missing, `routes without an entry in the access matrix: ${missing.join("; ")}`).toEqual([]);
    const stale = Object.keys(table).filter((key) => !declared.includes(key));
    expect(stale, `entries for routes that no longer exist: ${stale.join("; ")}`).toEqual([]);
  });

  it("mounts every route under /api, behind the session, CSRF and origin checks", () => {
    expect(routeTable.filter((route) => !route.path.startsWith("/api/")).map(routeKey)).toEqual([]);
  });

  const ordered = [...routeTable].sort((a, b) => Number(table[routeKey(a)]?.last ?? false) - Number(table[routeKey(b)]?.last ?? false));
  for (const route of ordered) {
    const key = routeKey(route);
    it(key, async () => {
      const entry = table[key];
      if (!entry) throw new Error(`${key} has no entry in the access matrix; add its expected status for every caller`);
      const problems: string[] = [];
      for (const who of callers) {
        const answer = await call(route.method, route.path, who, entry);
        const expected = entry.expect[who];
        if (answer.status !== expected) problems.push(`${who}: ${answer.status} (expected ${expected}) ${answer.text.slice(0, 200)}`);
        if (answer.status >= 400) {
          const parsed = apiErrorSchema.safeParse(answer.type.includes("json") ? JSON.parse(answer.text) : null);
          if (!parsed.success) problems.push(`${who}: error ${answer.status} not in the JSON error shape: ${answer.text.slice(0, 120)}`);
          else if (parsed.data.error.requestId !== answer.requestId) problems.push(`${who}: error body's request id differs from X-Request-Id`);
        }
        const foreign = foreignMarkets.get(who);
        if (foreign && !answer.type.includes("application/pdf")) {
          const named = foreign.filter((name) => answer.text.includes(name));
          if (named.length > 0) problems.push(`${who}: the answer names ${named.join(", ")}, not their market(s)`);
        }
      }
      expect(problems).toEqual([]);
    });
  }
});

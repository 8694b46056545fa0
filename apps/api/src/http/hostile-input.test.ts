// Hostile requests against the whole API (supertest, fast-check): bodies of every write
// route with malicious values planted anywhere (huge numbers, ±Infinity from JSON's 1e999,
// formula text, right-to-left and zero-width characters, very long strings, wrong types,
// __proto__ and constructor.prototype keys, deep nesting), malformed JSON and odd content
// types, hostile query strings and path parameters on every route, and files in other
// encodings. Whatever comes in: never a 5xx; a refusal is a 4xx in the JSON error shape
// with the request id; and a refused request writes nothing (every table's row count is
// the same before and after).
import { count, is } from "drizzle-orm";
import { PgTable } from "drizzle-orm/pg-core";
import fc from "fast-check";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, planSchema } from "@tributary/contracts";
import * as schema from "../db/schema";
import { routeTable } from "../routes";
import { tinyCsv } from "../testing/fit-fixtures";
import {
  copyPlan,
  fittedWorld,
  newFlag,
  newInvitation,
  scenarioInput,
  splitInput,
  tinyMapping,
  uploadTiny,
  type Agent,
  type World,
} from "../testing/fitted-world";

const seed = 20_251_006;
let w: World;
let kv: string;
let pv: string;
let veltriaPlan: string;
let veltriaSplit: string;

const tables = Object.entries(schema).flatMap(([name, value]) => (is(value, PgTable) ? [[name, value] as const] : []));

/** Rows in every table of the database. */
async function rowCounts(): Promise<Record<string, number>> {
  const entries = await Promise.all(tables.map(async ([name, table]) => [name, (await w.db.select({ n: count() }).from(table))[0]?.n ?? 0] as const));
  return Object.fromEntries(entries);
}

beforeAll(async () => {
  w = await fittedWorld();
  kv = w.cellId.get("Kestrova × Veltria")!;
  pv = w.cellId.get("Plumrise × Veltria")!;
  veltriaPlan = planSchema.parse((await w.agents.analyst.post("/api/plans/scenarios").send(await scenarioInput(w, [kv, pv])).expect(201)).body).id;
  veltriaSplit = planSchema.parse((await w.agents.analyst.post("/api/plans/budget-splits").send(await splitInput(w, [kv, pv])).expect(201)).body).id;
});
afterAll(() => w.close());

// ---------------------------------------------------------------------------------
// Hostile values
// ---------------------------------------------------------------------------------

const hostileStrings = [
  "=HYPERLINK(\"https://x.example\",\"open\")",
  "+cmd|' /C calc'!A0",
  "@SUM(1+1)*cmd|' /C calc'!A0",
  "-2+3",
  "\t=1+1",
  "\u202Eexe.fdp",
  "Vel\u200Btria",
  "\u2066Kestrova\u2069",
  "שוק",
  "\uD800",
  "\u0000",
  "<img src=x onerror=alert(1)>",
  "'; DROP TABLE plans; --",
  "../../../etc/passwd",
  "NaN",
  "Infinity",
  "1e309",
  "__proto__",
  "",
  "x".repeat(20_000),
];
/** Values JSON can carry (1e999 arrives as Infinity; see rawJson). */
const hostileJson: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(...hostileStrings),
  fc.constantFrom<unknown>(-1, -0, 0, 1.5, 1e308, -1e308, 2 ** 53 + 2, 4_294_967_296, 5e-324, true, false, null, [], {}, [[[]]]),
  fc.constantFrom<unknown>(
    JSON.parse('{"__proto__":{"polluted":"yes","role":"admin"}}'),
    JSON.parse('{"constructor":{"prototype":{"polluted":"yes"}}}'),
    Array.from({ length: 2000 }, (_, i) => i),
  ),
  fc.jsonValue({ maxDepth: 3 }),
  fc.string({ unit: "grapheme", maxLength: 40 }),
);

function pathsOf(value: unknown, prefix: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(prefix);
  if (value === null || typeof value !== "object" || prefix.length > 6) return out;
  if (Array.isArray(value)) value.forEach((item, i) => pathsOf(item, [...prefix, i], out));
  else for (const [key, item] of Object.entries(value)) pathsOf(item, [...prefix, key], out);
  return out;
}

function plantAt(value: unknown, path: readonly (string | number)[], planted: unknown): unknown {
  if (path.length === 0) return planted;
  const [head, ...rest] = path;
  // An earlier plant may have replaced a parent with a plain value: nothing to plant into.
  if (value === null || typeof value !== "object") return value;
  if (Array.isArray(value)) return value.map((item, i) => (i === head ? plantAt(item, rest, planted) : item));
  return { ...(value as Record<string, unknown>), [head as string]: plantAt((value as Record<string, unknown>)[head as string], rest, planted) };
}

/** A valid body with one or two hostile values planted, or with polluting keys added at the top, or replaced outright. */
function hostileBody(valid: unknown): fc.Arbitrary<unknown> {
  const paths = pathsOf(valid);
  const plant = fc.tuple(fc.nat(paths.length - 1), hostileJson).map(([k, value]) => ({ path: paths[k]!, value }));
  return fc.oneof(
    { weight: 6, arbitrary: fc.array(plant, { minLength: 1, maxLength: 2 }).map((plants) => plants.reduce<unknown>((body, p) => plantAt(body, p.path, p.value), valid)) },
    { weight: 1, arbitrary: fc.constant({ ...JSON.parse('{"__proto__":{"polluted":"yes"}}'), ...(valid as object) }) },
    { weight: 1, arbitrary: hostileJson },
  );
}

interface Answer {
  readonly status: number;
  readonly body: unknown;
  readonly requestId: string;
}

/** Never 5xx; a refusal is a 4xx JSON error naming the request; refused requests write nothing. */
async function expectSafe(label: string, send: () => Promise<{ status: number; body: unknown; headers: Record<string, unknown> }>): Promise<Answer> {
  const before = await rowCounts();
  const response = await send();
  const answer = { status: response.status, body: response.body, requestId: String(response.headers["x-request-id"] ?? "") };
  expect(answer.status, `${label}: ${JSON.stringify(answer.body).slice(0, 300)}`).toBeLessThan(500);
  if (answer.status >= 400) {
    const error = apiErrorSchema.parse(answer.body).error;
    expect(error.requestId, label).toBe(answer.requestId);
    expect(error.message.length, label).toBeGreaterThan(0);
    expect(error.message.length, `${label}: message of ${error.message.length} characters`).toBeLessThan(2000);
    expect(await rowCounts(), `${label} wrote something although it was refused`).toEqual(before);
  }
  expect(({} as Record<string, unknown>).polluted, label).toBeUndefined();
  return answer;
}

// ---------------------------------------------------------------------------------
// Every write route with a body, fuzzed
// ---------------------------------------------------------------------------------

interface WriteCase {
  readonly method: "post" | "put" | "patch";
  /** The path, with fresh resources where a success would use one up. */
  readonly path: () => Promise<string> | string;
  readonly as: keyof World["agents"] | "anonymous";
  readonly valid: () => Promise<unknown> | unknown;
  readonly runs?: number;
}

const writes: Record<string, WriteCase> = {
  "POST /api/auth/sign-in": { method: "post", path: () => "/api/auth/sign-in", as: "anonymous", valid: () => ({ email: "nobody@quillfern.example", password: "wrong-password-1" }) },
  "POST /api/uploads/:uploadId/validate": {
    method: "post",
    path: async () => `/api/uploads/${await uploadTiny(w.agents.analyst)}/validate`,
    as: "analyst",
    valid: () => ({ mapping: tinyMapping }),
  },
  "POST /api/uploads/:uploadId/save": {
    method: "post",
    path: async () => `/api/uploads/${await uploadTiny(w.agents.analyst)}/save`,
    as: "analyst",
    valid: () => ({ mapping: tinyMapping, note: "again" }),
    runs: 10,
  },
  "POST /api/datasets/:datasetId/lift-tests": {
    method: "post",
    path: () => `/api/datasets/${w.tinyVersionId}/lift-tests`,
    as: "analyst",
    valid: () => ({ brand: "Kestrova", market: "Veltria", channel: "search", firstWeek: "2025-08-04", lastWeek: "2025-08-25", spend: 30000, incrementalOutcome: 400, standardError: 90 }),
  },
  "POST /api/model-settings": {
    method: "post",
    path: () => "/api/model-settings",
    as: "analyst",
    valid: () => ({ datasetVersionId: w.tinyVersionId, chains: 2, warmup: 100, draws: 100, seed: 3, maxLag: 4, cacRanges: [{ channel: "search", lo: 10, hi: 400 }] }),
  },
  "POST /api/runs": { method: "post", path: () => "/api/runs", as: "analyst", valid: async () => ({ modelSettingsId: (await w.db.select({ id: schema.modelSettings.id }).from(schema.modelSettings))[0]!.id }) },
  "POST /api/flags": { method: "post", path: () => "/api/flags", as: "analyst", valid: () => ({ cellId: kv, channel: "search", kind: "data_problem", note: "Spend doubled in March" }) },
  "POST /api/flags/:flagId/clear": { method: "post", path: async () => `/api/flags/${await newFlag(w)}/clear`, as: "analyst", valid: () => ({ note: "fixed" }) },
  "POST /api/plans/scenarios": { method: "post", path: () => "/api/plans/scenarios", as: "analyst", valid: () => scenarioInput(w, [kv, pv]), runs: 12 },
  "POST /api/plans/budget-splits": { method: "post", path: () => "/api/plans/budget-splits", as: "analyst", valid: () => splitInput(w, [kv, pv]), runs: 10 },
  "PUT /api/plans/:planId": { method: "put", path: async () => `/api/plans/${await copyPlan(w, veltriaPlan)}`, as: "analyst", valid: () => scenarioInput(w, [kv]), runs: 10 },
  "PATCH /api/plans/:planId": { method: "patch", path: async () => `/api/plans/${await copyPlan(w, veltriaPlan)}`, as: "analyst", valid: () => ({ name: "Renamed", note: "a note" }) },
  "POST /api/plans/:planId/decision": {
    method: "post",
    path: async () => `/api/plans/${await copyPlan(w, veltriaSplit, { status: "submitted" })}/decision`,
    as: "portfolioLead",
    valid: () => ({ decision: "reject", comment: "Too much on search" }),
  },
  "PATCH /api/people/:userId": { method: "patch", path: () => `/api/people/${w.userId.southManager}`, as: "admin", valid: () => ({ marketIds: [w.marketId.get("Marendi"), w.marketId.get("Lunesse")] }) },
  "POST /api/invitations": { method: "post", path: () => "/api/invitations", as: "admin", valid: () => ({ email: "fuzz@quillfern.example", role: "market_manager", marketIds: [w.marketId.get("Veltria")] }) },
  "POST /api/invitations/:token/accept": {
    method: "post",
    path: async () => `/api/invitations/${(await newInvitation(w)).token}/accept`,
    as: "anonymous",
    valid: () => ({ name: "Fuzz Person", password: "harbour-lantern-copper-8" }),
    runs: 8,
  },
  "PATCH /api/portfolio-settings/company": { method: "patch", path: () => "/api/portfolio-settings/company", as: "admin", valid: () => ({ companyName: "Quillfern Household Group", currency: "EUR" }) },
  "PUT /api/portfolio-settings/customer-values": {
    method: "put",
    path: () => "/api/portfolio-settings/customer-values",
    as: "admin",
    valid: () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 58 }, { id: w.brandId.get("Plumrise"), customerValue: null }] }),
  },
  "PUT /api/portfolio-settings/channels": {
    method: "put",
    path: () => "/api/portfolio-settings/channels",
    as: "admin",
    valid: async () => ({ channels: (await w.db.select({ id: schema.channels.id, name: schema.channels.name }).from(schema.channels).orderBy(schema.channels.position)).map((c) => ({ id: c.id, name: c.name })) }),
  },
  "PUT /api/portfolio-settings/brand-names": {
    method: "put",
    path: () => "/api/portfolio-settings/brand-names",
    as: "admin",
    valid: () => ({ brands: [{ id: w.brandId.get("Kestrova"), name: "Kestrova" }] }),
  },
  "PUT /api/portfolio-settings/market-names": {
    method: "put",
    path: () => "/api/portfolio-settings/market-names",
    as: "admin",
    valid: () => ({ markets: [{ id: w.marketId.get("Veltria"), name: "Veltria" }] }),
  },
  "POST /api/runs/:runId/publish": { method: "post", path: () => `/api/runs/${w.secondRunId}/publish`, as: "analyst", valid: () => ({ reason: "x" }), runs: 10 },
};

function agentFor(as: WriteCase["as"]): Agent | ReturnType<typeof request> {
  return as === "anonymous" ? request(w.app) : w.agents[as];
}

describe("hostile bodies on every write route", () => {
  it("covers every route that reads a JSON body", () => {
    // Routes that take no body (or only a file) are covered by the query and path tests below.
    const withoutBody = new Set([
      "POST /api/auth/sign-out",
      "POST /api/auth/sign-out-all",
      "POST /api/uploads",
      "DELETE /api/datasets/:datasetId/lift-tests/:liftTestId",
      "POST /api/runs/:runId/cancel",
      "POST /api/runs/:runId/restart",
      "DELETE /api/plans/:planId",
      "POST /api/plans/:planId/submit",
      "POST /api/plans/:planId/withdraw",
      "POST /api/invitations/:invitationId/resend",
      "POST /api/invitations/:invitationId/revoke",
    ]);
    const unsafe = routeTable.filter((route) => route.method !== "get").map((route) => `${route.method.toUpperCase()} ${route.path}`);
    expect(unsafe.filter((key) => !withoutBody.has(key) && !(key in writes))).toEqual([]);
  });

  for (const [label, write] of Object.entries(writes)) {
    it(`${label}: never a 5xx, refusals in the JSON error shape and nothing written`, async () => {
      const valid = await write.valid();
      let refused = 0;
      await fc.assert(
        fc.asyncProperty(hostileBody(valid), async (body) => {
          const path = await write.path();
          // Sent as JSON text, as a browser or script would, whatever its top-level type.
          const json = JSON.stringify(body) ?? "";
          const answer = await expectSafe(`${label} ${json.slice(0, 200)}`, () => agentFor(write.as)[write.method](path).set("Content-Type", "application/json").send(json));
          if (answer.status >= 400) refused++;
        }),
        { seed, numRuns: write.runs ?? 15 },
      );
      expect(refused).toBeGreaterThan(0);
    });
  }
});

describe("malformed requests", () => {
  it("JSON that is not JSON, too deep, too big, of another type or encoding: a 4xx, nothing written", async () => {
    const raw = (body: string, type = "application/json") => () => w.agents.analyst.post("/api/flags").set("Content-Type", type).send(body);
    const cases: [string, () => Promise<{ status: number; body: unknown; headers: Record<string, unknown> }>][] = [
      ["not JSON", raw("{not json")],
      ["truncated", raw('{"cellId": "')],
      ["a bare string", raw('"hello"')],
      ["a bare number", raw("1e999")],
      ["null", raw("null")],
      ["an array", raw("[1,2,3]")],
      ["1e999 as the note (Infinity)", raw(`{"cellId":"${kv}","channel":"search","kind":"data_problem","note":1e999}`)],
      ["duplicate keys", raw(`{"cellId":"${kv}","channel":"search","kind":"data_problem","kind":"admin","note":"dup keys"}`)],
      ["nested 50 000 deep", raw(`${"[".repeat(50_000)}${"]".repeat(50_000)}`)],
      ["over the body limit", raw(JSON.stringify({ note: "x".repeat(1_100_000) }))],
      ["form-encoded", raw("cellId=x&channel=search", "application/x-www-form-urlencoded")],
      ["plain text", raw('{"cellId":"x"}', "text/plain")],
      ["another charset", raw('{"cellId":"x"}', "application/json; charset=iso-8859-7")],
    ];
    for (const [label, send] of cases) {
      const answer = await expectSafe(label, send);
      expect(answer.status, label).toBeGreaterThanOrEqual(400);
    }
    // Text Postgres cannot store (NUL) or that is not Unicode (a lone surrogate): refused naming the field, never a 5xx.
    const nul = await expectSafe("NUL in a note", raw(`{"cellId":"${kv}","channel":"search","kind":"data_problem","note":"bad\\u0000note"}`));
    expect(nul.status).toBe(400);
    expect(apiErrorSchema.parse(nul.body).error.issues?.[0]?.path).toBe("note");
    const surrogate = await expectSafe("lone surrogate in a plan name", () => w.agents.analyst.patch(`/api/plans/${veltriaPlan}`).set("Content-Type", "application/json").send('{"name":"Plan \\ud800"}'));
    expect(surrogate.status).toBe(400);
    expect((await expectSafe("NUL in the query", () => w.agents.analyst.get("/api/flags?status=%00"))).status).toBe(400);
    expect((await expectSafe("NUL in the path", () => w.agents.analyst.get("/api/plans/%00"))).status).toBe(404);
    // A body key with NUL too.
    expect((await expectSafe("NUL in a key", raw('{"a\\u0000b": 1}'))).status).toBe(400);

    // A budget that JSON turns into Infinity, and a horizon of 2^53: refused, with the field named.
    const input = await splitInput(w, [kv, pv]);
    const infinite = JSON.stringify(input).replace(/"totalBudget":[^,]+/, '"totalBudget":1e999');
    const answer = await expectSafe("Infinity budget", () => w.agents.analyst.post("/api/plans/budget-splits").set("Content-Type", "application/json").send(infinite));
    expect(answer.status).toBe(400);
    expect(JSON.stringify(answer.body)).toContain("totalBudget");
    const long = await expectSafe("horizon 2^53", () => w.agents.analyst.post("/api/plans/budget-splits").send({ ...input, horizon: 2 ** 53 }));
    expect(long.status).toBe(400);
  });
});

// ---------------------------------------------------------------------------------
// Query strings and path parameters on every route
// ---------------------------------------------------------------------------------

const hostileQueryValue = fc.oneof(fc.constantFrom(...hostileStrings.map((s) => s.slice(0, 3000)), "1e309", "-1", "0", "999999999999999999999"), fc.string({ maxLength: 20 }));
const queryNames = ["market", "channel", "status", "cell", "cells", "table", "run", "dataset", "kind", "to", "page", "pageSize", "action", "userId", "brand", "__proto__", "constructor"];
const hostileQuery = fc.array(fc.tuple(fc.constantFrom(...queryNames), hostileQueryValue, fc.boolean()), { minLength: 1, maxLength: 4 }).map((pairs) =>
  pairs.map(([name, value, asArray]) => `${encodeURIComponent(name)}${asArray ? "[]" : ""}=${encodeURIComponent(value)}`).join("&"),
);
const hostileSegment = fc.constantFrom("%00", "'%20OR%201%3D1--", "..%2F..%2Fetc%2Fpasswd", "%E2%80%AE", "%F0%9F%92%A9", "x".repeat(5000), "__proto__", "constructor", "%2e%2e", "NaN", "-1");

describe("hostile query strings and path parameters on every route", () => {
  const gets = routeTable.filter((route) => route.method === "get");
  for (const route of gets) {
    it(`GET ${route.path}`, async () => {
      const heavy = route.path.endsWith(".pdf") || route.path.endsWith("/events");
      const fill = (segment: string) => route.path.replace(/:(\w+)/g, () => segment);
      await fc.assert(
        fc.asyncProperty(hostileQuery, hostileSegment, async (query, segment) => {
          const url = `${fill(route.path.includes(":") ? segment : "")}?${query}`;
          await expectSafe(`GET ${url.slice(0, 200)}`, () => w.agents.admin.get(url));
          if (route.path.includes(":")) await expectSafe(`GET ${fill(segment).slice(0, 200)} (manager)`, () => w.agents.veltriaManager.get(fill(segment)));
        }),
        { seed, numRuns: heavy ? 2 : 6 },
      );
    });
  }

  it("unsafe routes with hostile path parameters", async () => {
    for (const route of routeTable.filter((r) => r.method !== "get" && r.path.includes(":") && !r.path.includes("/accept"))) {
      await fc.assert(
        fc.asyncProperty(hostileSegment, async (segment) => {
          const url = route.path.replace(/:(\w+)/g, () => segment);
          await expectSafe(`${route.method.toUpperCase()} ${url.slice(0, 200)}`, () => w.agents.admin[route.method](url).send({}));
        }),
        { seed, numRuns: 3 },
      );
    }
  });
});

// ---------------------------------------------------------------------------------
// Files in other encodings
// ---------------------------------------------------------------------------------

function utf16(text: string, order: "le" | "be", mark: boolean): Buffer {
  const le = Buffer.from(text, "utf16le");
  const bytes = order === "le" ? le : Buffer.from(le.map((_, i) => le[i % 2 === 0 ? i + 1 : i - 1]!));
  return mark ? Buffer.concat([Buffer.from(order === "le" ? [0xff, 0xfe] : [0xfe, 0xff]), bytes]) : bytes;
}

describe("files in other encodings (decided: UTF-8 and UTF-16 are read; other code pages are refused)", () => {
  const upload = (bytes: Buffer, name = "data.csv") => () => w.agents.analyst.post("/api/uploads").attach("file", bytes, name);

  it("reads UTF-16 (both byte orders, with or without a byte-order mark) exactly like UTF-8", async () => {
    const text = tinyCsv().replace("Kestrova", "Kestrova Ünïcødé 東");
    const reference = await expectSafe("utf-8", upload(Buffer.from(text, "utf8")));
    expect(reference.status).toBe(201);
    const ref = reference.body as { header: string[]; rowCount: number; previewRows: string[][] };
    expect(ref.previewRows[0]![1]).toBe("Kestrova Ünïcødé 東");
    for (const [label, bytes] of [
      ["UTF-16LE with mark", utf16(text, "le", true)],
      ["UTF-16BE with mark", utf16(text, "be", true)],
      ["UTF-16LE without mark", utf16(text, "le", false)],
      ["UTF-16BE without mark", utf16(text, "be", false)],
      ["UTF-8 with mark", Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(text, "utf8")])],
    ] as const) {
      const answer = await expectSafe(label, upload(bytes));
      expect(answer.status, label).toBe(201);
      const body = answer.body as typeof ref;
      expect(body.header, label).toEqual(ref.header);
      expect(body.rowCount, label).toBe(ref.rowCount);
      expect(body.previewRows, label).toEqual(ref.previewRows);
    }
  });

  it("refuses Latin-1 / Windows-1252 text with a clear message naming the line, and stores nothing", async () => {
    const lines = tinyCsv().split("\n");
    lines[3] = lines[3]!.replace("Kestrova", "Kestrova Mönchengladbach");
    const latin1 = Buffer.from(lines.join("\n"), "latin1");
    const answer = await expectSafe("latin-1", upload(latin1));
    expect(answer.status).toBe(400);
    const message = apiErrorSchema.parse(answer.body).error.message;
    expect(message).toContain("not valid UTF-8");
    expect(message).toContain("Line 4");
    expect(message).toContain("CSV UTF-8");
  });

  it("lift tests uploaded as UTF-16 are read too", async () => {
    const csv = "brand,market,channel,first_week,last_week,spend,incremental_outcome,standard_error\nKestrova,Veltria,social,2025-07-07,2025-07-28,25000,310,70\n";
    const answer = await expectSafe("lift tests utf-16", () => w.agents.analyst.post(`/api/datasets/${w.tinyVersionId}/lift-tests`).attach("file", utf16(csv, "le", true), "lift.csv"));
    expect(answer.status, JSON.stringify(answer.body)).toBe(201);
  });
});

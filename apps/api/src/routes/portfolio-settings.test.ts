// Portfolio settings through the API on a fitted snapshot (the tiny dataset's published
// fit: Kestrova × Veltria, Kestrova × Solvera, Plumrise × Veltria; search and social):
// each write with its audit entry, bad input refused naming the field with nothing
// changed, every other role refused, and the dashboards answering with the new names,
// values and currency at once (their cached numbers are per run; names and values are
// reread after any write).
import { asc, count, desc, eq, inArray } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, channelSheetSchema, portfolioMapSchema, portfolioSettingsActions, portfolioSettingsSchema, type PortfolioSettings } from "@tributary/contracts";
import { auditLog, brands, channels, workspaceSettings } from "../db/schema";
import { computeRunEstimates } from "../dashboards/run-estimates";
import { anonymous, fittedWorld, type Agent, type World } from "../testing/fitted-world";

let w: World;
let admin: Agent;

beforeAll(async () => {
  w = await fittedWorld();
  admin = w.agents.admin;
});
afterAll(() => w.close());

async function settings(): Promise<PortfolioSettings> {
  return portfolioSettingsSchema.parse((await admin.get("/api/portfolio-settings").expect(200)).body);
}

/** Everything a settings write may touch, to show that a refused one changed nothing. */
async function state() {
  const [settingsRow] = await w.db.select().from(workspaceSettings);
  return {
    settings: settingsRow,
    brands: await w.db.select().from(brands).orderBy(asc(brands.code)),
    channels: await w.db.select().from(channels).orderBy(asc(channels.code)),
    audit: (await w.db.select({ n: count() }).from(auditLog))[0]!.n,
  };
}

async function latestAudit(action: string) {
  const [entry] = await w.db.select().from(auditLog).where(eq(auditLog.action, action)).orderBy(desc(auditLog.id)).limit(1);
  return entry;
}

async function channelBody(change: (list: { id: string; code: string; name: string }[]) => { id: string; name: string }[] = (list) => list) {
  const list = (await settings()).channels.map(({ id, code, name }) => ({ id, code, name }));
  return { channels: change(list).map(({ id, name }) => ({ id, name })) };
}

describe("reading the portfolio settings", () => {
  it("gives the admin the company, currency, every brand with its customer value and the channels in display order", async () => {
    const s = await settings();
    expect(s.company).toBe("Quillfern Household Group");
    expect(s.currency).toBe("EUR");
    expect(s.brands.map((b) => [b.name, b.customerValue])).toEqual([
      ["Kestrova", 140],
      ["Plumrise", 95],
      ["Sundrift", 180],
    ]);
    expect(s.channels.map((c) => c.position)).toEqual([...s.channels.map((c) => c.position)].sort((a, b) => a - b));
    expect(s.channels.map((c) => c.code)).toContain("search");
  });
});

describe("changing the company name and currency", () => {
  it("renames the company (tidied), in one audit entry naming who, old and new", async () => {
    const answer = await admin.patch("/api/portfolio-settings/company").send({ companyName: "  Quillfern   Household Group Ltd " }).expect(200);
    expect(portfolioSettingsSchema.parse(answer.body).company).toBe("Quillfern Household Group Ltd");
    const entry = await latestAudit(portfolioSettingsActions.companyName);
    expect(entry?.userId).toBe(w.userId.admin);
    expect(entry?.details).toEqual({ from: "Quillfern Household Group", to: "Quillfern Household Group Ltd" });
    expect((await w.agents.analyst.get("/api/portfolio").expect(200)).body.company).toBe("Quillfern Household Group Ltd");
    await admin.patch("/api/portfolio-settings/company").send({ companyName: "Quillfern Household Group" }).expect(200);
  });

  it("relabels every money figure with a new currency without converting any number", async () => {
    const before = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    const answer = await admin.patch("/api/portfolio-settings/company").send({ currency: "sek" }).expect(200);
    expect(portfolioSettingsSchema.parse(answer.body).currency).toBe("SEK");
    const after = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(after.currency).toBe("SEK");
    expect(after.cells.map((c) => c.cac)).toEqual(before.cells.map((c) => c.cac));
    expect(after.cells.map((c) => c.customerValue)).toEqual(before.cells.map((c) => c.customerValue));
    const entry = await latestAudit(portfolioSettingsActions.currency);
    expect(entry?.details).toMatchObject({ from: "EUR", to: "SEK" });
    await admin.patch("/api/portfolio-settings/company").send({ currency: "EUR" }).expect(200);
    expect((await settings()).currency).toBe("EUR");
  });

  it("writes nothing when nothing changes", async () => {
    const before = await state();
    await admin.patch("/api/portfolio-settings/company").send({ companyName: "Quillfern Household Group", currency: "EUR" }).expect(200);
    expect(await state()).toEqual(before);
  });
});

describe("customer values", () => {
  /** The share of the run's stored average-CAC draws (search) of a cell below a value, counted here directly. */
  async function shareOfDrawsBelow(cellId: string, value: number): Promise<number> {
    const estimates = await computeRunEstimates(w.db, w.publishedRunId);
    const draws = estimates.cells.find((c) => c.cellId === cellId)!.channels.find((ch) => ch.channel === "search")!.average!.draws;
    return Array.from(draws).filter((x) => x < value).length / draws.length;
  }

  it("changes a brand's value; the Portfolio map's chance of profit follows at once (cached numbers are per run, values are reread)", async () => {
    const kestrova = w.brandId.get("Kestrova")!;
    const cell = w.cellId.get("Kestrova × Veltria")!;
    const map = async () => portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").query({ channel: "search" }).expect(200)).body);
    const chanceOf = async () => (await map()).cells.find((c) => c.cellId === cell)!;
    const before = await chanceOf();
    expect(before).toMatchObject({ customerValue: 140, probabilityProfitable: await shareOfDrawsBelow(cell, 140) });

    // The median draw as the value: about half the draws below it.
    const estimates = await computeRunEstimates(w.db, w.publishedRunId);
    const median = estimates.cells.find((c) => c.cellId === cell)!.channels.find((ch) => ch.channel === "search")!.average!.interval.q50;
    for (const value of [median, 1e-6, 1e9]) {
      await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: value }] }).expect(200);
      const after = await chanceOf();
      expect(after.customerValue).toBe(value);
      expect(after.probabilityProfitable).toBe(await shareOfDrawsBelow(cell, value));
      const sheet = channelSheetSchema.parse((await w.agents.veltriaManager.get(`/api/dashboards/channel-sheet/${cell}/search`).expect(200)).body);
      expect(sheet.profit).toMatchObject({ customerValue: value, probabilityAtCustomerValue: after.probabilityProfitable });
    }
    expect(await shareOfDrawsBelow(cell, median)).toBeGreaterThan(0.3);
    expect(await shareOfDrawsBelow(cell, median)).toBeLessThan(0.7);
    expect(await shareOfDrawsBelow(cell, 1e-6)).toBe(0);

    // Cleared: not known, so no chance of profit is shown (null), never a made-up one.
    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: null }] }).expect(200);
    const cleared = await map();
    expect(cleared.cells.filter((c) => c.brandId === kestrova).map((c) => [c.customerValue, c.probabilityProfitable])).toEqual([
      [null, null],
      [null, null],
    ]);
    // Plumrise kept its value.
    expect(cleared.cells.find((c) => c.cellId === w.cellId.get("Plumrise × Veltria"))?.customerValue).toBe(95);
    expect((await w.agents.analyst.get("/api/portfolio").expect(200)).body.brands.find((b: { id: string }) => b.id === kestrova).customerValue).toBeNull();

    const entries = await w.db.select().from(auditLog).where(eq(auditLog.action, portfolioSettingsActions.customerValue)).orderBy(asc(auditLog.id));
    expect(entries.slice(-4).map((e) => [e.userId, e.target, e.details])).toEqual([
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 140, to: median }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: median, to: 1e-6 }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 1e-6, to: 1e9 }],
      [w.userId.admin, `brand:${kestrova}`, { brand: "Kestrova", from: 1e9, to: null }],
    ]);

    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: kestrova, customerValue: 140 }] }).expect(200);
    expect((await chanceOf()).probabilityProfitable).toBe(before.probabilityProfitable);
  });

  it("sets several brands in one change, one audit entry each", async () => {
    const ids = [w.brandId.get("Plumrise")!, w.brandId.get("Sundrift")!];
    const auditBefore = (await w.db.select({ n: count() }).from(auditLog))[0]!.n;
    const answer = portfolioSettingsSchema.parse(
      (await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: ids[0], customerValue: 99.5 }, { id: ids[1], customerValue: 180 }] }).expect(200)).body,
    );
    expect(answer.brands.map((b) => b.customerValue)).toEqual([140, 99.5, 180]);
    // Sundrift's value did not change: only Plumrise's entry is written.
    expect((await w.db.select({ n: count() }).from(auditLog))[0]!.n).toBe(auditBefore + 1);
    await admin.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: ids[0], customerValue: 95 }] }).expect(200);
  });
});

describe("channel names and order", () => {
  it("renames and reorders the channels; the Channel sheet, the Portfolio map and the channel list follow", async () => {
    const original = await channelBody();
    const body = await channelBody((list) => [...list].reverse().map((c) => (c.code === "social" ? { ...c, name: " Social   media " } : c)));
    const answer = portfolioSettingsSchema.parse((await admin.put("/api/portfolio-settings/channels").send(body).expect(200)).body);
    expect(answer.channels.map((c) => c.id)).toEqual(body.channels.map((c) => c.id));
    expect(answer.channels.map((c) => c.position)).toEqual(body.channels.map((_, k) => k));
    expect(answer.channels.find((c) => c.code === "social")?.name).toBe("Social media");

    const cell = w.cellId.get("Kestrova × Veltria")!;
    const sheet = channelSheetSchema.parse((await w.agents.veltriaManager.get(`/api/dashboards/channel-sheet/${cell}/social`).expect(200)).body);
    expect(sheet.channel.name).toBe("Social media");
    const map = portfolioMapSchema.parse((await w.agents.portfolioLead.get("/api/dashboards/portfolio-map").expect(200)).body);
    expect(map.channels.map((c) => c.code)).toEqual(["social", "search"]);
    expect((await w.agents.analyst.get("/api/channels").expect(200)).body.map((c: { name: string }) => c.name).slice(0, 2)).toEqual(
      answer.channels.slice(0, 2).map((c) => c.name),
    );

    const renamed = await latestAudit(portfolioSettingsActions.channelName);
    expect(renamed?.details).toMatchObject({ channel: "social", from: "Social", to: "Social media" });
    const order = await latestAudit(portfolioSettingsActions.channelOrder);
    expect(order?.details).toEqual({ from: original.channels.map((c) => answerCode(answer, c.id)), to: body.channels.map((c) => answerCode(answer, c.id)) });

    await admin.put("/api/portfolio-settings/channels").send(original).expect(200);
    expect((await settings()).channels.map(({ id, name }) => ({ id, name }))).toEqual(original.channels);
  });

  it("lets two channels swap names in one change", async () => {
    const original = await channelBody();
    const [a, b] = original.channels;
    const swapped = { channels: [{ id: a!.id, name: b!.name }, { id: b!.id, name: a!.name }, ...original.channels.slice(2)] };
    await admin.put("/api/portfolio-settings/channels").send(swapped).expect(200);
    expect((await settings()).channels.slice(0, 2).map((c) => c.name)).toEqual([b!.name, a!.name]);
    await admin.put("/api/portfolio-settings/channels").send(original).expect(200);
  });
});

function answerCode(s: PortfolioSettings, id: string): string {
  return s.channels.find((c) => c.id === id)!.code;
}

describe("bad input: a 400 naming the field, and nothing changed", () => {
  const cases: [string, string, "patch" | "put", () => Promise<unknown> | unknown, string][] = [
    ["an empty company name", "/api/portfolio-settings/company", "patch", () => ({ companyName: "   " }), "companyName"],
    ["a company name of 121 characters", "/api/portfolio-settings/company", "patch", () => ({ companyName: "Q".repeat(121) }), "companyName"],
    ["a company name a spreadsheet would run", "/api/portfolio-settings/company", "patch", () => ({ companyName: "=HYPERLINK(\"x\")" }), "companyName"],
    ["a company name that reads backwards", "/api/portfolio-settings/company", "patch", () => ({ companyName: "Quill\u202Efern" }), "companyName"],
    ["a made-up currency", "/api/portfolio-settings/company", "patch", () => ({ currency: "QQQ" }), "currency"],
    ["a currency that is not three letters", "/api/portfolio-settings/company", "patch", () => ({ currency: "EURO" }), "currency"],
    ["a currency as a number", "/api/portfolio-settings/company", "patch", () => ({ currency: 978 }), "currency"],
    ["a good name with a bad currency (nothing of it applied)", "/api/portfolio-settings/company", "patch", () => ({ companyName: "New name", currency: "XYZ1" }), "currency"],
    ["nothing to change", "/api/portfolio-settings/company", "patch", () => ({}), "body"],
    ["a customer value of 0", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 0 }] }), "brands.0.customerValue"],
    ["a negative customer value", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: -12 }] }), "brands.0.customerValue"],
    ["a customer value as text", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: "140" }] }), "brands.0.customerValue"],
    ["a customer value of 10^12", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 1e12 }] }), "brands.0.customerValue"],
    [
      "one good value and one bad (neither applied)",
      "/api/portfolio-settings/customer-values",
      "put",
      () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: w.brandId.get("Plumrise"), customerValue: -1 }] }),
      "brands.1.customerValue",
    ],
    ["an unknown brand", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: "no-such-brand", customerValue: 10 }] }), "brands.1.id"],
    ["a brand listed twice", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 150 }, { id: w.brandId.get("Kestrova"), customerValue: 10 }] }), "brands.1.id"],
    ["no brands", "/api/portfolio-settings/customer-values", "put", () => ({ brands: [] }), "brands"],
    ["an empty channel name", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 1 ? { ...c, name: " " } : c))), "channels.1.name"],
    ["a channel name of 61 characters", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 0 ? { ...c, name: "x".repeat(61) } : c))), "channels.0.name"],
    ["a channel name with a line break", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.map((c, k) => (k === 0 ? { ...c, name: "Search\u0007engine" } : c))), "channels.0.name"],
    [
      "two channels with one name (case and spacing aside)",
      "/api/portfolio-settings/channels",
      "put",
      () => channelBody((l) => l.map((c, k) => (k === 1 ? { ...c, name: ` ${l[0]!.name.toUpperCase()} ` } : c))),
      "channels.1.name",
    ],
    ["a channel left out", "/api/portfolio-settings/channels", "put", () => channelBody((l) => l.slice(1)), "channels"],
    ["an unknown channel", "/api/portfolio-settings/channels", "put", () => channelBody((l) => [...l, { id: "no-such-channel", code: "x", name: "Billboards" }]), "channels.5.id"],
    ["a channel listed twice", "/api/portfolio-settings/channels", "put", () => channelBody((l) => [...l, l[0]!]), "channels.5.id"],
  ];
  for (const [label, path, method, body, field] of cases) {
    it(label, async () => {
      const before = await state();
      const answer = await admin[method](path).send((await body()) as object);
      expect(answer.status, JSON.stringify(answer.body)).toBe(400);
      const error = apiErrorSchema.parse(answer.body).error;
      expect(error.code).toBe("invalid_input");
      expect(error.issues?.map((i) => i.path)).toContain(field);
      expect(error.message.length).toBeGreaterThan(5);
      expect(await state()).toEqual(before);
    });
  }

  it("Infinity sent as 1e999 is refused like any other non-number", async () => {
    const before = await state();
    const raw = `{"brands":[{"id":"${w.brandId.get("Kestrova")}","customerValue":1e999}]}`;
    const answer = await admin.put("/api/portfolio-settings/customer-values").set("Content-Type", "application/json").send(raw);
    expect(answer.status).toBe(400);
    expect(apiErrorSchema.parse(answer.body).error.issues?.[0]?.path).toBe("brands.0.customerValue");
    expect(await state()).toEqual(before);
  });
});

describe("only admins", () => {
  it("refuses every other role (403) and a visitor without a session (401), changing nothing", async () => {
    const before = await state();
    const writes = async (agent: Agent | ReturnType<typeof anonymous>) => [
      await agent.get("/api/portfolio-settings"),
      await agent.patch("/api/portfolio-settings/company").send({ companyName: "Taken over" }),
      await agent.put("/api/portfolio-settings/customer-values").send({ brands: [{ id: w.brandId.get("Kestrova"), customerValue: 1 }] }),
      await agent.put("/api/portfolio-settings/channels").send(await channelBody((l) => l.map((c) => ({ ...c, name: `${c.name} 2` })))),
    ];
    for (const who of ["portfolioLead", "analyst", "veltriaManager", "southManager"] as const) {
      expect((await writes(w.agents[who])).map((r) => r.status), who).toEqual([403, 403, 403, 403]);
    }
    expect((await writes(anonymous(w))).map((r) => r.status)).toEqual([401, 401, 401, 401]);
    expect(await state()).toEqual(before);
    const brandRows = await w.db.select({ v: brands.customerValue }).from(brands).where(inArray(brands.code, ["kestrova"]));
    expect(brandRows[0]?.v).toBe(140);
  });
});

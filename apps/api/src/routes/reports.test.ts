// The PDF report of the current run, by brand and by market, read back as text: the
// headline numbers, the trust mark, the cautions, and market scope (a market manager's
// report names no other market; another market's report is refused).
import { inflateSync } from "node:zlib";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { portfolioSchema, runResultsSchema } from "@tributary/contracts";
import { closeDatabase } from "../db/client";
import { brands, markets } from "../db/schema";
import { demoUsers } from "../demo/users";
import { FITTED_PUBLISH_REASON, fittedDatabase } from "../testing/fitted-snapshot";
import { demoTestApp, signedInAgent, type TestApp } from "../testing/test-app";

type Agent = Awaited<ReturnType<typeof signedInAgent>>;

/** The page content streams of a PDF, inflated. */
function contentStreams(pdf: Buffer): string[] {
  const out: string[] = [];
  const text = pdf.toString("latin1");
  const re = /(?<!end)stream\r?\n/g;
  let match: RegExpExecArray | null;
  while ((match = re.exec(text)) !== null) {
    const start = match.index + match[0].length;
    const end = text.indexOf("endstream", start);
    if (end < 0) break;
    const dict = text.slice(text.lastIndexOf("<<", match.index), match.index);
    const bytes = pdf.subarray(start, end);
    try {
      out.push((dict.includes("FlateDecode") ? inflateSync(bytes) : bytes).toString("latin1"));
    } catch {
      // Not a deflated stream (e.g. a font); not page text.
    }
    re.lastIndex = end;
  }
  return out;
}

/** WinAnsiEncoding (PDF 32000-1, annex D): Latin-1 but for 0x80–0x9F. */
const winAnsiHigh = "€\u0081‚ƒ„…†‡ˆ‰Š‹Œ\u008dŽ\u008f\u0090‘’“”•–—˜™š›œ\u009džŸ";
const winAnsi = { decode: (bytes: Buffer) => Array.from(bytes, (b) => (b >= 0x80 && b <= 0x9f ? winAnsiHigh[b - 0x80]! : String.fromCharCode(b))).join("") };

/** The text shown by the PDF, one line per text operation (standard fonts: hex of WinAnsi codes). */
function pdfText(pdf: Buffer): string {
  const lines: string[] = [];
  for (const stream of contentStreams(pdf)) {
    for (const op of stream.matchAll(/\[([^\]]*)\]\s*TJ/g)) {
      const hex = [...op[1]!.matchAll(/<([0-9a-fA-F]*)>/g)].map((m) => m[1]).join("");
      lines.push(winAnsi.decode(Buffer.from(hex, "hex")));
    }
  }
  return lines.join("\n");
}

let t: TestApp;
let lead: Agent, veltria: Agent, south: Agent;
const id = new Map<string, string>();
beforeAll(async () => {
  const fitted = await fittedDatabase();
  t = await demoTestApp({}, fitted.db);
  [lead, veltria, south] = await Promise.all([
    signedInAgent(t.app, demoUsers.portfolioLead),
    signedInAgent(t.app, demoUsers.veltriaManager),
    signedInAgent(t.app, demoUsers.southManager),
  ]);
  for (const m of await t.db.select().from(markets)) id.set(m.name, m.id);
  for (const b of await t.db.select().from(brands)) id.set(b.name, b.id);
});
afterAll(async () => {
  await t.close();
  await closeDatabase(t.db);
});

async function report(agent: Agent, query: string): Promise<{ pdf: Buffer; text: string }> {
  const response = await agent
    .get(`/api/reports/run.pdf?${query}`)
    .buffer(true)
    .parse((res, callback) => {
      const chunks: Buffer[] = [];
      res.on("data", (chunk: Buffer) => chunks.push(chunk));
      res.on("end", () => callback(null, Buffer.concat(chunks)));
    })
    .expect(200);
  expect(response.headers["content-type"]).toBe("application/pdf");
  expect(response.headers["content-disposition"]).toMatch(/^attachment; filename="tributary-.*\.pdf"$/);
  const pdf = response.body as Buffer;
  expect(pdf.subarray(0, 5).toString()).toBe("%PDF-");
  return { pdf, text: pdfText(pdf) };
}

const money = (x: number) => {
  const digits = Math.abs(x) >= 100 ? 0 : Math.abs(x) >= 10 ? 1 : 2;
  return x.toLocaleString("en-GB", { minimumFractionDigits: digits, maximumFractionDigits: digits });
};

describe("the run report", () => {
  it("of a brand holds every cell's median and 90 % interval, the trust mark, the publish reason and the cautions", async () => {
    const { pdf, text } = await report(lead, `brand=${id.get("Kestrova")}`);
    expect(text).toContain("Fit report — Brand Kestrova");
    expect(text).toContain("Veltria");
    expect(text).toContain("Solvera");
    expect(text).not.toContain("Plumrise");
    expect(text).toContain("did not pass every convergence check");
    expect(text).toContain(FITTED_PUBLISH_REASON.slice(0, 20));
    expect(text).toContain("lift test");
    expect(text).toContain("model-based estimates");
    const results = runResultsSchema.parse((await lead.get("/api/runs/current").expect(200)).body);
    expect(results.run.trust.reasons.length).toBeGreaterThan(0);
    expect(text).toContain(`• ${results.run.trust.reasons[0]!.slice(0, 25)}`);
    for (const cell of results.cells.filter((c) => c.brand === "Kestrova" && c.hasSpend)) {
      expect(text).toContain(money(cell.cac0.q50));
      expect(text).toContain(`${money(cell.cac0.q05)} – ${money(cell.cac0.q95)}`);
    }
    // Channels read by their display names ("Online video"), never their codes, in the table's cells.
    const portfolio = portfolioSchema.parse((await lead.get("/api/portfolio").expect(200)).body);
    const lines = text.split("\n");
    const shown = new Set(results.cells.filter((c) => c.brand === "Kestrova" && c.hasSpend).map((c) => c.channel));
    expect(shown.size).toBeGreaterThan(1);
    for (const channel of portfolio.channels.filter((c) => shown.has(c.code))) {
      expect(channel.name).not.toBe(channel.code);
      expect(lines).toContain(channel.name);
      expect(lines).not.toContain(channel.code);
    }
    // The intervals chart is drawn with vector paths: lines and circles (Bézier curves).
    const content = contentStreams(pdf).join("\n");
    expect((content.match(/ l\n/g) ?? []).length).toBeGreaterThan(10);
    expect(content).toMatch(/ c\n/);
  });

  it("of a market shows its cells only", async () => {
    const { text } = await report(lead, `market=${id.get("Solvera")}`);
    expect(text).toContain("Fit report — Market Solvera");
    expect(text).toContain("Kestrova");
    expect(text).not.toContain("Veltria");
  });

  it("for a market manager names only their markets, by market and by brand", async () => {
    const others = ["Solvera", "Kessland", "Marendi", "Tallowmere", "Lunesse"];
    const reasons = runResultsSchema.parse((await lead.get("/api/runs/current").expect(200)).body).run.trust.reasons;
    for (const query of [`market=${id.get("Veltria")}`, `brand=${id.get("Kestrova")}`, `brand=${id.get("Plumrise")}`]) {
      const { text } = await report(veltria, query);
      expect(text).toContain("Veltria");
      for (const other of others) expect(text).not.toContain(other);
      // A manager sees the trust mark without the reasons that name parameters of any cell.
      for (const reason of reasons) expect(text).not.toContain(reason.slice(0, 25));
      expect(text).toContain("did not pass every convergence check");
    }
    await veltria.get(`/api/reports/run.pdf?market=${id.get("Solvera")}`).expect(403);
    await south.get(`/api/reports/run.pdf?brand=${id.get("Kestrova")}`).expect(404);
  });

  it("needs exactly one of brand and market", async () => {
    const both = await lead.get(`/api/reports/run.pdf?brand=${id.get("Kestrova")}&market=${id.get("Veltria")}`).expect(400);
    expect(both.body.error.message).toContain("one brand");
    await lead.get("/api/reports/run.pdf").expect(400);
    await lead.get("/api/reports/run.pdf?brand=no-such-brand").expect(404);
    await lead.get("/api/reports/run.pdf?market=no-such-market").expect(404);
  });
});

describe("before any publication", () => {
  it("says there is no fit yet", async () => {
    const plain = await demoTestApp();
    try {
      const agent = await signedInAgent(plain.app, demoUsers.portfolioLead);
      const [kestrova] = await plain.db.select().from(brands).where(eq(brands.name, "Kestrova"));
      const response = await agent.get(`/api/reports/run.pdf?brand=${kestrova!.id}`).expect(404);
      expect(response.body.error.message).toBe("No fit has been published yet");
    } finally {
      await plain.close();
    }
  });
});

import { mkdtempSync, rmSync, writeFileSync } from "node:fs";
import { tmpdir } from "node:os";
import { join } from "node:path";
import { Writable } from "node:stream";
import { pino } from "pino";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, healthSchema } from "@tributary/contracts";
import { anyone, defineRoute } from "./access/route-table";
import { createApp } from "./app";
import { defaultConfig } from "./config";
import { closeDatabase, type Database } from "./db/client";
import { snapshotDatabase } from "./testing/database-snapshot";
import { safeErrorForLog } from "./http/error-handler";
import { routeTable } from "./routes";

let db: Database;
const webDir = mkdtempSync(join(tmpdir(), "tributary-web-"));
beforeAll(async () => {
  db = await snapshotDatabase("migrated");
  writeFileSync(join(webDir, "index.html"), "<!doctype html><title>Tributary</title><div id=root></div>");
  writeFileSync(join(webDir, "app.js"), "console.log(1)");
});
afterAll(async () => {
  await closeDatabase(db);
  rmSync(webDir, { recursive: true, force: true });
});

describe("GET /api/health", () => {
  it("says the server and its database are up, with the version", async () => {
    const app = createApp({ db, config: { logLevel: "silent" } });
    const response = await request(app).get("/api/health").expect(200);
    expect(healthSchema.parse(response.body)).toEqual({ ok: true, version: defaultConfig.version, database: "up" });
    expect(response.headers["x-request-id"]).toMatch(/^[0-9a-f-]{36}$/);
  });

  it("sets helmet's security headers", async () => {
    const app = createApp({ db, config: { logLevel: "silent" } });
    const response = await request(app).get("/api/health");
    expect(response.headers["x-content-type-options"]).toBe("nosniff");
    expect(response.headers["content-security-policy"]).toContain("default-src 'self'");
    expect(response.headers["x-powered-by"]).toBeUndefined();
  });
});

describe("errors", () => {
  const lines: string[] = [];
  const sink = new Writable({
    write(chunk, _encoding, done) {
      lines.push(String(chunk));
      done();
    },
  });
  const failing = [
    ...routeTable,
    defineRoute({
      method: "get",
      path: "/api/broken",
      access: anyone,
      handler: async ({ db: database }) => {
        // A failing query whose parameters must not reach the log.
        await database.$client.query("select * from no_such_table where secret = $1", ["hunter2-row-data"]);
      },
    }),
  ];

  it("turn an unknown error into 500 'Something went wrong' with the request id, logged without its data", async () => {
    const app = createApp({ db, routes: failing, logger: pino({ level: "error" }, sink) });
    const response = await request(app).get("/api/broken").expect(500);
    const body = apiErrorSchema.parse(response.body);
    expect(body.error.code).toBe("internal");
    expect(body.error.requestId).toBe(response.headers["x-request-id"]);
    expect(body.error.message).toBe(`Something went wrong (request ${response.headers["x-request-id"]})`);
    const logged = lines.join("");
    expect(logged).toContain("unhandled error");
    expect(logged).toContain(String(response.headers["x-request-id"]));
    expect(logged).not.toContain("hunter2");
  });

  it("answer an unknown API path with a JSON 404", async () => {
    const app = createApp({ db, config: { logLevel: "silent" } });
    const response = await request(app).get("/api/nothing-here").expect(404);
    expect(apiErrorSchema.parse(response.body).error).toMatchObject({ code: "not_found", message: "Nothing at GET /api/nothing-here" });
  });

  it("answer an oversized JSON body with 413", async () => {
    const app = createApp({ db, config: { logLevel: "silent" } });
    const response = await request(app)
      .post("/api/auth/sign-in")
      .send({ email: "a@b.example", password: "x".repeat(2_000_000) })
      .expect(413);
    expect(apiErrorSchema.parse(response.body).error.code).toBe("too_large");
  });

  it("keep query parameters and database details out of what is logged", () => {
    const cause = Object.assign(new Error('relation "x" does not exist'), { code: "42P01", detail: "Key (email)=(a@b.example)" });
    const error = Object.assign(new Error("Failed query: select $1\nparams: secret-value"), { name: "DrizzleQueryError", cause });
    const logged = JSON.stringify(safeErrorForLog(error));
    expect(logged).not.toContain("secret-value");
    expect(logged).not.toContain("a@b.example");
    expect(logged).toContain("42P01");
  });
});

describe("the web app", () => {
  it("is served with an SPA fallback, while API misses stay JSON", async () => {
    const app = createApp({ db, config: { logLevel: "silent", webDistDir: webDir } });
    const page = await request(app).get("/market-desk/some-market").expect(200);
    expect(page.headers["content-type"]).toMatch(/text\/html/);
    expect(page.text).toContain("<title>Tributary</title>");
    await request(app).get("/").expect(200).expect(/<div id=root>/);
    await request(app).get("/app.js").expect(200).expect("content-type", /javascript/);
    const api = await request(app).get("/api/nope").expect(404);
    expect(api.body.error.code).toBe("not_found");
  });
});

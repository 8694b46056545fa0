// Web security of the API: cross-site request forgery (the Origin/Referer check and the
// session's token, on every unsafe route of the route table, multipart uploads included),
// sessions (a new one at every sign-in, ended by a role change and by "sign out
// everywhere"), password rules on every path that sets a password, rate limits on
// sign-in and the invitation page, and the audit log of the actions that matter.
import { readdirSync, readFileSync, statSync } from "node:fs";
import { join } from "node:path";
import { and, count, desc, eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, passwordProblems, planSchema } from "@tributary/contracts";
import { routeTable } from "../routes";
import { auditLog, flags, invitations, plans, sessions, users } from "../db/schema";
import { demoUserList, demoUsers } from "../demo/users";
import { csrfSetCookie, sessionSetCookie, signInCookie, signedInAgent } from "../testing/test-app";
import { copyPlan, copyRun, fittedWorld, newFlag, newInvitation, renewAgent, scenarioInput, splitInput, tinyMapping, type World } from "../testing/fitted-world";
import { tinyCsv } from "../testing/fit-fixtures";
import { tableCounts } from "../testing/intake-fixtures";
import { csrfCookieName, csrfHeaderName, csrfTokenFor } from "./csrf";

let w: World;
let kv: string;
let pv: string;
let veltriaPlan: string;
beforeAll(async () => {
  w = await fittedWorld();
  kv = w.cellId.get("Kestrova × Veltria")!;
  pv = w.cellId.get("Plumrise × Veltria")!;
  veltriaPlan = planSchema.parse((await w.agents.veltriaManager.post("/api/plans/scenarios").send(await scenarioInput(w, [kv, pv])).expect(201)).body).id;
});
afterAll(() => w.close());

const unsafeRoutes = routeTable.filter((route) => route.method !== "get");
const pathWithDummies = (path: string) => path.replace(/:(\w+)/g, "x");
const tokenRefusal = "This request lacks the page's security token; reload the page and try again";

describe("cross-site request forgery", () => {
  it("refuses every unsafe route called with a session but without its token, before the route runs", async () => {
    const { cookie } = await signInCookie(w.app, demoUsers.admin);
    const before = await tableCounts(w.db);
    const methods = new Set<string>();
    for (const route of unsafeRoutes) {
      methods.add(route.method);
      const response = await request(w.app)[route.method](pathWithDummies(route.path)).set("Cookie", cookie).send({});
      expect(response.status, `${route.method.toUpperCase()} ${route.path}`).toBe(403);
      expect(apiErrorSchema.parse(response.body).error.message).toBe(tokenRefusal);
    }
    expect([...methods].sort()).toEqual(["delete", "patch", "post", "put"]);
    expect(await tableCounts(w.db)).toEqual(before);
  });

  it("refuses a wrong token, and the token of another session", async () => {
    const mine = await signInCookie(w.app, demoUsers.analyst);
    const other = await signInCookie(w.app, demoUsers.analyst);
    const body = { cellId: kv, channel: "social", kind: "data_problem", note: "forged" };
    for (const token of ["", "x", other.csrfToken, mine.csrfToken.slice(1), mine.sessionId]) {
      await request(w.app).post("/api/flags").set("Cookie", mine.cookie).set(csrfHeaderName, token).send(body).expect(403);
    }
    expect(await w.db.select().from(flags).where(eq(flags.note, "forged"))).toHaveLength(0);
    await request(w.app).post("/api/flags").set("Cookie", mine.cookie).set(csrfHeaderName, mine.csrfToken).send(body).expect(201);
  });

  it("covers POST, PUT, PATCH, DELETE and multipart uploads alike", async () => {
    const { cookie, csrfToken } = await signInCookie(w.app, demoUsers.admin);
    const plan = await copyPlan(w, veltriaPlan);
    const calls = [
      () => request(w.app).put(`/api/plans/${plan}`),
      () => request(w.app).patch(`/api/plans/${plan}`),
      () => request(w.app).delete(`/api/plans/${plan}`),
    ];
    for (const make of calls) await make().set("Cookie", cookie).send({ name: "forged" }).expect(403);
    const upload = () => request(w.app).post("/api/uploads").set("Cookie", cookie).attach("file", Buffer.from(tinyCsv()), "tiny.csv");
    expect((await upload().expect(403)).body.error.message).toBe(tokenRefusal);
    expect((await w.db.select().from(plans).where(eq(plans.id, plan)))[0]!.name).not.toBe("forged");
    // With the token each goes through.
    await request(w.app).patch(`/api/plans/${plan}`).set("Cookie", cookie).set(csrfHeaderName, csrfToken).send({ name: "renamed" }).expect(200);
    await upload().set(csrfHeaderName, csrfToken).expect(201);
    await request(w.app).delete(`/api/plans/${plan}`).set("Cookie", cookie).set(csrfHeaderName, csrfToken).expect(204);
  });

  it("refuses every unsafe route from another site's Origin or Referer, token or not, signed in or not", async () => {
    const { cookie, csrfToken } = await signInCookie(w.app, demoUsers.admin);
    const before = await tableCounts(w.db);
    for (const route of unsafeRoutes) {
      const path = pathWithDummies(route.path);
      const label = `${route.method.toUpperCase()} ${route.path}`;
      const withOrigin = await request(w.app)[route.method](path).set("Cookie", cookie).set(csrfHeaderName, csrfToken).set("Origin", "https://elsewhere.example").send({});
      expect(withOrigin.status, label).toBe(403);
      expect(withOrigin.body.error.message, label).toBe("Cross-site request refused");
      // An opaque origin ("null": a sandboxed frame, a redirect) is refused too.
      expect((await request(w.app)[route.method](path).set("Origin", "null").send({})).status, label).toBe(403);
      // No Origin, but a Referer from another site (older browsers).
      expect((await request(w.app)[route.method](path).set("Referer", "https://elsewhere.example/page").send({})).status, label).toBe(403);
    }
    expect(await tableCounts(w.db)).toEqual(before);
  });

  it("lets same-site requests through (Origin or Referer of this host), and reads need no token", async () => {
    const server = w.app.listen(0);
    try {
      const address = server.address();
      const port = typeof address === "object" && address ? address.port : 0;
      const base = `http://127.0.0.1:${port}`;
      const { cookie, csrfToken } = await signInCookie(w.app, demoUsers.analyst);
      const send = (headers: Record<string, string>) =>
        fetch(`${base}/api/flags`, {
          method: "POST",
          headers: { "Content-Type": "application/json", Cookie: cookie, [csrfHeaderName]: csrfToken, ...headers },
          body: JSON.stringify({ cellId: kv, channel: "social", kind: "data_problem", note: "from this site" }),
        });
      expect((await send({ Origin: base })).status).toBe(201);
      expect((await send({ Referer: `${base}/pooling-review` })).status).toBe(201);
      expect((await send({ Origin: `http://127.0.0.1:${port + 1}` })).status).toBe(403);
      // Reads carry no token.
      expect((await fetch(`${base}/api/flags`, { headers: { Cookie: cookie } })).status).toBe(200);
    } finally {
      server.close();
    }
  });

  it("hands the token to the page in a readable, same-site cookie, and clears it at sign-out", async () => {
    const response = await request(w.app).post("/api/auth/sign-in").send({ email: demoUsers.portfolioLead.email, password: demoUsers.portfolioLead.password }).expect(200);
    const header = (response.headers["set-cookie"] as unknown as string[]).find((c) => c.startsWith(`${csrfCookieName}=`))!;
    expect(header).not.toMatch(/HttpOnly/i);
    expect(header).toMatch(/SameSite=Strict/);
    expect(header).toMatch(/Path=\//);
    const sessionId = sessionSetCookie(response)!.split(";")[0]!.split("=")[1]!;
    expect(csrfSetCookie(response)).toBe(csrfTokenFor(sessionId));
    // The token tells nothing of the session id.
    expect(csrfTokenFor(sessionId)).not.toContain(sessionId);
    const cookie = `tributary_session=${sessionId}`;
    // A browser that lost the token cookie gets it back on its next request.
    const me = await request(w.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    expect(csrfSetCookie(me)).toBe(csrfTokenFor(sessionId));
    const kept = await request(w.app).get("/api/auth/me").set("Cookie", `${cookie}; ${csrfCookieName}=${csrfTokenFor(sessionId)}`).expect(200);
    expect(csrfSetCookie(kept)).toBeUndefined();
    const out = await request(w.app).post("/api/auth/sign-out").set("Cookie", cookie).set(csrfHeaderName, csrfTokenFor(sessionId)).expect(204);
    expect((out.headers["set-cookie"] as unknown as string[]).some((c) => c.startsWith(`${csrfCookieName}=;`))).toBe(true);
  });

  it("needs no token where there is no session (signing in, the invitation page)", async () => {
    await request(w.app).post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password }).expect(200);
    const { token } = await newInvitation(w);
    await request(w.app).post(`/api/invitations/${token}/accept`).send({ name: "Ona Pell", password: "copper-kettle-meadow-4" }).expect(201);
    // A stale cookie (a session that ended) does not stand in the way of signing in again.
    const { cookie, sessionId } = await signInCookie(w.app, demoUsers.analyst);
    await w.db.delete(sessions).where(eq(sessions.id, sessionId));
    await request(w.app).post("/api/auth/sign-in").set("Cookie", cookie).send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password }).expect(200);
  });
});

describe("sessions", () => {
  it("every sign-in makes a new session id; the browser's previous session ends", async () => {
    const agent = request.agent(w.app);
    const first = await agent.post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password }).expect(200);
    const firstCookie = sessionSetCookie(first)!.split(";")[0]!;
    agent.set(csrfHeaderName, csrfSetCookie(first)!);
    const second = await agent.post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password }).expect(200);
    const secondCookie = sessionSetCookie(second)!.split(";")[0]!;
    expect(secondCookie).not.toBe(firstCookie);
    await request(w.app).get("/api/auth/me").set("Cookie", firstCookie).expect(401);
    await request(w.app).get("/api/auth/me").set("Cookie", secondCookie).expect(200);
    const firstId = firstCookie.split("=")[1]!;
    expect(await w.db.select().from(sessions).where(eq(sessions.id, firstId))).toHaveLength(0);
    // Signing in as someone else in the same browser ends the first person's session too.
    agent.set(csrfHeaderName, csrfSetCookie(second)!);
    const third = await agent.post("/api/auth/sign-in").send({ email: demoUsers.portfolioLead.email, password: demoUsers.portfolioLead.password }).expect(200);
    await request(w.app).get("/api/auth/me").set("Cookie", secondCookie).expect(401);
    expect((await request(w.app).get("/api/auth/me").set("Cookie", sessionSetCookie(third)!.split(";")[0]!).expect(200)).body.role).toBe("portfolio_lead");
  });

  it("a role change ends every session of that user", async () => {
    const [extra] = await w.db.insert(users).values({ email: "rotating@quillfern.example", name: "Rotating", role: "analyst", passwordHash: (await w.db.select().from(users).where(eq(users.email, demoUsers.analyst.email)))[0]!.passwordHash }).returning();
    const one = await signInCookie(w.app, { email: extra!.email, password: demoUsers.analyst.password });
    const two = await signInCookie(w.app, { email: extra!.email, password: demoUsers.analyst.password });
    await w.agents.admin.patch(`/api/people/${extra!.id}`).send({ role: "portfolio_lead" }).expect(200);
    for (const session of [one, two]) await request(w.app).get("/api/auth/me").set("Cookie", session.cookie).expect(401);
    expect((await w.db.select({ n: count() }).from(sessions).where(eq(sessions.userId, extra!.id)))[0]!.n).toBe(0);
  });

  it("'sign out everywhere' ends all of the user's sessions, no one else's, and is in the audit log", async () => {
    const phone = await signInCookie(w.app, demoUsers.veltriaManager);
    const laptop = await signInCookie(w.app, demoUsers.veltriaManager);
    const someoneElse = await signInCookie(w.app, demoUsers.southManager);
    const out = await request(w.app).post("/api/auth/sign-out-all").set("Cookie", laptop.cookie).set(csrfHeaderName, laptop.csrfToken).expect(204);
    expect(sessionSetCookie(out)).toMatch(/tributary_session=;/);
    for (const session of [phone, laptop]) await request(w.app).get("/api/auth/me").set("Cookie", session.cookie).expect(401);
    await request(w.app).get("/api/auth/me").set("Cookie", someoneElse.cookie).expect(200);
    const [entry] = await w.db.select().from(auditLog).where(and(eq(auditLog.action, "signed_out_everywhere"), eq(auditLog.userId, w.userId.veltriaManager)));
    expect(entry!.target).toBe(`user:${w.userId.veltriaManager}`);
    expect((entry!.details as { sessions: number }).sessions).toBeGreaterThanOrEqual(2);
    await request(w.app).post("/api/auth/sign-out-all").expect(401);
    await renewAgent(w, "veltriaManager");
  });
});

describe("passwords", () => {
  it("refuse short, common, patterned and e-mail-like passwords at the invitation page, and nothing is created", async () => {
    const { token, email } = await newInvitation(w);
    const local = email.split("@")[0]!;
    for (const [bad, words] of [
      ["short-pass", "at least 12"],
      [email.toUpperCase(), "e-mail address"],
      [local, "e-mail address"],
      ["Password2025!!", "too common"],
      ["!!Welcome12345", "too common"],
      ["dragondragon99", "too common"],
      ["TRIBUTARY2026", "too common"],
      ["abababababab", "different characters"],
      ["zzzzzzzzzzzzzzz", "different characters"],
    ] as const) {
      const refused = await request(w.app).post(`/api/invitations/${token}/accept`).send({ name: "Pia Lund", password: bad }).expect(400);
      expect(refused.body.error.message, bad).toContain(words);
    }
    expect(await w.db.select().from(users).where(eq(users.email, email))).toHaveLength(0);
    const [invitation] = await w.db.select().from(invitations).where(eq(invitations.email, email));
    expect(invitation!.acceptedAt).toBeNull();
    await request(w.app).post(`/api/invitations/${token}/accept`).send({ name: "Pia Lund", password: "autumn-lantern-harbour-7" }).expect(201);
  });

  it("the rules pass good passwords and the demo ones", () => {
    for (const good of ["autumn-lantern-harbour-7", "correct horse battery", "Summer loves 7 otters"]) expect(passwordProblems(good, "x@quillfern.example")).toEqual([]);
    for (const user of demoUserList) expect(passwordProblems(user.password, user.email)).toEqual([]);
  });

  it("every place in the API that stores a password hash checks the rules first", () => {
    // A password is set in exactly these places; a new one must be added here with its check.
    const sourceRoot = join(import.meta.dirname, "..");
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const name of readdirSync(dir)) {
        const path = join(dir, name);
        if (statSync(path).isDirectory()) walk(path);
        else if (name.endsWith(".ts") && !name.endsWith(".test.ts")) files.push(path);
      }
    };
    walk(sourceRoot);
    const callers = files.filter((file) => /\bhashPassword\(/.test(readFileSync(file, "utf8"))).map((file) => file.slice(sourceRoot.length + 1)).sort();
    expect(callers).toEqual(["auth/password.ts", "demo/seed-demo.ts", "people/invitations.ts"]);
    // The invitation checks the rules before hashing; the demo's public passwords pass them (above); password.ts hashes a random decoy.
    const invitation = readFileSync(join(sourceRoot, "people/invitations.ts"), "utf8");
    expect(invitation.indexOf("passwordProblems(input.password")).toBeGreaterThan(0);
    expect(invitation.indexOf("passwordProblems(input.password")).toBeLessThan(invitation.indexOf("hashPassword(input.password"));
  });
});

describe("rate limits", () => {
  it("the invitation page allows 20 tries per client in 15 minutes, then answers 429 in the JSON error shape", async () => {
    // A fresh app: the limit's counters belong to it.
    const limited = await fittedWorld();
    try {
      for (let i = 0; i < 20; i++) await request(limited.app).get(`/api/invitations/guessed-token-${i}-000000000000000000`).expect(404);
      const blocked = await request(limited.app).get("/api/invitations/guessed-token-x-000000000000000000").expect(429);
      expect(apiErrorSchema.parse(blocked.body).error).toMatchObject({ code: "rate_limited" });
      expect(blocked.body.error.message).toContain("Wait 15 minutes");
      await request(limited.app).post("/api/invitations/guessed-token-y-000000000000000000/accept").send({ name: "A", password: "x" }).expect(429);
    } finally {
      await limited.close();
    }
  });

  it("sign-in stops an address after the allowed failures (routes/auth.test.ts checks the details)", async () => {
    const limited = await fittedWorld({ config: { signInLimit: { attempts: 2, windowMinutes: 15 } } });
    try {
      const attempt = (password: string) => request(limited.app).post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password });
      await attempt("wrong-one").expect(401);
      await attempt("wrong-two").expect(401);
      await attempt(demoUsers.analyst.password).expect(429);
    } finally {
      await limited.close();
    }
  });
});

describe("the audit log", () => {
  /** The newest entry of an action: who, what, when. */
  async function latest(action: string) {
    const [entry] = await w.db.select().from(auditLog).where(eq(auditLog.action, action)).orderBy(desc(auditLog.id)).limit(1);
    return entry;
  }
  const recent = (at: Date | null | undefined) => at !== null && at !== undefined && Date.now() - at.getTime() < 60_000;

  it("records sign-in, role changes and uploads with who, what and when", async () => {
    await signedInAgent(w.app, demoUsers.portfolioLead);
    const signIn = await latest("sign_in");
    expect(signIn).toMatchObject({ userId: w.userId.portfolioLead, target: `user:${w.userId.portfolioLead}` });
    expect(recent(signIn!.at)).toBe(true);

    const [person] = await w.db.insert(users).values({ email: "audited@quillfern.example", name: "Audited", role: "analyst" }).returning();
    await w.agents.admin.patch(`/api/people/${person!.id}`).send({ role: "market_manager", marketIds: [w.marketId.get("Veltria")] }).expect(200);
    const role = await latest("role_changed");
    expect(role).toMatchObject({ userId: w.userId.admin, target: `user:${person!.id}`, details: { from: "analyst", to: "market_manager" } });
    expect(recent(role!.at)).toBe(true);

    const upload = await w.agents.analyst.post("/api/uploads").attach("file", Buffer.from(tinyCsv()), "tiny.csv").expect(201);
    const uploaded = await latest("data_uploaded");
    expect(uploaded).toMatchObject({ userId: w.userId.analyst, target: `upload:${upload.body.uploadId}` });
    expect(uploaded!.details).toMatchObject({ fileName: "tiny.csv", rows: 120 });
    // The entry describes the file; it holds none of its rows.
    expect(JSON.stringify(uploaded!.details)).not.toContain("Kestrova");
    await w.agents.analyst.post(`/api/uploads/${upload.body.uploadId}/save`).send({ mapping: tinyMapping }).expect(201);
    expect(await latest("dataset_saved")).toMatchObject({ userId: w.userId.analyst });
  });

  it("records flags raised and cleared", async () => {
    const raised = await w.agents.analyst.post("/api/flags").send({ cellId: pv, channel: "search", kind: "real_difference", note: "Matches the lift test" }).expect(201);
    expect(await latest("flag_raised")).toMatchObject({ userId: w.userId.analyst, target: `flag:${raised.body.id}`, details: { kind: "real_difference" } });
    const flagId = await newFlag(w, "Plumrise × Veltria", "social");
    await w.agents.admin.post(`/api/flags/${flagId}/clear`).send({ note: "fixed in the data" }).expect(200);
    expect(await latest("flag_cleared")).toMatchObject({ userId: w.userId.admin, target: `flag:${flagId}` });
  });

  it("records plan decisions (approval and rejection, with the comment) and the steps before them", async () => {
    const split = planSchema.parse((await w.agents.analyst.post("/api/plans/budget-splits").send(await splitInput(w, [kv, pv], "Audited split")).expect(201)).body);
    expect(await latest("plan_created")).toMatchObject({ userId: w.userId.analyst, target: `plan:${split.id}` });
    await w.agents.analyst.post(`/api/plans/${split.id}/submit`).expect(200);
    expect(await latest("plan_submitted")).toMatchObject({ userId: w.userId.analyst, target: `plan:${split.id}` });
    await w.agents.portfolioLead.post(`/api/plans/${split.id}/decision`).send({ decision: "approve" }).expect(200);
    const approved = await latest("plan_approved");
    expect(approved).toMatchObject({ userId: w.userId.portfolioLead, target: `plan:${split.id}` });
    expect(recent(approved!.at)).toBe(true);
    const other = await copyPlan(w, split.id, { status: "submitted", decidedAt: null, decidedBy: null });
    await w.agents.admin.post(`/api/plans/${other}/decision`).send({ decision: "reject", comment: "Too much on search" }).expect(200);
    expect(await latest("plan_rejected")).toMatchObject({ userId: w.userId.admin, target: `plan:${other}`, details: { comment: "Too much on search" } });
  });

  it("records publishing a run (last: it changes the current run)", async () => {
    const runId = await copyRun(w, w.secondRunId, "succeeded");
    await w.agents.analyst.post(`/api/runs/${runId}/publish`).send({ reason: "Quick fit published for the audit test." }).expect(200);
    const published = await latest("run_published");
    expect(published).toMatchObject({ userId: w.userId.analyst, target: `run:${runId}`, details: { reason: "Quick fit published for the audit test." } });
    expect(recent(published!.at)).toBe(true);
  });
});

import { eq } from "drizzle-orm";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema, currentUserSchema } from "@tributary/contracts";
import { sessions, users } from "../db/schema";
import { demoUserList, demoUsers } from "../demo/users";
import { csrfHeaderName } from "../auth/csrf";
import { csrfSetCookie, demoTestApp, sessionSetCookie, signInCookie, signedInAgent, type TestApp } from "../testing/test-app";

const DAY = 24 * 3600 * 1000;
import { wrongCredentialsMessage } from "./auth";

let t: TestApp;
beforeAll(async () => {
  t = await demoTestApp();
});
afterAll(() => t.close());

describe("sign-in", () => {
  it.each(demoUserList.map((user) => [user.role, user] as const))("a %s signs in and /me tells who they are", async (_role, user) => {
    const agent = await signedInAgent(t.app, user);
    const me = await agent.get("/api/auth/me").expect(200);
    const current = currentUserSchema.parse(me.body);
    expect(current).toMatchObject({ email: user.email, name: user.name, role: user.role });
    expect(current.marketIds).toHaveLength(user.markets.length);
  });

  it("returns the current user from sign-in itself, market ids included", async () => {
    const response = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: demoUsers.southManager.email, password: demoUsers.southManager.password })
      .expect(200);
    expect(currentUserSchema.parse(response.body).marketIds).toHaveLength(2);
  });

  it("accepts the e-mail in any case and with spaces around it", async () => {
    await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: `  ${demoUsers.analyst.email.toUpperCase()} `, password: demoUsers.analyst.password })
      .expect(200);
  });

  it("answers bad input with 400 and a clear message per field", async () => {
    const response = await request(t.app).post("/api/auth/sign-in").send({ email: "not-an-address", password: "" }).expect(400);
    const body = apiErrorSchema.parse(response.body);
    expect(body.error.code).toBe("invalid_input");
    expect(body.error.issues).toEqual(
      expect.arrayContaining([
        { path: "email", message: "Enter a valid e-mail address" },
        { path: "password", message: "Enter your password" },
      ]),
    );
    expect(body.error.message).toContain("email");
  });

  it("answers a body that is not JSON with 400", async () => {
    const response = await request(t.app).post("/api/auth/sign-in").set("Content-Type", "application/json").send("{not json").expect(400);
    expect(apiErrorSchema.parse(response.body).error.message).toBe("The request body is not valid JSON");
  });

  it("says the same for a wrong password and an unknown e-mail, and sets no cookie", async () => {
    const wrongPassword = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: demoUsers.admin.email, password: "not-the-password" })
      .expect(401);
    const unknownEmail = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: "nobody@quillfern.example", password: "not-the-password" })
      .expect(401);
    const strip = (body: unknown) => ({ ...apiErrorSchema.parse(body).error, requestId: undefined });
    expect(strip(wrongPassword.body)).toEqual(strip(unknownEmail.body));
    expect(strip(wrongPassword.body)).toMatchObject({ code: "unauthenticated", message: wrongCredentialsMessage });
    expect(sessionSetCookie(wrongPassword)).toBeUndefined();
  });

  it("treats a user who has not chosen a password yet like an unknown e-mail", async () => {
    await t.db.insert(users).values({ email: "invited@quillfern.example", name: "Invited", role: "analyst", passwordHash: null });
    const response = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: "invited@quillfern.example", password: "anything" })
      .expect(401);
    expect(response.body.error.message).toBe(wrongCredentialsMessage);
  });

  it("refuses a cross-site sign-in form post", async () => {
    await request(t.app)
      .post("/api/auth/sign-in")
      .set("Origin", "https://elsewhere.example")
      .send({ email: demoUsers.admin.email, password: demoUsers.admin.password })
      .expect(403);
  });
});

describe("session cookie", () => {
  it("is httpOnly, SameSite=Lax, for the whole site, lasts the idle period, and not Secure over plain http", async () => {
    const response = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password })
      .expect(200);
    const cookie = sessionSetCookie(response);
    expect(cookie).toBeDefined();
    expect(cookie).toMatch(/; HttpOnly/);
    expect(cookie).toMatch(/; SameSite=Lax/);
    expect(cookie).toMatch(/; Path=\//);
    expect(cookie).toMatch(new RegExp(`; Max-Age=${30 * 24 * 3600}`));
    expect(cookie).not.toMatch(/Secure/);
  });

  it("is Secure when the request came over https through a trusted proxy", async () => {
    const proxied = await demoTestApp({ trustProxy: true }, t.db);
    const response = await request(proxied.app)
      .post("/api/auth/sign-in")
      .set("X-Forwarded-Proto", "https")
      .send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password })
      .expect(200);
    expect(sessionSetCookie(response)).toMatch(/; Secure/);
  });

  it("follows the configured idle period", async () => {
    const shortLived = await demoTestApp({ sessionIdleDays: 2 }, t.db);
    const response = await request(shortLived.app)
      .post("/api/auth/sign-in")
      .send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password })
      .expect(200);
    expect(sessionSetCookie(response)).toMatch(new RegExp(`; Max-Age=${2 * 24 * 3600}`));
  });
});

describe("sessions", () => {
  it("sign-out ends the session: the old cookie no longer works", async () => {
    const agent = await signedInAgent(t.app, demoUsers.portfolioLead);
    const signIn = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: demoUsers.portfolioLead.email, password: demoUsers.portfolioLead.password });
    const cookie = sessionSetCookie(signIn)!.split(";")[0]!;

    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    const out = await request(t.app).post("/api/auth/sign-out").set("Cookie", cookie).set(csrfHeaderName, csrfSetCookie(signIn)!).expect(204);
    expect(sessionSetCookie(out)).toMatch(/tributary_session=;/);
    const after = await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(401);
    expect(apiErrorSchema.parse(after.body).error.code).toBe("unauthenticated");
    // Another session of the same user is untouched.
    await agent.get("/api/auth/me").expect(200);
  });

  it("rejects an expired session", async () => {
    const { cookie, sessionId } = await signInCookie(t.app, demoUsers.veltriaManager);
    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    await t.db.update(sessions).set({ expiresAt: new Date(Date.now() - 1000) }).where(eq(sessions.id, sessionId));
    const response = await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(401);
    expect(apiErrorSchema.parse(response.body).error.code).toBe("unauthenticated");
    expect(sessionSetCookie(response)).toMatch(/tributary_session=;/);
    expect(await t.db.select().from(sessions).where(eq(sessions.id, sessionId))).toHaveLength(0);
  });

  it("extends a session used in the second half of its life (sliding expiry)", async () => {
    const { cookie, sessionId } = await signInCookie(t.app, demoUsers.southManager);
    const unchanged = await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    expect(sessionSetCookie(unchanged)).toBeUndefined();
    await t.db.update(sessions).set({ expiresAt: new Date(Date.now() + 5 * DAY) }).where(eq(sessions.id, sessionId));
    const response = await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    expect(sessionSetCookie(response)).toMatch(new RegExp(`^${cookie}; Max-Age=${30 * 24 * 3600};`));
    const [session] = await t.db.select().from(sessions).where(eq(sessions.id, sessionId));
    expect(session!.expiresAt.getTime()).toBeGreaterThan(Date.now() + 29 * DAY);
  });

  it("ends the sessions of a disabled user and refuses their sign-in", async () => {
    await t.db.insert(users).values({ email: "leaving@quillfern.example", name: "Leaving", role: "analyst", passwordHash: (await t.db.select().from(users).where(eq(users.email, demoUsers.analyst.email)))[0]!.passwordHash });
    const agent = await signedInAgent(t.app, { email: "leaving@quillfern.example", password: demoUsers.analyst.password });
    await t.db.update(users).set({ disabled: true }).where(eq(users.email, "leaving@quillfern.example"));
    await agent.get("/api/auth/me").expect(401);
    const response = await request(t.app)
      .post("/api/auth/sign-in")
      .send({ email: "leaving@quillfern.example", password: demoUsers.analyst.password })
      .expect(403);
    expect(response.body.error.message).toMatch(/disabled/);
  });

  it("answers a request without a session with 401 on signed-in routes", async () => {
    const response = await request(t.app).get("/api/auth/me").expect(401);
    expect(apiErrorSchema.parse(response.body).error).toMatchObject({ code: "unauthenticated", message: "Sign in to continue" });
  });
});

describe("sign-in rate limit", () => {
  it("stops an IP and e-mail after the allowed failures, in the JSON error shape, without touching other e-mails", async () => {
    const limited = await demoTestApp({ signInLimit: { attempts: 3, windowMinutes: 15 } }, t.db);
    const attempt = (email: string, password: string) => request(limited.app).post("/api/auth/sign-in").send({ email, password });
    for (let i = 0; i < 3; i++) await attempt(demoUsers.admin.email, "wrong-password").expect(401);
    const blocked = await attempt(demoUsers.admin.email, demoUsers.admin.password).expect(429);
    const body = apiErrorSchema.parse(blocked.body);
    expect(body.error.code).toBe("rate_limited");
    expect(body.error.message).toMatch(/Too many sign-in attempts/);
    expect(blocked.headers["ratelimit-policy"]).toBeDefined();
    await attempt(demoUsers.analyst.email, demoUsers.analyst.password).expect(200);
  });

  it("does not count successful sign-ins", async () => {
    const limited = await demoTestApp({ signInLimit: { attempts: 2, windowMinutes: 15 } }, t.db);
    for (let i = 0; i < 4; i++) {
      await request(limited.app)
        .post("/api/auth/sign-in")
        .send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password })
        .expect(200);
    }
  });
});

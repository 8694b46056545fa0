// People & access through the API: an invitation from e-mail to first sign-in (expired
// and reused links refused), resend and revoke, role and market changes (a role change
// ends the user's sessions), the audit log and the Outbox screen's routes.
import request from "supertest";
import { eq } from "drizzle-orm";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import {
  auditLogPageSchema,
  currentUserSchema,
  invitationLookupSchema,
  invitationSchema,
  outboxMessageSchema,
  outboxPageSchema,
  passwordProblems,
  personSchema,
  type Invitation,
} from "@tributary/contracts";
import { invitations, markets, outbox, users } from "../db/schema";
import { demoUsers } from "../demo/users";
import { hashToken } from "../people/invitations";
import { demoTestApp, signedInAgent, signInCookie, type TestApp } from "../testing/test-app";

type Agent = Awaited<ReturnType<typeof signedInAgent>>;

let t: TestApp;
let admin: Agent;
const marketId = new Map<string, string>();
beforeAll(async () => {
  t = await demoTestApp({ publicUrl: "https://tributary.quillfern.example" });
  admin = await signedInAgent(t.app, demoUsers.admin);
  for (const row of await t.db.select().from(markets)) marketId.set(row.code, row.id);
});
afterAll(() => t.close());

/** The newest invitation e-mail to an address, and the token in its link. */
async function invitationMail(email: string) {
  const page = outboxPageSchema.parse((await admin.get(`/api/outbox?kind=invitation&to=${encodeURIComponent(email)}`).expect(200)).body);
  expect(page.messages.length).toBeGreaterThan(0);
  const message = outboxMessageSchema.parse((await admin.get(`/api/outbox/${page.messages[0]!.id}`).expect(200)).body);
  const link = /https:\/\/tributary\.quillfern\.example\/invite\/([A-Za-z0-9_-]+)/.exec(message.text);
  expect(link).not.toBeNull();
  return { message, token: link![1]! };
}

describe("an invitation, end to end", () => {
  const email = "marit.oyelaran@quillfern.example";
  const password = "heron-ledger-copper-41";
  let invitation: Invitation;

  it("is sent by an admin with a role and markets, as an e-mail with a one-time link", async () => {
    const response = await admin.post("/api/invitations").send({ email: "  Marit.Oyelaran@Quillfern.example ", role: "market_manager", marketIds: [marketId.get("kessland")] }).expect(201);
    invitation = invitationSchema.parse(response.body);
    expect(invitation).toMatchObject({ email, role: "market_manager", status: "pending", invitedBy: { name: demoUsers.admin.name } });
    expect(invitation.markets.map((m) => m.name)).toEqual(["Kessland"]);
    const hours = (Date.parse(invitation.expiresAt) - Date.parse(invitation.createdAt)) / 3600_000;
    expect(hours).toBeCloseTo(72, 1);

    const { message, token } = await invitationMail(email);
    expect(message.kind).toBe("invitation");
    expect(message.subject).toContain("Quillfern");
    expect(message.text).toContain("Kessland");
    expect(message.html).toContain(`/invite/${token}`);
    // Only the hash of the token is stored.
    const [row] = await t.db.select().from(invitations).where(eq(invitations.id, invitation.id));
    expect(row!.tokenHash).toBe(hashToken(token));
    expect(JSON.stringify(row)).not.toContain(token);
  });

  it("refuses a second invitation to the same address, an existing user, and bad scopes", async () => {
    await admin.post("/api/invitations").send({ email, role: "analyst" }).expect(409);
    await admin.post("/api/invitations").send({ email: demoUsers.analyst.email, role: "analyst" }).expect(409);
    const noMarket = await admin.post("/api/invitations").send({ email: "x1@quillfern.example", role: "market_manager" }).expect(400);
    expect(noMarket.body.error.message).toContain("at least one market");
    await admin.post("/api/invitations").send({ email: "x2@quillfern.example", role: "analyst", marketIds: [marketId.get("veltria")] }).expect(400);
    await admin.post("/api/invitations").send({ email: "x3@quillfern.example", role: "market_manager", marketIds: ["no-such-market"] }).expect(400);
    await admin.post("/api/invitations").send({ email: "not an address", role: "analyst" }).expect(400);
    expect((await t.db.select().from(invitations)).length).toBe(1);
  });

  it("is refused to everyone but admins", async () => {
    for (const user of [demoUsers.portfolioLead, demoUsers.analyst, demoUsers.veltriaManager]) {
      const agent = await signedInAgent(t.app, user);
      await agent.post("/api/invitations").send({ email: "y@quillfern.example", role: "analyst" }).expect(403);
      await agent.get("/api/invitations").expect(403);
      await agent.get("/api/people").expect(403);
      await agent.get("/api/audit-log").expect(403);
      await agent.get("/api/outbox").expect(403);
    }
    await request(t.app).get("/api/outbox").expect(401);
  });

  it("is accepted once with a good password, then the person signs in with the invited role and markets", async () => {
    const { token } = await invitationMail(email);
    const lookup = invitationLookupSchema.parse((await request(t.app).get(`/api/invitations/${token}`).expect(200)).body);
    expect(lookup).toMatchObject({ email, role: "market_manager" });

    // Password rules: length, not the address, not a common password; nothing is created.
    for (const [bad, words] of [
      ["short-pass", "at least 12"],
      [email, "e-mail address"],
      ["marit.oyelaran", "e-mail address"],
      ["Password1234", "too common"],
    ] as const) {
      const refused = await request(t.app).post(`/api/invitations/${token}/accept`).send({ name: "Marit Oyelaran", password: bad }).expect(400);
      expect(refused.body.error.message).toContain(words);
    }
    expect((await t.db.select().from(users).where(eq(users.email, email))).length).toBe(0);
    await request(t.app).post(`/api/invitations/${token}/accept`).send({ password }).expect(400);

    const agent = request.agent(t.app);
    const accepted = currentUserSchema.parse((await agent.post(`/api/invitations/${token}/accept`).send({ name: "Marit Oyelaran", password }).expect(201)).body);
    expect(accepted).toMatchObject({ email, name: "Marit Oyelaran", role: "market_manager", marketIds: [marketId.get("kessland")] });
    await agent.get("/api/auth/me").expect(200);

    // The link works once.
    const reused = await request(t.app).post(`/api/invitations/${token}/accept`).send({ name: "Someone else", password: "another-long-password-9" }).expect(404);
    expect(reused.body.error.message).toContain("used already");
    await request(t.app).get(`/api/invitations/${token}`).expect(404);

    const signedIn = await signedInAgent(t.app, { email, password });
    expect((await signedIn.get("/api/auth/me").expect(200)).body.marketIds).toEqual([marketId.get("kessland")]);
    const list = invitationSchema.array().parse((await admin.get("/api/invitations?status=accepted").expect(200)).body);
    expect(list.map((i) => [i.email, i.acceptedUser?.name])).toEqual([[email, "Marit Oyelaran"]]);
  });

  it("refuses an expired link, until the admin resends it (the old link then stays dead)", async () => {
    const other = "pell.aranda@quillfern.example";
    const created = invitationSchema.parse((await admin.post("/api/invitations").send({ email: other, role: "analyst" }).expect(201)).body);
    const { token: first } = await invitationMail(other);
    await t.db.update(invitations).set({ expiresAt: new Date(Date.now() - 60_000) }).where(eq(invitations.id, created.id));
    const expired = await request(t.app).post(`/api/invitations/${first}/accept`).send({ name: "Pell Aranda", password: "quiet-harbour-lantern-7" }).expect(409);
    expect(expired.body.error.message).toContain("expired");
    expect(invitationSchema.array().parse((await admin.get("/api/invitations?status=expired").expect(200)).body).map((i) => i.id)).toEqual([created.id]);

    const resent = invitationSchema.parse((await admin.post(`/api/invitations/${created.id}/resend`).expect(200)).body);
    expect(resent.status).toBe("pending");
    const { token: second } = await invitationMail(other);
    expect(second).not.toBe(first);
    await request(t.app).post(`/api/invitations/${first}/accept`).send({ name: "Pell Aranda", password: "quiet-harbour-lantern-7" }).expect(404);
    await request(t.app).post(`/api/invitations/${second}/accept`).send({ name: "Pell Aranda", password: "quiet-harbour-lantern-7" }).expect(201);
  });

  it("can be revoked while waiting", async () => {
    const created = invitationSchema.parse((await admin.post("/api/invitations").send({ email: "revoked@quillfern.example", role: "portfolio_lead" }).expect(201)).body);
    const { token } = await invitationMail("revoked@quillfern.example");
    expect(invitationSchema.parse((await admin.post(`/api/invitations/${created.id}/revoke`).expect(200)).body).status).toBe("revoked");
    await request(t.app).post(`/api/invitations/${token}/accept`).send({ name: "R", password: "quiet-harbour-lantern-7" }).expect(404);
    await admin.post(`/api/invitations/${created.id}/resend`).expect(409);
    await admin.post(`/api/invitations/${created.id}/revoke`).expect(409);
  });
});

describe("roles and market scopes", () => {
  it("lists users with role and markets", async () => {
    const people = personSchema.array().parse((await admin.get("/api/people").expect(200)).body);
    const south = people.find((p) => p.email === demoUsers.southManager.email)!;
    expect(south.markets.map((m) => m.name).sort()).toEqual(["Lunesse", "Marendi"]);
    expect(people.find((p) => p.email === demoUsers.admin.email)!.lastSignInAt).not.toBeNull();
  });

  it("ends a user's sessions when their role changes; market changes apply at once", async () => {
    const [analyst] = await t.db.select().from(users).where(eq(users.email, demoUsers.analyst.email));
    const { cookie } = await signInCookie(t.app, demoUsers.analyst);
    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(200);
    const changed = personSchema.parse((await admin.patch(`/api/people/${analyst!.id}`).send({ role: "market_manager", marketIds: [marketId.get("solvera")] }).expect(200)).body);
    expect(changed.role).toBe("market_manager");
    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(401);
    const again = await signedInAgent(t.app, demoUsers.analyst);
    expect((await again.get("/api/auth/me").expect(200)).body).toMatchObject({ role: "market_manager", marketIds: [marketId.get("solvera")] });

    // A market change keeps the session and narrows what it sees at once.
    await admin.patch(`/api/people/${analyst!.id}`).send({ marketIds: [marketId.get("kessland")] }).expect(200);
    expect((await again.get("/api/auth/me").expect(200)).body.marketIds).toEqual([marketId.get("kessland")]);
    await again.get(`/api/markets/${marketId.get("solvera")}`).expect(403);

    // Back to analyst: the markets are cleared.
    const back = personSchema.parse((await admin.patch(`/api/people/${analyst!.id}`).send({ role: "analyst" }).expect(200)).body);
    expect(back.markets).toEqual([]);
  });

  it("refuses changes that would lock the workspace or make no sense", async () => {
    const [me] = await t.db.select().from(users).where(eq(users.email, demoUsers.admin.email));
    const [lead] = await t.db.select().from(users).where(eq(users.email, demoUsers.portfolioLead.email));
    expect((await admin.patch(`/api/people/${me!.id}`).send({ role: "analyst" }).expect(403)).body.error.message).toContain("your own role");
    await admin.patch(`/api/people/${me!.id}`).send({ disabled: true }).expect(403);
    await admin.patch(`/api/people/${lead!.id}`).send({ role: "market_manager" }).expect(400);
    await admin.patch(`/api/people/${lead!.id}`).send({ marketIds: [marketId.get("veltria")] }).expect(400);
    await admin.patch(`/api/people/${lead!.id}`).send({}).expect(400);
    await admin.patch("/api/people/no-such-user").send({ disabled: true }).expect(404);
  });

  it("disables and enables a user; a disabled user cannot sign in", async () => {
    const [lead] = await t.db.select().from(users).where(eq(users.email, demoUsers.portfolioLead.email));
    const { cookie } = await signInCookie(t.app, demoUsers.portfolioLead);
    expect(personSchema.parse((await admin.patch(`/api/people/${lead!.id}`).send({ disabled: true }).expect(200)).body).disabled).toBe(true);
    await request(t.app).get("/api/auth/me").set("Cookie", cookie).expect(401);
    await request(t.app).post("/api/auth/sign-in").send({ email: demoUsers.portfolioLead.email, password: demoUsers.portfolioLead.password }).expect(403);
    await admin.patch(`/api/people/${lead!.id}`).send({ disabled: false }).expect(200);
    await signedInAgent(t.app, demoUsers.portfolioLead);
  });
});

describe("the audit log", () => {
  it("records invitations and role changes, paged and filtered", async () => {
    const [analyst] = await t.db.select().from(users).where(eq(users.email, demoUsers.analyst.email));
    const roleChanges = auditLogPageSchema.parse((await admin.get(`/api/audit-log?action=role_changed`).expect(200)).body);
    expect(roleChanges.entries.map((e) => e.details)).toEqual([
      { from: "market_manager", to: "analyst" },
      { from: "analyst", to: "market_manager" },
    ]);
    expect(roleChanges.entries.every((e) => e.target === `user:${analyst!.id}` && e.user?.name === demoUsers.admin.name)).toBe(true);
    const all = auditLogPageSchema.parse((await admin.get("/api/audit-log?pageSize=3").expect(200)).body);
    expect(all.entries).toHaveLength(3);
    expect(all.total).toBeGreaterThan(10);
    expect(all.actions).toEqual(expect.arrayContaining(["invitation_sent", "invitation_resent", "invitation_revoked", "invitation_accepted", "role_changed", "markets_changed", "user_disabled", "user_enabled", "sign_in"]));
    const page2 = auditLogPageSchema.parse((await admin.get("/api/audit-log?pageSize=3&page=2").expect(200)).body);
    expect(page2.entries[0]!.id).toBeLessThan(all.entries[2]!.id);
    const [me] = await t.db.select().from(users).where(eq(users.email, demoUsers.admin.email));
    const mine = auditLogPageSchema.parse((await admin.get(`/api/audit-log?userId=${me!.id}&action=invitation_sent`).expect(200)).body);
    expect(mine.entries.map((e) => (e.details as { email: string }).email)).toEqual(["revoked@quillfern.example", "pell.aranda@quillfern.example", "marit.oyelaran@quillfern.example"]);
    await admin.get("/api/audit-log?page=0").expect(400);
  });
});

describe("the outbox", () => {
  it("lists every message newest first and reads one with text and HTML", async () => {
    const page = outboxPageSchema.parse((await admin.get("/api/outbox").expect(200)).body);
    expect(page.total).toBe((await t.db.select().from(outbox)).length);
    const times = page.messages.map((m) => Date.parse(m.createdAt));
    expect([...times].sort((a, b) => b - a)).toEqual(times);
    await admin.get("/api/outbox/no-such-message").expect(404);
    await admin.get("/api/outbox?pageSize=500").expect(400);
  });
});

describe("password rules", () => {
  it("are the same in the contracts the web form uses", () => {
    expect(passwordProblems("quiet-harbour-lantern-7", "a@b.example")).toEqual([]);
    expect(passwordProblems("tributary123", "a@b.example")).toEqual(["This password is too common; choose another"]);
    expect(passwordProblems("  A@B.example ", "a@b.example")).toContain("Do not use your e-mail address as the password");
  });
});

// SMTP delivery against a real SMTP server started here (the smtp-server package on a
// free local port): the protocol is exercised end to end, with authentication. Every
// message is also in the outbox. And the SMTP_* settings from the environment.
import { once } from "node:events";
import type { AddressInfo } from "node:net";
import { SMTPServer } from "smtp-server";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { closeDatabase, type Database } from "../db/client";
import { outbox } from "../db/schema";
import { snapshotDatabase } from "../testing/database-snapshot";
import { configFromEnv } from "../config";
import { invitationMessage } from "./messages";
import { createMailer, smtpSettingsFromEnv, type SmtpSettings } from "./smtp";

interface Received {
  readonly from: string;
  readonly to: string[];
  readonly user: string;
  readonly raw: string;
}

let db: Database;
let server: SMTPServer;
let port: number;
const received: Received[] = [];

beforeAll(async () => {
  db = await snapshotDatabase("migrated");
  server = new SMTPServer({
    // Plain connection on localhost: no STARTTLS, so nodemailer authenticates in the clear.
    disabledCommands: ["STARTTLS"],
    closeTimeout: 200,
    allowInsecureAuth: true,
    authMethods: ["PLAIN", "LOGIN"],
    onAuth(auth, _session, callback) {
      if (auth.username === "tributary" && auth.password === "s3cret-relay-pass") callback(null, { user: auth.username });
      else callback(new Error("Invalid username or password"));
    },
    onData(stream, session, callback) {
      const chunks: Buffer[] = [];
      stream.on("data", (chunk: Buffer) => chunks.push(chunk));
      stream.on("end", () => {
        received.push({
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : "",
          to: session.envelope.rcptTo.map((r) => r.address),
          user: String(session.user),
          raw: Buffer.concat(chunks).toString("utf8"),
        });
        callback();
      });
    },
  });
  server.listen(0, "127.0.0.1");
  await once(server.server, "listening");
  port = (server.server.address() as AddressInfo).port;
});

afterAll(async () => {
  await new Promise<void>((resolve) => server.close(() => resolve()));
  await closeDatabase(db);
});

const settings = (pass = "s3cret-relay-pass"): SmtpSettings => ({
  host: "127.0.0.1",
  port,
  user: "tributary",
  pass,
  from: "Tributary <no-reply@quillfern.example>",
  secure: false,
});

const invitation = () =>
  invitationMessage({
    to: "new.person@quillfern.example",
    company: "Quillfern Household Group",
    role: "analyst",
    marketNames: [],
    invitedBy: "Wren Castellane",
    acceptUrl: "https://tributary.quillfern.example/invite/abc",
  });

describe("SMTP delivery", () => {
  it("sends through the server with authentication, and keeps the message in the outbox", async () => {
    await createMailer(db, settings()).send(invitation());
    expect(received).toHaveLength(1);
    const mail = received[0]!;
    expect(mail.user).toBe("tributary");
    expect(mail.from).toBe("no-reply@quillfern.example");
    expect(mail.to).toEqual(["new.person@quillfern.example"]);
    expect(mail.raw).toMatch(/^Subject: Your invitation to Quillfern Household Group on Tributary/m);
    expect(mail.raw).toContain("multipart/alternative");
    expect(mail.raw).toContain("https://tributary.quillfern.example/invite/abc");
    const rows = await db.select().from(outbox);
    expect(rows.map((r) => r.subject)).toEqual(["Your invitation to Quillfern Household Group on Tributary"]);
  });

  it("fails loudly when the server refuses the credentials", async () => {
    await expect(createMailer(db, settings("wrong")).send(invitation())).rejects.toThrow(/Invalid login|Invalid username/);
    expect(received).toHaveLength(1);
  });
});

describe("SMTP settings from the environment", () => {
  const env = { SMTP_HOST: "mail.quillfern.example", SMTP_PORT: "587", SMTP_USER: "u", SMTP_PASS: "p", SMTP_FROM: "Tributary <t@quillfern.example>" };

  it("are all five or none", () => {
    expect(smtpSettingsFromEnv({})).toBeNull();
    expect(smtpSettingsFromEnv(env)).toEqual({ host: "mail.quillfern.example", port: 587, user: "u", pass: "p", from: "Tributary <t@quillfern.example>", secure: false });
    expect(smtpSettingsFromEnv({ ...env, SMTP_PORT: "465" })?.secure).toBe(true);
    expect(() => smtpSettingsFromEnv({ SMTP_HOST: "mail.quillfern.example" })).toThrow(/missing: SMTP_PORT, SMTP_USER, SMTP_PASS, SMTP_FROM/);
    expect(() => smtpSettingsFromEnv({ ...env, SMTP_PORT: "smtp" })).toThrow(/SMTP_PORT must be a port number/);
    expect(configFromEnv(env, null).smtp?.host).toBe("mail.quillfern.example");
    expect(configFromEnv({}, null).smtp).toBeNull();
    expect(configFromEnv({ PUBLIC_URL: "https://tributary.quillfern.example/" }, null).publicUrl).toBe("https://tributary.quillfern.example");
    expect(() => configFromEnv({ PUBLIC_URL: "ftp://x" }, null)).toThrow(/PUBLIC_URL/);
  });
});

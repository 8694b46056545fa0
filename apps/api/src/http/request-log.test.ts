// The structured logs (pino), captured while people sign in (rightly and wrongly), upload
// a data file, are invited and accept: one line per request with its id (the same as the
// X-Request-Id header and the error body's), method, path, status and — once known — the
// user id; never a password, a session id or CSRF token, an invitation token or link,
// a cookie, or a value from the uploaded rows.
import { Writable } from "node:stream";
import request from "supertest";
import { afterAll, beforeAll, describe, expect, it } from "vitest";
import { apiErrorSchema } from "@tributary/contracts";
import { demoUsers } from "../demo/users";
import { tinyCsv } from "../testing/fit-fixtures";
import { fittedWorld, newInvitation, type World } from "../testing/fitted-world";
import { csrfSetCookie, sessionSetCookie } from "../testing/test-app";
import { csrfHeaderName } from "../auth/csrf";
import { createLogger, loggedPath } from "./request-log";

const lines: string[] = [];
const sink = new Writable({
  write(chunk, _encoding, done) {
    lines.push(...String(chunk).split("\n").filter(Boolean));
    done();
  },
});

interface LogLine {
  level: number;
  msg: string;
  userId?: string;
  req?: { id: string; method: string; url: string };
  res?: { statusCode: number };
  [key: string]: unknown;
}
const parsed = (): LogLine[] => lines.map((line) => JSON.parse(line) as LogLine);
const requestLine = (id: string) => parsed().find((line) => line.req?.id === id);

let w: World;
beforeAll(async () => {
  w = await fittedWorld({ logger: createLogger("debug", sink) });
});
afterAll(() => w.close());

describe("request logs", () => {
  const secrets: string[] = [];
  const dataValue = "7345129";

  it("log sign-in, upload and invitation acceptance without passwords, session ids, tokens, links or data", async () => {
    lines.length = 0;
    // A wrong password, then the right one.
    const wrong = await request(w.app).post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password: "hunter2-wrong-password" }).expect(401);
    secrets.push("hunter2-wrong-password");
    expect(apiErrorSchema.parse(wrong.body).error.requestId).toBe(wrong.headers["x-request-id"]);
    const signIn = await request(w.app).post("/api/auth/sign-in").send({ email: demoUsers.analyst.email, password: demoUsers.analyst.password }).expect(200);
    const cookie = sessionSetCookie(signIn)!.split(";")[0]!;
    const token = csrfSetCookie(signIn)!;
    secrets.push(demoUsers.analyst.password, cookie.split("=")[1]!, token);

    // An upload whose rows hold a value found nowhere else.
    const lines_ = tinyCsv().split("\n");
    const fields = lines_[5]!.split(",");
    fields[3] = dataValue;
    lines_[5] = fields.join(",");
    const upload = await request(w.app).post("/api/uploads").set("Cookie", cookie).set(csrfHeaderName, token).attach("file", Buffer.from(lines_.join("\n")), "weekly.csv").expect(201);
    expect(upload.body.previewRows.flat()).toContain(dataValue);

    // An invitation, a wrong token, and the right one accepted with a password.
    const invitation = await newInvitation(w);
    secrets.push(invitation.token);
    await request(w.app).get(`/api/invitations/${invitation.token}`).expect(200);
    await request(w.app).get("/api/invitations/not-the-token-but-long-enough-000000").expect(404);
    const accepted = await request(w.app).post(`/api/invitations/${invitation.token}/accept`).send({ name: "Lio Brannock", password: "copper-meadow-lantern-5" }).expect(201);
    secrets.push("copper-meadow-lantern-5", sessionSetCookie(accepted)!.split(";")[0]!.split("=")[1]!, csrfSetCookie(accepted)!);

    const text = lines.join("\n");
    expect(lines.length).toBeGreaterThan(8);
    for (const secret of secrets) expect(text, "a secret reached the log").not.toContain(secret);
    expect(text).not.toContain(dataValue);
    expect(text).not.toContain("/invite/");
    expect(text).not.toMatch(/tributary_session|tributary_csrf|set-cookie|cookie/i);
    // Who and what, though: the request ids, the paths (the token replaced), the user ids.
    expect(requestLine(String(wrong.headers["x-request-id"]))).toMatchObject({ req: { method: "POST", url: "/api/auth/sign-in" }, res: { statusCode: 401 } });
    expect(requestLine(String(wrong.headers["x-request-id"]))!.userId).toBeUndefined();
    expect(requestLine(String(signIn.headers["x-request-id"]))).toMatchObject({ userId: w.userId.analyst, res: { statusCode: 200 } });
    expect(requestLine(String(upload.headers["x-request-id"]))).toMatchObject({ userId: w.userId.analyst, req: { url: "/api/uploads" }, res: { statusCode: 201 } });
    const acceptLine = requestLine(String(accepted.headers["x-request-id"]))!;
    expect(acceptLine.req!.url).toBe("/api/invitations/[redacted]/accept");
    expect(typeof acceptLine.userId).toBe("string");
  });

  it("give every request an id, in the X-Request-Id header, the error body and its log line", async () => {
    const ids = new Set<string>();
    for (let i = 0; i < 5; i++) {
      const response = await w.agents.southManager.get(`/api/markets/${w.marketId.get("Veltria")}`).expect(403);
      const id = String(response.headers["x-request-id"]);
      expect(id).toMatch(/^[0-9a-f-]{36}$/);
      expect(apiErrorSchema.parse(response.body).error.requestId).toBe(id);
      expect(requestLine(id)).toMatchObject({ userId: w.userId.southManager, res: { statusCode: 403 } });
      ids.add(id);
    }
    expect(ids.size).toBe(5);
  });

  it("keep query strings out and replace invitation tokens in paths", () => {
    expect(loggedPath("/api/flags?market=abc&note=secret")).toBe("/api/flags");
    expect(loggedPath("/api/invitations/SECRETtoken123/accept")).toBe("/api/invitations/[redacted]/accept");
    expect(loggedPath("/api/invitations/SECRETtoken123")).toBe("/api/invitations/[redacted]");
    expect(loggedPath("/invite/SECRETtoken123?x=1")).toBe("/invite/[redacted]");
    // Invitation ids (not secrets) stay, so an admin's resend can be traced.
    expect(loggedPath("/api/invitations/4f1c/resend")).toBe("/api/invitations/4f1c/resend");
    expect(loggedPath("/api/invitations")).toBe("/api/invitations");
  });

  it("redact secrets even if a handler logged them by mistake", () => {
    const captured: string[] = [];
    const logger = createLogger(
      "info",
      new Writable({
        write(chunk, _encoding, done) {
          captured.push(String(chunk));
          done();
        },
      }),
    );
    logger.info({ password: "p4ss-word-x", token: "tok-123", input: { password: "nested-secret", sessionId: "sess-9" }, req: { headers: { cookie: "tributary_session=abc" } } }, "oops");
    const text = captured.join("");
    for (const secret of ["p4ss-word-x", "tok-123", "nested-secret", "sess-9", "tributary_session=abc"]) expect(text).not.toContain(secret);
    expect(text).toContain("[redacted]");
  });
});

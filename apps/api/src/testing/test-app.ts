// Test helpers: an app over a fresh in-memory database holding the demo workspace.
import request from "supertest";
import type { Express } from "express";
import { createApp, shutdownApp } from "../app";
import { csrfCookieName, csrfHeaderName } from "../auth/csrf";
import type { AppConfig } from "../config";
import { closeDatabase, type Database } from "../db/client";
import type { DemoUser } from "../demo/users";
import { markInterruptedRuns } from "../runs/run-service";
import { snapshotDatabase } from "./database-snapshot";

export interface TestApp {
  readonly app: Express;
  readonly db: Database;
  close(): Promise<void>;
}

/**
 * The app over the demo workspace: a fresh copy of the seeded snapshot, or `db` when
 * given (then closing leaves the database open for its owner). Fit runs left queued or
 * running in `db` are marked interrupted first, as the server does at start.
 */
export async function demoTestApp(config: Partial<AppConfig> = {}, db?: Database): Promise<TestApp> {
  const database = db ?? (await snapshotDatabase("demo"));
  await markInterruptedRuns(database);
  const app = createApp({ db: database, config: { logLevel: "silent", ...config } });
  return {
    app,
    db: database,
    close: async () => {
      await shutdownApp(app);
      if (!db) await closeDatabase(database);
    },
  };
}

/**
 * A supertest agent that keeps cookies, signed in as the given demo user, and sends the
 * session's CSRF token on every request as the web app does.
 */
export async function signedInAgent(app: Express, user: Pick<DemoUser, "email" | "password">) {
  const agent = request.agent(app);
  const response = await agent.post("/api/auth/sign-in").send({ email: user.email, password: user.password });
  if (response.status !== 200) throw new Error(`sign-in as ${user.email} failed: ${response.status} ${JSON.stringify(response.body)}`);
  const token = csrfSetCookie(response);
  if (!token) throw new Error(`sign-in as ${user.email} set no CSRF token cookie`);
  agent.set(csrfHeaderName, token);
  return agent;
}

/** The CSRF token a response set in its cookie, if any. */
export function csrfSetCookie(response: { headers: Record<string, unknown> }): string | undefined {
  const header = response.headers["set-cookie"];
  const list = Array.isArray(header) ? (header as string[]) : typeof header === "string" ? [header] : [];
  const cookie = list.find((c) => c.startsWith(`${csrfCookieName}=`));
  return cookie ? decodeURIComponent(cookie.slice(csrfCookieName.length + 1).split(";")[0]!) : undefined;
}

/** The Set-Cookie header for the session cookie, if the response set one. */
export function sessionSetCookie(response: { headers: Record<string, unknown> }): string | undefined {
  const header = response.headers["set-cookie"];
  const list = Array.isArray(header) ? (header as string[]) : typeof header === "string" ? [header] : [];
  return list.find((cookie) => cookie.startsWith("tributary_session="));
}

/** Signs in without an agent: the session cookie ("name=value"), the session id and its CSRF token. */
export async function signInCookie(app: Express, user: Pick<DemoUser, "email" | "password">) {
  const response = await request(app).post("/api/auth/sign-in").send({ email: user.email, password: user.password });
  const cookie = sessionSetCookie(response)?.split(";")[0];
  const csrfToken = csrfSetCookie(response);
  if (response.status !== 200 || !cookie || !csrfToken) throw new Error(`sign-in as ${user.email} failed: ${response.status}`);
  return { cookie, sessionId: cookie.slice(cookie.indexOf("=") + 1), csrfToken };
}

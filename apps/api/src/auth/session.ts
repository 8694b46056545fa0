// Reads the session cookie on every API request and attaches the signed-in user, if any.
import type { Request, RequestHandler, Response } from "express";
import { asc, eq } from "drizzle-orm";
import type { CurrentUser } from "@tributary/contracts";
import type { Database, Queryable } from "../db/client";
import { DataGeneration, dataGenerationOf } from "../db/data-generation";
import { userMarkets } from "../db/schema";
import { clearCsrfCookie, csrfCookieName, csrfTokenFor, readCookie, setCsrfCookie } from "./csrf";
import { sessionLifetimeMs, type Auth } from "./lucia";
import { SessionCache } from "./session-cache";

export interface RequestAuth {
  readonly user: CurrentUser;
  readonly sessionId: string;
}

declare global {
  namespace Express {
    interface Request {
      /** Set by `authenticate`: the signed-in user, or null. */
      auth?: RequestAuth | null;
    }
  }
}

/** The user as the API and web app see it; market ids only for market managers. */
export async function currentUserOf(
  db: Queryable,
  user: { id: string; email: string; name: string; role: CurrentUser["role"] },
): Promise<CurrentUser> {
  const marketIds =
    user.role === "market_manager"
      ? (
          await db
            .select({ marketId: userMarkets.marketId })
            .from(userMarkets)
            .where(eq(userMarkets.userId, user.id))
            .orderBy(asc(userMarkets.marketId))
        ).map((row) => row.marketId)
      : [];
  return { id: user.id, email: user.email, name: user.name, role: user.role, marketIds };
}

/**
 * The cookie flags: httpOnly, SameSite=Lax, Secure whenever the request came over https.
 * The session's CSRF token goes along in a cookie the page can read (see csrf.ts).
 */
export function setSessionCookie(auth: Auth, req: Request, res: Response, sessionId: string): void {
  const cookie = auth.createSessionCookie(sessionId);
  const maxAge = (cookie.attributes.maxAge ?? 0) * 1000;
  res.cookie(cookie.name, cookie.value, { httpOnly: true, sameSite: "lax", secure: req.secure, path: "/", maxAge });
  setCsrfCookie(req, res, sessionId, maxAge);
}

export function clearSessionCookie(auth: Auth, req: Request, res: Response): void {
  res.clearCookie(auth.sessionCookieName, { httpOnly: true, sameSite: "lax", secure: req.secure, path: "/" });
  clearCsrfCookie(req, res);
}

/**
 * Attaches the signed-in user. A session checked at the current data generation is taken
 * from a cache (session-cache.ts) without a database round trip; its expiry and renewal
 * time are still compared with the clock on every request.
 */
export function authenticate(auth: Auth, db: Database): RequestHandler {
  const generation = dataGenerationOf(db);
  const lifetimeMs = sessionLifetimeMs(auth);
  const cache = generation && lifetimeMs !== undefined ? new SessionCache(generation) : null;
  return async (req, res, next) => {
    req.auth = null;
    const sessionId = auth.readSessionCookie(req.headers.cookie ?? "");
    if (!sessionId) return next();
    let known = cache?.get(sessionId, Date.now()) ?? null;
    let fresh = false;
    if (!known) {
      const checked = await (generation ?? new DataGeneration()).readAt(async () => {
        const { session, user } = await auth.validateSession(sessionId);
        if (!session) return null;
        if (user.disabled) return { session, user, current: null };
        return { session, user, current: await currentUserOf(db, user) };
      });
      const result = checked.value;
      if (!result) {
        clearSessionCookie(auth, req, res);
        return next();
      }
      if (!result.current) {
        await auth.invalidateUserSessions(result.user.id);
        clearSessionCookie(auth, req, res);
        return next();
      }
      const expiresAt = result.session.expiresAt.getTime();
      known = {
        user: result.current,
        expiresAt,
        renewFrom: lifetimeMs === undefined ? expiresAt : expiresAt - lifetimeMs / 2,
        csrfToken: csrfTokenFor(sessionId),
      };
      fresh = result.session.fresh;
      cache?.set(sessionId, checked.generation, known);
    }
    if (fresh) setSessionCookie(auth, req, res, sessionId);
    // A browser that lost its token cookie (or holds an older one) gets it back on its next request.
    else if (readCookie(req.headers.cookie, csrfCookieName) !== known.csrfToken) {
      setCsrfCookie(req, res, sessionId, Math.max(0, known.expiresAt - Date.now()));
    }
    // A copy: handlers get their own user object, the cached one never changes.
    const user = known.user;
    req.auth = { user: { ...user, marketIds: [...user.marketIds] }, sessionId };
    // Every later log line of this request names who made it.
    if (req.log) req.log = req.log.child({ userId: user.id });
    next();
  };
}

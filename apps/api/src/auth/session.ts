// Reads the session cookie on every API request and attaches the signed-in user, if any.
import type { Request, RequestHandler, Response } from "express";
import { asc, eq } from "drizzle-orm";
import type { CurrentUser } from "@tributary/contracts";
import type { Database, Queryable } from "../db/client";
import { userMarkets } from "../db/schema";
import { clearCsrfCookie, csrfCookieName, csrfTokenFor, readCookie, setCsrfCookie } from "./csrf";
import type { Auth } from "./lucia";

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

export function authenticate(auth: Auth, db: Database): RequestHandler {
  return async (req, res, next) => {
    req.auth = null;
    const sessionId = auth.readSessionCookie(req.headers.cookie ?? "");
    if (!sessionId) return next();
    const { session, user } = await auth.validateSession(sessionId);
    if (!session) {
      clearSessionCookie(auth, req, res);
      return next();
    }
    if (user.disabled) {
      await auth.invalidateUserSessions(user.id);
      clearSessionCookie(auth, req, res);
      return next();
    }
    if (session.fresh) setSessionCookie(auth, req, res, session.id);
    // A browser that lost its token cookie (or holds an older one) gets it back on its next request.
    else if (readCookie(req.headers.cookie, csrfCookieName) !== csrfTokenFor(session.id)) {
      setCsrfCookie(req, res, session.id, Math.max(0, session.expiresAt.getTime() - Date.now()));
    }
    req.auth = { user: await currentUserOf(db, user), sessionId: session.id };
    // Every later log line of this request names who made it.
    if (req.log) req.log = req.log.child({ userId: user.id });
    next();
  };
}

// Sign-in, sign-out (here or on every device) and the current user. Every sign-in starts
// a new session (the browser's old one ends), so a session id known before sign-in is useless.
import { eq } from "drizzle-orm";
import { signInInput, type CurrentUser } from "@tributary/contracts";
import { anyone, defineRoute, markets, signedIn } from "../access/route-table";
import { verifyAgainstDecoy, verifyPassword } from "../auth/password";
import { clearSessionCookie, currentUserOf, setSessionCookie } from "../auth/session";
import { signInRateLimit } from "../auth/sign-in-limit";
import { auditLog, sessions, users } from "../db/schema";
import { Forbidden, Unauthenticated } from "../http/errors";

/** The same words for an unknown e-mail and a wrong password, so neither is revealed. */
export const wrongCredentialsMessage = "E-mail or password is incorrect";

export const authRoutes = [
  defineRoute({
    method: "post",
    path: "/api/auth/sign-in",
    access: anyone,
    before: ({ config }) => [signInRateLimit(config)],
    handler: async ({ req, res, db, auth }): Promise<CurrentUser> => {
      const input = signInInput.parse(req.body);
      const [user] = await db.select().from(users).where(eq(users.email, input.email));
      const passwordOk = user?.passwordHash
        ? await verifyPassword(user.passwordHash, input.password)
        : await verifyAgainstDecoy(input.password);
      if (!user || !passwordOk) throw new Unauthenticated(wrongCredentialsMessage);
      if (user.disabled) throw new Forbidden("This account is disabled. Ask an admin to enable it");

      if (req.auth) await auth.invalidateSession(req.auth.sessionId);
      const session = await auth.createSession(user.id, {});
      setSessionCookie(auth, req, res, session.id);
      res.locals.signedInUserId = user.id;
      await db.insert(auditLog).values({ userId: user.id, action: "sign_in", target: `user:${user.id}` });
      return currentUserOf(db, user);
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/auth/sign-out",
    access: anyone,
    handler: async ({ req, res, auth }) => {
      if (req.auth) await auth.invalidateSession(req.auth.sessionId);
      clearSessionCookie(auth, req, res);
      return undefined;
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/auth/sign-out-all",
    access: signedIn(markets.unscoped),
    handler: async ({ req, res, db, auth, user }) => {
      // Ends every session of the user: this browser's and any other device's.
      const ended = await db.select({ id: sessions.id }).from(sessions).where(eq(sessions.userId, user.id));
      await auth.invalidateUserSessions(user.id);
      clearSessionCookie(auth, req, res);
      await db.insert(auditLog).values({ userId: user.id, action: "signed_out_everywhere", target: `user:${user.id}`, details: { sessions: ended.length } });
      return undefined;
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/auth/me",
    access: signedIn(markets.unscoped),
    handler: ({ user }): CurrentUser => user,
  }),
];

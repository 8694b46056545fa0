// People & access (admins): users, roles and market scopes, invitations, the audit log.
// The invitation page's two routes are public: the token in the link is the credential.
import { eq } from "drizzle-orm";
import { ipKeyGenerator, rateLimit } from "express-rate-limit";
import {
  acceptInvitationInput,
  auditLogQuery,
  invitationInput,
  invitationListQuery,
  personUpdateInput,
  type AuditLogPage,
  type CurrentUser,
  type Invitation,
  type InvitationLookup,
  type Person,
} from "@tributary/contracts";
import type { RequestHandler } from "express";
import { anyone, defineRoute, markets, signedIn, type AppDeps } from "../access/route-table";
import { currentUserOf, setSessionCookie } from "../auth/session";
import { auditLog, users } from "../db/schema";
import { RateLimited } from "../http/errors";
import { appBaseUrl } from "../mail/messages";
import { auditLogPage } from "../people/audit-log";
import { acceptInvitation, createInvitation, listInvitations, lookUpInvitation, resendInvitation, revokeInvitation } from "../people/invitations";
import { listPeople, updatePerson } from "../people/people";

const admins = ["admin"] as const;

/**
 * The invitation page (looking a token up, accepting it: an argon2 hash each time): 20
 * tries per client per quarter hour, counted together for both routes of one app.
 */
const invitationPageLimits = new WeakMap<AppDeps, RequestHandler>();
const acceptLimit = (deps: AppDeps): RequestHandler[] => {
  let limit = invitationPageLimits.get(deps);
  if (!limit) {
    limit = rateLimit({
      windowMs: 15 * 60_000,
      limit: 20,
      standardHeaders: "draft-8",
      legacyHeaders: false,
      keyGenerator: (req) => ipKeyGenerator(req.ip ?? ""),
      handler: (_req, _res, next) => next(new RateLimited("Too many attempts to accept an invitation. Wait 15 minutes and try again")),
    });
    invitationPageLimits.set(deps, limit);
  }
  return [limit];
};

export const peopleRoutes = [
  defineRoute({
    method: "get",
    path: "/api/people",
    access: signedIn(markets.unscoped, admins),
    handler: ({ db }): Promise<Person[]> => listPeople(db),
  }),
  defineRoute({
    method: "patch",
    path: "/api/people/:userId",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, auth, user }): Promise<Person> => updatePerson(db, auth, user, String(req.params.userId), personUpdateInput.parse(req.body ?? {})),
  }),
  defineRoute({
    method: "get",
    path: "/api/invitations",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db }): Promise<Invitation[]> => listInvitations(db, invitationListQuery.parse(req.query).status),
  }),
  defineRoute({
    method: "post",
    path: "/api/invitations",
    access: signedIn(markets.unscoped, admins),
    handler: async ({ req, res, db, user, mailer, config }): Promise<Invitation> => {
      const input = invitationInput.parse(req.body ?? {});
      const invitation = await createInvitation(db, user, input, { mailer, baseUrl: appBaseUrl(config, req) });
      res.status(201);
      return invitation;
    },
  }),
  defineRoute({
    method: "post",
    path: "/api/invitations/:invitationId/resend",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user, mailer, config }): Promise<Invitation> =>
      resendInvitation(db, user, String(req.params.invitationId), { mailer, baseUrl: appBaseUrl(config, req) }),
  }),
  defineRoute({
    method: "post",
    path: "/api/invitations/:invitationId/revoke",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<Invitation> => revokeInvitation(db, user, String(req.params.invitationId)),
  }),
  defineRoute({
    method: "get",
    path: "/api/invitations/:token",
    access: anyone,
    before: acceptLimit,
    handler: ({ req, db }): Promise<InvitationLookup> => lookUpInvitation(db, String(req.params.token)),
  }),
  defineRoute({
    method: "post",
    path: "/api/invitations/:token/accept",
    access: anyone,
    before: acceptLimit,
    handler: async ({ req, res, db, auth }): Promise<CurrentUser> => {
      const input = acceptInvitationInput.parse(req.body ?? {});
      const userId = await acceptInvitation(db, String(req.params.token), input);
      // The new account is signed in at once (any earlier session in this browser ends).
      if (req.auth) await auth.invalidateSession(req.auth.sessionId);
      const session = await auth.createSession(userId, {});
      setSessionCookie(auth, req, res, session.id);
      res.locals.signedInUserId = userId;
      await db.insert(auditLog).values({ userId, action: "sign_in", target: `user:${userId}` });
      const [row] = await db.select().from(users).where(eq(users.id, userId));
      res.status(201);
      return currentUserOf(db, row!);
    },
  }),
  defineRoute({
    method: "get",
    path: "/api/audit-log",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db }): Promise<AuditLogPage> => auditLogPage(db, auditLogQuery.parse(req.query)),
  }),
];

// lucia v3 over the Drizzle tables: database sessions with sliding expiry.
import { DrizzlePostgreSQLAdapter } from "@lucia-auth/adapter-drizzle";
import { Lucia, TimeSpan } from "lucia";
import type { Role } from "@tributary/contracts";
import type { AppConfig } from "../config";
import type { Database } from "../db/client";
import { sessions, users } from "../db/schema";

export const sessionCookieName = "tributary_session";

/** How long a session lasts, by the lucia instance (see sessionLifetimeMs). */
const lifetimes = new WeakMap<object, number>();

export function createAuth(db: Database, config: Pick<AppConfig, "sessionIdleDays">) {
  const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);
  const expiresIn = new TimeSpan(config.sessionIdleDays, "d");
  // lucia extends a session to the full period when it is used in the second half of it.
  const auth = new Lucia(adapter, {
    sessionExpiresIn: expiresIn,
    sessionCookie: { name: sessionCookieName, expires: true, attributes: { sameSite: "lax" } },
    getUserAttributes: (attributes) => ({
      email: attributes.email,
      name: attributes.name,
      role: attributes.role,
      disabled: attributes.disabled,
    }),
  });
  lifetimes.set(auth, expiresIn.milliseconds());
  return auth;
}

/** A session's full lifetime in ms (lucia renews it in the second half), or undefined for an instance not made by createAuth. */
export function sessionLifetimeMs(auth: object): number | undefined {
  return lifetimes.get(auth);
}

export type Auth = ReturnType<typeof createAuth>;

declare module "lucia" {
  interface Register {
    Lucia: Auth;
    DatabaseUserAttributes: { email: string; name: string; role: Role; disabled: boolean };
  }
}

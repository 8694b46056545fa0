// The route table: every API route declares who may call it and which markets it
// touches; `mountRoutes` enforces both in one place before any handler runs.
import type { Request, RequestHandler, Response } from "express";
import type { CurrentUser, Role } from "@tributary/contracts";
import type { AppConfig } from "../config";
import type { Auth } from "../auth/lucia";
import type { DashboardCache } from "../dashboards/dashboard-cache";
import type { Database } from "../db/client";
import type { Mailer } from "../mail/mailer";
import type { RunService } from "../runs/run-service";
import type { UploadStore } from "../uploads/upload-store";

/** Everything a handler may use, injected; handlers import no globals. */
export interface AppDeps {
  readonly db: Database;
  readonly config: AppConfig;
  readonly auth: Auth;
  readonly mailer: Mailer;
  /** Uploaded files between upload and save (in memory, per user). */
  readonly uploads: UploadStore;
  /** Fit runs: start, cancel, restart, live progress. */
  readonly runs: RunService;
  /** The dashboards' per-run numbers, computed once per run and kept in memory. */
  readonly dashboards: DashboardCache;
}

/** How a route finds the market(s) a request touches. */
export type MarketRule =
  /** The data is not tied to a market (brands, channels, settings). */
  | { readonly kind: "unscoped" }
  /** A list across markets: the handler must restrict every query with `inScope(column, scope)`. */
  | { readonly kind: "filter" }
  /** A market id in the path, e.g. `/api/markets/:marketId`. */
  | { readonly kind: "param"; readonly name: string }
  /** Market id(s) in the query string (`?market=a&market=b` or `?market=a,b`); all allowed when absent. */
  | { readonly kind: "query"; readonly name: string }
  /** The markets of one resource (a cell, a plan); null when it does not exist. Out of scope looks like not found. */
  | {
      readonly kind: "resolve";
      readonly resolve: (req: Request, db: Database) => Promise<readonly string[] | null>;
    };

export const markets = {
  unscoped: { kind: "unscoped" } as MarketRule,
  filtered: { kind: "filter" } as MarketRule,
  fromParam: (name: string): MarketRule => ({ kind: "param", name }),
  fromQuery: (name: string): MarketRule => ({ kind: "query", name }),
  resolvedBy: (resolve: (req: Request, db: Database) => Promise<readonly string[] | null>): MarketRule => ({
    kind: "resolve",
    resolve,
  }),
};

export interface PublicAccess {
  readonly kind: "public";
}
export interface SignedInAccess {
  readonly kind: "signed_in";
  readonly roles: readonly Role[] | "any";
  readonly markets: MarketRule;
}
export type Access = PublicAccess | SignedInAccess;

export const anyone: PublicAccess = { kind: "public" };

/** Signed-in users of the given roles (default: every role), with the route's market rule. */
export function signedIn(marketRule: MarketRule, roles: readonly Role[] | "any" = "any"): SignedInAccess {
  return { kind: "signed_in", roles, markets: marketRule };
}

/** The markets a request may touch: the user's markets narrowed by the route's rule. */
export interface MarketScope {
  readonly marketIds: readonly string[];
  /** True for roles that see every market (still listed in `marketIds`). */
  readonly allMarkets: boolean;
}

declare global {
  namespace Express {
    interface Request {
      /** Set by the route table's authorization for signed-in routes. */
      scope?: MarketScope;
    }
  }
}

interface BaseContext extends AppDeps {
  readonly req: Request;
  readonly res: Response;
}
export interface PublicContext extends BaseContext {
  readonly user: CurrentUser | null;
}
export interface SignedInContext extends BaseContext {
  readonly user: CurrentUser;
  readonly scope: MarketScope;
}
export type ContextFor<A extends Access> = A extends SignedInAccess ? SignedInContext : PublicContext;

export type HttpMethod = "get" | "post" | "put" | "patch" | "delete";

/**
 * A handler returns the JSON body (status 200 unless it set another), or undefined for
 * 204; a handler that streams writes to `res` itself.
 */
export interface RouteSpec<A extends Access> {
  readonly method: HttpMethod;
  readonly path: string;
  readonly access: A;
  /** Extra middleware run after authorization (e.g. a rate limit), built once per app. */
  readonly before?: (deps: AppDeps) => RequestHandler[];
  readonly handler: (ctx: ContextFor<A>) => unknown;
}

export interface Route {
  readonly method: HttpMethod;
  readonly path: string;
  readonly access: Access;
  readonly before?: (deps: AppDeps) => RequestHandler[];
  readonly handler: (ctx: PublicContext | SignedInContext) => unknown;
}

export function defineRoute<A extends Access>(spec: RouteSpec<A>): Route {
  // mountRoutes builds the context that matches `access`, so the erased handler is safe.
  return spec as unknown as Route;
}

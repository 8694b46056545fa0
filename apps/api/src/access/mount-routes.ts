// Enforces the route table: authentication, role and market scope are checked here,
// once, before any handler runs.
import { Router, type Request, type RequestHandler } from "express";
import { roleLabels } from "@tributary/contracts";
import { Forbidden, NotFound, Unauthenticated } from "../http/errors";
import { checkPathText } from "../http/request-text";
import { allowedMarkets } from "./market-scope";
import type { AppDeps, MarketRule, MarketScope, PublicContext, Route, SignedInContext } from "./route-table";

function queryValues(req: Request, name: string): string[] | null {
  const raw = req.query[name];
  if (raw === undefined) return null;
  const list = (Array.isArray(raw) ? raw : [raw]).flatMap((value) => (typeof value === "string" ? value.split(",") : []));
  return list.map((value) => value.trim()).filter((value) => value !== "");
}

async function narrowScope(rule: MarketRule, allowed: MarketScope, req: Request, deps: AppDeps): Promise<MarketScope> {
  const allowedSet = new Set(allowed.marketIds);
  const requireAll = (ids: readonly string[]) => {
    for (const id of ids) {
      if (allowedSet.has(id)) continue;
      // Someone who sees every market asked for one that does not exist.
      if (allowed.allMarkets) throw new NotFound("No such market");
      throw new Forbidden("You do not have access to this market");
    }
    return { marketIds: [...new Set(ids)], allMarkets: false };
  };
  switch (rule.kind) {
    case "unscoped":
    case "filter":
      return allowed;
    case "param":
      return requireAll([String(req.params[rule.name] ?? "")]);
    case "query": {
      const ids = queryValues(req, rule.name);
      return ids === null || ids.length === 0 ? allowed : requireAll(ids);
    }
    case "resolve": {
      const ids = await rule.resolve(req, deps.db);
      // Out of scope is reported as not found, so a resource's existence does not leak.
      if (ids === null || ids.some((id) => !allowedSet.has(id))) throw new NotFound();
      return { marketIds: [...new Set(ids)], allMarkets: false };
    }
  }
}

function authorize(route: Route, deps: AppDeps): RequestHandler {
  const access = route.access;
  return async (req, _res, next) => {
    if (access.kind === "public") {
      checkPathText(req);
      return next();
    }
    const user = req.auth?.user;
    if (!user) throw new Unauthenticated();
    if (access.roles !== "any" && !access.roles.includes(user.role)) {
      throw new Forbidden(`${roleLabels[user.role]}s cannot do this`);
    }
    // Before any rule reads the path (a resolve rule queries the database with it).
    checkPathText(req);
    req.scope = await narrowScope(access.markets, await allowedMarkets(deps.db, user), req, deps);
    next();
  };
}

function respond(route: Route, deps: AppDeps): RequestHandler {
  return async (req, res) => {
    const ctx: PublicContext | SignedInContext =
      route.access.kind === "public"
        ? { ...deps, req, res, user: req.auth?.user ?? null }
        : { ...deps, req, res, user: req.auth!.user, scope: req.scope! };
    const body = await route.handler(ctx);
    if (res.headersSent) return;
    if (body === undefined) res.status(204).end();
    else res.json(body);
  };
}

/** A path's `:marketId` must be checked by the route's market rule, not by hand. */
function checkMarketParams(route: Route): void {
  const params = [...route.path.matchAll(/:(\w+)/g)].map((match) => match[1]);
  const rule = route.access.kind === "signed_in" ? route.access.markets : null;
  if (rule?.kind === "param" && !params.includes(rule.name)) {
    throw new Error(`${route.method.toUpperCase()} ${route.path}: market rule names :${rule.name}, which the path lacks`);
  }
  if (params.includes("marketId") && !(rule?.kind === "param" && rule.name === "marketId")) {
    throw new Error(`${route.method.toUpperCase()} ${route.path}: :marketId must be declared with markets.fromParam("marketId")`);
  }
}

export function mountRoutes(routes: readonly Route[], deps: AppDeps): Router {
  const router = Router();
  const seen = new Set<string>();
  for (const route of routes) {
    const key = `${route.method} ${route.path}`;
    if (seen.has(key)) throw new Error(`Route ${key} is declared twice`);
    seen.add(key);
    checkMarketParams(route);
    router[route.method](route.path, authorize(route, deps), ...(route.before?.(deps) ?? []), respond(route, deps));
  }
  return router;
}

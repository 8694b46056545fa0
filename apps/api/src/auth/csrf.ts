// Cross-site request forgery protection for cookie-authenticated writes, in two layers:
// 1. every unsafe request (POST, PUT, PATCH, DELETE — multipart uploads included) whose
//    Origin, or failing that Referer, names another site is refused;
// 2. an unsafe request made with a valid session must also carry the session's token in
//    the X-CSRF-Token header (a synchronizer token derived from the session id, handed to
//    the page in a readable cookie: another site can neither read it nor compute it).
// Layer 2 closes what layer 1 cannot see: requests with neither header (old browsers,
// privacy tools that strip them). Requests without a session have no ambient authority
// to abuse and pass layer 2 (sign-in, the invitation page).
import { createHash, timingSafeEqual } from "node:crypto";
import type { Request, RequestHandler, Response } from "express";
import { verifyRequestOrigin } from "lucia";
import { Forbidden } from "../http/errors";

export const csrfCookieName = "tributary_csrf";
export const csrfHeaderName = "X-CSRF-Token";

const safeMethods = new Set(["GET", "HEAD", "OPTIONS"]);

export function isUnsafeMethod(method: string): boolean {
  return !safeMethods.has(method.toUpperCase());
}

/** The token of a session: a one-way hash of its (secret, random) id, so it reveals nothing of the id. */
export function csrfTokenFor(sessionId: string): string {
  return createHash("sha256").update(`tributary-csrf\u0000${sessionId}`, "utf8").digest("base64url");
}

/** One cookie's value from a Cookie header, or null. */
export function readCookie(header: string | undefined, name: string): string | null {
  if (!header) return null;
  for (const part of header.split(";")) {
    const at = part.indexOf("=");
    if (at < 0) continue;
    if (part.slice(0, at).trim() !== name) continue;
    const raw = part.slice(at + 1).trim();
    try {
      return decodeURIComponent(raw);
    } catch {
      return raw;
    }
  }
  return null;
}

/** The token cookie: readable by the page's script (that is its purpose), same-site only. */
export function setCsrfCookie(req: Request, res: Response, sessionId: string, maxAgeMs: number): void {
  res.cookie(csrfCookieName, csrfTokenFor(sessionId), { httpOnly: false, sameSite: "strict", secure: req.secure, path: "/", maxAge: maxAgeMs });
}

export function clearCsrfCookie(req: Request, res: Response): void {
  res.clearCookie(csrfCookieName, { httpOnly: false, sameSite: "strict", secure: req.secure, path: "/" });
}

function sameSite(value: string, req: Request): boolean {
  return verifyRequestOrigin(value, [req.host]);
}

/** Layer 1: an unsafe request whose Origin (or, without one, Referer) is another site is refused. */
export const sameSiteWrites: RequestHandler = (req, _res, next) => {
  if (!isUnsafeMethod(req.method)) return next();
  const origin = req.get("origin");
  // "null" (sandboxed frames, some redirects) fails the check like any other site.
  if (origin !== undefined) {
    if (!sameSite(origin, req)) throw new Forbidden("Cross-site request refused");
    return next();
  }
  const referer = req.get("referer");
  if (referer !== undefined && referer !== "" && !sameSite(referer, req)) throw new Forbidden("Cross-site request refused");
  next();
};

function equalTokens(a: string, b: string): boolean {
  const left = Buffer.from(a, "utf8");
  const right = Buffer.from(b, "utf8");
  return left.length === right.length && timingSafeEqual(left, right);
}

/** Layer 2 (after `authenticate`): an unsafe request with a valid session must carry the session's token. */
export const sessionTokenOnWrites: RequestHandler = (req, _res, next) => {
  if (!isUnsafeMethod(req.method) || !req.auth) return next();
  const sent = req.get(csrfHeaderName) ?? "";
  if (!equalTokens(sent, csrfTokenFor(req.auth.sessionId))) {
    throw new Forbidden("This request lacks the page's security token; reload the page and try again");
  }
  next();
};

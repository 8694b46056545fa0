// Sign-in attempts are limited per client IP and e-mail address; successful sign-ins do not count.
import type { RequestHandler } from "express";
import { ipKeyGenerator, rateLimit } from "express-rate-limit";
import type { AppConfig } from "../config";
import { RateLimited } from "../http/errors";

export function signInRateLimit(config: Pick<AppConfig, "signInLimit">): RequestHandler {
  const { attempts, windowMinutes } = config.signInLimit;
  return rateLimit({
    windowMs: windowMinutes * 60_000,
    limit: attempts,
    standardHeaders: "draft-8",
    legacyHeaders: false,
    skipSuccessfulRequests: true,
    keyGenerator: (req) => {
      const body: unknown = req.body;
      const email =
        typeof body === "object" && body !== null && typeof (body as { email?: unknown }).email === "string"
          ? (body as { email: string }).email.trim().toLowerCase()
          : "";
      return `${ipKeyGenerator(req.ip ?? "")}|${email}`;
    },
    handler: (_req, _res, next) => {
      next(new RateLimited(`Too many sign-in attempts. Wait ${windowMinutes} minutes and try again`));
    },
  });
}

// Structured request logs (pino): one line per request with its id, method, path (secrets
// in the path replaced), status, time and — once signed in — the user id. Never headers,
// cookies, bodies, query strings or data rows. The id is also sent back in X-Request-Id
// and in every error body, so a person can quote it.
import { randomUUID } from "node:crypto";
import type { IncomingMessage, ServerResponse } from "node:http";
import { pino, type Logger } from "pino";
import { pinoHttp, type Options } from "pino-http";

/** Anything that might carry a secret if a caller ever logs it by mistake. */
export const redactedPaths = [
  "req.headers.cookie",
  "req.headers.authorization",
  'req.headers["x-csrf-token"]',
  'res.headers["set-cookie"]',
  "password",
  "token",
  "sessionId",
  "*.password",
  "*.token",
  "*.sessionId",
  "*.passwordHash",
];

export function createLogger(level: string, destination?: pino.DestinationStream): Logger {
  const options = { level, redact: { paths: redactedPaths, censor: "[redacted]" } };
  return destination ? pino(options, destination) : pino(options);
}

/** Path segments that are credentials: the invitation token (API and web page). */
const secretSegments: readonly RegExp[] = [
  // GET /api/invitations/:token and POST /api/invitations/:token/accept; ids before /resend and /revoke are not secret.
  /^(\/api\/invitations\/)(?!(?:[^/]+)\/(?:resend|revoke)\/?$)[^/]+/,
  /^(\/invite\/)[^/]+/,
];

/** The request path as logged: no query string, secret segments replaced. */
export function loggedPath(url: string): string {
  let path = url.split("?")[0] ?? "";
  for (const pattern of secretSegments) path = path.replace(pattern, "$1[redacted]");
  return path;
}

/** pino-http, configured as above; `X-Request-Id` is set before any handler runs. */
export function requestLogger(logger: Logger) {
  const options: Options<IncomingMessage, ServerResponse> = {
    logger,
    serializers: {
      req: (req: { id: unknown; method: string; url: string }) => ({ id: req.id, method: req.method, url: loggedPath(req.url) }),
      res: (res: { statusCode: number }) => ({ statusCode: res.statusCode }),
    },
    genReqId: (_req, res) => {
      const id = randomUUID();
      res.setHeader("X-Request-Id", id);
      return id;
    },
    // Who made the request, once the session is known (evaluated again when it ends).
    customProps: (req, res) => {
      const auth = (req as IncomingMessage & { auth?: { user: { id: string } } | null }).auth;
      const userId = auth?.user.id ?? (res as ServerResponse & { locals?: { signedInUserId?: string } }).locals?.signedInUserId;
      return userId ? { userId } : {};
    },
  };
  return pinoHttp(options);
}

// The error middleware, registered last: every error becomes the one JSON error shape.
import type { ErrorRequestHandler, RequestHandler } from "express";
import { ZodError } from "zod";
import type { ApiError } from "@tributary/contracts";
import { HttpError, Invalid, NotFound, TooLarge } from "./errors";

/** Zod issues as field issues; the message names the first problem in plain words. */
export function invalidFromZod(error: ZodError): Invalid {
  const issues = error.issues.map((issue) => ({
    path: issue.path.map(String).join(".") || "body",
    message: issue.message,
  }));
  const first = issues[0];
  const message =
    issues.length === 1 && first ? first.message : `${issues.length} fields are not valid: ${issues.map((i) => i.path).join(", ")}`;
  return new Invalid(message, issues);
}

/** Errors from body parsing (express.json) and uploads carry a `type` or `code`. */
function fromFrameworkError(err: unknown): HttpError | null {
  if (typeof err !== "object" || err === null) return null;
  const { type, code } = err as { type?: unknown; code?: unknown };
  if (type === "entity.parse.failed") return new Invalid("The request body is not valid JSON");
  if (type === "entity.too.large" || code === "LIMIT_FILE_SIZE") return new TooLarge();
  if (type === "encoding.unsupported" || type === "charset.unsupported") return new Invalid("Unsupported request encoding");
  return null;
}

/**
 * What of an unknown error may be logged: its kind, the first line of its message and
 * its stack frames. Query parameters and database details (which can hold rows or
 * password hashes) are left out.
 */
export function safeErrorForLog(err: unknown): Record<string, unknown> {
  if (!(err instanceof Error)) return { type: typeof err };
  const cause = err.cause instanceof Error ? err.cause : undefined;
  const isQueryError = err.name === "DrizzleQueryError" || err.message.startsWith("Failed query:");
  const message = isQueryError ? `Failed query (${cause?.message.split("\n")[0] ?? "no cause"})` : err.message.split("\n")[0];
  const frames = (err.stack ?? "").split("\n").filter((line) => line.trimStart().startsWith("at "));
  const code = (cause as { code?: unknown } | undefined)?.code ?? (err as { code?: unknown }).code;
  return { type: err.name, message, code: typeof code === "string" ? code : undefined, stack: frames.join("\n") };
}

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new NotFound(`Nothing at ${req.method} ${req.originalUrl.split("?")[0]}`));
};

/** Messages may quote what was sent (an id, a name); a long quote is cut so the answer stays readable. */
export const MAX_MESSAGE_LENGTH = 500;
const MAX_ISSUE_MESSAGE_LENGTH = 300;

function shortened(text: string, max: number): string {
  const chars = Array.from(text);
  return chars.length <= max ? text : `${chars.slice(0, max - 1).join("")}…`;
}

export const errorHandler: ErrorRequestHandler = (err, req, res, _next) => {
  const known =
    err instanceof HttpError ? err : err instanceof ZodError ? invalidFromZod(err) : fromFrameworkError(err);
  const requestId = String(req.id ?? "");
  let body: ApiError;
  let status: number;
  if (known) {
    status = known.status;
    const issues = known.issues?.map((issue) => ({ path: shortened(issue.path, MAX_ISSUE_MESSAGE_LENGTH), message: shortened(issue.message, MAX_ISSUE_MESSAGE_LENGTH) }));
    body = { error: { code: known.code, message: shortened(known.message, MAX_MESSAGE_LENGTH), ...(issues ? { issues } : {}), requestId } };
  } else {
    status = 500;
    req.log?.error({ err: safeErrorForLog(err) }, "unhandled error");
    body = { error: { code: "internal", message: `Something went wrong (request ${requestId})`, requestId } };
  }
  if (res.headersSent) {
    res.end();
    return;
  }
  res.status(status).json(body);
};

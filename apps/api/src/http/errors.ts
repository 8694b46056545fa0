// Typed errors that handlers throw; the error middleware turns each into the one JSON
// error shape of @tributary/contracts with its HTTP status.
import type { ApiErrorCode } from "@tributary/contracts";

export interface FieldIssue {
  readonly path: string;
  readonly message: string;
}

export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly issues?: readonly FieldIssue[],
  ) {
    super(message);
    this.name = new.target.name;
  }
}

export class Invalid extends HttpError {
  constructor(message: string, issues?: readonly FieldIssue[]) {
    super(400, "invalid_input", message, issues);
  }
}

export class Unauthenticated extends HttpError {
  constructor(message = "Sign in to continue") {
    super(401, "unauthenticated", message);
  }
}

export class Forbidden extends HttpError {
  constructor(message = "You do not have access to this") {
    super(403, "forbidden", message);
  }
}

export class NotFound extends HttpError {
  constructor(message = "Not found") {
    super(404, "not_found", message);
  }
}

export class Conflict extends HttpError {
  constructor(message: string) {
    super(409, "conflict", message);
  }
}

export class TooLarge extends HttpError {
  constructor(message = "The request is too large") {
    super(413, "too_large", message);
  }
}

export class RateLimited extends HttpError {
  constructor(message = "Too many attempts. Wait a few minutes and try again") {
    super(429, "rate_limited", message);
  }
}

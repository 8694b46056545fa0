// The one way the web app talks to the API: JSON in, JSON out, the session cookie sent
// along, every failure turned into a typed ApiError.
import { apiErrorSchema, type ApiError as ApiErrorBody } from "@tributary/contracts";
import type { z } from "zod";
import { paths } from "../config/paths";

export type ApiErrorCode = ApiErrorBody["error"]["code"] | "network" | "unexpected_response";
export type ApiIssue = { path: string; message: string };

export class ApiError extends Error {
  override readonly name = "ApiError";
  constructor(
    /** HTTP status; 0 when the request never got an answer. */
    readonly status: number,
    readonly code: ApiErrorCode,
    message: string,
    readonly issues: ApiIssue[] = [],
  ) {
    super(message);
  }
}

const codeByStatus: Record<number, ApiErrorCode> = {
  400: "invalid_input",
  401: "unauthenticated",
  403: "forbidden",
  404: "not_found",
  409: "conflict",
  413: "too_large",
  429: "rate_limited",
};

const messageByCode: Partial<Record<ApiErrorCode, string>> = {
  invalid_input: "Some of what you entered is not valid.",
  unauthenticated: "Please sign in again.",
  forbidden: "Your role does not allow this.",
  not_found: "That was not found.",
  conflict: "This conflicts with a change someone else made.",
  too_large: "That is too large to send.",
  rate_limited: "Too many attempts. Please wait a moment and try again.",
};

/** The session's CSRF token: the API sets it in a cookie the page can read and wants it back on every write. */
export const csrfCookieName = "tributary_csrf";
export const csrfHeaderName = "X-CSRF-Token";

/** The token from the page's cookies, or null (not signed in). */
export function readCsrfToken(cookies: string = typeof document === "undefined" ? "" : document.cookie): string | null {
  for (const part of cookies.split(";")) {
    const at = part.indexOf("=");
    if (at < 0 || part.slice(0, at).trim() !== csrfCookieName) continue;
    const raw = part.slice(at + 1).trim();
    try {
      return decodeURIComponent(raw);
    } catch {
      return raw;
    }
  }
  return null;
}

export type RequestOptions = {
  signal?: AbortSignal;
  /** Send the browser to sign-in on a 401. Off for the calls where 401 is an expected answer. */
  redirectOnUnauthenticated?: boolean;
};

export type ApiClientConfig = {
  fetch?: typeof fetch;
  onUnauthenticated?: () => void;
};

async function errorFromResponse(response: Response): Promise<ApiError> {
  const fallbackCode = codeByStatus[response.status] ?? "internal";
  let body: unknown = null;
  try {
    body = await response.json();
  } catch {
    // Not JSON (a proxy page, an empty body): fall back to the status.
  }
  const parsed = apiErrorSchema.safeParse(body);
  if (parsed.success) {
    const { code, message, issues } = parsed.data.error;
    return new ApiError(response.status, code, message, issues ?? []);
  }
  const message = messageByCode[fallbackCode] ?? `The server could not complete the request (HTTP ${response.status}).`;
  return new ApiError(response.status, fallbackCode, message);
}

export function createApiClient(config: ApiClientConfig = {}) {
  const doFetch = config.fetch ?? ((input: RequestInfo | URL, init?: RequestInit) => globalThis.fetch(input, init));

  async function request<T>(method: string, url: string, schema: z.ZodType<T> | null, body: unknown, options: RequestOptions): Promise<T> {
    const headers: Record<string, string> = { Accept: "application/json" };
    // A FormData body (a file upload) sets its own multipart Content-Type with the boundary.
    const isForm = typeof FormData !== "undefined" && body instanceof FormData;
    if (body !== undefined && !isForm) headers["Content-Type"] = "application/json";
    if (method !== "GET" && method !== "HEAD") {
      const token = readCsrfToken();
      if (token) headers[csrfHeaderName] = token;
    }
    let response: Response;
    try {
      response = await doFetch(url, {
        method,
        headers,
        credentials: "same-origin",
        body: body === undefined ? undefined : isForm ? (body as FormData) : JSON.stringify(body),
        signal: options.signal,
      });
    } catch (cause) {
      if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
      throw new ApiError(0, "network", "Could not reach the server. Check your connection and try again.");
    }
    if (!response.ok) {
      const error = await errorFromResponse(response);
      if (response.status === 401 && options.redirectOnUnauthenticated !== false) config.onUnauthenticated?.();
      throw error;
    }
    if (response.status === 204 || schema === null) return undefined as T;
    let json: unknown;
    try {
      json = await response.json();
    } catch {
      throw new ApiError(response.status, "unexpected_response", "The server sent a response the app could not read.");
    }
    const parsed = schema.safeParse(json);
    if (!parsed.success) {
      throw new ApiError(response.status, "unexpected_response", "The server sent data in a shape the app does not expect.");
    }
    return parsed.data;
  }

  async function requestFile(url: string, options: RequestOptions): Promise<{ blob: Blob; fileName: string | null }> {
    let response: Response;
    try {
      response = await doFetch(url, { method: "GET", credentials: "same-origin", signal: options.signal });
    } catch (cause) {
      if (cause instanceof DOMException && cause.name === "AbortError") throw cause;
      throw new ApiError(0, "network", "Could not reach the server. Check your connection and try again.");
    }
    if (!response.ok) {
      const error = await errorFromResponse(response);
      if (response.status === 401 && options.redirectOnUnauthenticated !== false) config.onUnauthenticated?.();
      throw error;
    }
    const disposition = response.headers.get("Content-Disposition") ?? "";
    const fileName = /filename="?([^";]+)"?/i.exec(disposition)?.[1] ?? null;
    return { blob: await response.blob(), fileName };
  }

  return {
    get: <T>(url: string, schema: z.ZodType<T>, options: RequestOptions = {}) => request("GET", url, schema, undefined, options),
    post: <T>(url: string, schema: z.ZodType<T> | null, body?: unknown, options: RequestOptions = {}) =>
      request("POST", url, schema, body, options),
    /** Multipart POST, e.g. a file upload. */
    postForm: <T>(url: string, schema: z.ZodType<T> | null, form: FormData, options: RequestOptions = {}) =>
      request("POST", url, schema, form, options),
    put: <T>(url: string, schema: z.ZodType<T> | null, body?: unknown, options: RequestOptions = {}) =>
      request("PUT", url, schema, body, options),
    patch: <T>(url: string, schema: z.ZodType<T> | null, body?: unknown, options: RequestOptions = {}) =>
      request("PATCH", url, schema, body, options),
    delete: <T>(url: string, schema: z.ZodType<T> | null, options: RequestOptions = {}) =>
      request("DELETE", url, schema, undefined, options),
    /** GET a file (e.g. a PDF): its bytes and the file name the server suggests; failures become ApiErrors like any call. */
    getFile: (url: string, options: RequestOptions = {}) => requestFile(url, options),
  };
}

export type ApiClient = ReturnType<typeof createApiClient>;

/** A full page load to sign-in, remembering where the user was. */
export function redirectToSignIn(): void {
  const { pathname, search } = window.location;
  if (pathname === paths.auth.signIn.path) return;
  window.location.assign(paths.auth.signIn.getHref(pathname + search));
}

export const api = createApiClient({ onUnauthenticated: redirectToSignIn });

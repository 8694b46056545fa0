import { describe, expect, it, vi } from "vitest";
import { z } from "zod";
import { ApiError, createApiClient, csrfHeaderName, readCsrfToken } from "../api-client";

const thing = z.object({ id: z.string(), count: z.number() });

function respond(status: number, body: unknown, contentType = "application/json") {
  return vi.fn(async () => new Response(typeof body === "string" ? body : JSON.stringify(body), { status, headers: { "Content-Type": contentType } }));
}

async function caught(promise: Promise<unknown>): Promise<ApiError> {
  try {
    await promise;
  } catch (error) {
    if (error instanceof ApiError) return error;
    throw error;
  }
  throw new Error("expected the request to fail");
}

describe("api client", () => {
  it("returns the parsed body and sends the session cookie with JSON", async () => {
    const fetch = respond(200, { id: "a", count: 3 });
    const api = createApiClient({ fetch });
    await expect(api.post("/api/things", thing, { name: "x" })).resolves.toEqual({ id: "a", count: 3 });
    const [url, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(url).toBe("/api/things");
    expect(init.method).toBe("POST");
    expect(init.credentials).toBe("same-origin");
    expect(init.body).toBe(JSON.stringify({ name: "x" }));
    expect((init.headers as Record<string, string>)["Content-Type"]).toBe("application/json");
  });

  it("sends a file upload as multipart form data, letting the browser set the boundary", async () => {
    const fetch = respond(201, { id: "u1", count: 1 });
    const api = createApiClient({ fetch });
    const form = new FormData();
    form.append("file", new Blob(["week,brand\n"], { type: "text/csv" }), "data.csv");
    await expect(api.postForm("/api/uploads", thing, form)).resolves.toEqual({ id: "u1", count: 1 });
    const [, init] = fetch.mock.calls[0] as unknown as [string, RequestInit];
    expect(init.body).toBe(form);
    expect((init.headers as Record<string, string>)["Content-Type"]).toBeUndefined();
  });

  it("turns the JSON error shape into a typed ApiError with its issues", async () => {
    const body = {
      error: {
        code: "invalid_input",
        message: "Check the highlighted fields.",
        issues: [{ path: "email", message: "Enter a valid e-mail address" }],
      },
    };
    const api = createApiClient({ fetch: respond(400, body) });
    const error = await caught(api.post("/api/things", thing, {}));
    expect(error.status).toBe(400);
    expect(error.code).toBe("invalid_input");
    expect(error.message).toBe("Check the highlighted fields.");
    expect(error.issues).toEqual([{ path: "email", message: "Enter a valid e-mail address" }]);
  });

  it("falls back to the status when the error body is not our JSON shape", async () => {
    const api = createApiClient({ fetch: respond(502, "<html>Bad gateway</html>", "text/html") });
    const error = await caught(api.get("/api/things", thing));
    expect(error.status).toBe(502);
    expect(error.code).toBe("internal");
    expect(error.message).toMatch(/HTTP 502/);

    const forbidden = await caught(createApiClient({ fetch: respond(403, { unexpected: true }) }).get("/api/x", thing));
    expect(forbidden.code).toBe("forbidden");
  });

  it("reports a network failure as an ApiError with status 0", async () => {
    const api = createApiClient({ fetch: vi.fn(async () => Promise.reject(new TypeError("Failed to fetch"))) });
    const error = await caught(api.get("/api/things", thing));
    expect(error.status).toBe(0);
    expect(error.code).toBe("network");
    expect(error.message).toMatch(/could not reach the server/i);
  });

  it("rejects a success body of the wrong shape instead of passing it on", async () => {
    const api = createApiClient({ fetch: respond(200, { id: 7 }) });
    const error = await caught(api.get("/api/things", thing));
    expect(error.code).toBe("unexpected_response");
  });

  it("calls the sign-in redirect on 401 unless the call expects a 401", async () => {
    const body = { error: { code: "unauthenticated", message: "Your session has ended." } };
    const onUnauthenticated = vi.fn();
    const api = createApiClient({ fetch: respond(401, body), onUnauthenticated });

    const error = await caught(api.get("/api/portfolio", thing));
    expect(error.code).toBe("unauthenticated");
    expect(onUnauthenticated).toHaveBeenCalledTimes(1);

    await caught(api.get("/api/auth/me", thing, { redirectOnUnauthenticated: false }));
    expect(onUnauthenticated).toHaveBeenCalledTimes(1);
  });

  it("does not redirect on other errors", async () => {
    const onUnauthenticated = vi.fn();
    const api = createApiClient({ fetch: respond(403, { error: { code: "forbidden", message: "No." } }), onUnauthenticated });
    await caught(api.get("/api/x", thing));
    expect(onUnauthenticated).not.toHaveBeenCalled();
  });

  it("returns nothing for 204 and for calls without a response schema", async () => {
    const api = createApiClient({ fetch: vi.fn(async () => new Response(null, { status: 204 })) });
    await expect(api.post("/api/auth/sign-out", null)).resolves.toBeUndefined();
  });

  it("sends the session's CSRF token from its cookie on every write, multipart included, and never on reads", async () => {
    document.cookie = "tributary_csrf=tok%2Ben-1; path=/";
    try {
      const fetch = vi.fn(async () => new Response(null, { status: 204 }));
      const api = createApiClient({ fetch });
      const form = new FormData();
      form.append("file", new Blob(["week\n"]), "a.csv");
      await api.post("/api/a", null, {});
      await api.put("/api/a", null, {});
      await api.patch("/api/a", null, {});
      await api.delete("/api/a", null);
      await api.postForm("/api/a", null, form);
      await api.get("/api/a", z.unknown()).catch(() => undefined);
      await api.getFile("/api/a.csv").catch(() => undefined);
      const sent = fetch.mock.calls.map((call) => {
        const [, init] = call as unknown as [string, RequestInit];
        return [init.method, (init.headers as Record<string, string> | undefined)?.[csrfHeaderName]];
      });
      expect(sent).toEqual([
        ["POST", "tok+en-1"],
        ["PUT", "tok+en-1"],
        ["PATCH", "tok+en-1"],
        ["DELETE", "tok+en-1"],
        ["POST", "tok+en-1"],
        ["GET", undefined],
        ["GET", undefined],
      ]);
    } finally {
      document.cookie = "tributary_csrf=; expires=Thu, 01 Jan 1970 00:00:00 GMT; path=/";
    }
  });

  it("reads the token among other cookies, and null without one", () => {
    expect(readCsrfToken("a=1; tributary_csrf=xyz; b=2")).toBe("xyz");
    expect(readCsrfToken("a=1; not_tributary_csrf=xyz")).toBeNull();
    expect(readCsrfToken("")).toBeNull();
  });
});

import { z } from "zod";

/** The one JSON error shape every API error uses. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: z.enum([
      "invalid_input",
      "unauthenticated",
      "forbidden",
      "not_found",
      "conflict",
      "too_large",
      "rate_limited",
      "internal",
    ]),
    message: z.string(),
    /** Field-level problems, e.g. from zod: path and message. */
    issues: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
    /** The request's id (also in the X-Request-Id header), to quote when reporting a problem. */
    requestId: z.string().optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
export type ApiErrorCode = ApiError["error"]["code"];

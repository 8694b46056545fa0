import { z } from "zod";

/** GET /api/health: the server is up and its database answers. */
export const healthSchema = z.object({
  ok: z.boolean(),
  version: z.string(),
  database: z.enum(["up", "down"]),
});
export type Health = z.infer<typeof healthSchema>;

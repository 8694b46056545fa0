import { z } from "zod";
import { roleSchema } from "./roles";

export const signInInput = z.object({
  email: z.string().trim().toLowerCase().email("Enter a valid e-mail address").max(254),
  password: z.string().min(1, "Enter your password").max(256),
});
export type SignInInput = z.infer<typeof signInInput>;

export const currentUserSchema = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  role: roleSchema,
  /** Market ids a market manager may see; empty for roles that see every market. */
  marketIds: z.array(z.string()),
});
export type CurrentUser = z.infer<typeof currentUserSchema>;

import { z } from "zod";

/** The four roles of the product. A market manager is also scoped to markets. */
export const roles = ["admin", "portfolio_lead", "analyst", "market_manager"] as const;
export const roleSchema = z.enum(roles);
export type Role = z.infer<typeof roleSchema>;

export const roleLabels: Record<Role, string> = {
  admin: "Admin",
  portfolio_lead: "Portfolio lead",
  analyst: "Analyst",
  market_manager: "Market manager",
};

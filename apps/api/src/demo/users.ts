// Demo sign-ins, one per role. LOCAL DEMO ONLY: these passwords are public; the demo
// database must never be exposed beyond your own machine.
import type { Role } from "@tributary/contracts";
import type { DemoMarketCode } from "./demo-design";

export interface DemoUser {
  readonly email: string;
  readonly password: string;
  readonly name: string;
  readonly role: Role;
  /** Markets of a market manager (codes); empty for roles that see every market. */
  readonly markets: readonly DemoMarketCode[];
}

export const demoUsers = {
  admin: {
    email: "admin@quillfern.example",
    password: "demo-admin-quillfern",
    name: "Wren Castellane",
    role: "admin",
    markets: [],
  },
  portfolioLead: {
    email: "lead@quillfern.example",
    password: "demo-lead-quillfern",
    name: "Odile Marchetti-Vance",
    role: "portfolio_lead",
    markets: [],
  },
  analyst: {
    email: "analyst@quillfern.example",
    password: "demo-analyst-quillfern",
    name: "Tobiah Renquist",
    role: "analyst",
    markets: [],
  },
  /** Scoped to one market. */
  veltriaManager: {
    email: "veltria.manager@quillfern.example",
    password: "demo-veltria-quillfern",
    name: "Ilse Varnholt",
    role: "market_manager",
    markets: ["veltria"],
  },
  /** Scoped to two markets, one of them the recent launch. */
  southManager: {
    email: "south.manager@quillfern.example",
    password: "demo-south-quillfern",
    name: "Cassio Deliane",
    role: "market_manager",
    markets: ["marendi", "lunesse"],
  },
} as const satisfies Record<string, DemoUser>;

export const demoUserList: readonly DemoUser[] = Object.values(demoUsers);

// The API's route table: one module per resource; a new route is one entry in its module.
import type { Route } from "../access/route-table";
import { authRoutes } from "./auth";
import { brandRoutes } from "./brands";
import { channelRoutes } from "./channels";
import { dashboardRoutes } from "./dashboards";
import { flagRoutes } from "./flags";
import { healthRoutes } from "./health";
import { marketRoutes } from "./markets";
import { portfolioRoutes } from "./portfolio";
import { portfolioSettingsRoutes } from "./portfolio-settings";
import { datasetRoutes } from "./datasets";
import { liftTestRoutes } from "./lift-tests";
import { modelSettingsRoutes } from "./model-settings";
import { runRoutes } from "./runs";
import { planRoutes } from "./plans";
import { peopleRoutes } from "./people";
import { outboxRoutes } from "./outbox";
import { reportRoutes } from "./reports";
import { uploadRoutes } from "./uploads";

export const routeTable: readonly Route[] = [
  ...healthRoutes,
  ...authRoutes,
  ...portfolioRoutes,
  ...brandRoutes,
  ...marketRoutes,
  ...channelRoutes,
  ...uploadRoutes,
  ...datasetRoutes,
  ...liftTestRoutes,
  ...modelSettingsRoutes,
  ...runRoutes,
  ...dashboardRoutes,
  ...flagRoutes,
  ...planRoutes,
  ...peopleRoutes,
  ...portfolioSettingsRoutes,
  ...outboxRoutes,
  ...reportRoutes,
];

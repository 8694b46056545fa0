// The spend planner's forecasts run here, off the main thread, so the page stays responsive.
import { expose } from "comlink";
import { createPlannerApi } from "./planner-api";

expose(createPlannerApi());

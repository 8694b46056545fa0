import type { ScreenKey } from "./paths";

export type ScreenSection = "results" | "modelling" | "planning" | "workspace";

export const screenSectionLabels: Record<ScreenSection, string> = {
  results: "Results",
  modelling: "Modelling",
  planning: "Planning",
  workspace: "Workspace",
};

/** The screens of the product under their own names, in navigation order. */
export const screens: Record<ScreenKey, { label: string; section: ScreenSection }> = {
  portfolioMap: { label: "Portfolio map", section: "results" },
  brandComparison: { label: "Brand comparison", section: "results" },
  marketDesk: { label: "Market desk", section: "results" },
  channelSheet: { label: "Channel sheet", section: "results" },
  dataIntake: { label: "Data intake", section: "modelling" },
  modelSetup: { label: "Model setup", section: "modelling" },
  runs: { label: "Runs", section: "modelling" },
  poolingReview: { label: "Pooling review", section: "modelling" },
  spendPlanner: { label: "Spend planner", section: "planning" },
  budgetSplit: { label: "Budget split", section: "planning" },
  peopleAccess: { label: "People & access", section: "workspace" },
  portfolioSettings: { label: "Portfolio settings", section: "workspace" },
  outbox: { label: "Outbox", section: "workspace" },
};

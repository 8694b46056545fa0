import { roles, type Role } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import type { ScreenKey } from "../../config/paths";
import { screens } from "../../config/screens";
import { canUseScreen, homeScreenFor, navigationFor } from "../authorization";

function labelsFor(role: Role): string[] {
  return navigationFor(role).flatMap((section) => section.items.map((item) => item.label));
}

describe("role-based navigation", () => {
  it("gives the admin every screen", () => {
    expect(labelsFor("admin")).toEqual(Object.values(screens).map((screen) => screen.label));
    expect(labelsFor("admin")).toHaveLength(13);
  });

  it("gives the portfolio lead the dashboards and planning", () => {
    expect(labelsFor("portfolio_lead")).toEqual([
      "Portfolio map",
      "Brand comparison",
      "Market desk",
      "Channel sheet",
      "Spend planner",
      "Budget split",
    ]);
  });

  it("gives the analyst the dashboards, modelling and planning but no workspace admin", () => {
    const labels = labelsFor("analyst");
    expect(labels).toEqual(expect.arrayContaining(["Data intake", "Model setup", "Runs", "Pooling review", "Spend planner", "Budget split"]));
    expect(labels).not.toContain("People & access");
    expect(labels).not.toContain("Portfolio settings");
    expect(labels).not.toContain("Outbox");
  });

  it("gives the market manager their desk first and no modelling, budget split or admin screens", () => {
    expect(labelsFor("market_manager")).toEqual([
      "Market desk",
      "Portfolio map",
      "Brand comparison",
      "Channel sheet",
      "Spend planner",
    ]);
    for (const screen of ["dataIntake", "modelSetup", "runs", "poolingReview", "budgetSplit", "peopleAccess", "portfolioSettings", "outbox"] as ScreenKey[]) {
      expect(canUseScreen("market_manager", screen)).toBe(false);
    }
  });

  it("only lists screens the role may open, and every role's home is one of them", () => {
    for (const role of roles) {
      for (const section of navigationFor(role)) {
        for (const item of section.items) expect(canUseScreen(role, item.screen)).toBe(true);
      }
      expect(canUseScreen(role, homeScreenFor(role))).toBe(true);
    }
    expect(homeScreenFor("market_manager")).toBe("marketDesk");
    expect(homeScreenFor("portfolio_lead")).toBe("portfolioMap");
  });
});

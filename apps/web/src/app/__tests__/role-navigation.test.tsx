import { screen, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { jsonResponse, renderApp, signedInRoutes, testUsers } from "../../testing/test-utils";

function mainNavigationLinks(): string[] {
  const nav = screen.getByRole("navigation", { name: "Main" });
  return within(nav)
    .getAllByRole("link")
    .map((link) => link.textContent ?? "");
}

describe("app navigation by role", () => {
  it("sends a market manager from / to the Market desk and shows only their screens", async () => {
    const { router } = renderApp("/", signedInRoutes(testUsers.market_manager));
    expect(await screen.findByRole("heading", { level: 1, name: "Market desk" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/market-desk");
    expect(mainNavigationLinks()).toEqual(["Market desk", "Portfolio map", "Brand comparison", "Channel sheet", "Spend planner"]);
    expect(screen.getByText("Markets: Briskmoor")).toBeTruthy();
  });

  it("shows every screen to the admin, People & access, Portfolio settings and Outbox included", async () => {
    renderApp("/portfolio-map", signedInRoutes(testUsers.admin));
    expect(await screen.findByRole("heading", { level: 1, name: "Portfolio map" })).toBeTruthy();
    const links = mainNavigationLinks();
    expect(links).toHaveLength(13);
    expect(links).toContain("People & access");
    expect(links).toContain("Portfolio settings");
    expect(links).toContain("Outbox");
    expect(screen.getByRole("link", { name: "Portfolio map" }).getAttribute("aria-current")).toBe("page");
  });

  it("explains that a screen is not available when a role opens it directly", async () => {
    const { calls } = renderApp("/people-access", signedInRoutes(testUsers.market_manager));
    expect(await screen.findByRole("heading", { name: "People & access is not available for your role" })).toBeTruthy();
    expect(within(screen.getByRole("main")).getByText("Market manager")).toBeTruthy();
    expect(screen.getByRole("link", { name: "Go to Market desk" }).getAttribute("href")).toBe("/market-desk");
    // Nothing is fetched for a screen the role may not use.
    expect(new Set(calls.map((call) => call.path))).toEqual(new Set(["/api/auth/me", "/api/portfolio"]));
  });

  it("keeps the analyst out of People & access but lets them into Runs", async () => {
    const first = renderApp("/outbox", signedInRoutes(testUsers.analyst));
    expect(await screen.findByRole("heading", { name: "Outbox is not available for your role" })).toBeTruthy();
    first.unmount();
    renderApp("/runs", signedInRoutes(testUsers.analyst));
    expect(await screen.findByRole("heading", { level: 1, name: "Runs" })).toBeTruthy();
  });

  it("sends a visitor without a session to sign-in, remembering the screen", async () => {
    const { router } = renderApp("/budget-split", {
      "GET /api/auth/me": () => jsonResponse(401, { error: { code: "unauthenticated", message: "Sign in first." } }),
    });
    expect(await screen.findByRole("heading", { name: "Sign in to Tributary" })).toBeTruthy();
    expect(router.state.location.pathname).toBe("/sign-in");
    expect(router.state.location.search).toBe("?redirectTo=%2Fbudget-split");
  });

  it("shows the portfolio only with the markets the server sent", async () => {
    renderApp("/portfolio-map", signedInRoutes(testUsers.market_manager));
    const grid = await screen.findByRole("table", { name: /Brands × markets/ });
    const columnHeaders = within(grid)
      .getAllByRole("columnheader")
      .map((header) => header.textContent);
    expect(columnHeaders).toEqual(["Brand", "Briskmoor"]);
    expect(screen.getByText("Showing your markets only: Briskmoor.")).toBeTruthy();
  });
});

// Shared test helpers: render with the app's providers, answer fetch calls from a table.
import type { CurrentUser, Portfolio } from "@tributary/contracts";
import type { QueryClient } from "@tanstack/react-query";
import { cleanup, render } from "@testing-library/react";
import type { ReactElement } from "react";
import { createMemoryRouter, RouterProvider } from "react-router-dom";
import { afterEach, vi } from "vitest";
import { AppProvider } from "../app/provider";
import { createAppRoutes } from "../app/router";
import { createQueryClient } from "../lib/query-client";

afterEach(() => {
  cleanup();
  vi.unstubAllGlobals();
});

export function jsonResponse(status: number, body: unknown): Response {
  return new Response(body === undefined ? null : JSON.stringify(body), {
    status,
    headers: { "Content-Type": "application/json" },
  });
}

export type FetchHandler = (request: { method: string; path: string; body: unknown }) => Response | Promise<Response>;

/** Stubs global fetch: "GET /api/portfolio" → handler. Unknown routes answer 404. */
export function stubFetch(routes: Record<string, FetchHandler>) {
  const calls: { method: string; path: string; body: unknown; credentials: RequestCredentials | undefined }[] = [];
  const fetchMock = vi.fn(async (input: RequestInfo | URL, init?: RequestInit) => {
    const method = (init?.method ?? "GET").toUpperCase();
    const path = new URL(String(input), "http://localhost").pathname;
    const body = typeof init?.body === "string" ? (JSON.parse(init.body) as unknown) : undefined;
    calls.push({ method, path, body, credentials: init?.credentials });
    const handler = routes[`${method} ${path}`];
    if (!handler) return jsonResponse(404, { error: { code: "not_found", message: `No route ${method} ${path}` } });
    return handler({ method, path, body });
  });
  vi.stubGlobal("fetch", fetchMock);
  return { fetchMock, calls };
}

export function renderWithProviders(ui: ReactElement, queryClient: QueryClient = createQueryClient()) {
  return { queryClient, ...render(<AppProvider queryClient={queryClient}>{ui}</AppProvider>) };
}

/** The whole app (every route) in memory at `path`, talking to a stubbed API. */
export function renderApp(path: string, routes: Record<string, FetchHandler>) {
  const api = stubFetch(routes);
  const queryClient = createQueryClient();
  queryClient.setDefaultOptions({ queries: { ...queryClient.getDefaultOptions().queries, retry: false } });
  const router = createMemoryRouter(createAppRoutes(queryClient), { initialEntries: [path] });
  const view = render(
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>,
  );
  return { ...view, router, queryClient, ...api };
}

// Invented test data: a fictional group with fictional brands and markets.
export const testMarkets = [
  { id: "m-ard", code: "ardeval", name: "Ardeval" },
  { id: "m-bri", code: "brisk", name: "Briskmoor" },
  { id: "m-cel", code: "celo", name: "Celowen" },
];

export function testPortfolio(marketIds?: string[]): Portfolio {
  const markets = marketIds ? testMarkets.filter((market) => marketIds.includes(market.id)) : testMarkets;
  const brands = [
    { id: "b-fen", code: "fennick", name: "Fennick", customerValue: 120 },
    { id: "b-hol", code: "hollo", name: "Hollowby", customerValue: null },
  ];
  const cells = [
    { id: "c1", brandId: "b-fen", marketId: "m-ard", weeks: 104, firstWeek: "2023-01-02", lastWeek: "2024-12-23" },
    { id: "c2", brandId: "b-fen", marketId: "m-bri", weeks: 20, firstWeek: "2024-08-05", lastWeek: "2024-12-16" },
    { id: "c3", brandId: "b-hol", marketId: "m-ard", weeks: 52, firstWeek: "2024-01-01", lastWeek: "2024-12-23" },
    { id: "c4", brandId: "b-hol", marketId: "m-cel", weeks: 104, firstWeek: "2023-01-02", lastWeek: "2024-12-23" },
  ].filter((cell) => markets.some((market) => market.id === cell.marketId));
  return {
    company: "Tallowmere Goods Co",
    currency: "EUR",
    brands,
    markets,
    channels: [
      { id: "ch-s", code: "search", name: "Search" },
      { id: "ch-r", code: "radio", name: "Radio" },
    ],
    cells,
    datasetVersionId: "dv-1",
  };
}

export const testUsers: Record<CurrentUser["role"], CurrentUser> = {
  admin: { id: "u-a", email: "admin@tallowmere.test", name: "Ada Quern", role: "admin", marketIds: [] },
  portfolio_lead: { id: "u-l", email: "lead@tallowmere.test", name: "Lior Pask", role: "portfolio_lead", marketIds: [] },
  analyst: { id: "u-n", email: "analyst@tallowmere.test", name: "Nell Ostrand", role: "analyst", marketIds: [] },
  market_manager: {
    id: "u-m",
    email: "manager@tallowmere.test",
    name: "Mika Dorne",
    role: "market_manager",
    marketIds: ["m-bri"],
  },
};

/** API routes for a signed-in user; the portfolio is scoped like the server scopes it. */
export function signedInRoutes(user: CurrentUser): Record<string, FetchHandler> {
  return {
    "GET /api/auth/me": () => jsonResponse(200, user),
    "GET /api/portfolio": () =>
      jsonResponse(200, testPortfolio(user.role === "market_manager" ? user.marketIds : undefined)),
    "POST /api/auth/sign-out": () => new Response(null, { status: 204 }),
  };
}

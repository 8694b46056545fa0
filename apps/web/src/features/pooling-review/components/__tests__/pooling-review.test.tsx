import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import type { PoolingReview } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { publishedRun, testFlag, testPoolingReview } from "../../../../testing/dashboard-fixtures";
import { testRun } from "../../../../testing/run-fixtures";
import { jsonResponse, renderApp, signedInRoutes, testUsers } from "../../../../testing/test-utils";

describe("pooling review screen", () => {
  it("lists pooling factors, candidate outliers and flags with who raised them", async () => {
    renderApp("/pooling-review", {
      ...signedInRoutes(testUsers.analyst),
      "GET /api/dashboards/pooling-review": () => jsonResponse(200, testPoolingReview()),
      "GET /api/flags": () => jsonResponse(200, [testFlag()]),
    });
    const outliers = await screen.findByRole("region", { name: "Candidate outliers" }, { timeout: 5000 });
    expect(within(outliers).getByText("Fennick · Briskmoor · Search")).toBeTruthy();
    expect(within(outliers).getByText("Its own interval excludes the group estimate.")).toBeTruthy();
    const factors = screen.getByRole("table", { name: "Pooling factors" });
    expect(within(factors).getByRole("row", { name: /Brands/ }).textContent).toContain("0.42");
    const flags = await screen.findByRole("table", { name: "Flags" });
    expect(within(flags).getByRole("row", { name: /Nell Ostrand/ }).textContent).toContain("Only 20 weeks; confirm before moving budget.");
    expect(screen.getByRole("figure", { name: "How far pooling moved each estimate" })).toBeTruthy();
  });

  it("flags an outlier from its own button and refreshes the dashboards and the flag list", async () => {
    let flagged = false;
    const review = (): PoolingReview => {
      const base = testPoolingReview();
      if (!flagged) return base;
      return { ...base, flags: [...base.flags, testFlag({ id: "flag-2", cellId: "c1", channel: "radio", channelName: "Radio", kind: "real_difference" })], rows: base.rows.map((row) => (row.cellId === "c1" ? { ...row, flagIds: ["flag-2"] } : row)) };
    };
    const { calls } = renderApp("/pooling-review", {
      ...signedInRoutes(testUsers.analyst),
      "GET /api/dashboards/pooling-review": () => jsonResponse(200, review()),
      "GET /api/flags": () => jsonResponse(200, flagged ? [testFlag({ id: "flag-2", kind: "real_difference" }), testFlag()] : [testFlag()]),
      "POST /api/flags": ({ body }) => {
        flagged = true;
        return jsonResponse(201, testFlag({ id: "flag-2", ...(body as object) }));
      },
    });
    await screen.findByRole("region", { name: "Candidate outliers" }, { timeout: 5000 });
    fireEvent.click(screen.getByRole("button", { name: "Flag Fennick · Ardeval · Radio" }));
    const form = screen.getByRole("form", { name: "Flag an estimate" });
    await waitFor(() => expect((within(form).getByLabelText("Cell") as HTMLSelectElement).value).toBe("c1"));
    fireEvent.click(within(form).getByLabelText(/Real difference/));
    fireEvent.change(within(form).getByLabelText("Note"), { target: { value: "Ardeval radio ran a different creative all year." } });
    fireEvent.click(within(form).getByRole("button", { name: "Flag this estimate" }));
    await within(form).findByRole("status");
    expect(calls.find((call) => call.method === "POST")?.body).toEqual({
      cellId: "c1",
      channel: "radio",
      kind: "real_difference",
      note: "Ardeval radio ran a different creative all year.",
      runId: "run-7f3a9c21",
    });
    // Flags show on every dashboard: the review is fetched again after the flag is saved.
    const postAt = calls.findIndex((call) => call.method === "POST");
    await waitFor(() => expect(calls.slice(postAt).some((call) => call.path === "/api/dashboards/pooling-review")).toBe(true));
    await waitFor(() => expect(within(screen.getByRole("table", { name: "Flags" })).getAllByRole("row")).toHaveLength(3));
  });

  it("reviews an earlier finished run chosen from the list, and says it is not the current one", async () => {
    const older = testRun({ id: "run-0e1d2c3b", current: false, datasetVersionNumber: 2, finishedAt: "2025-01-10T09:00:00.000Z" });
    let chosen = false;
    const { router } = renderApp("/pooling-review", {
      ...signedInRoutes(testUsers.admin),
      "GET /api/runs": () => jsonResponse(200, [publishedRun, older]),
      "GET /api/dashboards/pooling-review": () => jsonResponse(200, chosen ? { ...testPoolingReview(), run: older } : testPoolingReview()),
      "GET /api/flags": () => jsonResponse(200, []),
    });
    const picker = await screen.findByRole("combobox", { name: "Run to review" }, { timeout: 5000 });
    expect(within(picker).getAllByRole("option").map((option) => option.textContent)).toEqual([
      expect.stringMatching(/^run run-7f3a \(dataset version 3\), fitted .* · current · not trustworthy$/),
      expect.stringMatching(/^run run-0e1d \(dataset version 2\), fitted 10 Jan 2025/),
    ]);
    chosen = true;
    fireEvent.change(picker, { target: { value: "run-0e1d2c3b" } });
    await waitFor(() => expect(router.state.location.search).toBe("?run=run-0e1d2c3b"));
    const fetchMock = globalThis.fetch as unknown as { mock: { calls: [RequestInfo | URL][] } };
    await waitFor(() => expect(fetchMock.mock.calls.map(([url]) => String(url))).toContain("/api/dashboards/pooling-review?run=run-0e1d2c3b"));
    await waitFor(() => expect(screen.getByRole("region", { name: "Published run" }).textContent).toContain("You are reviewing a run that is not the current published fit, run run-0e1d"));
  });
});

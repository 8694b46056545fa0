import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { renderApp, signedInRoutes, testUsers } from "../../../testing/test-utils";

describe("the account menu", () => {
  it("signs out on every device with POST /api/auth/sign-out-all, then shows sign-in", async () => {
    let ended = 0;
    const { router, calls } = renderApp("/runs", {
      ...signedInRoutes(testUsers.analyst),
      "POST /api/auth/sign-out-all": () => {
        ended++;
        return new Response(null, { status: 204 });
      },
    });
    await screen.findByRole("heading", { level: 1, name: "Runs" });
    const account = screen.getByRole("region", { name: "Your account" });
    fireEvent.click(within(account).getByRole("button", { name: "Sign out everywhere" }));
    await waitFor(() => expect(router.state.location.pathname).toBe("/sign-in"));
    expect(ended).toBe(1);
    // Only everywhere: not the plain sign-out as well.
    expect(calls.filter((call) => call.method === "POST").map((call) => call.path)).toEqual(["/api/auth/sign-out-all"]);
  });
});

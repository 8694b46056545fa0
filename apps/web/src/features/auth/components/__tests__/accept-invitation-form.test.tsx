import type { InvitationLookup } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { jsonResponse, renderApp, testUsers } from "../../../../testing/test-utils";

const token = "k7Qm2xV9pL4rT8wZ1nB6cD3fG5hJ0sA";
const lookup: InvitationLookup = { email: "nell.ostrand@tallowmere.test", role: "analyst", expiresAt: "2025-02-01T12:00:00.000Z", company: "Tallowmere Goods Co" };

function open(routes: Parameters<typeof renderApp>[1] = {}) {
  return renderApp(`/invite/${token}`, {
    "GET /api/auth/me": () => jsonResponse(401, { error: { code: "unauthenticated", message: "Please sign in." } }),
    [`GET /api/invitations/${token}`]: () => jsonResponse(200, lookup),
    ...routes,
  });
}

const fill = (label: string, value: string) => fireEvent.change(screen.getByLabelText(label), { target: { value } });

describe("the invitation page", () => {
  it("says who is invited, as what, and shows the password rules", async () => {
    open();
    const form = await screen.findByRole("form", { name: "Accept the invitation" }, { timeout: 5000 });
    expect(form.textContent).toMatch(/Tallowmere Goods Co's Tributary workspace as Analyst, with the e-mail address nell.ostrand@tallowmere.test/);
    const rules = within(screen.getByRole("list", { name: "Password rules" })).getAllByRole("listitem");
    expect(rules.map((rule) => rule.textContent)).toEqual([
      "·At least 12 characters (not met yet)",
      "·Not your e-mail address or the part before @ (not met yet)",
      "·Not a common password (not met yet)",
    ]);
    fill("Choose a password", "slow river at dusk");
    expect(within(screen.getByRole("list", { name: "Password rules" })).getAllByText(/\(met\)/)).toHaveLength(3);
    expect(document.title).toBe("Accept your invitation · Tributary");
  });

  it("checks every field before sending anything", async () => {
    const { calls } = open();
    await screen.findByRole("form", { name: "Accept the invitation" }, { timeout: 5000 });
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("Enter your name")).toBeTruthy();
    expect(screen.getByText("Choose a password of at least 12 characters")).toBeTruthy();

    fill("Your name", "Nell Ostrand");
    fill("Choose a password", "short");
    fill("Repeat the password", "short");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("Use at least 12 characters")).toBeTruthy();

    fill("Choose a password", "Password1234");
    fill("Repeat the password", "Password1234");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("This password is too common; choose another")).toBeTruthy();

    fill("Choose a password", "nell.ostrand@tallowmere.test");
    fill("Repeat the password", "nell.ostrand@tallowmere.test");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("Do not use your e-mail address as the password")).toBeTruthy();

    fill("Choose a password", "slow river at dusk");
    fill("Repeat the password", "slow river at dawn");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("The two passwords are not the same")).toBeTruthy();
    expect(screen.getByLabelText("Repeat the password").getAttribute("aria-invalid")).toBe("true");
    expect(calls.filter((call) => call.method === "POST")).toHaveLength(0);
  });

  it("creates the account with the name and password only, and goes into the app signed in", async () => {
    const newUser = { ...testUsers.analyst, email: lookup.email, name: "Nell Ostrand" };
    const { calls, router } = open({
      [`POST /api/invitations/${token}/accept`]: () => jsonResponse(201, newUser),
      "GET /api/portfolio": () => jsonResponse(200, { company: "Tallowmere Goods Co", currency: "EUR", brands: [], markets: [], channels: [], cells: [], datasetVersionId: null }),
    });
    await screen.findByRole("form", { name: "Accept the invitation" }, { timeout: 5000 });
    fill("Your name", "  Nell Ostrand ");
    fill("Choose a password", "slow river at dusk");
    fill("Repeat the password", "slow river at dusk");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    await waitFor(() => expect(router.state.location.pathname).not.toBe(`/invite/${token}`), { timeout: 5000 });
    expect(calls.find((call) => call.method === "POST")?.body).toEqual({ name: "Nell Ostrand", password: "slow river at dusk" });
  });

  it("shows the server's refusal of a password beside the field", async () => {
    open({
      [`POST /api/invitations/${token}/accept`]: () =>
        jsonResponse(400, { error: { code: "invalid_input", message: "Use another password.", issues: [{ path: "password", message: "Use another password" }] } }),
    });
    await screen.findByRole("form", { name: "Accept the invitation" }, { timeout: 5000 });
    fill("Your name", "Nell Ostrand");
    fill("Choose a password", "slow river at dusk");
    fill("Repeat the password", "slow river at dusk");
    fireEvent.click(screen.getByRole("button", { name: "Create my account" }));
    expect(await screen.findByText("Use another password")).toBeTruthy();
  });

  it("explains an expired link and a used one, with a way to sign in", async () => {
    open({
      [`GET /api/invitations/${token}`]: () =>
        jsonResponse(409, { error: { code: "conflict", message: "This invitation link expired on 2025-01-03 12:00 UTC. Ask an admin to send a new one" } }),
    });
    expect((await screen.findByRole("alert", {}, { timeout: 5000 })).textContent).toBe("This invitation link expired on 2025-01-03 12:00 UTC. Ask an admin to send a new one.");
    expect(screen.getByRole("heading", { level: 1, name: "This invitation link does not work" })).toBeTruthy();
    expect(screen.getByRole("link", { name: "Sign in" }).getAttribute("href")).toBe("/sign-in");
  });

  it("explains a link that was used or withdrawn", async () => {
    open({
      [`GET /api/invitations/${token}`]: () =>
        jsonResponse(404, { error: { code: "not_found", message: "This invitation link does not work: it may have been used already or withdrawn. Ask an admin for a new invitation" } }),
    });
    expect((await screen.findByRole("alert", {}, { timeout: 5000 })).textContent).toMatch(/may have been used already or withdrawn/);
    expect(screen.queryByRole("form", { name: "Accept the invitation" })).toBeNull();
  });
});

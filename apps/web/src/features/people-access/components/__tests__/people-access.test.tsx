import type { AuditLogPage, Invitation, Person } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { jsonResponse, renderWithProviders, stubFetch, testMarkets, testUsers } from "../../../../testing/test-utils";
import { PeopleAccess } from "../people-access";

const people: Person[] = [
  { id: "u-a", email: "admin@tallowmere.test", name: "Ada Quern", role: "admin", markets: [], disabled: false, createdAt: "2024-12-01T08:00:00.000Z", lastSignInAt: "2025-01-08T08:00:00.000Z" },
  { id: "u-m", email: "manager@tallowmere.test", name: "Mika Dorne", role: "market_manager", markets: [{ id: "m-bri", name: "Briskmoor" }], disabled: false, createdAt: "2024-12-01T08:00:00.000Z", lastSignInAt: null },
];

const invitation: Invitation = {
  id: "inv-1",
  email: "new.analyst@tallowmere.test",
  role: "analyst",
  markets: [],
  status: "pending",
  invitedBy: { id: "u-a", name: "Ada Quern" },
  createdAt: "2025-01-08T09:00:00.000Z",
  expiresAt: "2025-01-11T09:00:00.000Z",
  acceptedAt: null,
  acceptedUser: null,
  revokedAt: null,
};

function auditPage(page: number, total = 60): AuditLogPage {
  return {
    entries: Array.from({ length: Math.min(25, total - (page - 1) * 25) }, (_, i) => ({
      id: 1000 - (page - 1) * 25 - i,
      at: "2025-01-08T09:00:00.000Z",
      user: { id: "u-a", name: "Ada Quern" },
      action: i % 2 ? "invitation_sent" : "sign_in",
      target: i % 2 ? "invitation:inv-1" : "user:u-a",
      details: i % 2 ? { email: "new.analyst@tallowmere.test", role: "analyst" } : null,
    })),
    total,
    page,
    pageSize: 25,
    actions: ["invitation_sent", "sign_in", "user_updated"],
  };
}

function routes(extra: Parameters<typeof stubFetch>[0] = {}) {
  return stubFetch({
    "GET /api/people": () => jsonResponse(200, people),
    "GET /api/invitations": () => jsonResponse(200, [invitation]),
    "GET /api/audit-log": () => jsonResponse(200, auditPage(1)),
    ...extra,
  });
}

describe("People & access", () => {
  it("lists people with their role and markets, and invitations with their status", async () => {
    routes();
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    const table = await screen.findByRole("table", { name: "People" });
    expect(within(table).getByRole("row", { name: /Mika Dorne/ }).textContent).toMatch(/Market manager.*Briskmoor.*never/);
    expect(within(table).getByRole("row", { name: /Ada Quern/ }).textContent).toMatch(/Admin.*every market/);
    const invitations = await screen.findByRole("table", { name: "Invitations" });
    expect(within(invitations).getByRole("row", { name: /new.analyst@tallowmere.test/ }).textContent).toMatch(/Analyst.*Waiting/);
  });

  it("checks the invitation form: a valid address, and markets only for a market manager", async () => {
    const { calls } = routes({ "POST /api/invitations": ({ body }) => jsonResponse(201, { ...invitation, id: "inv-2", email: (body as { email: string }).email, role: "market_manager", markets: [{ id: "m-ard", name: "Ardeval" }] }) });
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    const form = await screen.findByRole("form", { name: "Invite someone" });
    fireEvent.change(within(form).getByLabelText("E-mail address"), { target: { value: "not an address" } });
    fireEvent.click(within(form).getByRole("button", { name: "Send invitation" }));
    expect(await within(form).findByText("Enter a valid e-mail address")).toBeTruthy();
    expect(within(form).getByText("Choose at least one market for a market manager")).toBeTruthy();
    expect(calls.filter((call) => call.method === "POST")).toHaveLength(0);

    fireEvent.change(within(form).getByLabelText("E-mail address"), { target: { value: "  Ilse.Varn@Tallowmere.test " } });
    fireEvent.click(within(form).getByRole("checkbox", { name: "Ardeval" }));
    fireEvent.click(within(form).getByRole("button", { name: "Send invitation" }));
    expect((await within(form).findByRole("status")).textContent).toBe("Invitation sent to ilse.varn@tallowmere.test as Market manager for Ardeval. The e-mail is in the Outbox.");
    expect(calls.find((call) => call.method === "POST")?.body).toEqual({ email: "ilse.varn@tallowmere.test", role: "market_manager", marketIds: ["m-ard"] });
  });

  it("sends no markets for a role that sees every market, and shows the server's refusal", async () => {
    const { calls } = routes({
      "POST /api/invitations": () => jsonResponse(409, { error: { code: "conflict", message: "lior@tallowmere.test already has an account" } }),
    });
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    const form = await screen.findByRole("form", { name: "Invite someone" });
    fireEvent.click(within(form).getByRole("checkbox", { name: "Celowen" }));
    fireEvent.change(within(form).getByLabelText("Role"), { target: { value: "portfolio_lead" } });
    expect(within(form).getByText("Portfolio leads see every market.")).toBeTruthy();
    fireEvent.change(within(form).getByLabelText("E-mail address"), { target: { value: "lior@tallowmere.test" } });
    fireEvent.click(within(form).getByRole("button", { name: "Send invitation" }));
    expect((await within(form).findByRole("alert")).textContent).toBe("lior@tallowmere.test already has an account");
    expect(calls.find((call) => call.method === "POST")?.body).toEqual({ email: "lior@tallowmere.test", role: "portfolio_lead", marketIds: [] });
  });

  it("changes a person's role and markets, and disables them", async () => {
    const { calls } = routes({ "PATCH /api/people/u-m": ({ body }) => jsonResponse(200, { ...people[1]!, ...(body as object), markets: [{ id: "m-bri", name: "Briskmoor" }, { id: "m-cel", name: "Celowen" }] }) });
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    fireEvent.click(await screen.findByRole("button", { name: "Change Mika Dorne" }));
    const editor = screen.getByRole("form", { name: "Change Mika Dorne" });
    fireEvent.click(within(editor).getByRole("checkbox", { name: "Briskmoor" }));
    fireEvent.click(within(editor).getByRole("button", { name: "Save role and markets" }));
    expect(within(editor).getByRole("alert").textContent).toBe("Choose at least one market for a market manager");
    fireEvent.click(within(editor).getByRole("checkbox", { name: "Briskmoor" }));
    fireEvent.click(within(editor).getByRole("checkbox", { name: "Celowen" }));
    fireEvent.click(within(editor).getByRole("button", { name: "Save role and markets" }));
    await within(editor).findByText("Saved: Mika Dorne is now Market manager for Briskmoor, Celowen.");
    fireEvent.click(within(editor).getByRole("button", { name: "Disable" }));
    await waitFor(() => expect(calls.filter((call) => call.method === "PATCH")).toHaveLength(2));
    expect(calls.filter((call) => call.method === "PATCH").map((call) => call.body)).toEqual([{ role: "market_manager", marketIds: ["m-bri", "m-cel"] }, { disabled: true }]);
  });

  it("keeps an admin from changing their own role", async () => {
    routes();
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    fireEvent.click(await screen.findByRole("button", { name: "Change Ada Quern" }));
    const editor = screen.getByRole("form", { name: "Change Ada Quern" });
    expect(within(editor).getByText(/This is you/)).toBeTruthy();
    expect((within(editor).getByLabelText("Role") as HTMLSelectElement).disabled).toBe(true);
    expect((within(editor).getByRole("button", { name: "Disable" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("resends and revokes invitations", async () => {
    const { calls } = routes({
      "POST /api/invitations/inv-1/resend": () => jsonResponse(200, invitation),
      "POST /api/invitations/inv-1/revoke": () => jsonResponse(409, { error: { code: "conflict", message: "This invitation was accepted; disable the user instead" } }),
    });
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    fireEvent.click(await screen.findByRole("button", { name: "Resend the invitation to new.analyst@tallowmere.test" }));
    expect(await screen.findByText("A new link was sent to new.analyst@tallowmere.test; the old one no longer works.")).toBeTruthy();
    fireEvent.click(screen.getByRole("button", { name: "Revoke the invitation to new.analyst@tallowmere.test" }));
    expect(await screen.findByText("This invitation was accepted; disable the user instead")).toBeTruthy();
    expect(calls.filter((call) => call.method === "POST").map((call) => call.path)).toEqual(["/api/invitations/inv-1/resend", "/api/invitations/inv-1/revoke"]);
  });

  it("pages and filters the audit log on the server", async () => {
    const { fetchMock } = routes({
      "GET /api/audit-log": () => {
        const url = String(fetchMock.mock.calls.at(-1)?.[0]);
        const page = Number(new URL(url, "http://localhost").searchParams.get("page"));
        return jsonResponse(200, auditPage(page));
      },
    });
    renderWithProviders(<PeopleAccess user={testUsers.admin} markets={testMarkets} />);
    const log = await screen.findByRole("table", { name: "Audit log (page 1 of 3)" });
    expect(within(log).getAllByRole("row")).toHaveLength(26);
    expect(within(log).getAllByText("invitation sent").length).toBeGreaterThan(0);
    expect(within(log).getAllByText("email: new.analyst@tallowmere.test; role: analyst").length).toBeGreaterThan(0);
    fireEvent.click(screen.getByRole("button", { name: "Older" }));
    await screen.findByRole("table", { name: "Audit log (page 2 of 3)" });
    fireEvent.change(screen.getByLabelText("Action"), { target: { value: "sign_in" } });
    fireEvent.change(screen.getByLabelText("Person"), { target: { value: "u-a" } });
    await waitFor(() => expect(fetchMock.mock.calls.map(([url]) => String(url))).toContain("/api/audit-log?page=1&pageSize=25&action=sign_in&userId=u-a"));
  });
});

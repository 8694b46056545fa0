import type { PortfolioSettings as Settings } from "@tributary/contracts";
import { fireEvent, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { jsonResponse, renderApp, renderWithProviders, signedInRoutes, stubFetch, testUsers } from "../../../../testing/test-utils";
import { createQueryClient } from "../../../../lib/query-client";
import { customerValueOf } from "../customer-values-form";
import { PortfolioSettings } from "../portfolio-settings";

// Invented test data: a fictional group with fictional brands and markets.
const settings: Settings = {
  company: "Tallowmere Goods Co",
  currency: "EUR",
  brands: [
    { id: "b-fen", code: "fennick", name: "Fennick", customerValue: 120 },
    { id: "b-hol", code: "hollo", name: "Hollowby", customerValue: null },
  ],
  markets: [
    { id: "m-ard", code: "ardeval", name: "Ardeval" },
    { id: "m-bri", code: "brisk", name: "Briskmoor" },
  ],
  channels: [
    { id: "ch-s", code: "search", name: "Search", position: 0 },
    { id: "ch-r", code: "radio", name: "Radio", position: 1 },
    { id: "ch-p", code: "print", name: "Print", position: 2 },
  ],
  updatedAt: "2025-01-08T09:00:00.000Z",
};

function routes(extra: Parameters<typeof stubFetch>[0] = {}) {
  return stubFetch({ "GET /api/portfolio-settings": () => jsonResponse(200, settings), ...extra });
}

const form = (name: string) => screen.findByRole("form", { name });

describe("Portfolio settings", () => {
  it("shows the company, each brand's customer value in the currency and the channels in order", async () => {
    routes();
    renderWithProviders(<PortfolioSettings />);
    const company = await form("Company");
    expect((within(company).getByLabelText("Company name") as HTMLInputElement).value).toBe("Tallowmere Goods Co");
    const currency = within(company).getByLabelText("Reporting currency") as HTMLSelectElement;
    expect(currency.value).toBe("EUR");
    expect(within(currency).getByRole("option", { name: "EUR — Euro" })).toBeTruthy();
    // The note is tied to the select, so it is read out with it.
    const note = document.getElementById(currency.getAttribute("aria-describedby")!.split(" ")[0]!);
    expect(note?.textContent).toMatch(/only changes the label.*No number is converted/);

    const brands = await form("Brands");
    expect(within(brands).getByText(/chance of profit on the dashboards/).textContent).toMatch(/profit objective of the Budget split/);
    expect((within(brands).getByLabelText("Fennick") as HTMLInputElement).value).toBe("120");
    expect((within(brands).getByLabelText("Hollowby") as HTMLInputElement).value).toBe("");
    expect(within(brands).getByRole("columnheader", { name: "Customer value (EUR)" })).toBeTruthy();
    expect(within(brands).getByRole("row", { name: /Hollowby/ }).textContent).toMatch(/not known/);

    const channels = await form("Channels");
    expect(within(channels).getAllByRole("textbox").map((input) => (input as HTMLInputElement).value)).toEqual(["Search", "Radio", "Print"]);
    expect((within(channels).getByRole("button", { name: "Move Search up" }) as HTMLButtonElement).disabled).toBe(true);
    expect((within(channels).getByRole("button", { name: "Move Print down" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("shows loading, then a retryable error when the settings cannot be read", async () => {
    let fail = true;
    routes({ "GET /api/portfolio-settings": () => (fail ? jsonResponse(500, { error: { code: "internal", message: "Something went wrong (request r-1)" } }) : jsonResponse(200, settings)) });
    const queryClient = createQueryClient();
    queryClient.setDefaultOptions({ queries: { retry: false } });
    renderWithProviders(<PortfolioSettings />, queryClient);
    expect(screen.getByRole("status").textContent).toMatch(/Loading the portfolio settings/);
    const alert = await screen.findByRole("alert");
    expect(alert.textContent).toMatch(/could not be loaded.*Something went wrong/);
    fail = false;
    fireEvent.click(within(alert).getByRole("button", { name: "Try again" }));
    expect(await form("Company")).toBeTruthy();
  });

  it("saves only the changed customer values, clears one to 'not known', and checks input like the server", async () => {
    const { calls } = routes({
      "PUT /api/portfolio-settings/customer-values": ({ body }) => {
        const sent = (body as { brands: { id: string; customerValue: number | null }[] }).brands;
        return jsonResponse(200, { ...settings, brands: settings.brands.map((b) => ({ ...b, customerValue: sent.find((s) => s.id === b.id)?.customerValue ?? b.customerValue })) });
      },
    });
    renderWithProviders(<PortfolioSettings />);
    const brands = await form("Brands");
    const fennick = within(brands).getByLabelText("Fennick");
    const save = within(brands).getByRole("button", { name: "Save customer values" }) as HTMLButtonElement;
    expect(save.disabled).toBe(true);

    for (const [typed, message] of [
      ["-5", /must be above 0/],
      ["0", /must be above 0/],
      ["12,50", /as a number/],
      ["lots", /as a number/],
    ] as const) {
      fireEvent.change(fennick, { target: { value: typed } });
      fireEvent.click(save);
      expect((await within(brands).findByText(message)).id).toBe("customer-value-0-error");
      expect(fennick.getAttribute("aria-invalid")).toBe("true");
    }
    expect(calls.filter((call) => call.method === "PUT")).toHaveLength(0);

    fireEvent.change(fennick, { target: { value: " 1 350.5 " } });
    fireEvent.click(save);
    expect((await within(brands).findByText(/Saved the customer value of Fennick/)).getAttribute("role")).toBe("status");
    expect(calls.filter((call) => call.method === "PUT").map((call) => call.body)).toEqual([{ brands: [{ id: "b-fen", customerValue: 1350.5 }] }]);
    // The form now holds the saved values, with no error left.
    expect((within(brands).getByLabelText("Fennick") as HTMLInputElement).value).toBe("1350.5");
    expect(within(brands).getByLabelText("Fennick").getAttribute("aria-invalid")).toBeNull();
    expect((within(brands).getByRole("button", { name: "Save customer values" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("clearing a value sends null (not known)", async () => {
    const { calls } = routes({ "PUT /api/portfolio-settings/customer-values": () => jsonResponse(200, { ...settings, brands: [{ ...settings.brands[0]!, customerValue: null }, settings.brands[1]!] }) });
    renderWithProviders(<PortfolioSettings />);
    const brands = await form("Brands");
    fireEvent.change(within(brands).getByLabelText("Fennick"), { target: { value: "  " } });
    fireEvent.click(within(brands).getByRole("button", { name: "Save customer values" }));
    await within(brands).findByText(/Saved the customer value of Fennick/);
    expect(calls.find((call) => call.method === "PUT")?.body).toEqual({ brands: [{ id: "b-fen", customerValue: null }] });
  });

  it("shows the server's refusal beside the field it names", async () => {
    routes({
      "PUT /api/portfolio-settings/customer-values": () =>
        jsonResponse(400, { error: { code: "invalid_input", message: "The customer value must be at most 1,000,000,000", issues: [{ path: "brands.0.customerValue", message: "Too large for this workspace" }], requestId: "r-2" } }),
    });
    renderWithProviders(<PortfolioSettings />);
    const brands = await form("Brands");
    // Hollowby is the only brand sent, so the server's index 0 is Hollowby's row.
    fireEvent.change(within(brands).getByLabelText("Hollowby"), { target: { value: "77" } });
    fireEvent.click(within(brands).getByRole("button", { name: "Save customer values" }));
    expect((await within(brands).findByText("Too large for this workspace")).id).toBe("customer-value-1-error");
    expect(within(brands).getByRole("alert").textContent).toBe("Not saved: check the fields marked above.");
  });

  it("renames and reorders channels with the keyboard-usable move buttons, then saves the whole list", async () => {
    const { calls } = routes({
      "PUT /api/portfolio-settings/channels": ({ body }) => {
        const sent = (body as { channels: { id: string; name: string }[] }).channels;
        return jsonResponse(200, { ...settings, channels: sent.map((c, k) => ({ ...settings.channels.find((s) => s.id === c.id)!, name: c.name, position: k })) });
      },
    });
    renderWithProviders(<PortfolioSettings />);
    const channels = await form("Channels");
    fireEvent.change(within(channels).getByLabelText("Display name of radio"), { target: { value: "  Radio   and audio " } });
    const down = within(channels).getByRole("button", { name: "Move Search down" });
    down.focus();
    fireEvent.click(down);
    await waitFor(() => expect(within(channels).getAllByRole("textbox").map((input) => (input as HTMLInputElement).value)).toEqual(["  Radio   and audio ", "Search", "Print"]));
    // The focus follows the moved channel, and the move is announced.
    await waitFor(() => expect(document.activeElement?.getAttribute("aria-label")).toBe("Move Search down"));
    expect(within(channels).getByText("Search moved to position 2 of 3.")).toBeTruthy();

    fireEvent.click(within(channels).getByRole("button", { name: "Save channels" }));
    expect(await within(channels).findByText(/Saved. Every screen now shows these names in this order/)).toBeTruthy();
    expect(calls.find((call) => call.method === "PUT")?.body).toEqual({
      channels: [
        { id: "ch-r", name: "Radio and audio" },
        { id: "ch-s", name: "Search" },
        { id: "ch-p", name: "Print" },
      ],
    });
  });

  it("refuses an empty or duplicate channel name before sending", async () => {
    const { calls } = routes();
    renderWithProviders(<PortfolioSettings />);
    const channels = await form("Channels");
    fireEvent.change(within(channels).getByLabelText("Display name of print"), { target: { value: "search " } });
    fireEvent.change(within(channels).getByLabelText("Display name of radio"), { target: { value: " " } });
    fireEvent.click(within(channels).getByRole("button", { name: "Save channels" }));
    expect(await within(channels).findByText('Another channel is already called "Search"')).toBeTruthy();
    expect(within(channels).getByText("The channel name cannot be empty")).toBeTruthy();
    expect(calls.filter((call) => call.method === "PUT")).toHaveLength(0);
    fireEvent.click(within(channels).getByRole("button", { name: "Undo changes" }));
    await waitFor(() => expect(within(channels).getAllByRole("textbox").map((input) => (input as HTMLInputElement).value)).toEqual(["Search", "Radio", "Print"]));
  });

  it("renames a brand: only the changed name is sent, tidied, and the form then holds the saved names", async () => {
    const { calls } = routes({
      "PUT /api/portfolio-settings/brand-names": ({ body }) => {
        const sent = (body as { brands: { id: string; name: string }[] }).brands;
        return jsonResponse(200, { ...settings, brands: settings.brands.map((b) => ({ ...b, name: sent.find((s) => s.id === b.id)?.name ?? b.name })) });
      },
    });
    renderWithProviders(<PortfolioSettings />);
    const names = await form("Brand names");
    expect(within(names).getAllByRole("textbox").map((input) => (input as HTMLInputElement).value)).toEqual(["Fennick", "Hollowby"]);
    // The codes are shown, not editable.
    expect(within(names).getByRole("cell", { name: "hollo" })).toBeTruthy();
    expect(within(names).getByText(/a data file may still use the old name/)).toBeTruthy();
    const save = within(names).getByRole("button", { name: "Save brand names" }) as HTMLButtonElement;
    expect(save.disabled).toBe(true);

    fireEvent.change(within(names).getByLabelText("Display name of hollo"), { target: { value: "  Hollowby   Home " } });
    fireEvent.click(save);
    expect((await within(names).findByText(/Saved: “Hollowby” is now “Hollowby Home”/)).getAttribute("role")).toBe("status");
    expect(calls.filter((call) => call.method === "PUT").map((call) => call.body)).toEqual([{ brands: [{ id: "b-hol", name: "Hollowby Home" }] }]);
    expect((within(names).getByLabelText("Display name of hollo") as HTMLInputElement).value).toBe("Hollowby Home");
    expect((within(names).getByRole("button", { name: "Save brand names" }) as HTMLButtonElement).disabled).toBe(true);
  });

  it("refuses an empty or duplicate market name before sending, and shows the server's refusal beside the name it names", async () => {
    const { calls } = routes({
      "PUT /api/portfolio-settings/market-names": () =>
        jsonResponse(400, {
          error: {
            code: "invalid_input",
            message: 'Data files would read "Ardevale" as the market with code "ardeval"',
            issues: [{ path: "markets.0.name", message: 'Data files would read "Ardevale" as the market with code "ardeval" (now "Ardeval")' }],
            requestId: "r-3",
          },
        }),
    });
    renderWithProviders(<PortfolioSettings />);
    const names = await form("Market names");
    const briskmoor = within(names).getByLabelText("Display name of brisk");
    fireEvent.change(briskmoor, { target: { value: " ARDEVAL " } });
    fireEvent.click(within(names).getByRole("button", { name: "Save market names" }));
    expect((await within(names).findByText('Another market is already called "Ardeval"')).id).toBe("market-name-m-bri-error");
    expect(briskmoor.getAttribute("aria-invalid")).toBe("true");
    fireEvent.change(briskmoor, { target: { value: "\u200B " } });
    fireEvent.click(within(names).getByRole("button", { name: "Save market names" }));
    expect((await within(names).findByText("The market name cannot be empty")).id).toBe("market-name-m-bri-error");
    expect(calls.filter((call) => call.method === "PUT")).toHaveLength(0);

    fireEvent.click(within(names).getByRole("button", { name: "Undo changes" }));
    await waitFor(() => expect(within(names).getAllByRole("textbox").map((input) => (input as HTMLInputElement).value)).toEqual(["Ardeval", "Briskmoor"]));
    fireEvent.change(within(names).getByLabelText("Display name of brisk"), { target: { value: "Ardevale" } });
    fireEvent.click(within(names).getByRole("button", { name: "Save market names" }));
    // Briskmoor is the only market sent, so the server's index 0 is Briskmoor's row.
    expect((await within(names).findByText(/Data files would read "Ardevale"/)).id).toBe("market-name-m-bri-error");
    expect(within(names).getByRole("alert").textContent).toBe("Not saved: check the fields marked above.");
    expect(calls.filter((call) => call.method === "PUT").map((call) => call.body)).toEqual([{ markets: [{ id: "m-bri", name: "Ardevale" }] }]);
  });

  it("warns that a new currency relabels figures without converting them, and saves name and currency", async () => {
    const { calls } = routes({ "PATCH /api/portfolio-settings/company": ({ body }) => jsonResponse(200, { ...settings, company: "Tallowmere Goods", currency: (body as { currency: string }).currency }) });
    renderWithProviders(<PortfolioSettings />);
    const company = await form("Company");
    fireEvent.change(within(company).getByLabelText("Company name"), { target: { value: "Tallowmere Goods" } });
    fireEvent.change(within(company).getByLabelText("Reporting currency"), { target: { value: "SEK" } });
    expect(within(company).getByText(/Every figure now in EUR will read as SEK/)).toBeTruthy();
    fireEvent.click(within(company).getByRole("button", { name: "Save company" }));
    expect(await within(company).findByText("Saved. Money is now labelled SEK; no figure was converted.")).toBeTruthy();
    expect(calls.find((call) => call.method === "PATCH")?.body).toEqual({ companyName: "Tallowmere Goods", currency: "SEK" });
  });

  it("is in the admin's Workspace navigation and closed to other roles", async () => {
    const admin = renderApp("/portfolio-settings", { ...signedInRoutes(testUsers.admin), "GET /api/portfolio-settings": () => jsonResponse(200, settings) });
    expect(await screen.findByRole("heading", { level: 1, name: "Portfolio settings" })).toBeTruthy();
    expect(await screen.findByRole("form", { name: "Brands" })).toBeTruthy();
    expect(within(screen.getByRole("navigation", { name: "Main" })).getByRole("link", { name: "Portfolio settings" }).getAttribute("href")).toBe("/portfolio-settings");
    admin.unmount();
    for (const role of ["portfolio_lead", "analyst", "market_manager"] as const) {
      const view = renderApp("/portfolio-settings", signedInRoutes(testUsers[role]));
      expect(await screen.findByRole("heading", { name: "Portfolio settings is not available for your role" })).toBeTruthy();
      expect(view.calls.some((call) => call.path === "/api/portfolio-settings")).toBe(false);
      view.unmount();
    }
  });
});

describe("customerValueOf", () => {
  it("reads empty as not known, numbers with space separators, and anything else as not a number", () => {
    expect(customerValueOf("")).toBeNull();
    expect(customerValueOf("   ")).toBeNull();
    expect(customerValueOf(" 1 200.5 ")).toBe(1200.5);
    expect(customerValueOf("95")).toBe(95);
    expect(customerValueOf("1e3")).toBe(1000);
    expect(customerValueOf("12,5")).toBeNaN();
    expect(customerValueOf("abc")).toBeNaN();
    expect(customerValueOf("Infinity")).toBeNaN();
  });
});

import { fireEvent, render, screen, waitFor, within } from "@testing-library/react";
import { describe, expect, it, vi } from "vitest";
import { testUpload } from "../../../../testing/intake-fixtures";
import "../../../../testing/test-utils";
import { ColumnMappingStep } from "../column-mapping-step";

function roleOf(header: string): HTMLSelectElement {
  return screen.getByRole("combobox", { name: `Role of ${header}` }) as HTMLSelectElement;
}

describe("column mapping step", () => {
  it("starts from the server's guess, with sample values and the guess's notes", () => {
    render(<ColumnMappingStep upload={testUpload} onSubmit={vi.fn()} checking={false} />);
    expect(roleOf("week_start").value).toBe("week");
    expect(roleOf("spend_radio").value).toBe("channel");
    expect(roleOf("price_index").value).toBe("control");
    expect(roleOf("comment").value).toBe("ignore");
    expect((screen.getByRole("textbox", { name: "Channel name for spend_search" }) as HTMLInputElement).value).toBe("search");
    const row = screen.getByRole("row", { name: /new_customers/ });
    expect(within(row).getByText("412, 398")).toBeTruthy();
    expect(screen.getByRole("list", { name: "Notes on the guess" }).textContent).toMatch(/comment/);
  });

  it("gives a single role to one column only: choosing it elsewhere ignores the old column and says so", () => {
    render(<ColumnMappingStep upload={testUpload} onSubmit={vi.fn()} checking={false} />);
    fireEvent.change(roleOf("price_index"), { target: { value: "outcome" } });
    expect(roleOf("price_index").value).toBe("outcome");
    expect(roleOf("new_customers").value).toBe("ignore");
    expect(screen.getByText(/price_index is now the outcome; new_customers is ignored instead/)).toBeTruthy();
  });

  it("proposes a channel name when a column becomes a channel", () => {
    render(<ColumnMappingStep upload={testUpload} onSubmit={vi.fn()} checking={false} />);
    fireEvent.change(roleOf("comment"), { target: { value: "channel" } });
    expect((screen.getByRole("textbox", { name: "Channel name for comment" }) as HTMLInputElement).value).toBe("comment");
  });

  it("sends the mapping the analyst chose", async () => {
    const onSubmit = vi.fn();
    render(<ColumnMappingStep upload={testUpload} onSubmit={onSubmit} checking={false} />);
    fireEvent.change(roleOf("spend_radio"), { target: { value: "ignore" } });
    fireEvent.change(screen.getByRole("textbox", { name: "Channel name for spend_search" }), { target: { value: "Paid search" } });
    fireEvent.click(screen.getByRole("button", { name: "Check the data" }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]?.[0]).toEqual({
      week: "week_start",
      brand: "brand",
      market: "market",
      outcome: "new_customers",
      channels: [{ column: "spend_search", channel: "Paid search" }],
      controls: ["price_index"],
      ignored: ["spend_radio", "comment"],
    });
  });

  it("blocks an incomplete mapping with the reasons, without sending it", async () => {
    const onSubmit = vi.fn();
    render(<ColumnMappingStep upload={testUpload} onSubmit={onSubmit} checking={false} />);
    fireEvent.change(roleOf("brand"), { target: { value: "ignore" } });
    fireEvent.change(roleOf("spend_search"), { target: { value: "control" } });
    fireEvent.change(roleOf("spend_radio"), { target: { value: "control" } });
    fireEvent.click(screen.getByRole("button", { name: "Check the data" }));
    const alert = await screen.findByRole("alert");
    expect(within(alert).getAllByRole("listitem").map((item) => item.textContent)).toEqual([
      "Choose the column that holds the brand",
      "Map at least one spend column to a channel",
    ]);
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it("puts a clashing channel name's message beside its field", async () => {
    render(<ColumnMappingStep upload={testUpload} onSubmit={vi.fn()} checking={false} />);
    const radio = screen.getByRole("textbox", { name: "Channel name for spend_radio" });
    fireEvent.change(radio, { target: { value: "SEARCH" } });
    fireEvent.click(screen.getByRole("button", { name: "Check the data" }));
    expect(await screen.findByText('"spend_search" already uses the channel name search')).toBeTruthy();
    expect(radio.getAttribute("aria-invalid")).toBe("true");
  });
});

import { fireEvent, render, screen, waitFor } from "@testing-library/react";
import type { CreateFlagInput } from "@tributary/contracts";
import { describe, expect, it, vi } from "vitest";
import { testFlag } from "../../../../testing/dashboard-fixtures";
import "../../../../testing/test-utils";
import { ApiError } from "../../../../lib/api-client";
import { FlagForm } from "../flag-form";

const cells = [
  { cellId: "c1", label: "Fennick · Ardeval" },
  { cellId: "c2", label: "Fennick · Briskmoor" },
];
const channels = [
  { code: "search", name: "Search" },
  { code: "radio", name: "Radio" },
];

function renderForm(onSubmit = vi.fn(async (input: CreateFlagInput) => testFlag({ cellId: input.cellId, kind: input.kind, note: input.note })), target: { cellId: string; channel: string } | null = null) {
  render(<FlagForm cells={cells} channels={channels} runId="run-7" target={target} onSubmit={onSubmit} />);
  return onSubmit;
}

describe("flag form", () => {
  it("refuses an empty form with the contract's messages and sends nothing", async () => {
    const onSubmit = renderForm();
    fireEvent.click(screen.getByRole("button", { name: "Flag this estimate" }));
    expect(await screen.findByText("Choose the cell")).toBeTruthy();
    expect(screen.getByText("Choose the channel")).toBeTruthy();
    expect(screen.getByText(/^Choose the kind of flag/)).toBeTruthy();
    expect(screen.getByText(/Write a note of at least 3 characters/)).toBeTruthy();
    expect(screen.getByLabelText("Note").getAttribute("aria-invalid")).toBe("true");
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it("refuses a note of blanks (the note is trimmed)", async () => {
    const onSubmit = renderForm(undefined, { cellId: "c2", channel: "search" });
    fireEvent.click(screen.getByLabelText(/Real difference/));
    fireEvent.change(screen.getByLabelText("Note"), { target: { value: "    " } });
    fireEvent.click(screen.getByRole("button", { name: "Flag this estimate" }));
    expect(await screen.findByText(/Write a note of at least 3 characters/)).toBeTruthy();
    expect(onSubmit).not.toHaveBeenCalled();
  });

  it("sends a valid flag for the cell × channel chosen elsewhere, and confirms it", async () => {
    const onSubmit = renderForm(undefined, { cellId: "c2", channel: "search" });
    expect((screen.getByLabelText("Cell") as HTMLSelectElement).value).toBe("c2");
    expect((screen.getByLabelText("Channel") as HTMLSelectElement).value).toBe("search");
    fireEvent.click(screen.getByLabelText(/Needs a lift test/));
    fireEvent.change(screen.getByLabelText("Note"), { target: { value: "  Only 20 weeks of data.  " } });
    fireEvent.click(screen.getByRole("button", { name: "Flag this estimate" }));
    await waitFor(() => expect(onSubmit).toHaveBeenCalledTimes(1));
    expect(onSubmit.mock.calls[0]![0]).toEqual({ cellId: "c2", channel: "search", kind: "needs_lift_test", note: "Only 20 weeks of data.", runId: "run-7" });
    expect((await screen.findByRole("status")).textContent).toMatch(/Flagged Fennick in Briskmoor, Search/);
    expect((screen.getByLabelText("Note") as HTMLTextAreaElement).value).toBe("");
  });

  it("shows the server's refusal beside the field it names", async () => {
    const onSubmit = vi.fn(async () => {
      throw new ApiError(400, "invalid_input", "Some of what you entered is not valid.", [{ path: "channel", message: "This cell has no such channel" }]);
    });
    renderForm(onSubmit, { cellId: "c1", channel: "radio" });
    fireEvent.click(screen.getByLabelText(/Data problem/));
    fireEvent.change(screen.getByLabelText("Note"), { target: { value: "Spend file for radio is empty." } });
    fireEvent.click(screen.getByRole("button", { name: "Flag this estimate" }));
    expect(await screen.findByText("This cell has no such channel")).toBeTruthy();
    expect(screen.getByRole("alert").textContent).toBe("Some of what you entered is not valid.");
  });
});

import { fireEvent, render, screen, within } from "@testing-library/react";
import { useState } from "react";
import { describe, expect, it } from "vitest";
import { channelCodeAsName } from "../../../../lib/channel-names";
import "../../../../testing/test-utils";
import { newOperation, toOperations, type ScenarioDraft } from "../../scenario/scenario-draft";
import { ScenarioEditor } from "../scenario-editor";

const choices = { channels: ["search", "radio"], markets: ["Ardeval", "Briskmoor"], brands: ["Fennick", "Hollowby"] };

/** The editor with its state held like the planner holds it; the latest operations are written to `seen`. */
function Harness({ seen, problem }: { seen: { operations: unknown; name: string }; problem?: string }) {
  const [scenario, setScenario] = useState<ScenarioDraft>({ id: "s1", name: "More search", operations: [newOperation(13, { channel: "search", value: "1.2" })] });
  const checked = toOperations(scenario, 13);
  seen.operations = checked.operations;
  seen.name = scenario.name;
  return <ScenarioEditor scenario={scenario} horizon={13} choices={choices} channelName={channelCodeAsName} onChange={setScenario} problem={problem} />;
}

describe("ScenarioEditor", () => {
  it("builds the operations from what is chosen and typed", () => {
    const seen = { operations: null as unknown, name: "" };
    render(<Harness seen={seen} />);
    expect(seen.operations).toEqual([{ kind: "scale", factor: 1.2, target: { channels: ["search"] } }]);

    fireEvent.change(screen.getByRole("combobox", { name: "Kind of change 1 of More search" }), { target: { value: "add" } });
    fireEvent.change(screen.getByRole("textbox", { name: "Amount per week, change 1 of More search" }), { target: { value: "-250" } });
    fireEvent.change(screen.getByRole("combobox", { name: "Market of change 1 of More search" }), { target: { value: "Briskmoor" } });
    fireEvent.change(screen.getByRole("textbox", { name: "First week, change 1 of More search" }), { target: { value: "4" } });
    fireEvent.change(screen.getByRole("textbox", { name: "Last week, change 1 of More search" }), { target: { value: "6" } });
    expect(seen.operations).toEqual([{ kind: "add", amountPerWeek: -250, target: { channels: ["search"], markets: ["Briskmoor"], weeks: { from: 3, to: 5 } } }]);

    fireEvent.click(screen.getByRole("button", { name: "Add a change" }));
    const second = screen.getAllByRole("listitem", { name: /^Change \d$/ })[1]!;
    fireEvent.change(within(second).getByRole("combobox", { name: "Kind of change 2 of More search" }), { target: { value: "zero" } });
    fireEvent.change(within(second).getByRole("combobox", { name: "Channel of change 2 of More search" }), { target: { value: "radio" } });
    // Setting to zero asks for no amount.
    expect(within(second).queryByRole("textbox", { name: /Weekly spend|Factor|Amount/ })).toBeNull();
    expect(seen.operations).toEqual([
      { kind: "add", amountPerWeek: -250, target: { channels: ["search"], markets: ["Briskmoor"], weeks: { from: 3, to: 5 } } },
      { kind: "zero", target: { channels: ["radio"] } },
    ]);

    fireEvent.click(screen.getByRole("button", { name: "Remove change 1 of More search" }));
    expect(seen.operations).toEqual([{ kind: "zero", target: { channels: ["radio"] } }]);
  });

  it("takes one spend per week for the weeks chosen", () => {
    const seen = { operations: null as unknown, name: "" };
    render(<Harness seen={seen} />);
    fireEvent.change(screen.getByRole("combobox", { name: "Kind of change 1 of More search" }), { target: { value: "set" } });
    fireEvent.click(screen.getByRole("checkbox", { name: "One value per week, change 1 of More search" }));
    fireEvent.change(screen.getByRole("textbox", { name: "First week, change 1 of More search" }), { target: { value: "2" } });
    fireEvent.change(screen.getByRole("textbox", { name: "Last week, change 1 of More search" }), { target: { value: "3" } });
    expect(screen.getAllByRole("textbox", { name: /^Spend in week \d+/ })).toHaveLength(2);
    expect(seen.operations).toBeNull();
    expect(screen.getByText("Enter a spend of 0 or more for every week.")).toBeTruthy();
    fireEvent.change(screen.getByRole("textbox", { name: "Spend in week 2, change 1 of More search" }), { target: { value: "400" } });
    fireEvent.change(screen.getByRole("textbox", { name: "Spend in week 3, change 1 of More search" }), { target: { value: "0" } });
    expect(seen.operations).toEqual([{ kind: "set", weekly: [400, 0], target: { channels: ["search"], weeks: { from: 1, to: 2 } } }]);
  });

  it("shows a clear message beside a field that is wrong, and holds the scenario back", () => {
    const seen = { operations: null as unknown, name: "" };
    render(<Harness seen={seen} />);
    const factor = screen.getByRole("textbox", { name: "Factor, change 1 of More search" });
    fireEvent.change(factor, { target: { value: "-2" } });
    expect(factor.getAttribute("aria-invalid")).toBe("true");
    expect(screen.getByText("Enter a factor of 0 or more (1.2 = 20 % more)").id).toBe(factor.getAttribute("aria-describedby"));
    expect(seen.operations).toBeNull();
    fireEvent.change(screen.getByRole("textbox", { name: "Last week, change 1 of More search" }), { target: { value: "20" } });
    expect(screen.getByText("Enter a week from 1 to 13")).toBeTruthy();
    fireEvent.change(screen.getByLabelText("Scenario name"), { target: { value: "  " } });
    expect(screen.getByText("Give the scenario a name")).toBeTruthy();
  });

  it("shows the forecast's own objection to the scenario", () => {
    render(<Harness seen={{ operations: null, name: "" }} problem="operation 1 (add) on every line would make the spend of Fennick × Ardeval, search, plan week 1 equal -50; spend cannot be negative" />);
    expect(screen.getByRole("alert").textContent).toMatch(/spend cannot be negative/);
  });
});

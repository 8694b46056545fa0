import { scenarioOperationSchema } from "@tributary/contracts";
import { describe, expect, it } from "vitest";
import { describeOperation, fromOperation, newOperation, parseAmount, toOperation, toOperations } from "../scenario-draft";

describe("scenario drafts", () => {
  it("reads numbers as people type them, and nothing else", () => {
    expect(parseAmount(" 1.2 ")).toBe(1.2);
    expect(parseAmount("1,5")).toBe(1.5);
    expect(parseAmount("-300")).toBe(-300);
    expect(parseAmount("12 000")).toBe(12000);
    expect(parseAmount("")).toBeNull();
    expect(parseAmount("1.2.3")).toBeNull();
    expect(parseAmount("ten")).toBeNull();
    expect(parseAmount("Infinity")).toBeNull();
  });

  it("turns each kind of change into the operation the stats package takes, weeks 0-based", () => {
    expect(toOperation(newOperation(13, { kind: "scale", value: "1.5", channel: "search" }), 13)).toEqual({ ok: true, operation: { kind: "scale", factor: 1.5, target: { channels: ["search"] } } });
    expect(toOperation(newOperation(13, { kind: "add", value: "-200", market: "Ardeval", fromWeek: "3", toWeek: "6" }), 13)).toEqual({
      ok: true,
      operation: { kind: "add", amountPerWeek: -200, target: { markets: ["Ardeval"], weeks: { from: 2, to: 5 } } },
    });
    expect(toOperation(newOperation(13, { kind: "zero", value: "", channel: "radio", brand: "Hollowby" }), 13)).toEqual({
      ok: true,
      operation: { kind: "zero", target: { channels: ["radio"], brands: ["Hollowby"] } },
    });
    expect(toOperation(newOperation(4, { kind: "set", value: "900" }), 4)).toEqual({ ok: true, operation: { kind: "set", weekly: 900 } });
    expect(toOperation(newOperation(4, { kind: "set", perWeek: true, fromWeek: "2", toWeek: "4", weeklyValues: ["100", "0", "250.5"] }), 4)).toEqual({
      ok: true,
      operation: { kind: "set", weekly: [100, 0, 250.5], target: { weeks: { from: 1, to: 3 } } },
    });
  });

  it("names the field that is wrong, in words", () => {
    const check = (overrides: Parameters<typeof newOperation>[1]) => {
      const result = toOperation(newOperation(13, overrides), 13);
      return result.ok ? {} : result.errors;
    };
    expect(check({ kind: "scale", value: "-1" })).toEqual({ value: "Enter a factor of 0 or more (1.2 = 20 % more)" });
    expect(check({ kind: "add", value: "lots" })).toEqual({ value: "Enter an amount per week (negative to cut)" });
    expect(check({ kind: "set", value: "-5" })).toEqual({ value: "Enter a weekly spend of 0 or more" });
    expect(check({ fromWeek: "0" })).toEqual({ fromWeek: "Enter a week from 1 to 13" });
    expect(check({ toWeek: "14" })).toEqual({ toWeek: "Enter a week from 1 to 13" });
    expect(check({ fromWeek: "5", toWeek: "2" })).toEqual({ toWeek: "The last week cannot come before the first" });
    expect(check({ fromWeek: "2.5" })).toEqual({ fromWeek: "Enter a week from 1 to 13" });
    expect(check({ kind: "set", perWeek: true, fromWeek: "1", toWeek: "3", weeklyValues: ["10", "", "-1"] })).toEqual({
      "week-1": "Enter the spend of week 2 (0 or more)",
      "week-2": "Enter the spend of week 3 (0 or more)",
    });
    // A change to zero needs no value.
    expect(check({ kind: "zero", value: "not a number" })).toEqual({});
  });

  it("gives the operations only when every change is valid", () => {
    const good = newOperation(13, { kind: "scale", value: "2" });
    const bad = newOperation(13, { kind: "add", value: "" });
    expect(toOperations({ id: "s", name: "A", operations: [good] }, 13).operations).toEqual([{ kind: "scale", factor: 2 }]);
    const mixed = toOperations({ id: "s", name: "A", operations: [good, bad] }, 13);
    expect(mixed.operations).toBeNull();
    expect(mixed.checks.map((c) => c.ok)).toEqual([true, false]);
  });

  it("makes operations the API accepts, and reads saved ones back unchanged", () => {
    const drafts = [
      newOperation(13, { kind: "scale", value: "0.5", channel: "radio", market: "Ardeval" }),
      newOperation(13, { kind: "set", perWeek: true, fromWeek: "12", toWeek: "13", weeklyValues: ["5", "6"] }),
      newOperation(13, { kind: "zero", brand: "Fennick", fromWeek: "1", toWeek: "1" }),
      newOperation(13, { kind: "add", value: "75" }),
    ];
    for (const draft of drafts) {
      const result = toOperation(draft, 13);
      if (!result.ok) throw new Error(JSON.stringify(result.errors));
      expect(scenarioOperationSchema.parse(result.operation)).toEqual(result.operation);
      expect(toOperation(fromOperation(result.operation, 13), 13)).toEqual(result);
    }
  });

  it("says what a change does in words", () => {
    expect(describeOperation({ kind: "scale", factor: 1.2, target: { channels: ["search"], markets: ["Ardeval"] } }, 13)).toBe("search in Ardeval, weeks 1–13: multiply spend by 1.2");
    expect(describeOperation({ kind: "add", amountPerWeek: -300, target: { weeks: { from: 2, to: 2 } } }, 13)).toBe("every channel, week 3: cut 300 per week");
    expect(describeOperation({ kind: "zero", target: { brands: ["Hollowby"] } }, 8)).toBe("every channel of Hollowby, weeks 1–8: no spend");
    const names = (code: string) => ({ search: "Paid search", online_video: "Online video" })[code] ?? code;
    expect(describeOperation({ kind: "zero", target: { channels: ["search", "online_video"] } }, 4, names)).toBe("Paid search, Online video, weeks 1–4: no spend");
  });
});

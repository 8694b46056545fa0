import { describe, expect, it } from "vitest";
import { chanceOfProfit, chanceOfProfitCurve, chanceOfProfitSorted, sortedCacDraws } from "../chance-of-profit";

// Hand-counted: P(profitable) is the share of draws whose CAC is below the customer value (model.md).
const draws = [40, 55, 60, 80, 95, 110, 130, 150, 200, null];

describe("chance of profit from draws", () => {
  it("counts the draws strictly below the customer value", () => {
    expect(chanceOfProfit(draws, 100)).toBe(0.5); // 40, 55, 60, 80, 95
    expect(chanceOfProfit(draws, 95)).toBe(0.4); // 95 itself is not below
    expect(chanceOfProfit(draws, 1000)).toBe(0.9); // the null draw (no finite CAC) is never below
    expect(chanceOfProfit(draws, 30)).toBe(0);
  });

  it("leaves NaN draws out of the count, and needs draws and a positive value", () => {
    expect(chanceOfProfit([10, Number.NaN, 30], 20)).toBe(0.5);
    expect(chanceOfProfit([], 20)).toBeNull();
    expect(chanceOfProfit(draws, 0)).toBeNull();
    expect(chanceOfProfit(draws, Number.NaN)).toBeNull();
  });

  it("gives the same answer from sorted draws at every slider position, and a non-decreasing curve", () => {
    const sorted = sortedCacDraws(draws);
    expect([...sorted]).toEqual([40, 55, 60, 80, 95, 110, 130, 150, 200, Infinity]);
    for (const value of [1, 40, 41, 99.9, 150, 150.01, 500]) expect(chanceOfProfitSorted(sorted, value)).toBe(chanceOfProfit(draws, value));
    const curve = chanceOfProfitCurve(sorted, [20, 50, 100, 140, 250]);
    expect(curve.map((point) => point.chance)).toEqual([0, 0.1, 0.5, 0.7, 0.9]);
  });
});

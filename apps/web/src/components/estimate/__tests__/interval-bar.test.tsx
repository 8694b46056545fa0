import { render } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import "../../../testing/test-utils";
import { IntervalBar, logDomainOf, logPosition } from "../interval-bar";

describe("interval bar", () => {
  it("places values on a log scale: equal ratios are equal steps", () => {
    // Domain 10–1000: 100 is the geometric middle, 10^1.5 ≈ 31.6 a quarter of the way.
    expect(logPosition(100, [10, 1000])).toBeCloseTo(0.5, 12);
    expect(logPosition(10 ** 1.5, [10, 1000])).toBeCloseTo(0.25, 12);
    expect(logPosition(5, [10, 1000])).toBe(0);
    expect(logPosition(5000, [10, 1000])).toBe(1);
    expect(logPosition(0, [10, 1000])).toBe(0);
  });

  it("takes a domain around every positive value, padded 4 % of the log range on each side", () => {
    const domain = logDomainOf([20, null, 80, undefined, -3, 40])!;
    const pad = Math.log(80 / 20) * 0.04;
    expect(domain[0]).toBeCloseTo(20 * Math.exp(-pad), 10);
    expect(domain[1]).toBeCloseTo(80 * Math.exp(pad), 10);
    expect(logDomainOf([50])).toEqual([25, 100]);
    expect(logDomainOf([null, 0])).toBeNull();
  });

  it("draws the 90 % interval from its ends and the median at its place, with the customer value as a line", () => {
    const { container } = render(<IntervalBar low={10} median={100} high={1000} domain={[1, 10_000]} reference={1000} />);
    const parts = [...container.querySelectorAll<HTMLElement>("span > span")];
    const line = parts.find((part) => part.className.includes("h-1 "));
    const dot = parts.find((part) => part.className.includes("rounded-full border"));
    const reference = container.querySelector<HTMLElement>("[data-reference]");
    // On 1–10 000, 10 sits at 25 %, 100 at 50 % and 1000 at 75 %.
    expect(line?.style.left).toBe("25.00%");
    expect(line?.style.width).toBe("50.00%");
    expect(dot?.style.left).toBe("50.00%");
    expect(reference?.style.left).toBe("75.00%");
  });
});

import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import "../../../testing/test-utils";
import { describeShrinkage, formatShrinkage, ShrinkageMark, shrinkagePlacement } from "../shrinkage-mark";

// The glyph's track runs from x = 9 (the cell's own estimate) to x = 39 (the group).
describe("shrinkage mark", () => {
  it("puts the bar's end in proportion to the shrinkage between the two ends", () => {
    expect(shrinkagePlacement(0)).toEqual({ position: 9, beyond: "none" });
    expect(shrinkagePlacement(0.5)).toEqual({ position: 24, beyond: "none" });
    expect(shrinkagePlacement(1)).toEqual({ position: 39, beyond: "none" });
    expect(shrinkagePlacement(0.25).position).toBeCloseTo(16.5, 10);
  });

  it("shows shrinkage outside 0–1 as such instead of clipping it to the track", () => {
    // −0.1 runs 3 units left of the tick; far values stop at the overhang with a chevron.
    expect(shrinkagePlacement(-0.1)).toEqual({ position: 6, beyond: "away" });
    expect(shrinkagePlacement(-4.48)).toEqual({ position: 4, beyond: "away" });
    expect(shrinkagePlacement(1.1).position).toBeCloseTo(42, 10);
    expect(shrinkagePlacement(2.77)).toEqual({ position: 44, beyond: "past" });
  });

  it("says in words how far pooling moved the estimate", () => {
    expect(describeShrinkage(0.62)).toBe("Pooling moved the estimate 62 % of the way from the cell's own data to the group");
    expect(describeShrinkage(-0.04)).toBe("Pooling moved the estimate away from the group (shrinkage −4 %)");
    expect(describeShrinkage(1.66)).toBe("Pooling moved the estimate past the group (shrinkage 166 %)");
    expect(describeShrinkage(0.002)).toBe("Pooling hardly moved the estimate (shrinkage 0 %)");
    expect(describeShrinkage(null)).toMatch(/not defined/);
    expect(formatShrinkage(-9.25)).toBe("−925 %");
  });

  it("draws a bar of the right length, a chevron beyond 0–1, and no bar when undefined", () => {
    const { container } = render(
      <>
        <ShrinkageMark shrinkage={0.5} withValue />
        <ShrinkageMark shrinkage={-0.3} />
        <ShrinkageMark shrinkage={null} withValue />
      </>,
    );
    const [half, away, none] = [...container.querySelectorAll("svg")];
    // The bar is the only line drawn in the mark's own colour.
    const bar = half!.querySelector('line[stroke="currentColor"]');
    expect(bar?.getAttribute("x1")).toBe("9");
    expect(bar?.getAttribute("x2")).toBe("24");
    expect(half!.getAttribute("data-beyond")).toBe("none");
    expect(away!.getAttribute("data-beyond")).toBe("away");
    expect(away!.querySelectorAll("path")).toHaveLength(1);
    expect(none!.querySelector('line[stroke="currentColor"]')).toBeNull();
    expect(screen.getByRole("img", { name: "Pooling moved the estimate 50 % of the way from the cell's own data to the group" })).toBeTruthy();
    expect(screen.getByText("50 %")).toBeTruthy();
    expect(screen.getByText("–")).toBeTruthy();
  });
});

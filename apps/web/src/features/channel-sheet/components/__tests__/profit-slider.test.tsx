import { fireEvent, render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { testChannelSheet } from "../../../../testing/dashboard-fixtures";
import "../../../../testing/test-utils";
import { ProfitSlider, sliderRange } from "../profit-slider";

// The fixture's 10 draws: 40, 55, 60, 80, 95, 110, 130, 150, 200 and one with no finite CAC.
describe("chance of profit slider", () => {
  it("starts at the brand's customer value with the server's chance from every stored draw", () => {
    render(<ProfitSlider sheet={testChannelSheet()} />);
    expect(screen.getByTestId("profit-readout").textContent).toMatch(/^At €120 per customer, the chance of profit is 61 % .*from every stored posterior draw/);
    expect(screen.getByText("(the brand’s value)")).toBeTruthy();
  });

  it("recomputes the chance in the browser as the slider moves", () => {
    render(<ProfitSlider sheet={testChannelSheet()} />);
    const slider = screen.getByRole("slider", { name: /Value of a new customer/ });
    const readout = screen.getByTestId("profit-readout");
    // The range runs from half the 1 % draw to twice the 99 % draw: €20 to €400 on a log scale.
    expect(sliderRange(Float64Array.from([40, 55, 60, 80, 95, 110, 130, 150, 200, Infinity]), 120)).toEqual([20, 400]);
    fireEvent.change(slider, { target: { value: "0" } });
    expect(readout.textContent).toMatch(/^At €20 per customer, the chance of profit is < 1 %/);
    fireEvent.change(slider, { target: { value: "200" } });
    // Every finite draw is below €400; the draw without a finite CAC never is: 9 of 10.
    expect(readout.textContent).toMatch(/^At €400 per customer, the chance of profit is 90 %/);
    // Half-way on the log scale: √(20 × 400) ≈ 89.4, shown to 2 significant digits as €89: 40, 55, 60, 80 → 40 %.
    fireEvent.change(slider, { target: { value: "100" } });
    expect(readout.textContent).toMatch(/^At €89 per customer, the chance of profit is 40 %/);
    expect(slider.getAttribute("aria-valuetext")).toBe("€89");
    // Step 110: 20 × 20^0.55 ≈ 104, shown as €100: 40, 55, 60, 80, 95 → 50 %.
    fireEvent.change(slider, { target: { value: "110" } });
    expect(readout.textContent).toMatch(/^At €100 per customer, the chance of profit is 50 % .*counted from 10 posterior draws/);
    fireEvent.click(screen.getByRole("button", { name: /Back to the brand’s value/ }));
    expect(readout.textContent).toMatch(/chance of profit is 61 %/);
  });

  it("says so when there are no draws to count", () => {
    const sheet = testChannelSheet();
    render(<ProfitSlider sheet={{ ...sheet, profit: { ...sheet.profit, draws: [] } }} />);
    expect(screen.getByText(/its chance of profit is not defined/)).toBeTruthy();
    expect(screen.queryByRole("slider")).toBeNull();
  });
});

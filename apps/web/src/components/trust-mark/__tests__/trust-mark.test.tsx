import { render, screen } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import "../../../testing/test-utils";
import { TrustMark, trustStateOf } from "../trust-mark";

describe("trust mark", () => {
  it("says its state in words and draws a different shape for each", () => {
    const { container } = render(
      <>
        <TrustMark state="trustworthy" />
        <TrustMark state="untrustworthy" detail="2 reasons" />
        <TrustMark state="unassessed" />
      </>,
    );
    expect(screen.getByText("Trustworthy")).toBeTruthy();
    expect(screen.getByText("Not trustworthy")).toBeTruthy();
    expect(screen.getByText("· 2 reasons")).toBeTruthy();
    expect(screen.getByText("Not assessed yet")).toBeTruthy();
    expect([...container.querySelectorAll("svg")].map((svg) => svg.getAttribute("data-glyph"))).toEqual(["stone", "wedge", "ring"]);
    for (const svg of container.querySelectorAll("svg")) expect(svg.getAttribute("aria-hidden")).toBe("true");
  });

  it("shows the reason an untrustworthy run was published anyway, and only then", () => {
    const { rerender } = render(<TrustMark state="untrustworthy" publishReason="Lift tests in Ardeval agree with these estimates." />);
    expect(screen.getByText("“Lift tests in Ardeval agree with these estimates.”")).toBeTruthy();
    rerender(<TrustMark state="trustworthy" publishReason="Ignored for a sound run" />);
    expect(screen.queryByText(/Ignored for a sound run/)).toBeNull();
  });

  it("maps a run's flag to a state", () => {
    expect([trustStateOf(true), trustStateOf(false), trustStateOf(null), trustStateOf(undefined)]).toEqual(["trustworthy", "untrustworthy", "unassessed", "unassessed"]);
  });
});

import { fireEvent, screen } from "@testing-library/react";
import { afterEach, describe, expect, it, vi } from "vitest";
import { jsonResponse, renderWithProviders, stubFetch } from "../../../../testing/test-utils";
import { ReportDownloads } from "../report-downloads";

const brands = [
  { id: "b-fen", name: "Fennick" },
  { id: "b-hol", name: "Hollowby" },
];
const markets = [{ id: "m-ard", name: "Ardeval" }];

afterEach(() => vi.restoreAllMocks());

describe("ReportDownloads", () => {
  it("downloads the PDF of the brand or market chosen, under the server's file name", async () => {
    const created = vi.spyOn(URL, "createObjectURL").mockReturnValue("blob:report");
    vi.spyOn(URL, "revokeObjectURL").mockImplementation(() => undefined);
    const clicks: string[] = [];
    vi.spyOn(HTMLAnchorElement.prototype, "click").mockImplementation(function (this: HTMLAnchorElement) {
      clicks.push(this.download);
    });
    const { calls } = stubFetch({
      "GET /api/reports/run.pdf": () =>
        new Response(new Blob(["%PDF-1.7 test"], { type: "application/pdf" }), {
          status: 200,
          headers: { "Content-Type": "application/pdf", "Content-Disposition": 'attachment; filename="tributary-ardeval.pdf"' },
        }),
    });
    const fetchUrls = () => (globalThis.fetch as unknown as { mock: { calls: [string][] } }).mock.calls.map(([url]) => url);
    renderWithProviders(<ReportDownloads brands={brands} markets={markets} />);
    fireEvent.change(screen.getByLabelText("Report for"), { target: { value: "market:m-ard" } });
    fireEvent.click(screen.getByRole("button", { name: "Download PDF for Ardeval" }));
    expect((await screen.findByRole("status")).textContent).toBe("Downloaded tributary-ardeval.pdf.");
    expect(fetchUrls()).toEqual(["/api/reports/run.pdf?market=m-ard"]);
    expect(calls[0]?.credentials).toBe("same-origin");
    expect(clicks).toEqual(["tributary-ardeval.pdf"]);
    const blob = created.mock.calls[0]![0] as Blob;
    expect(blob.type).toBe("application/pdf");
  });

  it("says why a report could not be made", async () => {
    stubFetch({ "GET /api/reports/run.pdf": () => jsonResponse(404, { error: { code: "not_found", message: "No fit has been published yet." } }) });
    renderWithProviders(<ReportDownloads brands={brands} markets={markets} />);
    fireEvent.click(screen.getByRole("button", { name: "Download PDF for Fennick" }));
    expect((await screen.findByRole("alert")).textContent).toBe("The report could not be made: No fit has been published yet.");
  });

  it("shows nothing when there is nothing to report on", () => {
    const { container } = renderWithProviders(<ReportDownloads brands={[]} markets={[]} />);
    expect(container.textContent).toBe("");
  });
});

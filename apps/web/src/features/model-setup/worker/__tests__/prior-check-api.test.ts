import { priorCheck, type PortfolioData } from "@tributary/stats";
import { expose, wrap } from "comlink";
import { afterEach, describe, expect, it } from "vitest";
import { priorCheckApi, type PriorCheckApi, type PriorCheckRequest } from "../prior-check-api";

// Two invented cells of one market, 12 weeks, two channels.
function data(): PortfolioData {
  const weeks = 12;
  const cell = (brand: string, scale: number) => ({
    brand,
    market: "Ardeval",
    firstWeek: "2024-01-01",
    outcome: Float64Array.from({ length: weeks }, (_, t) => scale * (300 + 10 * (t % 4))),
    spend: [Float64Array.from({ length: weeks }, (_, t) => scale * (800 + 100 * (t % 3))), Float64Array.from({ length: weeks }, (_, t) => (t % 2 ? 0 : scale * 500))],
    controls: [],
  });
  return { channels: ["search", "radio"], controls: [], cells: [cell("Fennick", 1), cell("Hollowby", 0.5)] };
}

const request = (overrides: Partial<PriorCheckRequest> = {}): PriorCheckRequest => ({
  data: data(),
  options: { cacRange: { search: [20, 400] } },
  settings: { draws: 60, seed: 4 },
  ...overrides,
});

const ports: MessagePort[] = [];
afterEach(() => {
  for (const port of ports.splice(0)) port.close();
});

describe("prior-check worker API", () => {
  it("answers with the prior check of the stats package and how long it took", () => {
    const response = priorCheckApi.run(request());
    expect(response.ok).toBe(true);
    if (!response.ok) return;
    expect(response.result).toEqual(priorCheck(data(), { cacRange: { search: [20, 400] } }, { draws: 60, seed: 4 }));
    expect(response.result.channels.map((channel) => channel.channel)).toEqual(["search", "radio"]);
    expect(response.result.cells).toHaveLength(2);
    expect(response.elapsedMs).toBeGreaterThanOrEqual(0);
  });

  it("turns bad settings into a message instead of throwing", () => {
    const response = priorCheckApi.run(request({ options: { cacRange: { search: [400, 20] } } }));
    expect(response.ok).toBe(false);
    if (response.ok) return;
    expect(response.message).toMatch(/cacRange for "search" must be \[lo, hi\] with 0 < lo < hi/);
  });

  it("says which cell is too short, without the internal prefix", () => {
    const response = priorCheckApi.run(request({ options: { holdoutWeeks: 6 } }));
    expect(response.ok).toBe(false);
    if (response.ok) return;
    expect(response.message).toMatch(/^cell 0 \(Fennick × Ardeval\) has 12 weeks; at least 8 weeks are needed/);
  });

  it("works across a message port through comlink, as it does in the worker", async () => {
    const { port1, port2 } = new MessageChannel();
    ports.push(port1, port2);
    expose(priorCheckApi, port1);
    const remote = wrap<PriorCheckApi>(port2);
    const response = await remote.run(request());
    expect(response.ok).toBe(true);
    if (!response.ok) return;
    // The typed arrays of the data and the plain result survive the structured clone unchanged.
    expect(response.result).toEqual(priorCheck(data(), { cacRange: { search: [20, 400] } }, { draws: 60, seed: 4 }));
  });
});

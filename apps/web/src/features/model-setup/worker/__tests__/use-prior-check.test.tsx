import type { PortfolioData, PriorCheckModelOptions } from "@tributary/stats";
import { act, renderHook } from "@testing-library/react";
import { afterEach, beforeEach, describe, expect, it, vi } from "vitest";
import "../../../../testing/test-utils";
import type { PriorCheckRequest, PriorCheckResponse } from "../prior-check-api";
import type { PriorCheckRunner } from "../prior-check-runner";
import { usePriorCheck } from "../use-prior-check";

const data: PortfolioData = { channels: ["search"], controls: [], cells: [] };
const settings = { draws: 10, seed: 1 };

function fakeResult(tag: number): PriorCheckResponse {
  return { ok: true, elapsedMs: tag, result: { draws: 10, seed: tag, structure: "pooled", channels: [], cells: [] } };
}

/** A runner whose answers the test releases by hand, in any order. */
function manualRunner() {
  const pending: { request: PriorCheckRequest; resolve: (response: PriorCheckResponse) => void }[] = [];
  const runner: PriorCheckRunner = {
    run: (request) => new Promise((resolve) => pending.push({ request, resolve })),
    dispose: vi.fn(),
  };
  return { runner, pending };
}

beforeEach(() => vi.useFakeTimers());
afterEach(() => vi.useRealTimers());

describe("usePriorCheck", () => {
  it("waits for a pause in typing, then checks once with the latest settings", async () => {
    const { runner, pending } = manualRunner();
    const { result, rerender } = renderHook(({ options }: { options: PriorCheckModelOptions }) => usePriorCheck(data, options, settings, { runner, delayMs: 200 }), {
      initialProps: { options: { maxLag: 4 } },
    });
    rerender({ options: { maxLag: 5 } });
    rerender({ options: { maxLag: 6 } });
    expect(result.current.status).toBe("running");
    await act(async () => vi.advanceTimersByTime(199));
    expect(pending).toHaveLength(0);
    await act(async () => vi.advanceTimersByTime(1));
    expect(pending.map((p) => p.request.options)).toEqual([{ maxLag: 6 }]);
    await act(async () => pending[0]!.resolve(fakeResult(6)));
    expect(result.current).toMatchObject({ status: "done", elapsedMs: 6, stale: false });
  });

  it("drops an answer to settings that have since changed", async () => {
    const { runner, pending } = manualRunner();
    const { result, rerender } = renderHook(({ options }: { options: PriorCheckModelOptions }) => usePriorCheck(data, options, settings, { runner, delayMs: 50 }), {
      initialProps: { options: { maxLag: 4 } },
    });
    await act(async () => vi.advanceTimersByTime(50));
    rerender({ options: { maxLag: 9 } });
    await act(async () => vi.advanceTimersByTime(50));
    expect(pending).toHaveLength(2);
    await act(async () => pending[1]!.resolve(fakeResult(9)));
    await act(async () => pending[0]!.resolve(fakeResult(4)));
    expect(result.current.result?.seed).toBe(9);
  });

  it("keeps the last result, marked stale, while the settings are not valid, and shows a failure's message", async () => {
    const { runner, pending } = manualRunner();
    const { result, rerender } = renderHook(({ options }: { options: PriorCheckModelOptions | null }) => usePriorCheck(data, options, settings, { runner, delayMs: 10 }), {
      initialProps: { options: { maxLag: 4 } as PriorCheckModelOptions | null },
    });
    await act(async () => vi.advanceTimersByTime(10));
    await act(async () => pending[0]!.resolve(fakeResult(4)));
    rerender({ options: null });
    expect(result.current).toMatchObject({ stale: true, result: { seed: 4 } });
    rerender({ options: { maxLag: 60 } });
    await act(async () => vi.advanceTimersByTime(10));
    await act(async () => pending[1]!.resolve({ ok: false, message: "maxLag must be an integer from 1 to 52, got 60", elapsedMs: 0 }));
    expect(result.current).toMatchObject({ status: "failed", message: "maxLag must be an integer from 1 to 52, got 60", stale: true, result: { seed: 4 } });
  });
});

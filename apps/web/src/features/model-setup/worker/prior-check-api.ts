// What the prior-check worker exposes through comlink. Kept apart from the worker entry so
// it can be called and tested directly, without a Worker.
import { priorCheck, type PortfolioData, type PriorCheckModelOptions, type PriorCheckResult, type PriorCheckSettings } from "@tributary/stats";

export type PriorCheckRequest = {
  data: PortfolioData;
  options: PriorCheckModelOptions;
  settings: PriorCheckSettings;
};

export type PriorCheckResponse =
  | { ok: true; result: PriorCheckResult; elapsedMs: number }
  | { ok: false; message: string; elapsedMs: number };

const now = () => (typeof performance !== "undefined" ? performance.now() : Date.now());

/** Runs the prior check; a problem with the data or settings comes back as a message, never as a thrown error. */
function run(request: PriorCheckRequest): PriorCheckResponse {
  const start = now();
  try {
    const result = priorCheck(request.data, request.options, request.settings);
    return { ok: true, result, elapsedMs: now() - start };
  } catch (error) {
    const message = error instanceof Error ? error.message.replace(/^portfolio data: /, "") : String(error);
    return { ok: false, message, elapsedMs: now() - start };
  }
}

export const priorCheckApi = { run };
export type PriorCheckApi = typeof priorCheckApi;
